import { Link, useParams } from 'react-router-dom';
import type { TierView } from '@shared/schemas/campaign';
import { buttonClasses } from '@/components/ui/button';
import { PageLoadError } from '@/components/ui/page-load-error';
import { PageSpinner } from '@/components/ui/spinner';
import { FEATURED_CAMPAIGN, useCampaign } from '@/features/campaign/api/get-campaign';
import { BackerWall } from '@/features/campaign/components/backer-wall';
import { CampaignProgress } from '@/features/campaign/components/campaign-progress';
import { StretchTargets } from '@/features/campaign/components/stretch-targets';
import { TierCard } from '@/features/campaign/components/tier-card';
import { useDocumentTitle } from '@/lib/document-title';
import { isNotFoundError } from '@/lib/api-client';
import { NotFoundPage } from './not-found';

function TierGroup({
  id,
  title,
  intro,
  className,
  tiers,
  currency,
  open,
}: {
  id: string;
  title: string;
  intro?: string;
  className: string;
  tiers: TierView[];
  currency: string;
  open: boolean;
}) {
  if (tiers.length === 0) return null;
  return (
    <section aria-labelledby={id} className={className}>
      <h2 id={id} className="text-2xl font-bold text-foil-50">
        {title}
      </h2>
      {intro && <p className="mt-1 text-sm text-foil-400">{intro}</p>}
      <div className="mt-4 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
        {tiers.map((t) => (
          <TierCard key={t.id} tier={t} currency={currency} open={open} />
        ))}
      </div>
    </section>
  );
}

export function Component() {
  const { slug = FEATURED_CAMPAIGN } = useParams();
  const campaign = useCampaign(slug);
  useDocumentTitle(campaign.data?.title ?? 'Campaign');

  if (campaign.isPending) return <PageSpinner label="Loading the campaign…" />;
  if (campaign.isError && isNotFoundError(campaign.error)) return <NotFoundPage />;
  if (campaign.isError)
    return <PageLoadError title="Could not load the campaign" error={campaign.error} onRetry={() => campaign.refetch()} />;
  const c = campaign.data;
  const open = c.progress.status === 'open';
  const oneTime = c.tiers.filter((t) => t.kind === 'one-time');
  const monthly = c.tiers.filter((t) => t.kind === 'monthly');

  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 md:py-12">
      <div className="grid gap-8 lg:grid-cols-[1fr_22rem]">
        <div className="min-w-0">
          <p className="text-xs font-bold uppercase tracking-[0.2em] text-amber-400">Campaign</p>
          <h1 className="mt-2 text-3xl font-bold leading-tight text-foil-50 sm:text-4xl">{c.title}</h1>
          {c.summary && <p className="mt-3 text-lg text-foil-300">{c.summary}</p>}
        </div>
        <div className="lg:row-span-2">
          <div className="space-y-4 lg:sticky lg:top-6">
            <CampaignProgress progress={c.progress} />
            {open ? (
              <Link to="/campaign/pledge" className={buttonClasses({ size: 'lg', className: 'w-full' })}>
                Pledge any amount
              </Link>
            ) : (
              <p className="rounded-xl border border-foil-800 p-3 text-center text-sm text-foil-300">
                {c.progress.status === 'ended' ? 'This campaign has ended. Thank you to every backer.' : 'Pledges open soon.'}
              </p>
            )}
          </div>
        </div>
        <section aria-labelledby="story-title" className="min-w-0 space-y-4">
          <h2 id="story-title" className="text-xl font-bold text-foil-50">
            The story
          </h2>
          {c.story.split(/\n\s*\n/).map((para, i) => (
            <p key={i} className="text-foil-200">
              {para}
            </p>
          ))}
        </section>
      </div>

      <TierGroup id="tiers-title" title="Reward tiers" className="mt-12" tiers={oneTime} currency={c.currency} open={open} />
      <TierGroup
        id="crew-title"
        title="Crew memberships"
        intro="Monthly support, renewed each month until you stop it from My support."
        className="mt-10"
        tiers={monthly}
        currency={c.currency}
        open={open}
      />
      <div className="mt-12 grid gap-10 lg:grid-cols-2">
        <StretchTargets targets={c.stretchTargets} currency={c.currency} />
        <BackerWall slug={c.slug} />
      </div>
    </div>
  );
}
