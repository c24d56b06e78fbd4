import { and, asc, eq, isNull, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { booksSettings, receipts } from './books.tables';
import { ledgerEntries } from '../ledger/ledger.tables';
import { pledges } from '../pledges/pledges.tables';
import { campaigns, tiers } from '../campaigns/campaigns.tables';
import { accounts } from '../accounts/accounts.tables';
import { recordAudit } from '../audit/audit.repository';
import { notFound } from '../../errors';
import type { BooksSettingsInput } from '../../../shared/schemas/books';
import { renderReceiptPdf, renderYearlySummaryPdf, type Organisation } from './pdf';

type Viewer = { id: string; roles: string[] };
const isBooksStaff = (v: Viewer) => v.roles.includes('finance') || v.roles.includes('admin');

export function createReceiptsService({ db }: { db: Db }) {
  async function settings(): Promise<Organisation & { updatedAt: string }> {
    const [row] = await db.select().from(booksSettings).where(eq(booksSettings.id, 1));
    return {
      organisationName: row?.organisationName ?? '',
      address: row?.address ?? '',
      registrationNumber: row?.registrationNumber ?? '',
      updatedAt: (row?.updatedAt ?? new Date(0)).toISOString(),
    };
  }

  async function render(receiptId: string, mayRead: (backerId: string | null) => boolean) {
    const [row] = await db
      .select({ r: receipts, charge: ledgerEntries, title: campaigns.title, tierTitle: tiers.title, name: accounts.displayName })
      .from(receipts)
      .innerJoin(ledgerEntries, eq(ledgerEntries.id, receipts.ledgerEntryId))
      .leftJoin(pledges, eq(pledges.id, receipts.pledgeId))
      .leftJoin(campaigns, eq(campaigns.id, pledges.campaignId))
      .leftJoin(tiers, eq(tiers.id, pledges.tierId))
      .leftJoin(accounts, eq(accounts.id, receipts.backerId))
      .where(eq(receipts.id, receiptId));
    if (!row || !mayRead(row.r.backerId)) throw notFound('receipts.not_found', 'There is no such receipt in your account.');
    const [replaces] = row.r.replacesReceiptId ? await db.select().from(receipts).where(eq(receipts.id, row.r.replacesReceiptId)) : [];
    const [replacedBy] = await db.select().from(receipts).where(eq(receipts.replacesReceiptId, row.r.id));
    const pdf = await renderReceiptPdf({
      org: await settings(),
      number: row.r.number,
      kind: row.r.kind === 'correction' ? 'correction' : 'payment',
      issuedAt: row.r.issuedAt,
      paidAt: row.charge.occurredAt,
      backerName: row.name ?? 'Backer',
      campaignTitle: row.title ?? '',
      tierTitle: row.tierTitle,
      chargedMinor: row.charge.amountMinor,
      amountMinor: row.r.amountMinor,
      currency: row.r.currency,
      processorChargeId: row.charge.processorObjectId,
      voided: row.r.voidedAt !== null,
      replacesNumber: replaces?.number ?? null,
      replacedByNumber: replacedBy?.number ?? null,
    });
    return { pdf, filename: `receipt-${String(row.r.number).padStart(6, '0')}.pdf` };
  }

  return {
    settings,

    async saveSettings(input: BooksSettingsInput, actorId: string) {
      const before = await settings();
      await db.transaction(async (tx) => {
        await tx
          .insert(booksSettings)
          .values({ id: 1, ...input, updatedBy: actorId })
          .onConflictDoUpdate({ target: booksSettings.id, set: { ...input, updatedBy: actorId, updatedAt: new Date() } });
        await recordAudit(tx, {
          actorId,
          action: 'books.settings_changed',
          subjectType: 'books_settings',
          subjectId: '1',
          before,
          after: input,
        });
      });
      return settings();
    },

    /** Receipts of the viewer (a backer sees their own). */
    async listOwn(accountId: string) {
      const rows = await db
        .select({ r: receipts, title: campaigns.title })
        .from(receipts)
        .leftJoin(pledges, eq(pledges.id, receipts.pledgeId))
        .leftJoin(campaigns, eq(campaigns.id, pledges.campaignId))
        .where(eq(receipts.backerId, accountId))
        .orderBy(asc(receipts.number));
      return rows.map(({ r, title }) => ({
        id: r.id,
        number: r.number,
        kind: r.kind,
        ledgerEntryId: r.ledgerEntryId,
        amountMinor: r.amountMinor,
        currency: r.currency,
        voided: r.voidedAt !== null,
        issuedAt: r.issuedAt.toISOString(),
        campaignTitle: title ?? '',
      }));
    },

    /** The receipt's PDF for its backer or books staff; anyone else is told there is no such receipt. */
    async receiptPdf(receiptId: string, viewer: Viewer) {
      return render(receiptId, (backerId) => backerId === viewer.id || isBooksStaff(viewer));
    },

    /** The receipt's PDF for the mail sender (the message goes to the receipt's own backer). */
    async receiptPdfForMail(receiptId: string) {
      return render(receiptId, () => true);
    },

    /** The current (not void) receipt of a charge ledger row, for the my-support page and e-mail link. */
    async currentForEntry(entryId: number, viewer: Viewer) {
      const [row] = await db
        .select()
        .from(receipts)
        .where(and(eq(receipts.ledgerEntryId, entryId), isNull(receipts.voidedAt)));
      if (!row || (row.backerId !== viewer.id && !isBooksStaff(viewer)))
        throw notFound('receipts.not_found', 'There is no such receipt in your account.');
      return row;
    },

    async yearlyPdf(accountId: string, year: number) {
      const [account] = await db.select().from(accounts).where(eq(accounts.id, accountId));
      const rows = await db
        .select({ r: receipts, title: campaigns.title, paidAt: ledgerEntries.occurredAt })
        .from(receipts)
        .innerJoin(ledgerEntries, eq(ledgerEntries.id, receipts.ledgerEntryId))
        .leftJoin(pledges, eq(pledges.id, receipts.pledgeId))
        .leftJoin(campaigns, eq(campaigns.id, pledges.campaignId))
        .where(
          and(
            eq(receipts.backerId, accountId),
            isNull(receipts.voidedAt),
            sql`extract(year from ${ledgerEntries.occurredAt} at time zone 'UTC') = ${year}`,
          ),
        )
        .orderBy(asc(ledgerEntries.occurredAt));
      const totals = new Map<string, number>();
      for (const { r } of rows) totals.set(r.currency, (totals.get(r.currency) ?? 0) + r.amountMinor);
      const pdf = await renderYearlySummaryPdf({
        org: await settings(),
        year,
        backerName: account?.displayName ?? 'Backer',
        lines: rows.map(({ r, title, paidAt }) => ({
          date: paidAt,
          campaignTitle: title ?? '',
          number: r.number,
          amountMinor: r.amountMinor,
          currency: r.currency,
        })),
        totals: [...totals].map(([currency, amountMinor]) => ({ currency, amountMinor })),
      });
      return { pdf, filename: `yearly-summary-${year}.pdf` };
    },
  };
}

export type ReceiptsService = ReturnType<typeof createReceiptsService>;
