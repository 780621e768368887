import cluster from 'node:cluster';
import type { Server } from 'node:http';
import { createApp } from './app';
import { ConfigError, loadConfig } from './config';
import { createDataSource } from './db/data-source';
import { reportError } from './lib/errors';
import { logger, setLogLevel } from './lib/logger';
import { startWorkers, type Workers } from './workers';

async function main() {
  const config = loadConfig();
  setLogLevel(config.logLevel);
  const db = await createDataSource({ url: config.databaseUrl, poolSize: config.databasePoolSize }).initialize();
  const workers: Workers | null = config.runWorkers ? await startWorkers({ config, db }) : null;
  const app = createApp({ config, db });
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(config.port, config.host, () => resolve(s));
  });
  logger.info({ url: config.appUrl, port: config.port }, 'server listening');

  let stopping = false;
  const shutdown = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'shutting down');
    // Stop taking requests and let those in flight finish (up to 10 s) before the pool goes away.
    const drained = new Promise<void>((resolve) => server.close(() => resolve()));
    server.closeIdleConnections?.();
    await Promise.race([drained, new Promise((resolve) => setTimeout(resolve, 10_000).unref())]);
    server.closeAllConnections?.();
    await workers?.stop();
    await db.destroy();
    process.exit(0);
  };
  process.once('SIGTERM', () => void shutdown('SIGTERM'));
  process.once('SIGINT', () => void shutdown('SIGINT'));
  process.on('unhandledRejection', (err) => reportError(err, { source: 'unhandledRejection' }));
}

/**
 * With WEB_CONCURRENCY above 1, this process only watches over that many app processes, which share the
 * port (node:cluster). Background workers run in the first of them only; the others serve requests.
 */
function supervise(count: number, runWorkers: boolean) {
  let stopping = false;
  const fork = (index: number) => {
    const child = cluster.fork({ RUN_WORKERS: String(runWorkers && index === 0), WEB_CONCURRENCY: '1' });
    child.on('exit', (code, signal) => {
      if (stopping) return;
      logger.error({ index, code, signal }, 'app process exited; starting another');
      setTimeout(() => fork(index), 1000);
    });
  };
  for (let i = 0; i < count; i++) fork(i);
  const stop = (signal: NodeJS.Signals) => {
    stopping = true;
    for (const child of Object.values(cluster.workers ?? {})) child?.process.kill(signal);
    cluster.disconnect(() => process.exit(0));
  };
  process.once('SIGTERM', () => stop('SIGTERM'));
  process.once('SIGINT', () => stop('SIGINT'));
}

function start() {
  if (cluster.isPrimary) {
    const config = loadConfig();
    setLogLevel(config.logLevel);
    if (config.webConcurrency > 1) return supervise(config.webConcurrency, config.runWorkers);
  }
  return main();
}

Promise.resolve()
  .then(start)
  .catch((err) => {
    if (err instanceof ConfigError) console.error(err.message);
    else logger.fatal({ err }, 'server failed to start');
    process.exit(1);
  });
