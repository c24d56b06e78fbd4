// Server rendering of the public pages that have it (the mission page): the same components, routes and providers
// as src/main.tsx, rendered by React on the server from the same data the page's queries fetch, so the page paints
// before any script runs. The browser then hydrates this HTML (src/main.tsx).
import { StrictMode } from 'react';
import { renderToPipeableStream } from 'react-dom/server';
import { StaticRouter } from 'react-router-dom';
import { Writable } from 'node:stream';
import type { AccountView } from '@shared/schemas/auth';
import type { CampaignView } from '@shared/schemas/campaign';
import type { DispatchFeedItem } from '@shared/schemas/dispatch';
import { AppProvider, createAppQueryClient } from '@/app/provider';
import { AppRoutes } from '@/app/router';
import { preloadMissionSections } from '@/app/routes/home';
import type { SeededQuery } from '@/app/ssr-data';

export { SSR_DATA_ID } from '@/app/ssr-data';
import { getMeQueryOptions } from '@/features/auth/api/get-me';
import { campaignKeys, FEATURED_CAMPAIGN } from '@/features/campaign/api/get-campaign';
import { dispatchKeys } from '@/features/dispatches/api/keys';
import { getOrbitSummaryQueryOptions, type OrbitSummary } from '@/features/live-orbit/api/get-orbit-summary';

/** The campaign the mission page shows. */
export const MISSION_CAMPAIGN = FEATURED_CAMPAIGN;

/** The mission page's data, each part as its API answers it (JSON-parsed); a part left out is fetched by the browser. */
export type MissionPageData = {
  /** Who the page was rendered for (null: signed out), as `/api/auth/me` answers: the header shows their links. */
  me?: AccountView | null;
  campaign?: CampaignView;
  orbitSummary?: OrbitSummary;
  dispatchFeed?: { dispatches: DispatchFeedItem[] };
};

/** The queries of the mission page's components, under the keys those components read, as read at `updatedAt`. */
export function missionPageQueries(updatedAt: number, data: MissionPageData): SeededQuery[] {
  const queries: SeededQuery[] = [];
  if (data.me !== undefined) queries.push({ key: getMeQueryOptions().queryKey, data: data.me, updatedAt });
  if (data.campaign) queries.push({ key: campaignKeys.detail(FEATURED_CAMPAIGN), data: data.campaign, updatedAt });
  if (data.orbitSummary) queries.push({ key: getOrbitSummaryQueryOptions().queryKey, data: data.orbitSummary, updatedAt });
  if (data.dispatchFeed) queries.push({ key: dispatchKeys.feed(), data: data.dispatchFeed, updatedAt });
  return queries;
}

/**
 * The app's HTML for `url` with these queries already answered. Waits for every lazy part (all of the page, as a
 * crawler or a visitor without scripts would need it), and gives up after `timeoutMs`.
 */
export async function renderPage(url: string, queries: SeededQuery[], timeoutMs = 5_000): Promise<string> {
  // Lazy parts load before rendering, so each is rendered in place: a part that suspended would be streamed
  // out of order with an inline script to move it, which the CSP blocks.
  await preloadMissionSections();
  const client = createAppQueryClient();
  for (const q of queries) client.setQueryData(q.key, q.data, { updatedAt: q.updatedAt });
  const html = await new Promise<string>((resolve, reject) => {
    let html = '';
    let failed: unknown = null;
    const sink = new Writable({
      write(chunk: Buffer | string, _encoding, callback) {
        html += typeof chunk === 'string' ? chunk : chunk.toString('utf8');
        callback();
      },
      final(callback) {
        callback();
        if (failed) reject(failed instanceof Error ? failed : new Error(String(failed)));
        else resolve(html);
      },
    });
    const stream = renderToPipeableStream(
      <StrictMode>
        <AppProvider client={client}>
          <StaticRouter location={url}>
            <AppRoutes />
          </StaticRouter>
        </AppProvider>
      </StrictMode>,
      {
        // All in document order: large parts are otherwise sent out of place with inline scripts that move them
        // into place, which the CSP blocks (and the page is sent whole anyway, once everything is ready).
        progressiveChunkSize: Number.MAX_SAFE_INTEGER,
        onAllReady: () => stream.pipe(sink),
        onShellError: (error) => reject(error instanceof Error ? error : new Error(String(error))),
        // An error inside a boundary would leave that part to the browser: render all of it or nothing.
        onError: (error) => {
          failed ??= error;
        },
      },
    );
    setTimeout(() => stream.abort(new Error(`server rendering of ${url} took longer than ${timeoutMs} ms`)), timeoutMs).unref();
  });
  if (html.includes('<script')) throw new Error(`server rendering of ${url} needed an inline script (a part suspended)`);
  return html;
}
