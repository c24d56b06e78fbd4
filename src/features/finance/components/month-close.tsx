import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { Spinner } from '@/components/ui/spinner';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { useToast } from '@/components/ui/toast';
import { errorMessage } from '@/lib/form-errors';
import { useMonths } from '../api/get-months';
import { useCloseMonth } from '../api/close-month';
import { usePublishMonth } from '../api/publish-month';

const linkClass = 'text-amber-300 underline underline-offset-2 hover:text-amber-200';

/** Every month with money in it: its state, its close report (page, CSV, PDF), closing and publishing. */
export function MonthClose({ campaignSlug }: { campaignSlug: string }) {
  const months = useMonths();
  const close = useCloseMonth();
  const publish = usePublishMonth();
  const notify = useToast();
  const [asked, setAsked] = useState<{ month: string; action: 'close' | 'publish' } | null>(null);
  if (months.isPending) return <Spinner label="Loading months" />;
  if (months.isError) return <Alert title="Could not load the months">{errorMessage(months.error)}</Alert>;
  const done = () => setAsked(null);
  return (
    <Card>
      <h2 className="text-lg font-bold text-foil-50">Month close</h2>
      <p className="mt-1 text-sm text-foil-300">
        A month closes once a finished reconciliation covers all of it with no open findings. A closed month is read-only: a later refund of
        one of its payments is booked in the next open month, linked to the payment.
      </p>
      {close.isError && (
        <Alert className="mt-3" title="The month stays open">
          {errorMessage(close.error)}
        </Alert>
      )}
      {publish.isError && (
        <Alert className="mt-3" title="Not published">
          {errorMessage(publish.error)}
        </Alert>
      )}
      <Table caption="Months" className="mt-4">
        <THead>
          <Tr>
            <Th>Month</Th>
            <Th>State</Th>
            <Th>Close report</Th>
            <Th>Next step</Th>
          </Tr>
        </THead>
        <TBody>
          {months.data.map((m) => (
            <Tr key={m.month}>
              <Td className="whitespace-nowrap">{m.month}</Td>
              <Td>{m.closedAt ? <Badge tone="good">closed</Badge> : <Badge>open</Badge>}</Td>
              <Td className="whitespace-nowrap">
                <Link className={linkClass} to={`/console/books/months/${m.month}`} aria-label={`Close report for ${m.month}`}>
                  Report
                </Link>
                {' · '}
                <a className={linkClass} href={`/api/books/months/${m.month}/report.pdf`} aria-label={`Close report for ${m.month}, PDF`}>
                  PDF
                </a>
                {' · '}
                <a className={linkClass} href={`/api/books/months/${m.month}/report.csv`} aria-label={`Close report for ${m.month}, CSV`}>
                  CSV
                </a>
              </Td>
              <Td>
                {!m.closedAt ? (
                  <Button size="sm" aria-label={`Close month ${m.month}`} onClick={() => setAsked({ month: m.month, action: 'close' })}>
                    Close month
                  </Button>
                ) : !m.published ? (
                  <Button
                    size="sm"
                    variant="secondary"
                    aria-label={`Publish the account of ${m.month}`}
                    onClick={() => setAsked({ month: m.month, action: 'publish' })}
                  >
                    Publish account
                  </Button>
                ) : (
                  <Badge tone="good">account published</Badge>
                )}
              </Td>
            </Tr>
          ))}
        </TBody>
      </Table>
      <p className="mt-3 text-sm text-foil-300">
        Exports:{' '}
        {(['pledges', 'backers', 'ledger', 'findings'] as const).map((k) => (
          <a key={k} className={`mr-3 ${linkClass}`} href={`/api/books/exports/${k}.csv`}>
            {k}.csv
          </a>
        ))}
      </p>
      <ConfirmDialog
        open={asked?.action === 'close'}
        title={`Close ${asked?.month ?? ''}?`}
        confirmLabel="Close the month"
        cancelLabel="Keep it open"
        pending={close.isPending}
        onCancel={done}
        onConfirm={() =>
          asked &&
          close.mutate(asked.month, {
            onSuccess: () => notify(`${asked.month} is closed; its report is frozen.`),
            onSettled: done,
          })
        }
      >
        <p>Its ledger becomes read-only and its close report is frozen as it is now. This cannot be undone here.</p>
      </ConfirmDialog>
      <ConfirmDialog
        open={asked?.action === 'publish'}
        title={`Publish the account of ${asked?.month ?? ''}?`}
        confirmLabel="Publish for backers"
        cancelLabel="Not yet"
        pending={publish.isPending}
        onCancel={done}
        onConfirm={() =>
          asked &&
          publish.mutate(
            { month: asked.month, campaignSlug },
            { onSuccess: () => notify(`The account of ${asked.month} is on the campaign page.`), onSettled: done },
          )
        }
      >
        <p>
          Backers will see on the campaign page what was raised, the processor’s fees, refunds, the net received and how many backers gave —
          no names, no addresses.
        </p>
      </ConfirmDialog>
    </Card>
  );
}
