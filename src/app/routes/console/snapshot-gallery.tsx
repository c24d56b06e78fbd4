import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Card } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { Spinner } from '@/components/ui/spinner';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { useSpacecraft } from '@/features/orbit/api/get-spacecraft';
import { useSnapshots } from '@/features/orbit/api/snapshots';
import { formatUtcDate } from '@/features/orbit/format';

/** Outreach's read-only view of the orbit desk's snapshots, to pick from when writing a dispatch. */
export function Component() {
  useDocumentTitle('Snapshot gallery');
  const craft = useSpacecraft();
  const snapshots = useSnapshots(false);
  const [chosen, setChosen] = useState<string | null>(null);
  const all = craft.data?.spacecraft ?? [];
  // The mission craft's snapshots first; "all" shows every craft's.
  const craftId = chosen ?? all.find((c) => c.isMissionCraft)?.id ?? 'all';
  const shown = (snapshots.data?.snapshots ?? []).filter((s) => craftId === 'all' || s.spacecraftId === craftId);
  return (
    <>
      <PageHeader
        eyebrow="Console"
        title="Snapshot gallery"
        description="Charts the engineers froze from the orbit desk. Public ones have a stable link you can put in a dispatch."
      />
      {all.length > 1 && (
        <label className="mb-4 flex items-center gap-2 text-sm text-foil-300">
          Spacecraft
          <select
            className="rounded-lg border border-foil-700 bg-night-950 px-2 py-1 text-foil-50"
            value={craftId}
            onChange={(e) => setChosen(e.target.value)}
          >
            {all.map((c) => (
              <option key={c.id} value={c.id}>
                {c.isMissionCraft ? `${c.name} (mission craft)` : c.name}
              </option>
            ))}
            <option value="all">Every craft</option>
          </select>
        </label>
      )}
      {snapshots.isPending || craft.isPending ? (
        <Spinner label="Loading the snapshots…" />
      ) : snapshots.isError ? (
        <Alert title="Could not load the snapshots">{errorMessage(snapshots.error)}</Alert>
      ) : shown.length === 0 ? (
        <EmptyState title="No snapshots yet" description="When an engineer saves a chart on the orbit desk, it appears here." />
      ) : (
        <ul className="grid gap-4 sm:grid-cols-2 xl:grid-cols-3" data-testid="snapshot-gallery">
          {shown.map((s) => (
            <li key={s.id}>
              <Card className="h-full">
                <img
                  src={`/api/orbit/snapshots/${s.id}/chart.svg`}
                  alt={`Chart: ${s.title}`}
                  className="aspect-[16/9] w-full rounded-lg bg-night-900 object-cover"
                  loading="lazy"
                />
                <h2 className="mt-3 font-bold text-foil-50">{s.title}</h2>
                {s.caption && <p className="mt-1 text-sm text-foil-300">{s.caption}</p>}
                <p className="mt-1 text-xs text-foil-400">
                  {formatUtcDate(s.window.fromMs)} – {formatUtcDate(s.window.toMs)} · by {s.owner?.displayName ?? 'a former account'}
                </p>
                <div className="mt-2 flex flex-wrap items-center gap-2 text-sm">
                  {s.isPublic ? (
                    <>
                      <Badge tone="good">public</Badge>
                      <a className="font-semibold text-amber-300 underline" href={s.publicPath}>
                        Public page
                      </a>
                      <a className="font-semibold text-amber-300 underline" href={s.pngPath}>
                        Image (PNG)
                      </a>
                    </>
                  ) : (
                    <Badge tone="neutral">not public — ask an engineer to publish it before a dispatch uses it</Badge>
                  )}
                </div>
              </Card>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
