import { randomBytes } from 'node:crypto';
import { and, desc, eq, inArray } from 'drizzle-orm';
import type pg from 'pg';
import type { Db } from '../../db/client';
import type { Config } from '../../config';
import type { JobSender } from '../../jobs/queue';
import type { FileStorage } from '../../lib/storage';
import { withTransaction, type SqlExecutor } from '../../lib/pg-transaction';
import { excerptOf, renderMarkdown } from '../../lib/markdown';
import { recordAudit } from '../audit/audit.repository';
import { accounts } from '../accounts/accounts.tables';
import { tiers } from '../campaigns/campaigns.tables';
import { snapshots } from '../orbit/orbit.tables';
import { renderSnapshotPng } from '../orbit/snapshot-render';
import type { SnapshotData } from '../../../shared/charts/snapshot-chart';
import type { Role } from '../../../shared/schemas/auth';
import {
  AUDIENCE_LABEL,
  DISPATCH_TRANSITIONS,
  type DispatchDetail,
  type DispatchFeedItem,
  type DispatchSummary,
  type DispatchVersionView,
  type PublicDispatchView,
  type SaveDispatch,
  type TransitionDispatch,
  heroAltSchema,
} from '../../../shared/schemas/dispatch';
import { dispatches, dispatchSends, dispatchVersions, storedFiles, type StoredDispatchChart } from './dispatches.tables';
import {
  alreadyEmailed,
  badTransition,
  dispatchNotFound,
  jobsUnavailable,
  heroAltInvalid,
  notPublished,
  snapshotMissing,
  tierMissing,
} from './dispatches.errors';
import { checkHeroImage } from './hero-image';
import { isInAudience } from './audience';

type DispatchRow = typeof dispatches.$inferSelect;
type Actor = { id: string; roles: readonly Role[] };
/** A viewer of the public pages: null when signed out. */
type Viewer = { id: string; roles: readonly Role[] } | null;

export const DISPATCH_PUBLISH_QUEUE = 'dispatch-publish';
export const DISPATCH_FAN_OUT_QUEUE = 'dispatch-fan-out';

export const fileUrlPath = (key: string) => `/api/files/${key}`;
const STAFF: readonly Role[] = ['outreach', 'admin'];

function slugify(title: string): string {
  const base = title
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 48)
    .replace(/-+$/, '');
  return `${base || 'dispatch'}-${randomBytes(3).toString('hex')}`;
}

function randomKey(prefix: string, ext: string) {
  return `${prefix}/${randomBytes(12).toString('hex')}.${ext}`;
}

function summary(row: DispatchRow): DispatchSummary {
  return {
    id: row.id,
    slug: row.slug,
    title: row.title,
    state: row.state,
    audience: { kind: row.audienceKind, tierIds: row.audienceTierIds },
    publishAt: row.publishAt?.toISOString() ?? null,
    publishedAt: row.publishedAt?.toISOString() ?? null,
    updatedAt: row.updatedAt.toISOString(),
    version: row.version,
    emailOnPublish: row.emailOnPublish,
  };
}

function chartViews(charts: StoredDispatchChart[]) {
  return charts.map((c) => ({
    snapshotId: c.snapshotId,
    title: c.title,
    caption: c.caption,
    alt: c.alt,
    imagePath: fileUrlPath(c.imageKey),
  }));
}

export type DispatchesServiceDeps = { db: Db; pool: pg.Pool; config: Config; storage: FileStorage; jobs?: JobSender };

export function createDispatchesService(deps: DispatchesServiceDeps) {
  const { db, pool, storage } = deps;

  async function load(id: string, tx: Db = db): Promise<DispatchRow> {
    const [row] = await tx.select().from(dispatches).where(eq(dispatches.id, id));
    if (!row) throw dispatchNotFound();
    return row;
  }

  async function storeFile(
    tx: Db,
    key: string,
    bytes: Buffer,
    meta: { contentType: string; width?: number; height?: number; purpose: string; ownerId: string | null },
  ) {
    await storage.put(key, bytes);
    await tx.insert(storedFiles).values({ key, byteSize: bytes.length, ...meta });
  }

  /** Freezes each picked snapshot as a PNG (with its caution line) so web and e-mail show the same picture. */
  async function freezeCharts(actorId: string, input: SaveDispatch['charts'], previous: StoredDispatchChart[]) {
    if (input.length === 0) return [];
    const rows = await db
      .select()
      .from(snapshots)
      .where(
        inArray(
          snapshots.id,
          input.map((c) => c.snapshotId),
        ),
      );
    const out: StoredDispatchChart[] = [];
    for (const [i, c] of input.entries()) {
      const snap = rows.find((r) => r.id === c.snapshotId);
      if (!snap) throw snapshotMissing(i);
      const kept = previous.find((p) => p.snapshotId === c.snapshotId && p.title === snap.title && p.caption === snap.caption);
      if (kept) {
        out.push({ ...kept, alt: c.alt });
        continue;
      }
      const png = renderSnapshotPng({ title: snap.title, caption: snap.caption, data: snap.data as SnapshotData });
      const key = randomKey('charts', 'png');
      await storeFile(db, key, png, { contentType: 'image/png', purpose: 'dispatch-chart', ownerId: actorId });
      out.push({ snapshotId: snap.id, title: snap.title, caption: snap.caption, alt: c.alt, imageKey: key });
    }
    return out;
  }

  async function checkTiers(ids: string[]) {
    if (ids.length === 0) return;
    const found = await db.select({ id: tiers.id }).from(tiers).where(inArray(tiers.id, ids));
    const missing = ids.filter((id) => !found.some((f) => f.id === id));
    if (missing.length) throw tierMissing(missing);
  }

  function detail(row: DispatchRow): DispatchDetail {
    return {
      ...summary(row),
      bodyMarkdown: row.bodyMarkdown,
      bodyHtml: renderMarkdown(row.bodyMarkdown),
      heroImagePath: row.heroImageKey ? fileUrlPath(row.heroImageKey) : null,
      heroAlt: row.heroAlt,
      charts: chartViews(row.charts),
      allowed: DISPATCH_TRANSITIONS[row.state],
    };
  }

  async function snapshotVersion(tx: Db, row: DispatchRow, version: number, editedBy: string | null) {
    await tx.insert(dispatchVersions).values({
      dispatchId: row.id,
      version,
      title: row.title,
      bodyMarkdown: row.bodyMarkdown,
      heroImageKey: row.heroImageKey,
      charts: row.charts,
      editedBy,
    });
  }

  /** Writes the e-mail decision (the fan-out's outbox row) and its job, inside the caller's transaction. */
  async function requestEmail(tx: Db, executor: SqlExecutor, dispatchId: string, actorId: string | null) {
    const inserted = await tx
      .insert(dispatchSends)
      .values({ dispatchId, requestedBy: actorId })
      .onConflictDoNothing()
      .returning({ id: dispatchSends.dispatchId });
    if (inserted.length === 0) return false;
    if (!deps.jobs) throw jobsUnavailable();
    await deps.jobs.send(DISPATCH_FAN_OUT_QUEUE, { dispatchId }, { db: executor, singletonKey: dispatchId });
    return true;
  }

  const service = {
    preview(markdown: string) {
      return { html: renderMarkdown(markdown), excerpt: excerptOf(markdown) };
    },

    async list(): Promise<DispatchSummary[]> {
      const rows = await db.select().from(dispatches).orderBy(desc(dispatches.updatedAt)).limit(500);
      return rows.map(summary);
    },

    async get(id: string): Promise<DispatchDetail> {
      return detail(await load(id));
    },

    async create(actor: Actor, input: SaveDispatch): Promise<DispatchDetail> {
      await checkTiers(input.audience.kind === 'tiers' ? input.audience.tierIds : []);
      const charts = await freezeCharts(actor.id, input.charts, []);
      const [row] = await db.transaction(async (tx) => {
        const created = await tx
          .insert(dispatches)
          .values({
            slug: slugify(input.title),
            title: input.title,
            bodyMarkdown: input.bodyMarkdown,
            heroAlt: input.heroAlt,
            charts,
            audienceKind: input.audience.kind,
            audienceTierIds: input.audience.kind === 'tiers' ? input.audience.tierIds : [],
            emailOnPublish: input.emailOnPublish,
            authorId: actor.id,
          })
          .returning();
        await recordAudit(tx, {
          actorId: actor.id,
          action: 'dispatch.created',
          subjectType: 'dispatch',
          subjectId: created[0]!.id,
          after: { title: input.title, audience: input.audience.kind },
        });
        return created;
      });
      return detail(row!);
    },

    /** Saves an edit; once published, each edit becomes a new version readers can see was made. */
    async update(actor: Actor, id: string, input: SaveDispatch): Promise<DispatchDetail> {
      const before = await load(id);
      await checkTiers(input.audience.kind === 'tiers' ? input.audience.tierIds : []);
      const charts = await freezeCharts(actor.id, input.charts, before.charts);
      const row = await db.transaction(async (tx) => {
        const [locked] = await tx.select().from(dispatches).where(eq(dispatches.id, id)).for('update');
        if (!locked) throw dispatchNotFound();
        const versioned = locked.state === 'published';
        const [updated] = await tx
          .update(dispatches)
          .set({
            title: input.title,
            bodyMarkdown: input.bodyMarkdown,
            heroAlt: input.heroAlt,
            charts,
            audienceKind: input.audience.kind,
            audienceTierIds: input.audience.kind === 'tiers' ? input.audience.tierIds : [],
            emailOnPublish: input.emailOnPublish,
            version: versioned ? locked.version + 1 : locked.version,
            updatedAt: new Date(),
          })
          .where(eq(dispatches.id, id))
          .returning();
        if (versioned) await snapshotVersion(tx, updated!, updated!.version, actor.id);
        await recordAudit(tx, {
          actorId: actor.id,
          action: versioned ? 'dispatch.revised' : 'dispatch.edited',
          subjectType: 'dispatch',
          subjectId: id,
          before: { title: locked.title, version: locked.version },
          after: { title: input.title, version: updated!.version },
        });
        return updated!;
      });
      return detail(row);
    },

    async setHero(actor: Actor, id: string, file: Buffer | undefined, alt: string | undefined): Promise<DispatchDetail> {
      await load(id);
      const img = checkHeroImage(file, { maxBytes: deps.config.HERO_IMAGE_MAX_BYTES, maxPixels: deps.config.HERO_IMAGE_MAX_PIXELS });
      const altParsed = heroAltSchema.safeParse(alt ?? '');
      if (!altParsed.success) throw heroAltInvalid(altParsed.error.issues[0]!.message);
      const key = randomKey('heroes', img.ext);
      const row = await db.transaction(async (tx) => {
        await storeFile(tx, key, file!, {
          contentType: img.contentType,
          width: img.width,
          height: img.height,
          purpose: 'dispatch-hero',
          ownerId: actor.id,
        });
        const [updated] = await tx
          .update(dispatches)
          .set({ heroImageKey: key, heroAlt: altParsed.data, updatedAt: new Date() })
          .where(eq(dispatches.id, id))
          .returning();
        await recordAudit(tx, { actorId: actor.id, action: 'dispatch.hero_set', subjectType: 'dispatch', subjectId: id, after: { key } });
        return updated!;
      });
      return detail(row);
    },

    async removeHero(actor: Actor, id: string): Promise<DispatchDetail> {
      await load(id);
      const [row] = await db.update(dispatches).set({ heroImageKey: null, updatedAt: new Date() }).where(eq(dispatches.id, id)).returning();
      await recordAudit(db, { actorId: actor.id, action: 'dispatch.hero_removed', subjectType: 'dispatch', subjectId: id });
      return detail(row!);
    },

    async transition(actor: Actor, id: string, t: TransitionDispatch): Promise<DispatchDetail> {
      if (t.to === 'published') return service.publish({ dispatchId: id, actorId: actor.id });
      const row = await withTransaction(pool, async (tx, executor) => {
        const [locked] = await tx.select().from(dispatches).where(eq(dispatches.id, id)).for('update');
        if (!locked) throw dispatchNotFound();
        const allowed = DISPATCH_TRANSITIONS[locked.state];
        if (!allowed.includes(t.to)) throw badTransition(locked.state, t.to, allowed);
        const now = new Date();
        const patch: Partial<DispatchRow> =
          t.to === 'scheduled'
            ? { state: 'scheduled', publishAt: new Date(t.publishAt) }
            : t.to === 'draft'
              ? { state: 'draft', publishAt: null }
              : { state: 'withdrawn', withdrawnAt: now };
        const [updated] = await tx
          .update(dispatches)
          .set({ ...patch, updatedAt: now })
          .where(eq(dispatches.id, id))
          .returning();
        if (t.to === 'scheduled') {
          if (!deps.jobs) throw jobsUnavailable();
          // The job carries the time it was made for: a dispatch re-scheduled or unscheduled since ignores it.
          await deps.jobs.send(
            DISPATCH_PUBLISH_QUEUE,
            { dispatchId: id, publishAt: t.publishAt },
            { db: executor, startAfter: new Date(t.publishAt), singletonKey: `${id}@${new Date(t.publishAt).toISOString()}` },
          );
        }
        await recordAudit(tx, {
          actorId: actor.id,
          action: `dispatch.${t.to}`,
          subjectType: 'dispatch',
          subjectId: id,
          before: { state: locked.state },
          after: { state: t.to, ...(t.to === 'scheduled' ? { publishAt: t.publishAt } : {}) },
        });
        return updated!;
      });
      return detail(row);
    },

    /**
     * Publishes a dispatch: the one function both "publish now" and the scheduled job call. With
     * `scheduledFor`, it acts only if the dispatch is still scheduled for that moment (an old job after a
     * reschedule does nothing). Publishing twice changes nothing the second time.
     */
    async publish(opts: { dispatchId: string; actorId: string | null; scheduledFor?: string }): Promise<DispatchDetail> {
      const row = await withTransaction(pool, async (tx, executor) => {
        const [locked] = await tx.select().from(dispatches).where(eq(dispatches.id, opts.dispatchId)).for('update');
        if (!locked) throw dispatchNotFound();
        if (opts.scheduledFor !== undefined) {
          const due = locked.state === 'scheduled' && locked.publishAt?.getTime() === Date.parse(opts.scheduledFor);
          if (!due) return locked;
        } else {
          const allowed = DISPATCH_TRANSITIONS[locked.state];
          if (!allowed.includes('published')) throw badTransition(locked.state, 'published', allowed);
        }
        const now = new Date();
        const firstTime = locked.version === 0;
        const [updated] = await tx
          .update(dispatches)
          .set({
            state: 'published',
            publishedAt: locked.publishedAt ?? now,
            withdrawnAt: null,
            version: firstTime ? 1 : locked.version,
            updatedAt: now,
          })
          .where(eq(dispatches.id, opts.dispatchId))
          .returning();
        if (firstTime) await snapshotVersion(tx, updated!, 1, opts.actorId);
        if (updated!.emailOnPublish) await requestEmail(tx, executor, updated!.id, opts.actorId ?? locked.authorId);
        await recordAudit(tx, {
          actorId: opts.actorId,
          action: 'dispatch.published',
          subjectType: 'dispatch',
          subjectId: opts.dispatchId,
          before: { state: locked.state },
          after: { state: 'published', by: opts.scheduledFor ? 'schedule' : 'hand', email: updated!.emailOnPublish },
        });
        return updated!;
      });
      return detail(row);
    },

    /** E-mails a published dispatch that was published without e-mail; once per dispatch. */
    async email(actor: Actor, id: string) {
      await withTransaction(pool, async (tx, executor) => {
        const [locked] = await tx.select().from(dispatches).where(eq(dispatches.id, id)).for('update');
        if (!locked) throw dispatchNotFound();
        if (locked.state !== 'published') throw notPublished();
        if (!(await requestEmail(tx, executor, id, actor.id))) throw alreadyEmailed();
        await tx.update(dispatches).set({ emailOnPublish: true }).where(eq(dispatches.id, id));
        await recordAudit(tx, { actorId: actor.id, action: 'dispatch.emailed', subjectType: 'dispatch', subjectId: id });
      });
      return service.get(id);
    },

    async versions(id: string): Promise<DispatchVersionView[]> {
      await load(id);
      const rows = await db
        .select({ v: dispatchVersions, editor: accounts.displayName })
        .from(dispatchVersions)
        .leftJoin(accounts, eq(accounts.id, dispatchVersions.editedBy))
        .where(eq(dispatchVersions.dispatchId, id))
        .orderBy(desc(dispatchVersions.version));
      return rows.map((r) => ({ version: r.v.version, title: r.v.title, editedBy: r.editor, createdAt: r.v.createdAt.toISOString() }));
    },

    async mayRead(viewer: Viewer, row: DispatchRow): Promise<boolean> {
      if (row.audienceKind === 'everyone') return true;
      if (!viewer) return false;
      if (viewer.roles.some((r) => STAFF.includes(r))) return true;
      return isInAudience(db, { kind: row.audienceKind, tierIds: row.audienceTierIds }, viewer.id);
    },

    /** The public feed: every published dispatch; those for an audience the viewer is not in show as locked. */
    async feed(viewer: Viewer): Promise<DispatchFeedItem[]> {
      const rows = await db
        .select()
        .from(dispatches)
        .where(eq(dispatches.state, 'published'))
        .orderBy(desc(dispatches.publishedAt))
        .limit(100);
      const out: DispatchFeedItem[] = [];
      for (const row of rows) {
        const open = await service.mayRead(viewer, row);
        out.push({
          slug: row.slug,
          title: row.title,
          excerpt: open ? excerptOf(row.bodyMarkdown) : '',
          publishedAt: row.publishedAt!.toISOString(),
          audienceLabel: AUDIENCE_LABEL[row.audienceKind],
          locked: !open,
          heroImagePath: open && row.heroImageKey ? fileUrlPath(row.heroImageKey) : null,
        });
      }
      return out;
    },

    async page(viewer: Viewer, slug: string): Promise<PublicDispatchView> {
      const [row] = await db
        .select()
        .from(dispatches)
        .where(and(eq(dispatches.slug, slug), eq(dispatches.state, 'published')));
      if (!row) throw dispatchNotFound();
      const base = {
        slug: row.slug,
        title: row.title,
        publishedAt: row.publishedAt!.toISOString(),
        audienceLabel: AUDIENCE_LABEL[row.audienceKind],
      };
      if (!(await service.mayRead(viewer, row))) return { access: 'for-backers', ...base, signedIn: viewer !== null };
      return {
        access: 'open',
        ...base,
        excerpt: excerptOf(row.bodyMarkdown),
        bodyHtml: renderMarkdown(row.bodyMarkdown),
        heroImagePath: row.heroImageKey ? fileUrlPath(row.heroImageKey) : null,
        heroAlt: row.heroAlt,
        charts: chartViews(row.charts),
        edited: row.version > 1,
      };
    },

    async file(key: string) {
      const [meta] = await db.select().from(storedFiles).where(eq(storedFiles.key, key));
      if (!meta) return null;
      const bytes = await storage.get(key);
      return bytes ? { bytes, contentType: meta.contentType } : null;
    },

    load,
  };
  return service;
}

export type DispatchesService = ReturnType<typeof createDispatchesService>;
