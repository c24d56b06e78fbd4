// Title and description of every public page: the server writes them (with the Open Graph tags) into the HTML it
// sends, so link previews and search engines see them without running the app; the client keeps them as the
// visitor moves between pages. Fictional demo names only.

export type PageMeta = { title: string; description: string };

const SITE = 'Lightkeel';
const fallback: PageMeta = {
  title: 'Tern-1 — a solar sail from the Saltmarsh Orbital Society',
  description:
    'Tern-1 is a 4.8 kg spacecraft with a 24 m² sail pushed by sunlight. See what the money pays for, what the sail does to the orbit, where it is now and when to look up.',
};

// Patterns are matched in order; ":x" stands for one path segment.
const pages: Array<[pattern: string, meta: PageMeta]> = [
  ['/', fallback],
  [
    '/campaign',
    {
      title: 'Flight budget and thank-you gifts — Tern-1',
      description: 'The campaign for Tern-1: budget lines filled in order by the money raised, thank-you gifts and crew memberships.',
    },
  ],
  ['/campaign/pledge', { title: 'Pledge — Tern-1', description: 'Support Tern-1 with the amount you choose, once or every month.' }],
  ['/campaign/:slug', { title: 'Campaign — Tern-1', description: 'A campaign of the Saltmarsh Orbital Society.' }],
  [
    '/dispatches',
    { title: 'Dispatches — Tern-1', description: 'Mission updates from the team that flies Tern-1: sail turns, orbit charts and news.' },
  ],
  ['/dispatches/:slug', { title: 'Dispatch — Tern-1', description: 'A mission update from the team that flies Tern-1.' }],
  [
    '/where-it-is-now',
    {
      title: 'Where Tern-1 is now',
      description: 'Tern-1 on a world map: its position now, its path for the next orbits and the night side, computed in your browser.',
    },
  ],
  [
    '/sky-watch',
    {
      title: 'Sky watch — when to see Tern-1',
      description:
        'The visible passes of Tern-1 over your place for the next ten days, with calendar files. Never look at or near the Sun.',
    },
  ],
  ['/snapshots/:slug', { title: 'Orbit chart — Tern-1', description: 'A chart of Tern-1’s orbit frozen by the mission’s engineers.' }],
  ['/sign-in', { title: 'Sign in', description: 'Sign in to Lightkeel to see your pledges, receipts and e-mail choices.' }],
  ['/sign-up', { title: 'Create an account', description: 'Create a Lightkeel account to back Tern-1 and follow the mission.' }],
  ['/forgot-password', { title: 'Reset your password', description: 'Get a link to choose a new Lightkeel password.' }],
];

function matches(pattern: string, pathname: string): boolean {
  const a = pattern.split('/').filter(Boolean);
  const b = pathname.split('/').filter(Boolean);
  return a.length === b.length && a.every((seg, i) => seg.startsWith(':') || seg === b[i]);
}

/** The meta of a public page, or the mission's own for anything else (my support and the console are not indexed). */
export function pageMeta(pathname: string): PageMeta & { fullTitle: string } {
  const meta = pages.find(([pattern]) => matches(pattern, pathname))?.[1] ?? fallback;
  return { ...meta, fullTitle: `${meta.title} · ${SITE}` };
}
