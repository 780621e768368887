import { createHash, createPublicKey, generateKeyPairSync, verify } from 'node:crypto';
import { createRequire } from 'node:module';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { canonicalEntry, sha256Hex } from '@shared/domain/custody-chain';
import { custodyLogDto, custodySigningKeyDto, custodyStatementText, type CustodyEntryDto } from '@shared/schemas/custody';
import { appendCustody, type CustodyInput } from '../../server/custody';
import { setupApi, signIn, unique } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';
import { auth, deletedPhotosDrive, labWorlds, receivedCase, type LabWorld } from '../support/lab-work';

/** pdf-parse v1's index reads a sample PDF when loaded as a main module; its library file does not. */
const pdfParse = createRequire(import.meta.url)('pdf-parse/lib/pdf-parse.js') as (data: Buffer) => Promise<{ text: string }>;

const uploadDir = mkdtempSync(path.join(os.tmpdir(), 'platterpost-custody-'));
afterAll(() => rmSync(uploadDir, { recursive: true, force: true }));
const ctx = await setupApi({ UPLOAD_DIR: uploadDir });
const { app, db } = ctx;

// Montana ZIP centroids at least 8 km apart, away from the demo network and the other files' worlds.
const makeWorld = labWorlds(ctx, [
  '59001', '59002', '59003', '59006', '59007', '59008', '59010', '59011', '59012', '59013', '59014', '59015', '59016', '59018', '59019',
  '59020', '59022', '59024', '59025', '59027', '59028', '59030', '59032', '59033', '59034', '59035',
]);
const network = (await signIn(app, 'ines.albright@platterpost.example')).accessToken;

const sha256 = (text: string) => createHash('sha256').update(text, 'utf8').digest('hex');

/** The world's lab also does forensic chain-of-custody work and accepts such cases by rule. */
async function forensicWorld(): Promise<LabWorld> {
  const world = await makeWorld();
  const [place]: { postal_code: string }[] = await db.query(`SELECT postal_code FROM organizations WHERE id = $1`, [world.lab.id]);
  const profile = await request(app)
    .put('/api/lab/profile')
    .set(auth(world.manager.token))
    .send({
      address: { line1: '12 Bench Road', postalCode: place!.postal_code, country: 'US' },
      timeZone: 'America/Chicago',
      businessHours: { opensAt: '09:00', closesAt: '17:00', workdays: [1, 2, 3, 4, 5], holidayCountry: 'US' },
      mediaTypes: ['hdd_3_5', 'hdd_2_5', 'ssd_sata', 'usb_flash', 'memory_card'],
      skills: [
        { skill: 'logical', turnaroundDays: 1 },
        { skill: 'forensic_custody', turnaroundDays: 1 },
      ],
      weeklyThroughput: 1000,
      queueCapacity: 1000,
      healthDataAgreement: { signed: false },
      acceptingNewCases: true,
      autoAcceptRules: [{ skills: ['logical', 'forensic_custody'], maxDistanceKm: 5 }],
    });
  expect(profile.status, JSON.stringify(profile.body)).toBe(200);
  return world;
}

const evidenceDrive = () => deletedPhotosDrive({ sensitivity: ['legal_evidence'], description: 'Drive seized for a civil case; the court needs the chain of custody.' });

function append(referralId: string, input: CustodyInput) {
  return db.transaction((manager) => appendCustody(manager, referralId, input));
}

/** The handling of a case from the shop's counter to the lab's bench, as the components record it. */
async function handle(referralId: string, world: LabWorld) {
  const base = Date.parse('2026-03-02T15:04:05.678Z');
  const steps: CustodyInput[] = [
    { action: 'packed_by_shop', actor: { type: 'user', id: world.shopStaff.id, name: world.shopStaff.name }, location: `${world.shop.name}, ${world.shop.city}`, details: { sealNumber: 'S-41877' }, at: new Date(base) },
    { action: 'handed_to_carrier', actor: { type: 'carrier', name: 'Ridgeway Parcel' }, location: 'Carrier drop-off', details: { trackingCode: 'RW1001' }, at: new Date(base + 3_600_000) },
    { action: 'delivered', actor: { type: 'carrier', name: 'Ridgeway Parcel' }, location: `${world.lab.name} receiving dock`, details: { trackingCode: 'RW1001' }, at: new Date(base + 86_400_000) },
    { action: 'checked_in', actor: { type: 'user', id: world.clerk.id, name: world.clerk.name }, location: `${world.lab.name}, intake desk`, details: { seal: 'intact', boxCondition: 'good' }, at: new Date(base + 90_000_000) },
  ];
  const entries: CustodyEntryDto[] = [];
  for (const step of steps) entries.push(await append(referralId, step));
  return entries;
}

/** Rewrites one stored entry as a superuser could: with the append-only trigger switched off for this transaction only. */
async function tamper(sql: string, params: unknown[]) {
  await db.transaction(async (manager) => {
    await manager.query(`SET LOCAL session_replication_role = replica`);
    await manager.query(sql, params);
  });
}

describe('SHA-256 under the custody chain', () => {
  it('hashes "abc" to the FIPS 180-4 example digest (NIST, SHA-256 example "abc": ba7816bf…f20015ad)', async () => {
    const expected = 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad';
    expect(await sha256Hex('abc')).toBe(expected);
    expect(sha256('abc')).toBe(expected);
  });
});

describe('appendCustody and GET /api/referrals/:id/custody', () => {
  it('carries the demo cases at the lab from the shop’s packing to check-in, intact', async () => {
    const [demo] = await db.query(`SELECT id FROM referrals WHERE customer_email = 'corinne.adebayomarsh@customer.example' ORDER BY created_at LIMIT 1`);
    expect(demo).toBeDefined();
    const res = await request(app).get(`/api/referrals/${demo.id}/custody`).set(auth(network));
    expect(res.status).toBe(200);
    const log = custodyLogDto.parse(res.body);
    expect(log.entries.slice(0, 4).map((e) => e.action)).toEqual(['packed_by_shop', 'handed_to_carrier', 'delivered', 'checked_in']);
    expect(log.verification).toEqual({ intact: true });
    const times = log.entries.map((e) => Date.parse(e.at));
    expect(times).toEqual([...times].sort((x, y) => x - y));
  });

  it('chains each entry to the one before: hash = SHA-256(previous hash + canonical entry), recomputed here with node:crypto', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    await handle(c.id, world);

    const res = await request(app).get(`/api/referrals/${c.id}/custody`).set(auth(world.shopStaff.token));

    expect(res.status).toBe(200);
    const log = custodyLogDto.parse(res.body);
    expect(log.entries.map((e) => [e.sequence, e.action])).toEqual([
      [1, 'packed_by_shop'],
      [2, 'handed_to_carrier'],
      [3, 'delivered'],
      [4, 'checked_in'],
    ]);
    expect(log.entries[1]).toMatchObject({ at: '2026-03-02T16:04:05.678Z', actor: { type: 'carrier', id: null, name: 'Ridgeway Parcel' }, location: 'Carrier drop-off', details: { trackingCode: 'RW1001' } });
    let previous: string | null = null;
    for (const e of log.entries) {
      const canonical = canonicalEntry({
        sequence: e.sequence,
        caseId: c.id,
        action: e.action,
        actor: JSON.stringify([e.actor.type, e.actor.id, e.actor.name]),
        at: e.at,
        location: e.location,
        details: e.details as Record<string, string>,
      });
      expect(e.previousHash).toBe(previous);
      expect(e.hash).toBe(sha256((previous ?? '') + canonical));
      previous = e.hash;
    }
    expect(log.headHash).toBe(previous);
    expect(log.verification).toEqual({ intact: true });
    expect(log.referral).toEqual({ id: c.id, reference: c.reference, legalEvidence: false });
    expect(log.signedExportAvailable).toBe(false);
    const [head]: { sequence: number; head_hash: string }[] = await db.query(`SELECT sequence, head_hash FROM custody_heads WHERE referral_id = $1`, [c.id]);
    expect(head).toEqual({ sequence: 4, head_hash: previous });
  });

  it('shows the log to the shop, the lab holding the case and the network admin, and answers 404 to another shop and another lab', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    await handle(c.id, world);
    const otherShop = await createOrganization(db, 'partner');
    const otherShopStaff = await createUser(db, { role: 'partner_admin', organizationId: otherShop.id });
    const otherLab = await createOrganization(db, 'lab');
    const otherTech = await createUser(db, { role: 'lab_technician', organizationId: otherLab.id });

    const as = async (token: string) => (await request(app).get(`/api/referrals/${c.id}/custody`).set(auth(token))).status;

    expect(await as(world.shopStaff.token)).toBe(200);
    expect(await as(world.technician.token)).toBe(200);
    expect(await as(world.clerk.token)).toBe(200);
    expect(await as(network)).toBe(200);
    expect(await as((await signIn(app, otherShopStaff.email, TEST_PASSWORD)).accessToken)).toBe(404);
    expect(await as((await signIn(app, otherTech.email, TEST_PASSWORD)).accessToken)).toBe(404);
    expect((await request(app).get(`/api/referrals/${c.id}/custody`)).status).toBe(401);
    expect((await request(app).get(`/api/referrals/${c.id.replace(/.$/, 'x')}/custody`).set(auth(network))).status).toBe(400);
  });

  it('gives concurrent appends for one case distinct sequences, each on the previous hash, so the chain stays intact', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);

    await Promise.all(
      Array.from({ length: 8 }, (_, i) =>
        append(c.id, { action: 'to_clean_bench', actor: { type: 'user', id: world.technician.id, name: world.technician.name }, location: `Bench ${i + 1}`, details: { i } }),
      ),
    );

    const log = custodyLogDto.parse((await request(app).get(`/api/referrals/${c.id}/custody`).set(auth(world.technician.token))).body);
    expect(log.entries.map((e) => e.sequence)).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(new Set(log.entries.map((e) => e.previousHash)).size).toBe(8);
    expect(log.verification).toEqual({ intact: true });
  });

  it('refuses an append for a case that does not exist', async () => {
    await expect(append('00000000-0000-4000-8000-000000000000', { action: 'imaged', actor: { type: 'system', name: 'test' }, location: null })).rejects.toMatchObject({ status: 404 });
  });
});

describe('the custody table is append-only', () => {
  it('refuses UPDATE and DELETE from the application with the trigger’s message, and the entry stays as it was', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    const [first] = await handle(c.id, world);

    await expect(db.query(`UPDATE custody_entries SET location = 'somewhere else' WHERE id = $1`, [first!.id])).rejects.toThrow(/append-only: UPDATE is not allowed/);
    await expect(db.query(`DELETE FROM custody_entries WHERE id = $1`, [first!.id])).rejects.toThrow(/append-only: DELETE is not allowed/);

    const [row]: { location: string }[] = await db.query(`SELECT location FROM custody_entries WHERE id = $1`, [first!.id]);
    expect(row!.location).toBe(first!.location);
  });
});

describe('verification of a changed log', () => {
  it('detects an entry changed behind the trigger’s back at that entry', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    const entries = await handle(c.id, world);

    await tamper(`UPDATE custody_entries SET location = 'Unrecorded locker' WHERE id = $1`, [entries[1]!.id]);

    const log = custodyLogDto.parse((await request(app).get(`/api/referrals/${c.id}/custody`).set(auth(network))).body);
    expect(log.verification).toEqual({ intact: false, firstBrokenSequence: 2, reason: expect.stringContaining('entry 2 does not match its stored hash') });
    expect(log.entries[1]!.location).toBe('Unrecorded locker');
  });

  it('detects a changed detail deeper in the log at its own entry, not earlier', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    const entries = await handle(c.id, world);

    await tamper(`UPDATE custody_entries SET details = jsonb_set(details, '{seal}', '"broken"') WHERE id = $1`, [entries[3]!.id]);

    const log = custodyLogDto.parse((await request(app).get(`/api/referrals/${c.id}/custody`).set(auth(world.shopStaff.token))).body);
    expect(log.verification).toMatchObject({ intact: false, firstBrokenSequence: 4 });
  });

  it('detects a removed last entry by the head kept beside the log', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    const entries = await handle(c.id, world);

    await tamper(`DELETE FROM custody_entries WHERE id = $1`, [entries[3]!.id]);

    const log = custodyLogDto.parse((await request(app).get(`/api/referrals/${c.id}/custody`).set(auth(network))).body);
    expect(log.entries).toHaveLength(3);
    expect(log.verification).toMatchObject({ intact: false, firstBrokenSequence: 4, reason: expect.stringContaining('expected head') });
  });

  it('detects an entry whose hash was recomputed to fit the change, at that entry, through the next link', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    const entries = await handle(c.id, world);
    const changed = { ...entries[1]!, location: 'Back room' };
    const forged = sha256(
      entries[0]!.hash +
        canonicalEntry({ sequence: 2, caseId: c.id, action: changed.action, actor: JSON.stringify(['carrier', null, 'Ridgeway Parcel']), at: changed.at, location: changed.location, details: changed.details as Record<string, string> }),
    );

    await tamper(`UPDATE custody_entries SET location = 'Back room', hash = $2 WHERE id = $1`, [entries[1]!.id, forged]);

    const log = custodyLogDto.parse((await request(app).get(`/api/referrals/${c.id}/custody`).set(auth(network))).body);
    // Entry 2 now matches its own hash, so the chain breaks where entry 3 was computed from the old one.
    expect(log.verification).toMatchObject({ intact: false, firstBrokenSequence: 3 });
  });
});

describe('POST /api/referrals/:id/custody (handling inside the lab)', () => {
  it('lets the lab holding the case record a move to the clean bench, with the lab’s place and the person', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    await handle(c.id, world);

    const res = await request(app).post(`/api/referrals/${c.id}/custody`).set(auth(world.technician.token)).send({ action: 'to_clean_bench', location: 'Clean bench 2', note: 'Head swap prep' });

    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({
      sequence: 5,
      action: 'to_clean_bench',
      actor: { type: 'user', id: world.technician.id, name: world.technician.name },
      location: expect.stringMatching(new RegExp(`^${world.lab.name}.*\\(Clean bench 2\\)$`)),
      details: { note: 'Head swap prep' },
    });
    const log = custodyLogDto.parse((await request(app).get(`/api/referrals/${c.id}/custody`).set(auth(world.shopStaff.token))).body);
    expect(log.entries.at(-1)!.previousHash).toBe(log.entries.at(-2)!.hash);
    expect(log.verification).toEqual({ intact: true });
  });

  it('refuses the shop (403), another lab (404), an action the components record themselves (400) and a missing place (400)', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    const otherLab = await createOrganization(db, 'lab');
    const otherTech = await createUser(db, { role: 'lab_technician', organizationId: otherLab.id });
    const otherToken = (await signIn(app, otherTech.email, TEST_PASSWORD)).accessToken;
    const post = (token: string, body: object) => request(app).post(`/api/referrals/${c.id}/custody`).set(auth(token)).send(body);

    expect((await post(world.shopStaff.token, { action: 'to_clean_bench', location: 'Bench' })).status).toBe(403);
    expect((await post(otherToken, { action: 'to_clean_bench', location: 'Bench' })).status).toBe(404);
    const wrongAction = await post(world.technician.token, { action: 'sanitized', location: 'Bench' });
    expect(wrongAction.status).toBe(400);
    expect(wrongAction.body.error.fields).toEqual([{ path: 'action', message: expect.stringContaining('to_clean_bench') }]);
    const noPlace = await post(world.technician.token, { action: 'imaged', location: '  ' });
    expect(noPlace.body.error.fields).toEqual([{ path: 'location', message: expect.any(String) }]);
    expect(await db.query(`SELECT 1 FROM custody_entries WHERE referral_id = $1`, [c.id])).toEqual([]);
  });
});

describe('GET /api/referrals/:id/custody.pdf (signed export for legal evidence)', () => {
  it('exports the log as a PDF with the head hash and an Ed25519 signature that node:crypto verifies against the published key', async () => {
    const world = await forensicWorld();
    const c = await receivedCase(ctx, world, evidenceDrive());
    const entries = await handle(c.id, world);

    const res = await request(app).get(`/api/referrals/${c.id}/custody.pdf`).set(auth(world.shopStaff.token)).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (d: Buffer) => chunks.push(d));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });

    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const head = entries.at(-1)!.hash;
    expect(res.headers['x-custody-head-hash']).toBe(head);
    expect(res.headers['x-custody-entry-count']).toBe('4');
    const signature = res.headers['x-custody-signature'] as string;
    const exportedAt = res.headers['x-custody-exported-at'] as string;

    const key = custodySigningKeyDto.parse((await request(app).get('/api/custody/signing-key').set(auth(world.shopStaff.token))).body);
    expect(key).toMatchObject({ algorithm: 'Ed25519', development: true, keyId: res.headers['x-custody-key-id'] });
    const statement = custodyStatementText({ referralId: c.id, reference: c.reference, entryCount: 4, headHash: head, exportedAt });
    // Ed25519 (RFC 8032) through node:crypto: no digest name, the public key from the PEM the server publishes.
    const publicKey = createPublicKey(key.publicKeyPem);
    expect(verify(null, Buffer.from(statement), publicKey, Buffer.from(signature, 'base64'))).toBe(true);
    expect(verify(null, Buffer.from(statement.replace(head, entries[2]!.hash)), publicKey, Buffer.from(signature, 'base64'))).toBe(false);

    const { text } = await pdfParse(res.body as Buffer);
    expect(text).toContain(`Chain of custody: case ${c.reference}`);
    expect(text).toContain(head);
    expect(text).toContain(signature);
    for (const e of entries) expect(text).toContain(e.hash);
    expect(text).toContain('Signed with a development key');

    const [audit]: { actor_user_id: string; details: { headHash: string } }[] = await db.query(
      `SELECT actor_user_id, details FROM audit_events WHERE action = 'custody.exported' AND target_id = $1`,
      [c.id],
    );
    expect(audit).toMatchObject({ actor_user_id: world.shopStaff.id, details: { headHash: head } });
  });

  it('checks an export’s signature at POST /api/custody/verify, also after the log has grown, and refuses a forged one', async () => {
    const world = await forensicWorld();
    const c = await receivedCase(ctx, world, evidenceDrive());
    await handle(c.id, world);
    const res = await request(app).get(`/api/referrals/${c.id}/custody.pdf`).set(auth(network));
    const statement = {
      referralId: c.id,
      reference: c.reference,
      entryCount: Number(res.headers['x-custody-entry-count']),
      headHash: res.headers['x-custody-head-hash'] as string,
      exportedAt: res.headers['x-custody-exported-at'] as string,
      signature: res.headers['x-custody-signature'] as string,
    };
    await append(c.id, { action: 'to_clean_bench', actor: { type: 'user', id: world.technician.id, name: world.technician.name }, location: 'Clean bench 1' });

    const good = await request(app).post('/api/custody/verify').set(auth(world.technician.token)).send(statement);
    const forged = await request(app).post('/api/custody/verify').set(auth(world.technician.token)).send({ ...statement, entryCount: 3 });

    expect(good.body).toEqual({ signatureValid: true, matchesLog: true, keyId: res.headers['x-custody-key-id'] });
    expect(forged.body).toEqual({ signatureValid: false, matchesLog: null, keyId: res.headers['x-custody-key-id'] });
  });

  it('answers 409 for a case that is not legal evidence, and for a broken chain, signing nothing', async () => {
    const plain = await makeWorld();
    const c = await receivedCase(ctx, plain);
    await handle(c.id, plain);
    const notEvidence = await request(app).get(`/api/referrals/${c.id}/custody.pdf`).set(auth(plain.shopStaff.token));
    expect(notEvidence.status).toBe(409);
    expect(notEvidence.body.error.message).toMatch(/legal evidence/);

    const world = await forensicWorld();
    const e = await receivedCase(ctx, world, evidenceDrive());
    const entries = await handle(e.id, world);
    await tamper(`UPDATE custody_entries SET actor_name = 'Someone else' WHERE id = $1`, [entries[0]!.id]);
    const broken = await request(app).get(`/api/referrals/${e.id}/custody.pdf`).set(auth(network));
    expect(broken.status).toBe(409);
    expect(broken.body.error.message).toMatch(/fails verification at entry 1/);
    expect(broken.headers['x-custody-signature']).toBeUndefined();
  });

  it('signs with the configured CUSTODY_SIGNING_KEY and publishes its public key', async () => {
    const { privateKey, publicKey } = generateKeyPairSync('ed25519');
    const pem = privateKey.export({ type: 'pkcs8', format: 'pem' }).toString();
    const configured = await setupApi({ UPLOAD_DIR: uploadDir, CUSTODY_SIGNING_KEY: pem });
    const world = await forensicWorld();
    const c = await receivedCase(ctx, world, evidenceDrive());
    await handle(c.id, world);

    const key = custodySigningKeyDto.parse((await request(configured.app).get('/api/custody/signing-key').set(auth(network))).body);
    const res = await request(configured.app).get(`/api/referrals/${c.id}/custody.pdf`).set(auth(network));

    expect(key.development).toBe(false);
    expect(key.publicKeyPem).toBe(publicKey.export({ type: 'spki', format: 'pem' }).toString());
    const statement = custodyStatementText({
      referralId: c.id,
      reference: c.reference,
      entryCount: 4,
      headHash: res.headers['x-custody-head-hash'] as string,
      exportedAt: res.headers['x-custody-exported-at'] as string,
    });
    expect(verify(null, Buffer.from(statement), publicKey, Buffer.from(res.headers['x-custody-signature'] as string, 'base64'))).toBe(true);
  });

  it('refuses a signing key that is not Ed25519 at start, naming the variable', async () => {
    const rsa = generateKeyPairSync('rsa', { modulusLength: 2048 }).privateKey.export({ type: 'pkcs8', format: 'pem' }).toString();
    await expect(setupApi({ CUSTODY_SIGNING_KEY: rsa })).rejects.toThrow(/CUSTODY_SIGNING_KEY: CUSTODY_SIGNING_KEY must be an Ed25519 private key/);
  });
});

describe('a case reference in the log stays the case’s', () => {
  it('hashes the case id into each entry, so an entry moved to another case does not verify there', async () => {
    const world = await makeWorld();
    const a = await receivedCase(ctx, world, deletedPhotosDrive({ customer: { name: 'Ada Pell', email: `${unique('ada')}@customer.test` } }));
    const b = await receivedCase(ctx, world, deletedPhotosDrive({ customer: { name: 'Bo Pell', email: `${unique('bo')}@customer.test` } }));
    const [entry] = await handle(a.id, world);
    await append(b.id, { action: 'packed_by_shop', actor: { type: 'user', id: world.shopStaff.id, name: world.shopStaff.name }, location: 'Counter' });

    await tamper(
      `UPDATE custody_entries SET location = $2, details = $3::jsonb, at = $4, actor_type = 'user', actor_id = $5, actor_name = $6, hash = $7 WHERE referral_id = $1 AND sequence = 1`,
      [b.id, entry!.location, JSON.stringify(entry!.details), entry!.at, entry!.actor.id, entry!.actor.name, entry!.hash],
    );
    await tamper(`UPDATE custody_heads SET head_hash = $2 WHERE referral_id = $1`, [b.id, entry!.hash]);

    const log = custodyLogDto.parse((await request(app).get(`/api/referrals/${b.id}/custody`).set(auth(network))).body);
    expect(log.verification).toMatchObject({ intact: false, firstBrokenSequence: 1 });
  });
});
