import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import type { Config } from '../../config';
import { pledges, memberships } from '../pledges/pledges.tables';
import { campaigns, tiers } from '../campaigns/campaigns.tables';
import { ledgerEntries } from '../ledger/ledger.tables';
import { accounts, accountRoles, authTokens, emailPreferences, identities } from '../accounts/accounts.tables';
import { sessions } from '../auth/auth.tables';
import { paymentCustomers } from '../payments/payments.tables';
import { auditLog } from '../audit/audit.tables';
import { recordAudit } from '../audit/audit.repository';
import { processorUnavailable, type Processor } from '../payments/processor';
import type { PledgesService } from '../pledges/pledges.service';
import { badRequest, conflict, notFound } from '../../errors';
import type { EmailPreferences, MembershipView, ReceiptView } from '../../../shared/schemas/campaign';

const LIVE_SUBSCRIPTION = ['active', 'past_due', 'unpaid', 'trialing', 'incomplete', 'paused'];

export function createMySupportService(deps: { db: Db; config: Config; processor: Processor; pledges: PledgesService }) {
  const { db, config, processor } = deps;
  const stripe = processor.stripe;

  async function ownMembership(accountId: string, membershipId: string) {
    const [row] = await db
      .select()
      .from(memberships)
      .where(and(eq(memberships.id, membershipId), eq(memberships.backerId, accountId)));
    if (!row) throw notFound('memberships.not_found', 'There is no such membership in your account.');
    return row;
  }

  async function membershipViews(rows: (typeof memberships.$inferSelect)[]): Promise<MembershipView[]> {
    if (rows.length === 0) return [];
    const joined = await db
      .select({ pledge: pledges, tierTitle: tiers.title, slug: campaigns.slug, title: campaigns.title })
      .from(pledges)
      .innerJoin(campaigns, eq(campaigns.id, pledges.campaignId))
      .leftJoin(tiers, eq(tiers.id, pledges.tierId))
      .where(
        inArray(
          pledges.id,
          rows.map((r) => r.pledgeId),
        ),
      );
    return rows.map((m) => {
      const j = joined.find((x) => x.pledge.id === m.pledgeId)!;
      return {
        id: m.id,
        pledgeId: m.pledgeId,
        tier: j.pledge.tierId && j.tierTitle ? { id: j.pledge.tierId, title: j.tierTitle } : null,
        campaign: { slug: j.slug, title: j.title },
        amountMinor: j.pledge.amountMinor,
        currency: j.pledge.currency,
        status: m.status,
        currentPeriodEnd: m.currentPeriodEnd?.toISOString() ?? null,
        cancelAtPeriodEnd: m.cancelAtPeriodEnd,
        endedAt: m.endedAt?.toISOString() ?? null,
      };
    });
  }

  async function setCancelAtPeriodEnd(accountId: string, membershipId: string, cancel: boolean) {
    const m = await ownMembership(accountId, membershipId);
    if (!LIVE_SUBSCRIPTION.includes(m.status)) throw conflict('memberships.ended', 'This membership has already ended.');
    let sub;
    try {
      sub = await stripe.subscriptions.update(
        m.subscriptionId,
        { cancel_at_period_end: cancel },
        { idempotencyKey: `sub-cape-${m.subscriptionId}-${cancel}-${Date.now()}` },
      );
    } catch (err) {
      throw processorUnavailable(err);
    }
    const [row] = await db
      .update(memberships)
      .set({ cancelAtPeriodEnd: sub.cancel_at_period_end, status: sub.status, updatedAt: new Date() })
      .where(eq(memberships.id, m.id))
      .returning();
    await db.insert(auditLog).values({
      actorId: accountId,
      action: cancel ? 'membership.cancel_requested' : 'membership.resumed',
      subjectType: 'membership',
      subjectId: m.id,
      before: { cancelAtPeriodEnd: m.cancelAtPeriodEnd },
      after: { cancelAtPeriodEnd: sub.cancel_at_period_end },
    });
    return (await membershipViews([row!]))[0]!;
  }

  return {
    async pledges(accountId: string) {
      const list = await deps.pledges.listOwn(accountId);
      const payments = await deps.pledges.paymentsOf(list.map((p) => p.id));
      return list.map((p) => ({ ...p, payments: payments[p.id] ?? [] }));
    },

    async memberships(accountId: string) {
      const rows = await db.select().from(memberships).where(eq(memberships.backerId, accountId)).orderBy(desc(memberships.createdAt));
      return membershipViews(rows);
    },

    cancelMembership: (accountId: string, id: string) => setCancelAtPeriodEnd(accountId, id, true),
    resumeMembership: (accountId: string, id: string) => setCancelAtPeriodEnd(accountId, id, false),

    /** A card-update page at the processor for the membership's customer. */
    async cardUpdateUrl(accountId: string, id: string) {
      const m = await ownMembership(accountId, id);
      try {
        const portal = await stripe.billingPortal.sessions.create({
          customer: m.customerId,
          return_url: `${config.PUBLIC_URL}/my-support/memberships`,
        });
        return portal.url;
      } catch (err) {
        throw processorUnavailable(err);
      }
    },

    async receipt(account: { id: string; displayName: string }, entryId: number): Promise<ReceiptView> {
      const [row] = await db
        .select({ entry: ledgerEntries, pledge: pledges, slug: campaigns.slug, title: campaigns.title, tierTitle: tiers.title })
        .from(ledgerEntries)
        .innerJoin(pledges, eq(pledges.id, ledgerEntries.pledgeId))
        .innerJoin(campaigns, eq(campaigns.id, pledges.campaignId))
        .leftJoin(tiers, eq(tiers.id, pledges.tierId))
        .where(and(eq(ledgerEntries.id, entryId), eq(pledges.backerId, account.id), inArray(ledgerEntries.kind, ['charge', 'refund'])));
      if (!row) throw notFound('receipts.not_found', 'There is no such payment in your account.');
      return {
        number: `LK-${String(row.entry.id).padStart(6, '0')}`,
        entryId: row.entry.id,
        kind: row.entry.kind as 'charge' | 'refund',
        amountMinor: row.entry.amountMinor,
        currency: row.entry.currency,
        occurredAt: row.entry.occurredAt.toISOString(),
        processorId: row.entry.processorObjectId,
        backerName: account.displayName,
        campaign: { slug: row.slug, title: row.title },
        tier: row.tierTitle,
        pledgeId: row.pledge.id,
        pledgeKind: row.pledge.kind,
      };
    },

    async emailPreferences(accountId: string): Promise<EmailPreferences> {
      const [row] = await db.select().from(emailPreferences).where(eq(emailPreferences.accountId, accountId));
      return { dispatches: row?.dispatches ?? true, receipts: row?.receipts ?? true, membership: row?.membership ?? true };
    },

    async setEmailPreferences(accountId: string, prefs: EmailPreferences): Promise<EmailPreferences> {
      await db
        .insert(emailPreferences)
        .values({ accountId, ...prefs })
        .onConflictDoUpdate({ target: emailPreferences.accountId, set: { ...prefs, updatedAt: new Date() } });
      return this.emailPreferences(accountId);
    },

    /** Everything Lightkeel holds about the account, as one JSON document. */
    async exportData(accountId: string) {
      const [account] = await db.select().from(accounts).where(eq(accounts.id, accountId));
      const roles = await db.select({ role: accountRoles.role }).from(accountRoles).where(eq(accountRoles.accountId, accountId));
      const ids = await db
        .select({ provider: identities.provider, createdAt: identities.createdAt })
        .from(identities)
        .where(eq(identities.accountId, accountId));
      const pledgeList = await this.pledges(accountId);
      const audit = await db
        .select({ at: auditLog.at, action: auditLog.action, subjectType: auditLog.subjectType, subjectId: auditLog.subjectId })
        .from(auditLog)
        .where(eq(auditLog.actorId, accountId))
        .orderBy(desc(auditLog.at))
        .limit(1000);
      return {
        format: 'lightkeel-account-export',
        version: 1,
        exportedAt: new Date().toISOString(),
        account: account
          ? {
              id: account.id,
              email: account.email,
              displayName: account.displayName,
              emailVerifiedAt: account.emailVerifiedAt?.toISOString() ?? null,
              createdAt: account.createdAt.toISOString(),
            }
          : null,
        roles: roles.map((r) => r.role),
        signInMethods: ids.map((i) => ({ provider: i.provider, since: i.createdAt.toISOString() })),
        emailPreferences: await this.emailPreferences(accountId),
        pledges: pledgeList.map(({ checkoutUrl: _c, ...p }) => p),
        memberships: await this.memberships(accountId),
        activity: audit.map((a) => ({ ...a, at: a.at.toISOString() })),
      };
    },

    /**
     * Deletes the account: live memberships are cancelled at the processor first (so nothing is charged
     * again), then in one transaction pledges are kept but anonymised, personal data and sign-in methods
     * go, every session ends, and the audit log records it.
     */
    async deleteAccount(account: { id: string; email: string; roles: readonly string[] }, confirmEmail: string) {
      if (confirmEmail.trim().toLowerCase() !== account.email.toLowerCase()) {
        throw badRequest('account.confirm_mismatch', 'Type your e-mail address exactly to confirm.', [
          { path: 'confirmEmail', message: 'does not match your e-mail address' },
        ]);
      }
      if (account.roles.some((r) => r !== 'backer')) {
        throw conflict('account.staff_cannot_delete', 'Staff accounts are removed by an admin: ask one to revoke your roles first.');
      }
      const live = await db
        .select()
        .from(memberships)
        .where(and(eq(memberships.backerId, account.id), inArray(memberships.status, LIVE_SUBSCRIPTION)));
      for (const m of live) {
        try {
          await stripe.subscriptions.cancel(m.subscriptionId, {}, { idempotencyKey: `cancel-${m.subscriptionId}` });
        } catch (err) {
          const sub = await stripe.subscriptions.retrieve(m.subscriptionId).catch(() => null);
          if (sub?.status !== 'canceled') throw processorUnavailable(err);
        }
      }
      const now = new Date();
      await db.transaction(async (tx) => {
        const anonymised = await tx
          .update(pledges)
          .set({ backerId: null, publicName: null, message: null, anonymisedAt: now, updatedAt: now })
          .where(eq(pledges.backerId, account.id))
          .returning({ id: pledges.id });
        await tx.update(memberships).set({ backerId: null, updatedAt: now }).where(eq(memberships.backerId, account.id));
        await tx.delete(identities).where(eq(identities.accountId, account.id));
        await tx.delete(authTokens).where(eq(authTokens.accountId, account.id));
        await tx.delete(emailPreferences).where(eq(emailPreferences.accountId, account.id));
        await tx.delete(paymentCustomers).where(eq(paymentCustomers.accountId, account.id));
        await tx.delete(accountRoles).where(eq(accountRoles.accountId, account.id));
        await tx
          .update(accounts)
          .set({ email: `deleted-${account.id}@deleted.invalid`, displayName: 'Deleted account', emailVerifiedAt: null, deletedAt: now })
          .where(eq(accounts.id, account.id));
        await tx.delete(sessions).where(sql`${sessions.sess}->'passport'->>'user' = ${account.id}`);
        await recordAudit(tx, {
          actorId: account.id,
          action: 'account.deleted',
          subjectType: 'account',
          subjectId: account.id,
          after: { pledgesAnonymised: anonymised.length, membershipsCancelled: live.length },
        });
      });
    },
  };
}

export type MySupportService = ReturnType<typeof createMySupportService>;
