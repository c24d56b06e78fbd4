import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { MembershipView } from '@shared/schemas/campaign';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button, buttonClasses } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { errorMessage } from '@/lib/form-errors';
import { useSetMembershipRenewal } from '../api/set-membership-renewal';
import { dateFormat, membershipLabels, money } from '../format';

const LIVE = ['active', 'past_due', 'unpaid', 'trialing', 'incomplete', 'paused'];

export function MembershipList({ memberships }: { memberships: MembershipView[] }) {
  const [confirming, setConfirming] = useState<MembershipView | null>(null);
  const renewal = useSetMembershipRenewal();
  const confirmingEnd = confirming?.currentPeriodEnd ? dateFormat.format(new Date(confirming.currentPeriodEnd)) : null;
  return (
    <>
      {renewal.isError && (
        <Alert className="mb-4" title="Could not change the membership">
          {errorMessage(renewal.error)}
        </Alert>
      )}
      <ul className="space-y-4">
        {memberships.map((m) => {
          const live = LIVE.includes(m.status);
          const periodEnd = m.currentPeriodEnd ? dateFormat.format(new Date(m.currentPeriodEnd)) : null;
          return (
            <li key={m.id} className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5" data-testid="my-membership">
              <div className="flex flex-wrap items-start justify-between gap-3">
                <div className="min-w-0">
                  <p className="font-bold text-foil-50">
                    {m.tier?.title ?? 'Crew membership'} · {money(m.amountMinor, m.currency)} a month
                  </p>
                  <p className="text-sm text-foil-400">{m.campaign.title}</p>
                </div>
                <Badge tone={m.cancelAtPeriodEnd && live ? 'attention' : m.status === 'active' ? 'good' : live ? 'attention' : 'neutral'}>
                  {m.cancelAtPeriodEnd && live ? 'Ends soon' : (membershipLabels[m.status] ?? m.status)}
                </Badge>
              </div>
              <p className="mt-2 text-sm text-foil-300">
                {!live
                  ? `Ended${m.endedAt ? ` on ${dateFormat.format(new Date(m.endedAt))}` : ''}.`
                  : m.cancelAtPeriodEnd
                    ? `Stops at the end of the period, on ${periodEnd}. Nothing more will be charged.`
                    : `Renews on ${periodEnd}.`}
                {m.status === 'past_due' && ' The last renewal did not go through: please update your card.'}
              </p>
              {live && (
                <div className="mt-4 flex flex-wrap gap-2">
                  {m.cancelAtPeriodEnd ? (
                    <Button
                      variant="secondary"
                      size="sm"
                      loading={renewal.isPending && renewal.variables?.id === m.id}
                      onClick={() => renewal.mutate({ id: m.id, action: 'resume' })}
                    >
                      Keep renewing
                    </Button>
                  ) : (
                    <Button variant="danger" size="sm" onClick={() => setConfirming(m)}>
                      Stop renewing…
                    </Button>
                  )}
                  <Link to={`/my-support/memberships/${m.id}/card`} className={buttonClasses({ variant: 'secondary', size: 'sm' })}>
                    Update card
                  </Link>
                </div>
              )}
            </li>
          );
        })}
      </ul>
      <ConfirmDialog
        open={confirming !== null}
        title="Stop renewing this crew membership?"
        confirmLabel={confirmingEnd ? `Stop renewing after ${confirmingEnd}` : 'Stop renewing after this period'}
        cancelLabel="Keep renewing"
        tone="danger"
        pending={renewal.isPending}
        onCancel={() => setConfirming(null)}
        onConfirm={() => {
          if (!confirming) return;
          renewal.mutate({ id: confirming.id, action: 'cancel' }, { onSettled: () => setConfirming(null) });
        }}
      >
        <p>
          You stay a crew member until {confirmingEnd ?? 'the end of this period'}; after that nothing more is charged. You can change your
          mind until then.
        </p>
      </ConfirmDialog>
    </>
  );
}
