import { Alert } from '@/components/ui/alert';
import { Card, CardHeader } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { Button } from '@/components/ui/button';
import { errorMessage } from '@/lib/form-errors';
import { useAudit, type AuditEntry } from '../api/get-audit';

const timeFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });

function show(value: unknown): string {
  if (value === undefined || value === null) return '—';
  if (Array.isArray(value)) return value.length ? value.map(show).join(', ') : 'none';
  if (typeof value === 'object') return JSON.stringify(value);
  return String(value);
}

/** The keys that changed, each as before → after; a whole value when either side is not an object. */
export function describeChange(before: unknown, after: unknown): { key: string | null; before: string; after: string }[] {
  const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
  if (before == null && after == null) return [];
  // A record created or deleted: show its fields against nothing.
  if (before == null && isRecord(after)) before = {};
  if (after == null && isRecord(before)) after = {};
  if (!isRecord(before) || !isRecord(after)) {
    return [{ key: null, before: show(before), after: show(after) }];
  }
  const keys = [...new Set([...Object.keys(before), ...Object.keys(after)])];
  return keys
    .filter((key) => JSON.stringify(before[key]) !== JSON.stringify(after[key]))
    .map((key) => ({ key, before: show(before[key]), after: show(after[key]) }));
}

function subjectLabel(entry: AuditEntry, subjectNames: Map<string, string>): string {
  const name = entry.subjectId ? subjectNames.get(entry.subjectId) : undefined;
  if (name) return `${entry.subjectType} ${name}`;
  return entry.subjectId ? `${entry.subjectType} ${entry.subjectId}` : entry.subjectType;
}

export function AuditLogPanel({ subjectNames = new Map() }: { subjectNames?: Map<string, string> }) {
  const audit = useAudit({ limit: 100 });

  return (
    <Card>
      <CardHeader
        title="Audit log"
        description="The latest 100 changes: who did what to which record, with the values before and after."
        actions={
          <Button variant="ghost" size="sm" onClick={() => audit.refetch()} loading={audit.isFetching && !audit.isPending}>
            Refresh
          </Button>
        }
      />
      {audit.isPending ? (
        <Spinner label="Loading the audit log…" />
      ) : audit.isError ? (
        <Alert title="Could not load the audit log">{errorMessage(audit.error)}</Alert>
      ) : audit.data.entries.length === 0 ? (
        <EmptyState title="Nothing recorded yet" description="Role changes and other administrative actions appear here." />
      ) : (
        <ol className="divide-y divide-foil-800/70" aria-label="Audit entries, newest first">
          {audit.data.entries.map((entry) => {
            const changes = describeChange(entry.before, entry.after);
            return (
              <li key={entry.id} className="grid gap-1 py-3 text-sm sm:grid-cols-[11rem_1fr] sm:gap-4">
                <time dateTime={entry.at} className="text-foil-400">
                  {timeFormat.format(new Date(entry.at))}
                </time>
                <div className="min-w-0 space-y-1">
                  <p className="text-foil-100">
                    <span className="font-semibold">{entry.actor?.email ?? 'System'}</span>{' '}
                    <code className="rounded bg-night-800 px-1.5 py-0.5 text-xs text-amber-200">{entry.action}</code>{' '}
                    <span className="break-all text-foil-300">{subjectLabel(entry, subjectNames)}</span>
                  </p>
                  {changes.length > 0 && (
                    <ul className="space-y-0.5 text-foil-300">
                      {changes.map((change, index) => (
                        <li key={change.key ?? index} className="break-words">
                          {change.key && <span className="text-foil-400">{change.key}: </span>}
                          <span>{change.before}</span>
                          <span aria-hidden="true" className="px-1.5 text-amber-400">
                            →
                          </span>
                          <span className="sr-only"> changed to </span>
                          <span className="text-foil-50">{change.after}</span>
                        </li>
                      ))}
                    </ul>
                  )}
                </div>
              </li>
            );
          })}
        </ol>
      )}
    </Card>
  );
}
