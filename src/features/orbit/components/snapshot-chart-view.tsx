import { useMemo, useState } from 'react';
import { buildSnapshotChart, CHART_COLORS, CHART_FONT_FAMILY, SERIES, type SnapshotData } from '@shared/charts/snapshot-chart';
import { formatUtcDateTime } from '../format';

/**
 * A snapshot drawn from the same geometry model the server writes as SVG/PNG, plus a hover read-out.
 * The markup mirrors snapshotSvg() element for element.
 */
export function SnapshotChartView({ data, title, caption }: { data: SnapshotData; title: string; caption: string }) {
  const m = useMemo(() => buildSnapshotChart(data, { title, caption }), [data, title, caption]);
  const [hoverX, setHoverX] = useState<number | null>(null);
  const c = CHART_COLORS;
  const hover = useMemo(() => {
    if (hoverX === null) return null;
    const out: { label: string; color: string; value: string; x: number; y: number; epochMs: number }[] = [];
    for (const l of m.lines) {
      let best = l.points[0];
      for (const p of l.points) if (best && Math.abs(p.x - hoverX) < Math.abs(best.x - hoverX)) best = p;
      if (best)
        out.push({
          label: l.label,
          color: l.color,
          value: `${(best.value * SERIES[l.key].scale).toFixed(SERIES[l.key].decimals)} ${SERIES[l.key].unit}`,
          x: best.x,
          y: best.y,
          epochMs: best.epochMs,
        });
    }
    return out;
  }, [hoverX, m]);
  const { plot } = m;
  const colW = Math.floor((m.width - 48) / 3);
  let ly = plot.y + plot.h + 42;
  return (
    <figure className="w-full">
      <svg
        viewBox={`0 0 ${m.width} ${m.height}`}
        className="h-auto w-full rounded-xl"
        fontFamily={CHART_FONT_FAMILY}
        role="img"
        aria-label={`${m.title}. ${m.subtitle}`}
        onMouseMove={(e) => {
          const r = e.currentTarget.getBoundingClientRect();
          const x = ((e.clientX - r.left) / r.width) * m.width;
          setHoverX(x >= plot.x && x <= plot.x + plot.w ? x : null);
        }}
        onMouseLeave={() => setHoverX(null)}
      >
        <rect width={m.width} height={m.height} fill={c.background} />
        <text x={24} y={30} fill={c.text} fontSize={19} fontWeight={700}>
          {m.title}
        </text>
        <text x={24} y={50} fill={c.muted} fontSize={12}>
          {m.subtitle}
        </text>
        <rect x={plot.x} y={plot.y} width={plot.w} height={plot.h} fill={c.plot} />
        {m.bands.map((b, i) => (
          <rect key={i} x={b.x} y={plot.y} width={b.w} height={plot.h} fill={b.color} fillOpacity={b.opacity} />
        ))}
        {m.rateWindow && (
          <rect
            x={m.rateWindow.x}
            y={plot.y}
            width={m.rateWindow.w}
            height={plot.h}
            fill="none"
            stroke={c.axis}
            strokeDasharray="2 4"
            strokeOpacity={0.7}
          />
        )}
        {m.axes[0]?.ticks.map((t, i) => (
          <line key={i} x1={plot.x} x2={plot.x + plot.w} y1={t.y} y2={t.y} stroke={c.grid} />
        ))}
        {m.xTicks.map((t, i) => (
          <line key={i} x1={t.x} x2={t.x} y1={plot.y} y2={plot.y + plot.h} stroke={c.grid} strokeOpacity={0.6} />
        ))}
        {m.axes.map((a) => {
          const x = a.side === 'left' ? plot.x - 8 : plot.x + plot.w + 8;
          const lx = a.side === 'left' ? 16 : m.width - 12;
          const cy = plot.y + plot.h / 2;
          return (
            <g key={a.side}>
              {a.ticks.map((t, i) => (
                <text key={i} x={x} y={t.y + 4} fill={c.axis} fontSize={11} textAnchor={a.side === 'left' ? 'end' : 'start'}>
                  {t.label}
                </text>
              ))}
              <text
                x={lx}
                y={cy}
                fill={c.muted}
                fontSize={11}
                textAnchor="middle"
                transform={`rotate(${a.side === 'left' ? -90 : 90} ${lx} ${cy})`}
              >
                {a.label}
              </text>
            </g>
          );
        })}
        {m.xTicks.map((t, i) => (
          <text key={i} x={t.x} y={plot.y + plot.h + 18} fill={c.axis} fontSize={11} textAnchor="middle">
            {t.label}
          </text>
        ))}
        {m.lines.map(
          (l) =>
            l.d && <path key={l.key} d={l.d} fill="none" stroke={l.color} strokeWidth={1.6} strokeLinejoin="round" data-series={l.key} />,
        )}
        {m.rateLines.map((r) => (
          <g key={r.key}>
            <line x1={r.x1} y1={r.y1} x2={r.x2} y2={r.y2} stroke="#ffffff" strokeWidth={3} strokeOpacity={0.35} />
            <line x1={r.x1} y1={r.y1} x2={r.x2} y2={r.y2} stroke={r.color} strokeWidth={2} strokeDasharray="6 4" />
          </g>
        ))}
        {m.outliers.map((p, i) => (
          <circle key={i} cx={p.x} cy={p.y} r={4} fill="none" stroke={c.outlier} strokeWidth={1.6} />
        ))}
        {m.annotations.map((a, i) => (
          <g key={i}>
            <line x1={a.x} x2={a.x} y1={plot.y} y2={plot.y + plot.h} stroke={c.text} strokeDasharray="3 3" strokeOpacity={0.8} />
            <text x={a.x + 4} y={plot.y + 14} fill={c.text} fontSize={11}>
              {a.text}
            </text>
          </g>
        ))}
        {[
          ...m.legend,
          ...(m.outliers.length ? [{ label: 'Outlier (not used in rates)', color: c.outlier, detail: '', kind: 'line' as const }] : []),
        ].map((item, k) => {
          if (k > 0 && k % 3 === 0) ly += 20;
          const lx = 24 + (k % 3) * colW;
          return (
            <g key={k}>
              {item.kind === 'band' ? (
                <rect x={lx} y={ly - 9} width={16} height={10} fill={item.color} fillOpacity={0.5} />
              ) : item.label.startsWith('Outlier') ? (
                <circle cx={lx + 8} cy={ly - 4} r={4} fill="none" stroke={item.color} strokeWidth={1.6} />
              ) : (
                <line x1={lx} x2={lx + 16} y1={ly - 4} y2={ly - 4} stroke={item.color} strokeWidth={2.5} />
              )}
              <text x={lx + 22} y={ly} fill={c.text} fontSize={12}>
                {item.label}
                {item.detail && <tspan fill={c.muted}> {item.detail}</tspan>}
              </text>
            </g>
          );
        })}
        {m.captionLines.map((line, i) => (
          <text key={i} x={24} y={ly + 26 + i * 18} fill={c.muted} fontSize={12.5}>
            {line}
          </text>
        ))}
        <text x={24} y={ly + 26 + m.captionLines.length * 18} fill={c.axis} fontSize={11.5} fontStyle="italic" data-role="caution">
          {m.caution}
        </text>
        {hover && hover[0] && (
          <g pointerEvents="none">
            <line x1={hover[0].x} x2={hover[0].x} y1={plot.y} y2={plot.y + plot.h} stroke={c.text} strokeOpacity={0.5} />
            {hover.map((h, i) => (
              <circle key={i} cx={h.x} cy={h.y} r={3.5} fill={h.color} />
            ))}
            <g transform={`translate(${Math.min(hover[0].x + 10, plot.x + plot.w - 190)} ${plot.y + 10})`}>
              <rect width={180} height={22 + hover.length * 16} rx={6} fill={c.background} stroke={c.grid} />
              <text x={8} y={16} fill={c.muted} fontSize={11}>
                {formatUtcDateTime(hover[0].epochMs)}
              </text>
              {hover.map((h, i) => (
                <text key={i} x={8} y={32 + i * 16} fill={h.color} fontSize={11}>
                  {h.label}: {h.value}
                </text>
              ))}
            </g>
          </g>
        )}
      </svg>
    </figure>
  );
}
