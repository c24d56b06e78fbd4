import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { errorMessage } from '@/lib/form-errors';
import { useDeleteSnapshot, useSnapshots, useUpdateSnapshot } from '../api/snapshots';
import { formatUtcDate } from '../format';
import type { SnapshotSummary } from '../types';

function SnapshotItem({ s, canChange, onDelete }: { s: SnapshotSummary; canChange: boolean; onDelete: () => void }) {
  const update = useUpdateSnapshot();
  const [renaming, setRenaming] = useState(false);
  const [title, setTitle] = useState(s.title);
  const link = `${window.location.origin}${s.publicPath}`;
  return (
    <li className="flex flex-col gap-3 rounded-xl border border-foil-800 bg-night-950/40 p-3 sm:flex-row">
      <img
        src={`/api/orbit/snapshots/${s.id}/chart.svg`}
        alt=""
        className="aspect-[16/9] w-full shrink-0 rounded-lg bg-night-900 object-cover sm:w-56"
        loading="lazy"
      />
      <div className="min-w-0 flex-1 space-y-1.5">
        {renaming ? (
          <form
            className="flex gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              update.mutate({ id: s.id, patch: { title } }, { onSuccess: () => setRenaming(false) });
            }}
          >
            <input
              aria-label="New title"
              value={title}
              onChange={(e) => setTitle(e.target.value)}
              maxLength={120}
              className="min-w-0 flex-1 rounded-lg border border-foil-700 bg-night-950 px-2 py-1 text-foil-50"
            />
            <Button size="sm" type="submit" loading={update.isPending}>
              Save
            </Button>
            <Button size="sm" variant="ghost" onClick={() => setRenaming(false)}>
              Cancel
            </Button>
          </form>
        ) : (
          <Link to={`/console/orbit/snapshots/${s.id}`} className="block truncate font-bold text-foil-50 hover:text-amber-300">
            {s.title}
          </Link>
        )}
        <p className="text-xs text-foil-400">
          {formatUtcDate(s.window.fromMs)} – {formatUtcDate(s.window.toMs)} · by {s.owner?.displayName ?? 'a former account'} · saved{' '}
          {formatUtcDate(Date.parse(s.createdAt))}
        </p>
        <div className="flex flex-wrap items-center gap-2">
          {s.isPublic ? <Badge tone="good">public</Badge> : <Badge>private</Badge>}
          {s.isPublic && (
            <a href={s.publicPath} className="truncate text-xs text-amber-300 underline">
              {link}
            </a>
          )}
        </div>
        {canChange && (
          <div className="flex flex-wrap gap-1 pt-1">
            <Button size="sm" variant="ghost" onClick={() => setRenaming(true)}>
              Rename
            </Button>
            <Button
              size="sm"
              variant="ghost"
              loading={update.isPending && !renaming}
              onClick={() => update.mutate({ id: s.id, patch: { isPublic: !s.isPublic } })}
            >
              {s.isPublic ? 'Make private' : 'Make public'}
            </Button>
            <a
              className="inline-flex min-h-8 items-center px-3 text-sm font-semibold text-foil-200 hover:text-foil-50"
              href={`/api/orbit/snapshots/${s.id}/chart.png`}
              download={`${s.slug}.png`}
            >
              PNG
            </a>
            <a
              className="inline-flex min-h-8 items-center px-3 text-sm font-semibold text-foil-200 hover:text-foil-50"
              href={`/api/orbit/snapshots/${s.id}/chart.svg`}
              download={`${s.slug}.svg`}
            >
              SVG
            </a>
            <Button size="sm" variant="ghost" onClick={onDelete}>
              Delete
            </Button>
          </div>
        )}
        {update.isError && <Alert title="Not changed">{errorMessage(update.error)}</Alert>}
      </div>
    </li>
  );
}

export function SnapshotList({ meId, isAdmin }: { meId: string | undefined; isAdmin: boolean }) {
  const [mine, setMine] = useState(true);
  const q = useSnapshots(mine);
  const del = useDeleteSnapshot();
  const [deleting, setDeleting] = useState<SnapshotSummary | null>(null);
  return (
    <div className="space-y-4">
      <div className="flex gap-2" role="group" aria-label="Whose snapshots">
        <Button size="sm" variant={mine ? 'primary' : 'secondary'} aria-pressed={mine} onClick={() => setMine(true)}>
          Mine
        </Button>
        <Button size="sm" variant={!mine ? 'primary' : 'secondary'} aria-pressed={!mine} onClick={() => setMine(false)}>
          Everyone's
        </Button>
      </div>
      {q.isPending ? (
        <Spinner label="Loading snapshots…" />
      ) : q.isError ? (
        <Alert title="Could not load snapshots">{errorMessage(q.error)}</Alert>
      ) : q.data.snapshots.length === 0 ? (
        <EmptyState
          title="No snapshots yet"
          description="Freeze a chart from the trend view: it keeps its data, window, series and caption."
        />
      ) : (
        <ul className="space-y-3" data-testid="snapshot-list">
          {q.data.snapshots.map((s) => (
            <SnapshotItem key={s.id} s={s} canChange={isAdmin || s.owner?.id === meId} onDelete={() => setDeleting(s)} />
          ))}
        </ul>
      )}
      <ConfirmDialog
        open={!!deleting}
        title={`Delete “${deleting?.title ?? ''}”?`}
        confirmLabel="Delete"
        tone="danger"
        pending={del.isPending}
        onCancel={() => setDeleting(null)}
        onConfirm={() => deleting && del.mutate({ id: deleting.id }, { onSuccess: () => setDeleting(null) })}
      >
        Its public link stops working, and dispatches that embed it lose the chart.
      </ConfirmDialog>
    </div>
  );
}
