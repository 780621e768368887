import pg from 'pg';
import { afterAll, describe, expect, it } from 'vitest';
import { createMailFake } from '../../fakes/mail/mail-fake';
import { createDataSource, runMigrations } from '../../server/db/data-source';
import { createMailTransport, dispatchOutbox, enqueueEmail } from '../../server/notifications';
import { unique } from '../support/api';

// A database of its own, so no other file's mail worker sends these messages, and a mail fake of its
// own that this test can stop in the middle of a burst.
const adminUrl = process.env.TEST_PG_ADMIN_URL!;
const name = unique('outbox_');
const admin = new pg.Client({ connectionString: adminUrl });
await admin.connect();
await admin.query(`CREATE DATABASE ${name}`);
const db = createDataSource({ url: adminUrl.replace(/\/postgres$/, `/${name}`), poolSize: 4 });
await db.initialize();
await runMigrations(db);
const mail = createMailFake({ smtpPort: 0, httpPort: 0 });
await mail.start();

afterAll(async () => {
  await mail.stop();
  await db.destroy();
  await admin.query(`DROP DATABASE ${name}`);
  await admin.end();
});

describe('the mail outbox when the mail server goes away', () => {
  it('delivers all 500 messages of a burst once each, though the mail server stopped in the middle of it', async () => {
    const transport = createMailTransport({ host: '127.0.0.1', port: mail.smtpPort });
    await db.transaction(async (manager) => {
      for (let i = 0; i < 500; i++) {
        await enqueueEmail(manager, `burst-${i}@test.example`, 'password_reset', { name: `Person ${i}`, url: `http://app.test/reset?token=${i}`, minutes: 60 });
      }
    });
    // Part of the burst goes out, then the mail server stops.
    await dispatchOutbox(db, transport, { from: 'Platterpost <no-reply@platterpost.example>', batchSize: 100 });
    await mail.stopSmtp();
    await dispatchOutbox(db, transport, { from: 'Platterpost <no-reply@platterpost.example>', batchSize: 100 });
    const [{ waiting }] = await db.query(`SELECT count(*)::int AS waiting FROM outbox_messages WHERE status = 'pending' AND attempts > 0`);
    expect(waiting).toBeGreaterThan(0);

    // It comes back; the failed messages are due again after their back-off (moved to now here).
    await mail.startSmtp();
    await db.query(`UPDATE outbox_messages SET next_attempt_at = now() WHERE status = 'pending'`);
    for (let round = 0; round < 20; round++) {
      const [{ pending }] = await db.query(`SELECT count(*)::int AS pending FROM outbox_messages WHERE status = 'pending'`);
      if (pending === 0) break;
      await dispatchOutbox(db, transport, { from: 'Platterpost <no-reply@platterpost.example>', batchSize: 100 });
    }
    transport.close();

    const received = mail.messages().filter((m) => m.to.some((t) => t.startsWith('burst-')));
    const recipients = new Set(received.flatMap((m) => m.to));
    expect(received).toHaveLength(500);
    expect(recipients.size).toBe(500);
    expect(new Set(received.map((m) => m.messageId)).size).toBe(500);
    const [{ sent }] = await db.query(`SELECT count(*)::int AS sent FROM outbox_messages WHERE status = 'sent'`);
    expect(sent).toBe(500);
  });
});
