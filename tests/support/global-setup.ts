import type { TestProject } from 'vitest/node';

// Shared by the API and browser suites: the database that server/cli/test.ts migrated and seeded,
// and the one mail fake it started.
export default function setup(project: TestProject) {
  const { DATABASE_URL, TEST_SMTP_PORT, TEST_MAIL_API_URL } = process.env;
  if (!DATABASE_URL || !TEST_SMTP_PORT || !TEST_MAIL_API_URL) {
    throw new Error('Run the API and browser suites through `npm test`, which starts PostgreSQL and the mail fake');
  }
  // The browser suite's server has a database of its own (see server/cli/test.ts).
  project.provide('databaseUrl', project.name === 'e2e' ? (process.env.E2E_DATABASE_URL ?? DATABASE_URL) : DATABASE_URL);
  project.provide('smtpPort', Number(TEST_SMTP_PORT));
  project.provide('mailApiUrl', TEST_MAIL_API_URL);
}
