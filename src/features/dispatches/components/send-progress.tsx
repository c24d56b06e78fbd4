import { Button } from '@/components/ui/button';
import { ProgressBar } from '@/components/ui/progress-bar';
import { useProgress, useRetryFailed } from '../api/get-progress';

/** Queued / sent / failed for a dispatch's e-mail, refreshed every second while mail is going out. */
export function SendProgress({ id }: { id: string }) {
  const q = useProgress(id, true);
  const retry = useRetryFailed(id);
  if (!q.data || q.data.state === 'none') return null;
  const p = q.data;
  const pct = p.total ? Math.round(((p.sent + p.failed) / p.total) * 100) : 0;
  return (
    <section aria-labelledby="sending" className="mt-6 rounded-xl border border-foil-800 p-4">
      <h2 id="sending" className="text-lg font-bold">
        E-mail to the audience
      </h2>
      {p.state === 'pending' ? (
        <p className="mt-2 text-foil-300">Working out who receives it…</p>
      ) : (
        <>
          <ProgressBar className="mt-3" value={pct} label="Messages handled" valueText={`${pct} % (${p.sent} sent of ${p.total})`} />
          <p className="mt-2" data-testid="send-counts" aria-live="polite">
            {pct} % · {p.queued} queued · {p.sent} sent · {p.failed} failed · {p.total} recipients
          </p>
        </>
      )}
      {p.failures.length > 0 && (
        <div className="mt-3">
          <Button variant="secondary" size="sm" loading={retry.isPending} onClick={() => retry.mutate(undefined)}>
            Retry all failed
          </Button>
          <ul className="mt-2 space-y-1 text-sm">
            {p.failures.map((f) => (
              <li key={String(f.mailId)} className="flex flex-wrap items-center gap-2">
                <span className="font-semibold">{f.email}</span>
                <span className="text-foil-300">{f.error}</span>
                <Button variant="ghost" size="sm" onClick={() => retry.mutate([f.mailId])}>
                  Retry
                </Button>
              </li>
            ))}
          </ul>
        </div>
      )}
    </section>
  );
}
