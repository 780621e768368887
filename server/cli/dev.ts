import { execFileSync, spawn } from 'node:child_process';
import path from 'node:path';
import { defaultPorts, fakes, ProcessGroup, serverNodeOptions, stackEnv, startDatabase } from './lib/stack';

// `npm run dev`: like `npm start`, but the server restarts on change and Vite serves the client
// with hot reload, proxying /api to the server.
const ports = defaultPorts(process.env);
const { cluster, databaseUrl } = await startDatabase(ports, process.env.PG_DATA_DIR ?? '.data/postgres');
const env = { ...stackEnv(ports, databaseUrl), APP_URL: 'http://localhost:5173' };
execFileSync(process.execPath, [path.join('node_modules', 'tsx', 'dist', 'cli.mjs'), 'server/cli/migrate.ts', '--seed'], { stdio: 'inherit', env: { ...process.env, ...env } });

const group = new ProcessGroup((name, code) => console.error(`[dev] ${name} exited (code ${code})`));
for (const fake of fakes) group.spawnTsx(`${fake.name} fake`, [fake.main], env);
group.spawnTsx('server', ['watch', '--clear-screen=false', 'server/index.ts'], { ...env, NODE_OPTIONS: serverNodeOptions(process.env.NODE_OPTIONS) });
const vite = spawn(process.execPath, [path.join('node_modules', 'vite', 'bin', 'vite.js')], { stdio: 'inherit', env: { ...process.env, ...env } });

const stop = async () => {
  vite.kill('SIGTERM');
  await group.stopAll();
  if (cluster.startedHere) cluster.stop();
  process.exit(0);
};
process.once('SIGINT', () => void stop());
process.once('SIGTERM', () => void stop());
