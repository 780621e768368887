import { createPaymentsFake } from './payments-fake';

/*
 * Start command: `tsx fakes/payments/main.ts`.
 *   PAYMENTS_FAKE_PORT       port to listen on (default 4020)
 *   PAYMENTS_SECRET_KEY      API key clients must send (default sk_test_platterpost_local)
 *   PAYMENTS_WEBHOOK_SECRET  endpoint signing secret (default whsec_platterpost_local)
 *   PAYMENTS_WEBHOOK_URL     where events are POSTed (optional)
 *   PAYMENTS_FAKE_PUBLIC_URL base URL of the hosted pages as a browser reaches them (optional)
 * This is a stand-alone process, so it reads its own environment rather than the server's config.
 */

const rawPort = process.env.PAYMENTS_FAKE_PORT ?? '4020';
const port = Number(rawPort);
if (!Number.isInteger(port) || port < 0 || port > 65535) {
  console.error(`PAYMENTS_FAKE_PORT must be a port number (0–65535); got "${rawPort}".`);
  process.exit(1);
}

const fake = createPaymentsFake({
  port,
  secretKey: process.env.PAYMENTS_SECRET_KEY || 'sk_test_platterpost_local',
  webhookSecret: process.env.PAYMENTS_WEBHOOK_SECRET || 'whsec_platterpost_local',
  webhookUrl: process.env.PAYMENTS_WEBHOOK_URL || undefined,
  publicUrl: process.env.PAYMENTS_FAKE_PUBLIC_URL || undefined,
});

try {
  const { url } = await fake.start();
  console.log(`Payments fake listening on ${url}`);
  console.log(`  webhooks → ${process.env.PAYMENTS_WEBHOOK_URL || '(none yet; POST /_fake/webhook-endpoint to set)'}`);
} catch (error) {
  console.error(`Payments fake could not start on port ${port}: ${(error as Error).message}`);
  process.exit(1);
}

let stopping = false;
for (const signal of ['SIGTERM', 'SIGINT'] as const) {
  process.on(signal, () => {
    if (stopping) return;
    stopping = true;
    fake
      .stop()
      .then(() => process.exit(0))
      .catch((error: unknown) => {
        console.error('Payments fake did not stop cleanly:', error);
        process.exit(1);
      });
  });
}
