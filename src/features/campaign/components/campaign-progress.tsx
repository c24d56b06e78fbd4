import type { CampaignProgress as Progress } from '@shared/schemas/campaign';
import { ProgressBar } from '@/components/ui/progress-bar';
import { money, timeLeft } from '../format';

export function CampaignProgress({ progress }: { progress: Progress }) {
  const raised = money(progress.raisedMinor, progress.currency);
  const goal = money(progress.goalMinor, progress.currency);
  return (
    <section aria-labelledby="progress-title" className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5 sm:p-6">
      <h2 id="progress-title" className="sr-only">
        Progress
      </h2>
      <p className="text-3xl font-bold text-foil-50" data-testid="raised">
        {raised}
      </p>
      <p className="text-sm text-foil-400">raised of a {goal} goal</p>
      <ProgressBar
        className="mt-4"
        value={progress.raisedMinor}
        max={progress.goalMinor}
        label="Raised towards the goal"
        valueText={`${raised} of ${goal}, ${progress.percent}%`}
      />
      <dl className="mt-4 grid grid-cols-3 gap-3 text-center">
        <div>
          <dt className="text-xs font-bold uppercase tracking-wider text-foil-500">Funded</dt>
          <dd className="text-lg font-bold text-foil-50">{progress.percent}%</dd>
        </div>
        <div>
          <dt className="text-xs font-bold uppercase tracking-wider text-foil-500">Backers</dt>
          <dd className="text-lg font-bold text-foil-50" data-testid="backers">
            {progress.backers.toLocaleString('en-US')}
          </dd>
        </div>
        <div>
          <dt className="text-xs font-bold uppercase tracking-wider text-foil-500">
            {progress.status === 'upcoming' ? 'Opens in' : 'Time left'}
          </dt>
          <dd className="text-lg font-bold text-foil-50">{timeLeft(progress.secondsLeft, progress.status)}</dd>
        </div>
      </dl>
    </section>
  );
}
