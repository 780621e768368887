import { spawn } from 'node:child_process';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { createPaymentsFake } from '../../fakes/payments/payments-fake';
import { freePort } from '../../server/cli/lib/stack';

// The browser suite drives the real server process serving the built client.
export default async function setup(project: TestProject) {
  const port = await freePort();
  const appUrl = `http://127.0.0.1:${port}`;
  // The shipping fake for the browser suite, its own process; its clock moves only when a test says so,
  // and it posts its signed tracking events to this server.
  const shippingPort = await freePort();
  const shippingUrl = `http://127.0.0.1:${shippingPort}`;
  const shippingEnv = {
    SHIPPING_API_KEY: 'e2e_shipping_key',
    SHIPPING_WEBHOOK_SECRET: 'e2e-shipping-webhook-secret',
    SHIPPING_WEBHOOK_URL: `${appUrl}/api/webhooks/shipping`,
  };
  const shippingFake = spawn(process.execPath, [path.join('node_modules', 'tsx', 'dist', 'cli.mjs'), 'fakes/shipping/main.ts'], {
    env: { ...process.env, ...shippingEnv, SHIPPING_FAKE_PORT: String(shippingPort), SHIPPING_CLOCK_SPEED: '0' },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  // The payments fake for the browser suite, in this process; it posts its signed events to this server.
  const paymentsEnv = { PAYMENTS_SECRET_KEY: 'sk_test_e2e_payments', PAYMENTS_WEBHOOK_SECRET: 'whsec_e2e_payments' };
  const paymentsFake = createPaymentsFake({
    port: 0,
    secretKey: paymentsEnv.PAYMENTS_SECRET_KEY,
    webhookSecret: paymentsEnv.PAYMENTS_WEBHOOK_SECRET,
    webhookUrl: `${appUrl}/api/webhooks/payments`,
  });
  const { url: paymentsUrl } = await paymentsFake.start();
  const child = spawn(process.execPath, [path.join('node_modules', 'tsx', 'dist', 'cli.mjs'), 'server/index.ts'], {
    env: {
      ...process.env,
      DATABASE_URL: process.env.E2E_DATABASE_URL,
      PORT: String(port),
      APP_URL: appUrl,
      SMTP_PORT: process.env.TEST_SMTP_PORT ?? '2525',
      LOG_LEVEL: 'warn',
      ...shippingEnv,
      SHIPPING_API_URL: `${shippingUrl}/v2/`,
      ...paymentsEnv,
      PAYMENTS_API_URL: paymentsUrl,
    },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`the server exited with code ${child.exitCode} before answering`);
    try {
      if ((await fetch(`${appUrl}/api/health`)).ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error('the server did not answer /api/health within 60 s');
    await new Promise((r) => setTimeout(r, 200));
  }
  for (let i = 0; ; i++) {
    try {
      if ((await fetch(`${shippingUrl}/_fake/clock`)).ok) break;
    } catch {
      if (i > 150) throw new Error('the shipping fake did not start');
      await new Promise((r) => setTimeout(r, 200));
    }
  }
  project.provide('appUrl', appUrl);
  project.provide('shippingFakeUrl', shippingUrl);
  project.provide('paymentsFakeUrl', paymentsUrl);
  return async () => {
    shippingFake.kill('SIGTERM');
    await paymentsFake.stop();
    await new Promise<void>((resolve) => {
      child.once('exit', () => resolve());
      child.kill('SIGTERM');
      setTimeout(() => child.kill('SIGKILL'), 8000).unref();
    });
  };
}
