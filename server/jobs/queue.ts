import PgBoss from 'pg-boss';
import type { Config } from '../config';
import { reportError } from '../lib/errors';

// The job queue: pg-boss on the same PostgreSQL, in its own `pgboss` schema (pg-boss creates and
// migrates it on start). Delayed work (an offer that nobody answers by its deadline) is scheduled here.

export const QUEUE_SCHEMA = 'pgboss';

export const queues = {
  /** { offerId }: expire one offer at its deadline, if it is still pending then. */
  offerExpire: 'offer-expire',
  /** Every minute: expire whatever pending offer is past its deadline (a backstop for lost jobs). */
  offerSweep: 'offer-sweep',
  /** Every few minutes: read the trackers of boxes on the way, for events a webhook never delivered. */
  shippingReconcile: 'shipping-reconcile',
  /** Daily: mark boxes whose expected delivery date has passed as overdue. */
  shippingOverdue: 'shipping-overdue',
  /** On the 1st of the month: settle the month that just ended (commission and lab shares, transfers). */
  settlementMonthly: 'settlement-monthly',
  /** { statementId }: try a failed payout again once its back-off has passed. */
  payoutRetry: 'payout-retry',
  /** Every few minutes: retry due payouts whose retry job was lost, and finish payouts a crash left open. */
  payoutSweep: 'payout-sweep',
} as const;
export type QueueName = (typeof queues)[keyof typeof queues];
export const queueNames: readonly QueueName[] = Object.values(queues);

// 'short': at most one waiting job per singleton key, so an offer has one expiry job however often it
// is relayed.
const queuePolicies: Record<QueueName, PgBoss.QueuePolicy> = {
  'offer-expire': 'short',
  'offer-sweep': 'short',
  'shipping-reconcile': 'short',
  'shipping-overdue': 'short',
  'settlement-monthly': 'short',
  'payout-retry': 'short',
  'payout-sweep': 'short',
};

/** Starts pg-boss (creating or migrating its schema) and makes sure every queue exists. */
export async function startQueue(config: Config, options: { applicationName?: string } = {}): Promise<PgBoss> {
  const boss = new PgBoss({
    connectionString: config.databaseUrl,
    schema: QUEUE_SCHEMA,
    application_name: options.applicationName ?? 'platterpost-jobs',
    max: 4,
  });
  boss.on('error', (err) => reportError(err, { worker: 'pg-boss' }));
  await boss.start();
  for (const name of queueNames) await boss.createQueue(name, { name, policy: queuePolicies[name] });
  return boss;
}
