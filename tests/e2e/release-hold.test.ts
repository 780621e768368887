import pg from 'pg';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { makeReference } from '@shared/domain/reference';
import { triage } from '@shared/domain/triage';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { appUrl, launchBrowser, signIn } from '../support/browser';

// The lab manager releases a case held at check-in from the outbound page. The case arrives as the
// check-in leaves a damaged box (checking in is tested in shipping.test.ts); demo sign-in: Quillmark.
const MANAGER_EMAIL = 'rosa.quintero@quillmark.example';

let browser: Browser;
let db: pg.Client;

beforeAll(async () => {
  browser = await launchBrowser();
  db = new pg.Client({ connectionString: inject('databaseUrl') });
  await db.connect();
});

afterAll(async () => {
  await browser?.close();
  await db?.end();
});

async function heldCase(): Promise<{ id: string; reference: string }> {
  const orgs = await db.query(`SELECT id, slug, address_line1, city, region, postal_code, lat, lon FROM organizations WHERE slug IN ('juniper-lane', 'quillmark')`);
  const shop = orgs.rows.find((o) => o.slug === 'juniper-lane');
  const lab = orgs.rows.find((o) => o.slug === 'quillmark');
  const { rows: [{ n }] } = await db.query(`SELECT nextval('referral_number_seq')::text AS n`);
  const stored = { ...triage({ mediaType: 'hdd_3_5', symptoms: ['clicking'], sensitivity: [] }), battery: null };
  const { rows: [row] } = await db.query(
    `INSERT INTO referrals (reference_number, reference, partner_organization_id, status, customer_name, customer_email, media_type, symptoms,
       origin_line1, origin_city, origin_region, origin_postal_code, origin_country, origin_lat, origin_lon, triage,
       lab_organization_id, created_by_type, created_by_id, created_by_name)
     VALUES ($1, $2, $3, 'on_hold', 'Mirela Sandoval', 'mirela.sandoval@customer.test', 'hdd_3_5', '{clicking}',
       $4, $5, $6, $7, 'US', $8, $9, $10, $11, 'user', 'e2e', 'Theo Brandt') RETURNING id, reference`,
    [n, makeReference(BigInt(n)), shop.id, shop.address_line1, shop.city, shop.region, shop.postal_code, shop.lat, shop.lon, JSON.stringify(stored), lab.id],
  );
  await db.query(
    `INSERT INTO lab_offers (referral_id, lab_organization_id, status, offered_at, deadline, responded_at, responded_by_name)
     VALUES ($1, $2, 'accepted', now(), now() + interval '4 hours', now(), 'Rosa Quintero')`,
    [row.id, lab.id],
  );
  await db.query(
    `INSERT INTO check_ins (referral_id, lab_organization_id, box_condition, seal_present, contents_match, outcome, hold_reason, checked_in_by_name)
     VALUES ($1, $2, 'damaged', false, true, 'on_hold', 'On arrival, the box arrived damaged.', 'Lee Varga')`,
    [row.id, lab.id],
  );
  return row;
}

describe('releasing a hold in the browser', () => {
  it('asks what settled it, then releases the case, which the lab sees received', async () => {
    const kase = await heldCase();
    const page = await (await browser.newContext()).newPage();
    await signIn(page, MANAGER_EMAIL, DEMO_PASSWORD);
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
    await page.goto(appUrl('/lab/outbound'));

    const card = page.locator('section').filter({ hasText: kase.reference });
    await card.getByText('keep a swollen or leaking battery isolated', { exact: false }).waitFor();
    await card.getByRole('button', { name: 'Release the hold' }).click();
    await card.getByText('Say what settled the hold, for the shop').waitFor();

    await card.getByLabel('What settled it (the shop sees this)').fill('Outer box dented only; the drive is unharmed.');
    await card.getByRole('button', { name: 'Release the hold' }).click();
    await page.getByText(`${kase.reference} is received and can go to the bench.`).waitFor();

    const { rows } = await db.query(`SELECT status FROM referrals WHERE id = $1`, [kase.id]);
    expect(rows[0].status).toBe('received');
    const { rows: timeline } = await db.query(`SELECT summary FROM referral_timeline WHERE referral_id = $1 AND kind = 'hold_released'`, [kase.id]);
    expect(timeline[0].summary).toBe('Hold released by Rosa Quintero: Outer box dented only; the drive is unharmed.');
  });
});
