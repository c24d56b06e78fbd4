import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';

const LEGEND_PX = 56;

/**
 * A thin React home for one uPlot canvas: created once per `options` identity, fed new data with setData (no
 * re-creation on zoom), resized with its box. uPlot owns the canvas; React owns nothing inside it.
 */
export function UPlotChart({
  options,
  data,
  xRange,
  onCreate,
  className,
}: {
  options: Omit<uPlot.Options, 'width' | 'height'>;
  data: uPlot.AlignedData;
  /** The x range shown (the view), in the x unit; the y scales fit what is visible in it. */
  xRange: { min: number; max: number };
  onCreate?: (u: uPlot) => void;
  className?: string;
}) {
  const box = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const dataRef = useRef(data);
  dataRef.current = data;
  const onCreateRef = useRef(onCreate);
  onCreateRef.current = onCreate;

  useEffect(() => {
    const el = box.current;
    if (!el) return;
    // The box's height holds the plot and uPlot's legend (the hover read-out) below it.
    const size = () => ({ width: Math.max(200, el.clientWidth), height: Math.max(160, el.clientHeight - LEGEND_PX) });
    const u = new uPlot({ ...options, ...size() }, dataRef.current, el);
    plot.current = u;
    onCreateRef.current?.(u);
    const ro = new ResizeObserver(() => u.setSize(size()));
    ro.observe(el);
    return () => {
      ro.disconnect();
      u.destroy();
      plot.current = null;
    };
  }, [options]);

  const { min, max } = xRange;
  useEffect(() => {
    const u = plot.current;
    if (!u) return;
    if (u.data !== data) u.setData(data, true);
    u.setScale('x', { min, max });
  }, [data, min, max, options]);

  return <div ref={box} className={className} />;
}
