import { useId, type ReactNode } from 'react';
import { cn } from '@/lib/cn';

export type ChartTable = { caption: string; columns: string[]; rows: (string | number)[][] };

/**
 * Every chart in one frame: a title, the drawing (hidden from screen readers, which get the summary instead), a
 * sentence that says what the chart shows, and the numbers behind it as a table a reader can open.
 */
export function ChartFrame({
  title,
  summary,
  table,
  children,
  className,
  headingLevel = 3,
}: {
  title: ReactNode;
  summary: ReactNode;
  table?: ChartTable;
  children: ReactNode;
  className?: string;
  headingLevel?: 2 | 3;
}) {
  const summaryId = useId();
  const Heading = headingLevel === 2 ? 'h2' : 'h3';
  return (
    <figure aria-describedby={summaryId} className={cn('min-w-0', className)}>
      <Heading className="text-sm font-bold text-foil-100">{title}</Heading>
      <div aria-hidden="true" className="mt-2">
        {children}
      </div>
      <figcaption id={summaryId} className="mt-2 text-sm text-foil-300">
        {summary}
      </figcaption>
      {table && (
        <details className="mt-2 text-sm">
          <summary className="cursor-pointer font-semibold text-amber-300 underline-offset-2 hover:underline">
            The numbers as a table
          </summary>
          <div className="mt-2 max-h-64 overflow-auto rounded-lg border border-foil-700/60">
            <table className="w-full border-collapse text-left text-xs">
              <caption className="sr-only">{table.caption}</caption>
              <thead className="sticky top-0 bg-night-800 text-foil-200">
                <tr>
                  {table.columns.map((c) => (
                    <th key={c} scope="col" className="px-3 py-2 font-bold">
                      {c}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody className="divide-y divide-foil-800/70">
                {table.rows.map((row, i) => (
                  <tr key={i}>
                    {row.map((cell, j) => (
                      <td key={j} className="px-3 py-1.5 tabular-nums text-foil-100">
                        {cell}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </details>
      )}
    </figure>
  );
}
