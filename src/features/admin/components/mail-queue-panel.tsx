import { useState } from 'react';
import { mailStates, type MailQueueEntry, type MailState } from '@shared/schemas/mail-queue';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { errorMessage } from '@/lib/form-errors';
import { useMailQueue } from '../api/get-mail-queue';
import { useRetryMail } from '../api/retry-mail';

const timeFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'medium' });

const stateLabel: Record<MailState, string> = { queued: 'Waiting', sending: 'Sending', sent: 'Sent', failed: 'Failed' };
const stateTone = { queued: 'neutral', sending: 'neutral', sent: 'good', failed: 'attention' } as const;

/** What the mail service said, in one line. */
export function answerText(entry: MailQueueEntry): string {
  const a = entry.answer;
  if (!a) return entry.state === 'queued' ? 'Not tried yet' : '—';
  if ('id' in a) return `Accepted as ${a.id}`;
  const status = a.status === null ? 'no answer' : `HTTP ${a.status}`;
  const wait = a.retryAfterSeconds !== undefined ? ` (asked us to wait ${a.retryAfterSeconds} s)` : '';
  return `${status} · ${a.name}: ${a.message}${wait}`;
}

export function MailQueuePanel() {
  const [state, setState] = useState<MailState | undefined>(undefined);
  const [page, setPage] = useState(1);
  const queue = useMailQueue({ state, page });
  const retry = useRetryMail();
  const data = queue.data;
  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;

  return (
    <Card>
      <CardHeader
        title="Mail queue"
        description="Every message the product sends waits here until the mail service takes it. Failed messages keep the service’s answer and can be tried again."
        actions={
          <Button variant="ghost" size="sm" onClick={() => queue.refetch()} loading={queue.isFetching && !queue.isPending}>
            Refresh
          </Button>
        }
      />
      <fieldset className="mb-4 flex flex-wrap gap-2">
        <legend className="sr-only">Show messages</legend>
        {[undefined, ...mailStates].map((s) => {
          const n = s && data ? data.counts[s] : data ? Object.values(data.counts).reduce((a, b) => a + b, 0) : undefined;
          return (
            <Button
              key={s ?? 'all'}
              size="sm"
              variant={state === s ? 'primary' : 'secondary'}
              aria-pressed={state === s}
              onClick={() => {
                setState(s);
                setPage(1);
              }}
            >
              {s ? stateLabel[s] : 'All'}
              {n !== undefined ? ` (${n})` : ''}
            </Button>
          );
        })}
      </fieldset>
      {queue.isPending ? (
        <Spinner label="Loading the mail queue…" />
      ) : queue.isError ? (
        <Alert title="Could not load the mail queue">{errorMessage(queue.error)}</Alert>
      ) : queue.data.entries.length === 0 ? (
        <EmptyState
          title="No messages here"
          description={state ? `No message is ${stateLabel[state].toLowerCase()}.` : 'Nothing has been sent yet.'}
        />
      ) : (
        <>
          <Table caption="Messages in the mail queue, newest first">
            <THead>
              <Tr>
                <Th>Queued</Th>
                <Th>To</Th>
                <Th>Message</Th>
                <Th>State</Th>
                <Th>Service’s answer</Th>
                <Th>
                  <span className="sr-only">Actions</span>
                </Th>
              </Tr>
            </THead>
            <TBody>
              {queue.data.entries.map((e) => (
                <Tr key={e.id}>
                  <Td className="whitespace-nowrap">{timeFormat.format(new Date(e.createdAt))}</Td>
                  <Td className="break-all">{e.to}</Td>
                  <Td>
                    {e.template}
                    <span className="block text-xs text-foil-300">{e.category === 'dispatch' ? 'dispatch' : 'account and receipts'}</span>
                  </Td>
                  <Td>
                    <Badge tone={stateTone[e.state]}>{stateLabel[e.state]}</Badge>
                    <span className="block text-xs text-foil-300">
                      {e.attempts} {e.attempts === 1 ? 'try' : 'tries'}
                      {e.state === 'queued' && e.attempts > 0 ? ` · next ${timeFormat.format(new Date(e.nextAttemptAt))}` : ''}
                    </span>
                  </Td>
                  <Td className="max-w-md break-words text-xs">{answerText(e)}</Td>
                  <Td>
                    {e.state === 'failed' && (
                      <Button
                        size="sm"
                        variant="secondary"
                        loading={retry.isPending && retry.variables?.id === e.id}
                        onClick={() => retry.mutate({ id: e.id })}
                        aria-label={`Try again: ${e.template} to ${e.to}`}
                      >
                        Try again
                      </Button>
                    )}
                  </Td>
                </Tr>
              ))}
            </TBody>
          </Table>
          {retry.isError && <Alert title="Could not queue the message again">{errorMessage(retry.error)}</Alert>}
          <nav aria-label="Mail queue pages" className="mt-4 flex items-center gap-3">
            <Button size="sm" variant="secondary" disabled={page <= 1} onClick={() => setPage((p) => p - 1)}>
              Newer
            </Button>
            <span className="text-sm text-foil-200">
              Page {page} of {pages}
            </span>
            <Button size="sm" variant="secondary" disabled={page >= pages} onClick={() => setPage((p) => p + 1)}>
              Older
            </Button>
          </nav>
        </>
      )}
    </Card>
  );
}
