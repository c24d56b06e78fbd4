import { z } from 'zod';
import { defineQueue } from './queue';
import { createLocalDiskStorage, type FileStorage } from '../lib/storage';
import { createDispatchesService, DISPATCH_PUBLISH_QUEUE } from '../modules/dispatches/dispatches.service';

/** A scheduled dispatch goes out: the job carries the time it was scheduled for (a reschedule makes it a no-op). */
export const dispatchPublishQueue = defineQueue({
  name: DISPATCH_PUBLISH_QUEUE,
  schema: z.object({ dispatchId: z.uuid(), publishAt: z.iso.datetime({ offset: true }) }),
  options: { retryLimit: 5, retryDelay: 10, retryBackoff: true, expireInSeconds: 120 },
  work: { pollingIntervalSeconds: 1 },
  handler: async ({ dispatchId, publishAt }, { ctx }) => {
    const { db, pool, config } = ctx;
    const storage = (ctx.deps.storage as FileStorage | undefined) ?? createLocalDiskStorage(config.UPLOADS_DIR);
    const service = createDispatchesService({ db, pool, config, storage, jobs: ctx.jobs });
    const d = await service.publish({ dispatchId, actorId: null, scheduledFor: publishAt });
    return { state: d.state };
  },
});
