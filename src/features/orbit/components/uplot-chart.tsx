import { useEffect, useImperativeHandle, useRef, type Ref } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';

const LEGEND_PX = 56;

/** Moves the plot's x scale straight away, from the data it already has (no React render, no new data). */
export type UPlotHandle = { setView: (min: number, max: number) => void };

/**
 * A thin React home for one uPlot canvas: created once per `options` identity, fed new data with setData (no
 * re-creation on zoom), resized with its box. uPlot owns the canvas; React owns nothing inside it.
 *
 * Kept off the page's critical task: the plot is made in the box's first ResizeObserver callback (the size comes
 * from the observer, so nothing forces a layout inside React's commit), the x scale takes the view from a range
 * function (so new data draws once, already at the view), and a resize to the same size draws nothing.
 */
export function UPlotChart({
  options,
  data,
  xRange,
  onCreate,
  className,
  handle,
}: {
  options: Omit<uPlot.Options, 'width' | 'height'>;
  data: uPlot.AlignedData;
  /** The x range shown (the view), in the x unit; the y scales fit what is visible in it. */
  xRange: { min: number; max: number };
  onCreate?: (u: uPlot) => void;
  className?: string;
  handle?: Ref<UPlotHandle>;
}) {
  const box = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const dataRef = useRef(data);
  dataRef.current = data;
  // The view shown: the prop's, unless setView moved it since the prop last changed (a zoom drawn before React
  // renders it must not be undone by a render that still carries the previous view).
  const viewRef = useRef(xRange);
  const propView = useRef(xRange);
  if (propView.current.min !== xRange.min || propView.current.max !== xRange.max) {
    propView.current = xRange;
    viewRef.current = xRange;
  }
  const onCreateRef = useRef(onCreate);
  onCreateRef.current = onCreate;

  useEffect(() => {
    const el = box.current;
    if (!el) return;
    let u: uPlot | null = null;
    let last = { width: 0, height: 0 };
    const x = options.scales?.x ?? {};
    const withView: Omit<uPlot.Options, 'width' | 'height'> = {
      ...options,
      scales: { ...options.scales, x: { ...x, range: () => [viewRef.current.min, viewRef.current.max] } },
    };
    // The box's height holds the plot and uPlot's legend (the hover read-out) below it.
    const ro = new ResizeObserver((entries) => {
      const rect = entries[entries.length - 1]!.contentRect;
      const size = { width: Math.max(200, Math.round(rect.width)), height: Math.max(160, Math.round(rect.height) - LEGEND_PX) };
      if (size.width === last.width && size.height === last.height) return;
      last = size;
      if (u) {
        u.setSize(size);
        return;
      }
      u = new uPlot({ ...withView, ...size }, dataRef.current, el);
      plot.current = u;
      onCreateRef.current?.(u);
    });
    ro.observe(el);
    return () => {
      ro.disconnect();
      u?.destroy();
      plot.current = null;
    };
  }, [options]);

  useImperativeHandle(
    handle,
    () => ({
      setView: (vMin, vMax) => {
        // The range function reads viewRef: set it first, then one redraw at the new scale.
        viewRef.current = { min: vMin, max: vMax };
        plot.current?.setScale('x', { min: vMin, max: vMax });
      },
    }),
    [],
  );

  const { min, max } = xRange;
  useEffect(() => {
    const u = plot.current;
    if (!u) return;
    // New data: one draw, with the x scale set to the view by its range function.
    if (u.data !== data) u.setData(data, true);
    else {
      const sx = u.scales.x;
      if (sx?.min !== min || sx?.max !== max) {
        viewRef.current = { min, max };
        u.setScale('x', { min, max });
      }
    }
  }, [data, min, max]);

  return <div ref={box} className={className} />;
}
