import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { money } from '@/lib/money';
import { useMonthlyAccounts } from '../api/get-monthly-accounts';

const monthName = (month: string) =>
  new Date(`${month}-01T00:00:00Z`).toLocaleDateString('en-GB', { month: 'long', year: 'numeric', timeZone: 'UTC' });

/** Where the money went, month by month, once finance has closed and published each month. */
export function MonthlyAccounts({ slug }: { slug: string }) {
  const q = useMonthlyAccounts(slug);
  if (!q.isSuccess || q.data.length === 0) return null;
  return (
    <section aria-labelledby="money-path-title" className="space-y-3">
      <h2 id="money-path-title" className="text-xl font-bold text-foil-50">
        The money’s path, month by month
      </h2>
      <p className="max-w-3xl text-foil-300">
        After each month is closed and checked against the payment processor’s records, the team publishes what came in and what reached the
        mission. Totals only: no names.
      </p>
      <Table caption="Published monthly accounts">
        <THead>
          <Tr>
            <Th>Month</Th>
            <Th>Raised</Th>
            <Th>Processor fees</Th>
            <Th>Refunds and disputes</Th>
            <Th>Net received</Th>
            <Th>Backers</Th>
          </Tr>
        </THead>
        <TBody>
          {q.data.map((a) => (
            <Tr key={a.month}>
              <Td className="whitespace-nowrap">{monthName(a.month)}</Td>
              <Td className="tabular-nums">{money(a.raisedMinor, a.currency)}</Td>
              <Td className="tabular-nums">{money(a.feesMinor, a.currency)}</Td>
              <Td className="tabular-nums">{money(a.refundsMinor + a.disputesMinor, a.currency)}</Td>
              <Td className="font-bold tabular-nums">{money(a.netMinor, a.currency)}</Td>
              <Td className="tabular-nums">{a.backerCount}</Td>
            </Tr>
          ))}
        </TBody>
      </Table>
    </section>
  );
}
