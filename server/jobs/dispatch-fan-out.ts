import { z } from 'zod';
import { defineQueue } from './queue';
import { DISPATCH_FAN_OUT_QUEUE } from '../modules/dispatches/dispatches.service';
import { createDispatchSending } from '../modules/dispatches/dispatch-sending';

/** Resolves a published dispatch's audience now and fills the mail queue in committed chunks (idempotent). */
export const dispatchFanOutQueue = defineQueue({
  name: DISPATCH_FAN_OUT_QUEUE,
  schema: z.object({ dispatchId: z.uuid() }),
  options: { retryLimit: 5, retryDelay: 5, retryBackoff: true, expireInSeconds: 300 },
  work: { pollingIntervalSeconds: 1 },
  handler: async ({ dispatchId }, { ctx }) => createDispatchSending(ctx).fanOut(dispatchId),
});
