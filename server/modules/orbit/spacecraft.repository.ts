import { and, asc, desc, eq, ne } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { recordAudit, recordChange } from '../audit/audit.repository';
import { parseCatalogNumber, formatCatalogNumber } from '../../../shared/orbit/catalog-number';
import type { SpacecraftInput } from '../../../shared/schemas/orbit';
import type { SpacecraftReply } from '../../../shared/schemas/orbit-replies';
import { spacecraft } from './orbit.tables';
import { missionCraftRace, spacecraftNotFound, spacecraftTaken } from './orbit.errors';

export type SpacecraftRow = typeof spacecraft.$inferSelect;

export function spacecraftView(row: SpacecraftRow): SpacecraftReply {
  return {
    id: row.id,
    slug: row.slug,
    name: row.name,
    catalogNumber: row.catalogNumber,
    internationalDesignator: row.internationalDesignator,
    massKg: row.massKg,
    sailAreaM2: row.sailAreaM2,
    sailReflectivity: row.sailReflectivity,
    dragCoefficient: row.dragCoefficient,
    dragAreaEdgeOnM2: row.dragAreaEdgeOnM2,
    launchDate: row.launchDate,
    sailDeployedAt: row.sailDeployedAt?.toISOString() ?? null,
    isMissionCraft: row.isMissionCraft,
    hasSail: row.sailAreaM2 > 0,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}
export type SpacecraftView = ReturnType<typeof spacecraftView>;

function toColumns(input: SpacecraftInput) {
  const catInt = parseCatalogNumber(input.catalogNumber.padStart(5, '0'));
  return {
    name: input.name,
    slug: input.slug,
    catalogNumber: formatCatalogNumber(catInt),
    catalogNumberInt: catInt,
    internationalDesignator: input.internationalDesignator,
    massKg: input.massKg,
    sailAreaM2: input.sailAreaM2,
    sailReflectivity: input.sailReflectivity,
    dragCoefficient: input.dragCoefficient,
    dragAreaEdgeOnM2: input.dragAreaEdgeOnM2,
    launchDate: input.launchDate,
    sailDeployedAt: input.sailDeployedAt ? new Date(input.sailDeployedAt) : null,
    isMissionCraft: input.isMissionCraft,
  };
}

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** Marking a craft as the mission's own unmarks the one marked before (the partial unique index holds the rule). */
async function unmarkOthers(tx: Tx, keepId: string | null) {
  await tx
    .update(spacecraft)
    .set({ isMissionCraft: false, updatedAt: new Date() })
    .where(keepId ? and(eq(spacecraft.isMissionCraft, true), ne(spacecraft.id, keepId)) : eq(spacecraft.isMissionCraft, true));
}

function mapUnique(err: unknown): never {
  const e = err as { code?: string; constraint?: string; cause?: { code?: string; constraint?: string } };
  const code = e.code ?? e.cause?.code;
  const constraint = e.constraint ?? e.cause?.constraint;
  if (code === '23505' && constraint === 'spacecraft_slug_key') throw spacecraftTaken('slug');
  if (code === '23505' && constraint === 'spacecraft_catalog_key') throw spacecraftTaken('catalog number');
  if (code === '23505' && constraint === 'spacecraft_one_mission_craft') throw missionCraftRace();
  throw err;
}

export function createSpacecraftRepository({ db }: { db: Db }) {
  return {
    /** The mission craft first, then the comparison objects by name. */
    async list() {
      return db.select().from(spacecraft).orderBy(desc(spacecraft.isMissionCraft), asc(spacecraft.name));
    },
    async missionCraft() {
      const [row] = await db.select().from(spacecraft).where(eq(spacecraft.isMissionCraft, true));
      return row ?? null;
    },
    async get(id: string) {
      const [row] = await db.select().from(spacecraft).where(eq(spacecraft.id, id));
      if (!row) throw spacecraftNotFound();
      return row;
    },
    async findBySlug(slug: string) {
      const [row] = await db.select().from(spacecraft).where(eq(spacecraft.slug, slug));
      return row ?? null;
    },
    async create(actorId: string | null, input: SpacecraftInput) {
      try {
        return await db.transaction(async (tx) => {
          // The first craft recorded is the mission's own unless another is marked later.
          const [marked] = await tx.select({ id: spacecraft.id }).from(spacecraft).where(eq(spacecraft.isMissionCraft, true));
          const values = { ...toColumns(input), isMissionCraft: input.isMissionCraft || !marked };
          if (input.isMissionCraft) await unmarkOthers(tx, null);
          const [row] = await tx.insert(spacecraft).values(values).returning();
          await recordAudit(tx, {
            actorId,
            action: 'spacecraft.created',
            subjectType: 'spacecraft',
            subjectId: row!.id,
            after: spacecraftView(row!),
          });
          return row!;
        });
      } catch (err) {
        mapUnique(err);
      }
    },
    async update(actorId: string | null, id: string, input: SpacecraftInput) {
      try {
        return await db.transaction(async (tx) => {
          const [before] = await tx.select().from(spacecraft).where(eq(spacecraft.id, id)).for('update');
          if (!before) throw spacecraftNotFound();
          if (input.isMissionCraft) await unmarkOthers(tx, id);
          const [row] = await tx
            .update(spacecraft)
            .set({ ...toColumns(input), updatedAt: new Date() })
            .where(eq(spacecraft.id, id))
            .returning();
          await recordChange(tx, {
            actorId,
            action: 'spacecraft.updated',
            subjectType: 'spacecraft',
            subjectId: id,
            before: spacecraftView(before),
            after: spacecraftView(row!),
          });
          return row!;
        });
      } catch (err) {
        mapUnique(err);
      }
    },
  };
}
