import { Link } from 'react-router-dom';
import { buttonClasses } from '@/components/ui/button';
import { useDocumentTitle } from '@/lib/document-title';
import { MISSION_CRAFT_SLUG } from '@/features/live-orbit/api/get-latest-set';
import { openDataLinks } from '@/features/live-orbit/open-data';

export const orbitCaution =
  'Orbit and lifetime estimates shown here are not for collision or re-entry safety decisions; rely on official space-surveillance providers';

const facts = [
  { term: 'Mass', value: '4.8 kg' },
  { term: 'Sail area', value: '24 m²' },
  { term: 'Propellant', value: 'None — sunlight only' },
  { term: 'Built by', value: 'Volunteers in a harbour shed' },
];

const chapters = [
  {
    title: 'Build',
    text: 'Members of the Saltmarsh Orbital Society folded a sail of aluminised film thinner than a bin bag into a box the size of a loaf of bread, and tested every fold on the clubhouse floor.',
  },
  {
    title: 'Unfurl',
    text: 'A few days after launch, four booms push the sail out to its full 24 m². From then on, Tern-1 has one engine: the faint, constant push of sunlight on a mirror.',
  },
  {
    title: 'Climb',
    text: 'Turning the sail face-on while it moves away from the Sun and edge-on while it moves towards it, Tern-1 tries to climb against the thin air that slowly drags every low satellite down.',
  },
  {
    title: 'Report',
    text: 'Our engineers read the published element sets and tell you, in plain words, whether the sail is winning. Backers get every dispatch from orbit; crew members read each one a day early.',
  },
];

const uses = [
  'The launch slot and the deployer that carries Tern-1 to orbit',
  'Ground-station time to hear the spacecraft and command each sail turn',
  'Spare sail film and booms, because the first fold is never the last',
  'Open reports of what the sail did, good days and bad',
];

function SailIllustration() {
  return (
    <svg viewBox="0 0 320 320" aria-hidden="true" className="h-auto w-full max-w-64 sm:max-w-sm">
      <defs>
        <radialGradient id="sun-glow" cx="0.5" cy="0.5" r="0.5">
          <stop offset="0" stopColor="#ffd27a" stopOpacity="0.55" />
          <stop offset="1" stopColor="#ffd27a" stopOpacity="0" />
        </radialGradient>
        <linearGradient id="foil-a" x1="0" y1="0" x2="1" y2="1">
          <stop offset="0" stopColor="#eceff3" />
          <stop offset="1" stopColor="#7b879b" />
        </linearGradient>
        <linearGradient id="foil-b" x1="1" y1="0" x2="0" y2="1">
          <stop offset="0" stopColor="#bcc4d1" />
          <stop offset="1" stopColor="#454c58" />
        </linearGradient>
      </defs>
      <circle cx="240" cy="78" r="76" fill="url(#sun-glow)" />
      <circle cx="240" cy="78" r="16" fill="#ffbe45" />
      {[0, 1, 2].map((i) => (
        <line
          key={i}
          x1={222 - i * 12}
          y1={98 + i * 10}
          x2={190 - i * 12}
          y2={126 + i * 10}
          stroke="#ffbe45"
          strokeOpacity="0.5"
          strokeWidth="2"
          strokeDasharray="4 6"
        />
      ))}
      <ellipse cx="150" cy="176" rx="128" ry="40" fill="none" stroke="#5069b3" strokeOpacity="0.6" strokeDasharray="3 7" />
      <g transform="translate(150 170) rotate(-14)">
        <path d="M0 -96 L96 0 L0 0 Z" fill="url(#foil-a)" opacity="0.95" />
        <path d="M96 0 L0 96 L0 0 Z" fill="url(#foil-b)" opacity="0.9" />
        <path d="M0 96 L-96 0 L0 0 Z" fill="url(#foil-a)" opacity="0.8" />
        <path d="M-96 0 L0 -96 L0 0 Z" fill="url(#foil-b)" opacity="0.95" />
        <path d="M0 -96 V96 M-96 0 H96" stroke="#f7f8fa" strokeWidth="1.5" />
        <rect x="-7" y="-7" width="14" height="14" rx="2" fill="#131f47" stroke="#d9dee6" strokeWidth="1.5" />
      </g>
    </svg>
  );
}

export function Component() {
  useDocumentTitle('Tern-1 — a solar sail from the Saltmarsh Orbital Society');
  return (
    <>
      <section aria-labelledby="hero-title" className="relative overflow-hidden border-b border-foil-800/70">
        <div
          aria-hidden="true"
          className="pointer-events-none absolute inset-0 bg-[radial-gradient(ellipse_at_80%_0%,rgba(52,76,150,0.45),transparent_60%)]"
        />
        <div className="relative mx-auto grid max-w-6xl items-center gap-10 px-4 py-14 sm:px-6 md:grid-cols-[1.2fr_1fr] md:py-20">
          <div>
            <p className="text-xs font-bold uppercase tracking-[0.2em] text-amber-400">Saltmarsh Orbital Society · Tern-1</p>
            <h1 id="hero-title" className="mt-3 text-4xl font-bold leading-tight text-foil-50 sm:text-5xl">
              A sail the size of a small flat, pushed by sunlight.
            </h1>
            <p className="mt-5 max-w-xl text-lg text-foil-300">
              Tern-1 is a 4.8 kg spacecraft built by a club of volunteers. In orbit it opens a 24 m² mirror and tries to climb using nothing
              but the pressure of light. You can help it fly — and follow every turn of the sail.
            </p>
            <div className="mt-8 flex flex-wrap gap-3">
              <Link to="/campaign" className={buttonClasses({ size: 'lg' })}>
                Back the mission
              </Link>
              <a href="#story" className={buttonClasses({ variant: 'secondary', size: 'lg' })}>
                Read the story
              </a>
            </div>
          </div>
          <div className="flex justify-center">
            <SailIllustration />
          </div>
        </div>
      </section>

      <section aria-labelledby="facts-title" className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
        <h2 id="facts-title" className="sr-only">
          Tern-1 at a glance
        </h2>
        <dl className="grid grid-cols-2 gap-3 md:grid-cols-4">
          {facts.map((fact) => (
            <div key={fact.term} className="rounded-xl border border-foil-800 bg-night-900/70 px-4 py-3">
              <dt className="text-xs font-bold uppercase tracking-wider text-foil-500">{fact.term}</dt>
              <dd className="mt-1 font-semibold text-foil-50">{fact.value}</dd>
            </div>
          ))}
        </dl>
      </section>

      <section id="story" aria-labelledby="story-title" className="mx-auto max-w-6xl scroll-mt-20 px-4 py-10 sm:px-6">
        <h2 id="story-title" className="text-2xl font-bold text-foil-50 sm:text-3xl">
          The story so far
        </h2>
        <ol className="mt-6 grid gap-4 md:grid-cols-2">
          {chapters.map((chapter, index) => (
            <li key={chapter.title} className="rounded-2xl border border-foil-800 bg-night-900/60 p-5">
              <p className="text-sm font-bold text-amber-400">
                <span aria-hidden="true">0{index + 1} · </span>
                {chapter.title}
              </p>
              <p className="mt-2 text-foil-200">{chapter.text}</p>
            </li>
          ))}
        </ol>
      </section>

      <section aria-labelledby="support-title" className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
        <div className="grid gap-8 rounded-2xl border border-amber-400/30 bg-gradient-to-br from-night-800 to-night-900 p-6 sm:p-10 md:grid-cols-[1fr_auto] md:items-center">
          <div>
            <h2 id="support-title" className="text-2xl font-bold text-foil-50">
              What your pledge pays for
            </h2>
            <ul className="mt-4 space-y-2 text-foil-200">
              {uses.map((use) => (
                <li key={use} className="flex gap-3">
                  <span aria-hidden="true" className="mt-2 size-1.5 shrink-0 rotate-45 bg-amber-400" />
                  {use}
                </li>
              ))}
            </ul>
          </div>
          <Link to="/campaign" className={buttonClasses({ size: 'lg' })}>
            Back the mission
          </Link>
        </div>
      </section>

      <section aria-labelledby="follow-title" className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
        <h2 id="follow-title" className="text-2xl font-bold text-foil-50">
          Follow the sail yourself
        </h2>
        <div className="mt-4 grid gap-4 md:grid-cols-3">
          <Link to="/where-it-is-now" className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5 hover:border-amber-400/60">
            <span className="block font-bold text-foil-50">Where it is now</span>
            <span className="mt-1 block text-sm text-foil-300">The craft on a world map, its path and the night side, live.</span>
          </Link>
          <Link to="/sky-watch" className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5 hover:border-amber-400/60">
            <span className="block font-bold text-foil-50">Sky watch</span>
            <span className="mt-1 block text-sm text-foil-300">When it crosses your evening or morning sky, with calendar files.</span>
          </Link>
          <div className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5">
            <p className="font-bold text-foil-50">Open data</p>
            <p className="mt-1 text-sm text-foil-300">Every element set we use, so you can check our numbers:</p>
            <ul className="mt-2 space-y-1 text-sm">
              {openDataLinks(MISSION_CRAFT_SLUG).map((l) => (
                <li key={l.href}>
                  <a href={l.href} download className="font-semibold text-amber-300 underline">
                    {l.label}
                  </a>{' '}
                  <span className="text-foil-400">— {l.description}</span>
                </li>
              ))}
            </ul>
          </div>
        </div>
      </section>

      <section aria-label="Caution about orbit estimates" className="mx-auto max-w-6xl px-4 pb-14 pt-4 sm:px-6">
        <p className="rounded-xl border border-foil-700 bg-night-900/60 px-4 py-3 text-sm text-foil-300">
          <strong className="text-foil-100">Caution: </strong>
          {orbitCaution}.
        </p>
      </section>
    </>
  );
}
