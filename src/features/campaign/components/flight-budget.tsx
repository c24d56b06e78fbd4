import type { CampaignView } from '@shared/schemas/campaign';
import type { FilledBudgetLine } from '@shared/flight-budget';
import { cn } from '@/lib/cn';
import { longDate, money } from '../format';

const stateWords: Record<FilledBudgetLine['state'], string> = {
  paid: 'Paid for',
  filling: 'Pledges pay into this now',
  waiting: 'Next in line',
};

/**
 * The flight budget: what the goal buys, line by line, filled in order by the money raised, so a backer sees what is
 * already paid for and what their pledge pays next. Without lines, one line stands for the whole goal.
 */
export function FlightBudget({ campaign }: { campaign: CampaignView }) {
  const { progress, currency } = campaign;
  const lines: FilledBudgetLine[] =
    campaign.budgetLines.length > 0
      ? campaign.budgetLines
      : [
          {
            id: 'goal',
            name: 'The mission',
            reason: '',
            amountMinor: progress.goalMinor,
            fundedMinor: Math.min(progress.goalMinor, progress.raisedMinor),
            state: progress.raisedMinor >= progress.goalMinor ? 'paid' : 'filling',
          },
        ];
  const closes = longDate.format(new Date(campaign.endsAt));
  const opens = longDate.format(new Date(campaign.startsAt));
  return (
    <section aria-labelledby="budget-title" className="rounded-2xl border border-foil-700/60 bg-night-900/70 p-5 sm:p-7">
      <div className="flex flex-wrap items-baseline justify-between gap-x-6 gap-y-1">
        <h2 id="budget-title" className="text-xl font-bold text-foil-50">
          Flight budget
        </h2>
        <p className="text-sm text-foil-300">
          {progress.status === 'upcoming'
            ? `Pledges open on ${opens}`
            : progress.status === 'open'
              ? `Pledges close on ${closes}`
              : `Pledges closed on ${closes}`}
        </p>
      </div>
      <p className="mt-2 text-foil-200">
        <strong className="text-foil-50" data-testid="raised">
          {money(progress.raisedMinor, currency)}
        </strong>{' '}
        from{' '}
        <strong className="text-foil-50" data-testid="backers">
          {progress.backers.toLocaleString('en-US')}
        </strong>{' '}
        {progress.backers === 1 ? 'backer' : 'backers'} towards {money(progress.goalMinor, currency)}, the sum of the lines below.
      </p>
      <ol className="mt-5 space-y-3">
        {lines.map((line, i) => {
          const percent = Math.round((line.fundedMinor * 100) / line.amountMinor);
          return (
            <li
              key={line.id}
              className={cn(
                'grid gap-2 rounded-xl border p-4 sm:grid-cols-[2rem_1fr_auto] sm:items-center',
                line.state === 'filling' ? 'border-amber-400/70 bg-night-800/80' : 'border-foil-800',
              )}
            >
              <span
                aria-hidden="true"
                className={cn(
                  'flex size-8 items-center justify-center rounded-full text-sm font-bold',
                  line.state === 'paid' ? 'bg-amber-400 text-night-950' : 'border border-foil-600 text-foil-300',
                )}
              >
                {line.state === 'paid' ? '✓' : i + 1}
              </span>
              <div className="min-w-0">
                <p className="font-semibold text-foil-50">{line.name}</p>
                {line.reason && <p className="text-sm text-foil-400">{line.reason}</p>}
                <div
                  role="meter"
                  aria-label={`${line.name}: ${stateWords[line.state].toLowerCase()}`}
                  aria-valuemin={0}
                  aria-valuemax={line.amountMinor}
                  aria-valuenow={line.fundedMinor}
                  aria-valuetext={`${money(line.fundedMinor, currency)} of ${money(line.amountMinor, currency)}`}
                  className="mt-2 h-2 w-full overflow-hidden rounded-full bg-night-950 ring-1 ring-foil-800"
                >
                  <div className="h-full rounded-full bg-amber-400" style={{ width: `${percent}%` }} />
                </div>
              </div>
              <div className="text-sm sm:text-right">
                <p className="font-semibold text-foil-100">{money(line.amountMinor, currency)}</p>
                <p className={line.state === 'filling' ? 'text-amber-300' : 'text-foil-400'}>
                  {line.state === 'filling' ? `${stateWords.filling}: ${money(line.fundedMinor, currency)} so far` : stateWords[line.state]}
                </p>
              </div>
            </li>
          );
        })}
      </ol>
    </section>
  );
}
