import { describe, expect, it, vi } from 'vitest';
import { EmailTemplateError, emailNames, renderEmail, type EmailData, type EmailName } from '../../emails/render';
import { formatMoney } from '../../shared/money';

const hostile = 'Wren <script>alert("x")</script> & Co';
const hostileTitle = 'Tern-1 <b>sail</b> fund';

const samples: { [N in EmailName]: EmailData[N] } = {
  'verify-email': { displayName: hostile, verifyUrl: 'http://127.0.0.1:3000/verify?token=abc123&x=1' },
  'password-reset': { displayName: hostile, resetUrl: 'http://127.0.0.1:3000/reset?token=def456', expiresInMinutes: 45 },
  'pledge-confirmation': {
    displayName: hostile,
    campaignTitle: hostileTitle,
    tierTitle: 'Deck hand',
    amountMinor: 123450,
    currency: 'EUR',
    receiptUrl: 'http://127.0.0.1:3000/my-support/receipts/9',
  },
  'renewal-failed': {
    displayName: hostile,
    campaignTitle: 'Tern-1 crew',
    amountMinor: 500,
    currency: 'JPY',
    updateCardUrl: 'http://127.0.0.1:3000/my-support/card',
    nextAttemptAt: '2031-03-04T10:15:00Z',
  },
  'sign-up-attempt': {
    displayName: hostile,
    signInUrl: 'http://127.0.0.1:3000/sign-in',
    resetUrl: 'http://127.0.0.1:3000/forgot-password',
  },
  'password-changed': { displayName: hostile, changedAt: '2031-05-06T07:08:00Z', resetUrl: 'http://127.0.0.1:3000/forgot-password' },
  dispatch: {
    title: hostile,
    bodyMarkdown: 'The sail **opened** on day 3. [Mission page](/campaign)',
    excerpt: 'The sail opened on day 3.',
    pageUrl: 'http://127.0.0.1:3000/dispatches/sail-opened-abc',
    siteUrl: 'http://127.0.0.1:3000',
    charts: [
      { imageUrl: 'http://127.0.0.1:3000/api/files/charts/x.png', alt: 'Apogee rising 2 km', caption: 'After deploy', title: 'Apogee' },
    ],
    audienceLine: 'a backer',
    unsubscribeUrl: 'http://127.0.0.1:3000/unsubscribe?token=abc',
    choicesUrl: 'http://127.0.0.1:3000/my-support/email',
  },
  'pass-reminder': {
    displayName: hostile,
    craftName: 'Tern-1',
    placeName: 'Shed & "dune" top',
    timeZone: 'Pacific/Auckland',
    start: { at: '2026-11-26T13:40:03Z', elevationDeg: 10, compass: 'S' },
    highest: { at: '2026-11-26T13:45:03Z', elevationDeg: 74.4, compass: 'WSW' },
    end: { at: '2026-11-26T13:48:40Z', elevationDeg: 12.2, compass: 'NW' },
    skyWatchUrl: 'http://127.0.0.1:3000/sky-watch?lat=-41.3&lon=174.8',
    unsubscribeUrl: 'http://127.0.0.1:3000/unsubscribe?token=abc',
    choicesUrl: 'http://127.0.0.1:3000/my-support/email',
  },
  'refund-issued': {
    displayName: hostile,
    campaignTitle: hostileTitle,
    amountMinor: 1250,
    currency: 'USD',
    reason: 'Backer asked',
    receiptUrl: 'http://127.0.0.1:3000/my-support/receipts/9',
  },
};

function urlOf(name: EmailName): string {
  const d = samples[name] as Record<string, unknown>;
  return String(d.verifyUrl ?? d.signInUrl ?? d.resetUrl ?? d.receiptUrl ?? d.updateCardUrl ?? d.pageUrl ?? d.skyWatchUrl);
}

describe('e-mail templates', () => {
  it('covers every template with a sample', () => {
    expect(new Set(emailNames)).toEqual(new Set(Object.keys(samples)));
  });

  for (const name of Object.keys(samples) as EmailName[]) {
    it(`renders ${name} under strict mjml validation with an HTML and a text part carrying the data`, async () => {
      const r = await renderEmail(name, samples[name] as never);
      expect(r.subject.length).toBeGreaterThan(5);
      expect(r.html).toMatch(/^<!doctype html>/i);
      // Brand: night-blue header with the wordmark, amber accent, silver footer with the reason.
      expect(r.html).toContain('Lightkeel');
      expect(r.html.toLowerCase()).toContain('#0b1431');
      expect(r.html.toLowerCase()).toContain('#f5a21b');
      expect(r.html.toLowerCase()).toContain('#d9dee6');
      expect(r.html).toContain('You get this e-mail because');
      expect(r.text).toContain('You get this e-mail because');
      // No webfont or other off-machine fetches.
      expect(r.html).not.toMatch(/fonts\.googleapis|@import url/);

      const url = urlOf(name);
      expect(r.html).toContain(`href="${url.replace(/&/g, '&amp;')}"`);
      expect(r.text).toContain(url);

      // User-supplied text is escaped in HTML, and kept verbatim in the text part.
      expect(r.html).not.toContain('<script>');
      expect(r.html).toContain('Wren &lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; Co');
      expect(r.text).toContain(hostile);
      // Apart from the reader's own words, the text part holds no markup from the layout.
      // (Lines are wrapped at 72 characters: compare with whitespace folded, so a wrapped title is still found.)
      expect(
        r.text
          .replace(/\s+/g, ' ')
          .split(hostile)
          .join('')
          .split(hostileTitle)
          .join('')
          .replace(/<[^>\s]+@[^>\s]+>/g, ''),
      ).not.toMatch(/<\/?[a-z][^>]*>/i);
    });
  }

  it('shows pledge amounts from minor units with the currency exponent, and the receipt caution', async () => {
    const pledge = await renderEmail('pledge-confirmation', samples['pledge-confirmation']);
    expect(pledge.html).toContain(formatMoney(123450, 'EUR'));
    expect(pledge.text).toContain('€1,234.50');
    expect(pledge.text).toMatch(/Tier:\s+Deck hand/);
    expect(pledge.html).toContain('Tern-1 &lt;b&gt;sail&lt;/b&gt; fund');
    expect(pledge.text).toMatch(/not tax advice/);
    expect(pledge.text).toMatch(/licensed tax adviser/);

    const renewal = await renderEmail('renewal-failed', samples['renewal-failed']);
    expect(renewal.text).toContain('JP¥500'); // JPY has no minor digits (exponent 0)
    expect(renewal.text).toContain('4 March 2031');

    const noTier = await renderEmail('pledge-confirmation', { ...samples['pledge-confirmation'], tierTitle: undefined });
    expect(noTier.text).not.toContain('Tier:');
  });

  it('says a monthly pledge renews monthly, on which date, and how to stop it', async () => {
    const r = await renderEmail('pledge-confirmation', {
      ...samples['pledge-confirmation'],
      renewsMonthly: { nextRenewalAt: '2031-04-01T00:00:00Z', manageUrl: 'http://127.0.0.1:3000/my-support/memberships/m1' },
    });
    for (const part of [r.text.replace(/\s+/g, ' '), r.html]) {
      expect(part).toContain('renews every month');
      expect(part).toContain('1 April 2031');
      expect(part).toMatch(/stop it at any time/);
    }
    expect(r.html).toContain('href="http://127.0.0.1:3000/my-support/memberships/m1"');
    const once = await renderEmail('pledge-confirmation', samples['pledge-confirmation']);
    expect(once.text).not.toContain('renews');
  });

  it('tells the owner of an address that someone tried to sign up with it, and when a password changed', async () => {
    const attempt = await renderEmail('sign-up-attempt', samples['sign-up-attempt']);
    expect(attempt.subject).toMatch(/tried to sign up/);
    expect(attempt.text).toMatch(/nothing was created/);
    const changed = await renderEmail('password-changed', samples['password-changed']);
    expect(changed.text.replace(/\s+/g, ' ')).toContain('6 May 2031 at 07:08 UTC');
    expect(changed.html).toContain('href="http://127.0.0.1:3000/forgot-password"');
  });

  it("states a pass in the place's own time zone, with both cautions and an unsubscribe link", async () => {
    const r = await renderEmail('pass-reminder', samples['pass-reminder']);
    // Expected local times from Python's zoneinfo (IANA tz database), not from the JS runtime under test:
    // 13:40:03Z → Friday 27 November 02:40 NZDT (UTC+13); 13:45:03Z → 02:45; 13:48:40Z → 02:48.
    expect(r.subject).toBe('Tern-1 passes over Shed & "dune" top, up to 74° high: Friday 27 November, 02:40 GMT+13');
    expect(r.text).toContain('Friday 27 November, 02:40 GMT+13, S, 10° up');
    expect(r.text).toContain('02:45, WSW, 74° up');
    expect(r.text).toContain('02:48, NW, 12° up');
    expect(r.html).toContain('Shed &amp; &quot;dune&quot; top');
    for (const part of [r.html, r.text.replace(/\s*\n\s*/g, ' ')]) {
      expect(part).toContain('Never look at or near the Sun');
      expect(part).toContain('Times shift by minutes as the orbit slowly decays: check the newest times on the site');
      expect(part).toContain('http://127.0.0.1:3000/unsubscribe?token=abc');
    }
  });

  it('mentions the reset link lifetime in both parts', async () => {
    const r = await renderEmail('password-reset', samples['password-reset']);
    expect(r.text).toContain('45 minutes');
    expect(r.html).toContain('45 minutes');
  });

  it('renders each copy of a dispatch exactly as a fresh render of its data, and still checks its own link', async () => {
    const title = 'Copies of one dispatch';
    const copyFor = (token: string) => ({
      ...samples.dispatch,
      title,
      unsubscribeUrl: `http://127.0.0.1:3000/unsubscribe?token=${token}&v=1`,
    });
    // A fresh module (empty cache) renders member B's copy from scratch …
    vi.resetModules();
    const fresh = await import('../../emails/render');
    const alone = await fresh.renderEmail('dispatch', copyFor('member-b'));
    // … and here member A's copy comes first, so B's is filled in from the shared render.
    await renderEmail('dispatch', copyFor('member-a'));
    const filledIn = await renderEmail('dispatch', copyFor('member-b'));
    expect(filledIn).toEqual(alone);
    expect(filledIn.html).toContain('http://127.0.0.1:3000/unsubscribe?token=member-b&amp;v=1');
    expect(filledIn.text).toContain('http://127.0.0.1:3000/unsubscribe?token=member-b&v=1');
    expect(filledIn.html).not.toContain('member-a');
    // The shared part is cached, the link is not trusted: a copy with a bad link is refused, naming the field.
    await expect(renderEmail('dispatch', { ...copyFor('x'), unsubscribeUrl: 'javascript:alert(1)' })).rejects.toThrow(/unsubscribeUrl/);
    await expect(renderEmail('dispatch', { ...copyFor('x'), unsubscribeUrl: 42 } as never)).rejects.toThrow(/unsubscribeUrl/);
  });

  it('renders a copy from stored shared data plus its own link exactly as from its whole data, and checks the link', async () => {
    const { unsubscribeUrl: _, ...common } = { ...samples.dispatch, title: 'Copies from one shared row' };
    const shared = { key: `dispatch/test-${Math.random()}`, data: common };
    const own = (token: string) => ({ unsubscribeUrl: `http://127.0.0.1:3000/unsubscribe?token=${token}&v=2` });
    const first = await renderEmail('dispatch', own('member-a'), shared);
    const second = await renderEmail('dispatch', own('member-b'), shared);
    expect(first).toEqual(await renderEmail('dispatch', { ...common, ...own('member-a') }));
    expect(second).toEqual(await renderEmail('dispatch', { ...common, ...own('member-b') }));
    expect(second.html).toContain('token=member-b&amp;v=2');
    expect(second.html).not.toContain('member-a');
    // The copy's own field is checked every time, the cached shared render notwithstanding.
    await expect(renderEmail('dispatch', { unsubscribeUrl: 'javascript:alert(1)' }, shared)).rejects.toThrow(/unsubscribeUrl/);
    // A row carrying more than its personal fields is a mail of its own: rendered (and checked) as a whole.
    const retitled = await renderEmail('dispatch', { ...own('member-c'), title: 'A title of its own' }, shared);
    expect(retitled.subject).toContain('A title of its own');
    await expect(renderEmail('dispatch', { ...own('member-d'), pageUrl: 'javascript:alert(1)' }, shared)).rejects.toThrow(/pageUrl/);
    // Shared data that cannot pass the template's schema is refused on the first copy, naming the field.
    const broken = { key: `dispatch/broken-${Math.random()}`, data: { ...common, siteUrl: 'not a url' } };
    await expect(renderEmail('dispatch', own('member-e'), broken)).rejects.toThrow(/siteUrl/);
    await expect(renderEmail('dispatch', own('member-f'), broken)).rejects.toThrow(/siteUrl/);
  });

  it('rejects bad data with the field named, before rendering', async () => {
    await expect(renderEmail('verify-email', { displayName: 'A', verifyUrl: 'javascript:alert(1)' })).rejects.toThrow(/verifyUrl/);
    await expect(renderEmail('pledge-confirmation', { ...samples['pledge-confirmation'], amountMinor: 12.5 })).rejects.toThrow(
      /amountMinor/,
    );
    await expect(renderEmail('verify-email', { displayName: 'A\r\nBcc: x', verifyUrl: 'http://127.0.0.1/v' })).rejects.toThrow(
      /displayName/,
    );
    await expect(renderEmail('no-such-template', {})).rejects.toBeInstanceOf(EmailTemplateError);
  });
});
