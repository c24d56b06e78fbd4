import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { Strategy as GoogleStrategy, type Profile } from 'passport-google-oauth20';
import type { Config } from '../../config';
import type { AuthService } from './auth.service';

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
