import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import bwipjs from 'bwip-js/node';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { referralDto } from '@shared/schemas/referrals';
import { setupApi, signIn, unique } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';

const uploadDir = mkdtempSync(path.join(os.tmpdir(), 'platterpost-uploads-'));
afterAll(() => rmSync(uploadDir, { recursive: true, force: true }));
const { app, db } = await setupApi({ UPLOAD_DIR: uploadDir });

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');
const storedFile = (hash: string) => path.join(uploadDir, hash.slice(0, 2), hash);
const storedFiles = () => readdirSync(uploadDir, { recursive: true, withFileTypes: true }).filter((d) => d.isFile()).map((d) => d.name);

// Real PNGs drawn by bwip-js (each text gives other bytes); a JPEG by its SOI/JFIF signature
// (ITU-T T.81); a text file that only has an image's name and declared type.
const png = (text = unique('PP')) => bwipjs.toBuffer({ bcid: 'code128', text });
const jpeg = Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10]), Buffer.from('JFIF\0'), Buffer.alloc(200, 7)]);
const textFile = Buffer.from('Customer says the drive clicks. Not a photo.\n');

async function shop() {
  const org = await createOrganization(db, 'partner');
  const admin = await createUser(db, { role: 'partner_admin', organizationId: org.id });
  const staff = await createUser(db, { role: 'partner_staff', organizationId: org.id });
  const adminToken = (await signIn(app, admin.email, TEST_PASSWORD)).accessToken;
  const staffToken = (await signIn(app, staff.email, TEST_PASSWORD)).accessToken;
  const key = (await request(app).post('/api/partner/api-keys').set('Authorization', `Bearer ${adminToken}`).send({ name: 'Ticketing' })).body.key as string;
  return { org, staff, staffToken, adminToken, key };
}

async function lab() {
  const org = await createOrganization(db, 'lab');
  const clerk = await createUser(db, { role: 'shipping_clerk', organizationId: org.id });
  return { org, token: (await signIn(app, clerk.email, TEST_PASSWORD)).accessToken };
}

async function openCase(key: string): Promise<string> {
  const res = await request(app)
    .post('/api/v1/referrals')
    .set('Authorization', `Bearer ${key}`)
    .send({ customer: { name: 'Ravi Ostrander', email: 'ravi@example.com' }, device: { mediaType: 'hdd_3_5' }, symptoms: ['clicking'], origin: { postalCode: '85004' } });
  expect(res.status).toBe(201);
  return res.body.id;
}

const photoCount = async (referralId: string) => Number((await db.query(`SELECT count(*) FROM referral_photos WHERE referral_id = $1`, [referralId]))[0].count);

const a = await shop();
const b = await shop();
const network = (await signIn(app, 'ines.albright@platterpost.example')).accessToken;

describe('POST /api/referrals/:id/photos', () => {
  it('accepts a real PNG from the shop’s staff and stores it under the SHA-256 of its content', async () => {
    const id = await openCase(a.key);
    const image = await png();

    const res = await request(app).post(`/api/referrals/${id}/photos`).set('Authorization', `Bearer ${a.staffToken}`).attach('photos', image, 'front.png');

    expect(res.status).toBe(201);
    expect(res.body).toEqual([{ id: expect.any(String), url: `/api/photos/${res.body[0].id}`, contentType: 'image/png', sizeBytes: image.length, uploadedAt: expect.any(String) }]);
    const hash = sha256(image);
    expect(readFileSync(storedFile(hash)).equals(image)).toBe(true);
    const [row] = await db.query(`SELECT content_hash, content_type, size_bytes, uploaded_by_type, uploaded_by_id FROM referral_photos WHERE id = $1`, [res.body[0].id]);
    expect(row).toEqual({ content_hash: hash, content_type: 'image/png', size_bytes: image.length, uploaded_by_type: 'user', uploaded_by_id: a.staff.id });
  });

  it('refuses a text file renamed .jpg and declared image/jpeg, naming it, and stores nothing', async () => {
    const id = await openCase(a.key);
    const before = storedFiles().length;

    const res = await request(app)
      .post(`/api/referrals/${id}/photos`)
      .set('Authorization', `Bearer ${a.staffToken}`)
      .attach('photos', textFile, { filename: 'drive.jpg', contentType: 'image/jpeg' });

    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.fields).toEqual([{ path: 'photos.0', message: expect.stringContaining('drive.jpg') }]);
    expect(await photoCount(id)).toBe(0);
    expect(storedFiles().length).toBe(before);
  });

  it('refuses the whole upload when one photo is bad, with one field error per refusal', async () => {
    const id = await openCase(a.key);
    const good = await png();
    const res = await request(app)
      .post(`/api/referrals/${id}/photos`)
      .set('Authorization', `Bearer ${a.staffToken}`)
      .attach('photos', textFile, 'a.jpg')
      .attach('photos', good, 'b.png')
      .attach('photos', Buffer.from('%PDF-1.7\n%\xe2\xe3\n1 0 obj\n'), 'c.heic');

    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { path: string }) => f.path)).toEqual(['photos.0', 'photos.2']);
    expect(await photoCount(id)).toBe(0);
    expect(existsSync(storedFile(sha256(good)))).toBe(false);
  });

  it('stores a photo once on disk when it is uploaded to two cases, and once per case when uploaded twice', async () => {
    const first = await openCase(a.key);
    const second = await openCase(a.key);
    const image = await png();

    await request(app).post(`/api/referrals/${first}/photos`).set('Authorization', `Bearer ${a.staffToken}`).attach('photos', image, 'x.png');
    await request(app).post(`/api/referrals/${first}/photos`).set('Authorization', `Bearer ${a.staffToken}`).attach('photos', image, 'x-again.png');
    const res = await request(app).post(`/api/referrals/${second}/photos`).set('Authorization', `Bearer ${a.staffToken}`).attach('photos', image, 'y.png');

    expect(res.status).toBe(201);
    expect(await photoCount(first)).toBe(1);
    expect(await photoCount(second)).toBe(1);
    expect(storedFiles().filter((n) => n === sha256(image))).toHaveLength(1);
  });

  it('accepts at most 8 photos per case: the 9th is refused with a field error and nothing of that upload is stored', async () => {
    const id = await openCase(a.key);
    let req = request(app).post(`/api/referrals/${id}/photos`).set('Authorization', `Bearer ${a.staffToken}`);
    for (let i = 0; i < 6; i++) req = req.attach('photos', await png(), `p${i}.png`);
    expect((await req).status).toBe(201);

    let more = request(app).post(`/api/referrals/${id}/photos`).set('Authorization', `Bearer ${a.staffToken}`);
    for (let i = 0; i < 3; i++) more = more.attach('photos', await png(), `q${i}.png`);
    const res = await more;

    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([{ path: 'photos', message: expect.stringContaining('at most 2 more') }]);
    expect(await photoCount(id)).toBe(6);
  });

  it('refuses more than 8 photos in one upload', async () => {
    const id = await openCase(a.key);
    let req = request(app).post(`/api/referrals/${id}/photos`).set('Authorization', `Bearer ${a.staffToken}`);
    for (let i = 0; i < 9; i++) req = req.attach('photos', jpeg, `p${i}.jpg`);
    const res = await req;
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].path).toBe('photos');
    expect(await photoCount(id)).toBe(0);
  });

  it('refuses a photo over 10 MB, naming it', async () => {
    const id = await openCase(a.key);
    const big = Buffer.concat([jpeg, Buffer.alloc(10 * 1024 * 1024)]);
    const res = await request(app)
      .post(`/api/referrals/${id}/photos`)
      .set('Authorization', `Bearer ${a.staffToken}`)
      .attach('photos', await png(), 'small.png')
      .attach('photos', big, 'huge.jpg');
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([{ path: 'photos.1', message: expect.stringMatching(/huge\.jpg.*10 MB/) }]);
    expect(await photoCount(id)).toBe(0);
  });

  it('answers 400 when no photo is attached, or the images come in another field', async () => {
    const id = await openCase(a.key);
    const none = await request(app).post(`/api/referrals/${id}/photos`).set('Authorization', `Bearer ${a.staffToken}`).send({});
    const wrongField = await request(app).post(`/api/referrals/${id}/photos`).set('Authorization', `Bearer ${a.staffToken}`).attach('image', jpeg, 'a.jpg');
    expect(none.status).toBe(400);
    expect(none.body.error.fields[0].path).toBe('photos');
    expect(wrongField.status).toBe(400);
    expect(wrongField.body.error.fields[0]).toEqual({ path: 'image', message: expect.stringContaining('photos') });
  });

  it('answers 404 for another shop’s case and 403 for a lab user', async () => {
    const id = await openCase(a.key);
    const lab1 = await lab();
    const otherShop = await request(app).post(`/api/referrals/${id}/photos`).set('Authorization', `Bearer ${b.staffToken}`).attach('photos', jpeg, 'a.jpg');
    const labUser = await request(app).post(`/api/referrals/${id}/photos`).set('Authorization', `Bearer ${lab1.token}`).attach('photos', jpeg, 'a.jpg');
    expect(otherShop.status).toBe(404);
    expect(labUser.status).toBe(403);
    expect(await photoCount(id)).toBe(0);
  });

  it('shows the photos on the case and its timeline', async () => {
    const id = await openCase(a.key);
    const up = await request(app).post(`/api/referrals/${id}/photos`).set('Authorization', `Bearer ${a.staffToken}`).attach('photos', jpeg, 'a.jpg');
    const res = await request(app).get(`/api/v1/referrals/${id}`).set('Authorization', `Bearer ${a.key}`);
    expect(() => referralDto.parse(res.body)).not.toThrow();
    expect(res.body.timeline.map((e: { kind: string }) => e.kind)).toContain('photos_added');
    expect(up.body[0].contentType).toBe('image/jpeg');
  });
});

describe('GET /api/photos/:id', () => {
  const upload = async () => {
    const id = await openCase(a.key);
    const image = await png();
    const res = await request(app).post(`/api/referrals/${id}/photos`).set('Authorization', `Bearer ${a.staffToken}`).attach('photos', image, 'p.png');
    return { referralId: id, photoId: res.body[0].id as string, image };
  };

  it('streams the image to the shop, with the type recognised at upload and nosniff', async () => {
    const { photoId, image } = await upload();
    const res = await request(app).get(`/api/photos/${photoId}`).set('Authorization', `Bearer ${a.adminToken}`).buffer(true);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('image/png');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(Buffer.compare(res.body as Buffer, image)).toBe(0);
  });

  it('shows it to a lab the case was offered to and to the network admin', async () => {
    const { referralId, photoId } = await upload();
    const offered = await lab();
    await db.query(
      `INSERT INTO lab_offers (referral_id, lab_organization_id, status, offered_at, deadline, responded_at, decline_reason)
       VALUES ($1, $2, 'declined', now() - interval '2 hours', now() - interval '1 hour', now() - interval '90 minutes', 'no_capacity')`,
      [referralId, offered.org.id],
    );
    expect((await request(app).get(`/api/photos/${photoId}`).set('Authorization', `Bearer ${offered.token}`)).status).toBe(200);
    expect((await request(app).get(`/api/photos/${photoId}`).set('Authorization', `Bearer ${network}`)).status).toBe(200);
  });

  it('answers 404 to another shop and to a lab the case was never offered to', async () => {
    const { photoId } = await upload();
    const stranger = await lab();
    const otherShop = await request(app).get(`/api/photos/${photoId}`).set('Authorization', `Bearer ${b.staffToken}`);
    const otherLab = await request(app).get(`/api/photos/${photoId}`).set('Authorization', `Bearer ${stranger.token}`);
    expect(otherShop.status).toBe(404);
    expect(otherShop.body.error.code).toBe('not_found');
    expect(otherLab.status).toBe(404);
  });

  it('answers 401 without a sign-in', async () => {
    const { photoId } = await upload();
    expect((await request(app).get(`/api/photos/${photoId}`)).status).toBe(401);
  });
});

describe('photos through the partner API', () => {
  it('accepts photos with the shop’s API key and serves them back to that key only', async () => {
    const id = await openCase(a.key);
    const image = await png();
    const up = await request(app).post(`/api/v1/referrals/${id}/photos`).set('Authorization', `Bearer ${a.key}`).attach('photos', image, 'k.png');
    expect(up.status).toBe(201);
    const [row] = await db.query(`SELECT uploaded_by_type FROM referral_photos WHERE id = $1`, [up.body[0].id]);
    expect(row.uploaded_by_type).toBe('api_key');

    const own = await request(app).get(`/api/v1/photos/${up.body[0].id}`).set('Authorization', `Bearer ${a.key}`).buffer(true);
    const other = await request(app).get(`/api/v1/photos/${up.body[0].id}`).set('Authorization', `Bearer ${b.key}`);
    expect(own.status).toBe(200);
    expect(Buffer.compare(own.body as Buffer, image)).toBe(0);
    expect(other.status).toBe(404);
  });

  it('lists the photos on the case with links the key can follow', async () => {
    const id = await openCase(a.key);
    const image = await png();
    await request(app).post(`/api/referrals/${id}/photos`).set('Authorization', `Bearer ${a.staffToken}`).attach('photos', image, 'desk.png');

    const res = await request(app).get(`/api/v1/referrals/${id}`).set('Authorization', `Bearer ${a.key}`);

    expect(res.body.photos).toEqual([expect.objectContaining({ contentType: 'image/png', sizeBytes: image.length, url: expect.stringMatching(/^\/api\/v1\/photos\//) })]);
    const followed = await request(app).get(res.body.photos[0].url).set('Authorization', `Bearer ${a.key}`).buffer(true);
    expect(Buffer.compare(followed.body as Buffer, image)).toBe(0);
  });

  it('answers 404 to another shop’s key for uploading to a case', async () => {
    const id = await openCase(a.key);
    const res = await request(app).post(`/api/v1/referrals/${id}/photos`).set('Authorization', `Bearer ${b.key}`).attach('photos', jpeg, 'a.jpg');
    expect(res.status).toBe(404);
    expect(await photoCount(id)).toBe(0);
  });

  it('replays an upload sent again with the same Idempotency-Key, and refuses the key with other photos', async () => {
    const id = await openCase(a.key);
    const image = await png();
    const send = (bytes: Buffer) => request(app).post(`/api/v1/referrals/${id}/photos`).set('Authorization', `Bearer ${a.key}`).set('Idempotency-Key', 'photos-1').attach('photos', bytes, 'k.png');
    const first = await send(image);
    const again = await send(image);
    const other = await send(await png());
    expect(again.status).toBe(201);
    expect(again.headers['idempotent-replayed']).toBe('true');
    expect(again.body).toEqual(first.body);
    expect(other.status).toBe(409);
    expect(await photoCount(id)).toBe(1);
  });
});
