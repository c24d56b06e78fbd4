// A short list of places we ship so nobody has to know their coordinates (rounded to 0.1°, common knowledge).
export type Place = { name: string; latitudeDeg: number; longitudeDeg: number };

export const PLACES: Place[] = [
  { name: 'Auckland', latitudeDeg: -36.8, longitudeDeg: 174.8 },
  { name: 'Buenos Aires', latitudeDeg: -34.6, longitudeDeg: -58.4 },
  { name: 'Cairo', latitudeDeg: 30.0, longitudeDeg: 31.2 },
  { name: 'Cape Town', latitudeDeg: -33.9, longitudeDeg: 18.4 },
  { name: 'Chicago', latitudeDeg: 41.9, longitudeDeg: -87.6 },
  { name: 'Delhi', latitudeDeg: 28.6, longitudeDeg: 77.2 },
  { name: 'Edinburgh', latitudeDeg: 55.9, longitudeDeg: -3.2 },
  { name: 'Lagos', latitudeDeg: 6.5, longitudeDeg: 3.4 },
  { name: 'Lima', latitudeDeg: -12.0, longitudeDeg: -77.0 },
  { name: 'Madrid', latitudeDeg: 40.4, longitudeDeg: -3.7 },
  { name: 'Mexico City', latitudeDeg: 19.4, longitudeDeg: -99.1 },
  { name: 'Nairobi', latitudeDeg: -1.3, longitudeDeg: 36.8 },
  { name: 'Oslo', latitudeDeg: 59.9, longitudeDeg: 10.8 },
  { name: 'Perth', latitudeDeg: -31.9, longitudeDeg: 115.9 },
  { name: 'Reykjavik', latitudeDeg: 64.1, longitudeDeg: -21.9 },
  { name: 'Santiago', latitudeDeg: -33.4, longitudeDeg: -70.7 },
  { name: 'Seoul', latitudeDeg: 37.6, longitudeDeg: 127.0 },
  { name: 'Singapore', latitudeDeg: 1.3, longitudeDeg: 103.8 },
  { name: 'Sydney', latitudeDeg: -33.9, longitudeDeg: 151.2 },
  { name: 'Tokyo', latitudeDeg: 35.7, longitudeDeg: 139.7 },
  { name: 'Toronto', latitudeDeg: 43.7, longitudeDeg: -79.4 },
  { name: 'Vancouver', latitudeDeg: 49.3, longitudeDeg: -123.1 },
  { name: 'Vienna', latitudeDeg: 48.2, longitudeDeg: 16.4 },
  { name: 'Wellington', latitudeDeg: -41.3, longitudeDeg: 174.8 },
];

/** "34.6° S, 58.4° W" */
export function formatLatLon(latitudeDeg: number, longitudeDeg: number): string {
  const lat = `${Math.abs(latitudeDeg).toFixed(1)}° ${latitudeDeg >= 0 ? 'N' : 'S'}`;
  const lon = `${Math.abs(longitudeDeg).toFixed(1)}° ${longitudeDeg >= 0 ? 'E' : 'W'}`;
  return `${lat}, ${lon}`;
}
