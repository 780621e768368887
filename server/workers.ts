import type { DataSource } from 'typeorm';
import type { Config } from './config';
import { reportError } from './lib/errors';
import { createMailTransport, dispatchOutbox } from './notifications';

export interface Workers {
  stop(): Promise<void>;
}

/** Background work: today the mail outbox; started with the server or by `npm run worker`. */
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
  return {
    async stop() {
      stopped = true;
      clearTimeout(timer);
      await running;
      transport.close();
    },
  };
}
