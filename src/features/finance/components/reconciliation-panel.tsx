import { useState, type FormEvent } from 'react';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { ProgressBar } from '@/components/ui/progress-bar';
import { Spinner } from '@/components/ui/spinner';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { TextField } from '@/components/ui/text-field';
import { errorMessage } from '@/lib/form-errors';
import { money } from '@/lib/money';
import { useStartReconciliation } from '../api/start-reconciliation';
import { useReconciliation } from '../api/get-reconciliation';
import { useReconciliations, type ReconRun } from '../api/get-reconciliations';
import { useResolveFinding } from '../api/resolve-finding';

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
/** The whole of last month, as the two date fields want it (UTC, like the ledger's booked months). */
function lastMonth(): { from: string; to: string } {
  const first = new Date(`${monthStart()}T00:00:00Z`);
  const end = new Date(first.getTime() - 86_400_000);
  return { from: `${end.toISOString().slice(0, 7)}-01`, to: end.toISOString().slice(0, 10) };
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

export function ReconciliationPanel() {
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
      <p className="mt-2 flex flex-wrap items-center gap-2 text-sm text-foil-300">
        Fill in:
        <Button
          size="sm"
          variant="ghost"
          onClick={() => {
            setFrom(monthStart());
            setTo(today());
          }}
        >
          This month so far
        </Button>
        <Button
          size="sm"
          variant="ghost"
          onClick={() => {
            const m = lastMonth();
            setFrom(m.from);
            setTo(m.to);
          }}
        >
          All of last month
        </Button>
      </p>
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
