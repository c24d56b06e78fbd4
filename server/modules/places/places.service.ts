import { and, asc, eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { savedPlaces } from './places.tables';
import { emailPreferences } from '../accounts/accounts.tables';
import { badRequest, conflict, notFound } from '../../errors';
import { SAVED_PLACES_MAX, type SavePlaceInput, type SavedPlaceView, type SavedPlacesView } from '../../../shared/schemas/places';

const isUniqueViolation = (err: unknown) => {
  const e = err as { code?: string; cause?: { code?: string } };
  return e?.code === '23505' || e?.cause?.code === '23505';
};

const view = (r: typeof savedPlaces.$inferSelect): SavedPlaceView => ({
  id: r.id,
  name: r.name,
  latitudeDeg: r.latitudeDeg,
  longitudeDeg: r.longitudeDeg,
  timeZone: r.timeZone,
  createdAt: r.createdAt.toISOString(),
});

export function createPlacesService({ db }: { db: Db }) {
  return {
    async list(accountId: string): Promise<SavedPlacesView> {
      const rows = await db.select().from(savedPlaces).where(eq(savedPlaces.accountId, accountId)).orderBy(asc(savedPlaces.createdAt));
      const [prefs] = await db
        .select({ passReminders: emailPreferences.passReminders })
        .from(emailPreferences)
        .where(eq(emailPreferences.accountId, accountId));
      return { places: rows.map(view), passReminders: prefs?.passReminders ?? false, max: SAVED_PLACES_MAX };
    },

    async save(accountId: string, input: SavePlaceInput): Promise<SavedPlaceView> {
      try {
        return await db.transaction(async (tx) => {
          // Counted under a lock on the account's places, so two saves at once cannot pass the limit together.
          const mine = await tx.select({ id: savedPlaces.id }).from(savedPlaces).where(eq(savedPlaces.accountId, accountId)).for('update');
          if (mine.length >= SAVED_PLACES_MAX) {
            throw conflict('places.too_many', `You can keep up to ${SAVED_PLACES_MAX} places; delete one to save another.`);
          }
          const [row] = await tx
            .insert(savedPlaces)
            .values({
              accountId,
              name: input.name,
              latitudeDeg: input.latitudeDeg,
              longitudeDeg: input.longitudeDeg,
              timeZone: input.timeZone,
            })
            .returning();
          return view(row!);
        });
      } catch (err) {
        if (!isUniqueViolation(err)) throw err;
        throw badRequest('places.name_taken', `You already have a place called "${input.name}".`, [
          { path: 'name', message: 'is already the name of one of your places' },
        ]);
      }
    },

    async remove(accountId: string, placeId: string) {
      const gone = await db
        .delete(savedPlaces)
        .where(and(eq(savedPlaces.id, placeId), eq(savedPlaces.accountId, accountId)))
        .returning({ id: savedPlaces.id });
      if (gone.length === 0) throw notFound('places.not_found', 'There is no such place among yours.');
    },

    async setPassReminders(accountId: string, enabled: boolean) {
      await db
        .insert(emailPreferences)
        .values({ accountId, passReminders: enabled })
        .onConflictDoUpdate({ target: emailPreferences.accountId, set: { passReminders: enabled, updatedAt: new Date() } });
      return this.list(accountId);
    },
  };
}

export type PlacesService = ReturnType<typeof createPlacesService>;
