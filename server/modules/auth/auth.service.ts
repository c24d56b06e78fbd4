import { createHash, randomBytes } from 'node:crypto';
import { and, eq, gt, isNull } from 'drizzle-orm';
import { hash, verify, type Algorithm } from '@node-rs/argon2';
import type { Db } from '../../db/client';
import type { Config } from '../../config';
import { queueMail, type DbOrTx } from '../mail/mail-queue';
import { accounts, authTokens, identities } from '../accounts/accounts.tables';
import { createAccountsRepository } from '../accounts/accounts.repository';
import { recordAudit } from '../audit/audit.repository';
import { AppError, badRequest } from '../../errors';
import type { SignUpInput } from '../../../shared/schemas/auth';

// Algorithm.Argon2id is 2 (a const enum, which isolatedModules cannot read).
const ARGON2 = { algorithm: 2 as Algorithm, memoryCost: 19456, timeCost: 2, parallelism: 1 } as const;
const RESET_MINUTES = 60;
const VERIFY_HOURS = 48;

export const invalidCredentials = () => new AppError(401, 'auth.invalid_credentials', 'That e-mail and password do not match an account.');

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
    async signUp(input: SignUpInput) {
      const passwordHash = await hash(input.password, ARGON2);
      const account = await db.transaction(async (tx) => {
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
        return row;
      });
      return account;
    },

    async verifyPassword(email: string, password: string) {
      const account = await repo.findByEmail(email);
      const identity = account ? await repo.passwordIdentity(account.id) : undefined;
      const ok = await verify(identity?.passwordHash ?? (await dummyHash), password).catch(() => false);
      if (!account || !identity?.passwordHash || !ok) return undefined;
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

    async verifyEmail(token: string) {
      const row = await consumeToken(token, 'verify-email');
      await db.update(accounts).set({ emailVerifiedAt: new Date() }).where(eq(accounts.id, row.accountId));
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

    async resetPassword(token: string, password: string) {
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
      });
    },
  };
}

export type AuthService = ReturnType<typeof createAuthService>;
