import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { BooksDashboard } from '../api/get-dashboard';

/** Money by booked month (major units for the axis only; the table beside it has the exact minor units). */
export function MonthsChart({ months }: { months: BooksDashboard['months'] }) {
  const data = months.map((m) => ({
    month: `${m.month} ${m.currency}`,
    charges: m.chargesMinor / 100,
    refunds: m.refundsMinor / 100,
    net: m.netMinor / 100,
  }));
  return (
    <figure aria-label="Charges, refunds and net by month" className="h-64">
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data}>
          <CartesianGrid strokeDasharray="3 3" stroke="var(--lk-foil-700)" />
          <XAxis dataKey="month" stroke="var(--lk-foil-300)" fontSize={12} />
          <YAxis stroke="var(--lk-foil-300)" fontSize={12} />
          <Tooltip />
          <Legend />
          <Bar dataKey="charges" fill="#fbbf24" />
          <Bar dataKey="refunds" fill="#f87171" />
          <Bar dataKey="net" fill="#34d399" />
        </BarChart>
      </ResponsiveContainer>
    </figure>
  );
}

export function TierChart({ tiers }: { tiers: BooksDashboard['byTier'] }) {
  const data = tiers.map((t) => ({ tier: t.tier, amount: t.amountMinor / 100 }));
  return (
    <figure aria-label="Money by tier" className="h-64">
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} layout="vertical">
          <CartesianGrid strokeDasharray="3 3" stroke="var(--lk-foil-700)" />
          <XAxis type="number" stroke="var(--lk-foil-300)" fontSize={12} />
          <YAxis type="category" dataKey="tier" stroke="var(--lk-foil-300)" fontSize={12} width={120} />
          <Tooltip />
          <Bar dataKey="amount" fill="#60a5fa" />
        </BarChart>
      </ResponsiveContainer>
    </figure>
  );
}
