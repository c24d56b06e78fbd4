import type { JobSender } from '../../jobs/queue';
import { Router, type Request, type Response, type NextFunction } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { PassportStatic } from 'passport';
type Authenticator = InstanceType<PassportStatic['Passport']>;
import type { Config } from '../../config';
import type { Db } from '../../db/client';
import { PgRateLimitStore } from './rate-limit-store';
import type { AuthService } from './auth.service';
import { invalidCredentials } from './auth.service';
import { validated } from '../../middleware/validate';
import { requireAuth } from '../../middleware/auth';
import { AppError } from '../../errors';
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

/** Only same-site paths may be a return target. */
/** POST /sign-up's one answer, for a new address and a known one alike. */
export const SIGN_UP_ANSWER = {
  status: 'check-your-inbox',
  message: 'If this address can be used, we have sent a message to it. Follow the link in it to confirm your address.',
} as const;

export function safeReturnTo(value: unknown) {
  return typeof value === 'string' && value.startsWith('/') && !value.startsWith('//') && !value.includes('\\') ? value : '/';
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
  const perIp = rateLimit({
    windowMs,
    store: new PgRateLimitStore(db, 'ip:'),
    limit: config.SIGN_IN_LIMIT_PER_IP,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: tooMany('Too many sign-in attempts from this network. Wait a little and try again.'),
  });
  // Failed attempts per account, whatever address they come from.
  const perAccount = rateLimit({
    windowMs,
    store: new PgRateLimitStore(db, 'account:'),
    limit: config.SIGN_IN_LIMIT_PER_ACCOUNT,
    skipSuccessfulRequests: true,
    standardHeaders: false,
    legacyHeaders: false,
    keyGenerator: (req) =>
      `acct:${String((req.body as { email?: unknown })?.email ?? '')
        .trim()
        .toLowerCase()}`,
    handler: tooMany('Too many failed sign-ins for this account. Wait a little and try again.'),
  });

  router.get('/csrf', (req, res) => {
    res.json({ csrfToken: generateCsrfToken(req) });
  });

  router.get('/providers', (_req, res) => {
    res.json({ google: Boolean(config.GOOGLE_CLIENT_ID && config.GOOGLE_CLIENT_SECRET) });
  });

  router.get('/me', requireAuth, (req, res) => {
    res.json({ account: req.user });
  });

  router.post(
    '/sign-up',
    perIp,
    validated({ body: signUpSchema }, async (_req, res, { body }) => {
      // The same answer for a new address and for one that has an account (its owner gets a notice by mail):
      // sign-up must not tell which addresses have accounts. The client signs in next with the same password.
      await auth.signUp(body);
      res.status(202).json(SIGN_UP_ANSWER);
    }),
  );

  router.post(
    '/sign-in',
    perIp,
    perAccount,
    validated({ body: signInSchema }, (req, res, _input, next) => {
      pp.authenticate('local', (err: unknown, user: Express.User | false) => {
        if (err) return next(err);
        if (!user) return next(invalidCredentials());
        req.logIn(user, (loginErr) => {
          if (loginErr) return next(loginErr);
          res.json({ account: user });
        });
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
    pp.authenticate('google', (err: unknown, user: Express.User | false) => {
      if (err) {
        const code = err instanceof AppError ? err.code : 'auth.provider_failed';
        return res.redirect(`/sign-in?error=${encodeURIComponent(code)}`);
      }
      if (!user) return res.redirect('/sign-in?error=auth.provider_failed');
      const returnTo = safeReturnTo(req.session.returnTo);
      req.logIn(user, (loginErr) => {
        if (loginErr) return next(loginErr);
        res.redirect(returnTo);
      });
    })(req, res, next);
  });

  router.post(
    '/verify-email',
    validated({ body: verifyEmailSchema }, async (_req, res, { body }) => {
      await auth.verifyEmail(body.token);
      res.status(204).end();
    }),
  );

  router.post('/resend-verification', requireAuth, async (req, res) => {
    const user = req.user!;
    if (!user.emailVerified) await auth.sendVerification(user);
    res.status(202).json({ status: 'sent' });
  });

  router.post(
    '/request-password-reset',
    perIp,
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
    validated({ body: resetPasswordSchema }, async (_req, res, { body }) => {
      await auth.resetPassword(body.token, body.password);
      res.status(204).end();
    }),
  );

  return router;
}
