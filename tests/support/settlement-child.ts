import { loadConfig } from '../../server/config';
import { createDataSource } from '../../server/db/data-source';
import { setLogLevel } from '../../server/lib/logger';
import { runSettlement } from '../../server/payouts';

// A settlement run in a process of its own, so a test can kill it half way (SIGKILL, no clean-up) and
// check that the next run finishes the job without paying anyone twice.
//   tsx tests/support/settlement-child.ts <period> <organization id>,<organization id>,…
// Reads DATABASE_URL and PAYMENTS_* from its environment, like the server.
const [period, ids] = process.argv.slice(2);
if (!period || !ids) {
  console.error('usage: settlement-child.ts <YYYY-MM> <id,id,…>');
  process.exit(2);
}
const config = loadConfig();
setLogLevel(config.logLevel);
const db = await createDataSource({ url: config.databaseUrl, poolSize: 3, applicationName: 'settlement-child' }).initialize();
try {
  const run = await runSettlement({ config, db }, { period, trigger: 'manual', organizationIds: ids.split(',') });
  console.log(JSON.stringify({ runId: run.id, summary: run.summary }));
} finally {
  await db.destroy();
}
