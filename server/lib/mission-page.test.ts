import { describe, expect, it, vi } from 'vitest';
import type { Request } from 'express';
import type { Logger } from 'pino';
import { createMissionPageRenderer, type MissionPageSources } from './mission-page';

const index = '<!doctype html><html><head><title>Lightkeel</title></head><body><div id="root"></div></body></html>';
const anonymous = {} as Request;
const signedIn = { user: { id: 'a', roles: ['backer'] } } as unknown as Request;
const feedItem = {
  slug: 'the-sail-is-open',
  title: 'The sail is open',
  excerpt: 'Two days ago the booms pushed the sail out.',
  publishedAt: '2025-11-03T17:00:00.000Z',
  audienceLabel: 'Everyone',
  locked: false,
  heroImagePath: null,
};

function setup(overrides: Partial<MissionPageSources> = {}, timing: { freshMs?: number; maxStaleMs?: number } = { freshMs: 60_000 }) {
  const sources: MissionPageSources = {
    campaign: vi.fn(() => Promise.reject(new Error('no campaign'))),
    orbitSummary: vi.fn(() => Promise.reject(new Error('no orbit data'))),
    dispatchFeed: vi.fn(() => Promise.resolve([feedItem])),
    ...overrides,
  };
  const warn = vi.fn();
  const render = createMissionPageRenderer({ sources, logger: { warn } as unknown as Logger, ...timing });
  return { sources, warn, render };
}

describe('the mission page rendered on the server', () => {
  it('renders the parts it could read and leaves the others to the browser, with the data beside the HTML', async () => {
    const { render, sources } = setup();
    const html = (await render(anonymous, index))!;
    expect(sources.campaign).toHaveBeenCalledWith('tern-1');
    const root = html.slice(html.indexOf('<div id="root">'), html.indexOf('</div>\n    <script'));
    expect(root).toContain('A sail the size of a small flat, pushed by sunlight.');
    expect(root).toContain('href="/dispatches/the-sail-is-open"');
    expect(root).toContain('3 November 2025');
    // Campaign and orbit could not be read: their loading states, as the browser shows them before its own fetch.
    expect(root).toContain('Loading the flight budget…');
    expect(root).toContain('Loading the orbit status…');
    expect(root).not.toContain('<script');
    const json = html.match(/<script type="application\/json" id="lk-ssr-data">([^<]*)<\/script>/)![1]!;
    const queries = JSON.parse(json) as { key: string[]; data: unknown; updatedAt: number }[];
    expect(queries).toEqual([
      { key: ['auth', 'me'], data: null, updatedAt: expect.any(Number) },
      { key: ['dispatches', 'feed'], data: { dispatches: [feedItem] }, updatedAt: expect.any(Number) },
    ]);
  });

  it("renders a signed-in visitor's page with their account, as /api/auth/me answers it", async () => {
    const { render } = setup();
    const account = {
      id: 'a',
      email: 'wren@example.test',
      displayName: 'Wren',
      roles: ['backer'],
      emailVerified: true,
      createdAt: '2026-01-05T10:00:00.000Z',
    };
    const html = (await render({ user: account } as unknown as Request, index))!;
    expect(html).toContain('Wren');
    const queries = JSON.parse(html.match(/id="lk-ssr-data">([^<]*)<\/script>/)![1]!) as { key: string[]; data: unknown }[];
    expect(queries.find((q) => q.key.join('/') === 'auth/me')?.data).toEqual(account);
  });

  it('escapes the data so no text in it can close the script element', async () => {
    const { render } = setup({ dispatchFeed: () => Promise.resolve([{ ...feedItem, title: '</script><script>alert(1)</script>' }]) });
    const html = (await render(anonymous, index))!;
    const json = html.slice(html.indexOf('id="lk-ssr-data">'), html.lastIndexOf('</script>'));
    expect(json).not.toContain('</script>');
    expect(json).toContain('\\u003c/script>');
    expect(html).toContain('&lt;/script&gt;&lt;script&gt;alert(1)&lt;/script&gt;');
  });

  it('serves signed-out visitors one render while it is fresh, and renders for each signed-in visitor', async () => {
    const { render, sources } = setup();
    const first = await render(anonymous, index);
    expect(await render(anonymous, index)).toBe(first);
    expect(sources.dispatchFeed).toHaveBeenCalledTimes(1);
    await render(signedIn, index);
    await render(signedIn, index);
    expect(sources.dispatchFeed).toHaveBeenCalledTimes(3);
    expect(vi.mocked(sources.dispatchFeed).mock.calls[1]![0]).toBe(signedIn);
  });

  it("renews the signed-out render on its own timer while visitors come, never on a visitor's request", async () => {
    vi.useFakeTimers({ toFake: ['Date', 'setInterval', 'clearInterval'] });
    try {
      let title = 'First';
      const { render, sources } = setup(
        { dispatchFeed: vi.fn(() => Promise.resolve([{ ...feedItem, title }])) },
        { freshMs: 3_000, maxStaleMs: 60_000 },
      );
      const feedCalls = () => vi.mocked(sources.dispatchFeed).mock.calls.length;
      expect(await render(anonymous, index)).toContain('First');
      expect(feedCalls()).toBe(1);
      title = 'Second';
      // Older than freshMs: the visitor gets the render there is, and their request starts no render (a render holds
      // the event loop while their stylesheet and scripts are being asked for).
      vi.setSystemTime(Date.now() + 3_500);
      expect(await render(anonymous, index)).toContain('First');
      expect(feedCalls()).toBe(1);
      // The timer renews it: the next visitor gets the new render.
      await vi.advanceTimersByTimeAsync(3_000);
      expect(feedCalls()).toBe(2);
      await vi.waitFor(async () => expect(await render(anonymous, index)).toContain('Second'));
      // A tick with no visit since the last render renders nothing; once nobody has come for maxStaleMs the timer stops.
      await vi.advanceTimersByTimeAsync(3_000);
      const settled = feedCalls();
      await vi.advanceTimersByTimeAsync(120_000);
      expect(feedCalls()).toBeLessThanOrEqual(settled + 1);
      expect(vi.getTimerCount()).toBe(0);
    } finally {
      vi.useRealTimers();
    }
  });

  it('keeps the last good render when a renewal fails', async () => {
    vi.useFakeTimers({ toFake: ['Date', 'setInterval', 'clearInterval'] });
    try {
      let fail = false;
      const { render, warn } = setup(
        { dispatchFeed: vi.fn(() => (fail ? Promise.resolve([null]) : Promise.resolve([feedItem]))) },
        { freshMs: 3_000, maxStaleMs: 60_000 },
      );
      const good = await render(anonymous, index);
      expect(good).toContain('The sail is open');
      fail = true;
      vi.setSystemTime(Date.now() + 3_500);
      expect(await render(anonymous, index)).toBe(good);
      await vi.advanceTimersByTimeAsync(3_000);
      await vi.waitFor(() => expect(warn).toHaveBeenCalledTimes(1));
      expect(await render(anonymous, index)).toBe(good);
    } finally {
      vi.useRealTimers();
    }
  });

  it('answers null (the plain client page is sent) when rendering fails, and says so in the log', async () => {
    const { render, warn } = setup({ dispatchFeed: () => Promise.resolve([null]) });
    expect(await render(anonymous, index)).toBeNull();
    expect(warn).toHaveBeenCalledTimes(1);
    expect(await setup().render(anonymous, '<html><body><main></main></body></html>')).toBeNull();
  });
});
