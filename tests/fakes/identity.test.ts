import { createHash, randomBytes } from 'node:crypto';
import { Strategy as GoogleStrategy, type Profile as GoogleProfile } from 'passport-google-oauth20';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createIdentityFake, defaultProfile, googleEndpoints, type IdentityFake } from '../../fakes/identity/server';

const redirectUri = 'http://127.0.0.1:3999/api/auth/google/callback';

function decodeJwtPayload(jwt: string): Record<string, unknown> {
  const part = jwt.split('.')[1];
  if (!part) throw new Error('not a JWT');
  return JSON.parse(Buffer.from(part, 'base64url').toString('utf8')) as Record<string, unknown>;
}

/** A PKCE pair (RFC 7636 §4.1–4.2, S256): challenge = BASE64URL(SHA256(verifier)). */
function pkcePair() {
  const verifier = randomBytes(32).toString('base64url');
  return { verifier, challenge: createHash('sha256').update(verifier).digest('base64url') };
}

/** GET /authorize as a browser would; answers the redirect back to the app. */
async function authorize(fake: IdentityFake, params: Record<string, string>) {
  const url = new URL(googleEndpoints(fake.issuerUrl).authorizationURL);
  url.search = new URLSearchParams({
    response_type: 'code',
    client_id: 'lightkeel-local',
    redirect_uri: redirectUri,
    scope: 'openid profile email',
    ...params,
  }).toString();
  const redirect = await fetch(url, { redirect: 'manual' });
  expect(redirect.status).toBe(302);
  return new URL(redirect.headers.get('location') ?? '');
}

/** An authorization code issued for a fresh PKCE pair. */
async function issueCode(fake: IdentityFake, state = 'state-x') {
  const pair = pkcePair();
  const back = await authorize(fake, { state, code_challenge: pair.challenge, code_challenge_method: 'S256' });
  return { code: back.searchParams.get('code') ?? '', ...pair };
}

function exchange(fake: IdentityFake, params: Record<string, string>) {
  return fetch(googleEndpoints(fake.issuerUrl).tokenURL, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ grant_type: 'authorization_code', redirect_uri: redirectUri, client_id: 'lightkeel-local', ...params }),
  });
}

/** authorize → code → token → userinfo, the way passport-google-oauth20 drives it (state and PKCE S256). */
async function signInRoundTrip(fake: IdentityFake, state: string) {
  const ep = googleEndpoints(fake.issuerUrl);
  const pair = pkcePair();
  const back = await authorize(fake, { state, code_challenge: pair.challenge, code_challenge_method: 'S256' });
  expect(`${back.origin}${back.pathname}`).toBe(redirectUri);
  expect(back.searchParams.get('state')).toBe(state);
  const code = back.searchParams.get('code');
  expect(code).toBeTruthy();

  const tokenRes = await exchange(fake, { code: code ?? '', code_verifier: pair.verifier, client_secret: 'local-secret' });
  expect(tokenRes.status).toBe(200);
  const token = (await tokenRes.json()) as { access_token: string; id_token: string; token_type: string };
  expect(token.token_type).toBe('Bearer');

  const infoRes = await fetch(ep.userProfileURL, { headers: { authorization: `Bearer ${token.access_token}` } });
  expect(infoRes.status).toBe(200);
  return { token, profile: (await infoRes.json()) as Record<string, unknown> };
}

describe('identity fake (local Google sign-in)', () => {
  let fake: IdentityFake;
  beforeAll(async () => {
    fake = await createIdentityFake({ port: 0 });
  });
  afterAll(async () => {
    await fake.close();
  });

  it('listens on loopback and publishes endpoints the Google strategy accepts', () => {
    expect(fake.issuerUrl).toBe(`http://127.0.0.1:${fake.port}`);
    const ep = googleEndpoints(`${fake.issuerUrl}/`);
    expect(ep.userProfileURL.endsWith('/userinfo')).toBe(true);
    expect(ep.authorizationURL).toBe(`${fake.issuerUrl}/authorize`);
    expect(ep.tokenURL).toBe(`${fake.issuerUrl}/token`);
  });

  it('completes the authorization-code round trip and returns the demo backer profile', async () => {
    fake.setNextProfile({});
    const { token, profile } = await signInRoundTrip(fake, 'state-abc-123');
    expect(profile).toEqual(defaultProfile);
    expect(profile.email).toBe('wren.backer@example.org');
    expect(profile.sub).toBe('demo-google-1');

    const idToken = decodeJwtPayload(token.id_token);
    expect(idToken.sub).toBe('demo-google-1');
    expect(idToken.email).toBe('wren.backer@example.org');
    expect(idToken.email_verified).toBe(true);
    expect(idToken.aud).toBe('lightkeel-local');
    expect(idToken.iss).toBe(fake.issuerUrl);
  });

  it('serves the profile a test sets for the next sign-in, in userinfo and in the id_token', async () => {
    fake.setNextProfile({ sub: 'demo-google-2', email: 'piper.crew@example.org', name: 'Piper Lund', email_verified: false });
    const { token, profile } = await signInRoundTrip(fake, 's2');
    expect(profile.sub).toBe('demo-google-2');
    expect(profile.email).toBe('piper.crew@example.org');
    expect(profile.email_verified).toBe(false);
    expect(profile.name).toBe('Piper Lund');
    expect(decodeJwtPayload(token.id_token).sub).toBe('demo-google-2');
    fake.setNextProfile({});
  });

  it('keeps the profile bound to the code even if the next profile changes mid sign-in', async () => {
    fake.setNextProfile({ sub: 'first-person', email: 'first@example.org' });
    const ep = googleEndpoints(fake.issuerUrl);
    const { code, verifier } = await issueCode(fake);
    fake.setNextProfile({ sub: 'second-person', email: 'second@example.org' });
    const tokenRes = await exchange(fake, { code, code_verifier: verifier });
    const { access_token } = (await tokenRes.json()) as { access_token: string };
    const info = (await (await fetch(ep.userProfileURL, { headers: { authorization: `Bearer ${access_token}` } })).json()) as {
      sub: string;
    };
    expect(info.sub).toBe('first-person');
    fake.setNextProfile({});
  });

  it('changes the profile over HTTP through POST /_fake/profile and rejects bad fields', async () => {
    const set = await fetch(`${fake.issuerUrl}/_fake/profile`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ sub: 'http-set-1', email: 'http.set@example.org' }),
    });
    expect(set.status).toBe(200);
    const { profile } = await signInRoundTrip(fake, 's3');
    expect(profile.sub).toBe('http-set-1');
    expect(profile.email).toBe('http.set@example.org');
    expect(profile.given_name).toBe(defaultProfile.given_name);

    const bad = await fetch(`${fake.issuerUrl}/_fake/profile`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email_verified: 'yes' }),
    });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error_description: string }).error_description).toMatch(/email_verified/);
    fake.setNextProfile({});
  });

  it('accepts the access token as a query parameter, as passport-google-oauth20 sends it', async () => {
    const { token } = await signInRoundTrip(fake, 's5');
    const ep = googleEndpoints(fake.issuerUrl);
    const res = await fetch(`${ep.userProfileURL}?access_token=${encodeURIComponent(token.access_token)}`);
    expect(res.status).toBe(200);
    expect(((await res.json()) as { email: string }).email).toBe(defaultProfile.email);
  });

  it('gives passport-google-oauth20 a profile it parses into id, name, verified e-mail and photo', async () => {
    fake.setNextProfile({ sub: 'strategy-1', email: 'strategy@example.org', given_name: 'Ash', family_name: 'Morrow' });
    const strategy = new GoogleStrategy(
      { clientID: 'lightkeel-local', clientSecret: 'local-secret', callbackURL: redirectUri, ...googleEndpoints(fake.issuerUrl) },
      () => undefined,
    );
    const { code, verifier } = await issueCode(fake);
    // The strategy's own OAuth2 client and profile loader, as used inside passport.authenticate().
    const internals = strategy as unknown as {
      _oauth2: { getOAuthAccessToken(code: string, params: object, cb: (err: unknown, accessToken: string) => void): void };
      userProfile(accessToken: string, done: (err: unknown, profile?: GoogleProfile) => void): void;
    };
    const accessToken = await new Promise<string>((resolve, reject) =>
      internals._oauth2.getOAuthAccessToken(
        code,
        { grant_type: 'authorization_code', redirect_uri: redirectUri, code_verifier: verifier },
        (err, t) => (err ? reject(err) : resolve(t)),
      ),
    );
    const profile = await new Promise<GoogleProfile>((resolve, reject) =>
      internals.userProfile(accessToken, (err, p) => (err || !p ? reject(err) : resolve(p))),
    );
    expect(profile.id).toBe('strategy-1');
    expect(profile.name).toEqual({ givenName: 'Ash', familyName: 'Morrow' });
    expect(profile.emails?.[0]).toEqual({ value: 'strategy@example.org', verified: true });
    expect(profile.photos?.[0]?.value).toMatch(/^data:image\/svg\+xml/);
    fake.setNextProfile({});
  });

  it('refuses userinfo without a token it issued', async () => {
    const ep = googleEndpoints(fake.issuerUrl);
    expect((await fetch(ep.userProfileURL)).status).toBe(401);
    expect((await fetch(ep.userProfileURL, { headers: { authorization: 'Bearer made-up' } })).status).toBe(401);
    expect((await fetch(`${ep.userProfileURL}?access_token=made-up`)).status).toBe(401);
  });

  it('refuses an authorization request without state or without an S256 PKCE challenge', async () => {
    const { challenge } = pkcePair();
    const cases: [Record<string, string>, RegExp][] = [
      [{ code_challenge: challenge, code_challenge_method: 'S256' }, /state/],
      [{ state: 's' }, /code_challenge/],
      [{ state: 's', code_challenge: challenge, code_challenge_method: 'plain' }, /S256/],
      [{ state: 's', code_challenge: challenge }, /S256/],
    ];
    for (const [params, reason] of cases) {
      const back = await authorize(fake, params);
      expect(back.searchParams.get('code'), JSON.stringify(params)).toBeNull();
      expect(back.searchParams.get('error')).toBe('invalid_request');
      expect(back.searchParams.get('error_description')).toMatch(reason);
    }
  });

  it('refuses a token exchange whose code_verifier does not match the code_challenge', async () => {
    const { code } = await issueCode(fake);
    const res = await exchange(fake, { code, code_verifier: pkcePair().verifier });
    expect(res.status).toBe(400);
    expect(((await res.json()) as { error_description: string }).error_description).toMatch(/code_verifier.*code_challenge/);
  });

  it('refuses a token exchange without a code_verifier, and the code is then spent', async () => {
    const { code, verifier } = await issueCode(fake);
    const res = await exchange(fake, { code });
    expect(res.status).toBe(400);
    expect(await res.json()).toMatchObject({ error: 'invalid_grant', error_description: expect.stringMatching(/code_verifier/) });
    const retry = await exchange(fake, { code, code_verifier: verifier });
    expect(retry.status).toBe(400);
  });

  it('refuses a code it never issued, a code used twice, and a code sent to another redirect_uri', async () => {
    const made = await exchange(fake, { code: 'made-up-code', code_verifier: pkcePair().verifier });
    expect(made.status).toBe(400);

    const first = await issueCode(fake);
    expect((await exchange(fake, { code: first.code, code_verifier: first.verifier })).status).toBe(200);
    const twice = await exchange(fake, { code: first.code, code_verifier: first.verifier });
    expect(twice.status).toBe(400);

    const other = await issueCode(fake);
    const elsewhere = await exchange(fake, {
      code: other.code,
      code_verifier: other.verifier,
      redirect_uri: 'http://127.0.0.1:3999/somewhere-else',
    });
    expect(elsewhere.status).toBe(400);
    expect(((await elsewhere.json()) as { error_description: string }).error_description).toMatch(/redirect_uri/);
  });

  it('starts with the profile given in its options', async () => {
    const other = await createIdentityFake({ profile: { sub: 'opt-1', email: 'opt@example.org' } });
    try {
      const { profile } = await signInRoundTrip(other, 's4');
      expect(profile.sub).toBe('opt-1');
      expect(profile.email).toBe('opt@example.org');
    } finally {
      await other.close();
    }
  });
});
