import { createHash, randomBytes } from 'node:crypto';
import { and, eq, gt, isNull } from 'drizzle-orm';
import { hash, verify, type Algorithm } from '@node-rs/argon2';
import type { Db } from '../../db/client';
import type { Config } from '../../config';
import { queueMail, type DbOrTx } from '../mail/mail-queue';
import { accounts, authTokens, identities } from '../accounts/accounts.tables';
import { createAccountsRepository } from '../accounts/accounts.repository';
import { recordAudit } from '../audit/audit.repository';
import { endOtherSessions } from './sessions.repository';
import { AppError, badRequest } from '../../errors';
import type { SignUpInput } from '../../../shared/schemas/auth';

// Algorithm.Argon2id is 2 (a const enum, which isolatedModules cannot read).
const ARGON2 = { algorithm: 2 as Algorithm, memoryCost: 19456, timeCost: 2, parallelism: 1 } as const;
const RESET_MINUTES = 60;
const VERIFY_HOURS = 48;

/**
 * The one answer to every refused sign-in: unknown address, wrong password, and an account whose address is not yet
 * confirmed (whatever the password). Telling the last apart would say which addresses sign-up had just created — and
 * so which already had an account — so its owner is reminded in the same words everyone gets.
 */
export const invalidCredentials = () =>
  new AppError(
    401,
    'auth.invalid_credentials',
    'That e-mail and password do not match an account we can sign in. Just created one? Open the link in the message we sent you: it confirms your address and signs you in.',
  );

const sha256 = (s: string) => createHash('sha256').update(s).digest('hex');

export function createAuthService({ db, config }: { db: Db; config: Config }) {
  const repo = createAccountsRepository({ db });
  // Verifying against a real hash when the e-mail is unknown keeps the answer time the same.
  const dummyHash = hash('not-a-real-password-lightkeel', ARGON2);

  async function issueToken(tx: DbOrTx, accountId: string, purpose: 'verify-email' | 'reset-password', ttlMs: number) {
    const token = randomBytes(32).toString('base64url');
    const [row] = await tx
      .insert(authTokens)
      .values({ accountId, purpose, tokenHash: sha256(token), expiresAt: new Date(Date.now() + ttlMs) })
      .returning({ id: authTokens.id });
    return { token, tokenId: row!.id };
  }

  async function consumeToken(token: string, purpose: string) {
    return db.transaction(async (tx) => {
      const [row] = await tx
        .update(authTokens)
        .set({ usedAt: new Date() })
        .where(
          and(
            eq(authTokens.tokenHash, sha256(token)),
            eq(authTokens.purpose, purpose),
            isNull(authTokens.usedAt),
            gt(authTokens.expiresAt, new Date()),
          ),
        )
        .returning();
      if (!row) throw badRequest('auth.token_invalid', 'This link has expired or was already used. Ask for a new one.');
      return row;
    });
  }

  /** Issues a verification token and queues its mail, both in `tx` (or a transaction of their own). */
  async function sendVerification(account: { id: string; email: string; displayName: string }, tx?: DbOrTx) {
    const run = async (t: DbOrTx) => {
      const { token, tokenId } = await issueToken(t, account.id, 'verify-email', VERIFY_HOURS * 3600_000);
      await queueMail(t, {
        template: 'verify-email',
        to: account.email,
        category: 'transactional',
        accountId: account.id,
        idempotencyKey: `verify-email/${tokenId}`,
        data: { displayName: account.displayName, verifyUrl: `${config.PUBLIC_URL}/verify-email?token=${token}` },
      });
    };
    if (tx) await run(tx);
    else await db.transaction(run);
  }

  return {
    repo,
    /**
     * Creates the account and queues its verification mail; for an address that already has an account, queues
     * a "someone tried to sign up with your address" notice to its owner instead (at most one an hour). The caller
     * answers the same either way, so sign-up does not tell anyone which addresses have accounts.
     */
    async signUp(input: SignUpInput): Promise<{ created: boolean }> {
      // Hashed in both cases, so both take the same time.
      const passwordHash = await hash(input.password, ARGON2);
      const existing = await repo.findByEmail(input.email);
      if (!existing) {
        try {
          await db.transaction(async (tx) => {
            const row = await repo.create(tx, { email: input.email, displayName: input.displayName });
            await tx.insert(identities).values({ accountId: row.id, provider: 'password', passwordHash });
            await recordAudit(tx, {
              actorId: row.id,
              action: 'account.created',
              subjectType: 'account',
              subjectId: row.id,
              after: { email: row.email, via: 'password' },
            });
            await sendVerification(row, tx);
          });
          return { created: true };
        } catch (err) {
          // A concurrent sign-up took the address: answer as for a known one.
          if (!(err instanceof AppError && err.code === 'auth.email_taken')) throw err;
        }
      }
      const owner = existing ?? (await repo.findByEmail(input.email));
      if (owner) {
        const hour = new Date().toISOString().slice(0, 13);
        await queueMail(db, {
          template: 'sign-up-attempt',
          to: owner.email,
          category: 'transactional',
          accountId: owner.id,
          idempotencyKey: `sign-up-attempt/${owner.id}/${hour}`,
          data: {
            displayName: owner.displayName,
            signInUrl: `${config.PUBLIC_URL}/sign-in`,
            resetUrl: `${config.PUBLIC_URL}/forgot-password`,
          },
        });
      }
      return { created: false };
    },

    /**
     * The account these credentials sign in to, or undefined. An address not yet confirmed signs in only through the
     * link in its confirmation mail: a password that matches one answers as a wrong one (see invalidCredentials).
     */
    async verifyPassword(email: string, password: string) {
      const account = await repo.findByEmail(email);
      const identity = account ? await repo.passwordIdentity(account.id) : undefined;
      const ok = await verify(identity?.passwordHash ?? (await dummyHash), password).catch(() => false);
      if (!account || !identity?.passwordHash || !ok || !account.emailVerifiedAt) return undefined;
      return account;
    },

    /** A first Google sign-in creates the account, or links to one holding the same verified e-mail. */
    async signInWithProvider(provider: string, profile: { subject: string; email?: string; emailVerified: boolean; displayName: string }) {
      return db.transaction(async (tx) => {
        const identity = await repo.findIdentity(provider, profile.subject, tx);
        if (identity) {
          const account = await repo.findById(identity.accountId, tx);
          if (account) return account;
        }
        if (!profile.email || !profile.emailVerified) {
          throw new AppError(
            403,
            'auth.email_unverified',
            'Your provider did not confirm an e-mail address, so we cannot sign you in with it.',
          );
        }
        let account = await repo.findByEmail(profile.email, tx);
        if (account) {
          if (!account.emailVerifiedAt) await tx.update(accounts).set({ emailVerifiedAt: new Date() }).where(eq(accounts.id, account.id));
          await recordAudit(tx, {
            actorId: account.id,
            action: 'identity.linked',
            subjectType: 'account',
            subjectId: account.id,
            after: { provider },
          });
        } else {
          account = await repo.create(tx, { email: profile.email, displayName: profile.displayName || profile.email, emailVerified: true });
          await recordAudit(tx, {
            actorId: account.id,
            action: 'account.created',
            subjectType: 'account',
            subjectId: account.id,
            after: { email: account.email, via: provider },
          });
        }
        await tx.insert(identities).values({ accountId: account.id, provider, subject: profile.subject });
        return account;
      });
    },

    sendVerification,

    /** Confirms the address the token was sent to; returns its account, which the link signs in. */
    async verifyEmail(token: string) {
      const row = await consumeToken(token, 'verify-email');
      await db
        .update(accounts)
        .set({ emailVerifiedAt: new Date() })
        .where(and(eq(accounts.id, row.accountId), isNull(accounts.emailVerifiedAt)));
      const account = await repo.findById(row.accountId);
      if (!account) throw badRequest('auth.token_invalid', 'This link has expired or was already used. Ask for a new one.');
      return account;
    },

    async requestPasswordReset(email: string) {
      const account = await repo.findByEmail(email);
      if (!account) return;
      await db.transaction(async (tx) => {
        const { token, tokenId } = await issueToken(tx, account.id, 'reset-password', RESET_MINUTES * 60_000);
        await queueMail(tx, {
          template: 'password-reset',
          to: account.email,
          category: 'transactional',
          accountId: account.id,
          idempotencyKey: `password-reset/${tokenId}`,
          data: {
            displayName: account.displayName,
            resetUrl: `${config.PUBLIC_URL}/reset-password?token=${token}`,
            expiresInMinutes: RESET_MINUTES,
          },
        });
      });
    },

    /** Sets the new password and ends the account's sessions in every other browser (`keepSessionId` stays). */
    async resetPassword(token: string, password: string, { keepSessionId }: { keepSessionId?: string } = {}) {
      const passwordHash = await hash(password, ARGON2);
      const row = await consumeToken(token, 'reset-password');
      await db.transaction(async (tx) => {
        const existing = await repo.passwordIdentity(row.accountId, tx);
        if (existing) await tx.update(identities).set({ passwordHash }).where(eq(identities.id, existing.id));
        else await tx.insert(identities).values({ accountId: row.accountId, provider: 'password', passwordHash });
        // A reset also proves the mailbox.
        await tx
          .update(accounts)
          .set({ emailVerifiedAt: new Date() })
          .where(and(eq(accounts.id, row.accountId), isNull(accounts.emailVerifiedAt)));
        await recordAudit(tx, { actorId: row.accountId, action: 'password.reset', subjectType: 'account', subjectId: row.accountId });
        await endOtherSessions(tx, { accountId: row.accountId, keepSessionId });
        const account = await repo.findById(row.accountId, tx);
        if (account) {
          await queueMail(tx, {
            template: 'password-changed',
            to: account.email,
            category: 'transactional',
            accountId: account.id,
            idempotencyKey: `password-changed/${row.id}`,
            data: { displayName: account.displayName, changedAt: new Date(), resetUrl: `${config.PUBLIC_URL}/forgot-password` },
          });
        }
      });
    },
  };
}

export type AuthService = ReturnType<typeof createAuthService>;
