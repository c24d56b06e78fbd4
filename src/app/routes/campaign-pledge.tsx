import { Link, useSearchParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { FEATURED_CAMPAIGN, useCampaign } from '@/features/campaign/api/get-campaign';
import { PledgeForm } from '@/features/pledges/components/pledge-form';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { RequireAccount } from '../layouts/require-account';

export function Component() {
  useDocumentTitle('Make a pledge');
  const [params] = useSearchParams();
  const campaign = useCampaign(params.get('campaign') ?? FEATURED_CAMPAIGN);
  return (
    <div className="mx-auto max-w-2xl px-4 py-8 sm:px-6 md:py-12">
      <RequireAccount>
        {(account) => {
          if (campaign.isPending) return <PageSpinner />;
          if (campaign.isError) return <Alert title="Could not load the campaign">{errorMessage(campaign.error)}</Alert>;
          const c = campaign.data;
          return (
            <>
              <PageHeader
                eyebrow={c.title}
                title="Make a pledge"
                description={
                  <Link to="/campaign" className="underline underline-offset-4">
                    Back to the campaign
                  </Link>
                }
              />
              {c.progress.status !== 'open' ? (
                <Alert tone="info">This campaign is not taking pledges right now.</Alert>
              ) : (
                <Card>
                  <PledgeForm
                    campaign={c}
                    account={account}
                    initialTierId={params.get('tier')}
                    onCheckout={(url) => window.location.assign(url)}
                  />
                </Card>
              )}
            </>
          );
        }}
      </RequireAccount>
    </div>
  );
}
