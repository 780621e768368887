import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, chmodSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { buildClientIfStale } from './lib/build';
import { ensureCluster, ensureDatabase } from './lib/postgres';
import { freePort, ProcessGroup, waitForHttp } from './lib/stack';

// `npm test [-- vitest args]`: a throwaway PostgreSQL cluster, migrated and seeded, the client
// built for the browser tests, then Vitest; everything it started is gone when it ends.
// Ports the OS says are free unless given: fixed ones sit in the ephemeral range, where an outgoing
// connection (a package download, say) can hold one when the run starts.
const port = Number(process.env.TEST_PG_PORT ?? (await freePort()));
const dataDir = mkdtempSync(path.join(os.tmpdir(), 'platterpost-test-'));
chmodSync(dataDir, 0o755);
const cluster = ensureCluster({
  dataDir: path.join(dataDir, 'pg'),
  port,
  // Durability is pointless for a cluster deleted after the run.
  settings: { fsync: 'off', synchronous_commit: 'off', full_page_writes: 'off', max_connections: '300' },
});

// One mail fake for every suite: the API tests' workers and the browser suite's server share the
// database, so any of them may send a given outbox message; all must reach the same inbox.
const mailSmtpPort = Number(process.env.TEST_MAIL_SMTP_PORT ?? (await freePort()));
const mailHttpPort = Number(process.env.TEST_MAIL_HTTP_PORT ?? (await freePort()));
const group = new ProcessGroup((name, exitCode) => console.error(`[test] ${name} exited early (code ${exitCode})`));

let code = 1;
try {
  group.spawnTsx('mail fake', ['fakes/mail/main.ts'], { MAIL_FAKE_SMTP_PORT: String(mailSmtpPort), MAIL_FAKE_HTTP_PORT: String(mailHttpPort) });
  await waitForHttp(`http://127.0.0.1:${mailHttpPort}/api/messages`);
  // Two databases: the API suites' workers and the browser suite's server each work only on their
  // own, so one suite's background jobs never pick up the other's records.
  await ensureDatabase(cluster, 'platterpost_test');
  await ensureDatabase(cluster, 'platterpost_e2e');
  const env = {
    ...process.env,
    DATABASE_URL: cluster.url('platterpost_test'),
    E2E_DATABASE_URL: cluster.url('platterpost_e2e'),
    TEST_PG_ADMIN_URL: cluster.url('postgres'),
    NODE_ENV: 'test',
    TEST_SMTP_PORT: String(mailSmtpPort),
    TEST_MAIL_API_URL: `http://127.0.0.1:${mailHttpPort}`,
    LOG_LEVEL: process.env.LOG_LEVEL ?? 'warn',
  };
  const tsx = path.join('node_modules', 'tsx', 'dist', 'cli.mjs');
  for (const url of [env.DATABASE_URL, env.E2E_DATABASE_URL]) {
    const migrate = spawnSync(process.execPath, [tsx, 'server/cli/migrate.ts', '--seed'], { stdio: 'inherit', env: { ...env, DATABASE_URL: url } });
    if (migrate.status !== 0) throw new Error('migrations failed');
  }
  // The demo seed's e-mails are history for the API suites: marked sent, so the mail the tests wait
  // for does not queue behind hundreds of demo messages on a busy machine.
  const seeded = new pg.Client({ connectionString: env.DATABASE_URL });
  await seeded.connect();
  await seeded.query(`UPDATE outbox_messages SET status = 'sent', sent_at = now() WHERE status = 'pending'`);
  await seeded.end();
  // The browser suite needs the built client; a run of other projects only does not.
  const args = process.argv.slice(2);
  const projects = args.flatMap((a, i) => (a === '--project' ? [args[i + 1]] : a.startsWith('--project=') ? [a.slice(10)] : []));
  if (projects.length === 0 || projects.includes('e2e')) buildClientIfStale();
  const vitest = spawnSync(process.execPath, [path.join('node_modules', 'vitest', 'vitest.mjs'), 'run', ...args], { stdio: 'inherit', env });
  code = vitest.status ?? 1;
} catch (err) {
  console.error(`[test] ${(err as Error).message}`);
} finally {
  await group.stopAll();
  cluster.stop();
  rmSync(dataDir, { recursive: true, force: true });
}
process.exit(code);
