import type { HTMLAttributes, ReactNode, TdHTMLAttributes, ThHTMLAttributes } from 'react';
import { cn } from '@/lib/cn';

export function Table({
  caption,
  className,
  children,
  scrollLabel,
  scrollDescribedBy,
}: {
  caption?: ReactNode;
  className?: string;
  children: ReactNode;
  /** For a table that may be wider than the screen: its scroll box becomes a named region keyboard users can focus and scroll. */
  scrollLabel?: string;
  scrollDescribedBy?: string;
}) {
  const region = scrollLabel ? { role: 'region', 'aria-label': scrollLabel, 'aria-describedby': scrollDescribedBy, tabIndex: 0 } : {};
  return (
    <div className={cn('overflow-x-auto rounded-xl border border-foil-700/60', className)} {...region}>
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
