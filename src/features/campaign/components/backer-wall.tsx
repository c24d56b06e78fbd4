import { useState } from 'react';
import { SAIL_ROLL_LABEL } from '@shared/schemas/campaign';
import { useBackers } from '../api/get-backers';

export function BackerWall({ slug }: { slug: string }) {
  const backers = useBackers(slug);
  const [all, setAll] = useState(false);
  if (!backers.data || backers.data.length === 0) return null;
  const shown = all ? backers.data : backers.data.slice(0, 12);
  return (
    <section aria-labelledby="backers-title">
      <h2 id="backers-title" className="text-xl font-bold text-foil-50">
        {SAIL_ROLL_LABEL}
      </h2>
      <p className="mt-1 text-sm text-foil-400">Backers who chose to show their name, newest first.</p>
      <ul className="mt-3 grid gap-3 sm:grid-cols-2">
        {shown.map((b) => (
          <li key={b.id} className="rounded-xl border border-foil-800 bg-night-900/60 p-4 text-sm">
            <p className="font-semibold text-foil-100">
              {b.name ?? 'Anonymous backer'}
              {b.tier && <span className="font-normal text-foil-400"> · {b.tier}</span>}
            </p>
            {b.message && <p className="mt-1 text-foil-300">“{b.message}”</p>}
          </li>
        ))}
      </ul>
      {!all && backers.data.length > shown.length && (
        <button type="button" className="mt-3 text-sm font-semibold text-amber-300 underline" onClick={() => setAll(true)}>
          Show all {backers.data.length} names
        </button>
      )}
    </section>
  );
}
