import { asc, eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { recordAudit, recordChange } from '../audit/audit.repository';
import { parseCatalogNumber, formatCatalogNumber } from '../../../shared/orbit/catalog-number';
import type { SpacecraftInput } from '../../../shared/schemas/orbit';
import { spacecraft } from './orbit.tables';
import { spacecraftNotFound, spacecraftTaken } from './orbit.errors';

export type SpacecraftRow = typeof spacecraft.$inferSelect;

export function spacecraftView(row: SpacecraftRow) {
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
  };
}

function mapUnique(err: unknown): never {
  const e = err as { code?: string; constraint?: string; cause?: { code?: string; constraint?: string } };
  const code = e.code ?? e.cause?.code;
  const constraint = e.constraint ?? e.cause?.constraint;
  if (code === '23505' && constraint === 'spacecraft_slug_key') throw spacecraftTaken('slug');
  if (code === '23505' && constraint === 'spacecraft_catalog_key') throw spacecraftTaken('catalog number');
  throw err;
}

export function createSpacecraftRepository({ db }: { db: Db }) {
  return {
    async list() {
      return db.select().from(spacecraft).orderBy(asc(spacecraft.name));
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
          const [row] = await tx.insert(spacecraft).values(toColumns(input)).returning();
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
