import { readFile } from 'node:fs/promises';
import pg from 'pg';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { appUrl, launchBrowser, signIn } from '../support/browser';
import { insertQuillmarkCase } from '../support/e2e-cases';

// The end of a case at the lab: the technician sanitizes the original drive by degaussing, sees the
// degausser's hazards when choosing the technique, and the case then lists its certificate of
// sanitization, for the lab and for the shop. Demo sign-ins: Quillmark Recovery Lab and Juniper Lane.
const TECHNICIAN_EMAIL = 'sam.idowu@quillmark.example';
const CLERK_EMAIL = 'lee.varga@quillmark.example';
const SHOP_EMAIL = 'theo.brandt@juniperlane.example';

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

async function token(email: string): Promise<string> {
  const res = await fetch(appUrl('/api/auth/sign-in'), { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) });
  expect(res.status).toBe(200);
  return ((await res.json()) as { accessToken: string }).accessToken;
}

/**
 * A case whose work is over: accepted by Quillmark from Juniper Lane (inserted as intake and routing leave
 * it, as the shipping suite does), then checked in by the clerk and evaluated as beyond recovery by the
 * technician, both through the API.
 */
async function closableCase(): Promise<{ id: string; reference: string }> {
  const row = await insertQuillmarkCase(db, {
    status: 'accepted',
    customerName: 'Perpetua Olsen',
    customerEmail: 'perpetua.olsen@customer.test',
    device: { make: 'Examplar', model: 'Spinwell 2T', serial: 'SW2T-55019' },
  });

  const form = new FormData();
  form.set('data', JSON.stringify({ referralId: row.id, boxCondition: 'intact', seal: { present: true, number: 'QM-SEAL-3310', intact: true }, contentsMatch: true }));
  const checkIn = await fetch(appUrl('/api/lab/check-ins'), { method: 'POST', headers: { authorization: `Bearer ${await token(CLERK_EMAIL)}` }, body: form });
  expect(checkIn.status, await checkIn.clone().text()).toBe(201);

  const evaluation = await fetch(appUrl(`/api/lab/cases/${row.id}/evaluation`), {
    method: 'PUT',
    headers: { authorization: `Bearer ${await token(TECHNICIAN_EMAIL)}`, 'content-type': 'application/json' },
    body: JSON.stringify({
      findings: [{ part: 'surface', condition: 'failed', note: 'Platters scored edge to edge after a head crash' }],
      recoverability: 'none',
      plan: 'Nothing can be read back; the customer asked the lab to sanitize the drive.',
    }),
  });
  expect(evaluation.status, await evaluation.clone().text()).toBe(200);
  return row;
}

async function signedIn(email: string): Promise<Page> {
  const context = await browser.newContext({ acceptDownloads: true });
  const page = await context.newPage();
  await signIn(page, email, DEMO_PASSWORD);
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
  return page;
}

describe('media disposition in the browser', () => {
  it('a technician degausses the original drive, sees the degausser’s hazards, and the case shows its certificate of sanitization', async () => {
    const kase = await closableCase();

    const tech = await signedIn(TECHNICIAN_EMAIL);
    await tech.goto(appUrl(`/lab/cases/${kase.id}`));
    const form = tech.getByRole('form', { name: 'Record what happened to the media' });
    await form.waitFor();
    await form.getByLabel('Description', { exact: true }).fill('Examplar Spinwell 2T, 3.5" SATA');
    await form.getByLabel(/^Serial number/).fill('SW2T-55019');
    expect(await form.getByText('Degausser: strong magnetic field').count()).toBe(0);

    await form.getByLabel('Technique', { exact: true }).selectOption({ label: 'Degauss' });

    const hazards = form.getByRole('region', { name: 'Equipment hazards' });
    await hazards.getByText('Degausser: strong magnetic field').waitFor();
    await hazards.getByText(/pacemaker, implanted defibrillator/).waitFor();
    await hazards.getByText(/maker's manual/).first().waitFor();
    await form.getByText('Degauss reaches purge here').waitFor();

    await form.getByLabel('Tool or machine').fill('Halberd Works HX-40 degausser');
    await form.getByLabel('Verification', { exact: true }).selectOption({ label: 'Verification report of the sanitizing tool' });
    await form.getByLabel('The verification passed').check();
    await form.getByRole('button', { name: 'Record the sanitization' }).click();

    const certificateButton = tech.getByRole('button', { name: `Download certificate SC-${kase.reference}-1` });
    await certificateButton.waitFor();
    await tech.getByRole('list', { name: 'Media disposition' }).getByText('Purge by degauss with Halberd Works HX-40 degausser', { exact: false }).waitFor();
    // The custody log shows the new entry once the case record has been fetched again.
    await tech.getByRole('list', { name: 'Custody log' }).getByText('Sanitized').first().waitFor();
    await tech.getByText('Closed').first().waitFor();
    const [download] = await Promise.all([tech.waitForEvent('download'), certificateButton.click()]);
    const pdf = await readFile((await download.path())!);
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');

    const { rows } = await db.query(`SELECT status FROM referrals WHERE id = $1`, [kase.id]);
    expect(rows[0].status).toBe('closed');

    // The shop's case page lists the same certificate.
    const shop = await signedIn(SHOP_EMAIL);
    await shop.goto(appUrl(`/partner/cases/${kase.id}`));
    await shop.getByRole('button', { name: `Download certificate SC-${kase.reference}-1` }).waitFor();
  });
});
