import { execFileSync } from 'node:child_process';
import path from 'node:path';
import { buildClientIfStale } from './lib/build';
import { defaultPorts, fakes, ProcessGroup, serverNodeOptions, stackEnv, startDatabase, waitForHttp } from './lib/stack';

// `npm start`: PostgreSQL, migrations and demo data, the fakes, the built client and the server.
const ports = defaultPorts(process.env);
const { cluster, databaseUrl } = await startDatabase(ports, process.env.PG_DATA_DIR ?? '.data/postgres');
const env = stackEnv(ports, databaseUrl);

let group: ProcessGroup | undefined;
const stop = async (code = 0) => {
  await group?.stopAll();
  if (cluster.startedHere) cluster.stop();
  process.exit(code);
};
process.once('SIGINT', () => void stop(0));
process.once('SIGTERM', () => void stop(0));

try {
  execFileSync(process.execPath, [path.join('node_modules', 'tsx', 'dist', 'cli.mjs'), 'server/cli/migrate.ts', '--seed'], {
    stdio: 'inherit',
    env: { ...process.env, ...env },
  });
  buildClientIfStale();
} catch (err) {
  console.error(String((err as Error).message ?? err));
  await stop(1);
}

group = new ProcessGroup((name, code) => {
  console.error(`[start] ${name} exited (code ${code}); stopping everything`);
  void stop(1);
});
for (const fake of fakes) group.spawnTsx(`${fake.name} fake`, [fake.main], env);
group.spawnTsx('server', ['server/index.ts'], { ...env, NODE_OPTIONS: serverNodeOptions(process.env.NODE_OPTIONS) });
await waitForHttp(`http://127.0.0.1:${ports.app}/api/health`);

console.log(`
  Platterpost is running.
    App:          http://localhost:${ports.app}
    Mail inbox:   http://127.0.0.1:${ports.mailHttp}  (every e-mail the app sends lands here)
    Demo sign-ins are listed in README.md ("Demo sign-ins"); the password for all of them is in that table.
  Ctrl-C stops everything, PostgreSQL included; the data stays in .data/ for the next start.
`);
