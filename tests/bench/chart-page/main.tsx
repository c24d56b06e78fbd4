// The bench's page for the chart the orbit desk drew before the canvas one: the same card, the same data the old
// trend endpoint answered (every stored set), the same series and zoom state. Built only by tests/bench/trend-chart.bench.ts.
import { StrictMode, useEffect, useState } from 'react';
import { createRoot } from 'react-dom/client';
import '@fontsource/nunito-sans/latin-400.css';
import '@fontsource/nunito-sans/latin-700.css';
import './page.css';
import { TrendChart, type Domain, type Trend } from './legacy-trend-chart';

function LegacyTrendPage({ spacecraftId }: { spacecraftId: string }) {
  const [trend, setTrend] = useState<Trend | null>(null);
  const [domain, setDomain] = useState<Domain | null>(null);
  useEffect(() => {
    const ctl = new AbortController();
    fetch(`/legacy-api/trend/${encodeURIComponent(spacecraftId)}`, { signal: ctl.signal })
      .then((r) => r.json() as Promise<Trend>)
      .then(setTrend)
      .catch(() => undefined);
    return () => ctl.abort();
  }, [spacecraftId]);
  return (
    <main className="mx-auto max-w-5xl p-6">
      <h1 className="mb-4 text-2xl font-bold">Orbit trend (legacy chart)</h1>
      <section className="rounded-xl border border-foil-800 bg-night-900 p-5">
        {trend ? (
          <TrendChart
            trend={trend}
            selection={{ left: ['apogee', 'perigee', 'meanAltitude'], right: 'none' }}
            domain={domain}
            onDomainChange={setDomain}
          />
        ) : (
          <p role="status">Loading the trend of every stored element set…</p>
        )}
      </section>
    </main>
  );
}

const root = document.getElementById('root')!;
const id = new URLSearchParams(location.search).get('spacecraft') ?? '';
createRoot(root).render(
  <StrictMode>
    <LegacyTrendPage spacecraftId={id} />
  </StrictMode>,
);
