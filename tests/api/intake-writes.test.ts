import { randomUUID } from 'node:crypto';
import pg from 'pg';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';
import { appendBufferOf, insertRow, updateRow, withBatchedAppends, withBatchedWrite } from '../../server/db/appends';
import { LabOffer } from '../../server/routing';
import { createDataSource, runMigrations } from '../../server/db/data-source';
import { createReferral, getReferral } from '../../server/referrals';
import { findActiveKey } from '../../server/partner-api/api-keys';
import { enqueueEmail } from '../../server/notifications';
import { recordTimeline } from '../../server/routing/timeline';
import { setupApi, signIn, unique } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';
import { statementsOf } from '../support/statements';

// Intake collects its timeline steps, e-mails, partner events and jobs and writes them in one
// statement before commit (server/db/appends.ts). These tests check that what lands is what the
// step-by-step writes would have left: same rows, same order, same answer to the shop.
const { app, db } = await setupApi();

async function shop(events: string[]) {
  const org = await createOrganization(db, 'partner');
  await db.query(`UPDATE organizations SET postal_code = '59801', lat = 46.87, lon = -113.99 WHERE id = $1`, [org.id]);
  const admin = await createUser(db, { role: 'partner_admin', organizationId: org.id });
  const token = (await signIn(app, admin.email, TEST_PASSWORD)).accessToken;
  const key = await request(app).post('/api/partner/api-keys').set('Authorization', `Bearer ${token}`).send({ name: 'Ticketing' });
  expect(key.status).toBe(201);
  if (events.length) {
    const hook = await request(app).post('/api/partner/webhooks').set('Authorization', `Bearer ${token}`).send({ url: 'http://127.0.0.1:9/hooks', events });
    expect(hook.status).toBe(201);
  }
  return { org, admin, key: `Bearer ${key.body.key as string}` };
}

const body = {
  customer: { name: 'Ada Customer', email: 'ada@customer.example' },
  device: { mediaType: 'hdd_3_5', capacityGb: 2000 },
  symptoms: ['clicking'],
  priorities: [{ category: 'photos', note: 'Wedding' }],
  sensitivity: [],
};

describe('intake writes its appended rows in one go', () => {
  it('answers with the case exactly as a later read of it shows it', async () => {
    const { key } = await shop([]);
    const created = await request(app).post('/api/v1/referrals').set('Authorization', key).send(body);
    expect(created.status).toBe(201);
    const read = await request(app).get(`/api/v1/referrals/${created.body.id}`).set('Authorization', key);
    expect(read.status).toBe(200);
    expect(created.body).toEqual(read.body);
  });

  it('keeps the timeline in the order of its steps', async () => {
    const { key } = await shop([]);
    const created = await request(app).post('/api/v1/referrals').set('Authorization', key).send(body);
    const rows: { kind: string }[] = await db.query(`SELECT kind FROM referral_timeline WHERE referral_id = $1 ORDER BY position`, [created.body.id]);
    const kinds = rows.map((r) => r.kind);
    expect(kinds.slice(0, 3)).toEqual(['opened', 'triaged', 'routed']);
    expect(created.body.timeline.map((t: { kind: string }) => t.kind)).toEqual(kinds);
  });

  it('stores a partner event only where an active endpoint subscribed to it, with one delivery each', async () => {
    const { org, key } = await shop(['referral.created']);
    const created = await request(app).post('/api/v1/referrals').set('Authorization', key).send(body);
    expect(created.status).toBe(201);
    const events: { type: string; payload: string; deliveries: number }[] = await db.query(
      `SELECT e.type, e.payload, (SELECT count(*)::int FROM webhook_deliveries d WHERE d.event_id = e.id) AS deliveries
       FROM webhook_events e WHERE e.organization_id = $1`,
      [org.id],
    );
    // The case was also routed (and offered or queued), but the endpoint asked for referral.created only.
    expect(events.map((e) => [e.type, e.deliveries])).toEqual([['referral.created', 1]]);
    expect(JSON.parse(events[0].payload).data.referral).toMatchObject({ id: created.body.id, reference: created.body.reference, status: 'opened' });
  });

  it('stores no event at all for a shop without endpoints', async () => {
    const { org, key } = await shop([]);
    await request(app).post('/api/v1/referrals').set('Authorization', key).send(body);
    const [{ count }] = await db.query(`SELECT count(*)::int AS count FROM webhook_events WHERE organization_id = $1`, [org.id]);
    expect(count).toBe(0);
  });
});

describe('withBatchedAppends', () => {
  async function someCase() {
    const { key } = await shop([]);
    return (await request(app).post('/api/v1/referrals').set('Authorization', key).send(body)).body as { id: string };
  }
  const step = (kind: string) => ({ kind, summary: `Step ${kind}`, actor: { type: 'system' as const, name: 'test' } });
  const timelineCount = async (q: { query: typeof db.query }, id: string) =>
    (await q.query(`SELECT count(*)::int AS n FROM referral_timeline WHERE referral_id = $1`, [id]))[0].n as number;

  it('writes nothing until the work is done, then every row in the order recorded', async () => {
    const kase = await someCase();
    const before = await timelineCount(db, kase.id);
    await db.transaction(async (manager) => {
      const { appended } = await withBatchedAppends(manager, async () => {
        await recordTimeline(manager, kase.id, step('note_a'));
        await recordTimeline(manager, kase.id, step('note_b'));
        await enqueueEmail(manager, 'ordered@test.example', 'password_reset', { name: 'Ordered', url: 'http://app.test/reset', minutes: 60 });
        expect(await timelineCount(manager, kase.id)).toBe(before);
        expect(appendBufferOf(manager)?.size).toBe(3);
      });
      expect(appended.timeline.map((t) => t.kind)).toEqual(['note_a', 'note_b']);
      expect(await timelineCount(manager, kase.id)).toBe(before + 2);
    });
    const rows: { kind: string }[] = await db.query(`SELECT kind FROM referral_timeline WHERE referral_id = $1 ORDER BY position DESC LIMIT 2`, [kase.id]);
    expect(rows.map((r) => r.kind)).toEqual(['note_b', 'note_a']);
    const [{ n }] = await db.query(`SELECT count(*)::int AS n FROM outbox_messages WHERE recipient = 'ordered@test.example'`);
    expect(n).toBe(1);
  });

  it('leaves nothing behind when the transaction fails', async () => {
    const kase = await someCase();
    const before = await timelineCount(db, kase.id);
    await expect(
      db.transaction(async (manager) => {
        await withBatchedAppends(manager, async () => {
          await recordTimeline(manager, kase.id, step('doomed'));
          await enqueueEmail(manager, 'doomed@test.example', 'password_reset', { name: 'Doomed', url: 'http://app.test/reset', minutes: 60 });
        });
        throw new Error('a later step failed');
      }),
    ).rejects.toThrow('a later step failed');
    expect(await timelineCount(db, kase.id)).toBe(before);
    const [{ n }] = await db.query(`SELECT count(*)::int AS n FROM outbox_messages WHERE recipient = 'doomed@test.example'`);
    expect(n).toBe(0);
  });

  it('holds a new offer row with the batch, applies changes to it in memory, and refuses a row with a column left unset', async () => {
    const kase = await someCase();
    const [lab] = await db.query(`SELECT organization_id AS id FROM lab_profiles LIMIT 1`);
    const now = new Date();
    const fields = {
      referralId: kase.id, labOrganizationId: lab.id, routingSnapshotId: null, status: 'withdrawn' as const, rank: null, distanceKm: 10, estimatedDays: 5,
      offeredAt: now, deadline: new Date(now.getTime() + 3_600_000), respondedAt: null, respondedByUserId: null, respondedByName: null, autoAccepted: false, declineReason: null, declineNote: null,
      assignedByUserId: null, createdAt: now, updatedAt: now,
    };
    const id = crypto.randomUUID();
    await db.transaction(async (manager) => {
      await withBatchedAppends(manager, async () => {
        const offer = await insertRow(manager, LabOffer, manager.create(LabOffer, { id, ...fields }));
        await updateRow(manager, LabOffer, offer, { declineNote: 'changed before it was written' });
        expect(await manager.query(`SELECT id FROM lab_offers WHERE id = $1`, [id])).toEqual([]);
        await expect(insertRow(manager, LabOffer, manager.create(LabOffer, { ...fields }))).rejects.toThrow(/LabOffer\.id has no value/);
      });
    });
    const [row] = await db.query(`SELECT status, decline_note FROM lab_offers WHERE id = $1`, [id]);
    expect(row).toEqual({ status: 'withdrawn', decline_note: 'changed before it was written' });
  });

  it('writes at once outside it, and refuses to collect outside a transaction', async () => {
    const kase = await someCase();
    const before = await timelineCount(db, kase.id);
    await db.transaction(async (manager) => {
      await recordTimeline(manager, kase.id, step('immediate'));
      expect(appendBufferOf(manager)).toBeUndefined();
      expect(await timelineCount(manager, kase.id)).toBe(before + 1);
    });
    await expect(withBatchedAppends(db.manager, async () => undefined)).rejects.toThrow(/needs a transaction/);
  });
});

describe('withBatchedWrite (intake without an idempotency key)', () => {
  const step = (kind: string) => ({ kind, summary: `Step ${kind}`, actor: { type: 'system' as const, name: 'test' } });

  it('opens a case with reads and one write, and no BEGIN or COMMIT', async () => {
    const { key } = await shop([]);
    // The key's first use writes its last_used_at (at most once a minute); that is not intake's write.
    expect((await request(app).get('/api/v1/me').set('Authorization', key)).status).toBe(200);
    let created: request.Response | undefined;
    const { statements } = await statementsOf(async () => {
      created = await request(app).post('/api/v1/referrals').set('Authorization', key).send(body);
    });
    expect(created!.status).toBe(201);
    expect(statements.filter((s) => /^(BEGIN|START TRANSACTION|COMMIT|ROLLBACK)\b/i.test(s))).toEqual([]);
    const writes = statements.filter((s) => !/^SELECT\b/i.test(s));
    expect(writes).toHaveLength(1);
    expect(writes[0]).toMatch(/INSERT INTO referrals/);
    // The batched write is the last statement intake sends.
    expect(statements.at(-1)).toBe(writes[0]);
    // The ranking's fresh figures come with the key, in its statement; nothing reads them on their own.
    expect(statements[0]).toMatch(/FROM api_keys k/);
    expect(statements[0]).toMatch(/AS directory_open_cases/);
    expect(statements[0]).toMatch(/recipient_directory_version/);
    expect(statements.filter((s) => /^SELECT\s+\(SELECT version::text FROM lab_directory_version\) AS directory_version/.test(s))).toEqual([]);
  });

  it('refuses a write, a locking read or a transaction before the batched statement, and writes nothing', async () => {
    const { key } = await shop([]);
    const kase = (await request(app).post('/api/v1/referrals').set('Authorization', key).send(body)).body as { id: string };
    const count = async () => (await db.query(`SELECT count(*)::int AS n FROM referral_timeline WHERE referral_id = $1`, [kase.id]))[0].n as number;
    const before = await count();
    const attempts: ((m: import('typeorm').EntityManager) => Promise<unknown>)[] = [
      (m) => m.query(`UPDATE referrals SET description = 'sneaked in' WHERE id = $1`, [kase.id]),
      (m) => m.query(`SELECT id FROM referrals WHERE id = $1 FOR UPDATE`, [kase.id]),
      (m) => m.query(`SELECT pg_advisory_xact_lock(1)`),
      (m) => m.transaction(async () => undefined),
      (m) => m.update(LabOffer, { referralId: kase.id }, { declineNote: 'sneaked in' }),
    ];
    for (const attempt of attempts) {
      await expect(
        withBatchedWrite(db, async (manager) => {
          await recordTimeline(manager, kase.id, step('collected_first'));
          expect(appendBufferOf(manager)?.size).toBe(1);
          await attempt(manager);
        }),
      ).rejects.toThrow(/Only plain reads may run before the batched write/);
    }
    expect(await count()).toBe(before);
    const [row] = await db.query(`SELECT description FROM referrals WHERE id = $1`, [kase.id]);
    expect(row.description).not.toBe('sneaked in');
  });

  it('writes what was collected in one statement once the work is done', async () => {
    const { key } = await shop([]);
    const kase = (await request(app).post('/api/v1/referrals').set('Authorization', key).send(body)).body as { id: string };
    const before = (await db.query(`SELECT count(*)::int AS n FROM referral_timeline WHERE referral_id = $1`, [kase.id]))[0].n as number;
    const { statements } = await statementsOf(() =>
      withBatchedWrite(db, async (manager) => {
        await manager.query(`SELECT 1`);
        await recordTimeline(manager, kase.id, step('note_a'));
        await recordTimeline(manager, kase.id, step('note_b'));
      }),
    );
    expect(statements.filter((s) => !/^SELECT\b/i.test(s))).toHaveLength(1);
    const rows: { kind: string }[] = await db.query(`SELECT kind FROM referral_timeline WHERE referral_id = $1 ORDER BY position DESC LIMIT 2`, [kase.id]);
    expect(rows.map((r) => r.kind)).toEqual(['note_b', 'note_a']);
    expect((await db.query(`SELECT count(*)::int AS n FROM referral_timeline WHERE referral_id = $1`, [kase.id]))[0].n).toBe(before + 2);
  });
});

describe('the answer to intake, for each way routing can end', () => {
  it('matches a later read when the case is offered, and when a lab’s rule accepts it at once', async () => {
    const { key } = await shop([]);
    const cases = [
      body,
      { ...body, device: { mediaType: 'usb_flash', capacityGb: 64 }, symptoms: ['deleted_files'] },
    ];
    const statuses = new Set<string>();
    for (const sent of cases) {
      const created = await request(app).post('/api/v1/referrals').set('Authorization', key).send(sent);
      expect(created.status).toBe(201);
      statuses.add(created.body.status);
      const read = await request(app).get(`/api/v1/referrals/${created.body.id}`).set('Authorization', key);
      expect(created.body).toEqual(read.body);
    }
    expect([...statuses].sort()).toEqual(['accepted', 'offered']);
  });
});

describe('the answer to intake on a network without labs', () => {
  it('matches a later read when the case waits for the network admin', async () => {
    // A database of its own with no labs at all, so that routing finds no candidate.
    const adminUrl = process.env.TEST_PG_ADMIN_URL!;
    const name = unique('nolabs_');
    const admin = new pg.Client({ connectionString: adminUrl });
    await admin.connect();
    await admin.query(`CREATE DATABASE ${name}`);
    const empty = createDataSource({ url: adminUrl.replace(/\/postgres$/, `/${name}`), poolSize: 2 });
    await empty.initialize();
    try {
      await runMigrations(empty);
      const org = await createOrganization(empty, 'partner');
      await empty.query(`UPDATE organizations SET postal_code = '59801', lat = 46.87, lon = -113.99 WHERE id = $1`, [org.id]);
      const ctx = { db: empty, config: loadConfig({ NODE_ENV: 'test', DATABASE_URL: 'postgres://unused/none', APP_URL: 'http://app.test' }) };
      const who = { partnerOrganizationId: org.id, actor: { type: 'user' as const, id: randomUUID(), name: 'Counter clerk' } };
      const created = await createReferral(ctx, who, { ...body, origin: { postalCode: '59801', country: 'US' }, consent: { accepted: true } });
      expect(created.status).toBe('needs_attention');
      expect(created).toEqual(await getReferral(ctx, { partnerOrganizationId: org.id }, created.id));
    } finally {
      await empty.destroy();
      await admin.query(`DROP DATABASE ${name}`);
      await admin.end();
    }
  });
});

describe('the key statement intake sends on every request', () => {
  it('is planned once and its kept plan reused, not planned again for each request', async () => {
    // PostgreSQL plans a prepared statement five times, then keeps a generic plan only if it
    // does not look dearer than those (see PREPARE in the PostgreSQL manual); pg_prepared_statements
    // counts both kinds for the session, so one connection is used.
    const { key } = await shop([]);
    const single = createDataSource({ url: (db.options as { url: string }).url, poolSize: 1 });
    await single.initialize();
    try {
      const ctx = { db: single, config: loadConfig({ NODE_ENV: 'test', DATABASE_URL: 'postgres://unused/none', APP_URL: 'http://app.test' }) };
      for (let i = 0; i < 8; i++) expect(await findActiveKey(ctx, key.slice('Bearer '.length), { withDirectoryReading: true })).not.toBeNull();
      const [plans] = await single.query(`SELECT generic_plans::int AS generic, custom_plans::int AS custom FROM pg_prepared_statements WHERE name = 'api-keys.find-active-with-directory'`);
      expect(plans.generic).toBeGreaterThanOrEqual(3);
      expect(plans.custom).toBeLessThanOrEqual(5);
    } finally {
      await single.destroy();
    }
  });
});
