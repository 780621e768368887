import type { DataSource } from 'typeorm';
import type { Config } from './config';
import { reportError } from './lib/errors';
import { createMailTransport, dispatchOutbox } from './notifications';
import { startJobRelay, startQueue } from './jobs';
import { registerRoutingJobs } from './routing';

export interface Workers {
  stop(): Promise<void>;
}

/** Background work: the mail outbox and the job queue (offer deadlines); started with the server or by `npm run worker`. */
export async function startWorkers({ config, db }: { config: Config; db: DataSource }): Promise<Workers> {
  const transport = createMailTransport(config.smtp);
  let stopped = false;
  let running: Promise<unknown> = Promise.resolve();
  const tick = async () => {
    if (stopped) return;
    running = dispatchOutbox(db, transport, { from: config.mailFrom })
      .catch((err) => reportError(err, { worker: 'outbox' }))
      .finally(() => {
        if (!stopped) timer = setTimeout(tick, 500);
      });
  };
  let timer = setTimeout(tick, 100);
  // pg-boss on the same PostgreSQL; jobs written in a transaction reach it through the job outbox relay.
  const boss = await startQueue(config);
  await registerRoutingJobs({ config, db }, boss);
  const relay = startJobRelay(db, boss, (err) => reportError(err, { worker: 'job-relay' }));
  return {
    async stop() {
      stopped = true;
      clearTimeout(timer);
      await running;
      await relay.stop();
      await boss.stop({ graceful: true, timeout: 5000 });
      transport.close();
    },
  };
}
