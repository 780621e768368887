import { createShippingFake } from './shipping-fake';

function fail(message: string): never {
  console.error(message);
  process.exit(1);
}

function numberFromEnv(name: string, fallback: number, check: (n: number) => boolean, expected: string): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!check(n)) fail(`${name} must be ${expected}, got "${raw}"`);
  return n;
}

const port = numberFromEnv('SHIPPING_FAKE_PORT', 4010, (n) => Number.isInteger(n) && n >= 0 && n <= 65535, 'a TCP port number (0–65535)');
const clockSpeed = numberFromEnv('SHIPPING_CLOCK_SPEED', 1, (n) => Number.isFinite(n) && n >= 0, 'a number ≥ 0 (1 = real time, 60 = a minute per second)');
const apiKey = process.env.SHIPPING_API_KEY || 'shipping_fake_local_key';
const webhookUrl = process.env.SHIPPING_WEBHOOK_URL || undefined;
const webhookSecret = process.env.SHIPPING_WEBHOOK_SECRET || undefined;
if (webhookUrl) {
  try {
    new URL(webhookUrl);
  } catch {
    fail(`SHIPPING_WEBHOOK_URL must be a URL, got "${webhookUrl}"`);
  }
}

const fake = createShippingFake({
  port,
  apiKey,
  host: process.env.SHIPPING_FAKE_HOST || '127.0.0.1',
  clockSpeed,
  webhookUrl,
  webhookSecret,
  log: (line) => console.log(line),
});

try {
  await fake.start();
} catch (error) {
  fail(`Shipping fake could not start: ${(error as Error).message}`);
}
console.log(`Shipping fake on ${fake.baseUrl} (clock ×${clockSpeed})`);
if (!process.env.SHIPPING_API_KEY) console.log(`SHIPPING_API_KEY not set; accepting the key "${apiKey}"`);
if (webhookUrl) console.log(`Posting tracker events to ${webhookUrl}${webhookSecret ? ' (signed)' : ' (unsigned: SHIPPING_WEBHOOK_SECRET not set)'}`);

let stopping = false;
async function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  console.log(`Shipping fake stopping (${signal})`);
  await fake.stop();
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));
