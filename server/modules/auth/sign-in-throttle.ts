import { textProblem } from '../../../shared/schemas/text';
import { sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { AppError } from '../../errors';

/**
 * Failed sign-ins, counted in PostgreSQL (table rate_limit_hits) so every app process sees the same numbers.
 *
 * - Per client address: at most `perAddress` failures per window, whatever the accounts (password spraying).
 * - Per account: after `freeFailures` failures, an address that has itself failed on this account must wait
 *   firstDelaySeconds × 2^(n − freeFailures) (at most `maxDelaySeconds`) after the account's last attempt. Attempts that come
 *   sooner get 429 with Retry-After and are not heard. An address with no failures on the account is never
 *   held back, so guessing cannot lock the owner out, and the right password always works after the wait.
 * - Only failures count: a success gives back its reservation and clears its address's record on the account.
 *
 * Each attempt is reserved as a failure before the password is checked, so parallel guesses cannot slip
 * between the check and the count.
 */
export function createSignInThrottle({
  db,
  windowSeconds,
  perAddress,
  freeFailures,
  firstDelaySeconds,
  maxDelaySeconds,
}: {
  db: Db;
  windowSeconds: number;
  perAddress: number;
  freeFailures: number;
  firstDelaySeconds: number;
  maxDelaySeconds: number;
}) {
  const window = sql`make_interval(secs => ${windowSeconds})`;
  // The account row's reset_at slides: it is always (last attempt + window).
  const waitUntil = sql`(r.reset_at - ${window}) + make_interval(secs => least(${firstDelaySeconds} * power(2, r.hits - ${freeFailures}), ${maxDelaySeconds}))`;

  const tooMany = (seconds: number, message: string) =>
    new AppError(429, 'auth.rate_limited', message, undefined, { 'Retry-After': String(Math.max(1, seconds)) });

  return {
    /** Reserves one attempt; throws 429 when this address or this account must wait. Returns the settle step. */
    async begin({ email, address }: { email: string; address: string }) {
      // Text the database cannot store (a NUL, a lone surrogate) is counted under one key, never sent as a key.
      const typed = email.trim().toLowerCase();
      const account = textProblem(typed) ? '(unreadable)' : typed;
      const keys = { address: `signin:ip:${address}`, account: `signin:acct:${account}`, pair: `signin:pair:${account}|${address}` };

      const { rows: ipRows } = await db.execute<{ hits: number; retry: number }>(sql`
        insert into rate_limit_hits as r (key, hits, reset_at) values (${keys.address}, 1, now() + ${window})
        on conflict (key) do update set
          hits = case when r.reset_at <= now() then 1 else r.hits + 1 end,
          reset_at = case when r.reset_at <= now() then excluded.reset_at else r.reset_at end
        returning hits, ceil(extract(epoch from reset_at - now()))::int as retry`);
      if (Number(ipRows[0]!.hits) > perAddress) {
        throw tooMany(Number(ipRows[0]!.retry), 'Too many failed sign-ins from this network. Wait a little and try again.');
      }
      const giveBackAddress = () => db.execute(sql`update rate_limit_hits set hits = greatest(hits - 1, 0) where key = ${keys.address}`);

      const { rows: pairRows } = await db.execute(
        sql`select 1 from rate_limit_hits where key = ${keys.pair} and hits > 0 and reset_at > now()`,
      );
      const addressFailing = pairRows.length > 0;

      const { rows: accountRows } = await db.execute(sql`
        insert into rate_limit_hits as r (key, hits, reset_at) values (${keys.account}, 1, now() + ${window})
        on conflict (key) do update set
          hits = case when r.reset_at <= now() then 1 else r.hits + 1 end,
          reset_at = now() + ${window}
        where r.reset_at <= now() or ${!addressFailing} or r.hits < ${freeFailures} or ${waitUntil} <= now()
        returning hits`);
      if (accountRows.length === 0) {
        await giveBackAddress();
        const { rows } = await db.execute<{ retry: number }>(
          sql`select ceil(extract(epoch from ${waitUntil} - now()))::int as retry from rate_limit_hits r where key = ${keys.account}`,
        );
        throw tooMany(
          Number(rows[0]?.retry ?? 1),
          'Several wrong passwords were tried for this account. Wait a moment before the next try.',
        );
      }

      return {
        async succeeded() {
          await db.execute(sql`
            update rate_limit_hits set hits = greatest(hits - 1, 0) where key in (${keys.address}, ${keys.account})`);
          await db.execute(sql`delete from rate_limit_hits where key = ${keys.pair}`);
        },
        async failed() {
          await db.execute(sql`
            insert into rate_limit_hits as r (key, hits, reset_at) values (${keys.pair}, 1, now() + ${window})
            on conflict (key) do update set
              hits = case when r.reset_at <= now() then 1 else r.hits + 1 end,
              reset_at = now() + ${window}`);
        },
      };
    },
  };
}

export type SignInThrottle = ReturnType<typeof createSignInThrottle>;
