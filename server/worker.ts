import { loadConfig, ConfigError } from './config';
import { createDataSource } from './db/data-source';
import { logger, setLogLevel } from './lib/logger';
import { startWorkers } from './workers';

// `npm run worker`: the background jobs as their own process, for scaling out.
async function main() {
  const config = loadConfig();
  setLogLevel(config.logLevel);
  const db = await createDataSource({ url: config.databaseUrl, poolSize: 4, applicationName: 'platterpost-worker' }).initialize();
  const workers = await startWorkers({ config, db });
  logger.info('worker started');
  const stop = async () => {
    await workers.stop();
    await db.destroy();
    process.exit(0);
  };
  process.once('SIGTERM', stop);
  process.once('SIGINT', stop);
}

main().catch((err) => {
  if (err instanceof ConfigError) console.error(err.message);
  else logger.fatal({ err }, 'worker failed to start');
  process.exit(1);
});
