import type { DataSource } from 'typeorm';
import type { Config } from './config';
import { reportError } from './lib/errors';
import { createMailTransport, dispatchOutbox } from './notifications';
import { startJobRelay, startQueue } from './jobs';
import { registerRoutingJobs } from './routing';
import { registerPayoutJobs } from './payouts';
import { registerShippingJobs } from './shipping';
import { dispatchWebhooks } from './webhooks';

/** Which loops to run; all by default. Tests pick the one they exercise. */
const MAIL_BATCH = 100;

export interface WorkerSelection {
  mail?: boolean;
  jobs?: boolean;
  webhooks?: boolean;
}

export interface Workers {
  stop(): Promise<void>;
}

/** Background work: the mail outbox and the job queue (offer deadlines); started with the server or by `npm run worker`. */
export async function startWorkers(
  { config, db }: { config: Config; db: DataSource },
  only: WorkerSelection = { mail: true, jobs: true, webhooks: true },
): Promise<Workers> {
  const transport = createMailTransport(config.smtp);
  let stopped = false;
  let running: Promise<unknown> = Promise.resolve();
  const tick = async () => {
    if (stopped || !only.mail) return;
    // A full batch means more may be waiting (a backlog after the mail server was down): go on at once.
    let busy = false;
    running = dispatchOutbox(db, transport, { from: config.mailFrom, batchSize: MAIL_BATCH })
      .then((sent) => (busy = sent >= MAIL_BATCH))
      .catch((err) => reportError(err, { worker: 'outbox' }))
      .finally(() => {
        if (!stopped) timer = setTimeout(tick, busy ? 0 : 500);
      });
  };
  let timer = setTimeout(tick, 100);
  // Partner webhooks: each delivery row is its own job (due time, attempts), claimed with SKIP LOCKED.
  let webhookRun: Promise<unknown> = Promise.resolve();
  const webhookTick = () => {
    if (stopped || !only.webhooks) return;
    webhookRun = dispatchWebhooks(db, config.webhooks)
      .catch((err) => reportError(err, { worker: 'webhooks' }))
      .finally(() => {
        if (!stopped) webhookTimer = setTimeout(webhookTick, 500);
      });
  };
  let webhookTimer = setTimeout(webhookTick, 200);
  // pg-boss on the same PostgreSQL; jobs written in a transaction reach it through the job outbox relay.
  const boss = only.jobs ? await startQueue(config) : null;
  if (boss) await registerRoutingJobs({ config, db }, boss);
  // The monthly settlement on the 1st, payout retries with back-off and the payout sweep.
  if (boss) await registerPayoutJobs({ config, db }, boss);
  // Tracking reconcile and overdue boxes; registers our webhook URL with the shipping service.
  if (boss) await registerShippingJobs({ config, db }, boss);
  const relay = boss ? startJobRelay(db, boss, (err) => reportError(err, { worker: 'job-relay' })) : null;
  return {
    async stop() {
      stopped = true;
      clearTimeout(timer);
      clearTimeout(webhookTimer);
      await Promise.all([running, webhookRun]);
      await relay?.stop();
      await boss?.stop({ graceful: true, timeout: 5000 });
      transport.close();
    },
  };
}
