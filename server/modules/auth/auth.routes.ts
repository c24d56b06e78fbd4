import type { JobSender } from '../../jobs/queue';
import { Router, type Request, type Response, type NextFunction } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { PassportStatic } from 'passport';
type Authenticator = InstanceType<PassportStatic['Passport']>;
import type { Config } from '../../config';
import type { Db } from '../../db/client';
import { PgRateLimitStore } from './rate-limit-store';
import { createSignInThrottle } from './sign-in-throttle';
import { stateMismatch } from './oauth-state-store';
import type { AuthService } from './auth.service';
import { invalidCredentials } from './auth.service';
import { validated } from '../../middleware/validate';
import { requireAuth } from '../../middleware/auth';
import { AppError } from '../../errors';
import { DATABASE_RETRY_AFTER_SECONDS } from '../../db/errors';
import { textProblem } from '../../../shared/schemas/text';
import {
  signInSchema,
  signUpSchema,
  requestPasswordResetSchema,
  resetPasswordSchema,
  verifyEmailSchema,
} from '../../../shared/schemas/auth';

function tooMany(message: string) {
  return (req: Request, res: Response, next: NextFunction) => {
    const reset = (req as Request & { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime;
    const seconds = reset ? Math.max(1, Math.ceil((reset.getTime() - Date.now()) / 1000)) : 60;
    next(new AppError(429, 'auth.rate_limited', message, undefined, { 'Retry-After': String(seconds) }));
  };
}

/** POST /sign-up's one answer, for a new address and a known one alike. */
export const SIGN_UP_ANSWER = {
  status: 'check-your-inbox',
  message: 'If this address can be used, we have sent a message to it. Follow the link in it to confirm your address.',
} as const;

/** Only same-site paths of plain text may be a return target. */
export function safeReturnTo(value: unknown) {
  return typeof value === 'string' &&
    value.startsWith('/') &&
    !value.startsWith('//') &&
    !value.includes('\\') &&
    textProblem(value) === null
    ? value
    : '/';
}

function sessionStoreUnavailable(cause: unknown) {
  const err = new AppError(
    503,
    'service_unavailable',
    'Lightkeel cannot keep your session right now, so forms cannot be sent. Try again in a moment.',
    undefined,
    { 'Retry-After': String(DATABASE_RETRY_AFTER_SECONDS) },
  );
  (err as Error & { cause?: unknown }).cause = cause;
  return err;
}

export function createAuthRouter({
  db,
  auth,
  pp,
  config,
  generateCsrfToken,
  jobs,
}: {
  db: Db;
  auth: AuthService;
  pp: Authenticator;
  config: Config;
  generateCsrfToken: (req: Request, overwrite?: boolean) => string;
  /** Enqueues the password-reset lookup; without it (a bare test app) the lookup runs in the request. */
  jobs?: JobSender;
}) {
  const router = Router();
  const windowMs = config.SIGN_IN_WINDOW_SECONDS * 1000;
  // One budget per action and address, so failing sign-ins never block sign-up or a reset request.
  const perAddress = (action: string, limit: number, message: string) =>
    rateLimit({
      windowMs,
      store: new PgRateLimitStore(db, `${action}:ip:`),
      limit,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      // Without TRUST_PROXY the header is the client's own claim and is rightly ignored.
      validate: { xForwardedForHeader: false },
      handler: tooMany(message),
    });
  const signUpLimit = perAddress(
    'signup',
    config.SIGN_UP_LIMIT_PER_IP,
    'Too many new accounts from this network. Wait a little and try again.',
  );
  const resetRequestLimit = perAddress(
    'reset',
    config.PASSWORD_RESET_LIMIT_PER_IP,
    'Too many reset requests from this network. Wait a little and try again.',
  );
  const signInThrottle = createSignInThrottle({
    db,
    windowSeconds: config.SIGN_IN_WINDOW_SECONDS,
    perAddress: config.SIGN_IN_LIMIT_PER_IP,
    freeFailures: config.SIGN_IN_LIMIT_PER_ACCOUNT,
    firstDelaySeconds: config.SIGN_IN_FIRST_DELAY_SECONDS,
    maxDelaySeconds: config.SIGN_IN_MAX_DELAY_SECONDS,
  });

  // The token is only good once the session holding it is stored: save first, answer after. A session
  // store that is down must not hand out a token every later request would refuse.
  router.get('/csrf', (req, res, next) => {
    const csrfToken = generateCsrfToken(req);
    req.session.save((err) => {
      if (err) return next(sessionStoreUnavailable(err));
      res.set('Cache-Control', 'no-store').json({ csrfToken });
    });
  });

  router.get('/providers', (_req, res) => {
    res.json({ google: Boolean(config.GOOGLE_CLIENT_ID && config.GOOGLE_CLIENT_SECRET) });
  });

  // Signed out is an answer here, not an error: a 401 would show as a failed request in every visitor's console.
  router.get('/me', (req, res) => {
    res.json({ account: req.user ?? null });
  });

  router.post(
    '/sign-up',
    signUpLimit,
    validated({ body: signUpSchema }, async (_req, res, { body }) => {
      // The same answer for a new address and for one that has an account (its owner gets a notice by mail):
      // sign-up must not tell which addresses have accounts. Nobody is signed in here: a new account signs in through
      // the link in its confirmation mail, and a password sign-in refuses it until then in the words a wrong password
      // gets, so trying the same password next cannot tell either.
      await auth.signUp(body);
      res.status(202).json(SIGN_UP_ANSWER);
    }),
  );

  router.post(
    '/sign-in',
    validated({ body: signInSchema }, async (req, res, { body }, next) => {
      // req.ip is the socket address, or the proxy's X-Forwarded-For entry when TRUST_PROXY=true; an IPv6
      // address counts by its /56 network (one household or host gets many addresses).
      const attempt = await signInThrottle.begin({ email: body.email, address: ipKeyGenerator(req.ip ?? 'unknown') });
      pp.authenticate('local', (err: unknown, user: Express.User | false) => {
        if (err) return next(err);
        if (!user) return void attempt.failed().then(() => next(invalidCredentials()), next);
        void attempt.succeeded().then(
          () =>
            req.logIn(user, (loginErr) => {
              if (loginErr) return next(loginErr);
              res.json({ account: user });
            }),
          next,
        );
      })(req, res, next);
    }),
  );

  router.post('/sign-out', (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err);
      req.session.destroy((destroyErr) => {
        if (destroyErr) return next(destroyErr);
        res.clearCookie('lk.sid');
        res.status(204).end();
      });
    });
  });

  router.get('/google', (req, res, next) => {
    req.session.returnTo = safeReturnTo(req.query.returnTo);
    pp.authenticate('google', { scope: ['openid', 'email', 'profile'] })(req, res, next);
  });

  router.get('/google/callback', (req, res, next) => {
    pp.authenticate('google', (err: unknown, user: Express.User | false, info?: { code?: string }) => {
      if (err) {
        const code = err instanceof AppError ? err.code : 'auth.provider_failed';
        return res.redirect(`/sign-in?error=${encodeURIComponent(code)}`);
      }
      if (!user) {
        const code = info?.code === stateMismatch.code ? stateMismatch.code : 'auth.provider_failed';
        return res.redirect(`/sign-in?error=${code}`);
      }
      const returnTo = safeReturnTo(req.session.returnTo);
      req.logIn(user, (loginErr) => {
        if (loginErr) return next(loginErr);
        res.redirect(returnTo);
      });
    })(req, res, next);
  });

  // The confirmation link: proves the mailbox, so it signs the account in (a new session, as a sign-in makes).
  router.post(
    '/verify-email',
    validated({ body: verifyEmailSchema }, async (req, res, { body }, next) => {
      const row = await auth.verifyEmail(body.token);
      const account = await auth.repo.view(row);
      req.logIn(account, (err) => {
        if (err) return next(err);
        res.json({ account });
      });
    }),
  );

  router.post('/resend-verification', requireAuth, async (req, res) => {
    const user = req.user!;
    if (!user.emailVerified) await auth.sendVerification(user);
    res.status(202).json({ status: 'sent' });
  });

  router.post(
    '/request-password-reset',
    resetRequestLimit,
    validated({ body: requestPasswordResetSchema }, async (req, res, { body }) => {
      // Same answer, in the same time, whether or not the account exists: the route only enqueues (one insert
      // either way); the account-mail job looks the address up and queues the message after we answered.
      if (jobs) await jobs.send('account-mail', { kind: 'password-reset', email: body.email });
      else await auth.requestPasswordReset(body.email).catch((err) => req.log?.warn({ err }, 'password reset mail failed'));
      res.status(202).json({ status: 'sent' });
    }),
  );

  router.post(
    '/reset-password',
    validated({ body: resetPasswordSchema }, async (req, res, { body }) => {
      await auth.resetPassword(body.token, body.password, { keepSessionId: req.sessionID });
      res.status(204).end();
    }),
  );

  return router;
}
