import { useState } from 'react';
import { sailModes } from '@shared/schemas/orbit';
import { SAIL_MODE_STYLE } from '@shared/charts/snapshot-chart';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { TextField } from '@/components/ui/text-field';
import { errorMessage } from '@/lib/form-errors';
import { useSailingPeriods } from '../api/get-sailing-periods';
import { useDeleteSailingPeriod, useSaveSailingPeriod } from '../api/save-sailing-period';
import { formatUtcDateTime, sailModeLabels } from '../format';
import type { SailingPeriod, SailMode } from '../types';

const toLocalInput = (iso: string) => iso.slice(0, 16);
const fromLocalInput = (v: string) => (v ? `${v}:00Z` : '');

function PeriodForm({ spacecraftId, editing, onDone }: { spacecraftId: string; editing: SailingPeriod | null; onDone: () => void }) {
  const save = useSaveSailingPeriod();
  const [startAt, setStartAt] = useState(editing ? toLocalInput(editing.startAt) : '');
  const [endAt, setEndAt] = useState(editing ? toLocalInput(editing.endAt) : '');
  const [mode, setMode] = useState<SailMode>(editing?.mode ?? 'raising');
  const [note, setNote] = useState(editing?.note ?? '');
  const fieldError = (path: string) =>
    save.error && 'details' in save.error
      ? (save.error as { details: { path: string; message: string }[] }).details.find((d) => d.path === path)?.message
      : undefined;
  return (
    <form
      className="grid gap-3 sm:grid-cols-2 lg:grid-cols-[1fr_1fr_10rem_2fr_auto] lg:items-end"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate(
          { spacecraftId, id: editing?.id, values: { startAt: fromLocalInput(startAt), endAt: fromLocalInput(endAt), mode, note } },
          {
            onSuccess: () => {
              onDone();
              if (!editing) {
                setStartAt('');
                setEndAt('');
                setNote('');
              }
            },
          },
        );
      }}
    >
      <TextField
        label="Start (UTC)"
        type="datetime-local"
        value={startAt}
        onChange={(e) => setStartAt(e.target.value)}
        required
        error={fieldError('startAt')}
      />
      <TextField
        label="End (UTC)"
        type="datetime-local"
        value={endAt}
        onChange={(e) => setEndAt(e.target.value)}
        required
        error={fieldError('endAt')}
      />
      <label className="space-y-1.5 text-sm font-semibold text-foil-100">
        <span className="block">Mode</span>
        <select
          value={mode}
          onChange={(e) => setMode(e.target.value as SailMode)}
          className="block w-full rounded-lg border border-foil-700 bg-night-950 px-2 py-2 font-normal text-foil-50"
        >
          {sailModes.map((m) => (
            <option key={m} value={m}>
              {sailModeLabels[m]}
            </option>
          ))}
        </select>
      </label>
      <TextField label="Note" value={note} onChange={(e) => setNote(e.target.value)} maxLength={2000} />
      <div className="flex gap-2">
        <Button type="submit" loading={save.isPending}>
          {editing ? 'Save' : 'Add period'}
        </Button>
        {editing && (
          <Button variant="ghost" onClick={onDone}>
            Cancel
          </Button>
        )}
      </div>
      {save.isError && !fieldError('startAt') && !fieldError('endAt') && (
        <Alert className="sm:col-span-2 lg:col-span-5" title="Not saved">
          {errorMessage(save.error)}
        </Alert>
      )}
    </form>
  );
}

export function SailingPeriodLog({ spacecraftId }: { spacecraftId: string }) {
  const q = useSailingPeriods(spacecraftId);
  const del = useDeleteSailingPeriod();
  const [editing, setEditing] = useState<SailingPeriod | null>(null);
  const [deleting, setDeleting] = useState<SailingPeriod | null>(null);
  return (
    <div className="space-y-5">
      <PeriodForm key={editing?.id ?? 'new'} spacecraftId={spacecraftId} editing={editing} onDone={() => setEditing(null)} />
      {q.isPending ? (
        <Spinner label="Loading the log…" />
      ) : q.isError ? (
        <Alert title="Could not load the log">{errorMessage(q.error)}</Alert>
      ) : q.data.sailingPeriods.length === 0 ? (
        <EmptyState
          title="No sailing periods logged"
          description="Log when the sail was raising, edge-on, tumbling or unknown; the trend and the sail yield use them."
        />
      ) : (
        <Table caption="Sailing periods">
          <THead>
            <tr>
              <Th>Mode</Th>
              <Th>Start</Th>
              <Th>End</Th>
              <Th>Days</Th>
              <Th>Note</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </tr>
          </THead>
          <TBody>
            {q.data.sailingPeriods.map((p) => (
              <Tr key={p.id}>
                <Td className="whitespace-nowrap">
                  <span
                    aria-hidden="true"
                    className="mr-2 inline-block size-2.5 rounded-sm"
                    style={{ background: SAIL_MODE_STYLE[p.mode].color }}
                  />
                  {sailModeLabels[p.mode]}
                </Td>
                <Td className="whitespace-nowrap tabular-nums">{formatUtcDateTime(Date.parse(p.startAt))}</Td>
                <Td className="whitespace-nowrap tabular-nums">{formatUtcDateTime(Date.parse(p.endAt))}</Td>
                <Td className="tabular-nums">{((Date.parse(p.endAt) - Date.parse(p.startAt)) / 86_400_000).toFixed(1)}</Td>
                <Td className="min-w-48 text-foil-300">{p.note}</Td>
                <Td className="whitespace-nowrap text-right">
                  <Button size="sm" variant="ghost" onClick={() => setEditing(p)}>
                    Edit
                  </Button>
                  <Button size="sm" variant="ghost" onClick={() => setDeleting(p)}>
                    Delete
                  </Button>
                </Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      )}
      <ConfirmDialog
        open={!!deleting}
        title="Delete this sailing period?"
        confirmLabel="Delete"
        tone="danger"
        pending={del.isPending}
        onCancel={() => setDeleting(null)}
        onConfirm={() => deleting && del.mutate({ spacecraftId, id: deleting.id }, { onSuccess: () => setDeleting(null) })}
      >
        The trend's shading and the sail-yield comparison will no longer use it.
      </ConfirmDialog>
    </div>
  );
}
