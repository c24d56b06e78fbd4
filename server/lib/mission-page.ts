import type { Request } from 'express';
import type { Logger } from 'pino';

// The mission page (`/`) leaves the server already rendered: React renders the client's own components
// (src/entry-server.tsx) from the same data the page's API calls answer, and the HTML carries that data as JSON
// so the browser's hydration starts from it. Any failure falls back to the plain client page (rendered in the
// browser), so server rendering can never take the page down.

/** Where the mission page's data comes from: the services behind the same public API calls the page makes. */
export type MissionPageSources = {
  campaign: (slug: string) => Promise<unknown>;
  orbitSummary: () => Promise<unknown>;
  dispatchFeed: (req: Request) => Promise<unknown[]>;
};

// JSON in HTML: `<` escaped so no `</script>` or comment can end the element early; the JSON parser reads `\u003c` back.
const jsonForHtml = (value: unknown) => JSON.stringify(value).replace(/</g, '\\u003c');
// What the browser gets from the API: the value after a JSON round trip (dates as strings, no undefined fields).
const asJson = <T>(value: T): T => JSON.parse(JSON.stringify(value)) as T;

export function createMissionPageRenderer({ sources, logger }: { sources: MissionPageSources; logger: Logger }) {
  // Loaded on the first visit, so processes that never serve the page (API tests, the worker) never load React's
  // server renderer or the client's components.
  let entry: Promise<typeof import('../../src/entry-server')> | null = null;

  /** `indexHtml` with the mission page rendered into #root and its data beside it; null when rendering failed. */
  return async function renderMissionPage(req: Request, indexHtml: string): Promise<string | null> {
    if (!indexHtml.includes('<div id="root"></div>')) return null;
    try {
      entry ??= import('../../src/entry-server');
      const { missionPageQueries, renderPage, MISSION_CAMPAIGN } = await entry;
      const { SSR_DATA_ID } = await import('../../src/app/ssr-data');
      const [campaign, orbitSummary, dispatches] = await Promise.allSettled([
        sources.campaign(MISSION_CAMPAIGN),
        sources.orbitSummary(),
        sources.dispatchFeed(req),
      ]);
      // A part that cannot be read now (no campaign yet, no orbit data) is left to the browser, which shows its
      // own loading and error states for it, as before.
      const queries = missionPageQueries({
        campaign: campaign.status === 'fulfilled' ? asJson(campaign.value as never) : undefined,
        orbitSummary: orbitSummary.status === 'fulfilled' ? asJson(orbitSummary.value as never) : undefined,
        dispatchFeed: dispatches.status === 'fulfilled' ? asJson({ dispatches: dispatches.value as never[] }) : undefined,
      });
      const html = await renderPage('/', queries);
      return indexHtml.replace(
        '<div id="root"></div>',
        `<div id="root">${html}</div>\n    <script type="application/json" id="${SSR_DATA_ID}">${jsonForHtml(queries)}</script>`,
      );
    } catch (err) {
      logger.warn({ err }, 'mission page: server rendering failed, sending the client-rendered page');
      return null;
    }
  };
}
