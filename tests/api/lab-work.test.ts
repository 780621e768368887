import { createHash } from 'node:crypto';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { benchListDto, labCaseDto } from '@shared/schemas/lab-work';
import { setupApi } from '../support/api';
import {
  auth,
  deletedPhotosDrive,
  goodEvaluation,
  labWorlds,
  linkFromOutbox,
  paidCase,
  quotedCase,
  receivedCase,
  worldZips,
} from '../support/lab-work';
import { startPaymentsFake } from '../support/money-fixtures';

const payments = await startPaymentsFake();
const ctx = await setupApi(payments.env);
const { app, db } = ctx;
const makeWorld = labWorlds(ctx, worldZips.labWork);

async function count(sql: string, params: unknown[]): Promise<number> {
  const [row] = await db.query(sql, params);
  return Number((row as { n: string }).n);
}

const manifestCsv = [
  'path,size,state',
  'Photos/2021/IMG_2041.JPG,4200133,intact',
  'Photos/2021/IMG_2042.CR2,25104881,intact',
  'Photos/2022/IMG_0007.HEIC,2100221,partial',
  'Documents/Taxes/2023-return.pdf,880112,intact',
  '"Documents/Letters/To ""Nan"".docx",40211,unreadable',
  'Music/track01.mp3,5120000,intact',
].join('\n');

describe('GET /api/lab/bench (the bench queue)', () => {
  it("lists the lab's received cases by promised date, with triage, the customer's priorities and the intake photos, and no other lab's case", async () => {
    const world = await makeWorld();
    const other = await makeWorld();
    const first = await receivedCase(ctx, world);
    const second = await receivedCase(ctx, world, deletedPhotosDrive({ device: { mediaType: 'usb_flash', capacityGb: 64 } }));
    const theirs = await receivedCase(ctx, other);
    // The second case was promised sooner: its accepted offer estimated fewer days.
    await db.query(`UPDATE lab_offers SET estimated_days = 9 WHERE referral_id = $1 AND status = 'accepted'`, [first.id]);
    await db.query(`UPDATE lab_offers SET estimated_days = 3 WHERE referral_id = $1 AND status = 'accepted'`, [second.id]);

    const res = await request(app).get('/api/lab/bench').set(auth(world.technician.token));

    expect(res.status).toBe(200);
    const { data } = benchListDto.parse(res.body);
    expect(data.map((row) => row.id)).toEqual([second.id, first.id]);
    expect(data.map((row) => row.id)).not.toContain(theirs.id);
    const row = data[1]!;
    expect(row).toMatchObject({
      reference: first.reference,
      status: 'received',
      shopName: world.shop.name,
      customerName: 'Rowan Tillery',
      mediaType: 'hdd_2_5',
      requiredSkills: ['logical'],
      priorities: [{ category: 'photos', note: '2019–2023 family photos' }, { category: 'documents', note: 'Tax returns' }],
      photos: [],
    });
    expect(row.cautions.length).toBeGreaterThan(0);
    expect(new Date(row.promisedBy!).getTime()).toBeGreaterThan(new Date(data[0]!.promisedBy!).getTime());
    expect(row.receivedAt).not.toBeNull();
  });

  it('is for the lab’s bench only: shop staff and the shipping clerk are refused', async () => {
    const world = await makeWorld();
    expect((await request(app).get('/api/lab/bench').set(auth(world.shopStaff.token))).status).toBe(403);
    expect((await request(app).get('/api/lab/bench').set(auth(world.clerk.token))).status).toBe(403);
    expect((await request(app).get('/api/lab/bench')).status).toBe(401);
  });
});

describe('evaluation', () => {
  it('starts the evaluation (received → evaluating) with a timeline step and an audit line', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);

    const res = await request(app).post(`/api/lab/cases/${c.id}/evaluation/start`).set(auth(world.technician.token));

    expect(res.status).toBe(200);
    const body = labCaseDto.parse(res.body);
    expect(body.status).toBe('evaluating');
    expect(body.timeline.at(-1)).toMatchObject({ kind: 'evaluation_started', actor: { type: 'user', name: world.technician.name } });
    expect(await count(`SELECT count(*) AS n FROM audit_events WHERE action = 'lab_work.evaluation_started' AND target_id = $1`, [c.id])).toBe(1);

    const again = await request(app).post(`/api/lab/cases/${c.id}/evaluation/start`).set(auth(world.technician.token));
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/the case is evaluating/);
  });

  it('records findings per part, the recoverability and the plan, and shows them on the case', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);

    const res = await request(app).put(`/api/lab/cases/${c.id}/evaluation`).set(auth(world.technician.token)).send(goodEvaluation);

    expect(res.status).toBe(200);
    const body = labCaseDto.parse(res.body);
    expect(body.status).toBe('evaluating');
    expect(body.evaluation).toMatchObject({
      recoverability: 'high',
      plan: goodEvaluation.plan,
      recordedBy: world.technician.name,
      findings: [
        { part: 'heads', condition: 'ok', note: null },
        { part: 'electronics', condition: 'ok', note: null },
        { part: 'firmware', condition: 'ok', note: null },
        { part: 'surface', condition: 'degraded', note: 'A few weak sectors near the outer edge' },
      ],
    });
    expect(body.timeline.map((e) => e.kind).slice(-2)).toEqual(['evaluation_started', 'evaluation_recorded']);
    expect(body.timeline.at(-1)?.summary).toMatch(/recoverability high \(platter surface degraded\)/);
  });

  it('answers bad findings with 400 naming each field, and writes nothing', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    const before = await count(`SELECT count(*) AS n FROM referral_timeline WHERE referral_id = $1`, [c.id]);

    const res = await request(app)
      .put(`/api/lab/cases/${c.id}/evaluation`)
      .set(auth(world.technician.token))
      .send({
        findings: [
          { part: 'heads', condition: 'failed' },
          { part: 'heads', condition: 'ok' },
          { part: 'spindle', condition: 'ok' },
        ],
        recoverability: 'maybe',
        plan: '',
      });

    expect(res.status).toBe(400);
    const paths = (res.body.error.fields as { path: string }[]).map((f) => f.path);
    expect(paths).toEqual(expect.arrayContaining(['findings.2.part', 'recoverability', 'plan']));
    expect(await count(`SELECT count(*) AS n FROM lab_evaluations WHERE referral_id = $1`, [c.id])).toBe(0);
    expect(await count(`SELECT count(*) AS n FROM referral_timeline WHERE referral_id = $1`, [c.id])).toBe(before);
    const [{ status }] = await db.query(`SELECT status FROM referrals WHERE id = $1`, [c.id]);
    expect(status).toBe('received');

    const refined = await request(app)
      .put(`/api/lab/cases/${c.id}/evaluation`)
      .set(auth(world.technician.token))
      .send({ findings: [{ part: 'heads', condition: 'failed' }, { part: 'heads', condition: 'ok' }], recoverability: 'high', plan: 'x' });
    expect((refined.body.error.fields as { path: string }[]).map((f) => f.path).sort()).toEqual(['findings.0.note', 'findings.1.part']);
  });

  it('ends the case as no recovery on "none": no charge, nothing owed, and the customer is told with a link', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);

    const res = await request(app)
      .put(`/api/lab/cases/${c.id}/evaluation`)
      .set(auth(world.technician.token))
      .send({
        findings: [
          { part: 'heads', condition: 'failed', note: 'Heads crashed; deep rings on every surface' },
          { part: 'surface', condition: 'failed', note: 'Media scraped down to the substrate' },
        ],
        recoverability: 'none',
        plan: 'Platters are scored through the magnetic layer; nothing can be read back.',
      });

    expect(res.status).toBe(200);
    const body = labCaseDto.parse(res.body);
    expect(body.status).toBe('no_recovery');
    expect(body.timeline.at(-1)).toMatchObject({ kind: 'no_recovery', summary: expect.stringContaining('No charge to the customer') });
    expect(body.quote).toBeNull();
    expect(body.payment.state).toBe('unpaid');
    // Nothing is owed to anyone: no ledger transaction, no earning line for the case.
    expect(await count(`SELECT count(*) AS n FROM ledger_transactions WHERE referral_id = $1`, [c.id])).toBe(0);
    expect(await count(`SELECT count(*) AS n FROM earning_lines WHERE referral_id = $1`, [c.id])).toBe(0);
    const token = await linkFromOutbox(ctx, c.customerEmail, 'customer_no_recovery');
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);

    const quote = await request(app)
      .post(`/api/lab/cases/${c.id}/quote`)
      .set(auth(world.manager.token))
      .send({ lines: [{ kind: 'service', skill: 'logical', description: 'x', amountMinor: 100 }] });
    expect(quote.status).toBe(400);
  });

  it("answers another lab's case and an unknown case with 404", async () => {
    const world = await makeWorld();
    const other = await makeWorld();
    const theirs = await receivedCase(ctx, other);

    for (const path of [`/api/lab/cases/${theirs.id}`, `/api/lab/cases/${theirs.reference}`, '/api/lab/cases/00000000-0000-4000-8000-000000000000', '/api/lab/cases/nonsense']) {
      const res = await request(app).get(path).set(auth(world.technician.token));
      expect(res.status, path).toBe(404);
    }
    const res = await request(app).put(`/api/lab/cases/${theirs.id}/evaluation`).set(auth(world.technician.token)).send(goodEvaluation);
    expect(res.status).toBe(404);
    expect(await count(`SELECT count(*) AS n FROM lab_evaluations WHERE referral_id = $1`, [theirs.id])).toBe(0);
  });
});

describe('imaging progress', () => {
  it('waits for the payment, then starts recovery with the first report and works out the share done and the time left', async () => {
    const world = await makeWorld();
    const unpaid = await quotedCase(ctx, world);
    const early = await request(app).post(`/api/lab/cases/${unpaid.id}/imaging`).set(auth(world.technician.token)).send({ bytesRead: 0, rateBytesPerSec: 1 });
    expect(early.status).toBe(409);

    const c = await paidCase(ctx, world, payments.fake.url);
    // 500 GB at intake (SI: 10^9 bytes per GB); 125 GB passed over at 100 MB/s with 2 048 unreadable 512-byte sectors.
    const res = await request(app)
      .post(`/api/lab/cases/${c.id}/imaging`)
      .set(auth(world.technician.token))
      .send({ bytesRead: 125_000_000_000, unreadableSectors: 2048, rateBytesPerSec: 100_000_000 });

    expect(res.status).toBe(201);
    const body = labCaseDto.parse(res.body);
    expect(body.status).toBe('recovering');
    expect(body.imaging).toMatchObject({
      totalBytes: 500_000_000_000,
      bytesRead: 125_000_000_000,
      unreadableBytes: 2048 * 512,
      copiedBytes: 125_000_000_000 - 2048 * 512,
      percent: 25,
      // 375 GB left ÷ 100 MB/s = 3 750 s.
      remainingSeconds: 3750,
      finished: false,
      reportedBy: world.technician.name,
    });
    expect(new Date(body.imaging!.eta!).getTime() - new Date(body.imaging!.reportedAt).getTime()).toBe(3_750_000);
    expect(body.timeline.at(-1)).toMatchObject({ kind: 'imaging_started', summary: expect.stringContaining('500 GB') });

    // A stalled imager (rate 0) has no honest estimate; reaching the end writes "finished" once.
    const stalled = await request(app).post(`/api/lab/cases/${c.id}/imaging`).set(auth(world.technician.token)).send({ bytesRead: 300_000_000_000, rateBytesPerSec: 0 });
    expect(stalled.body.imaging).toMatchObject({ remainingSeconds: null, eta: null, percent: 60 });
    await request(app).post(`/api/lab/cases/${c.id}/imaging`).set(auth(world.technician.token)).send({ bytesRead: 500_000_000_000, unreadableSectors: 10, rateBytesPerSec: 0 });
    const done = await request(app).post(`/api/lab/cases/${c.id}/imaging`).set(auth(world.technician.token)).send({ bytesRead: 500_000_000_000, unreadableSectors: 8, rateBytesPerSec: 0 });
    expect(done.body.imaging).toMatchObject({ finished: true, remainingSeconds: 0 });
    expect(done.body.timeline.filter((e: { kind: string }) => e.kind === 'imaging_finished')).toHaveLength(1);

    // The shop sees the same progress on its panel.
    const shop = await request(app).get(`/api/referrals/${c.id}/lab-work`).set(auth(world.shopStaff.token));
    expect(shop.status).toBe(200);
    expect(shop.body.imaging).toMatchObject({ percent: 100, finished: true });
  });

  it('refuses impossible reports with field errors and stores nothing', async () => {
    const world = await makeWorld();
    const c = await paidCase(ctx, world, payments.fake.url);
    for (const [body, path] of [
      [{ bytesRead: 600_000_000_000, rateBytesPerSec: 1 }, 'bytesRead'],
      [{ bytesRead: -1, rateBytesPerSec: 1 }, 'bytesRead'],
      [{ bytesRead: 10, unreadableSectors: 1, rateBytesPerSec: 1 }, 'unreadableSectors'],
      [{ bytesRead: 10, rateBytesPerSec: 1, sectorSizeBytes: 1000 }, 'sectorSizeBytes'],
      [{ bytesRead: 10 }, 'rateBytesPerSec'],
    ] as const) {
      const res = await request(app).post(`/api/lab/cases/${c.id}/imaging`).set(auth(world.technician.token)).send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect((res.body.error.fields as { path: string }[]).map((f) => f.path)).toContain(path);
    }
    expect(await count(`SELECT count(*) AS n FROM imaging_reports WHERE referral_id = $1`, [c.id])).toBe(0);
    const [{ status }] = await db.query(`SELECT status FROM referrals WHERE id = $1`, [c.id]);
    expect(status).toBe('paid');
  });

  it("takes reports from the lab's own tooling with a lab key, and refuses revoked, shop and other labs' keys", async () => {
    const world = await makeWorld();
    const other = await makeWorld();
    const c = await paidCase(ctx, world, payments.fake.url);
    const created = await request(app).post('/api/lab/api-keys').set(auth(world.manager.token)).send({ name: 'Imager bay 2' });
    expect(created.status).toBe(201);
    const key = created.body.key as string;
    expect(key).toMatch(/^ppk_live_[a-z0-9]{12}_/);
    // Stored only as its SHA-256.
    const [stored] = await db.query(`SELECT secret_hash FROM api_keys WHERE id = $1`, [created.body.id]);
    // The secret is everything after the prefix (it may itself hold "_"); the row keeps its SHA-256, not it.
    const secret = key.slice('ppk_live_'.length + 12 + 1);
    expect(stored.secret_hash).toBe(createHash('sha256').update(secret).digest('hex'));
    expect(stored.secret_hash).not.toContain(secret);

    const res = await request(app)
      .post(`/api/lab/cases/${c.reference}/imaging`)
      .set({ Authorization: `Bearer ${key}` })
      .send({ bytesRead: 50_000_000_000, totalBytes: 500_107_862_016, rateBytesPerSec: 120_000_000 });
    expect(res.status).toBe(201);
    expect(res.body.imaging).toMatchObject({ totalBytes: 500_107_862_016, reportedBy: 'Lab tool “Imager bay 2” (' + created.body.prefix + ')' });
    expect(res.body.timeline.at(-1).actor).toEqual({ type: 'api_key', name: expect.stringContaining('Imager bay 2') });

    // The lab's key opens only that lab's cases; a shop's partner key is not a lab key.
    const otherKey = (await request(app).post('/api/lab/api-keys').set(auth(other.manager.token)).send({ name: 'Their imager' })).body.key as string;
    expect((await request(app).post(`/api/lab/cases/${c.id}/imaging`).set({ Authorization: `Bearer ${otherKey}` }).send({ bytesRead: 1, rateBytesPerSec: 1 })).status).toBe(404);
    const shopKey = await request(app).post('/api/partner/api-keys').set(auth(world.shopStaff.token)).send({ name: 'Ticketing' });
    expect(shopKey.status).toBe(403);

    const revoked = await request(app).delete(`/api/lab/api-keys/${created.body.id}`).set(auth(world.manager.token));
    expect(revoked.body.revokedAt).not.toBeNull();
    const refused = await request(app).post(`/api/lab/cases/${c.id}/imaging`).set({ Authorization: `Bearer ${key}` }).send({ bytesRead: 1, rateBytesPerSec: 1 });
    expect(refused.status).toBe(401);
    expect(refused.headers['www-authenticate']).toMatch(/invalid_token/);
    // Only the lab manager manages keys.
    expect((await request(app).post('/api/lab/api-keys').set(auth(world.technician.token)).send({ name: 'x' })).status).toBe(403);
  });

  // Common practice in the trade, no published source: cloning takes from about half an hour (a healthy
  // small drive) to a couple of weeks (a large, damaged one). bytes ÷ sustained rate, SI prefixes.
  it('estimates imaging times inside the trade’s range: a healthy small drive in about half an hour, a large damaged one in about two weeks', async () => {
    const world = await makeWorld();
    const small = await paidCase(ctx, world, payments.fake.url, deletedPhotosDrive({ device: { mediaType: 'ssd_sata', capacityGb: 250 } }));
    const healthy = await request(app).post(`/api/lab/cases/${small.id}/imaging`).set(auth(world.technician.token)).send({ bytesRead: 0, rateBytesPerSec: 150_000_000 });
    // 250 GB at 150 MB/s (a healthy SATA drive read sequentially) = 1 667 s ≈ 28 min.
    expect(healthy.body.imaging.remainingSeconds).toBeGreaterThan(15 * 60);
    expect(healthy.body.imaging.remainingSeconds).toBeLessThan(60 * 60);

    const large = await paidCase(ctx, world, payments.fake.url, deletedPhotosDrive({ device: { mediaType: 'hdd_3_5', capacityGb: 16_000 } }));
    const damaged = await request(app).post(`/api/lab/cases/${large.id}/imaging`).set(auth(world.technician.token)).send({ bytesRead: 0, rateBytesPerSec: 15_000_000 });
    // 16 TB at 15 MB/s (weak heads, slow retries on bad areas) = 1 066 667 s ≈ 12.3 days.
    expect(damaged.body.imaging.remainingSeconds / 86_400).toBeGreaterThan(7);
    expect(damaged.body.imaging.remainingSeconds / 86_400).toBeLessThan(21);
  });
});

describe('recovered-file manifest', () => {
  async function recoveringCase(world: Awaited<ReturnType<typeof makeWorld>>) {
    const c = await paidCase(ctx, world, payments.fake.url);
    const res = await request(app).post(`/api/lab/cases/${c.id}/imaging`).set(auth(world.technician.token)).send({ bytesRead: 500_000_000_000, rateBytesPerSec: 0 });
    expect(res.status).toBe(201);
    return c;
  }

  it("groups the uploaded CSV into the customer's priorities by file type, marks the case ready for review and e-mails the customer", async () => {
    const world = await makeWorld();
    const c = await recoveringCase(world);

    const res = await request(app)
      .post(`/api/lab/cases/${c.id}/manifest`)
      .set(auth(world.technician.token))
      .attach('manifest', Buffer.from(manifestCsv), { filename: 'recovered.csv', contentType: 'text/csv' });

    expect(res.status).toBe(201);
    const body = labCaseDto.parse(res.body);
    expect(body.status).toBe('ready_for_review');
    expect(body.manifest).toMatchObject({ version: 1, fileCount: 6, review: { status: 'pending', at: null, note: null } });
    // The customer's priorities first, in their order (photos, documents); then the rest (mime-db: .mp3 is audio → other).
    expect(body.manifest!.categories.map((x) => [x.category, x.priority, x.files, x.intact, x.partial, x.unreadable])).toEqual([
      ['photos', 0, 3, 2, 1, 0],
      ['documents', 1, 2, 1, 0, 1],
      ['other', null, 1, 1, 0, 0],
    ]);
    expect(body.manifest!.categories[0]!.note).toBe('2019–2023 family photos');
    expect(body.manifest!.categories[1]!.examples).toEqual([
      { path: 'Documents/Taxes/2023-return.pdf', state: 'intact' },
      { path: 'Documents/Letters/To "Nan".docx', state: 'unreadable' },
    ]);
    expect(body.timeline.at(-1)).toMatchObject({ kind: 'files_ready', summary: expect.stringContaining('6 files (4 intact, 1 partly readable, 1 unreadable)') });
    await linkFromOutbox(ctx, c.customerEmail, 'customer_files_ready');
    const [blob] = await db.query(`SELECT content_hash, size_bytes FROM recovered_file_manifests WHERE referral_id = $1`, [c.id]);
    expect(blob.size_bytes).toBe(Buffer.byteLength(manifestCsv));
  });

  it('refuses a manifest with bad lines, naming each line, and saves nothing', async () => {
    const world = await makeWorld();
    const c = await recoveringCase(world);
    const bad = ['path,size,state', 'a.jpg,12,intact', 'b.jpg,twelve,intact', ',5,intact', 'c.jpg,5,lost', 'd.jpg,5'].join('\n');

    const res = await request(app)
      .post(`/api/lab/cases/${c.id}/manifest`)
      .set(auth(world.technician.token))
      .attach('manifest', Buffer.from(bad), { filename: 'recovered.csv', contentType: 'text/csv' });

    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe('The file list has 4 problems; nothing was saved');
    expect(res.body.error.fields).toEqual([
      { path: 'manifest.line3.size', message: 'Line 3: size must be a whole number of bytes, found "twelve"' },
      { path: 'manifest.line4.path', message: 'Line 4: path is empty' },
      { path: 'manifest.line5.state', message: 'Line 5: state must be intact, partial or unreadable, found "lost"' },
      { path: 'manifest.line6', message: 'Line 6: expected 3 fields (path,size,state), found 2' },
    ]);
    for (const [bytes, message] of [
      [Buffer.from([0x70, 0x61, 0x74, 0x68, 0xff, 0xfe]), /not UTF-8/],
      [Buffer.from('path,size,state\n'), /no files/],
      [Buffer.from('name,bytes\nx,1\n'), /expected the header path,size,state/],
    ] as const) {
      const r = await request(app).post(`/api/lab/cases/${c.id}/manifest`).set(auth(world.technician.token)).attach('manifest', bytes, { filename: 'x.csv' });
      expect(r.status).toBe(400);
      expect(JSON.stringify(r.body.error.fields)).toMatch(message);
    }
    const missing = await request(app).post(`/api/lab/cases/${c.id}/manifest`).set(auth(world.technician.token)).send({});
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields[0].path).toBe('manifest');
    expect(await count(`SELECT count(*) AS n FROM recovered_file_manifests WHERE referral_id = $1`, [c.id])).toBe(0);
    const [{ status }] = await db.query(`SELECT status FROM referrals WHERE id = $1`, [c.id]);
    expect(status).toBe('recovering');
  });

  it('is uploaded by the lab’s tooling with a lab key too, and cannot come before recovery', async () => {
    const world = await makeWorld();
    const early = await receivedCase(ctx, world);
    const tooEarly = await request(app)
      .post(`/api/lab/cases/${early.id}/manifest`)
      .set(auth(world.technician.token))
      .attach('manifest', Buffer.from(manifestCsv), { filename: 'recovered.csv' });
    expect(tooEarly.status).toBe(409);

    const c = await recoveringCase(world);
    const key = (await request(app).post('/api/lab/api-keys').set(auth(world.manager.token)).send({ name: 'Recovery suite' })).body.key as string;
    const res = await request(app)
      .post(`/api/lab/cases/${c.id}/manifest`)
      .set({ Authorization: `Bearer ${key}` })
      .attach('manifest', Buffer.from(manifestCsv), { filename: 'recovered.csv' });
    expect(res.status).toBe(201);
    expect(res.body.manifest.uploadedBy).toMatch(/Recovery suite/);
  });
});
