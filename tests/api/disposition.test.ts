import { createHash } from 'node:crypto';
import { createRequire } from 'node:module';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { caseDispositionDto } from '@shared/schemas/disposition';
import { custodyLogDto } from '@shared/schemas/custody';
import type { ReferralInput } from '@shared/schemas/referrals';
import { setupApi, signIn } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';
import { auth, deletedPhotosDrive, goodEvaluation, labWorlds, receivedCase, type LabWorld } from '../support/lab-work';

/** pdf-parse v1's index reads a sample PDF when loaded as a main module; its library file does not. */
const pdfParse = createRequire(import.meta.url)('pdf-parse/lib/pdf-parse.js') as (data: Buffer) => Promise<{ text: string }>;

const uploadDir = mkdtempSync(path.join(os.tmpdir(), 'platterpost-disposition-'));
afterAll(() => rmSync(uploadDir, { recursive: true, force: true }));
const ctx = await setupApi({ UPLOAD_DIR: uploadDir });
const { app, db } = ctx;

// North Dakota ZIP centroids at least 9 km apart, away from the demo network and the other files' worlds.
const makeWorld = labWorlds(ctx, ['58001', '58002', '58004', '58005', '58007', '58008', '58009', '58011', '58013', '58015', '58016', '58017', '58018', '58021']);
const network = (await signIn(app, 'ines.albright@platterpost.example')).accessToken;

const binary = (res: request.Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (d: Buffer) => chunks.push(d));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
};

/** Received at the world's lab, then evaluated as beyond recovery through the lab's API: the work is over. */
async function closableCase(world: LabWorld, input?: ReferralInput) {
  const c = await receivedCase(ctx, world, input);
  const evaluation = await request(app)
    .put(`/api/lab/cases/${c.id}/evaluation`)
    .set(auth(world.technician.token))
    .send({ ...goodEvaluation, findings: [{ part: 'surface', condition: 'failed', note: 'Platters scored all over' }], recoverability: 'none', plan: 'Nothing can be read back.' });
  expect(evaluation.status, JSON.stringify(evaluation.body)).toBe(200);
  const [row]: { status: string }[] = await db.query(`SELECT status FROM referrals WHERE id = $1`, [c.id]);
  expect(row!.status).toBe('no_recovery');
  return c;
}

const degaussOriginal = (overrides: Record<string, unknown> = {}) => ({
  outcome: 'sanitized',
  item: 'original_media',
  description: 'Examplar E-500 2.5" laptop drive',
  serialNumber: 'EX500-77812',
  level: 'purge',
  technique: 'degauss',
  techniqueDetails: 'Two passes in the chamber, rotated 90 degrees between them',
  tool: { name: 'Halberd Works HX-40 degausser', serialNumber: 'HX40-0193' },
  verification: { method: 'tool_report', note: 'Field-strength indicator reached rating both passes' },
  verified: true,
  destination: 'Electronics recycler after crushing',
  ...overrides,
});

const record = (world: LabWorld, caseId: string, body: object, token = world.technician.token) =>
  request(app).post(`/api/referrals/${caseId}/dispositions`).set(auth(token)).send(body);

const counts = async (caseId: string) => {
  const [row]: { dispositions: string; certificates: string; custody: string }[] = await db.query(
    `SELECT (SELECT count(*) FROM media_dispositions WHERE referral_id = $1) AS dispositions,
            (SELECT count(*) FROM sanitization_certificates WHERE referral_id = $1) AS certificates,
            (SELECT count(*) FROM custody_entries WHERE referral_id = $1) AS custody`,
    [caseId],
  );
  return { dispositions: Number(row!.dispositions), certificates: Number(row!.certificates), custody: Number(row!.custody) };
};

describe('POST /api/referrals/:id/dispositions (sanitized)', () => {
  it('sanitizes the original media: certificate issued and attached, custody entry written, case closed', async () => {
    const world = await makeWorld();
    const c = await closableCase(world);

    const res = await record(world, c.id, degaussOriginal());

    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const body = caseDispositionDto.parse(res.body);
    expect(body.referral.status).toBe('closed');
    expect(body).toMatchObject({ acceptsOriginal: false, acceptsFailedParts: true, originalDisposed: true });
    const [d] = body.dispositions;
    expect(d).toMatchObject({
      item: 'original_media',
      mediaType: 'hdd_2_5',
      outcome: 'sanitized',
      serialNumber: 'EX500-77812',
      sanitization: { level: 'purge', technique: 'degauss', tool: { name: 'Halberd Works HX-40 degausser' }, verification: { method: 'tool_report' } },
      performedBy: { id: world.technician.id, name: world.technician.name },
      lab: { id: world.lab.id, name: world.lab.name },
      custodySequence: 1,
    });
    expect(d!.sanitization!.basis).toMatch(/Appendix A: Purge by degaussing/);
    expect(d!.certificate).toMatchObject({ number: `SC-${c.reference}-1`, url: `/api/referrals/${c.id}/certificates/${d!.certificate!.id}.pdf` });
    expect(body.certificates).toEqual([{ ...d!.certificate, dispositionId: d!.id }]);

    const custody = custodyLogDto.parse((await request(app).get(`/api/referrals/${c.id}/custody`).set(auth(world.shopStaff.token))).body);
    expect(custody.entries.at(-1)).toMatchObject({ action: 'sanitized', actor: { id: world.technician.id }, details: { level: 'purge', technique: 'degauss', serialNumber: 'EX500-77812' } });
    expect(custody.verification).toEqual({ intact: true });
    const [cert]: { custody_head_hash: string }[] = await db.query(`SELECT custody_head_hash FROM sanitization_certificates WHERE id = $1`, [d!.certificate!.id]);
    expect(cert!.custody_head_hash).toBe(custody.headHash);

    const timeline: { kind: string; summary: string }[] = await db.query(
      `SELECT kind, summary FROM referral_timeline WHERE referral_id = $1 AND kind IN ('media_sanitized', 'closed') ORDER BY position`,
      [c.id],
    );
    expect(timeline.map((t) => t.kind)).toEqual(['media_sanitized', 'closed']);
    expect(timeline[0]!.summary).toContain('purge by degauss; certificate issued');
    const [audit]: { actor_user_id: string }[] = await db.query(`SELECT actor_user_id FROM audit_events WHERE action = 'disposition.sanitized' AND target_id = $1`, [c.id]);
    expect(audit!.actor_user_id).toBe(world.technician.id);
  });

  it('serves the certificate PDF to the shop and the lab, stored under its SHA-256, and hides it from another shop', async () => {
    const world = await makeWorld();
    const c = await closableCase(world);
    const created = caseDispositionDto.parse((await record(world, c.id, degaussOriginal())).body);
    const certificate = created.certificates[0]!;

    const res = await request(app).get(certificate.url).set(auth(world.shopStaff.token)).buffer(true).parse(binary);

    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const pdf = res.body as Buffer;
    expect(createHash('sha256').update(pdf).digest('hex')).toBe(certificate.sha256);
    expect(pdf.length).toBe(certificate.sizeBytes);
    const { text } = await pdfParse(pdf);
    for (const expected of ['Certificate of Sanitization', certificate.number, 'EX500-77812', 'Purge', 'Degauss', 'Halberd Works HX-40 degausser', world.technician.name, world.lab.name, 'NIST SP 800-88 Rev. 1']) {
      expect(text).toContain(expected);
    }
    expect((await request(app).get(certificate.url).set(auth(world.manager.token)).buffer(true).parse(binary)).status).toBe(200);
    expect((await request(app).get(certificate.url).set(auth(network)).buffer(true).parse(binary)).status).toBe(200);
    const otherShop = await createOrganization(db, 'partner');
    const stranger = await createUser(db, { role: 'partner_admin', organizationId: otherShop.id });
    expect((await request(app).get(certificate.url).set(auth((await signIn(app, stranger.email, TEST_PASSWORD)).accessToken))).status).toBe(404);
    const listed = caseDispositionDto.parse((await request(app).get(`/api/referrals/${c.id}/dispositions`).set(auth(world.shopStaff.token))).body);
    expect(listed.certificates.map((x) => x.number)).toEqual([certificate.number]);
  });

  it('refuses degaussing a USB flash drive with the reason as a 400 on technique, writing nothing (NIST SP 800-88 Rev. 1 Appendix A: flash has no degauss method)', async () => {
    const world = await makeWorld();
    const c = await closableCase(world, deletedPhotosDrive({ device: { mediaType: 'usb_flash', capacityGb: 64, interface: 'usb', make: 'Examplar', model: 'Stick 64' } }));

    const res = await record(world, c.id, degaussOriginal({ description: 'Examplar Stick 64 USB drive' }));

    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.fields).toEqual([{ path: 'technique', message: expect.stringContaining('Degauss on usb_flash (USB flash drive) does not sanitize this media') }]);
    expect(res.body.error.fields[0].message).toMatch(/electric charge, not magnetism/);
    expect(await counts(c.id)).toEqual({ dispositions: 0, certificates: 0, custody: 0 });
    const [row]: { status: string }[] = await db.query(`SELECT status FROM referrals WHERE id = $1`, [c.id]);
    expect(row!.status).toBe('no_recovery');
  });

  it('records the level the technique reaches when it exceeds the one asked for (shredding asked as clear is destroy)', async () => {
    const world = await makeWorld();
    const c = await closableCase(world);

    const res = await record(
      world,
      c.id,
      degaussOriginal({ level: 'clear', technique: 'shred', tool: { name: 'Millrace S-12 shredder' }, verification: { method: 'visual_inspection', note: 'Fragments under 20 mm' } }),
    );

    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.dispositions[0].sanitization).toMatchObject({ level: 'destroy', technique: 'shred' });
  });

  it('asks for a verification that fits the level: a read-back cannot verify destruction, a look cannot verify a purge (NIST SP 800-88 Rev. 1 §4.7, from memory)', async () => {
    const world = await makeWorld();
    const c = await closableCase(world);

    const shredReadBack = await record(world, c.id, degaussOriginal({ level: 'destroy', technique: 'shred', verification: { method: 'full_read_back' } }));
    const purgeByLooking = await record(world, c.id, degaussOriginal({ verification: { method: 'visual_inspection' } }));
    const notVerified = await record(world, c.id, degaussOriginal({ verified: false }));

    expect(shredReadBack.body.error.fields).toEqual([{ path: 'verification.method', message: expect.stringContaining('cannot be read back') }]);
    expect(purgeByLooking.body.error.fields).toEqual([{ path: 'verification.method', message: expect.stringContaining('read the media back') }]);
    expect(notVerified.status).toBe(400);
    expect(notVerified.body.error.fields).toEqual([{ path: 'verified', message: expect.stringContaining('Confirm that the verification passed') }]);
    expect(await counts(c.id)).toEqual({ dispositions: 0, certificates: 0, custody: 0 });
  });
});

// NIST SP 800-88 Rev. 1, "Guidelines for Media Sanitization" (December 2014), Appendix A, from memory:
// one table per media kind with its Clear, Purge and Destroy methods. A few representative rows through
// the API, as failed parts of one case (each names its own media type); the expected answers are the
// appendix's, written here independently of the rules table in shared/domain/sanitization.ts.
describe('NIST SP 800-88 Rev. 1 Appendix A through the API', () => {
  let world: LabWorld;
  let caseId: string;
  beforeAll(async () => {
    world = await makeWorld();
    caseId = (await closableCase(world)).id;
  });

  type Row = [mediaType: string, technique: string, level: string, conditions: { selfEncrypting?: boolean; driveCommand?: boolean }, expected: 'accepted' | 'technique' | 'level', source: string];
  const rows: Row[] = [
    ['hdd_3_5', 'overwrite', 'clear', {}, 'accepted', 'ATA hard disk drives — Clear: overwrite all user-addressable locations'],
    ['hdd_3_5', 'overwrite', 'purge', { driveCommand: true }, 'accepted', 'ATA hard disk drives — Purge: the drive’s SANITIZE OVERWRITE or SECURITY ERASE UNIT command'],
    ['hdd_3_5', 'overwrite', 'purge', {}, 'level', 'ATA hard disk drives — a host overwrite is Clear only'],
    ['hdd_2_5', 'degauss', 'purge', {}, 'accepted', 'ATA hard disk drives — Purge: degauss with a degausser of adequate strength'],
    ['hdd_3_5', 'shred', 'destroy', {}, 'accepted', 'hard disk drives — Destroy: shred, disintegrate, pulverize or incinerate'],
    ['hdd_3_5', 'crush', 'destroy', {}, 'technique', 'hard disk drives — crushing is not among the Destroy methods'],
    ['hdd_3_5', 'block_erase', 'purge', {}, 'technique', 'hard disk drives — no block erase on magnetic media'],
    ['ssd_sata', 'block_erase', 'purge', {}, 'accepted', 'ATA solid state drives — Purge: SANITIZE BLOCK ERASE'],
    ['ssd_sata', 'cryptographic_erase', 'purge', { selfEncrypting: true }, 'accepted', 'ATA solid state drives — Purge: cryptographic erase on a self-encrypting drive'],
    ['ssd_sata', 'cryptographic_erase', 'purge', {}, 'technique', 'cryptographic erase needs a drive that encrypts all stored data'],
    ['ssd_m2_nvme', 'overwrite', 'purge', {}, 'level', 'NVMe solid state drives — overwrite through the host is Clear only'],
    ['ssd_m2_nvme', 'degauss', 'purge', {}, 'technique', 'flash-based media — degaussing does not apply'],
    ['usb_flash', 'overwrite', 'clear', {}, 'accepted', 'removable flash (USB drives) — Clear: overwrite'],
    ['usb_flash', 'disintegrate', 'destroy', {}, 'accepted', 'removable flash — Destroy: shred, disintegrate, pulverize or incinerate'],
    ['memory_card', 'block_erase', 'purge', {}, 'technique', 'memory cards — Purge: "see Destroy"'],
    ['memory_card', 'degauss', 'purge', {}, 'technique', 'memory cards are flash — degaussing does not apply'],
    ['phone', 'cryptographic_erase', 'purge', { selfEncrypting: true }, 'accepted', 'mobile devices — Purge: the built-in erase on a device with storage encryption'],
    ['phone', 'degauss', 'purge', {}, 'technique', 'mobile devices are flash — degaussing does not apply'],
    ['tape', 'degauss', 'purge', {}, 'accepted', 'magnetic tape — Purge: degauss'],
    ['tape', 'overwrite', 'clear', {}, 'accepted', 'magnetic tape — Clear: re-record (overwrite)'],
  ];

  it.each(rows)('%s by %s to %s %o: %s (%s)', async (mediaType, technique, level, conditions, expected) => {
    const before = await counts(caseId);
    const res = await record(world, caseId, {
      outcome: 'sanitized',
      item: 'failed_part',
      description: `Failed part: ${mediaType}`,
      mediaType,
      level,
      technique,
      ...conditions,
      tool: { name: 'Bench tool' },
      verification: { method: level === 'destroy' ? 'visual_inspection' : 'sampled_read_back' },
      verified: true,
    });

    if (expected === 'accepted') {
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      const d = res.body.dispositions.at(-1);
      expect(d).toMatchObject({ item: 'failed_part', mediaType, sanitization: { technique, level } });
      expect(d.certificate).not.toBeNull();
      expect(await counts(caseId)).toEqual({ dispositions: before.dispositions + 1, certificates: before.certificates + 1, custody: before.custody + 1 });
    } else {
      expect(res.status).toBe(400);
      expect(res.body.error.fields).toEqual([{ path: expected, message: expect.stringMatching(expected === 'technique' ? /does not sanitize this media/ : /reaches clear, not purge/) }]);
      expect(await counts(caseId)).toEqual(before);
    }
  });
});

describe('POST /api/referrals/:id/dispositions (returned, and the rules around it)', () => {
  it('records the original media as returned to the shop: custody entry, no certificate, case closed', async () => {
    const world = await makeWorld();
    const c = await closableCase(world);

    const res = await record(world, c.id, { outcome: 'returned', item: 'original_media', description: 'Examplar E-500', serialNumber: 'EX500-1', returnedTo: 'shop', trackingCode: 'RW7781' });

    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.referral.status).toBe('closed');
    expect(res.body.dispositions[0]).toMatchObject({ outcome: 'returned', returned: { to: 'shop', trackingCode: 'RW7781' }, sanitization: null, certificate: null });
    expect(res.body.certificates).toEqual([]);
    const custody = custodyLogDto.parse((await request(app).get(`/api/referrals/${c.id}/custody`).set(auth(world.shopStaff.token))).body);
    expect(custody.entries.map((e) => e.action)).toEqual(['returned']);
    expect(custody.entries[0]!.details).toMatchObject({ returnedTo: 'shop', trackingCode: 'RW7781' });
  });

  it('takes failed parts before and after the original media, but the original only once', async () => {
    const world = await makeWorld();
    const c = await closableCase(world);
    const part = { outcome: 'sanitized', item: 'failed_part', description: 'Head stack from the customer’s drive', level: 'destroy', technique: 'shred', tool: { name: 'Millrace S-12 shredder' }, verification: { method: 'visual_inspection' }, verified: true };

    expect((await record(world, c.id, part)).status).toBe(201);
    expect((await record(world, c.id, degaussOriginal())).status).toBe(201);
    const again = await record(world, c.id, degaussOriginal());
    const afterClosing = await record(world, c.id, { ...part, description: 'Preamp board' });

    expect(again.status).toBe(409);
    expect(afterClosing.status).toBe(201);
    expect(afterClosing.body.dispositions.map((d: { description: string }) => d.description)).toEqual(['Head stack from the customer’s drive', 'Examplar E-500 2.5" laptop drive', 'Preamp board']);
    expect(afterClosing.body.certificates.map((x: { number: string }) => x.number)).toEqual([`SC-${c.reference}-1`, `SC-${c.reference}-2`, `SC-${c.reference}-3`]);
  });

  it('answers 409 while the work goes on, 403 to the shop and 404 to another lab', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    const otherLab = await createOrganization(db, 'lab');
    const otherTech = await createUser(db, { role: 'lab_technician', organizationId: otherLab.id });

    const tooEarly = await record(world, c.id, degaussOriginal());
    const shop = await record(world, c.id, degaussOriginal(), world.shopStaff.token);
    const stranger = await record(world, c.id, degaussOriginal(), (await signIn(app, otherTech.email, TEST_PASSWORD)).accessToken);

    expect(tooEarly.status).toBe(409);
    expect(tooEarly.body.error.message).toMatch(/once the work on the case is over/);
    expect(shop.status).toBe(403);
    expect(stranger.status).toBe(404);
    expect(await counts(c.id)).toEqual({ dispositions: 0, certificates: 0, custody: 0 });
  });

  it('answers field errors for a body that is not a disposition', async () => {
    const world = await makeWorld();
    const c = await closableCase(world);

    const res = await record(world, c.id, { outcome: 'sanitized', item: 'original_media', description: '', level: 'erase', technique: 'magnet', tool: {}, verification: {}, verified: true });

    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['description', 'level', 'technique', 'tool.name', 'verification.method']);
  });
});
