import { sql, type SQL } from 'drizzle-orm';
import type { Db } from '../../db/client';
import type { AudienceKind } from '../../../shared/schemas/dispatch';

// Who belongs to a dispatch's audience, as one SQL predicate over an account id, used both to decide who may
// read a dispatch on the site and (with the e-mail choice) who receives it.

/** Pledges that count as backing: paid, perhaps partly refunded. Fully refunded, failed or disputed do not. */
const BACKING = sql`('paid', 'partly_refunded')`;
/** A crew membership counts while the processor still renews it (a failed card is retried, not ended). */
const CREW = sql`('active', 'trialing', 'past_due')`;

export type Audience = { kind: AudienceKind; tierIds: readonly string[] };

export function inAudience(audience: Audience, accountId: SQL): SQL {
  switch (audience.kind) {
    case 'everyone':
      return sql`true`;
    case 'backers':
      return sql`(exists (select 1 from pledges p where p.backer_id = ${accountId} and p.state in ${BACKING})
        or exists (select 1 from memberships m where m.backer_id = ${accountId} and m.status in ${CREW}))`;
    case 'crew':
      return sql`exists (select 1 from memberships m where m.backer_id = ${accountId} and m.status in ${CREW})`;
    case 'tiers': {
      const ids = sql`array[${sql.join(
        audience.tierIds.map((id) => sql`${id}`),
        sql`, `,
      )}]::uuid[]`;
      return sql`(exists (select 1 from pledges p where p.backer_id = ${accountId} and p.state in ${BACKING} and p.tier_id = any(${ids}))
        or exists (select 1 from memberships m where m.backer_id = ${accountId} and m.status in ${CREW} and m.tier_id = any(${ids})))`;
    }
  }
}

export async function isInAudience(db: Db, audience: Audience, accountId: string): Promise<boolean> {
  if (audience.kind === 'everyone') return true;
  const r = await db.execute<{ ok: boolean }>(sql`select ${inAudience(audience, sql`${accountId}::uuid`)} as ok`);
  return r.rows[0]?.ok === true;
}

export type Recipient = { accountId: string; email: string; displayName: string };

/**
 * The people who receive the dispatch by e-mail, resolved now: in the audience, account not deleted, and
 * dispatch mail not switched off in their e-mail choices (no row there means the default: on).
 */
export async function resolveRecipients(db: Pick<Db, 'execute'>, audience: Audience): Promise<Recipient[]> {
  const r = await db.execute<{ account_id: string; email: string; display_name: string }>(sql`
    select a.id as account_id, a.email, a.display_name
      from accounts a
      left join email_preferences ep on ep.account_id = a.id
     where a.deleted_at is null
       and coalesce(ep.dispatches, true)
       and ${inAudience(audience, sql`a.id`)}
     order by a.created_at, a.id`);
  return r.rows.map((x) => ({ accountId: x.account_id, email: x.email, displayName: x.display_name }));
}

export function audienceLine(kind: AudienceKind): string {
  switch (kind) {
    case 'everyone':
      return 'a follower';
    case 'backers':
      return 'a backer';
    case 'tiers':
      return 'a backer of the tier this dispatch was written for';
    case 'crew':
      return 'a crew member';
  }
}
