import { and, asc, desc, eq, inArray } from 'drizzle-orm';
import type pg from 'pg';
import type { Db } from '../../db/client';
import { budgetLines, campaigns, stretchTargets, tiers } from './campaigns.tables';
import { budgetTotalMinor, fillBudget } from '../../../shared/flight-budget';
import type { BudgetLinesInput } from '../../../shared/schemas/budget-lines';
import { pledges } from '../pledges/pledges.tables';
import { campaignReadSql, type CampaignReadRow } from './campaign-read.sql';
import { recordAudit } from '../audit/audit.repository';
import { diffFields } from '../audit/audit-diff';
import { badRequest, conflict, notFound } from '../../errors';
import type { CampaignView, StretchTargetsInput, TierInput, TierView, UpdateCampaignInput } from '../../../shared/schemas/campaign';

export const campaignNotFound = (slug: string) => notFound('campaigns.not_found', `There is no campaign "${slug}".`);

function tierView(t: CampaignReadRow['tiers'][number]): TierView {
  const remaining = t.quantityLimit === null ? null : Math.max(0, t.quantityLimit - t.soldCount);
  return {
    id: t.id,
    title: t.title,
    description: t.description,
    minAmountMinor: Number(t.minAmountMinor),
    kind: t.kind,
    quantityLimit: t.quantityLimit,
    remaining,
    soldOut: remaining === 0,
    estimatedDelivery: t.estimatedDelivery,
    position: t.position,
    active: t.active,
  };
}

/** Builds the public view from the one-row query; `now` decides status and time left. */
export function campaignViewOf(row: CampaignReadRow, now: Date, opts: { includeInactive?: boolean } = {}): CampaignView {
  const startsAt = new Date(row.startsAt);
  const endsAt = new Date(row.endsAt);
  const raisedMinor = Number(row.raisedMinor);
  const goalMinor = Number(row.goalMinor);
  const status = now < startsAt ? 'upcoming' : now >= endsAt ? 'ended' : 'open';
  return {
    id: row.id,
    slug: row.slug,
    title: row.title,
    summary: row.summary,
    story: row.story,
    goalMinor,
    currency: row.currency,
    startsAt: startsAt.toISOString(),
    endsAt: endsAt.toISOString(),
    tiers: row.tiers.filter((t) => opts.includeInactive || t.active).map(tierView),
    stretchTargets: row.stretchTargets.map((s) => ({
      ...s,
      amountMinor: Number(s.amountMinor),
      reached: raisedMinor >= Number(s.amountMinor),
    })),
    budgetLines: fillBudget(
      row.budgetLines.map((b) => ({ ...b, amountMinor: Number(b.amountMinor) })),
      raisedMinor,
    ),
    progress: {
      raisedMinor,
      goalMinor,
      currency: row.currency,
      backers: Number(row.backers),
      percent: Math.floor((raisedMinor * 100) / goalMinor),
      status,
      secondsLeft:
        status === 'ended' ? 0 : Math.max(0, Math.floor((endsAt.getTime() - Math.max(now.getTime(), startsAt.getTime())) / 1000)),
      asOf: now.toISOString(),
    },
  };
}

/**
 * Campaign reads and staff edits. Public reads go through a short in-memory cache (`cacheMs`): progress is
 * promised "consistent within seconds", and this process clears the cache itself whenever it moves money.
 */
export function createCampaignsService({ db, pool, cacheMs }: { db: Db; pool: pg.Pool; cacheMs: number }) {
  const cache = new Map<string, { at: number; row: CampaignReadRow | null }>();

  async function readRow(slug: string): Promise<CampaignReadRow | null> {
    const hit = cache.get(slug);
    if (hit && Date.now() - hit.at < cacheMs) return hit.row;
    // A named statement: each pooled connection parses and plans it once, then only binds the slug.
    const res = await pool.query<{ campaign: CampaignReadRow }>({ name: 'campaign-read', text: campaignReadSql, values: [slug] });
    const row = res.rows[0]?.campaign ?? null;
    if (cacheMs > 0) cache.set(slug, { at: Date.now(), row });
    return row;
  }

  async function requireCampaign(slug: string, tx: Db = db) {
    const [row] = await tx.select().from(campaigns).where(eq(campaigns.slug, slug));
    if (!row) throw campaignNotFound(slug);
    return row;
  }

  const tierRowView = (t: typeof tiers.$inferSelect) => tierView({ ...t, estimatedDelivery: t.estimatedDelivery ?? null });

  return {
    invalidate() {
      cache.clear();
    },

    async view(slug: string, opts: { fresh?: boolean; includeInactive?: boolean } = {}): Promise<CampaignView> {
      if (opts.fresh) cache.delete(slug);
      const row = await readRow(slug);
      if (!row) throw campaignNotFound(slug);
      return campaignViewOf(row, new Date(), opts);
    },

    async list() {
      const rows = await db.select({ slug: campaigns.slug }).from(campaigns).orderBy(desc(campaigns.startsAt));
      const out: CampaignView[] = [];
      for (const r of rows) out.push(await this.view(r.slug));
      return out.map(({ story: _story, tiers: _tiers, stretchTargets: _s, ...rest }) => rest);
    },

    /** Public names and messages of paid pledges, newest first; anonymous pledges show no name. */
    async backers(slug: string, limit: number) {
      const campaign = await requireCampaign(slug);
      const rows = await db
        .select({
          id: pledges.id,
          publicName: pledges.publicName,
          message: pledges.message,
          tierTitle: tiers.title,
          kind: pledges.kind,
          paidAt: pledges.paidAt,
        })
        .from(pledges)
        .leftJoin(tiers, eq(tiers.id, pledges.tierId))
        .where(and(eq(pledges.campaignId, campaign.id), inArray(pledges.state, ['paid', 'partly_refunded'])))
        .orderBy(desc(pledges.paidAt))
        .limit(limit);
      return rows.map((r) => ({
        id: r.id,
        name: r.publicName,
        message: r.message,
        tier: r.tierTitle,
        kind: r.kind,
        paidAt: r.paidAt?.toISOString() ?? null,
      }));
    },

    requireCampaign,

    async update({ actorId, slug, input }: { actorId: string; slug: string; input: UpdateCampaignInput }) {
      await db.transaction(async (tx) => {
        const [before] = await tx.select().from(campaigns).where(eq(campaigns.slug, slug)).for('update');
        if (!before) throw campaignNotFound(slug);
        if (input.currency !== before.currency) {
          const [any] = await tx.select({ id: pledges.id }).from(pledges).where(eq(pledges.campaignId, before.id)).limit(1);
          if (any) throw conflict('campaigns.currency_locked', 'The currency cannot change once anyone has pledged.');
        }
        const values = {
          title: input.title,
          summary: input.summary,
          story: input.story,
          goalMinor: input.goalMinor,
          currency: input.currency,
          startsAt: new Date(input.startsAt),
          endsAt: new Date(input.endsAt),
        };
        // Only what changed is written and recorded; a save without change leaves the row and the log alone.
        const diff = diffFields(before, values);
        if (!diff) return;
        const changed = Object.fromEntries(Object.keys(diff.after).map((k) => [k, values[k as keyof typeof values]]));
        await tx
          .update(campaigns)
          .set({ ...changed, updatedAt: new Date() })
          .where(eq(campaigns.id, before.id));
        await recordAudit(tx, { actorId, action: 'campaign.updated', subjectType: 'campaign', subjectId: before.id, ...diff });
      });
      cache.clear();
      return this.view(slug, { fresh: true, includeInactive: true });
    },

    async createTier({ actorId, slug, input }: { actorId: string; slug: string; input: TierInput }) {
      const tier = await db.transaction(async (tx) => {
        const campaign = await requireCampaign(slug, tx);
        const [row] = await tx
          .insert(tiers)
          .values({ ...input, campaignId: campaign.id })
          .returning();
        await recordAudit(tx, { actorId, action: 'tier.created', subjectType: 'tier', subjectId: row!.id, after: input });
        return row!;
      });
      cache.clear();
      return tierRowView(tier);
    },

    async updateTier({ actorId, slug, tierId, input }: { actorId: string; slug: string; tierId: string; input: TierInput }) {
      const tier = await db.transaction(async (tx) => {
        const campaign = await requireCampaign(slug, tx);
        const [before] = await tx
          .select()
          .from(tiers)
          .where(and(eq(tiers.id, tierId), eq(tiers.campaignId, campaign.id)))
          .for('update');
        if (!before) throw notFound('campaigns.tier_not_found', 'This campaign has no such tier.');
        if (input.kind !== before.kind && before.soldCount > 0) {
          throw conflict('campaigns.tier_kind_locked', 'A tier that has backers cannot switch between one-time and monthly.');
        }
        if (input.quantityLimit !== null && input.quantityLimit < before.soldCount) {
          throw badRequest('campaigns.tier_limit_below_sold', `The limit cannot go below the ${before.soldCount} slots already taken.`, [
            { path: 'quantityLimit', message: `must be at least ${before.soldCount}` },
          ]);
        }
        const diff = diffFields(before, input);
        if (!diff) return before;
        const [row] = await tx
          .update(tiers)
          .set({
            ...input,
            // A new minimum needs a new processor price for monthly tiers.
            processorPriceId: input.minAmountMinor === before.minAmountMinor && input.kind === before.kind ? before.processorPriceId : null,
            updatedAt: new Date(),
          })
          .where(eq(tiers.id, before.id))
          .returning();
        await recordAudit(tx, { actorId, action: 'tier.updated', subjectType: 'tier', subjectId: before.id, ...diff });
        return row!;
      });
      cache.clear();
      return tierRowView(tier);
    },

    async replaceStretchTargets({ actorId, slug, input }: { actorId: string; slug: string; input: StretchTargetsInput }) {
      await db.transaction(async (tx) => {
        const campaign = await requireCampaign(slug, tx);
        const before = await tx
          .select()
          .from(stretchTargets)
          .where(eq(stretchTargets.campaignId, campaign.id))
          .orderBy(asc(stretchTargets.amountMinor));
        const listed = (rows: { amountMinor: number; title: string }[]) =>
          rows.map((b) => ({ amountMinor: b.amountMinor, title: b.title }));
        const diff = diffFields({ targets: listed(before) }, { targets: listed(input.targets) });
        if (!diff) return;
        await tx.delete(stretchTargets).where(eq(stretchTargets.campaignId, campaign.id));
        if (input.targets.length > 0) await tx.insert(stretchTargets).values(input.targets.map((t) => ({ ...t, campaignId: campaign.id })));
        await recordAudit(tx, {
          actorId,
          action: 'campaign.stretch_targets_replaced',
          subjectType: 'campaign',
          subjectId: campaign.id,
          ...diff,
        });
      });
      cache.clear();
      return this.view(slug, { fresh: true, includeInactive: true });
    },

    /** Replaces the flight budget; with lines, the goal becomes their sum in the same transaction. */
    async replaceBudgetLines({ actorId, slug, input }: { actorId: string; slug: string; input: BudgetLinesInput }) {
      await db.transaction(async (tx) => {
        const campaign = await requireCampaign(slug, tx);
        const before = await tx
          .select()
          .from(budgetLines)
          .where(eq(budgetLines.campaignId, campaign.id))
          .orderBy(asc(budgetLines.position));
        const same =
          before.length === input.lines.length &&
          before.every(
            (b, i) =>
              b.name === input.lines[i]!.name && b.amountMinor === input.lines[i]!.amountMinor && b.reason === input.lines[i]!.reason,
          );
        if (same) return;
        await tx.delete(budgetLines).where(eq(budgetLines.campaignId, campaign.id));
        if (input.lines.length > 0) {
          await tx.insert(budgetLines).values(input.lines.map((l, position) => ({ ...l, position, campaignId: campaign.id })));
          const goalMinor = budgetTotalMinor(input.lines);
          if (goalMinor !== campaign.goalMinor)
            await tx.update(campaigns).set({ goalMinor, updatedAt: new Date() }).where(eq(campaigns.id, campaign.id));
        }
        await recordAudit(tx, {
          actorId,
          action: 'campaign.budget_lines_replaced',
          subjectType: 'campaign',
          subjectId: campaign.id,
          before: { lines: before.map((b) => ({ name: b.name, amountMinor: b.amountMinor })), goalMinor: campaign.goalMinor },
          after: {
            lines: input.lines.map((b) => ({ name: b.name, amountMinor: b.amountMinor })),
            goalMinor: input.lines.length ? budgetTotalMinor(input.lines) : campaign.goalMinor,
          },
        });
      });
      cache.clear();
      return this.view(slug, { fresh: true, includeInactive: true });
    },
  };
}

export type CampaignsService = ReturnType<typeof createCampaignsService>;
