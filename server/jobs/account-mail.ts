import { z } from 'zod';
import { createAuthService } from '../modules/auth/auth.service';
import { defineQueue } from './queue';

/**
 * Account mail that must not change how the request answers: the route enqueues (the same work whether or not
 * the address has an account) and answers; this job looks the address up and queues the message, if any.
 */
export const accountMailQueue = defineQueue({
  name: 'account-mail',
  schema: z.object({ kind: z.literal('password-reset'), email: z.string().min(1).max(320) }),
  options: { retryLimit: 5, retryDelay: 10, retryBackoff: true, expireInSeconds: 300 },
  work: { pollingIntervalSeconds: 1 },
  handler: async ({ email }, { ctx }) => {
    await createAuthService({ db: ctx.db, config: ctx.config }).requestPasswordReset(email);
  },
});
