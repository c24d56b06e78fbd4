import { useEffect, useMemo, useState } from 'react';
import { geoCircle, geoEquirectangular, geoGraticule10, geoPath } from 'd3-geo';
import { feature } from 'topojson-client';
import type { Topology, GeometryCollection } from 'topojson-specification';
import land110m from 'world-atlas/land-110m.json';
import { groundTrack, isSunlit, subSatellitePoint, subSolarPoint } from '@shared/orbit/passes';
import { createSatrec } from '@shared/orbit/sgp4-altitude';
import { formatLatLon } from '../places';

const WIDTH = 960,
  HEIGHT = 480;
const projection = geoEquirectangular().fitSize([WIDTH, HEIGHT], { type: 'Sphere' });
const path = geoPath(projection);
// Public-domain land outlines (Natural Earth via world-atlas), shipped with the app: no tiles, no network.
const topology = land110m as unknown as Topology<{ land: GeometryCollection }>;
const landPath = path(feature(topology, topology.objects.land)) ?? '';
const gridPath = path(geoGraticule10()) ?? '';
const spherePath = path({ type: 'Sphere' }) ?? '';

const timeFormat = new Intl.DateTimeFormat(undefined, { hour: '2-digit', minute: '2-digit', second: '2-digit', timeZoneName: 'short' });

/** Ticks every `ms` so the position follows the craft while the page is open. */
function useNow(ms: number): number {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const id = window.setInterval(() => setNow(Date.now()), ms);
    return () => window.clearInterval(id);
  }, [ms]);
  return now;
}

/**
 * The craft's position now on a world map, its ground track for the next two orbits, and the night side, all
 * propagated in the browser from the newest element set; the same facts in words below the map.
 */
export function WhereItIsNow({ name, line1, line2, epoch }: { name: string; line1: string; line2: string; epoch: string }) {
  const satrec = useMemo(() => createSatrec({ line1, line2 }), [line1, line2]);
  const now = useNow(5_000);
  const minute = Math.floor(now / 60_000) * 60_000;
  const periodMin = (2 * Math.PI) / satrec.no;
  const track = useMemo(() => groundTrack(satrec, minute, 2 * periodMin * 60_000, 30_000), [satrec, minute, periodMin]);
  const here = subSatellitePoint(satrec, now);
  const sun = subSolarPoint(now);
  const sunlit = isSunlit(satrec, now);
  const night = useMemo(
    () =>
      path(
        geoCircle()
          .center([sun.longitudeDeg + 180, -sun.latitudeDeg])
          .radius(90)(),
      ) ?? '',
    // The night side moves 0.25° a minute: redraw each minute.
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [minute],
  );
  const trackPath = path({ type: 'LineString', coordinates: track.map((p) => [p.longitudeDeg, p.latitudeDeg]) }) ?? '';
  const dot = here ? projection([here.longitudeDeg, here.latitudeDeg]) : null;
  const setAgeDays = (now - Date.parse(epoch)) / 86_400_000;

  return (
    <figure className="space-y-3">
      <svg
        viewBox={`0 0 ${WIDTH} ${HEIGHT}`}
        className="h-auto w-full rounded-xl bg-night-950"
        role="img"
        aria-labelledby="wiin-title wiin-text"
      >
        <title id="wiin-title">{`Map of where ${name} is now`}</title>
        <path d={spherePath} fill="#0b1431" />
        <path d={gridPath} fill="none" stroke="#1c2c60" strokeWidth={0.6} />
        <path d={landPath} fill="#344c96" stroke="#5069b3" strokeWidth={0.5} />
        <path d={night} fill="#060b1f" fillOpacity={0.55} />
        <path d={trackPath} fill="none" stroke="#ffd27a" strokeWidth={1.6} strokeDasharray="5 4" />
        {dot && (
          <g transform={`translate(${dot[0]} ${dot[1]})`}>
            <circle r={11} fill={sunlit ? '#ffbe45' : '#98a3b5'} fillOpacity={0.25} />
            <circle r={5.5} fill={sunlit ? '#ffbe45' : '#d9dee6'} stroke="#060b1f" strokeWidth={1.5} />
          </g>
        )}
      </svg>
      <figcaption id="wiin-text" className="space-y-1 text-sm text-foil-200" aria-live="off">
        {here ? (
          <p>
            At {timeFormat.format(now)}, {name} is above <strong>{formatLatLon(here.latitudeDeg, here.longitudeDeg)}</strong>, about{' '}
            <strong>{Math.round(here.altitudeKm)} km</strong> up, and <strong>{sunlit ? 'in sunlight' : "in the Earth's shadow"}</strong>.
            The dashed line is its path over the ground for the next two orbits ({Math.round(2 * periodMin)} minutes); the darker half of
            the map is night.
          </p>
        ) : (
          <p>The newest element set cannot be propagated to now; the engineers will upload a newer one.</p>
        )}
        <p className="text-foil-400">
          Propagated in your browser with SGP4 from the element set of {new Date(epoch).toUTCString()} ({setAgeDays.toFixed(1)} days old);
          positions drift by kilometres a day as the set ages.
        </p>
      </figcaption>
    </figure>
  );
}
