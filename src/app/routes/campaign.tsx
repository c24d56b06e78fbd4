import { Link, useParams } from 'react-router-dom';
import { NO_GIFT_LABEL, PLEDGE_MIN_MINOR, type TierView } from '@shared/schemas/campaign';
import { buttonClasses } from '@/components/ui/button';
import { PageLoadError } from '@/components/ui/page-load-error';
import { PageSpinner } from '@/components/ui/spinner';
import { MonthlyAccounts } from '@/features/campaign/components/monthly-accounts';
import { FEATURED_CAMPAIGN, useCampaign } from '@/features/campaign/api/get-campaign';
import { BackerWall } from '@/features/campaign/components/backer-wall';
import { FlightBudget } from '@/features/campaign/components/flight-budget';
import { StretchTargets } from '@/features/campaign/components/stretch-targets';
import { ThankYouGift } from '@/features/campaign/components/thank-you-gift';
import { money } from '@/features/campaign/format';
import { useDocumentTitle } from '@/lib/document-title';
import { isNotFoundError } from '@/lib/api-client';

function GiftList({
  id,
  title,
  intro,
  tiers,
  currency,
  open,
}: {
  id: string;
  title: string;
  intro: string;
  tiers: TierView[];
  currency: string;
  open: boolean;
}) {
  if (tiers.length === 0) return null;
  return (
    <section aria-labelledby={id} className="rounded-2xl border border-foil-700/60 bg-night-900/50 px-5 py-4 sm:px-7">
      <h2 id={id} className="pt-2 text-xl font-bold text-foil-50">
        {title}
      </h2>
      <p className="mt-1 text-sm text-foil-400">{intro}</p>
      <ul className="mt-2">
        {tiers.map((t) => (
          <ThankYouGift key={t.id} tier={t} currency={currency} open={open} />
        ))}
      </ul>
    </section>
  );
}

/** An address naming no campaign: say so and point to the one that runs (asking again cannot help). */
function MissingCampaign({ slug }: { slug: string }) {
  useDocumentTitle('No such campaign');
  return (
    <div className="mx-auto max-w-xl px-4 py-16 text-center">
      <h1 className="text-3xl font-bold text-foil-50">There is no campaign “{slug}”</h1>
      <p className="mt-3 text-foil-300">The link may be old or mistyped. The mission’s current campaign is one click away.</p>
      <Link to="/campaign" className={buttonClasses({ className: 'mt-8' })}>
        See the current campaign
      </Link>
    </div>
  );
}

/** The campaign: the flight budget first (what the money buys), the story, then the thank-you gifts and crew. */
export function Component() {
  const { slug = FEATURED_CAMPAIGN } = useParams();
  const campaign = useCampaign(slug);
  useDocumentTitle(campaign.data?.title ?? 'Campaign');

  if (campaign.isPending) return <PageSpinner label="Loading the campaign…" />;
  if (campaign.isError && isNotFoundError(campaign.error)) return <MissingCampaign slug={slug} />;
  if (campaign.isError)
    return <PageLoadError title="Could not load the campaign" error={campaign.error} onRetry={() => campaign.refetch()} />;
  const c = campaign.data;
  const open = c.progress.status === 'open';
  const oneTime = c.tiers.filter((t) => t.kind === 'one-time');
  const monthly = c.tiers.filter((t) => t.kind === 'monthly');

  return (
    <div className="mx-auto max-w-5xl space-y-10 px-4 py-8 sm:px-6 md:py-12">
      <header>
        <h1 className="text-3xl font-bold leading-tight text-foil-50 sm:text-4xl">{c.title}</h1>
        {c.summary && <p className="mt-3 max-w-3xl text-lg text-foil-300">{c.summary}</p>}
      </header>

      <FlightBudget campaign={c} />

      {open ? (
        <div className="flex flex-wrap items-center gap-4 rounded-2xl border border-amber-400/40 bg-night-800/60 p-5">
          <p className="min-w-0 flex-1 text-foil-200">
            Every pledge goes into the line being paid now. Pick a thank-you gift below, or give any amount from{' '}
            {money(PLEDGE_MIN_MINOR, c.currency)} without one.
          </p>
          <Link to="/campaign/pledge" className={buttonClasses({ size: 'lg' })}>
            {NO_GIFT_LABEL}
          </Link>
        </div>
      ) : (
        <p className="rounded-xl border border-foil-800 p-4 text-foil-300">
          {c.progress.status === 'ended' ? 'Pledges have closed. Thank you to every backer.' : 'Pledges are not open yet.'}
        </p>
      )}

      <section aria-labelledby="story-title" className="max-w-3xl space-y-4">
        <h2 id="story-title" className="text-xl font-bold text-foil-50">
          The story
        </h2>
        {c.story.split(/\n\s*\n/).map((para, i) => (
          <p key={i} className="text-foil-200">
            {para}
          </p>
        ))}
      </section>

      <GiftList
        id="gifts-title"
        title="Thank-you gifts"
        intro="One-time pledges. Give the amount shown or more; everything above it goes into the flight budget too."
        tiers={oneTime}
        currency={c.currency}
        open={open}
      />
      <GiftList
        id="crew-title"
        title="Crew memberships"
        intro="Monthly support that keeps the sail flying after launch."
        tiers={monthly}
        currency={c.currency}
        open={open}
      />
      <MonthlyAccounts slug={c.slug} />
      <div className="grid gap-10 lg:grid-cols-2">
        <StretchTargets targets={c.stretchTargets} currency={c.currency} />
        <BackerWall slug={c.slug} />
      </div>
    </div>
  );
}
