import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Card } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { errorMessage } from '@/lib/form-errors';
import { money } from '@/lib/money';
import { useDisputes } from '../api/get-disputes';

/** The processor's dispute states, in our words. */
const statusWords: Record<string, { text: string; tone: 'good' | 'attention' | 'neutral' }> = {
  warning_needs_response: { text: 'question: answer needed', tone: 'attention' },
  warning_under_review: { text: 'question: being reviewed', tone: 'neutral' },
  warning_closed: { text: 'question closed', tone: 'neutral' },
  needs_response: { text: 'answer needed', tone: 'attention' },
  under_review: { text: 'being reviewed', tone: 'neutral' },
  won: { text: 'won: money back', tone: 'good' },
  lost: { text: 'lost', tone: 'neutral' },
};
const day = (iso: string) => new Date(iso).toLocaleDateString('en-GB', { dateStyle: 'medium', timeZone: 'UTC' });

/** Disputed payments from the processor, the latest deadline to answer first. */
export function DisputesTable() {
  const q = useDisputes();
  if (q.isPending) return <Spinner label="Loading disputes from the processor" />;
  if (q.isError) return <Alert title="Could not load disputes">{errorMessage(q.error)}</Alert>;
  if (q.data.length === 0)
    return <EmptyState title="No disputes" description="When a backer’s bank questions a payment, it shows here with its deadline." />;
  return (
    <Card>
      <p className="text-sm text-foil-300">
        The ledger books each disputed amount and the processor’s dispute fee when the dispute opens, and gives the amount back when it is
        won.
      </p>
      <Table caption="Disputes, latest deadline first" className="mt-3">
        <THead>
          <Tr>
            <Th>Answer by</Th>
            <Th>State</Th>
            <Th>Amount</Th>
            <Th>Bank’s reason</Th>
            <Th>Pledge</Th>
          </Tr>
        </THead>
        <TBody>
          {q.data.map((d) => {
            const s = statusWords[d.status] ?? { text: d.status.replaceAll('_', ' '), tone: 'neutral' as const };
            return (
              <Tr key={d.id}>
                <Td className="whitespace-nowrap">{d.respondBy ? day(d.respondBy) : '—'}</Td>
                <Td>
                  <Badge tone={s.tone}>{s.text}</Badge>
                </Td>
                <Td className="whitespace-nowrap tabular-nums">{money(d.amountMinor, d.currency)}</Td>
                <Td>{d.reason.replaceAll('_', ' ')}</Td>
                <Td>
                  {d.pledgeId ? (
                    <Link className="text-amber-300 underline underline-offset-2" to={`/console/books/pledges/${d.pledgeId}`}>
                      Open the pledge
                    </Link>
                  ) : (
                    <span className="text-foil-400">not in our ledger</span>
                  )}
                </Td>
              </Tr>
            );
          })}
        </TBody>
      </Table>
    </Card>
  );
}
