import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { NO_GIFT_LABEL, PLEDGE_MIN_MINOR } from '@shared/campaign-words';
import { Alert } from '@/components/ui/alert';
import { buttonClasses } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { FEATURED_CAMPAIGN, useCampaign } from '@/features/campaign/api/get-campaign';
import { FlightBudget } from '@/features/campaign/components/flight-budget';
import { useDispatchFeed } from '@/features/dispatches/api/public-dispatches';
import { MISSION_CRAFT_SLUG } from '@/features/live-orbit/api/get-latest-set';
import { useOrbitSummary } from '@/features/live-orbit/api/get-orbit-summary';
import { OrbitStatus } from '@/features/live-orbit/components/orbit-status';
import { openDataLinks } from '@/features/live-orbit/open-data';
import { errorMessage } from '@/lib/form-errors';
import { money } from '@/lib/money';

// The mission page below its first screen (see ./home.tsx): loaded when the visitor comes near it.

export const orbitCaution =
  'Orbit and lifetime estimates shown here are not for collision or re-entry safety decisions; rely on official space-surveillance providers';
export const sunCaution = 'Never look at or near the Sun, with or without binoculars or a telescope: it blinds in an instant';

const chapters = [
  {
    title: 'Build',
    text: 'Members of the Saltmarsh Orbital Society folded a sail of aluminised film thinner than a bin bag into a box the size of a loaf of bread, and tested every fold on the clubhouse floor.',
  },
  {
    title: 'Unfurl',
    text: 'A few days after launch, four booms push the sail out to its full 24 m². From then on, Tern-1 has one engine: the faint, constant push of sunlight on a mirror.',
  },
  {
    title: 'Climb',
    text: 'Turning the sail face-on while it moves away from the Sun and edge-on while it moves towards it, Tern-1 tries to climb against the thin air that slowly drags every low satellite down.',
  },
  {
    title: 'Report',
    text: 'Our engineers read the published element sets and tell you, in plain words, whether the sail is winning. Backers get every dispatch from orbit; crew members read each one a day early.',
  },
];

const uses = [
  'The launch slot and the deployer that carries Tern-1 to orbit',
  'Ground-station time to hear the spacecraft and command each sail turn',
  'Spare sail film and booms, because the first fold is never the last',
  'Open reports of what the sail did, good days and bad',
];

const questions = [
  {
    q: 'How can sunlight push a spacecraft?',
    a: 'Light carries momentum. Each square metre of mirror facing the Sun feels a push of about nine millionths of a newton — tiny, but it never stops, and nothing has to be burned for it.',
  },
  {
    q: 'Why would a satellite need to climb?',
    a: 'Low orbits still brush the top of the atmosphere. The thin air slows a craft a little every orbit until it falls back and burns up. Tern-1 tries to win that race with light alone.',
  },
  {
    q: 'Where do your orbit numbers come from?',
    a: 'From public element sets that tracking networks publish for every catalogued object. We publish the same history as open data below, so anyone can check our sums.',
  },
  {
    q: 'What happens to my pledge if the goal is not reached?',
    a: 'Your pledge is paid when you make it and goes into the budget line being paid now. The lines are paid in order, so everything raised buys something real even before the whole goal is reached. Your receipts are in my support.',
  },
  {
    q: 'Can I see Tern-1 from where I live?',
    a: 'Often, yes: in the hour after sunset or before sunrise, when the sail catches sunlight over a dark sky. Sky watch lists the passes for your place and gives you calendar files.',
  },
];

function SectionTitle({ id, children }: { id: string; children: ReactNode }) {
  return (
    <h2 id={id} className="text-2xl font-bold text-foil-50 sm:text-3xl">
      {children}
    </h2>
  );
}

function MoneySide() {
  const campaign = useCampaign(FEATURED_CAMPAIGN);
  if (campaign.isPending) return <Spinner label="Loading the flight budget…" />;
  if (campaign.isError)
    return (
      <Alert tone="warning" title="The flight budget could not be loaded">
        {errorMessage(campaign.error)} The{' '}
        <Link to="/campaign" className="font-semibold underline">
          campaign page
        </Link>{' '}
        has it too.
      </Alert>
    );
  const c = campaign.data;
  const open = c.progress.status === 'open';
  return (
    <div className="space-y-4">
      <FlightBudget campaign={c} />
      {open ? (
        <div className="flex flex-wrap gap-3">
          <Link to="/campaign#gifts-title" className={buttonClasses({ size: 'lg' })}>
            Choose a thank-you gift
          </Link>
          <Link to="/campaign/pledge" className={buttonClasses({ variant: 'secondary', size: 'lg' })}>
            {NO_GIFT_LABEL} (from {money(PLEDGE_MIN_MINOR, c.currency)})
          </Link>
        </div>
      ) : (
        <p className="text-foil-300">
          {c.progress.status === 'ended' ? 'Pledges have closed. Thank you to every backer.' : 'Pledges are not open yet.'}
        </p>
      )}
    </div>
  );
}

function OrbitSide() {
  const summary = useOrbitSummary();
  return (
    <Card>
      <div className="mb-4 flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="orbit-title" className="text-xl font-bold text-foil-50">
          Orbit status
        </h2>
        <Link to="/where-it-is-now" className="text-sm font-semibold text-amber-300 underline underline-offset-2">
          Where it is now
        </Link>
      </div>
      {summary.isPending ? (
        <Spinner label="Loading the orbit status…" />
      ) : summary.isError ? (
        <Alert tone="warning" title="The orbit status could not be loaded">
          {errorMessage(summary.error)}
        </Alert>
      ) : (
        <OrbitStatus summary={summary.data} />
      )}
    </Card>
  );
}

function LatestDispatches() {
  const feed = useDispatchFeed();
  if (feed.isPending) return <Spinner label="Loading dispatches…" />;
  if (feed.isError)
    return (
      <Alert tone="warning" title="Dispatches could not be loaded">
        {errorMessage(feed.error)}
      </Alert>
    );
  const latest = feed.data.dispatches.slice(0, 3);
  if (latest.length === 0)
    return (
      <EmptyState title="No dispatches published yet" description="Outreach writes one whenever the sail does something worth telling." />
    );
  return (
    <ul className="grid gap-4 md:grid-cols-3 md:items-start">
      {latest.map((d) => (
        <li key={d.slug} className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5">
          <p className="text-xs font-semibold text-foil-400">
            <time dateTime={d.publishedAt}>
              {new Date(d.publishedAt).toLocaleDateString('en-GB', { dateStyle: 'long', timeZone: 'UTC' })}
            </time>
            {d.locked && ` · for backers`}
          </p>
          <h3 className="mt-1 font-bold">
            <Link
              to={`/dispatches/${d.slug}`}
              className="text-foil-50 underline decoration-amber-400 underline-offset-4 hover:text-amber-300"
            >
              {d.title}
            </Link>
          </h3>
          {d.excerpt && <p className="mt-2 line-clamp-4 text-sm text-foil-300">{d.excerpt}</p>}
        </li>
      ))}
    </ul>
  );
}

export function MissionSections() {
  return (
    // Below the first screen: the browser skips laying it out and painting it until it nears the viewport, so the
    // first screen paints sooner (its size is estimated until then; it stays in the accessibility tree).
    <div id="mission-sections" className="[contain-intrinsic-size:auto_3200px] [content-visibility:auto]">
      <div
        id="money-and-orbit"
        className="mx-auto grid max-w-6xl scroll-mt-28 gap-6 px-4 pb-10 sm:px-6 lg:grid-cols-[1.15fr_1fr] lg:items-start"
      >
        <MoneySide />
        <section aria-labelledby="orbit-title">
          <OrbitSide />
        </section>
      </div>

      <section id="story" aria-labelledby="story-title" className="mx-auto max-w-6xl scroll-mt-20 px-4 py-10 sm:px-6">
        <SectionTitle id="story-title">The story so far</SectionTitle>
        <ol className="mt-6 grid gap-4 md:grid-cols-2">
          {chapters.map((chapter, index) => (
            <li key={chapter.title} className="rounded-2xl border border-foil-800 bg-night-900/60 p-5">
              <p className="text-sm font-bold text-amber-300">
                <span aria-hidden="true">0{index + 1} · </span>
                {chapter.title}
              </p>
              <p className="mt-2 text-foil-200">{chapter.text}</p>
            </li>
          ))}
        </ol>
        <h3 className="mt-8 text-lg font-bold text-foil-50">What your pledge pays for</h3>
        <ul className="mt-3 space-y-2 text-foil-200">
          {uses.map((use) => (
            <li key={use} className="flex gap-3">
              <span aria-hidden="true" className="mt-2 size-1.5 shrink-0 rotate-45 bg-amber-400" />
              {use}
            </li>
          ))}
        </ul>
      </section>

      <section aria-labelledby="dispatches-title" className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
        <div className="mb-5 flex flex-wrap items-baseline justify-between gap-2">
          <SectionTitle id="dispatches-title">Latest dispatches</SectionTitle>
          <Link to="/dispatches" className="font-semibold text-amber-300 underline underline-offset-2">
            All dispatches
          </Link>
        </div>
        <LatestDispatches />
      </section>

      <section aria-labelledby="follow-title" className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
        <SectionTitle id="follow-title">Follow the sail yourself</SectionTitle>
        <div className="mt-5 grid gap-4 md:grid-cols-3 md:items-start">
          <Link to="/where-it-is-now" className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5 hover:border-amber-400/60">
            <span className="block font-bold text-foil-50">Where it is now</span>
            <span className="mt-1 block text-sm text-foil-300">The craft on a world map, its path and the night side, live.</span>
          </Link>
          <Link to="/sky-watch" className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5 hover:border-amber-400/60">
            <span className="block font-bold text-foil-50">Sky watch</span>
            <span className="mt-1 block text-sm text-foil-300">When it crosses your evening or morning sky, with calendar files.</span>
          </Link>
          <div className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5">
            <h3 className="font-bold text-foil-50">Open data</h3>
            <p className="mt-1 text-sm text-foil-300">Every element set we use, so you can check our numbers:</p>
            <ul className="mt-2 space-y-1 text-sm">
              {openDataLinks(MISSION_CRAFT_SLUG).map((l) => (
                <li key={l.href}>
                  <a href={l.href} download className="font-semibold text-amber-300 underline">
                    {l.label}
                  </a>{' '}
                  <span className="text-foil-400">— {l.description}</span>
                </li>
              ))}
            </ul>
          </div>
        </div>
      </section>

      <section aria-labelledby="questions-title" className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
        <SectionTitle id="questions-title">Questions and answers</SectionTitle>
        <div className="mt-5 divide-y divide-foil-800 rounded-2xl border border-foil-700/60 bg-night-900/60">
          {questions.map((item) => (
            <details key={item.q} className="group px-5 py-4">
              <summary className="cursor-pointer list-none font-semibold text-foil-50 marker:hidden">
                <span aria-hidden="true" className="mr-2 inline-block text-amber-300 transition-transform group-open:rotate-90">
                  ›
                </span>
                {item.q}
              </summary>
              <p className="mt-2 pl-5 text-foil-200">{item.a}</p>
            </details>
          ))}
        </div>
      </section>

      <section aria-labelledby="cautions-title" className="mx-auto max-w-6xl px-4 pb-14 pt-4 sm:px-6">
        <h2 id="cautions-title" className="sr-only">
          Cautions
        </h2>
        <ul className="grid gap-3 md:grid-cols-2">
          <li className="rounded-xl border border-amber-400/50 bg-amber-950/40 px-4 py-3 text-sm text-amber-100">
            <strong>Caution — the Sun: </strong>
            {sunCaution}. Watch for Tern-1 only after sunset or before sunrise.
          </li>
          <li className="rounded-xl border border-foil-700 bg-night-900/60 px-4 py-3 text-sm text-foil-300">
            <strong className="text-foil-100">Caution — orbit estimates: </strong>
            {orbitCaution}.
          </li>
        </ul>
      </section>
    </div>
  );
}
