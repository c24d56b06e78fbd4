import type { PledgeView } from '@shared/schemas/campaign';
import { NO_GIFT_LABEL } from '@shared/schemas/campaign';
import { pledgeStateLabels } from '@/lib/pledge-state';
import { money } from '../amount';

export function PledgeSummary({ pledge }: { pledge: PledgeView }) {
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-6 gap-y-2 text-sm">
      <dt className="text-foil-400">Campaign</dt>
      <dd className="text-foil-100">{pledge.campaign.title}</dd>
      <dt className="text-foil-400">Tier</dt>
      <dd className="text-foil-100">{pledge.tier?.title ?? NO_GIFT_LABEL}</dd>
      <dt className="text-foil-400">Amount</dt>
      <dd className="font-semibold text-foil-50">
        {money(pledge.amountMinor, pledge.currency)}
        {pledge.kind === 'monthly' && ' a month'}
      </dd>
      <dt className="text-foil-400">Status</dt>
      <dd className="text-foil-100" data-testid="pledge-state">
        {pledgeStateLabels[pledge.state]}
      </dd>
      <dt className="text-foil-400">Shown as</dt>
      <dd className="text-foil-100">{pledge.publicName ?? 'Anonymous'}</dd>
    </dl>
  );
}
