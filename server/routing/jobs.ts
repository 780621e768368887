import type PgBoss from 'pg-boss';
import { queues } from '../jobs';
import { requestContext } from '../lib/logger';
import type { ServiceContext } from '../lib/context';
import { expireOffer, expireOverdueOffers } from './dispatch';

/** Registers the offer-deadline handlers with a started queue (server and `npm run worker`). */
export async function registerRoutingJobs(ctx: ServiceContext, boss: PgBoss): Promise<void> {
  await boss.work<{ offerId: string; requestId?: string | null }>(queues.offerExpire, async (jobs) => {
    for (const job of jobs) {
      await requestContext.run({ requestId: job.data.requestId ?? `job-${job.id}` }, () => expireOffer(ctx, job.data.offerId, new Date()));
    }
  });
  await boss.work(queues.offerSweep, async () => {
    await expireOverdueOffers(ctx, new Date());
  });
  // A missed or lost deadline job still expires within a minute.
  await boss.schedule(queues.offerSweep, '* * * * *');
}
