import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { errorMessage } from '@/lib/form-errors';
import { money } from '@/lib/money';
import { useDashboard } from '../api/get-dashboard';
import { MonthsChart, TierChart } from './books-charts';

export function BooksDashboard() {
  const d = useDashboard();
  if (d.isPending) return <Spinner label="Loading the books dashboard" />;
  if (d.isError) return <Alert>{errorMessage(d.error)}</Alert>;
  return (
    <Card>
      <h2 className="text-lg font-bold text-foil-50">At a glance</h2>
      <dl className="mt-3 grid gap-3 sm:grid-cols-3">
        <div>
          <dt className="text-sm text-foil-400">Monthly recurring</dt>
          <dd className="text-foil-50">
            {d.data.monthlyRecurring.map((m) => `${money(m.amountMinor, m.currency)} (${m.members} crew)`).join(', ') || 'none'}
          </dd>
        </div>
        <div>
          <dt className="text-sm text-foil-400">Churn, last 30 days</dt>
          <dd className="text-foil-50">
            {d.data.churn.endedLast30Days} of {d.data.churn.atStart} ({(d.data.churn.rate * 100).toFixed(1)} %)
          </dd>
        </div>
        <div>
          <dt className="text-sm text-foil-400">Failed renewals awaiting retry</dt>
          <dd className="text-foil-50">{d.data.failedRenewalsAwaitingRetry}</dd>
        </div>
      </dl>
      <div className="mt-4 grid gap-4 lg:grid-cols-2">
        <MonthsChart months={d.data.months} />
        <TierChart tiers={d.data.byTier} />
      </div>
    </Card>
  );
}
