import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, newPage, shot } from './browser';

// Issue 8 item 3 (sign-up enumeration): the whole client flow — the sign-up form, then signing in with the same
// password — must look the same for an address that already has an account and for a new one. Before the fix the
// client signed in right after sign-up, which worked only for a new address. A new account now signs in through the
// link in its confirmation mail.
const baseUrl = inject('baseUrl');
const outboxUrl = inject('outboxUrl');
const PASSWORD = 'a long new password 1';
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

/** Everything a visitor (or a prober) sees: where the browser ends up, what the page says, who is signed in. */
async function signUpThenSignIn(email: string, name: string) {
  const { page, context, problems } = await newPage(browser, { width: 390, height: 844 });
  const seen: Record<string, unknown> = {};
  await page.goto(`${baseUrl}/sign-up`);
  await page.getByLabel(/^display name$/i).fill('Grebe Watcher');
  await page.getByLabel(/^e-?mail( address)?$/i).fill(email);
  await page.getByLabel(/^password$/i).fill(PASSWORD);
  await page.getByRole('button', { name: /^create account$/i }).click();
  // An info notice is a polite status message, not an alert (src/components/ui/alert.tsx).
  const notice = page.getByRole('status').filter({ hasText: /check your inbox/i });
  await notice.waitFor();
  seen.afterSignUp = { path: new URL(page.url()).pathname, notice: await notice.textContent() };
  await shot(page, `sign-up-${name}`);
  seen.meAfterSignUp = await page.evaluate(async () => (await fetch('/api/auth/me')).json());

  // The same password on the sign-in form, as the old client did by itself.
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel(/^e-?mail( address)?$/i).fill(email);
  await page.getByLabel(/^password$/i).fill(PASSWORD);
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await page.getByRole('alert').waitFor();
  seen.afterSignIn = { path: new URL(page.url()).pathname, alert: await page.getByRole('alert').textContent() };
  seen.meAfterSignIn = await page.evaluate(async () => (await fetch('/api/auth/me')).json());
  await shot(page, `sign-up-then-sign-in-${name}`);
  expect(problems).toEqual([]);
  await context.close();
  return seen;
}

describe('sign-up does not tell which addresses have accounts', () => {
  it('a known and a new address give the same screens, messages and signed-in state through sign-up and sign-in', async () => {
    const known = await signUpThenSignIn('backer@saltmarsh.example', 'known');
    const fresh = await signUpThenSignIn('new.grebe@example.org', 'new');
    expect(fresh).toEqual(known);
    expect(known.afterSignUp).toMatchObject({ path: '/sign-up' });
    expect(known.meAfterSignIn).toEqual({ account: null });
  });

  it('the link in the confirmation mail confirms the new address and signs in', async () => {
    let link: string | undefined;
    await expect
      .poll(
        async () => {
          const list = (await (await fetch(`${outboxUrl}/_fake/messages?to=new.grebe@example.org`)).json()) as {
            data: { subject: string; html?: string }[];
          };
          const mail = list.data.find((m) => /confirm/i.test(m.subject));
          link = /href="([^"]*\/verify-email\?token=[\w-]+)"/.exec(mail?.html ?? '')?.[1];
          return Boolean(link);
        },
        { timeout: 20_000 },
      )
      .toBe(true);
    const { page, context, problems } = await newPage(browser, { width: 390, height: 844 });
    await page.goto(link!.replace(/&amp;/g, '&'));
    await page
      .getByText(/you are signed in/i)
      .first()
      .waitFor();
    await shot(page, 'sign-up-confirmed');
    const me = (await page.evaluate(async () => (await fetch('/api/auth/me')).json())) as {
      account: { email: string; emailVerified: boolean };
    };
    expect(me.account).toMatchObject({ email: 'new.grebe@example.org', emailVerified: true });
    // The password works from now on.
    expect(problems).toEqual([]);
    await context.close();
  });
});
