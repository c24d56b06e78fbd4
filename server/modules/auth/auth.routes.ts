import { Router, type Request, type Response, type NextFunction } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { PassportStatic } from 'passport';
type Authenticator = InstanceType<PassportStatic['Passport']>;
import type { Config } from '../../config';
import type { Db } from '../../db/client';
import { PgRateLimitStore } from './rate-limit-store';
import { stateMismatch } from './oauth-state-store';
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
export function safeReturnTo(value: unknown) {
  return typeof value === 'string' && value.startsWith('/') && !value.startsWith('//') && !value.includes('\\') ? value : '/';
}

export function createAuthRouter({
  db,
  auth,
  pp,
  config,
  generateCsrfToken,
}: {
  db: Db;
  auth: AuthService;
  pp: Authenticator;
  config: Config;
  generateCsrfToken: (req: Request, overwrite?: boolean) => string;
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

  // Signed out is an answer here, not an error: a 401 would show as a failed request in every visitor's console.
  router.get('/me', (req, res) => {
    res.json({ account: req.user ?? null });
  });

  router.post(
    '/sign-up',
    perIp,
    validated({ body: signUpSchema }, async (req, res, { body }) => {
      const row = await auth.signUp(body);
      const account = await auth.repo.view(row);
      await new Promise<void>((resolve, reject) => req.logIn(account, (err) => (err ? reject(err) : resolve())));
      res.status(201).json({ account });
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
      // Same answer whether or not the account exists.
      await auth.requestPasswordReset(body.email).catch((err) => req.log?.warn({ err }, 'password reset mail failed'));
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
