import { useBackers } from '../api/get-backers';

export function BackerWall({ slug }: { slug: string }) {
  const backers = useBackers(slug);
  if (!backers.data || backers.data.length === 0) return null;
  return (
    <section aria-labelledby="backers-title">
      <h2 id="backers-title" className="text-xl font-bold text-foil-50">
        Latest backers
      </h2>
      <ul className="mt-3 grid gap-3 sm:grid-cols-2">
        {backers.data.map((b) => (
          <li key={b.id} className="rounded-xl border border-foil-800 bg-night-900/60 p-4 text-sm">
            <p className="font-semibold text-foil-100">
              {b.name ?? 'Anonymous backer'}
              {b.tier && <span className="font-normal text-foil-400"> · {b.tier}</span>}
            </p>
            {b.message && <p className="mt-1 text-foil-300">“{b.message}”</p>}
          </li>
        ))}
      </ul>
    </section>
  );
}
