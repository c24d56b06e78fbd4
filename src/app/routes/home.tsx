import { lazy, Suspense, useEffect, type ComponentType } from 'react';
import { buttonClasses } from '@/components/ui/button';
import { PageSpinner } from '@/components/ui/spinner';
import { useDocumentTitle } from '@/lib/document-title';
import { whenNear } from '@/lib/when-near';

// The mission page in two parts. The top (hero and facts) fills a phone's first screen and comes with the site's
// shell. The sections below it (flight budget, orbit status, story, dispatches, questions, cautions) are in their
// own chunk: the server sends their HTML already rendered (server/lib/mission-page.ts), and the browser fetches
// and hydrates their code once the visitor comes near them (or on arrival by a link inside the app).
const MISSION_SECTIONS_ID = 'mission-sections'; // the id of MissionSections' outer element
const loadSections = () => import('./home-sections').then((m) => m.MissionSections);
let loadedSections: ComponentType | null = null;
let loadNow: (() => void) | null = null;
const LazySections = lazy(() =>
  new Promise<void>((resolve) => {
    loadNow = resolve;
    void whenNear(MISSION_SECTIONS_ID).then(resolve);
  })
    .then(loadSections)
    .then((MissionSections) => ({ default: (loadedSections = MissionSections) })),
);

/** The server renders the sections in the same pass as the rest of the page: it loads them first. */
export async function preloadMissionSections(): Promise<void> {
  loadedSections = await loadSections();
}

const facts = [
  { term: 'Mass', value: '4.8 kg' },
  { term: 'Sail area', value: '24 m²' },
  { term: 'Propellant', value: 'None — sunlight only' },
  { term: 'Built by', value: 'Volunteers in a harbour shed' },
];

export function Component() {
  const Sections = loadedSections ?? LazySections;
  // Leaving before the sections came near: load them now, so a return to this page shows them at once.
  useEffect(() => () => loadNow?.(), []);
  useDocumentTitle('Tern-1 — a solar sail from the Saltmarsh Orbital Society');
  return (
    <>
      <section aria-labelledby="hero-title" className="relative overflow-hidden border-b border-foil-800/70">
        <div
          aria-hidden="true"
          className="pointer-events-none absolute inset-0 bg-[radial-gradient(ellipse_at_80%_0%,rgba(52,76,150,0.35),transparent_60%)]"
        />
        <div className="relative mx-auto grid max-w-6xl items-center gap-8 px-4 py-10 sm:px-6 md:grid-cols-[1.3fr_1fr] md:py-16">
          <div>
            <p className="text-xs font-bold uppercase tracking-[0.2em] text-amber-300">Saltmarsh Orbital Society · Tern-1</p>
            <h1 id="hero-title" className="mt-3 text-4xl font-bold leading-tight text-foil-50 sm:text-5xl">
              A sail the size of a small flat, pushed by sunlight.
            </h1>
            <p className="mt-5 max-w-xl text-lg text-foil-300">
              Tern-1 is a 4.8 kg spacecraft built by a club of volunteers. In orbit it opens a 24 m² mirror and tries to climb using nothing
              but the pressure of light. Below: what the money pays for, and what the sail is doing — side by side.
            </p>
            <div className="mt-7 flex flex-wrap gap-3">
              <a href="#money-and-orbit" className={buttonClasses({ size: 'lg' })}>
                See the budget and the orbit
              </a>
              <a href="#story" className={buttonClasses({ variant: 'secondary', size: 'lg' })}>
                Read the story
              </a>
            </div>
          </div>
          <div className="hidden justify-center md:flex">
            {/* Decoration, drawn as a file so the page's script does not carry it (public/sail-illustration.svg). */}
            <img
              src="/sail-illustration.svg"
              alt=""
              width={320}
              height={320}
              loading="lazy"
              decoding="async"
              className="h-auto w-full max-w-64 sm:max-w-sm"
            />
          </div>
        </div>
      </section>

      {/* Its bottom padding is the gap above the sections below, so their box starts where their content does. */}
      <section aria-labelledby="facts-title" className="mx-auto max-w-6xl px-4 pb-10 pt-8 sm:px-6">
        <h2 id="facts-title" className="sr-only">
          Tern-1 at a glance
        </h2>
        <dl className="grid grid-cols-2 gap-3 md:grid-cols-4">
          {facts.map((fact) => (
            <div key={fact.term} className="rounded-xl border border-foil-800 bg-night-900/70 px-4 py-3">
              <dt className="text-xs font-bold uppercase tracking-wider text-foil-400">{fact.term}</dt>
              <dd className="mt-1 font-semibold text-foil-50">{fact.value}</dd>
            </div>
          ))}
        </dl>
      </section>

      <Suspense fallback={<PageSpinner label="Loading the flight budget and the orbit…" />}>
        <Sections />
      </Suspense>
    </>
  );
}
