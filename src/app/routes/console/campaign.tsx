import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { FEATURED_CAMPAIGN } from '@/features/campaign/api/get-campaign';
import { useCampaignManage } from '@/features/campaign/api/get-campaign-manage';
import { CampaignDetailsForm } from '@/features/campaign/components/campaign-details-form';
import { StretchTargetsEditor } from '@/features/campaign/components/stretch-targets-editor';
import { FlightBudgetEditor } from '@/features/campaign/components/flight-budget-editor';
import { TierForm } from '@/features/campaign/components/tier-form';
import { money } from '@/features/campaign/format';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';

export function Component() {
  useDocumentTitle('Campaign desk');
  const campaign = useCampaignManage(FEATURED_CAMPAIGN);
  const [editing, setEditing] = useState<string | 'new' | null>(null);
  if (campaign.isPending) return <PageSpinner />;
  if (campaign.isError) return <Alert title="Could not load the campaign">{errorMessage(campaign.error)}</Alert>;
  const c = campaign.data;
  return (
    <>
      <PageHeader
        eyebrow="Console"
        title="Campaign desk"
        description={
          <>
            Goal, dates, story, tiers and stretch targets of the public{' '}
            <Link to="/campaign" className="underline underline-offset-4">
              campaign page
            </Link>
            . Every change is written to the audit log.
          </>
        }
      />
      <div className="space-y-6">
        <Card>
          <CardHeader
            title="Campaign"
            description={`${money(c.progress.raisedMinor, c.currency)} raised from ${c.progress.backers} backers (${c.progress.percent}%).`}
          />
          <CampaignDetailsForm key={c.id} campaign={c} />
        </Card>
        <Card>
          <CardHeader
            title="Tiers"
            actions={
              editing !== 'new' && (
                <Button size="sm" variant="secondary" onClick={() => setEditing('new')}>
                  Add a tier
                </Button>
              )
            }
          />
          <ul className="space-y-3">
            {editing === 'new' && (
              <li>
                <TierForm slug={c.slug} currency={c.currency} onDone={() => setEditing(null)} />
              </li>
            )}
            {c.tiers.map((t) =>
              editing === t.id ? (
                <li key={t.id}>
                  <TierForm slug={c.slug} currency={c.currency} tier={t} onDone={() => setEditing(null)} />
                </li>
              ) : (
                <li key={t.id} className="flex flex-wrap items-center justify-between gap-3 rounded-xl border border-foil-800 px-4 py-3">
                  <div className="min-w-0">
                    <p className="font-semibold text-foil-50">
                      {t.title} · {money(t.minAmountMinor, c.currency)}
                      {t.kind === 'monthly' && ' a month'}
                    </p>
                    <p className="text-sm text-foil-400">
                      {t.quantityLimit === null ? 'Unlimited' : `${t.remaining} of ${t.quantityLimit} left`}
                      {t.estimatedDelivery && ` · delivery ${t.estimatedDelivery}`}
                    </p>
                  </div>
                  <div className="flex items-center gap-2">
                    {!t.active && <Badge>Hidden</Badge>}
                    <Button size="sm" variant="ghost" onClick={() => setEditing(t.id)}>
                      Edit<span className="sr-only"> {t.title}</span>
                    </Button>
                  </div>
                </li>
              ),
            )}
          </ul>
        </Card>
        <Card>
          <CardHeader
            title="Flight budget"
            description="What the money pays for, in the order it is filled. The goal is the sum of the lines."
          />
          <FlightBudgetEditor key={c.id} campaign={c} />
        </Card>
        <Card>
          <CardHeader title="Stretch targets" description="Shown as reached once progress passes their amount." />
          <StretchTargetsEditor key={c.stretchTargets.map((s) => s.id).join()} campaign={c} />
        </Card>
      </div>
    </>
  );
}
