import { createMailFake } from './mail-fake';

function portFromEnv(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    console.error(`${name} must be a TCP port number (0–65535), got "${raw}"`);
    process.exit(1);
  }
  return port;
}

const fake = createMailFake({
  smtpPort: portFromEnv('MAIL_FAKE_SMTP_PORT', 2525),
  httpPort: portFromEnv('MAIL_FAKE_HTTP_PORT', 8025),
  host: process.env.MAIL_FAKE_HOST || '127.0.0.1',
});

try {
  await fake.start();
} catch (error) {
  console.error(`Mail fake could not start: ${(error as Error).message}`);
  process.exit(1);
}
console.log(`Mail fake SMTP on smtp://${fake.host}:${fake.smtpPort} (no TLS, no login)`);
console.log(`Mail fake inbox on http://${fake.host}:${fake.httpPort}/ (JSON at /api/messages)`);

let stopping = false;
async function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  console.log(`Mail fake stopping (${signal})`);
  await fake.stop();
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));
