import { spawn, spawnSync } from 'node:child_process';
import { chmodSync, mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';
import express from 'express';
import pg from 'pg';
import { ensureCluster, ensureDatabase } from '../../server/cli/lib/postgres';
import { freePort, serverNodeOptions } from '../../server/cli/lib/stack';
import { demoApiKeyValues } from '../../server/db/seed/demo-api-keys';

// POST /api/v1/referrals under load (issue target: ≥ 300 requests/s with p99 ≤ 150 ms, 50 connections
// for 10 s, 2 cores), against the real server process on a throwaway PostgreSQL with the demo network;
// and, as the yardstick, a bare Express route that does one INSERT, measured the same way.
const tsx = path.join('node_modules', 'tsx', 'dist', 'cli.mjs');

function run(url: string, options: Partial<autocannon.Options>): Promise<autocannon.Result> {
  return new Promise((resolve, reject) => {
    autocannon({ url, connections: 50, duration: 10, ...options }, (err, result) => (err ? reject(err) : resolve(result)));
  });
}

const line = (label: string, r: autocannon.Result) =>
  console.log(
    `${label}: ${r.requests.average.toFixed(0)} requests/s, latency p50=${r.latency.p50} ms p99=${r.latency.p99} ms, ` +
      `${r['2xx']} answered 2xx, ${r.non2xx} other, ${r.errors} errors, ${r.timeouts} timeouts`,
  );

export async function benchPartnerApiLoad(): Promise<void> {
  const dataDir = mkdtempSync(path.join(os.tmpdir(), 'platterpost-bench-load-'));
  chmodSync(dataDir, 0o755);
  const cluster = ensureCluster({
    dataDir: path.join(dataDir, 'pg'),
    port: Number(process.env.BENCH_LOAD_PG_PORT ?? 54395),
    settings: { max_connections: '200' },
  });
  let server: ReturnType<typeof spawn> | undefined;
  const pool = new pg.Pool({ connectionString: cluster.url('platterpost_load'), max: 10 });
  // pg-pool's end() settles before its clients' sockets have closed; when the throwaway cluster stops
  // right after, those clients report the shutdown as an error, which is expected here.
  pool.on('error', () => undefined);
  try {
    await ensureDatabase(cluster, 'platterpost_load');
    const env = { ...process.env, DATABASE_URL: cluster.url('platterpost_load'), NODE_ENV: 'test', LOG_LEVEL: 'warn' };
    const migrate = spawnSync(process.execPath, [tsx, 'server/cli/migrate.ts', '--seed'], { stdio: 'inherit', env });
    if (migrate.status !== 0) throw new Error('migrations failed');

    // The yardstick: one INSERT per request, same database, same machine.
    await pool.query('CREATE TABLE IF NOT EXISTS bench_yardstick (id bigserial PRIMARY KEY, body jsonb NOT NULL, at timestamptz NOT NULL DEFAULT now())');
    const bare = express();
    bare.use(express.json());
    bare.post('/insert', async (req, res) => {
      const { rows } = await pool.query('INSERT INTO bench_yardstick (body) VALUES ($1) RETURNING id', [req.body]);
      res.status(201).json(rows[0]);
    });
    const bareServer = await new Promise<import('node:http').Server>((r) => {
      const s = bare.listen(0, '127.0.0.1', () => r(s));
    });

    const body = JSON.stringify({
      customer: { name: 'Load Test Customer', email: 'load@customer.test' },
      device: { mediaType: 'usb_flash', capacityGb: 64 },
      symptoms: ['deleted_files'],
      priorities: [{ category: 'photos', note: 'Holiday pictures' }],
      sensitivity: [],
    });
    const headers = { authorization: `Bearer ${demoApiKeyValues['juniper-lane']}`, 'content-type': 'application/json' };

    // The server as one process, then with one app process per core (WEB_CONCURRENCY), as README's
    // "Scaling out" runs it on one machine.
    const results: [string, autocannon.Result][] = [];
    for (const processes of [1, Math.max(2, os.availableParallelism())]) {
      const port = await freePort();
      // Workers off: the figure is the request path (intake, triage, routing, offer, all in one transaction).
      server = spawn(process.execPath, [tsx, 'server/index.ts'], {
        env: {
          ...env,
          PORT: String(port),
          RUN_WORKERS: 'false',
          WEB_CONCURRENCY: String(processes),
          PARTNER_API_RATE_LIMIT_PER_MINUTE: '1000000',
          // The default pool of 10, shared between the processes.
          DATABASE_POOL_SIZE: String(Math.ceil(10 / processes)),
          NODE_OPTIONS: serverNodeOptions(process.env.NODE_OPTIONS),
        },
        stdio: ['ignore', 'inherit', 'inherit'],
      });
      for (let i = 0; ; i++) {
        try {
          if ((await fetch(`http://127.0.0.1:${port}/api/health`)).ok) break;
        } catch {
          // not up yet
        }
        if (i > 300) throw new Error('the server did not start');
        await new Promise((r) => setTimeout(r, 200));
      }
      await run(`http://127.0.0.1:${port}/api/v1/referrals`, { method: 'POST', headers, body, duration: 2, connections: 10 }); // warm-up
      results.push([`  POST /api/v1/referrals, ${processes === 1 ? 'one app process' : `${processes} app processes (WEB_CONCURRENCY)`}`, await run(`http://127.0.0.1:${port}/api/v1/referrals`, { method: 'POST', headers, body })]);
      // autocannon drops its connections at the end; let the requests still being handled finish first.
      await new Promise((r) => setTimeout(r, 2000));
      server.kill('SIGTERM');
      await new Promise((r) => server!.once('exit', r));
      server = undefined;
    }
    const { port: barePort } = bareServer.address() as { port: number };
    const yard = await run(`http://127.0.0.1:${barePort}/insert`, { method: 'POST', headers: { 'content-type': 'application/json' }, body });
    bareServer.close();
    console.log('partner API load: 50 connections for 10 s (autocannon), target ≥ 300 requests/s with p99 ≤ 150 ms');
    for (const [label, result] of results) line(label, result);
    line('  yardstick: bare Express route with one INSERT', yard);
  } finally {
    server?.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, 1500));
    await pool.end();
    cluster.stop();
    rmSync(dataDir, { recursive: true, force: true });
  }
}
