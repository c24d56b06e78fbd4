import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { Strategy as GoogleStrategy, type Profile } from 'passport-google-oauth20';
import type { Config } from '../../config';
import type { AuthService } from './auth.service';
import { SessionOAuthStateStore } from './oauth-state-store';
import type { StateStore } from 'passport-oauth2';

/** One Authenticator per app instance, so tests can build several apps in one process. */
export function createPassport({ config, auth }: { config: Config; auth: AuthService }) {
  const pp = new passport.Passport();

  pp.serializeUser<string>((user, done) => done(null, user.id));
  pp.deserializeUser<string>((id, done) => {
    auth.repo
      .findById(id)
      .then(async (row) => done(null, row ? await auth.repo.view(row) : false))
      .catch(done);
  });

  pp.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: true }, (email, password, done) => {
      auth
        .verifyPassword(email, password)
        .then(async (row) => done(null, row ? await auth.repo.view(row) : false))
        .catch(done);
    }),
  );

  const base = config.GOOGLE_OAUTH_BASE_URL.replace(/\/$/, '');
  pp.use(
    new GoogleStrategy(
      {
        clientID: config.GOOGLE_CLIENT_ID,
        clientSecret: config.GOOGLE_CLIENT_SECRET,
        callbackURL: `${config.PUBLIC_URL}/api/auth/google/callback`,
        ...(base ? { authorizationURL: `${base}/authorize`, tokenURL: `${base}/token`, userProfileURL: `${base}/userinfo` } : {}),
        scope: ['openid', 'email', 'profile'],
        // Login CSRF: the callback must carry the state this browser's session holds, and the code is only
        // good with this flow's PKCE verifier (S256).
        state: true,
        pkce: true,
        // The PKCE store signature (req, verifier, state, meta, cb) is missing from @types/passport-oauth2.
        store: new SessionOAuthStateStore() as unknown as StateStore,
      },
      (_accessToken: string, _refreshToken: string, profile: Profile, done: (err: unknown, user?: Express.User | false) => void) => {
        const json = profile._json as { email?: string; email_verified?: boolean | string };
        const email = profile.emails?.[0]?.value ?? json.email;
        const verified = json.email_verified === true || json.email_verified === 'true';
        auth
          .signInWithProvider('google', { subject: profile.id, email, emailVerified: verified, displayName: profile.displayName })
          .then(async (row) => done(null, await auth.repo.view(row)))
          .catch((err) => done(err));
      },
    ),
  );
  return pp;
}
