import { Alert } from '@/components/ui/alert';
import { Card, CardHeader } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { Button } from '@/components/ui/button';
import { errorMessage } from '@/lib/form-errors';
import { useAudit } from '../api/get-audit';
import { changesInWords, entryInWords } from '../audit-words';

const timeFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });

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
            const changes = changesInWords(entry);
            const subjectName = entry.subjectId ? subjectNames.get(entry.subjectId) : undefined;
            return (
              <li key={entry.id} className="grid gap-1 py-3 text-sm sm:grid-cols-[11rem_1fr] sm:gap-4">
                <time dateTime={entry.at} className="text-foil-400">
                  {timeFormat.format(new Date(entry.at))}
                </time>
                <div className="min-w-0 space-y-1">
                  <p className="break-words text-foil-100">{entryInWords(entry, subjectName)}</p>
                  {changes.length > 0 && (
                    <ul className="space-y-0.5 text-foil-300">
                      {changes.map((change, index) => (
                        <li key={change.field ?? index} className="break-words">
                          {change.field && <span className="text-foil-400">{change.field}: </span>}
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
