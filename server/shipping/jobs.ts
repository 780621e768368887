import type PgBoss from 'pg-boss';
import { queues } from '../jobs';
import { reportError } from '../lib/errors';
import { logger, requestContext } from '../lib/logger';
import type { ServiceContext } from '../lib/context';
import { ensureWebhookRegistered, markOverdueShipments, reconcileShipments } from './tracking';

/** The reconcile and overdue jobs, and our webhook URL at the shipping service (server and `npm run worker`). */
export async function registerShippingJobs(ctx: ServiceContext, boss: PgBoss): Promise<void> {
  await boss.work(queues.shippingReconcile, async (jobs) => {
    for (const job of jobs) {
      await requestContext.run({ requestId: `job-${job.id}` }, async () => {
        const result = await reconcileShipments(ctx);
        if (result.changed || result.settled) logger.info(result, 'shipping reconcile');
      });
    }
  });
  await boss.work(queues.shippingOverdue, async (jobs) => {
    for (const job of jobs) {
      await requestContext.run({ requestId: `job-${job.id}` }, async () => {
        const marked = await markOverdueShipments(ctx);
        if (marked) logger.info({ marked }, 'boxes marked overdue');
      });
    }
  });
  // Boxes on their way are read every five minutes; overdue boxes are marked once a day (06:00 UTC).
  await boss.schedule(queues.shippingReconcile, '*/5 * * * *');
  await boss.schedule(queues.shippingOverdue, '0 6 * * *');
  // The shipping service may be starting at the same moment; a failure here is retried by the next start
  // and covered meanwhile by the reconcile job (and by the stack's configured webhook URL).
  const register = (attempt: number) =>
    ensureWebhookRegistered(ctx)
      .then((outcome) => outcome !== 'not_configured' && logger.info({ outcome }, 'shipping webhook'))
      .catch((err: Error) => {
        if (attempt >= 5) return reportError(err, { worker: 'shipping-webhook-registration' });
        setTimeout(() => void register(attempt + 1), 2000 * attempt).unref();
      });
  void register(1);
}
