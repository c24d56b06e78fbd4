import { useMemo, useState } from 'react';
import {
  Brush,
  CartesianGrid,
  ComposedChart,
  Legend,
  Line,
  ReferenceArea,
  ReferenceLine,
  ResponsiveContainer,
  Scatter,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';
import { CHART_COLORS, SAIL_MODE_STYLE, SERIES, type SnapshotSeriesKey } from '@shared/charts/snapshot-chart';
import { Button } from '@/components/ui/button';
import { formatUtcDate, formatUtcDateTime } from '@/features/orbit/format';
import type { Trend as CurrentTrend } from '@/features/orbit/types';

// The chart the orbit desk drew before the canvas one (recharts, every point as SVG), kept for the bench only.
export type Trend = Omit<CurrentTrend, 'series'> & {
  series: CurrentTrend['series'] & { outlier: number[] };
};

export type RightAxis = 'none' | 'semiMajorAxis' | 'energy';
export type ChartSelection = { left: ('apogee' | 'perigee' | 'meanAltitude')[]; right: RightAxis };
export type Domain = { fromMs: number; toMs: number };

type Row = Record<string, number | null> & { t: number };

const KEY_OF: Record<SnapshotSeriesKey, keyof Trend['series']> = {
  apogee: 'apogeeKm',
  perigee: 'perigeeKm',
  meanAltitude: 'meanAltitudeKm',
  semiMajorAxis: 'semiMajorAxisKm',
  energy: 'energyJPerKg',
};

function lowerBound(xs: number[], v: number) {
  let lo = 0,
    hi = xs.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (xs[mid]! < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * The interactive trend: series from the stored history, sailing periods shaded, outliers ringed, rate lines
 * dashed over the rate window. Drag across the plot to zoom; the brush below pans and resizes the view.
 * Colours, labels and units come from the shared snapshot chart definition, so a snapshot looks the same.
 */
export function TrendChart({
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
  const keys: SnapshotSeriesKey[] = [...selection.left, ...(selection.right === 'none' ? [] : [selection.right])];
  const rows = useMemo(() => {
    const s = trend.series;
    const outliers = new Set(s.outlier);
    const out: Row[] = new Array(s.epochMs.length);
    for (let i = 0; i < s.epochMs.length; i++) {
      const row: Row = { t: s.epochMs[i]! };
      const bad = outliers.has(i);
      for (const k of Object.keys(KEY_OF) as SnapshotSeriesKey[]) {
        const v = s[KEY_OF[k]][i]! * SERIES[k].scale;
        row[k] = bad ? null : v;
        row[`${k}Outlier`] = bad ? v : null;
      }
      out[i] = row;
    }
    return out;
  }, [trend]);
  const times = useMemo(() => rows.map((r) => r.t), [rows]);
  const first = times[0] ?? 0,
    last = times[times.length - 1] ?? 1;
  const view = domain ?? { fromMs: first, toMs: last };
  const [drag, setDrag] = useState<{ a: number; b: number } | null>(null);
  const startIndex = Math.min(Math.max(0, lowerBound(times, view.fromMs)), Math.max(0, rows.length - 1));
  const endIndex = Math.min(
    Math.max(startIndex, lowerBound(times, view.toMs) - (times[lowerBound(times, view.toMs)] === view.toMs ? 0 : 1)),
    rows.length - 1,
  );

  const labelOf = (v: unknown) => (typeof v === 'number' ? formatUtcDate(v) : String(v));
  const activeLabel = (state: unknown) => {
    const l = (state as { activeLabel?: unknown } | null)?.activeLabel;
    const n = typeof l === 'string' ? Number(l) : l;
    return typeof n === 'number' && Number.isFinite(n) ? n : null;
  };
  const rateLines = trend.rateLines;

  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2 text-xs text-foil-400">
        <span>Drag across the chart to zoom · the brush below pans</span>
        {domain && (
          <Button size="sm" variant="secondary" onClick={() => onDomainChange(null)}>
            Show the whole history
          </Button>
        )}
      </div>
      <div className="h-[340px] w-full sm:h-[420px]" data-testid="trend-chart">
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart
            data={rows}
            margin={{ top: 8, right: 8, bottom: 0, left: 0 }}
            onMouseDown={(state) => {
              const x = activeLabel(state);
              if (x !== null) setDrag({ a: x, b: x });
            }}
            onMouseMove={(state) => {
              const x = activeLabel(state);
              if (drag && x !== null) setDrag({ a: drag.a, b: x });
            }}
            onMouseUp={() => {
              if (drag && Math.abs(drag.b - drag.a) > 3_600_000)
                onDomainChange({ fromMs: Math.min(drag.a, drag.b), toMs: Math.max(drag.a, drag.b) });
              setDrag(null);
            }}
          >
            <CartesianGrid stroke={CHART_COLORS.grid} strokeDasharray="3 3" />
            <XAxis
              dataKey="t"
              type="number"
              scale="time"
              domain={[view.fromMs, view.toMs]}
              allowDataOverflow
              tickFormatter={labelOf}
              stroke={CHART_COLORS.axis}
              fontSize={12}
              minTickGap={40}
            />
            <YAxis
              yAxisId="left"
              domain={['auto', 'auto']}
              stroke={CHART_COLORS.axis}
              fontSize={12}
              width={56}
              tickFormatter={(v: number) => v.toFixed(0)}
              label={{ value: 'km', angle: -90, position: 'insideLeft', fill: CHART_COLORS.muted, fontSize: 12 }}
            />
            {selection.right !== 'none' && (
              <YAxis
                yAxisId="right"
                orientation="right"
                domain={['auto', 'auto']}
                stroke={SERIES[selection.right].color}
                fontSize={12}
                width={64}
                tickFormatter={(v: number) => (selection.right === 'energy' ? v.toFixed(3) : v.toFixed(0))}
                label={{ value: SERIES[selection.right].unit, angle: 90, position: 'insideRight', fill: CHART_COLORS.muted, fontSize: 12 }}
              />
            )}
            {trend.sailingPeriods.map((p) => (
              <ReferenceArea
                key={p.id}
                yAxisId="left"
                x1={Math.max(Date.parse(p.startAt), view.fromMs)}
                x2={Math.min(Date.parse(p.endAt), view.toMs)}
                fill={SAIL_MODE_STYLE[p.mode].color}
                fillOpacity={SAIL_MODE_STYLE[p.mode].opacity}
                ifOverflow="hidden"
              />
            ))}
            <ReferenceArea
              yAxisId="left"
              x1={trend.window.fromMs}
              x2={trend.window.toMs}
              fill="none"
              stroke={CHART_COLORS.axis}
              strokeDasharray="2 4"
              ifOverflow="hidden"
            />
            {keys.map((k) => (
              <Line
                key={k}
                yAxisId={SERIES[k].group === 'altitude' ? 'left' : 'right'}
                dataKey={k}
                name={SERIES[k].label}
                stroke={SERIES[k].color}
                dot={false}
                strokeWidth={1.6}
                isAnimationActive={false}
                connectNulls
              />
            ))}
            {keys.map((k) => (
              <Scatter
                key={`${k}-o`}
                yAxisId={SERIES[k].group === 'altitude' ? 'left' : 'right'}
                dataKey={`${k}Outlier`}
                name={`${SERIES[k].label} outlier`}
                fill="none"
                stroke={CHART_COLORS.outlier}
                strokeWidth={1.6}
                isAnimationActive={false}
                legendType="none"
              />
            ))}
            {rateLines &&
              keys.map((k) => {
                const rl = rateLines[k];
                if (!rl) return null;
                return (
                  <ReferenceLine
                    key={`${k}-rate`}
                    yAxisId={SERIES[k].group === 'altitude' ? 'left' : 'right'}
                    ifOverflow="hidden"
                    segment={[
                      { x: rl.fromMs, y: rl.fromValue * SERIES[k].scale },
                      { x: rl.toMs, y: rl.toValue * SERIES[k].scale },
                    ]}
                    stroke={SERIES[k].color}
                    strokeWidth={2.5}
                    strokeDasharray="6 4"
                  />
                );
              })}
            {drag && <ReferenceArea yAxisId="left" x1={drag.a} x2={drag.b} fill={CHART_COLORS.text} fillOpacity={0.1} />}
            <Tooltip
              contentStyle={{
                background: CHART_COLORS.background,
                border: `1px solid ${CHART_COLORS.grid}`,
                borderRadius: 8,
                color: CHART_COLORS.text,
              }}
              labelFormatter={(v) => (typeof v === 'number' ? formatUtcDateTime(v) : String(v))}
              formatter={(value, name) => [typeof value === 'number' ? value.toFixed(3) : String(value), name]}
            />
            <Legend wrapperStyle={{ fontSize: 12, color: CHART_COLORS.text }} />
            <Brush
              dataKey="t"
              height={26}
              stroke={CHART_COLORS.axis}
              fill={CHART_COLORS.plot}
              travellerWidth={10}
              tickFormatter={labelOf}
              startIndex={startIndex}
              endIndex={Math.max(startIndex, endIndex)}
              onChange={(r) => {
                const { startIndex: s, endIndex: e } = r as { startIndex?: number; endIndex?: number };
                if (s === undefined || e === undefined) return;
                if (s === 0 && e === rows.length - 1) onDomainChange(null);
                else onDomainChange({ fromMs: rows[s]!.t, toMs: rows[e]!.t });
              }}
            />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
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
}
