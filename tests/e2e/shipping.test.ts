import { readFile } from 'node:fs/promises';
import pg from 'pg';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { appUrl, launchBrowser, signIn } from '../support/browser';
import { insertQuillmarkCase } from '../support/e2e-cases';

// A box from the counter to the lab's bench: the shop buys the prepaid label for an accepted case and
// downloads it, the shipping fake's clock runs until the carrier delivers it, the lab's shipping clerk
// sees it delivered on the inbound board, checks it in by typing its tracking code and records the seal,
// and the shop sees the case received. Demo sign-ins: Juniper Lane PC Clinic and Quillmark Recovery Lab.
const SHOP_EMAIL = 'theo.brandt@juniperlane.example';
const CLERK_EMAIL = 'lee.varga@quillmark.example';

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

/** A case Quillmark has accepted from Juniper Lane, as intake and routing leave it (tested in their own suites). */
async function acceptedCase(): Promise<{ id: string; reference: string }> {
  return insertQuillmarkCase(db, {
    status: 'accepted',
    customerName: 'Odile Marchetti',
    customerEmail: 'odile.marchetti@customer.test',
    device: { make: 'Examplar', model: 'Spinwell 4T' },
  });
}

async function signedIn(email: string): Promise<Page> {
  const context = await browser.newContext({ acceptDownloads: true });
  const page = await context.newPage();
  await signIn(page, email, DEMO_PASSWORD);
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
  return page;
}

async function shipmentStatus(referralId: string): Promise<{ status: string; tracking_code: string } | undefined> {
  const { rows } = await db.query(`SELECT status, tracking_code FROM shipments WHERE referral_id = $1 AND status <> 'awaiting_purchase'`, [referralId]);
  return rows[0];
}

describe('shipping a box from the shop to the lab', () => {
  it('the shop buys and downloads the label; the carrier delivers; the clerk checks the box in by its tracking code; the shop sees it received', async () => {
    const kase = await acceptedCase();

    // The shop: Ship section on the case, rates for the drive box, the cheapest label, the PDF.
    const shop = await signedIn(SHOP_EMAIL);
    await shop.goto(appUrl(`/partner/cases/${kase.id}`));
    const ship = shop.getByRole('region', { name: 'Ship' });
    await ship.getByText('anti-static bag').waitFor();
    await ship.getByLabel('Packed weight (lb)').fill('3');
    await ship.getByRole('button', { name: 'Get rates' }).click();
    await ship.getByRole('table', { name: 'Rates for this box' }).waitFor();
    await ship.getByRole('button', { name: /^Buy label:/ }).first().click();
    const labelButton = ship.getByRole('button', { name: 'Download label (PDF)' });
    await labelButton.waitFor();
    const [download] = await Promise.all([shop.waitForEvent('download'), labelButton.click()]);
    const pdf = await readFile((await download.path())!);
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const bought = await shipmentStatus(kase.id);
    expect(bought?.status).toBe('label_issued');
    const trackingCode = bought!.tracking_code;
    await ship.getByText(trackingCode).waitFor();

    // The carrier: the fake's clock runs past the delivery (Denver to Phoenix, ground, at most 5 days).
    const clock = await fetch(`${inject('shippingFakeUrl')}/_fake/clock`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ advanceHours: 24 * 6 }),
    });
    expect(clock.status).toBe(200);
    await expect.poll(async () => (await shipmentStatus(kase.id))?.status, { timeout: 30_000 }).toBe('delivered');

    // The lab's shipping clerk: the box on the board as delivered, then the check-in by typing its code.
    const clerk = await signedIn(CLERK_EMAIL);
    await clerk.goto(appUrl('/lab/inbound'));
    const row = clerk.getByRole('row', { name: new RegExp(trackingCode) });
    await row.waitFor();
    await expect.poll(() => row.textContent()).toContain('Delivered today');
    await clerk.goto(appUrl('/lab/check-in'));
    const code = clerk.getByLabel('Tracking code or case reference');
    await code.fill(trackingCode);
    await code.press('Enter');
    await clerk.getByRole('heading', { name: `Case ${kase.reference}` }).waitFor();
    await clerk.getByLabel('Seal number').fill('QM-SEAL-2291');
    await clerk.getByRole('button', { name: 'Check in', exact: true }).click();
    await clerk.getByText('Checked in: the case is received').waitFor();

    // The shop sees the case received.
    await shop.reload();
    await shop.getByText('Received at lab').first().waitFor();
    await ship.getByText(/seal QM-SEAL-2291 intact/).waitFor();
    const { rows } = await db.query(`SELECT status FROM referrals WHERE id = $1`, [kase.id]);
    expect(rows[0].status).toBe('received');
  });
});
