import type { TestProject } from 'vitest/node';
import { createMailFake } from '../../fakes/mail/mail-fake';

// Shared by the API and browser suites: the database that server/cli/test.ts migrated and
// seeded, and a mail fake on free ports.
export default async function setup(project: TestProject) {
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl) throw new Error('DATABASE_URL is not set: run the suites through `npm test`, which starts PostgreSQL');
  const mail = createMailFake({ smtpPort: 0, httpPort: 0 });
  await mail.start();
  process.env.TEST_SMTP_PORT = String(mail.smtpPort);
  project.provide('databaseUrl', databaseUrl);
  project.provide('smtpPort', mail.smtpPort);
  project.provide('mailApiUrl', `http://127.0.0.1:${mail.httpPort}`);
  return async () => {
    await mail.stop();
  };
}
