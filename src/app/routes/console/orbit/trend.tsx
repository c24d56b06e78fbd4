import { memo, useDeferredValue, useMemo, useState } from 'react';
import { SERIES, type SnapshotSeriesKey } from '@shared/charts/snapshot-chart';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { TextField } from '@/components/ui/text-field';
import { errorMessage } from '@/lib/form-errors';
import { useTrendRates } from '@/features/orbit/api/get-trend-rates';
import { useTrendView } from '@/features/orbit/api/get-trend-view';
import { OrbitDeskFrame } from '@/features/orbit/components/orbit-desk-frame';
import { RatesPanel } from '@/features/orbit/components/rates-panel';
import { SailYieldPanel } from '@/features/orbit/components/sail-yield-panel';
import { SaveSnapshotForm } from '@/features/orbit/components/save-snapshot-form';
import { TrendChart, type ChartSelection, type Domain, type RightAxis } from '@/features/orbit/components/trend-chart';
import { DATE_HINT, fromDateInput, toDateInput } from '@/features/orbit/format';
import type { Spacecraft, Trend } from '@/features/orbit/types';

const LEFT = ['apogee', 'perigee', 'meanAltitude'] as const;
// Re-rendered only when their own props change: a zoom step or a fetch state flip leaves them alone.
const Rates = memo(RatesPanel);
const SailYield = memo(SailYieldPanel);

function TrendView({ craft }: { craft: Spacecraft }) {
  const [rateWindow, setRateWindow] = useState<{ from?: string; to?: string }>({});
  const [selection, setSelection] = useState<ChartSelection>({ left: ['apogee', 'perigee', 'meanAltitude'], right: 'none' });
  const [domain, setDomain] = useState<Domain | null>(null);
  // One column per device pixel of the plot, in steps of 100 so a resize does not refetch for every pixel.
  const [columns] = useState(() =>
    Math.min(4000, Math.max(200, Math.ceil((Math.min(window.innerWidth, 1280) * (window.devicePixelRatio || 1)) / 100) * 100)),
  );
  // Two requests: the chart's view (asked again on each zoom or pan step) and the rate window's fit (asked again
  // only when the window changes) — a zoom never waits for a fit, and the chart never waits for the rates.
  const viewQuery = useTrendView(craft.id, {
    viewFrom: domain ? new Date(domain.fromMs).toISOString() : undefined,
    viewTo: domain ? new Date(domain.toMs).toISOString() : undefined,
    columns,
  });
  const ratesQuery = useTrendRates(craft.id, rateWindow);
  const [fromInput, setFromInput] = useState('');
  const [toInput, setToInput] = useState('');
  // A view that comes in is drawn in a background render React may slice (the query's own update is urgent).
  const deferredView = useDeferredValue(viewQuery.data);
  const chartView = deferredView ?? viewQuery.data;
  const rates = ratesQuery.data;
  const t = useMemo<Trend | undefined>(() => (chartView && rates ? { ...chartView, ...rates } : undefined), [chartView, rates]);

  if (viewQuery.isError || ratesQuery.isError)
    return <Alert title="Could not load the trend">{errorMessage(viewQuery.error ?? ratesQuery.error)}</Alert>;
  if (!t)
    return (
      <Card>
        <div className="flex h-[340px] items-center justify-center sm:h-[420px]">
          <Spinner label="Loading the trend of every stored element set…" />
        </div>
      </Card>
    );
  if (t.extent.total === 0) {
    return <EmptyState title="No element sets yet" description="Upload a file of element sets to see the orbit's trend." />;
  }
  const view = domain ?? { fromMs: t.extent.firstMs!, toMs: t.extent.lastMs! };
  const series: SnapshotSeriesKey[] = [...selection.left, ...(selection.right === 'none' ? [] : [selection.right])];
  const applyWindow = (from: number, to: number) => {
    setRateWindow({ from: new Date(from).toISOString(), to: new Date(to).toISOString() });
    setFromInput(toDateInput(from));
    setToInput(toDateInput(to));
  };

  return (
    <div className="space-y-6">
      <Card>
        <div className="mb-4 flex flex-wrap items-end gap-x-6 gap-y-3">
          <fieldset>
            <legend className="mb-1 text-sm font-semibold text-foil-100">Series</legend>
            <div className="flex flex-wrap gap-3">
              {LEFT.map((k) => (
                <label key={k} className="flex items-center gap-1.5 text-sm text-foil-200">
                  <input
                    type="checkbox"
                    className="size-4 accent-amber-400"
                    checked={selection.left.includes(k)}
                    onChange={(e) =>
                      setSelection((s) => ({
                        ...s,
                        left: e.target.checked ? LEFT.filter((x) => x === k || s.left.includes(x)) : s.left.filter((x) => x !== k),
                      }))
                    }
                  />
                  <span aria-hidden="true" className="inline-block h-0.5 w-4" style={{ background: SERIES[k].color }} />
                  {SERIES[k].label}
                </label>
              ))}
            </div>
          </fieldset>
          <label className="text-sm font-semibold text-foil-100">
            Right axis
            <select
              className="mt-1 block rounded-lg border border-foil-700 bg-night-950 px-2 py-1.5 font-normal text-foil-50"
              value={selection.right}
              onChange={(e) => setSelection((s) => ({ ...s, right: e.target.value as RightAxis }))}
            >
              <option value="none">None</option>
              <option value="semiMajorAxis">Semi-major axis (km)</option>
              <option value="energy">Orbital energy (MJ/kg)</option>
            </select>
          </label>
        </div>
        <TrendChart trend={t} selection={selection} domain={domain} onDomainChange={setDomain} />
      </Card>

      <Card>
        <form
          className="mb-4 flex flex-wrap items-end gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            const from = fromDateInput(fromInput),
              to = fromDateInput(toInput, true);
            if (from !== null && to !== null && to > from) applyWindow(from, to);
          }}
        >
          <TextField
            label="Rate window from"
            hint={DATE_HINT}
            inputMode="numeric"
            value={fromInput || toDateInput(t.window.fromMs)}
            onChange={(e) => setFromInput(e.target.value)}
          />
          <TextField
            label="to"
            hint={DATE_HINT}
            inputMode="numeric"
            value={toInput || toDateInput(t.window.toMs)}
            onChange={(e) => setToInput(e.target.value)}
          />
          <Button type="submit" variant="secondary">
            Apply
          </Button>
          <Button variant="ghost" onClick={() => applyWindow(view.fromMs, view.toMs)}>
            Use the zoomed range
          </Button>
          {ratesQuery.isFetching && <Spinner size="sm" label="Updating rates…" />}
        </form>
        <Rates trend={rates!} />
      </Card>

      <div className="grid gap-6 xl:grid-cols-2">
        <SailYield spacecraftId={craft.id} />
        <Card>
          <CardHeader
            level={2}
            title="Save as snapshot"
            description="Freezes the zoomed range, the series shown, the rate window and your note, for dispatches."
          />
          <SaveSnapshotForm
            spacecraftId={craft.id}
            view={view}
            rateWindow={{ fromMs: t.window.fromMs, toMs: t.window.toMs }}
            series={series}
          />
        </Card>
      </div>
    </div>
  );
}

export function Component() {
  return (
    <OrbitDeskFrame
      title="Orbit trend"
      description="Apogee, perigee and mean altitude from every stored element set, with the sailing periods and robust rates."
    >
      {(craft) => (craft ? <TrendView craft={craft} /> : null)}
    </OrbitDeskFrame>
  );
}
