import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { createServer } from 'node:net';
import path from 'node:path';
import { ensureCluster, ensureDatabase, type Cluster } from './postgres';

const tsx = path.join('node_modules', 'tsx', 'dist', 'cli.mjs');

/**
 * Node options for the app server. A larger young generation (V8 default: 16 MB semi-spaces) means
 * fewer scavenges while many requests are in flight; on the partner API's intake under load this
 * gave about a sixth more requests a second (`npm run bench`), for some 100 MB more memory.
 */
export const SERVER_NODE_OPTIONS = '--max-semi-space-size=32';

/** NODE_OPTIONS for a server process: the caller's own, then ours. */
export const serverNodeOptions = (existing: string | undefined): string => [existing, SERVER_NODE_OPTIONS].filter(Boolean).join(' ');

/**
 * A loopback port that is free now, chosen by the OS. Throwaway services (tests, benches) use it
 * instead of a fixed port: fixed ones in the ephemeral range can be held by an outgoing connection.
 */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as { port: number };
      srv.close(() => resolve(port));
    });
    srv.on('error', reject);
  });
}

export interface StackPorts {
  app: number;
  postgres: number;
  smtp: number;
  mailHttp: number;
  shipping: number;
  payments: number;
}

export const defaultPorts = (env: NodeJS.ProcessEnv): StackPorts => ({
  app: Number(env.PORT ?? 3000),
  postgres: Number(env.PG_PORT ?? 54320),
  smtp: Number(env.MAIL_FAKE_SMTP_PORT ?? 2525),
  mailHttp: Number(env.MAIL_FAKE_HTTP_PORT ?? 8025),
  shipping: Number(env.SHIPPING_FAKE_PORT ?? 4010),
  payments: Number(env.PAYMENTS_FAKE_PORT ?? 4020),
});

/** Shared secrets between our server and the local fakes; fixed for the demo, never for production. */
export const demoSecrets = {
  SHIPPING_API_KEY: 'pp_ship_demo_key',
  SHIPPING_WEBHOOK_SECRET: 'pp-shipping-webhook-demo-secret',
  PAYMENTS_SECRET_KEY: 'sk_test_platterpost_demo',
  PAYMENTS_WEBHOOK_SECRET: 'whsec_platterpost_demo',
};

export function stackEnv(ports: StackPorts, databaseUrl: string): Record<string, string> {
  return {
    ...demoSecrets,
    DATABASE_URL: databaseUrl,
    PORT: String(ports.app),
    APP_URL: process.env.APP_URL ?? `http://localhost:${ports.app}`,
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(ports.smtp),
    MAIL_FAKE_SMTP_PORT: String(ports.smtp),
    MAIL_FAKE_HTTP_PORT: String(ports.mailHttp),
    SHIPPING_FAKE_PORT: String(ports.shipping),
    SHIPPING_API_URL: `http://127.0.0.1:${ports.shipping}/v2/`,
    SHIPPING_WEBHOOK_URL: `http://127.0.0.1:${ports.app}/api/webhooks/shipping`,
    PAYMENTS_FAKE_PORT: String(ports.payments),
    PAYMENTS_API_URL: `http://127.0.0.1:${ports.payments}`,
    PAYMENTS_WEBHOOK_URL: `http://127.0.0.1:${ports.app}/api/webhooks/payments`,
  };
}

/** The fakes that exist in this checkout, each started with its own command. */
export const fakes = [
  { name: 'mail', main: 'fakes/mail/main.ts' },
  { name: 'shipping', main: 'fakes/shipping/main.ts' },
  { name: 'payments', main: 'fakes/payments/main.ts' },
].filter((f) => existsSync(f.main));

export class ProcessGroup {
  private children: { name: string; child: ChildProcess }[] = [];
  private stopping = false;

  constructor(private onUnexpectedExit: (name: string, code: number | null) => void) {}

  spawnTsx(name: string, args: string[], env: Record<string, string>) {
    const child = spawn(process.execPath, [tsx, ...args], { env: { ...process.env, ...env }, stdio: ['ignore', 'inherit', 'inherit'] });
    child.on('exit', (code) => {
      if (!this.stopping) this.onUnexpectedExit(name, code);
    });
    this.children.push({ name, child });
    return child;
  }

  async stopAll(): Promise<void> {
    this.stopping = true;
    await Promise.all(
      this.children.reverse().map(
        ({ child }) =>
          new Promise<void>((resolve) => {
            if (child.exitCode !== null || child.signalCode !== null) return resolve();
            const timer = setTimeout(() => child.kill('SIGKILL'), 8000);
            child.once('exit', () => {
              clearTimeout(timer);
              resolve();
            });
            child.kill('SIGTERM');
          }),
      ),
    );
  }
}

export async function startDatabase(ports: StackPorts, dataDir: string): Promise<{ cluster: Cluster; databaseUrl: string }> {
  const cluster = ensureCluster({ dataDir, port: ports.postgres });
  await ensureDatabase(cluster, 'platterpost');
  return { cluster, databaseUrl: cluster.url('platterpost') };
}

export async function waitForHttp(url: string, timeoutMs = 60_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    try {
      const res = await fetch(url);
      if (res.status < 500) return;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
}
