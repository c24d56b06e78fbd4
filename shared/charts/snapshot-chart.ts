// The one definition of a snapshot chart: frozen data → a geometry model (pure), which the server writes as SVG
// (and PNG through resvg) and the web draws as React SVG with hover. Same scales, colours, labels everywhere.

/** Travels with every rendered snapshot (web, SVG, PNG, e-mail): readers must not mistake estimates for safety data. */
export const ORBIT_CAUTION = 'Orbit figures are estimates: not for collision or re-entry safety decisions.';

export const snapshotSeriesKeys = ['apogee', 'perigee', 'meanAltitude', 'semiMajorAxis', 'energy'] as const;
export type SnapshotSeriesKey = (typeof snapshotSeriesKeys)[number];
export type SnapshotSailMode = 'raising' | 'edge-on' | 'tumbling' | 'unknown';
type AxisGroup = 'altitude' | 'semiMajorAxis' | 'energy';

export type RateLine = { fromMs: number; toMs: number; fromValue: number; toValue: number; slopePerDay: number };

export type SnapshotData = {
  version: 1;
  spacecraftName: string;
  fromMs: number;
  toMs: number;
  series: SnapshotSeriesKey[];
  points: { epochMs: number[]; values: Partial<Record<SnapshotSeriesKey, number[]>>; outlier: boolean[] };
  sailingPeriods: { startMs: number; endMs: number; mode: SnapshotSailMode }[];
  annotations: { atMs: number; text: string }[];
  /** Robust rates over `rateWindow`, per series, in the series' unit per day. */
  rateLines: Partial<Record<SnapshotSeriesKey, RateLine | null>>;
  rateWindow: { fromMs: number; toMs: number } | null;
};

export const SERIES: Record<
  SnapshotSeriesKey,
  { label: string; unit: string; group: AxisGroup; color: string; scale: number; decimals: number }
> = {
  apogee: { label: 'Apogee', unit: 'km', group: 'altitude', color: '#ffbe45', scale: 1, decimals: 2 },
  perigee: { label: 'Perigee', unit: 'km', group: 'altitude', color: '#7d93cf', scale: 1, decimals: 2 },
  meanAltitude: { label: 'Mean altitude', unit: 'km', group: 'altitude', color: '#eceff3', scale: 1, decimals: 2 },
  semiMajorAxis: { label: 'Semi-major axis', unit: 'km', group: 'semiMajorAxis', color: '#5fd3b5', scale: 1, decimals: 2 },
  // Stored in J/kg; drawn in MJ/kg so the axis reads well.
  energy: { label: 'Orbital energy', unit: 'MJ/kg', group: 'energy', color: '#e58fd4', scale: 1e-6, decimals: 4 },
};

/** What each line means, in plain words for backers (the public snapshot page lists the ones shown). */
export const SERIES_EXPLAINED: Record<SnapshotSeriesKey, string> = {
  apogee: 'Apogee is the highest point of the orbit above the ground. When the sail pushes the craft along its path, the apogee climbs.',
  perigee:
    'Perigee is the lowest point of the orbit. Near the bottom of the orbit the air is thickest, so a falling perigee means more drag.',
  meanAltitude: 'Mean altitude is the average height of the orbit above the ground: half-way between apogee and perigee.',
  semiMajorAxis:
    'Semi-major axis is the size of the orbit measured from the centre of the Earth. It grows when the orbit gains energy and shrinks when drag takes energy away.',
  energy:
    'Orbital energy is how much energy each kilogram of the craft has in its orbit. A rising line means the sail is winning against air drag; a falling line means drag is winning.',
};

export const SAIL_PERIODS_EXPLAINED =
  'Shaded bands mark sailing periods: when the team set the sail to raise the orbit, turned it edge-on to the Sun, or when it was tumbling.';

const GROUP_LABEL: Record<AxisGroup, string> = {
  altitude: 'Altitude (km)',
  semiMajorAxis: 'Semi-major axis (km)',
  energy: 'Specific energy (MJ/kg)',
};

export const SAIL_MODE_STYLE: Record<SnapshotSailMode, { label: string; color: string; opacity: number }> = {
  raising: { label: 'Raising', color: '#ffbe45', opacity: 0.2 },
  'edge-on': { label: 'Edge-on', color: '#98a3b5', opacity: 0.12 },
  tumbling: { label: 'Tumbling', color: '#f87171', opacity: 0.12 },
  unknown: { label: 'Unknown', color: '#636e81', opacity: 0.1 },
};

export const CHART_COLORS = {
  background: '#0b1431',
  plot: '#131f47',
  grid: '#263a7a',
  axis: '#98a3b5',
  text: '#eceff3',
  muted: '#bcc4d1',
  outlier: '#f87171',
};

/** Groups on the left and right axis, in that order; a third group is dropped (the form allows two). */
export function axisGroups(series: readonly SnapshotSeriesKey[]): AxisGroup[] {
  const out: AxisGroup[] = [];
  for (const s of series) if (!out.includes(SERIES[s].group)) out.push(SERIES[s].group);
  return out.slice(0, 2);
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const DAY_MS = 86_400_000;

export function formatDateUtc(ms: number, withYear = true): string {
  const d = new Date(ms);
  return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]}${withYear ? ` ${d.getUTCFullYear()}` : ''}`;
}

function formatMonth(ms: number): string {
  const d = new Date(ms);
  return `${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}`;
}

/** Nice tick values covering [lo, hi], about `count` of them. */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return [];
  if (hi - lo < 1e-12) {
    lo -= 1;
    hi += 1;
  }
  const raw = (hi - lo) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + step * 1e-9 && out.length < 50; v += step) out.push(Number(v.toPrecision(12)));
  return out;
}

function timeTicks(fromMs: number, toMs: number, maxTicks: number): { ms: number; label: string }[] {
  const spanDays = (toMs - fromMs) / DAY_MS;
  if (spanDays > 75) {
    const monthsStep = [1, 2, 3, 6, 12].find((m) => spanDays / (30.4 * m) <= maxTicks) ?? 12;
    const d = new Date(fromMs);
    let y = d.getUTCFullYear(),
      m = d.getUTCMonth() + 1;
    const out: { ms: number; label: string }[] = [];
    for (let k = 0; k < 200; k++) {
      if (m > 11) {
        y += Math.floor(m / 12);
        m %= 12;
      }
      const ms = Date.UTC(y, m, 1);
      if (ms > toMs) break;
      if (m % monthsStep === 0) out.push({ ms, label: formatMonth(ms) });
      m += 1;
    }
    return out;
  }
  const stepDays = [1, 2, 5, 7, 14, 28].find((s) => spanDays / s <= maxTicks) ?? 28;
  const out: { ms: number; label: string }[] = [];
  for (let ms = Math.ceil(fromMs / DAY_MS) * DAY_MS; ms <= toMs && out.length < 60; ms += stepDays * DAY_MS)
    out.push({ ms, label: formatDateUtc(ms, false) });
  return out;
}

/** Characters-per-line wrap (the renderer has no text metrics). */
export function wrapText(text: string, maxChars: number, maxLines = 3): string[] {
  const words = text.split(/\s+/).filter(Boolean);
  const lines: string[] = [];
  let cur = '';
  for (const w of words) {
    if ((cur + ' ' + w).trim().length > maxChars && cur) {
      lines.push(cur);
      cur = w;
    } else cur = (cur + ' ' + w).trim();
  }
  if (cur) lines.push(cur);
  if (lines.length > maxLines) {
    const kept = lines.slice(0, maxLines);
    kept[maxLines - 1] = kept[maxLines - 1]!.replace(/.{0,1}$/, '…');
    return kept;
  }
  return lines;
}

export function formatRate(key: SnapshotSeriesKey, slopePerDay: number): string {
  const s = SERIES[key];
  const v = slopePerDay * s.scale;
  const unit = key === 'energy' ? 'J/kg/day' : 'km/day';
  const shown = key === 'energy' ? slopePerDay : v;
  const text = Math.abs(shown) >= 100 ? shown.toFixed(0) : Math.abs(shown) >= 1 ? shown.toFixed(2) : shown.toFixed(3);
  return `${shown >= 0 ? '+' : ''}${text} ${unit}`;
}

export type ChartPoint = { x: number; y: number; epochMs: number; value: number; outlier: boolean };
export type ChartModel = {
  width: number;
  height: number;
  title: string;
  subtitle: string;
  captionLines: string[];
  /** One line under the caption on every rendering: ORBIT_CAUTION. */
  caution: string;
  plot: { x: number; y: number; w: number; h: number };
  xTicks: { x: number; label: string }[];
  axes: { side: 'left' | 'right'; label: string; ticks: { y: number; label: string }[] }[];
  bands: { x: number; w: number; color: string; opacity: number; label: string }[];
  rateWindow: { x: number; w: number } | null;
  lines: { key: SnapshotSeriesKey; label: string; color: string; d: string; points: ChartPoint[]; side: 'left' | 'right' }[];
  outliers: { x: number; y: number; key: SnapshotSeriesKey }[];
  rateLines: { key: SnapshotSeriesKey; x1: number; y1: number; x2: number; y2: number; color: string; label: string }[];
  annotations: { x: number; text: string }[];
  legend: { label: string; color: string; detail: string; kind: 'line' | 'band' }[];
  xToMs: (x: number) => number;
};

export function buildSnapshotChart(
  data: SnapshotData,
  opts: { width?: number; height?: number; title?: string; caption?: string } = {},
): ChartModel {
  const width = opts.width ?? 960;
  const height = opts.height ?? 540;
  const groups = axisGroups(data.series);
  const series = data.series.filter((s) => groups.includes(SERIES[s].group));
  const captionLines = opts.caption ? wrapText(opts.caption, Math.floor((width - 48) / 7.4), 3) : [];
  const modes = [...new Set(data.sailingPeriods.filter((p) => p.endMs > data.fromMs && p.startMs < data.toMs).map((p) => p.mode))];
  const legendRows = Math.ceil((series.length + modes.length + 1) / 3);
  const top = 64;
  // The caution line takes 18 px under the caption.
  const bottom = 44 + legendRows * 20 + captionLines.length * 18 + 18 + 12;
  const left = 72;
  const right = groups.length > 1 ? 80 : 28;
  const plot = { x: left, y: top, w: Math.max(50, width - left - right), h: Math.max(50, height - top - bottom) };
  const from = data.fromMs,
    to = data.toMs > data.fromMs ? data.toMs : data.fromMs + DAY_MS;
  const xOf = (ms: number) => plot.x + ((ms - from) / (to - from)) * plot.w;
  const ms = data.points.epochMs;
  const inWindow: number[] = [];
  for (let i = 0; i < ms.length; i++) if (ms[i]! >= from && ms[i]! <= to) inWindow.push(i);

  const ranges = new Map<AxisGroup, [number, number]>();
  for (const s of series) {
    const vals = data.points.values[s];
    if (!vals) continue;
    const g = SERIES[s].group;
    let [lo, hi] = ranges.get(g) ?? [Infinity, -Infinity];
    for (const i of inWindow) {
      if (data.points.outlier[i]) continue;
      const v = vals[i]! * SERIES[s].scale;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    ranges.set(g, [lo, hi]);
  }
  const scales = new Map<AxisGroup, { yOf: (v: number) => number; ticks: number[] }>();
  for (const g of groups) {
    const [lo0, hi0] = ranges.get(g) ?? [0, 1];
    const lo = Number.isFinite(lo0) ? lo0 : 0,
      hi = Number.isFinite(hi0) ? hi0 : 1;
    const pad = Math.max((hi - lo) * 0.08, Math.abs(hi) * 1e-6, 1e-6);
    const ticks = niceTicks(lo - pad, hi + pad, 5);
    const yLo = Math.min(lo - pad, ticks[0] ?? lo),
      yHi = Math.max(hi + pad, ticks[ticks.length - 1] ?? hi);
    scales.set(g, { yOf: (v: number) => plot.y + plot.h - ((v - yLo) / (yHi - yLo)) * plot.h, ticks });
  }
  const decimalsFor = (ticks: number[]) => {
    const step = ticks.length > 1 ? Math.abs(ticks[1]! - ticks[0]!) : 1;
    return Math.max(0, Math.min(6, -Math.floor(Math.log10(step) + 1e-9)));
  };
  const axes = groups.map((g, k) => {
    const sc = scales.get(g)!;
    const dec = decimalsFor(sc.ticks);
    return {
      side: (k === 0 ? 'left' : 'right') as 'left' | 'right',
      label: GROUP_LABEL[g],
      ticks: sc.ticks.map((t) => ({ y: sc.yOf(t), label: t.toFixed(dec) })),
    };
  });

  const lines: ChartModel['lines'] = [];
  const outliers: ChartModel['outliers'] = [];
  for (const s of series) {
    const vals = data.points.values[s];
    if (!vals) continue;
    const sc = scales.get(SERIES[s].group)!;
    const pts: ChartPoint[] = [];
    let d = '';
    for (const i of inWindow) {
      const value = vals[i]!;
      const p = { x: xOf(ms[i]!), y: sc.yOf(value * SERIES[s].scale), epochMs: ms[i]!, value, outlier: !!data.points.outlier[i] };
      pts.push(p);
      if (p.outlier) outliers.push({ x: p.x, y: Math.max(plot.y, Math.min(plot.y + plot.h, p.y)), key: s });
      else d += `${d ? 'L' : 'M'}${p.x.toFixed(1)},${p.y.toFixed(1)}`;
    }
    lines.push({
      key: s,
      label: SERIES[s].label,
      color: SERIES[s].color,
      d,
      points: pts,
      side: groups.indexOf(SERIES[s].group) === 0 ? 'left' : 'right',
    });
  }

  const clampX = (x: number) => Math.max(plot.x, Math.min(plot.x + plot.w, x));
  const bands = data.sailingPeriods
    .filter((p) => p.endMs > from && p.startMs < to)
    .map((p) => {
      const x1 = clampX(xOf(p.startMs)),
        x2 = clampX(xOf(p.endMs));
      const st = SAIL_MODE_STYLE[p.mode];
      return { x: x1, w: Math.max(1, x2 - x1), color: st.color, opacity: st.opacity, label: st.label };
    });

  const rateLines: ChartModel['rateLines'] = [];
  for (const s of series) {
    const rl = data.rateLines[s];
    if (!rl) continue;
    const sc = scales.get(SERIES[s].group)!;
    rateLines.push({
      key: s,
      color: SERIES[s].color,
      label: formatRate(s, rl.slopePerDay),
      x1: clampX(xOf(rl.fromMs)),
      y1: sc.yOf(rl.fromValue * SERIES[s].scale),
      x2: clampX(xOf(rl.toMs)),
      y2: sc.yOf(rl.toValue * SERIES[s].scale),
    });
  }
  const rateWindow =
    data.rateWindow && data.rateWindow.toMs > from && data.rateWindow.fromMs < to
      ? { x: clampX(xOf(data.rateWindow.fromMs)), w: clampX(xOf(data.rateWindow.toMs)) - clampX(xOf(data.rateWindow.fromMs)) }
      : null;

  const legend: ChartModel['legend'] = series.map((s) => {
    const rl = data.rateLines[s];
    return { label: SERIES[s].label, color: SERIES[s].color, detail: rl ? formatRate(s, rl.slopePerDay) : '', kind: 'line' as const };
  });
  for (const m of modes)
    legend.push({ label: `${SAIL_MODE_STYLE[m].label} period`, color: SAIL_MODE_STYLE[m].color, detail: '', kind: 'band' });

  return {
    width,
    height,
    title: opts.title ?? `${data.spacecraftName} orbit`,
    subtitle: `${data.spacecraftName} · ${formatDateUtc(from)} – ${formatDateUtc(to)} (UTC)${data.rateWindow ? ` · rates over ${formatDateUtc(data.rateWindow.fromMs)} – ${formatDateUtc(data.rateWindow.toMs)}` : ''}`,
    captionLines,
    caution: ORBIT_CAUTION,
    plot,
    xTicks: timeTicks(from, to, Math.max(3, Math.floor(plot.w / 110))).map((t) => ({ x: xOf(t.ms), label: t.label })),
    axes,
    bands,
    rateWindow,
    lines,
    outliers,
    rateLines,
    annotations: data.annotations.filter((a) => a.atMs >= from && a.atMs <= to).map((a) => ({ x: xOf(a.atMs), text: a.text })),
    legend,
    xToMs: (x: number) => from + ((x - plot.x) / plot.w) * (to - from),
  };
}

function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

export const CHART_FONT_FAMILY = "'Nunito Sans', 'DejaVu Sans', sans-serif";

/** The chart as a standalone SVG document (server: download, e-mail, PNG). */
export function snapshotSvg(model: ChartModel): string {
  const { width, height, plot } = model;
  const c = CHART_COLORS;
  const o: string[] = [];
  o.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="${esc(CHART_FONT_FAMILY)}">`,
  );
  o.push(`<title>${esc(model.title)}</title>`);
  o.push(`<rect width="${width}" height="${height}" fill="${c.background}"/>`);
  o.push(`<text x="24" y="30" fill="${c.text}" font-size="19" font-weight="700">${esc(model.title)}</text>`);
  o.push(`<text x="24" y="50" fill="${c.muted}" font-size="12">${esc(model.subtitle)}</text>`);
  o.push(`<rect x="${plot.x}" y="${plot.y}" width="${plot.w}" height="${plot.h}" fill="${c.plot}"/>`);
  for (const b of model.bands)
    o.push(
      `<rect x="${b.x.toFixed(1)}" y="${plot.y}" width="${b.w.toFixed(1)}" height="${plot.h}" fill="${b.color}" fill-opacity="${b.opacity}"/>`,
    );
  if (model.rateWindow)
    o.push(
      `<rect x="${model.rateWindow.x.toFixed(1)}" y="${plot.y}" width="${model.rateWindow.w.toFixed(1)}" height="${plot.h}" fill="none" stroke="${c.axis}" stroke-dasharray="2 4" stroke-opacity="0.7"/>`,
    );
  const left = model.axes[0];
  if (left)
    for (const t of left.ticks)
      o.push(
        `<line x1="${plot.x}" x2="${plot.x + plot.w}" y1="${t.y.toFixed(1)}" y2="${t.y.toFixed(1)}" stroke="${c.grid}" stroke-width="1"/>`,
      );
  for (const t of model.xTicks)
    o.push(
      `<line x1="${t.x.toFixed(1)}" x2="${t.x.toFixed(1)}" y1="${plot.y}" y2="${plot.y + plot.h}" stroke="${c.grid}" stroke-width="1" stroke-opacity="0.6"/>`,
    );
  for (const a of model.axes) {
    const x = a.side === 'left' ? plot.x - 8 : plot.x + plot.w + 8;
    const anchor = a.side === 'left' ? 'end' : 'start';
    for (const t of a.ticks)
      o.push(`<text x="${x}" y="${(t.y + 4).toFixed(1)}" fill="${c.axis}" font-size="11" text-anchor="${anchor}">${esc(t.label)}</text>`);
    const lx = a.side === 'left' ? 16 : width - 12;
    const cy = plot.y + plot.h / 2;
    o.push(
      `<text x="${lx}" y="${cy}" fill="${c.muted}" font-size="11" text-anchor="middle" transform="rotate(${a.side === 'left' ? -90 : 90} ${lx} ${cy})">${esc(a.label)}</text>`,
    );
  }
  for (const t of model.xTicks)
    o.push(
      `<text x="${t.x.toFixed(1)}" y="${plot.y + plot.h + 18}" fill="${c.axis}" font-size="11" text-anchor="middle">${esc(t.label)}</text>`,
    );
  for (const l of model.lines)
    if (l.d) o.push(`<path d="${l.d}" fill="none" stroke="${l.color}" stroke-width="1.6" stroke-linejoin="round" data-series="${l.key}"/>`);
  for (const r of model.rateLines) {
    o.push(
      `<line x1="${r.x1.toFixed(1)}" y1="${r.y1.toFixed(1)}" x2="${r.x2.toFixed(1)}" y2="${r.y2.toFixed(1)}" stroke="#ffffff" stroke-width="3" stroke-opacity="0.35"/>`,
    );
    o.push(
      `<line x1="${r.x1.toFixed(1)}" y1="${r.y1.toFixed(1)}" x2="${r.x2.toFixed(1)}" y2="${r.y2.toFixed(1)}" stroke="${r.color}" stroke-width="2" stroke-dasharray="6 4"/>`,
    );
  }
  for (const p of model.outliers)
    o.push(`<circle cx="${p.x.toFixed(1)}" cy="${p.y.toFixed(1)}" r="4" fill="none" stroke="${c.outlier}" stroke-width="1.6"/>`);
  for (const a of model.annotations) {
    o.push(
      `<line x1="${a.x.toFixed(1)}" x2="${a.x.toFixed(1)}" y1="${plot.y}" y2="${plot.y + plot.h}" stroke="${c.text}" stroke-dasharray="3 3" stroke-opacity="0.8"/>`,
    );
    o.push(`<text x="${(a.x + 4).toFixed(1)}" y="${plot.y + 14}" fill="${c.text}" font-size="11">${esc(a.text)}</text>`);
  }
  let lx = 24,
    ly = plot.y + plot.h + 42;
  const colW = Math.floor((width - 48) / 3);
  const all = [...model.legend];
  if (model.outliers.length) all.push({ label: 'Outlier (not used in rates)', color: c.outlier, detail: '', kind: 'line' });
  all.forEach((item, k) => {
    if (k > 0 && k % 3 === 0) {
      lx = 24;
      ly += 20;
    }
    if (item.kind === 'band') o.push(`<rect x="${lx}" y="${ly - 9}" width="16" height="10" fill="${item.color}" fill-opacity="0.5"/>`);
    else if (item.label.startsWith('Outlier'))
      o.push(`<circle cx="${lx + 8}" cy="${ly - 4}" r="4" fill="none" stroke="${item.color}" stroke-width="1.6"/>`);
    else o.push(`<line x1="${lx}" x2="${lx + 16}" y1="${ly - 4}" y2="${ly - 4}" stroke="${item.color}" stroke-width="2.5"/>`);
    o.push(
      `<text x="${lx + 22}" y="${ly}" fill="${c.text}" font-size="12">${esc(item.label)}${item.detail ? ` <tspan fill="${c.muted}">${esc(item.detail)}</tspan>` : ''}</text>`,
    );
    lx += colW;
  });
  let cy = ly + 26;
  for (const line of model.captionLines) {
    o.push(`<text x="24" y="${cy}" fill="${c.muted}" font-size="12.5">${esc(line)}</text>`);
    cy += 18;
  }
  o.push(`<text x="24" y="${cy}" fill="${c.axis}" font-size="11.5" font-style="italic" data-role="caution">${esc(model.caution)}</text>`);
  o.push('</svg>');
  return o.join('\n');
}
