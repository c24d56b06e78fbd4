import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { errorMessage } from '@/lib/form-errors';
import type { SnapshotSeriesKey } from '@shared/charts/snapshot-chart';
import { useCreateSnapshot } from '../api/snapshots';
import { fromDateInput, toDateInput } from '../format';
import type { Domain } from './trend-chart';

/** Freezes what the chart shows now — window, series, rate window — with a caption and an optional note. */
export function SaveSnapshotForm({
  spacecraftId,
  view,
  rateWindow,
  series,
}: {
  spacecraftId: string;
  view: Domain;
  rateWindow: Domain;
  series: SnapshotSeriesKey[];
}) {
  const create = useCreateSnapshot();
  const [title, setTitle] = useState('');
  const [caption, setCaption] = useState('');
  const [noteText, setNoteText] = useState('');
  const [noteDate, setNoteDate] = useState('');
  const [isPublic, setIsPublic] = useState(false);
  return (
    <form
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        const atMs = fromDateInput(noteDate);
        create.mutate({
          spacecraftId,
          title,
          caption,
          fromMs: view.fromMs,
          toMs: view.toMs,
          rateFromMs: rateWindow.fromMs,
          rateToMs: rateWindow.toMs,
          series,
          isPublic,
          annotations: noteText.trim() && atMs !== null ? [{ atMs, text: noteText.trim() }] : [],
        });
      }}
    >
      <TextField label="Title" value={title} onChange={(e) => setTitle(e.target.value)} required maxLength={120} />
      <div className="space-y-1.5">
        <label htmlFor="snapshot-caption" className="block text-sm font-semibold text-foil-100">
          Caption
        </label>
        <textarea
          id="snapshot-caption"
          value={caption}
          onChange={(e) => setCaption(e.target.value)}
          maxLength={1000}
          rows={2}
          className="block w-full rounded-lg border border-foil-700 bg-night-950/60 px-3 py-2 text-foil-50 focus:border-amber-400"
        />
      </div>
      <div className="grid gap-3 sm:grid-cols-[1fr_11rem]">
        <TextField label="Note on the chart (optional)" value={noteText} onChange={(e) => setNoteText(e.target.value)} maxLength={200} />
        <TextField
          label="Note date"
          hint={`yyyy-mm-dd, UTC, ${toDateInput(view.fromMs)} to ${toDateInput(view.toMs)}`}
          inputMode="numeric"
          value={noteDate}
          onChange={(e) => setNoteDate(e.target.value)}
        />
      </div>
      <label className="flex items-center gap-2 text-sm text-foil-100">
        <input type="checkbox" checked={isPublic} onChange={(e) => setIsPublic(e.target.checked)} className="size-4 accent-amber-400" />
        Public: anyone with the link can see it
      </label>
      {create.isError && <Alert title="The snapshot was not saved">{errorMessage(create.error)}</Alert>}
      {create.isSuccess && (
        <Alert tone="success" title="Snapshot saved">
          <Link className="underline" to={`/console/orbit/snapshots/${create.data.snapshot.id}`}>
            Open “{create.data.snapshot.title}”
          </Link>
        </Alert>
      )}
      <Button type="submit" loading={create.isPending}>
        Save snapshot
      </Button>
    </form>
  );
}
