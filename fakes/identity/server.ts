import { createHash } from 'node:crypto';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { OAuth2Issuer, OAuth2Service, type MutableRedirectUri, type MutableResponse, type MutableToken } from 'oauth2-mock-server';
import { closeServer, listenOnLoopback } from '../lib/loopback-server';

/** The userinfo shape of Google's OpenID Connect endpoint (what passport-google-oauth20 parses). */
export interface Profile {
  sub: string;
  name: string;
  given_name: string;
  family_name: string;
  email: string;
  email_verified: boolean;
  picture: string;
}

// A fictional demo backer; the picture is a data URL so nothing is fetched off this machine.
export const defaultProfile: Profile = {
  sub: 'demo-google-1',
  name: 'Wren Halloway',
  given_name: 'Wren',
  family_name: 'Halloway',
  email: 'wren.backer@example.org',
  email_verified: true,
  picture:
    'data:image/svg+xml;base64,' +
    Buffer.from(
      '<svg xmlns="http://www.w3.org/2000/svg" width="64" height="64"><rect width="64" height="64" fill="#0b1431"/><circle cx="32" cy="32" r="14" fill="#f5a21b"/></svg>',
    ).toString('base64'),
};

export interface IdentityFake {
  issuerUrl: string;
  port: number;
  close(): Promise<void>;
  /** Profile used for authorizations that start from now on (merged over the demo profile). */
  setNextProfile(profile: Partial<Profile>): void;
}

export interface IdentityFakeOptions {
  port?: number;
  profile?: Partial<Profile>;
}

/** Strategy options for passport-google-oauth20 pointed at an issuer (the fake, or Google's own). */
export function googleEndpoints(issuerUrl: string): { authorizationURL: string; tokenURL: string; userProfileURL: string } {
  const base = issuerUrl.replace(/\/+$/, '');
  return {
    authorizationURL: `${base}/authorize`,
    tokenURL: `${base}/token`,
    // The strategy only parses the OpenID profile format when this path ends in /userinfo.
    userProfileURL: `${base}/userinfo`,
  };
}

function checkProfile(input: unknown): Partial<Profile> {
  if (typeof input !== 'object' || input === null || Array.isArray(input)) {
    throw new Error('profile must be a JSON object');
  }
  const out: Partial<Profile> = {};
  for (const [key, value] of Object.entries(input)) {
    if (!(key in defaultProfile)) throw new Error(`unknown profile field "${key}"`);
    const expected = typeof defaultProfile[key as keyof Profile];
    if (typeof value !== expected) throw new Error(`profile field "${key}" must be a ${expected}`);
    (out as Record<string, unknown>)[key] = value;
  }
  return out;
}

interface Grant {
  profile: Profile;
  challenge: string;
  redirectUri: string;
  expiresAt: number;
}

// Authorization codes are short-lived (RFC 6749 §4.1.2 recommends at most 10 minutes).
const CODE_TTL_MS = 10 * 60_000;

function refuse(response: MutableResponse, error: string, description: string) {
  response.statusCode = 400;
  response.body = { error, error_description: description };
}

async function readJson(req: IncomingMessage): Promise<unknown> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of req) {
    size += (chunk as Buffer).length;
    if (size > 64 * 1024) throw new Error('body too large');
    chunks.push(chunk as Buffer);
  }
  return JSON.parse(Buffer.concat(chunks).toString('utf8') || '{}');
}

export async function createIdentityFake(opts: IdentityFakeOptions = {}): Promise<IdentityFake> {
  const issuer = new OAuth2Issuer();
  await issuer.keys.generate('RS256');
  const service = new OAuth2Service(issuer);

  let current: Profile = { ...defaultProfile, ...checkProfile(opts.profile ?? {}) };
  // A sign-in keeps the profile that was current when it started, even if a test changes it mid-flight.
  // Like the provider it stands in for, the fake asks for `state` and an S256 PKCE challenge at /authorize,
  // and gives tokens only for a code it issued, once, to the same redirect_uri, with the matching verifier.
  const byCode = new Map<string, Grant>();
  const byAccessToken = new Map<string, Profile>();

  service.on('beforeAuthorizeRedirect', (redirect: MutableRedirectUri, req: IncomingMessage) => {
    const code = redirect.url.searchParams.get('code');
    if (!code) return;
    const query = new URL(req.url ?? '/', 'http://127.0.0.1').searchParams;
    const problem = !query.get('state')
      ? 'state is required'
      : !query.get('code_challenge')
        ? 'code_challenge is required (PKCE)'
        : query.get('code_challenge_method') !== 'S256'
          ? 'code_challenge_method must be S256'
          : undefined;
    if (problem) {
      redirect.url.searchParams.delete('code');
      redirect.url.searchParams.set('error', 'invalid_request');
      redirect.url.searchParams.set('error_description', problem);
      return;
    }
    byCode.set(code, {
      profile: current,
      challenge: query.get('code_challenge')!,
      redirectUri: query.get('redirect_uri') ?? '',
      expiresAt: Date.now() + CODE_TTL_MS,
    });
  });
  const grantFor = (req: IncomingMessage & { body?: Record<string, unknown> }) => {
    const code = typeof req.body?.code === 'string' ? req.body.code : undefined;
    return code ? byCode.get(code) : undefined;
  };
  service.on('beforeTokenSigning', (token: MutableToken, req: IncomingMessage & { body?: Record<string, unknown> }) => {
    const p = grantFor(req)?.profile ?? current;
    Object.assign(token.payload, {
      sub: p.sub,
      email: p.email,
      email_verified: p.email_verified,
      name: p.name,
      given_name: p.given_name,
      family_name: p.family_name,
      picture: p.picture,
    });
  });
  service.on('beforeResponse', (response: MutableResponse, req: IncomingMessage & { body?: Record<string, unknown> }) => {
    const body = req.body ?? {};
    if (body.grant_type !== 'authorization_code') {
      refuse(response, 'unsupported_grant_type', 'only the authorization_code grant is offered');
      return;
    }
    const code = typeof body.code === 'string' ? body.code : '';
    const grant = byCode.get(code);
    byCode.delete(code); // a code is good for one exchange, whatever its outcome
    const verifier = typeof body.code_verifier === 'string' ? body.code_verifier : '';
    const problem = !grant
      ? 'unknown or already used authorization code'
      : grant.expiresAt < Date.now()
        ? 'authorization code expired'
        : body.redirect_uri !== grant.redirectUri
          ? 'redirect_uri differs from the one the code was issued for'
          : !verifier
            ? 'code_verifier is required (PKCE)'
            : createHash('sha256').update(verifier).digest('base64url') !== grant.challenge
              ? 'code_verifier does not match the code_challenge'
              : undefined;
    if (problem || !grant) {
      refuse(response, 'invalid_grant', problem ?? 'invalid grant');
      return;
    }
    const token = response.body;
    if (response.statusCode === 200 && typeof token === 'object' && typeof token.access_token === 'string') {
      byAccessToken.set(token.access_token, grant.profile);
    }
  });
  service.on('beforeUserinfo', (response: MutableResponse, req: IncomingMessage) => {
    const auth = req.headers.authorization ?? '';
    // passport-google-oauth20 sends the token as ?access_token= (node-oauth's default for GET); both work at Google.
    const token =
      /^Bearer\s+(\S+)$/i.exec(auth)?.[1] ?? new URL(req.url ?? '/', 'http://127.0.0.1').searchParams.get('access_token') ?? undefined;
    const p = token ? byAccessToken.get(token) : undefined;
    if (!p) {
      response.statusCode = 401;
      response.body = { error: 'invalid_token', error_description: 'Missing or unknown access token.' };
      return;
    }
    response.body = { ...p };
  });

  const handler = service.requestHandler;
  const server: Server = createServer((req: IncomingMessage, res: ServerResponse) => {
    const path = (req.url ?? '/').split('?')[0];
    if (path !== '/_fake/profile') return handler(req, res);
    const reply = (status: number, body: unknown) => {
      res.writeHead(status, { 'content-type': 'application/json' }).end(JSON.stringify(body));
    };
    if (req.method === 'GET') return reply(200, current);
    if (req.method !== 'POST') return reply(405, { error: 'method_not_allowed' });
    readJson(req)
      .then((body) => {
        current = { ...defaultProfile, ...checkProfile(body) };
        reply(200, current);
      })
      .catch((err: Error) => reply(400, { error: 'invalid_request', error_description: err.message }));
  });

  const port = await listenOnLoopback(server, opts.port ?? 0);
  issuer.url = `http://127.0.0.1:${port}`;

  return {
    issuerUrl: issuer.url,
    port,
    setNextProfile(profile) {
      current = { ...defaultProfile, ...checkProfile(profile) };
    },
    close: () => closeServer(server),
  };
}
