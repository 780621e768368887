import pg from 'pg';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { appUrl, launchBrowser, signIn } from '../support/browser';
import { insertQuillmarkCase } from '../support/e2e-cases';

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
  const row = await insertQuillmarkCase(db, { status: 'on_hold', customerName: 'Mirela Sandoval', customerEmail: 'mirela.sandoval@customer.test' });
  await db.query(
    `INSERT INTO check_ins (referral_id, lab_organization_id, box_condition, seal_present, contents_match, outcome, hold_reason, checked_in_by_name)
     VALUES ($1, $2, 'damaged', false, true, 'on_hold', 'On arrival, the box arrived damaged.', 'Lee Varga')`,
    [row.id, row.labId],
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
