import { z } from 'zod';
import { safeText } from './text';

export const SAVED_PLACES_MAX = 10;

/** An IANA time zone name the runtime knows ("Pacific/Chatham", "UTC"). */
const timeZone = safeText()
  .trim()
  .min(1)
  .max(64)
  .refine(
    (zone) => {
      try {
        new Intl.DateTimeFormat('en', { timeZone: zone });
        return true;
      } catch {
        return false;
      }
    },
    { message: 'is not a time zone name such as "Europe/Lisbon" or "UTC"' },
  );

/** Saving a place for sky watch: a name of the backer's own and the coordinates, checked as sky watch checks them. */
export const savePlaceSchema = z.object({
  name: safeText().trim().min(1, 'Give the place a name, e.g. "Back garden"').max(60, 'Keep the name to 60 characters'),
  // Numbers in a JSON body, never coerced: an empty or missing value must not become 0° (a real place).
  latitudeDeg: z
    .number({ message: 'Type the latitude in degrees, e.g. -41.3 for the south.' })
    .min(-90, 'The latitude is between -90° (south pole) and 90° (north pole).')
    .max(90, 'The latitude is between -90° (south pole) and 90° (north pole).'),
  longitudeDeg: z
    .number({ message: 'Type the longitude in degrees, e.g. 174.8 for the east.' })
    .min(-180, 'The longitude is between -180° (west) and 180° (east).')
    .max(180, 'The longitude is between -180° (west) and 180° (east).'),
  timeZone: timeZone.default('UTC'),
});
export type SavePlaceInput = z.infer<typeof savePlaceSchema>;

export const passRemindersSchema = z.object({ enabled: z.boolean({ message: 'must be true or false' }) });
export type PassRemindersInput = z.infer<typeof passRemindersSchema>;

export type SavedPlaceView = {
  id: string;
  name: string;
  latitudeDeg: number;
  longitudeDeg: number;
  timeZone: string;
  createdAt: string;
};

export type SavedPlacesView = { places: SavedPlaceView[]; passReminders: boolean; max: number };

/** What a pass reminder calls a good pass: high enough to be easy to find (common practice for naked-eye watching). */
export const GOOD_PASS_MIN_ELEVATION_DEG = 40;
