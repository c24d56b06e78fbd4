import { z } from 'zod';
import type Stripe from 'stripe';
import { defineQueue, type JobContext } from './queue';
import { createStripeFromConfig } from '../deps';
import { createProcessor } from '../modules/payments/processor';
import { createReconciliationService, RECONCILE_GAVE_UP_QUEUE, RECONCILE_QUEUE } from '../modules/books/reconciliation.service';

const RETRY_LIMIT = 3;
const payload = z.object({ runId: z.uuid() });

function serviceFor(ctx: JobContext) {
  const stripe = (ctx.deps.stripe as Stripe | undefined) ?? createStripeFromConfig(ctx.config);
  return createReconciliationService({ db: ctx.db, processor: createProcessor({ db: ctx.db, stripe }) });
}

/**
 * One reconciliation run (the row written with this job by reconciliation.service start()). A worker that dies
 * mid-run leaves the job active until RECON_JOB_EXPIRE_SECONDS, then pg-boss hands it out again: the retry keeps
 * the days already fetched and writes the findings from scratch. When the retries are used up the job goes to
 * the gave-up queue, which marks the run failed so the days are free for a new run.
 */
export const booksReconcileQueue = defineQueue({
  name: RECONCILE_QUEUE,
  schema: payload,
  options: (config) => ({
    retryLimit: RETRY_LIMIT,
    retryDelay: 5,
    retryBackoff: true,
    expireInSeconds: config.RECON_JOB_EXPIRE_SECONDS,
    deadLetter: RECONCILE_GAVE_UP_QUEUE,
  }),
  work: { pollingIntervalSeconds: 1 },
  handler: async ({ runId }, { ctx, retryCount }) => {
    const summary = await serviceFor(ctx).execute(runId, { finalAttempt: retryCount >= RETRY_LIMIT });
    return { runId, fetched: summary?.fetched ?? null };
  },
});

export const booksReconcileGaveUpQueue = defineQueue({
  name: RECONCILE_GAVE_UP_QUEUE,
  schema: payload,
  options: { retryLimit: 5, retryDelay: 5, expireInSeconds: 60 },
  work: { pollingIntervalSeconds: 2 },
  handler: async ({ runId }, { ctx }) => serviceFor(ctx).giveUp(runId),
});
