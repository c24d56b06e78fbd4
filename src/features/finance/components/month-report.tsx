import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { errorMessage } from '@/lib/form-errors';
import { money } from '@/lib/money';
import { useMonthReport } from '../api/get-month-report';

const linkClass = 'text-amber-300 underline underline-offset-2';

/** A month's close report as a page: totals per currency, money by tier, payouts and entries from earlier months. */
export function MonthReportView({ month }: { month: string }) {
  const q = useMonthReport(month);
  if (q.isPending) return <Spinner label={`Loading the report for ${month}`} />;
  if (q.isError) return <Alert title="Could not load the report">{errorMessage(q.error)}</Alert>;
  const { report, closed } = q.data;
  // One campaign (the usual case) is named once in the heading rather than on every row.
  const campaignTitles = [...new Set(report.byTier.map((t) => t.campaignTitle))];
  const oneCampaign = campaignTitles.length === 1 ? campaignTitles[0] : undefined;
  return (
    <>
      <Card>
        <p className="flex flex-wrap items-center gap-2 text-foil-200">
          {closed ? (
            <>
              <Badge tone="good">closed</Badge> Frozen when the month closed,{' '}
              {new Date(closed.at).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' })} UTC.
            </>
          ) : (
            <>
              <Badge>open</Badge> Computed now from the ledger; it may still change until the month closes.
            </>
          )}
        </p>
        <p className="mt-2 text-sm">
          <a className={linkClass} href={`/api/books/months/${month}/report.pdf`}>
            Download as PDF
          </a>
          {' · '}
          <a className={linkClass} href={`/api/books/months/${month}/report.csv`}>
            Download as CSV
          </a>
        </p>
      </Card>
      <Card>
        <h2 className="text-lg font-bold text-foil-50">Totals</h2>
        {report.totals.length === 0 ? (
          <p className="mt-2 text-foil-300">No money moved in {month}.</p>
        ) : (
          <Table caption={`Totals for ${month}`} className="mt-3">
            <THead>
              <Tr>
                <Th>Currency</Th>
                <Th>Charges</Th>
                <Th>Processor fees</Th>
                <Th>Refunds</Th>
                <Th>Disputes</Th>
                <Th>Net</Th>
                <Th>Payouts</Th>
              </Tr>
            </THead>
            <TBody>
              {report.totals.map((t) => (
                <Tr key={t.currency}>
                  <Td>{t.currency}</Td>
                  <Td className="tabular-nums">{money(t.chargesMinor, t.currency)}</Td>
                  <Td className="tabular-nums">{money(t.feesMinor, t.currency)}</Td>
                  <Td className="tabular-nums">{money(t.refundsMinor, t.currency)}</Td>
                  <Td className="tabular-nums">{money(t.disputesMinor - t.disputeReversalsMinor, t.currency)}</Td>
                  <Td className="font-bold tabular-nums">{money(t.netMinor, t.currency)}</Td>
                  <Td className="tabular-nums">{money(t.payoutsMinor, t.currency)}</Td>
                </Tr>
              ))}
            </TBody>
          </Table>
        )}
      </Card>
      <Card>
        <h2 className="text-lg font-bold text-foil-50">By reward tier</h2>
        {oneCampaign && <p className="mt-1 text-sm text-foil-300">{oneCampaign}</p>}
        <Table caption={`Charges by tier in ${month}`} className="mt-3">
          <THead>
            <Tr>
              {!oneCampaign && <Th>Campaign</Th>}
              <Th>Tier</Th>
              <Th>Payments</Th>
              <Th>Amount</Th>
            </Tr>
          </THead>
          <TBody>
            {report.byTier.map((t) => (
              <Tr key={`${t.campaignTitle}-${t.tierTitle}-${t.currency}`}>
                {!oneCampaign && <Td>{t.campaignTitle}</Td>}
                <Td>{t.tierTitle}</Td>
                <Td className="tabular-nums">{t.count}</Td>
                <Td className="tabular-nums">{money(t.amountMinor, t.currency)}</Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      </Card>
      {(report.payouts.length > 0 || report.lateEntries.length > 0) && (
        <Card>
          {report.payouts.length > 0 && (
            <>
              <h2 className="text-lg font-bold text-foil-50">Payouts to the bank</h2>
              <ul className="mt-2 space-y-1 text-foil-200">
                {report.payouts.map((p) => (
                  <li key={p.processorObjectId}>
                    {new Date(p.occurredAt).toISOString().slice(0, 10)}: {money(p.amountMinor, p.currency)}{' '}
                    <span className="font-mono text-xs text-foil-400">{p.processorObjectId}</span>
                  </li>
                ))}
              </ul>
            </>
          )}
          {report.lateEntries.length > 0 && (
            <>
              <h2 className="mt-4 text-lg font-bold text-foil-50">Booked here for a closed month</h2>
              <ul className="mt-2 space-y-1 text-foil-200">
                {report.lateEntries.map((e) => (
                  <li key={e.entryId}>
                    {e.kind} of {money(e.amountMinor, e.currency)} that happened in {e.occurredMonth}, after it closed
                    {e.processorChargeId && <span className="font-mono text-xs text-foil-400"> ({e.processorChargeId})</span>}
                  </li>
                ))}
              </ul>
            </>
          )}
        </Card>
      )}
    </>
  );
}
