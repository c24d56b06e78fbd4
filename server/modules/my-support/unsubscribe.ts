import { createHmac, timingSafeEqual } from 'node:crypto';
import { eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { accounts, emailPreferences } from '../accounts/accounts.tables';
import { recordAudit } from '../audit/audit.repository';
import { badRequest } from '../../errors';

// Signed unsubscribe links: the link itself proves which account and which kind of mail, so it works at once
// without signing in (and for the one-click POST a mail client makes, RFC 8058). The key is derived from
// SESSION_SECRET for this one purpose, so a token can never pass as anything else.

// Each category is a column of email_preferences.
export const UNSUBSCRIBE_CATEGORIES = ['dispatches', 'passReminders'] as const;
export type UnsubscribeCategory = (typeof UNSUBSCRIBE_CATEGORIES)[number];

const b64url = (b: Buffer) => b.toString('base64url');

function keyFor(secret: string) {
  return createHmac('sha256', secret).update('lightkeel/unsubscribe/v1').digest();
}

export function signUnsubscribeToken(secret: string, accountId: string, category: UnsubscribeCategory): string {
  const payload = b64url(Buffer.from(`${accountId}.${category}`));
  const sig = b64url(createHmac('sha256', keyFor(secret)).update(payload).digest().subarray(0, 18));
  return `${payload}.${sig}`;
}

const invalidLink = () =>
  badRequest('email_choices.bad_link', 'This unsubscribe link is not valid. Open your e-mail choices to change what you receive.', [
    { path: 'token', message: 'not a valid unsubscribe link' },
  ]);

export function verifyUnsubscribeToken(secret: string, token: string): { accountId: string; category: UnsubscribeCategory } {
  const [payload, sig, extra] = token.split('.');
  if (!payload || !sig || extra !== undefined) throw invalidLink();
  // Compared as text: base64url decoding forgives trailing junk, so decoded bytes could match a mangled token.
  const want = Buffer.from(b64url(createHmac('sha256', keyFor(secret)).update(payload).digest().subarray(0, 18)));
  const got = Buffer.from(sig);
  if (got.length !== want.length || !timingSafeEqual(got, want)) throw invalidLink();
  const [accountId, category] = Buffer.from(payload, 'base64url').toString('utf8').split('.');
  if (!accountId || !UNSUBSCRIBE_CATEGORIES.includes(category as UnsubscribeCategory)) throw invalidLink();
  return { accountId, category: category as UnsubscribeCategory };
}

/** Turns the category off (or back on) for the account the token names; repeated calls change nothing more. */
export async function applyUnsubscribe(db: Db, secret: string, token: string, subscribed: boolean) {
  const { accountId, category } = verifyUnsubscribeToken(secret, token);
  const [account] = await db.select({ id: accounts.id, deletedAt: accounts.deletedAt }).from(accounts).where(eq(accounts.id, accountId));
  // A deleted account receives nothing anyway; answer the same so the link never reveals account state.
  if (!account || account.deletedAt) return { category, subscribed: false };
  await db.transaction(async (tx) => {
    await tx
      .insert(emailPreferences)
      .values({ accountId, [category]: subscribed })
      .onConflictDoUpdate({ target: emailPreferences.accountId, set: { [category]: subscribed, updatedAt: new Date() } });
    await recordAudit(tx, {
      actorId: accountId,
      action: subscribed ? 'email_choices.resubscribed' : 'email_choices.unsubscribed',
      subjectType: 'account',
      subjectId: accountId,
      after: { [category]: subscribed, via: 'signed link' },
    });
  });
  return { category, subscribed };
}
