import { useState, type FormEvent } from 'react';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { ProgressBar } from '@/components/ui/progress-bar';
import { Spinner } from '@/components/ui/spinner';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { TextField } from '@/components/ui/text-field';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { money } from '@/lib/money';
import { useDashboard } from '@/features/finance/api/get-dashboard';
import { useStartReconciliation } from '@/features/finance/api/start-reconciliation';
import { useReconciliation } from '@/features/finance/api/get-reconciliation';
import { useReconciliations, type ReconRun } from '@/features/finance/api/get-reconciliations';
import { useResolveFinding } from '@/features/finance/api/resolve-finding';
import { usePledges } from '@/features/finance/api/get-pledges';
import { usePledge } from '@/features/finance/api/get-pledge';
import { useCreateRefund } from '@/features/finance/api/create-refund';
import { useMonths } from '@/features/finance/api/get-months';
import { useCloseMonth } from '@/features/finance/api/close-month';
import { usePublishMonth } from '@/features/finance/api/publish-month';
import { MonthsChart, TierChart } from '@/features/finance/components/books-charts';
import { refundReasons } from '@shared/schemas/books';

const findingLabel: Record<string, string> = {
  missing_in_ledger: 'At the processor, not in the ledger',
  missing_at_processor: 'In the ledger, not at the processor',
  amount_mismatch: 'Amounts differ',
  currency_mismatch: 'Currencies differ',
  fee_mismatch: 'Fees differ',
  double_charge: 'Paid twice',
  payout_differs: 'Payout does not sum',
  payout_sums: 'Payout sums',
};
const today = () => new Date().toISOString().slice(0, 10);
const monthStart = () => `${today().slice(0, 7)}-01`;

function Dashboard() {
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

const runStatusWords: Record<ReconRun['status'], string> = {
  queued: 'Waiting for a worker',
  running: 'Running',
  done: 'Finished',
  failed: 'Stopped with an error',
};

/** The run's stored progress (polled while it is open): steps done of total, in words for screen readers too. */
function RunProgress({ run }: { run: ReconRun }) {
  const open = run.status === 'queued' || run.status === 'running';
  const words = `${run.stepsDone} of ${run.stepsTotal} steps · ${run.fetchedCount} balance transactions fetched`;
  return (
    <div className="mt-4" aria-live="polite">
      <div className="flex flex-wrap items-baseline justify-between gap-2 text-sm">
        <span className="font-bold text-foil-50">{runStatusWords[run.status]}</span>
        <span className="text-foil-300">{words}</span>
      </div>
      {open && (
        <ProgressBar
          className="mt-2"
          value={run.stepsDone}
          max={Math.max(1, run.stepsTotal)}
          label="Reconciliation run progress"
          valueText={`${run.progressLabel}. ${words}`}
        />
      )}
      {open && <p className="mt-1 text-sm text-foil-300">{run.progressLabel}</p>}
      {run.attempts > 1 && open && (
        <p className="mt-1 text-sm text-amber-300">Started again after an interruption (attempt {run.attempts}).</p>
      )}
      {run.status === 'failed' && <Alert className="mt-2">The run stopped: {run.error ?? 'no reason was recorded'}. Start it again.</Alert>}
    </div>
  );
}

function Reconciliation() {
  const [from, setFrom] = useState(monthStart());
  const [to, setTo] = useState(today());
  const [runId, setRunId] = useState<string | null>(null);
  const start = useStartReconciliation();
  const runs = useReconciliations();
  const run = useReconciliation(runId ?? runs.data?.[0]?.id ?? null);
  const resolve = useResolveFinding();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    start.mutate({ from, to }, { onSuccess: (r) => setRunId(r.run.id) });
  };
  const data = run.data;
  const finished = data?.run.status === 'done';
  return (
    <Card>
      <h2 className="text-lg font-bold text-foil-50">Reconciliation run</h2>
      <form onSubmit={submit} className="mt-3 flex flex-wrap items-end gap-3">
        <TextField label="From" type="date" value={from} onChange={(e) => setFrom(e.target.value)} />
        <TextField label="To" type="date" value={to} onChange={(e) => setTo(e.target.value)} />
        <Button type="submit" loading={start.isPending}>
          Compare with the processor
        </Button>
      </form>
      {start.isError && <Alert className="mt-3">{errorMessage(start.error)}</Alert>}
      {resolve.isError && <Alert className="mt-3">{errorMessage(resolve.error)}</Alert>}
      {run.isPending && (runId || runs.data?.length) ? <Spinner label="Loading the reconciliation run" /> : null}
      {data && <RunProgress run={data.run} />}
      {data && finished && (
        <div className="mt-4">
          <p className="text-foil-200">
            {data.run.summary?.fetched ?? 0} processor transactions, {data.run.summary?.matched ?? 0} matched,{' '}
            {data.findings.filter((f) => f.kind !== 'payout_sums').length} finding(s).
          </p>
          <Table caption="Findings">
            <THead>
              <Tr>
                <Th>What</Th>
                <Th>Object</Th>
                <Th>Processor</Th>
                <Th>Ledger</Th>
                <Th>State</Th>
              </Tr>
            </THead>
            <TBody>
              {data.findings.map((f) => (
                <Tr key={f.id}>
                  <Td>{findingLabel[f.kind] ?? f.kind}</Td>
                  <Td className="font-mono text-xs">{f.processorObjectId ?? f.subjectKey}</Td>
                  <Td>{f.processorAmountMinor === null ? '—' : money(f.processorAmountMinor, f.currency ?? 'USD')}</Td>
                  <Td>{f.ledgerAmountMinor === null ? '—' : money(f.ledgerAmountMinor, f.currency ?? 'USD')}</Td>
                  <Td>
                    {f.kind === 'payout_sums' ? (
                      <Badge tone="good">sums</Badge>
                    ) : f.resolution ? (
                      <Badge tone="good">resolved ({f.resolution.action.replaceAll('_', ' ')})</Badge>
                    ) : (
                      <div className="flex flex-wrap gap-2">
                        {f.kind === 'missing_in_ledger' && (
                          <Button
                            size="sm"
                            onClick={() =>
                              resolve.mutate(
                                { id: f.id, action: 'record_from_processor', note: '' },
                                { onSuccess: () => void run.refetch() },
                              )
                            }
                          >
                            Record from processor
                          </Button>
                        )}
                        <Button
                          size="sm"
                          variant="secondary"
                          onClick={() =>
                            resolve.mutate({ id: f.id, action: 'acknowledge', note: '' }, { onSuccess: () => void run.refetch() })
                          }
                        >
                          Acknowledge
                        </Button>
                      </div>
                    )}
                  </Td>
                </Tr>
              ))}
            </TBody>
          </Table>
          <a className="mt-2 inline-block text-amber-300 underline" href={`/api/books/exports/findings.csv?runId=${data.run.id}`}>
            Findings as CSV
          </a>
        </div>
      )}
    </Card>
  );
}

function RefundForm({ pledgeId }: { pledgeId: string }) {
  const p = usePledge(pledgeId);
  const refund = useCreateRefund();
  const [amount, setAmount] = useState('');
  const [reason, setReason] = useState<(typeof refundReasons)[number]>('backer_asked');
  const [note, setNote] = useState('');
  if (p.isPending) return <Spinner label="Loading the pledge" />;
  if (p.isError) return <Alert>{errorMessage(p.error)}</Alert>;
  const charge = p.data.charges.at(-1);
  return (
    <div className="mt-4 space-y-3">
      <p className="text-foil-200">
        {p.data.pledge.campaignTitle} · {p.data.pledge.backer?.email ?? 'deleted account'} · state {p.data.pledge.state}
      </p>
      <ul className="text-sm text-foil-300">
        {p.data.refunds.map((r) => (
          <li key={r.id}>
            Refund {money(r.amountMinor, r.currency)} ({r.reason}) —{' '}
            {r.state === 'pending' ? 'pending: waiting for the processor' : r.state}
          </li>
        ))}
        {p.data.receipts.map((r) => (
          <li key={r.id}>
            <a className="text-amber-300 underline" href={`/api/books/receipts/${r.id}.pdf`}>
              Receipt {r.number} ({r.kind}) {money(r.amountMinor, r.currency)}
            </a>
            {r.voided && ' — void'}
          </li>
        ))}
      </ul>
      {charge && (
        <form
          className="flex flex-wrap items-end gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            refund.mutate({ pledgeId, amountMinor: Math.round(Number(amount) * 100), reason, note, chargeId: charge.chargeId });
          }}
        >
          <TextField
            label={`Amount (${charge.currency}, up to ${money(charge.refundableMinor, charge.currency)})`}
            inputMode="decimal"
            value={amount}
            onChange={(e) => setAmount(e.target.value)}
          />
          <label className="text-sm text-foil-200">
            Reason
            <select
              className="mt-1 block rounded-lg border border-foil-700 bg-night-950/60 px-3 py-2"
              value={reason}
              onChange={(e) => setReason(e.target.value as typeof reason)}
            >
              {refundReasons.map((r) => (
                <option key={r} value={r}>
                  {r.replaceAll('_', ' ')}
                </option>
              ))}
            </select>
          </label>
          <TextField label="Note" value={note} onChange={(e) => setNote(e.target.value)} />
          <Button type="submit" variant="danger" loading={refund.isPending}>
            Refund
          </Button>
        </form>
      )}
      {refund.isError && <Alert>{errorMessage(refund.error)}</Alert>}
      {refund.isSuccess && <Alert tone="success">Refund sent to the processor; the ledger moves when its confirmation lands.</Alert>}
    </div>
  );
}

function Pledges() {
  const [q, setQ] = useState('');
  const [picked, setPicked] = useState<string | null>(null);
  const list = usePledges(q);
  return (
    <Card>
      <h2 className="text-lg font-bold text-foil-50">Pledges and refunds</h2>
      <TextField label="Find a pledge (e-mail, name or id)" value={q} onChange={(e) => setQ(e.target.value)} />
      {list.isPending && <Spinner label="Loading pledges" />}
      <ul className="mt-3 space-y-1">
        {list.data?.slice(0, 20).map((p) => (
          <li key={p.id}>
            <button type="button" className="text-left text-amber-300 underline" onClick={() => setPicked(p.id)}>
              {money(p.amountMinor, p.currency)} · {p.backer?.email ?? 'anonymised'} · {p.state}
            </button>
          </li>
        ))}
      </ul>
      {picked && <RefundForm pledgeId={picked} />}
    </Card>
  );
}

function Months() {
  const months = useMonths();
  const close = useCloseMonth();
  const publish = usePublishMonth();
  if (months.isPending) return <Spinner label="Loading months" />;
  if (months.isError) return <Alert>{errorMessage(months.error)}</Alert>;
  return (
    <Card>
      <h2 className="text-lg font-bold text-foil-50">Month close</h2>
      {close.isError && <Alert className="mt-2">{errorMessage(close.error)}</Alert>}
      {publish.isError && <Alert className="mt-2">{errorMessage(publish.error)}</Alert>}
      <Table caption="Months">
        <THead>
          <Tr>
            <Th>Month</Th>
            <Th>State</Th>
            <Th>Report</Th>
            <Th>Actions</Th>
          </Tr>
        </THead>
        <TBody>
          {months.data.map((m) => (
            <Tr key={m.month}>
              <Td className="whitespace-nowrap">{m.month}</Td>
              <Td>{m.closedAt ? <Badge tone="good">closed</Badge> : <Badge>open</Badge>}</Td>
              <Td>
                <a className="text-amber-300 underline" href={`/api/books/months/${m.month}/report.pdf`}>
                  PDF
                </a>{' '}
                ·{' '}
                <a className="text-amber-300 underline" href={`/api/books/months/${m.month}/report.csv`}>
                  CSV
                </a>
              </Td>
              <Td>
                {!m.closedAt ? (
                  <Button
                    size="sm"
                    aria-label={`Close month ${m.month}`}
                    onClick={() => close.mutate(m.month)}
                    loading={close.isPending && close.variables === m.month}
                  >
                    Close month
                  </Button>
                ) : !m.published ? (
                  <Button size="sm" variant="secondary" onClick={() => publish.mutate({ month: m.month, campaignSlug: 'tern-1' })}>
                    Publish monthly account
                  </Button>
                ) : (
                  <Badge tone="good">published</Badge>
                )}
              </Td>
            </Tr>
          ))}
        </TBody>
      </Table>
      <p className="mt-3 text-sm text-foil-300">
        Exports:{' '}
        {(['pledges', 'backers', 'ledger', 'findings'] as const).map((k) => (
          <a key={k} className="mr-3 text-amber-300 underline" href={`/api/books/exports/${k}.csv`}>
            {k}.csv
          </a>
        ))}
      </p>
    </Card>
  );
}

export function Component() {
  useDocumentTitle('Books');
  return (
    <>
      <PageHeader
        eyebrow="Console"
        title="Books"
        description="Reconcile with the processor, refund, close months and publish the monthly account."
      />
      <div className="space-y-6">
        <Dashboard />
        <Reconciliation />
        <Pledges />
        <Months />
      </div>
    </>
  );
}
