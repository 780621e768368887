import type PgBoss from 'pg-boss';
import { previousPeriod } from '@shared/domain/commission';
import { queues } from '../jobs';
import type { ServiceContext } from '../lib/context';
import { AppError } from '../lib/errors';
import { logger, requestContext } from '../lib/logger';
import { retryPayout, runSettlement, sweepPayouts } from './settlement';

/** Registers the settlement and payout jobs with a started queue (server and `npm run worker`). */
export async function registerPayoutJobs(ctx: ServiceContext, boss: PgBoss): Promise<void> {
  await boss.work<{ requestId?: string | null }>(queues.settlementMonthly, async (jobs) => {
    for (const job of jobs) {
      await requestContext.run({ requestId: job.data?.requestId ?? `job-${job.id}` }, async () => {
        const period = previousPeriod(new Date());
        try {
          const run = await runSettlement(ctx, { period, trigger: 'schedule' });
          logger.info({ period, runId: run.id, summary: run.summary }, 'monthly settlement finished');
        } catch (err) {
          // Someone is running it by hand right now: that run does the work.
          if (err instanceof AppError && err.code === 'settlement_running') logger.info({ period }, 'monthly settlement already running');
          else throw err;
        }
      });
    }
  });
  await boss.work<{ statementId: string; requestId?: string | null }>(queues.payoutRetry, async (jobs) => {
    for (const job of jobs) {
      await requestContext.run({ requestId: job.data.requestId ?? `job-${job.id}` }, () => retryPayout(ctx, job.data.statementId));
    }
  });
  await boss.work(queues.payoutSweep, async () => {
    await sweepPayouts(ctx);
  });
  // 06:00 UTC on the 1st: the month before has ended everywhere in the network's time zones.
  await boss.schedule(queues.settlementMonthly, '0 6 1 * *', {}, { tz: 'UTC' });
  await boss.schedule(queues.payoutSweep, '*/10 * * * *');
}
