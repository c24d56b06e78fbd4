import { randomBytes } from 'node:crypto';
import { and, desc, eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { accounts } from '../accounts/accounts.tables';
import { recordAudit } from '../audit/audit.repository';
import { diffFields } from '../audit/audit-diff';
import type { Role } from '../../../shared/schemas/auth';
import type { CreateSnapshotInput } from '../../../shared/schemas/orbit';
import type { SnapshotData, SnapshotSeriesKey } from '../../../shared/charts/snapshot-chart';
import type { SnapshotReply, SnapshotSummaryReply } from '../../../shared/schemas/orbit-replies';
import { snapshots, spacecraft } from './orbit.tables';
import { snapshotNotFound, snapshotNotYours, spacecraftNotFound } from './orbit.errors';
import type { OrbitService } from './orbit.service';

type SnapshotRow = typeof snapshots.$inferSelect;

const SERIES_OF: Record<SnapshotSeriesKey, 'apogeeKm' | 'perigeeKm' | 'meanAltitudeKm' | 'semiMajorAxisKm' | 'energyJPerKg'> = {
  apogee: 'apogeeKm',
  perigee: 'perigeeKm',
  meanAltitude: 'meanAltitudeKm',
  semiMajorAxis: 'semiMajorAxisKm',
  energy: 'energyJPerKg',
};

function newSlug(craftSlug: string) {
  // 10 base-32 characters: unguessable enough for an unlisted public link, short enough to read out.
  const alphabet = 'abcdefghjkmnpqrstuvwxyz23456789';
  const bytes = randomBytes(10);
  let s = '';
  for (const b of bytes) s += alphabet[b % alphabet.length];
  return `${craftSlug}-${s}`;
}

export function snapshotView(row: SnapshotRow, owner: { id: string; displayName: string } | null): SnapshotSummaryReply {
  return {
    id: row.id,
    slug: row.slug,
    spacecraftId: row.spacecraftId,
    title: row.title,
    caption: row.caption,
    isPublic: row.isPublic,
    owner,
    publicPath: `/snapshots/${row.slug}`,
    svgPath: `/api/public/snapshots/${row.slug}.svg`,
    pngPath: `/api/public/snapshots/${row.slug}.png`,
    window: { fromMs: (row.data as SnapshotData).fromMs, toMs: (row.data as SnapshotData).toMs },
    series: (row.data as SnapshotData).series,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}
export type SnapshotView = SnapshotSummaryReply;

/** One snapshot with its frozen points. */
export function snapshotDetailView(row: SnapshotRow, owner: { id: string; displayName: string } | null): SnapshotReply {
  return { ...snapshotView(row, owner), data: row.data as SnapshotData };
}

export function createSnapshotsService({ db, orbit }: { db: Db; orbit: OrbitService }) {
  const withOwner = {
    row: snapshots,
    ownerName: accounts.displayName,
  };

  async function load(id: string) {
    const [r] = await db
      .select(withOwner)
      .from(snapshots)
      .leftJoin(accounts, eq(accounts.id, snapshots.ownerId))
      .where(eq(snapshots.id, id));
    if (!r) throw snapshotNotFound();
    return r;
  }

  function ownerOf(r: { row: SnapshotRow; ownerName: string | null }) {
    return r.row.ownerId ? { id: r.row.ownerId, displayName: r.ownerName ?? '' } : null;
  }

  function mayChange(actor: { id: string; roles: readonly Role[] }, row: SnapshotRow) {
    if (row.ownerId !== actor.id && !actor.roles.includes('admin')) throw snapshotNotYours();
  }

  return {
    /** Freezes the chart as it is now: the points in the window, the periods, the rate lines, the notes. */
    async create(actorId: string, input: CreateSnapshotInput) {
      // Without a craft named: the mission's own.
      const [craft] = await db
        .select()
        .from(spacecraft)
        .where(input.spacecraftId ? eq(spacecraft.id, input.spacecraftId) : eq(spacecraft.isMissionCraft, true));
      if (!craft) throw spacecraftNotFound();
      const rateFromMs = input.rateFromMs ?? input.fromMs;
      const rateToMs = input.rateToMs ?? input.toMs;
      const trend = await orbit.getTrend(craft.id, { fromMs: rateFromMs, toMs: rateToMs });
      const keep: number[] = [];
      for (let i = 0; i < trend.series.epochMs.length; i++) {
        const t = trend.series.epochMs[i]!;
        if (t >= input.fromMs && t <= input.toMs) keep.push(i);
      }
      const outlierSet = new Set(trend.series.outlier);
      const values: SnapshotData['points']['values'] = {};
      for (const s of input.series) values[s] = keep.map((i) => trend.series[SERIES_OF[s]][i]!);
      const rateLines: SnapshotData['rateLines'] = {};
      for (const s of input.series) rateLines[s] = trend.rateLines?.[s] ?? null;
      const data: SnapshotData = {
        version: 1,
        spacecraftName: craft.name,
        fromMs: input.fromMs,
        toMs: input.toMs,
        series: input.series,
        points: { epochMs: keep.map((i) => trend.series.epochMs[i]!), values, outlier: keep.map((i) => outlierSet.has(i)) },
        sailingPeriods: trend.sailingPeriods
          .filter((p) => Date.parse(p.endAt) > input.fromMs && Date.parse(p.startAt) < input.toMs)
          .map((p) => ({ startMs: Date.parse(p.startAt), endMs: Date.parse(p.endAt), mode: p.mode })),
        annotations: input.annotations,
        rateLines,
        rateWindow: trend.rates ? { fromMs: rateFromMs, toMs: rateToMs } : null,
      };
      const row = await db.transaction(async (tx) => {
        const [created] = await tx
          .insert(snapshots)
          .values({
            slug: newSlug(craft.slug),
            spacecraftId: craft.id,
            ownerId: actorId,
            title: input.title,
            caption: input.caption,
            isPublic: input.isPublic,
            data,
          })
          .returning();
        await recordAudit(tx, {
          actorId,
          action: 'snapshot.created',
          subjectType: 'snapshot',
          subjectId: created!.id,
          after: { title: input.title, isPublic: input.isPublic },
        });
        return created!;
      });
      return await this.get(row.id);
    },

    async list(opts: { ownerId?: string; spacecraftId?: string }) {
      const where = and(
        opts.ownerId ? eq(snapshots.ownerId, opts.ownerId) : undefined,
        opts.spacecraftId ? eq(snapshots.spacecraftId, opts.spacecraftId) : undefined,
      );
      const rows = await db
        .select(withOwner)
        .from(snapshots)
        .leftJoin(accounts, eq(accounts.id, snapshots.ownerId))
        .where(where)
        .orderBy(desc(snapshots.createdAt))
        .limit(500);
      return rows.map((r) => snapshotView(r.row, ownerOf(r)));
    },

    async get(id: string) {
      const r = await load(id);
      return snapshotDetailView(r.row, ownerOf(r));
    },

    async getRow(id: string) {
      return (await load(id)).row;
    },

    async getPublic(slug: string) {
      const [r] = await db
        .select(withOwner)
        .from(snapshots)
        .leftJoin(accounts, eq(accounts.id, snapshots.ownerId))
        .where(and(eq(snapshots.slug, slug), eq(snapshots.isPublic, true)));
      if (!r) throw snapshotNotFound();
      return r.row;
    },

    async update(
      actor: { id: string; roles: readonly Role[] },
      id: string,
      patch: { title?: string; caption?: string; isPublic?: boolean },
    ) {
      const before = (await load(id)).row;
      mayChange(actor, before);
      const diff = diffFields(before, { title: patch.title, caption: patch.caption, isPublic: patch.isPublic });
      if (!diff) return this.get(id);
      await db.transaction(async (tx) => {
        await tx
          .update(snapshots)
          .set({ ...diff.after, updatedAt: new Date() })
          .where(eq(snapshots.id, id));
        await recordAudit(tx, { actorId: actor.id, action: 'snapshot.updated', subjectType: 'snapshot', subjectId: id, ...diff });
      });
      return this.get(id);
    },

    async remove(actor: { id: string; roles: readonly Role[] }, id: string) {
      const before = (await load(id)).row;
      mayChange(actor, before);
      await db.transaction(async (tx) => {
        await tx.delete(snapshots).where(eq(snapshots.id, id));
        await recordAudit(tx, {
          actorId: actor.id,
          action: 'snapshot.deleted',
          subjectType: 'snapshot',
          subjectId: id,
          before: { title: before.title, slug: before.slug },
        });
      });
    },
  };
}
export type SnapshotsService = ReturnType<typeof createSnapshotsService>;
