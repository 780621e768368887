import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, statSync, chmodSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import pg from 'pg';

const isRoot = process.getuid?.() === 0;

function say(msg: string) {
  console.log(`[postgres] ${msg}`);
}

/** Finds PostgreSQL 15's server binaries; installs Debian's package when root and missing. */
export function findPgBin(): string {
  const candidates = () => {
    const base = '/usr/lib/postgresql';
    if (!existsSync(base)) return [];
    return readdirSync(base)
      .sort((a, b) => Number(b) - Number(a))
      .map((v) => path.join(base, v, 'bin'))
      .filter((dir) => existsSync(path.join(dir, 'pg_ctl')) && existsSync(path.join(dir, 'initdb')));
  };
  let found = candidates();
  if (found.length === 0) {
    if (!isRoot) {
      throw new Error('PostgreSQL server binaries were not found. Install them with: sudo apt-get install -y postgresql');
    }
    say('PostgreSQL is not installed; installing Debian\u2019s postgresql package…');
    execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit' });
    execFileSync('apt-get', ['install', '-y', '-qq', 'postgresql'], { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
    found = candidates();
    if (found.length === 0) throw new Error('apt-get installed postgresql but no pg_ctl was found under /usr/lib/postgresql');
  }
  return found.find((d) => d.includes('/15/')) ?? found[0]!;
}

/** PostgreSQL refuses to run as root: as root, its commands run as the postgres user. */
function runPg(bin: string, args: string[], opts: { quiet?: boolean } = {}) {
  const [cmd, cmdArgs] = isRoot ? ['runuser', ['-u', 'postgres', '--', bin, ...args]] : [bin, args];
  const result = spawnSync(cmd, cmdArgs, { stdio: opts.quiet ? 'pipe' : ['ignore', 'inherit', 'inherit'], encoding: 'utf8' });
  return result;
}

/** The postgres user must be able to reach the data folder: grant traverse (o+x) where missing. */
function ensureTraversable(dir: string) {
  if (!isRoot) return;
  const parts = path.resolve(dir).split(path.sep).filter(Boolean);
  let current = '/';
  for (const part of parts) {
    current = path.join(current, part);
    if (!existsSync(current)) break;
    const mode = statSync(current).mode;
    if ((mode & 0o001) === 0) {
      chmodSync(current, mode | 0o001);
      say(`allowed the postgres user to pass through ${current} (chmod o+x)`);
    }
  }
}

export interface ClusterOptions {
  dataDir: string;
  port: number;
  /** Extra server settings, e.g. for throwaway test clusters. */
  settings?: Record<string, string>;
}

export interface Cluster {
  bin: string;
  dataDir: string;
  port: number;
  startedHere: boolean;
  url(database: string): string;
  stop(): void;
}

export function ensureCluster({ dataDir, port, settings = {} }: ClusterOptions): Cluster {
  const bin = findPgBin();
  const abs = path.resolve(dataDir);
  mkdirSync(path.dirname(abs), { recursive: true, mode: 0o755 });
  ensureTraversable(path.dirname(abs));
  if (!existsSync(path.join(abs, 'PG_VERSION'))) {
    mkdirSync(abs, { recursive: true, mode: 0o700 });
    if (isRoot) execFileSync('chown', ['-R', 'postgres:postgres', abs]);
    say(`creating a cluster in ${abs}`);
    // Trust on loopback only: the cluster listens on 127.0.0.1 and has no unix socket.
    const init = runPg(path.join(bin, 'initdb'), ['-D', abs, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8'], { quiet: true });
    if (init.status !== 0) throw new Error(`initdb failed:\n${init.stdout}\n${init.stderr}`);
  }
  const status = runPg(path.join(bin, 'pg_ctl'), ['status', '-D', abs], { quiet: true });
  let startedHere = false;
  if (status.status !== 0) {
    const options = [`-p ${port}`, `-h 127.0.0.1`, `-k ''`, ...Object.entries(settings).map(([k, v]) => `-c ${k}=${v}`)].join(' ');
    const logFile = path.join(abs, 'server.log');
    const start = runPg(path.join(bin, 'pg_ctl'), ['start', '-w', '-t', '60', '-D', abs, '-l', logFile, '-o', options], { quiet: true });
    if (start.status !== 0) throw new Error(`PostgreSQL did not start (see ${logFile}):\n${start.stdout}\n${start.stderr}`);
    startedHere = true;
    say(`started on 127.0.0.1:${port}`);
  } else {
    say(`already running from ${abs}`);
  }
  return {
    bin,
    dataDir: abs,
    port,
    startedHere,
    url: (database) => `postgres://postgres@127.0.0.1:${port}/${database}`,
    stop() {
      runPg(path.join(bin, 'pg_ctl'), ['stop', '-D', abs, '-m', 'fast', '-w'], { quiet: true });
      say('stopped');
    },
  };
}

export async function ensureDatabase(cluster: Cluster, database: string): Promise<void> {
  const client = new pg.Client({ connectionString: cluster.url('postgres') });
  await client.connect();
  try {
    const { rowCount } = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [database]);
    if (!rowCount) {
      await client.query(`CREATE DATABASE "${database.replace(/"/g, '')}"`);
      say(`created database ${database}`);
    }
  } finally {
    await client.end();
  }
}

export function writeMarker(file: string, text: string) {
  writeFileSync(file, text);
}
