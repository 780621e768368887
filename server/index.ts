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
    server.close();
    server.closeAllConnections?.();
    await workers?.stop();
    await db.destroy();
    process.exit(0);
  };
  process.once('SIGTERM', () => void shutdown('SIGTERM'));
  process.once('SIGINT', () => void shutdown('SIGINT'));
  process.on('unhandledRejection', (err) => reportError(err, { source: 'unhandledRejection' }));
}

main().catch((err) => {
  if (err instanceof ConfigError) console.error(err.message);
  else logger.fatal({ err }, 'server failed to start');
  process.exit(1);
});
