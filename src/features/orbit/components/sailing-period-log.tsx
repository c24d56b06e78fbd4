import { useEffect, useRef, useState } from 'react';
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
import { isApiError } from '@/lib/api-client';
import { trimToFree } from '@shared/orbit/period-overlap';
import { useSailingPeriods } from '../api/get-sailing-periods';
import { useDeleteSailingPeriod, useSaveSailingPeriod } from '../api/save-sailing-period';
import { DATE_TIME_HINT, formatUtcDateTime, fromDateTimeInput, sailModeLabels, toDateTimeInput } from '../format';
import type { SailingPeriod, SailMode } from '../types';

function PeriodForm({
  spacecraftId,
  editing,
  periods,
  onDone,
}: {
  spacecraftId: string;
  editing: SailingPeriod | null;
  periods: readonly SailingPeriod[];
  onDone: () => void;
}) {
  const save = useSaveSailingPeriod();
  const [startAt, setStartAt] = useState(editing ? toDateTimeInput(editing.startAt) : '');
  const [endAt, setEndAt] = useState(editing ? toDateTimeInput(editing.endAt) : '');
  const [mode, setMode] = useState<SailMode>(editing?.mode ?? 'raising');
  const [note, setNote] = useState(editing?.note ?? '');
  const [local, setLocal] = useState<{ startAt?: string; endAt?: string }>({});
  const startRef = useRef<HTMLInputElement>(null);
  const formRef = useRef<HTMLFormElement>(null);
  useEffect(() => {
    // Editing a row far down the log: bring the form into view and put the cursor in it.
    if (!editing) return;
    formRef.current?.scrollIntoView({ block: 'center', behavior: 'smooth' });
    startRef.current?.focus({ preventScroll: true });
  }, [editing]);
  const serverError = (path: string) =>
    isApiError(save.error) && save.error.code === 'validation_failed'
      ? save.error.details.find((d) => d.path === path)?.message
      : undefined;
  const overlap = isApiError(save.error) && save.error.code === 'orbit.sailing_period_overlap' ? save.error : null;
  const submit = (values: { startAt: string; endAt: string }) => {
    const s = fromDateTimeInput(values.startAt),
      e = fromDateTimeInput(values.endAt);
    const problems = {
      startAt: s ? undefined : `write it as ${DATE_TIME_HINT.replace(', UTC', '')}, e.g. 2026-02-01 14:00`,
      endAt: e ? undefined : `write it as ${DATE_TIME_HINT.replace(', UTC', '')}, e.g. 2026-02-10 06:30`,
    };
    setLocal(problems);
    if (!s || !e) return;
    save.mutate(
      { spacecraftId, id: editing?.id, values: { startAt: s, endAt: e, mode, note } },
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
  };
  // The offer that goes with a refused overlap: the longest free part of what was asked, against the log as it is.
  const requested = { startMs: Date.parse(fromDateTimeInput(startAt) ?? ''), endMs: Date.parse(fromDateTimeInput(endAt) ?? '') };
  const others = periods.filter((p) => p.id !== editing?.id).map((p) => ({ startMs: Date.parse(p.startAt), endMs: Date.parse(p.endAt) }));
  const trim = overlap && Number.isFinite(requested.startMs) && Number.isFinite(requested.endMs) ? trimToFree(requested, others) : null;
  return (
    <form
      ref={formRef}
      aria-label={editing ? 'Edit the sailing period' : 'Add a sailing period'}
      className="grid gap-3 rounded-xl sm:grid-cols-2 lg:grid-cols-[1fr_1fr_10rem_2fr_auto] lg:items-start"
      onSubmit={(e) => {
        e.preventDefault();
        submit({ startAt, endAt });
      }}
    >
      <TextField
        ref={startRef}
        label="Start"
        hint={DATE_TIME_HINT}
        placeholder="2026-02-01 00:00"
        inputMode="numeric"
        autoComplete="off"
        value={startAt}
        onChange={(e) => setStartAt(e.target.value)}
        required
        error={local.startAt ?? serverError('startAt')}
      />
      <TextField
        label="End"
        hint={DATE_TIME_HINT}
        placeholder="2026-02-10 00:00"
        inputMode="numeric"
        autoComplete="off"
        value={endAt}
        onChange={(e) => setEndAt(e.target.value)}
        required
        error={local.endAt ?? serverError('endAt')}
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
      <div className="flex gap-2 lg:pt-7">
        <Button type="submit" loading={save.isPending}>
          {editing ? 'Save' : 'Add period'}
        </Button>
        {editing && (
          <Button variant="ghost" onClick={onDone}>
            Cancel
          </Button>
        )}
      </div>
      {overlap ? (
        <div className="sm:col-span-2 lg:col-span-5" data-testid="period-overlap">
          <Alert title="Overlaps another period">
            <p>{overlap.message}</p>
            {trim && (
              <Button
                className="mt-2"
                size="sm"
                variant="secondary"
                onClick={() => {
                  const s = toDateTimeInput(new Date(trim.startMs).toISOString()),
                    e = toDateTimeInput(new Date(trim.endMs).toISOString());
                  setStartAt(s);
                  setEndAt(e);
                  submit({ startAt: s, endAt: e });
                }}
              >
                Trim to {formatUtcDateTime(trim.startMs)} – {formatUtcDateTime(trim.endMs)}
              </Button>
            )}
          </Alert>
        </div>
      ) : (
        save.isError &&
        !serverError('startAt') &&
        !serverError('endAt') && (
          <Alert className="sm:col-span-2 lg:col-span-5" title="Not saved">
            {errorMessage(save.error)}
          </Alert>
        )
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
      <PeriodForm
        key={editing?.id ?? 'new'}
        spacecraftId={spacecraftId}
        editing={editing}
        periods={q.data?.sailingPeriods ?? []}
        onDone={() => setEditing(null)}
      />
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
