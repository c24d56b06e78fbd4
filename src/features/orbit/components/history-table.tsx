import { useMemo, useState } from 'react';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button, buttonClasses } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { TextField } from '@/components/ui/text-field';
import { errorMessage } from '@/lib/form-errors';
import { historyPath, useHistory } from '../api/get-history';
import { countOf, formatUtcDateTime, fromDateInput } from '../format';
import type { HistoryParams, HistoryRow, HistorySort } from '../types';

const col = createColumnHelper<HistoryRow>();
const columns = [
  col.accessor('epoch', { id: 'epoch', header: 'Epoch (UTC)', cell: (c) => formatUtcDateTime(c.row.original.epochMs) }),
  col.accessor('elementSetNo', { id: 'elementSetNo', header: 'Set no.', cell: (c) => c.getValue() }),
  col.accessor('semiMajorAxisKm', { id: 'semiMajorAxisKm', header: 'a (km)', cell: (c) => c.getValue().toFixed(3) }),
  col.accessor('eccentricity', { id: 'eccentricity', header: 'e', cell: (c) => c.getValue().toFixed(7) }),
  col.accessor('inclinationDeg', { id: 'inclinationDeg', header: 'i (°)', cell: (c) => c.getValue().toFixed(4) }),
  col.accessor('apogeeAltitudeKm', { id: 'apogeeAltitudeKm', header: 'Apogee (km)', cell: (c) => c.getValue().toFixed(2) }),
  col.accessor('perigeeAltitudeKm', { id: 'perigeeAltitudeKm', header: 'Perigee (km)', cell: (c) => c.getValue().toFixed(2) }),
  col.accessor('bstar', { id: 'bstar', header: 'B* (1/ER)', cell: (c) => c.getValue().toExponential(4) }),
  col.accessor('fileName', {
    id: 'fileName',
    header: 'Source file',
    enableSorting: false,
    cell: (c) => (
      <span className="block min-w-32 whitespace-normal break-all" title={`line ${c.row.original.sourceLine}`}>
        {c.getValue()}
      </span>
    ),
  }),
  col.accessor('outlier', {
    id: 'outlier',
    header: 'Outlier',
    enableSorting: false,
    cell: (c) => (c.getValue() ? <Badge tone="attention">outlier</Badge> : ''),
  }),
];

/** The stored history, sorted, filtered and paged on the server. */
export function HistoryTable({ spacecraftId }: { spacecraftId: string }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: 'epoch', desc: true }]);
  const [pagination, setPagination] = useState({ pageIndex: 0, pageSize: 25 });
  const [fromInput, setFromInput] = useState('');
  const [toInput, setToInput] = useState('');
  const [range, setRange] = useState<{ from?: string; to?: string }>({});
  const params: HistoryParams = useMemo(
    () => ({
      page: pagination.pageIndex + 1,
      pageSize: pagination.pageSize,
      sort: (sorting[0]?.id ?? 'epoch') as HistorySort,
      dir: sorting[0]?.desc === false ? 'asc' : 'desc',
      ...range,
    }),
    [pagination, sorting, range],
  );
  const q = useHistory(spacecraftId, params);
  // Says so when the table is wider than its box (a narrow window), so no column goes unseen.
  const [overflows, setOverflows] = useState(false);
  const table = useReactTable({
    data: q.data?.rows ?? [],
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    rowCount: q.data?.total ?? 0,
    state: { sorting, pagination },
    onSortingChange: (u) => {
      setSorting(u);
      setPagination((p) => ({ ...p, pageIndex: 0 }));
    },
    onPaginationChange: setPagination,
    enableSortingRemoval: false,
  });

  return (
    <div className="space-y-4">
      <form
        className="flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          const from = fromDateInput(fromInput),
            to = fromDateInput(toInput, true);
          setRange({
            from: from === null ? undefined : new Date(from).toISOString(),
            to: to === null ? undefined : new Date(to).toISOString(),
          });
          setPagination((p) => ({ ...p, pageIndex: 0 }));
        }}
      >
        <TextField label="Epoch from" type="date" value={fromInput} onChange={(e) => setFromInput(e.target.value)} />
        <TextField label="to" type="date" value={toInput} onChange={(e) => setToInput(e.target.value)} />
        <Button type="submit" variant="secondary">
          Filter
        </Button>
        {(range.from || range.to) && (
          <Button
            variant="ghost"
            onClick={() => {
              setRange({});
              setFromInput('');
              setToInput('');
            }}
          >
            Clear
          </Button>
        )}
        <a
          className={buttonClasses({ variant: 'secondary', className: 'ml-auto' })}
          href={historyPath(spacecraftId, { sort: params.sort, dir: params.dir, ...range }, true)}
          download
        >
          Export CSV
        </a>
      </form>
      {q.isPending ? (
        <Spinner label="Loading the history…" />
      ) : q.isError ? (
        <Alert title="Could not load the history">{errorMessage(q.error)}</Alert>
      ) : (
        <>
          {overflows && (
            <p id="history-scroll-hint" className="flex items-center gap-1.5 text-sm text-amber-200" data-testid="history-scroll-hint">
              <span aria-hidden="true">⇆</span>
              The table is wider than this window: scroll it sideways to see all {columns.length} columns (with the table focused, ← and →).
            </p>
          )}
          <Table caption="Element-set history" scrollDescribedBy="history-scroll-hint" onOverflowChange={setOverflows}>
            <THead>
              {table.getHeaderGroups().map((hg) => (
                <tr key={hg.id}>
                  {hg.headers.map((h) => {
                    const sorted = h.column.getIsSorted();
                    return (
                      <Th
                        key={h.id}
                        aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                        className="whitespace-nowrap px-2 py-2.5"
                      >
                        {h.column.getCanSort() ? (
                          <button
                            type="button"
                            className="inline-flex items-center gap-1 uppercase hover:text-foil-50"
                            onClick={h.column.getToggleSortingHandler()}
                          >
                            {flexRender(h.column.columnDef.header, h.getContext())}
                            <span aria-hidden="true">{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}</span>
                          </button>
                        ) : (
                          flexRender(h.column.columnDef.header, h.getContext())
                        )}
                      </Th>
                    );
                  })}
                </tr>
              ))}
            </THead>
            <TBody>
              {table.getRowModel().rows.map((r) => (
                <Tr key={r.id} className={r.original.outlier ? 'bg-red-950/20' : undefined}>
                  {r.getVisibleCells().map((c) => (
                    <Td key={c.id} className="whitespace-nowrap px-2 py-2 tabular-nums">
                      {flexRender(c.column.columnDef.cell, c.getContext())}
                    </Td>
                  ))}
                </Tr>
              ))}
            </TBody>
          </Table>
          <div className="flex flex-wrap items-center justify-between gap-3 text-sm text-foil-300">
            <span>
              {countOf(q.data.total, 'set')} · page {q.data.page} of {q.data.pageCount}
              {q.isFetching && ' · loading…'}
            </span>
            <div className="flex items-center gap-2">
              <label className="flex items-center gap-1.5">
                Rows
                <select
                  className="rounded-lg border border-foil-700 bg-night-950 px-2 py-1 text-foil-50"
                  value={pagination.pageSize}
                  onChange={(e) => setPagination({ pageIndex: 0, pageSize: Number(e.target.value) })}
                >
                  {[25, 50, 100, 250].map((n) => (
                    <option key={n} value={n}>
                      {n}
                    </option>
                  ))}
                </select>
              </label>
              <Button size="sm" variant="secondary" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
                Previous
              </Button>
              <Button size="sm" variant="secondary" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
                Next
              </Button>
            </div>
          </div>
        </>
      )}
    </div>
  );
}
