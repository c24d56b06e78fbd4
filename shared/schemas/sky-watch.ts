import { z } from 'zod';

/** A place to watch from: typed, picked from our list, or the browser's position (kept only if the backer saves it). */
export const observerPlaceSchema = z.object({
  latitudeDeg: z.coerce
    .number({ message: 'Type the latitude in degrees, e.g. -41.3 for the south.' })
    .min(-90, 'The latitude is between -90° (south pole) and 90° (north pole).')
    .max(90, 'The latitude is between -90° (south pole) and 90° (north pole).'),
  longitudeDeg: z.coerce
    .number({ message: 'Type the longitude in degrees, e.g. 174.8 for the east.' })
    .min(-180, 'The longitude is between -180° (west) and 180° (east).')
    .max(180, 'The longitude is between -180° (west) and 180° (east).'),
});
export type ObserverPlace = z.output<typeof observerPlaceSchema>;
