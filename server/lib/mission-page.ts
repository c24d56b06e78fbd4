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

export function createMissionPageRenderer({
  sources,
  logger,
  freshMs = 3_000,
  maxStaleMs = 60_000,
}: {
  sources: MissionPageSources;
  logger: Logger;
  /** How long one render serves every signed-out visitor as it is (their page is the same for all of them). */
  freshMs?: number;
  /** Up to this age an older render is still sent at once; past it, the visitor waits for a new render. The browser
   * refetches whatever its queries find stale for their age. */
  maxStaleMs?: number;
}) {
  // Loaded on first use, so processes that never serve the page (API tests, the worker) never load React's server
  // renderer or the client's components; `warm()` loads them ahead of the first visitor.
  let entry: Promise<typeof import('../../src/entry-server')> | null = null;
  const loadEntry = () => (entry ??= import('../../src/entry-server'));

  type Shared = { at: number; indexHtml: string; page: Promise<string | null> };
  let shared: Shared | null = null;
  let refreshing: Promise<unknown> | null = null;
  const renderShared = (req: Request, indexHtml: string): Shared => {
    const at = Date.now();
    return { at, indexHtml, page: render(req, indexHtml, at) };
  };
  const refresh = (req: Request, indexHtml: string) => {
    if (refreshing) return;
    const next = renderShared(req, indexHtml);
    // A renewal that failed (the database away for a moment, say) keeps the last good render in place.
    refreshing = next.page
      .then((page) => {
        if (page !== null && (!shared || next.at > shared.at)) shared = next;
      })
      .finally(() => {
        refreshing = null;
      });
  };

  // The shared render is renewed on a timer of its own while visitors come, never on a visitor's request: a render
  // holds the event loop for tens of milliseconds, and started by a request it delayed that same visitor's
  // stylesheet, fonts and scripts, asked for right after the HTML. A tick renders only if someone came since the
  // last render began, and the timer stops once nobody has come for maxStaleMs.
  let lastVisit: { at: number; req: Request; indexHtml: string } | null = null;
  let timer: ReturnType<typeof setInterval> | null = null;
  const keepFresh = (req: Request, indexHtml: string) => {
    lastVisit = { at: Date.now(), req, indexHtml };
    if (timer) return;
    timer = setInterval(() => {
      if (!lastVisit || Date.now() - lastVisit.at >= maxStaleMs) {
        clearInterval(timer!);
        timer = null;
        return;
      }
      if (!shared || lastVisit.at >= shared.at) refresh(lastVisit.req, lastVisit.indexHtml);
    }, freshMs);
    timer.unref();
  };

  /** `indexHtml` with the mission page rendered into #root and its data beside it; null when rendering failed. */
  function renderMissionPage(req: Request, indexHtml: string): Promise<string | null> {
    if (!indexHtml.includes('<div id="root"></div>')) return Promise.resolve(null);
    // A signed-in visitor's dispatch feed is their own: their page is rendered for them.
    if (req.user || freshMs <= 0) return render(req, indexHtml, Date.now());
    const age = shared ? Date.now() - shared.at : Infinity;
    if (!shared || shared.indexHtml !== indexHtml || age >= maxStaleMs) {
      shared = renderShared(req, indexHtml);
    } else if (age >= freshMs && !timer) {
      // The first visit after a pause long enough for the timer to stop: renew now, this once.
      refresh(req, indexHtml);
    }
    keepFresh(req, indexHtml);
    return shared.page;
  }

  renderMissionPage.warm = () =>
    loadEntry().then(
      () => undefined,
      (err: unknown) => logger.warn({ err }, 'mission page: the server renderer did not load'),
    );
  return renderMissionPage;

  async function render(req: Request, indexHtml: string, at: number): Promise<string | null> {
    try {
      const { missionPageQueries, renderPage, MISSION_CAMPAIGN, SSR_DATA_ID } = await loadEntry();
      const [campaign, orbitSummary, dispatches] = await Promise.allSettled([
        sources.campaign(MISSION_CAMPAIGN),
        sources.orbitSummary(),
        sources.dispatchFeed(req),
      ]);
      // A part that cannot be read now (no campaign yet, no orbit data) is left to the browser, which shows its
      // own loading and error states for it, as before.
      const queries = missionPageQueries(at, {
        // Known already: without it the browser would ask who is signed in and render the header again on the answer.
        me: asJson(req.user ?? null),
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
  }
}
