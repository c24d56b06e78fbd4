import { z } from 'zod';
import { defineQueue, type JobContext } from './queue';
import {
  createIngestService,
  ELEMENT_SET_INGEST_FAILED_QUEUE,
  ELEMENT_SET_INGEST_QUEUE,
  INGEST_RETRY_LIMIT,
  type IngestService,
} from '../modules/orbit/ingest.service';

const payload = z.object({
  uploadId: z.uuid(),
  step: z.enum(['preview', 'import']),
  accountId: z.uuid().nullable(),
});

// One service per worker process: it keeps what a preview parsed for the import that follows.
const services = new WeakMap<JobContext, IngestService>();
function ingestFor(ctx: JobContext) {
  let s = services.get(ctx);
  if (!s) {
    s = createIngestService({ db: ctx.db, logger: ctx.logger, expireInSeconds: ctx.config.INGEST_JOB_EXPIRE_SECONDS });
    services.set(ctx, s);
  }
  return s;
}

/**
 * Previews (parse, derive, count what is stored) or imports (one transaction, COPY in chunks, progress rows) one
 * element-set upload. The upload row's status is the idempotency key: a step already done is skipped, and an import
 * marks its row imported in the transaction that stores the sets. A job lost with its worker is handed out again
 * after its expiry (set per job from INGEST_JOB_EXPIRE_SECONDS); after the last attempt it goes to the queue below.
 */
export const elementSetIngestQueue = defineQueue({
  name: ELEMENT_SET_INGEST_QUEUE,
  schema: payload,
  options: {
    retryLimit: INGEST_RETRY_LIMIT,
    retryDelay: 1,
    retryBackoff: true,
    expireInSeconds: 900,
    deadLetter: ELEMENT_SET_INGEST_FAILED_QUEUE,
  },
  // Woken at once by the sender's NOTIFY; the poll is the fallback.
  work: { pollingIntervalSeconds: 2, concurrency: 1 },
  handler: async (step, { ctx }) => ingestFor(ctx).runStep(step),
});

/** Steps that failed every attempt: the upload is marked failed (nothing was stored) and its held text released. */
export const elementSetIngestFailedQueue = defineQueue({
  name: ELEMENT_SET_INGEST_FAILED_QUEUE,
  schema: payload,
  options: { retryLimit: 5, retryDelay: 10 },
  work: { pollingIntervalSeconds: 5 },
  handler: async (step, { ctx }) => ingestFor(ctx).markFailed(step),
});
