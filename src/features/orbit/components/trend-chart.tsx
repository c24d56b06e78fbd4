import { memo, startTransition, useMemo, useRef, type KeyboardEvent } from 'react';
import type uPlot from 'uplot';
import { CHART_COLORS, SAIL_MODE_STYLE, SERIES, type SnapshotSeriesKey } from '@shared/charts/snapshot-chart';
import { Button } from '@/components/ui/button';
import { countOf, formatUtcDate, formatUtcDateTime } from '../format';
import type { Trend } from '../types';
import { UPlotChart, type UPlotHandle } from './uplot-chart';

export type RightAxis = 'none' | 'semiMajorAxis' | 'energy';
export type ChartSelection = { left: ('apogee' | 'perigee' | 'meanAltitude')[]; right: RightAxis };
export type Domain = { fromMs: number; toMs: number };

const KEY_OF: Record<SnapshotSeriesKey, keyof Trend['outliers']> = {
  apogee: 'apogeeKm',
  perigee: 'perigeeKm',
  meanAltitude: 'meanAltitudeKm',
  semiMajorAxis: 'semiMajorAxisKm',
  energy: 'energyJPerKg',
};

const scaleOf = (k: SnapshotSeriesKey) => (SERIES[k].group === 'altitude' ? 'km' : 'right');

/** Zoom around the middle of a view by `factor` (< 1 zooms in), kept inside the history. */
export function zoomDomain(view: Domain, extent: Domain, factor: number): Domain | null {
  const mid = (view.fromMs + view.toMs) / 2;
  const half = Math.max(3_600_000, ((view.toMs - view.fromMs) * factor) / 2);
  const fromMs = Math.max(extent.fromMs, mid - half),
    toMs = Math.min(extent.toMs, mid + half);
  return fromMs <= extent.fromMs && toMs >= extent.toMs ? null : { fromMs, toMs };
}

/** Pan by a fraction of the view's width (negative: earlier), kept inside the history. */
export function panDomain(view: Domain, extent: Domain, fraction: number): Domain | null {
  const w = view.toMs - view.fromMs;
  let fromMs = view.fromMs + w * fraction;
  fromMs = Math.min(Math.max(fromMs, extent.fromMs), extent.toMs - w);
  return fromMs <= extent.fromMs && fromMs + w >= extent.toMs ? null : { fromMs, toMs: fromMs + w };
}

/**
 * The interactive trend on one canvas (uPlot): the server sends the view reduced to min/max per pixel column, so
 * drawing costs the same for 1,000 or 100,000 sets. Sailing periods shaded, outliers ringed, rate lines dashed
 * over the rate window; drag across to zoom, buttons or arrow keys to pan and zoom, the legend reads out the
 * values under the pointer, and a text summary says what is shown.
 *
 * A zoom or pan step redraws the canvas at once from the points already loaded (only the x scale moves); the new
 * view then reaches React as a transition — rendered in slices that let the browser paint — and the finer points
 * for it are fetched and drawn when they come.
 */
export const TrendChart = memo(function TrendChart({
  trend,
  selection,
  domain,
  onDomainChange,
}: {
  trend: Trend;
  selection: ChartSelection;
  domain: Domain | null;
  onDomainChange: (d: Domain | null) => void;
}) {
  const keys: SnapshotSeriesKey[] = useMemo(
    () => [...selection.left, ...(selection.right === 'none' ? [] : [selection.right])],
    [selection],
  );
  const extent: Domain = { fromMs: trend.extent.firstMs ?? 0, toMs: trend.extent.lastMs ?? 1 };
  const view = domain ?? extent;
  // Everything the draw hooks read, without re-creating the chart when it changes.
  const live = useRef({ trend, keys });
  live.current = { trend, keys };
  const changeRef = useRef(onDomainChange);
  changeRef.current = onDomainChange;
  const plot = useRef<UPlotHandle>(null);
  const extentRef = useRef(extent);
  extentRef.current = extent;
  /** One zoom or pan step: drawn now from the loaded points, then handed to React (and the fetch) in the background. */
  const showRef = useRef((d: Domain | null) => {
    const shown = d ?? extentRef.current;
    plot.current?.setView(shown.fromMs, shown.toMs);
    startTransition(() => changeRef.current(d));
  });

  const data = useMemo<uPlot.AlignedData>(() => {
    const s = trend.series;
    return [s.epochMs, ...keys.map((k) => (SERIES[k].scale === 1 ? s[KEY_OF[k]] : s[KEY_OF[k]].map((v) => v * SERIES[k].scale)))];
  }, [trend, keys]);

  const options = useMemo<Omit<uPlot.Options, 'width' | 'height'>>(() => {
    const right = selection.right;
    const fmt = (k: SnapshotSeriesKey) => (_u: uPlot, v: number | null) =>
      v === null || v === undefined ? '—' : v.toFixed(SERIES[k].decimals + 1);
    const axisFont = '12px "Nunito Sans", system-ui, sans-serif';
    const toX = (u: uPlot, ms: number) => u.valToPos(ms, 'x', true);
    return {
      ms: 1,
      padding: [8, 8, 0, 0],
      scales: { x: { time: true }, km: { auto: true }, right: { auto: true } },
      axes: [
        {
          stroke: CHART_COLORS.axis,
          grid: { stroke: CHART_COLORS.grid, dash: [3, 3], width: 1 },
          ticks: { stroke: CHART_COLORS.grid },
          font: axisFont,
          values: (_u, splits) => splits.map((ms) => formatUtcDate(ms)),
          space: 90,
        },
        {
          scale: 'km',
          label: 'km',
          stroke: CHART_COLORS.axis,
          grid: { stroke: CHART_COLORS.grid, dash: [3, 3], width: 1 },
          ticks: { stroke: CHART_COLORS.grid },
          font: axisFont,
          labelFont: axisFont,
          size: 56,
        },
        ...(right === 'none'
          ? []
          : [
              {
                scale: 'right',
                side: 1,
                label: SERIES[right].unit,
                stroke: SERIES[right].color,
                grid: { show: false },
                font: axisFont,
                labelFont: axisFont,
                size: 70,
                values: (_u: uPlot, splits: number[]) => splits.map((v) => (right === 'energy' ? v.toFixed(3) : v.toFixed(0))),
              } satisfies uPlot.Axis,
            ]),
      ],
      series: [
        { label: 'Epoch (UTC)', value: (_u, v) => (v === null ? '—' : formatUtcDateTime(v)) },
        ...keys.map((k) => ({
          label: `${SERIES[k].label} (${SERIES[k].unit})`,
          scale: scaleOf(k),
          stroke: SERIES[k].color,
          width: 1.6,
          points: { show: false },
          value: fmt(k),
        })),
      ],
      legend: { live: true },
      cursor: { drag: { x: true, y: false, setScale: false }, points: { size: 6 } },
      hooks: {
        drawClear: [
          (u) => {
            // Sailing periods under the lines.
            const { ctx, bbox } = u;
            ctx.save();
            for (const p of live.current.trend.sailingPeriods) {
              const x0 = Math.max(bbox.left, toX(u, Date.parse(p.startAt))),
                x1 = Math.min(bbox.left + bbox.width, toX(u, Date.parse(p.endAt)));
              if (x1 <= x0) continue;
              ctx.globalAlpha = SAIL_MODE_STYLE[p.mode].opacity;
              ctx.fillStyle = SAIL_MODE_STYLE[p.mode].color;
              ctx.fillRect(x0, bbox.top, x1 - x0, bbox.height);
            }
            ctx.restore();
          },
        ],
        draw: [
          (u) => {
            const { ctx, bbox } = u;
            const { trend: t, keys: ks } = live.current;
            ctx.save();
            ctx.beginPath();
            ctx.rect(bbox.left, bbox.top, bbox.width, bbox.height);
            ctx.clip();
            // The rate window: a dashed frame.
            const wx0 = toX(u, t.window.fromMs),
              wx1 = toX(u, t.window.toMs);
            ctx.setLineDash([2 * devicePixelRatio, 4 * devicePixelRatio]);
            ctx.strokeStyle = CHART_COLORS.axis;
            ctx.lineWidth = devicePixelRatio;
            ctx.strokeRect(wx0, bbox.top, wx1 - wx0, bbox.height);
            // Rate lines, dashed, in each series' colour.
            ctx.setLineDash([6 * devicePixelRatio, 4 * devicePixelRatio]);
            ctx.lineWidth = 2.5 * devicePixelRatio;
            for (const k of ks) {
              const rl = t.rateLines?.[k];
              if (!rl) continue;
              ctx.strokeStyle = SERIES[k].color;
              ctx.beginPath();
              ctx.moveTo(toX(u, rl.fromMs), u.valToPos(rl.fromValue * SERIES[k].scale, scaleOf(k), true));
              ctx.lineTo(toX(u, rl.toMs), u.valToPos(rl.toValue * SERIES[k].scale, scaleOf(k), true));
              ctx.stroke();
            }
            // Outliers: rings, not joined to the line.
            ctx.setLineDash([]);
            ctx.lineWidth = 1.6 * devicePixelRatio;
            ctx.strokeStyle = CHART_COLORS.outlier;
            const r = 3.5 * devicePixelRatio;
            for (const k of ks) {
              const xs = t.outliers.epochMs,
                ys = t.outliers[KEY_OF[k]];
              ctx.beginPath();
              for (let i = 0; i < xs.length; i++) {
                const x = toX(u, xs[i]!),
                  y = u.valToPos(ys[i]! * SERIES[k].scale, scaleOf(k), true);
                ctx.moveTo(x + r, y);
                ctx.arc(x, y, r, 0, 2 * Math.PI);
              }
              ctx.stroke();
            }
            ctx.restore();
          },
        ],
        setSelect: [
          (u) => {
            if (u.select.width < 4) return;
            const fromMs = u.posToVal(u.select.left, 'x'),
              toMs = u.posToVal(u.select.left + u.select.width, 'x');
            u.setSelect({ left: 0, top: 0, width: 0, height: 0 }, false);
            if (toMs - fromMs > 3_600_000) showRef.current({ fromMs, toMs });
          },
        ],
      },
    };
  }, [keys, selection.right]);

  const step = (d: Domain | null | undefined) => d !== undefined && showRef.current(d);
  const onKeyDown = (e: KeyboardEvent) => {
    const moves: Record<string, () => Domain | null> = {
      ArrowLeft: () => panDomain(view, extent, -0.25),
      ArrowRight: () => panDomain(view, extent, 0.25),
      '+': () => zoomDomain(view, extent, 0.5),
      '=': () => zoomDomain(view, extent, 0.5),
      '-': () => zoomDomain(view, extent, 2),
      Home: () => null,
    };
    const m = moves[e.key];
    if (!m) return;
    e.preventDefault();
    step(m());
  };

  const inView = trend.sailingPeriods.filter((p) => Date.parse(p.endAt) > view.fromMs && Date.parse(p.startAt) < view.toMs).length;
  const first = (k: SnapshotSeriesKey) => trend.series[KEY_OF[k]][0];
  const last = (k: SnapshotSeriesKey) => trend.series[KEY_OF[k]][trend.series.epochMs.length - 1];

  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2 text-xs text-foil-400">
        <span id="trend-help">Drag across the chart to zoom · with the chart focused: ← → pan, + − zoom, Home for the whole history</span>
        <div className="flex flex-wrap gap-1.5">
          <Button size="sm" variant="ghost" aria-label="Earlier" onClick={() => step(panDomain(view, extent, -0.5))} disabled={!domain}>
            ◀ Earlier
          </Button>
          <Button size="sm" variant="ghost" aria-label="Later" onClick={() => step(panDomain(view, extent, 0.5))} disabled={!domain}>
            Later ▶
          </Button>
          <Button size="sm" variant="ghost" onClick={() => step(zoomDomain(view, extent, 0.5))}>
            Zoom in
          </Button>
          <Button size="sm" variant="ghost" onClick={() => step(zoomDomain(view, extent, 2))} disabled={!domain}>
            Zoom out
          </Button>
          {domain && (
            <Button size="sm" variant="secondary" onClick={() => step(null)}>
              Show the whole history
            </Button>
          )}
        </div>
      </div>
      <div
        tabIndex={0}
        role="group"
        aria-roledescription="chart"
        aria-label={`Orbit trend chart, ${formatUtcDate(view.fromMs)} to ${formatUtcDate(view.toMs)}`}
        aria-describedby="trend-help trend-summary"
        onKeyDown={onKeyDown}
        // The canvas is drawn in the night palette (shared/charts colours, the same as the snapshot PNGs), so its
        // window stays night-coloured in the light theme too.
        style={{ backgroundColor: CHART_COLORS.background, color: CHART_COLORS.text }}
        className="rounded-lg p-2 focus-visible:outline-2 focus-visible:outline-amber-400"
        data-testid="trend-chart"
      >
        <UPlotChart
          options={options}
          data={data}
          xRange={{ min: view.fromMs, max: view.toMs }}
          handle={plot}
          className="trend-uplot h-[400px] w-full overflow-hidden sm:h-[480px]"
        />
      </div>
      <p id="trend-summary" className="mt-3 text-sm text-foil-300" data-testid="trend-summary">
        {formatUtcDate(view.fromMs)} to {formatUtcDate(view.toMs)}: {countOf(trend.view.pointsInView, 'element set')} in view
        {trend.view.reduced ? `, drawn as the lowest and highest value in each of ${trend.view.columns} columns` : ''}
        {keys
          .filter((k) => first(k) !== undefined)
          .map(
            (k) =>
              `; ${SERIES[k].label.toLowerCase()} ${((first(k) ?? 0) * SERIES[k].scale).toFixed(SERIES[k].decimals)} → ${((last(k) ?? 0) * SERIES[k].scale).toFixed(SERIES[k].decimals)} ${SERIES[k].unit}`,
          )
          .join('')}
        ; {countOf(trend.outliers.epochMs.length, 'outlier')}; {countOf(inView, 'sailing period')} shaded.
      </p>
      <ul className="mt-3 flex flex-wrap gap-x-4 gap-y-1 text-xs text-foil-300" aria-label="Shading">
        {(Object.keys(SAIL_MODE_STYLE) as (keyof typeof SAIL_MODE_STYLE)[]).map((m) => (
          <li key={m} className="flex items-center gap-1.5">
            <span
              aria-hidden="true"
              className="inline-block size-3 rounded-sm"
              style={{ background: SAIL_MODE_STYLE[m].color, opacity: 0.6 }}
            />
            {SAIL_MODE_STYLE[m].label} period
          </li>
        ))}
        <li className="flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-block size-3 rounded-full border-2" style={{ borderColor: CHART_COLORS.outlier }} />
          Outlier (not used in rates)
        </li>
        <li className="flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-block h-3 w-5 border border-dashed" style={{ borderColor: CHART_COLORS.axis }} />
          Rate window
        </li>
      </ul>
    </div>
  );
});
