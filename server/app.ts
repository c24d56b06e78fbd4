import express, { type Express, type RequestHandler } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import helmet from 'helmet';
import { pinoHttp } from 'pino-http';
import pino, { type Logger } from 'pino';
import { csrfSync } from 'csrf-sync';
import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { withPageMeta } from './lib/page-meta';
import { createMissionPageRenderer } from './lib/mission-page';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type pg from 'pg';
import type Stripe from 'stripe';
import type { Db } from './db/client';
import type { Config } from './config';
import type { Mailer } from './lib/mailer';
import type { JobSender } from './jobs/queue';
import { mount } from './lib/routes';
import { errorHandler, notFoundApi } from './middleware/error-handler';
import { sessionWhenNeeded } from './middleware/session-when-needed';
import { throttleTouch } from './middleware/session-touch';
import { createAuthService } from './modules/auth/auth.service';
import { createPassport } from './modules/auth/passport';
import { createAuthRouter } from './modules/auth/auth.routes';
import { createAccountRouter, createAdminRouter } from './modules/accounts/accounts.routes';
import { createHealthRouter } from './modules/health/health.routes';
import { createOrbitModule, createOrbitRouter, createPublicOrbitRouter, createPublicSnapshotsRouter } from './modules/orbit/orbit.routes';
import { createFunding } from './composition/funding';
import { createOpenDataRouter } from './modules/open-data/open-data.routes';
import { createLocalDiskStorage, type FileStorage } from './lib/storage';
import { createDispatchesService } from './modules/dispatches/dispatches.service';
import { createDispatchSending } from './modules/dispatches/dispatch-sending';
import { createDispatchesRouter } from './modules/dispatches/dispatches.routes';
import { createFilesRouter, createPublicDispatchesRouter } from './modules/dispatches/public-dispatches.routes';
import { createEmailChoicesRouter } from './modules/my-support/email-choices.routes';
import { createPlacesRouter } from './modules/places/places.routes';
import { createPlacesService } from './modules/places/places.service';
import { createMailQueueRouter } from './modules/mail/mail.routes';

export type AppDeps = {
  db: Db;
  pool: pg.Pool;
  config: Config;
  /** Unused by the routes since every message goes through the mail queue; kept for callers that pass it. */
  mailer?: Mailer;
  stripe: Stripe;
  logger?: Logger;
  /** Puts background work on a queue (server/jobs); workers may run in other processes. */
  jobs?: JobSender;
  /** Where uploaded and generated files live (default: local disk under UPLOADS_DIR). */
  storage?: FileStorage;
  /** Built client to serve (dist/); omitted in API tests. */
  clientDir?: string;
};

// Paths whose POSTs are authenticated by a signature instead of a session (no CSRF token).
// The e-mail-choice links carry a signed token instead (RFC 8058 one-click POSTs come from mail clients).
const CSRF_EXEMPT = new Set<string>(['/api/payments/webhook', '/api/email-choices/unsubscribe', '/api/email-choices/resubscribe']);

export function createApp(deps: AppDeps): Express {
  const { db, pool, config } = deps;
  const logger = deps.logger ?? pino({ level: config.LOG_LEVEL });
  const app = express();
  app.disable('x-powered-by');
  if (config.TRUST_PROXY) app.set('trust proxy', 1);

  app.use(
    pinoHttp({
      logger,
      autoLogging: config.LOG_LEVEL !== 'silent',
      // One short line per request: headers (cookies included) stay out of the logs.
      serializers: {
        req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url }),
        res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
      },
    }),
  );
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          'img-src': ["'self'", 'data:', 'blob:'],
          'frame-src': ["'self'"],
          'upgrade-insecure-requests': config.PUBLIC_URL.startsWith('https:') ? [] : null,
        },
      },
      hsts: config.PUBLIC_URL.startsWith('https:'),
    }),
  );

  // An https PUBLIC_URL means every request reached us through TLS (here or at the proxy in front), so the
  // session cookie is always Secure: it must not depend on whether a proxy header arrived.
  const httpsOnly = config.PUBLIC_URL.startsWith('https:');
  if (httpsOnly) Object.defineProperty(app.request, 'secure', { configurable: true, enumerable: true, get: () => true });

  const PgStore = connectPgSimple(session);
  // Sessions only where a request has or may start one (see sessionWhenNeeded): set up below with passport's.
  const sessionStack: RequestHandler[] = [
    session({
      name: 'lk.sid',
      secret: config.SESSION_SECRET,
      store: throttleTouch(
        new PgStore({
          pool,
          tableName: 'session',
          createTableIfMissing: false,
          pruneSessionInterval: config.NODE_ENV === 'test' ? false : 900,
        }),
      ),
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: {
        httpOnly: true,
        sameSite: 'lax',
        secure: httpsOnly,
        maxAge: 30 * 24 * 3600 * 1000,
      },
    }),
  ];

  const auth = createAuthService({ db, config });
  const pp = createPassport({ config, auth });
  app.use(pp.initialize());
  app.use(sessionWhenNeeded('lk.sid', [...sessionStack, pp.session()]));

  // Raw body routes (signed webhooks) go here, before the JSON parser.
  const funding = createFunding({ db, pool, config, stripe: deps.stripe, logger, jobs: deps.jobs });
  mount(app, '/api/payments', funding.webhookRouter);
  app.use('/api', express.json({ limit: config.JSON_BODY_LIMIT }));

  const { csrfSynchronisedProtection, generateToken } = csrfSync({
    getTokenFromRequest: (req) => req.headers['x-csrf-token'] as string | undefined,
  });
  app.use('/api', (req, res, next) =>
    CSRF_EXEMPT.has(req.originalUrl.split('?')[0]!) ? next() : csrfSynchronisedProtection(req, res, next),
  );

  mount(app, '/api/health', createHealthRouter({ db }));
  mount(app, '/api/auth', createAuthRouter({ db, auth, pp, config, generateCsrfToken: generateToken, jobs: deps.jobs }));
  mount(app, '/api/account', createAccountRouter({ db }));
  mount(app, '/api/admin/mail-queue', createMailQueueRouter({ db }));
  mount(app, '/api/admin', createAdminRouter({ db }));
  mount(app, '/api/campaigns', funding.campaignsRouter);
  mount(app, '/api/pledges', funding.pledgesRouter);
  mount(app, '/api/my-support/places', createPlacesRouter({ places: createPlacesService({ db }) }));
  mount(app, '/api/my-support', funding.mySupportRouter);
  mount(app, '/api/ledger', funding.ledgerRouter);
  mount(app, '/api/books', funding.booksRouter);
  mount(app, '/api/receipts', funding.receiptsRouter);
  mount(app, '/api/public/monthly-accounts', funding.publicAccountsRouter);

  const orbitDesk = createOrbitModule({ db, logger, jobs: deps.jobs, config });
  mount(app, '/api/orbit', createOrbitRouter({ db, config, module: orbitDesk }));
  mount(app, '/api/public/orbit', createOpenDataRouter({ pool }));
  mount(app, '/api/public/orbit', createPublicOrbitRouter({ module: orbitDesk }));
  mount(app, '/api/public/snapshots', createPublicSnapshotsRouter({ module: orbitDesk }));

  const storage = deps.storage ?? createLocalDiskStorage(config.UPLOADS_DIR);
  const dispatches = createDispatchesService({ db, pool, config, storage, jobs: deps.jobs });
  const sending = createDispatchSending({ db, pool, config });
  mount(app, '/api/dispatches', createDispatchesRouter({ dispatches, sending, heroLimitBytes: config.HERO_IMAGE_MAX_BYTES }));
  mount(app, '/api/public/dispatches', createPublicDispatchesRouter({ dispatches }));
  mount(app, '/api/files', createFilesRouter({ dispatches }));
  mount(app, '/api/email-choices', createEmailChoicesRouter({ db, config }));

  app.use('/api', notFoundApi);

  const clientDir = deps.clientDir;
  if (clientDir && existsSync(path.join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }));
    const indexFile = path.join(clientDir, 'index.html');
    const renderMissionPage = createMissionPageRenderer({
      logger,
      freshMs: config.CAMPAIGN_CACHE_MS,
      sources: {
        campaign: (slug) => funding.services.campaigns.view(slug),
        orbitSummary: () => orbitDesk.orbit.publicSummary(null),
        dispatchFeed: (req) => dispatches.feed(req.user ? { id: req.user.id, roles: req.user.roles } : null),
      },
    });
    void renderMissionPage.warm();
    app.get(['/', '/*rest'], async (req, res) => {
      let html = await readFile(indexFile, 'utf8');
      if (req.path === '/') html = (await renderMissionPage(req, html)) ?? html;
      res
        .type('html')
        // A signed-in visitor's mission page carries their own account and feed: no shared cache may keep it.
        .set('cache-control', req.user && req.path === '/' ? 'private, no-cache' : 'no-cache')
        .send(withPageMeta(html, req.path, config.PUBLIC_URL));
    });
  }

  app.use(errorHandler);
  return app;
}

export const defaultClientDir = fileURLToPath(new URL('../dist', import.meta.url));
