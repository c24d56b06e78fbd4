// Composition of the money modules: campaigns, pledges, the processor webhook, the ledger and my support are
// built here from the app's dependencies, so each module folder holds its own feature only, app.ts mounts the
// routers, and the services share one processor client and one campaign cache.
import type pg from 'pg';
import type Stripe from 'stripe';
import type { Logger } from 'pino';
import type { Db } from '../db/client';
import type { Config } from '../config';
import type { Mailer } from '../lib/mailer';
import type { JobSender } from '../jobs/queue';
import { createCampaignsService } from '../modules/campaigns/campaigns.service';
import { createCampaignsRouter } from '../modules/campaigns/campaigns.routes';
import { createProcessor } from '../modules/payments/processor';
import { createPaymentsService } from '../modules/payments/payments.service';
import { createPaymentsWebhookRouter } from '../modules/payments/payments.routes';
import { createPledgesService } from '../modules/pledges/pledges.service';
import { createPledgesRouter } from '../modules/pledges/pledges.routes';
import { createMySupportService } from '../modules/my-support/my-support.service';
import { createMySupportRouter } from '../modules/my-support/my-support.routes';
import { createLedgerRouter } from '../modules/ledger/ledger.routes';
import { createBooks } from '../modules/books/books.routes';

export function createFunding(deps: {
  db: Db;
  pool: pg.Pool;
  config: Config;
  mailer?: Mailer;
  stripe: Stripe;
  logger: Logger;
  jobs?: JobSender;
}) {
  const { db, pool, config, stripe, logger } = deps;
  const campaigns = createCampaignsService({ db, pool, cacheMs: config.CAMPAIGN_CACHE_MS });
  const processor = createProcessor({ db, stripe });
  const payments = createPaymentsService({ db, config, processor, campaigns, logger });
  const pledges = createPledgesService({ db, config, processor, campaigns, logger });
  const mySupport = createMySupportService({ db, config, processor, pledges });
  const books = createBooks({ db, pool, config, processor, logger, jobs: deps.jobs });
  return {
    services: { campaigns, payments, pledges, mySupport, books: books.services },
    booksRouter: books.router,
    receiptsRouter: books.receiptsRouter,
    publicAccountsRouter: books.publicRouter,
    webhookRouter: createPaymentsWebhookRouter({ payments, stripe, config }),
    campaignsRouter: createCampaignsRouter({ campaigns }),
    pledgesRouter: createPledgesRouter({ pledges }),
    mySupportRouter: createMySupportRouter({ mySupport }),
    ledgerRouter: createLedgerRouter({ db }),
  };
}
