import { useEffect, useRef, useState, type HTMLAttributes, type ReactNode, type TdHTMLAttributes, type ThHTMLAttributes } from 'react';
import { cn } from '@/lib/cn';

/**
 * A data table in a box that scrolls sideways when the table is wider than the screen (a phone). While it is wider,
 * the box is a named region in the tab order, so keyboard users can focus it and scroll with ← and →; when it fits,
 * it is a plain box and no extra tab stop.
 */
export function Table({
  caption,
  className,
  children,
  scrollLabel,
  scrollDescribedBy,
  onOverflowChange,
}: {
  caption?: ReactNode;
  className?: string;
  children: ReactNode;
  /** The region's name while it scrolls; defaults to the caption (when it is text) and "scrolls sideways". */
  scrollLabel?: string;
  scrollDescribedBy?: string;
  /** Told whenever the table starts or stops being wider than its box. */
  onOverflowChange?: (overflows: boolean) => void;
}) {
  const box = useRef<HTMLDivElement>(null);
  const [overflows, setOverflows] = useState(false);
  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const measure = () => setOverflows(el.scrollWidth > el.clientWidth + 1);
    const ro = new ResizeObserver(measure);
    ro.observe(el);
    const table = el.querySelector('table');
    if (table) ro.observe(table);
    measure();
    return () => ro.disconnect();
  }, []);
  useEffect(() => onOverflowChange?.(overflows), [overflows, onOverflowChange]);
  const label = scrollLabel ?? (typeof caption === 'string' ? `${caption}, scrolls sideways` : 'Table, scrolls sideways');
  const region = overflows ? { role: 'region', 'aria-label': label, 'aria-describedby': scrollDescribedBy, tabIndex: 0 } : {};
  return (
    <div ref={box} className={cn('overflow-x-auto rounded-xl border border-foil-700/60', className)} {...region}>
      <table className="w-full border-collapse text-left text-sm">
        {caption && <caption className="sr-only">{caption}</caption>}
        {children}
      </table>
    </div>
  );
}

export function THead(props: HTMLAttributes<HTMLTableSectionElement>) {
  return <thead className="bg-night-800/80 text-xs uppercase tracking-wide text-foil-300" {...props} />;
}

export function TBody(props: HTMLAttributes<HTMLTableSectionElement>) {
  return <tbody className="divide-y divide-foil-800/70" {...props} />;
}

export function Tr({ className, ...rest }: HTMLAttributes<HTMLTableRowElement>) {
  return <tr className={cn('align-top hover:bg-night-800/40', className)} {...rest} />;
}

export function Th({ className, scope = 'col', ...rest }: ThHTMLAttributes<HTMLTableCellElement>) {
  return <th scope={scope} className={cn('px-4 py-3 font-bold', className)} {...rest} />;
}

export function Td({ className, ...rest }: TdHTMLAttributes<HTMLTableCellElement>) {
  return <td className={cn('px-4 py-3 text-foil-100', className)} {...rest} />;
}
