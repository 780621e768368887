import pg from 'pg';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { unique, waitForMail } from '../support/api';
import { appUrl, launchBrowser, signIn, seriousViolations } from '../support/browser';
import { insertQuillmarkCase } from '../support/e2e-cases';

// A case through the lab's bench and the customer's page: the technician records the evaluation, the lab
// manager sends the quote, the customer opens the e-mailed link, approves and pays on the payment
// provider's page (the payments fake's hosted page), the technician reports imaging progress and uploads
// the recovered-file list, the customer confirms the files, and the lab manager refunds part of the
// payment. Demo sign-ins: Quillmark Recovery Lab.
const TECHNICIAN = 'sam.idowu@quillmark.example';
const LAB_MANAGER = 'rosa.quintero@quillmark.example';

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

/**
 * A clicking drive from Juniper Lane that Quillmark accepted and whose box the clerk checked in: written
 * as intake, routing and receiving leave it (each tested in its own suite).
 */
async function receivedCase(customerEmail: string): Promise<{ id: string; reference: string }> {
  const row = await insertQuillmarkCase(db, {
    status: 'received',
    customerName: 'Odile Marchetti',
    customerEmail,
    device: { capacityGb: 2000, make: 'Examplar', model: 'Spinwell 2T' },
    priorities: [{ category: 'photos', note: 'Photos of the garden, 2020–2024' }, { category: 'documents', note: null }],
    acceptedDaysAgo: 3,
    estimatedDays: 6,
  });
  await db.query(
    `INSERT INTO referral_timeline (referral_id, at, kind, summary, actor_type, actor_name, details)
     VALUES ($1, now() - interval '1 hour', 'checked_in', 'Box checked in at Quillmark Recovery Lab by Lee Varga: box intact.', 'user', 'Lee Varga', '{"outcome":"received"}')`,
    [row.id],
  );
  return row;
}

async function signedIn(email: string): Promise<Page> {
  const context = await browser.newContext();
  const page = await context.newPage();
  await signIn(page, email, DEMO_PASSWORD);
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
  return page;
}

async function openFromBench(page: Page, reference: string): Promise<void> {
  await page.goto(appUrl('/lab/bench'));
  await page.getByRole('link', { name: reference }).click();
  await page.getByRole('heading', { level: 1, name: reference }).waitFor();
}

const manifest = [
  'path,size,state',
  'Pictures/2021/Garden/IMG_0412.JPG,3920111,intact',
  'Pictures/2022/Garden/IMG_1180.HEIC,2210444,intact',
  'Pictures/2023/Garden/IMG_2211.JPG,4102000,partial',
  'Documents/Allotment plan.pdf,230112,intact',
].join('\n');

describe('a case on the bench and on the customer’s page', () => {
  it('evaluation, quote, approval and payment on the hosted page, imaging progress, the file list, the customer confirming the files, and a partial refund', async () => {
    const customerEmail = `${unique('odile')}@customer.test`;
    const kase = await receivedCase(customerEmail);

    // The technician: the case is in the bench queue; the evaluation is recorded on its page.
    const tech = await signedIn(TECHNICIAN);
    await tech.getByRole('heading', { level: 1, name: 'Bench queue' }).waitFor();
    await openFromBench(tech, kase.reference);
    await tech.getByText('Open the drive only on the clean-air bench').waitFor();
    await tech.getByLabel('Read/write heads', { exact: true }).selectOption('failed');
    await tech.getByLabel('Note on read/write heads').fill('Head 1 dead; clicks at spin-up');
    await tech.getByLabel('Platter surface', { exact: true }).selectOption('ok');
    await tech.getByLabel('Drive electronics (PCB)', { exact: true }).selectOption('ok');
    await tech.getByRole('radio', { name: 'High' }).check();
    await tech.getByLabel('Plan').fill('Head swap on the clean-air bench with a matched donor, then a full image.');
    await tech.getByRole('button', { name: 'Record the evaluation' }).click();
    await tech.getByText('Recoverability: High').waitFor();

    // The lab manager: the quote, line by line, sent to the customer.
    const lab = await signedIn(LAB_MANAGER);
    await openFromBench(lab, kase.reference);
    const quote = lab.getByRole('form', { name: 'Quote' });
    await quote.getByLabel('Amount (USD)').nth(0).fill('650');
    await quote.getByLabel('Description').nth(1).fill('2 TB USB 3.2 external drive');
    await quote.getByLabel('Amount (USD)').nth(1).fill('99');
    await quote.getByLabel('Amount (USD)').nth(2).fill('18.50');
    await quote.getByText('The customer pays $767.50').waitFor();
    await quote.getByRole('button', { name: 'Send the quote' }).click();
    await lab.getByText('Version 1, sent').waitFor();

    // The customer: the link from the e-mail opens the case; approve with the typed name and the terms.
    const mail = await waitForMail(customerEmail, (m) => m.subject.startsWith('Your recovery quote is ready'));
    const link = /\/c\/([A-Za-z0-9_-]{43})/.exec(mail.text)![1]!;
    const customer = await (await browser.newContext()).newPage();
    await customer.goto(appUrl(`/c/${link}`));
    await customer.getByRole('heading', { level: 1, name: 'Your data recovery' }).waitFor();
    await customer.getByRole('cell', { name: '$767.50' }).waitFor();
    expect(await seriousViolations(customer)).toEqual([]);
    await customer.getByLabel('Your full name').fill('Odile Marchetti');
    await customer.getByLabel('I have read the quote and agree to the terms above').check();
    await customer.getByRole('button', { name: 'Approve the quote of $767.50' }).click();

    // Paying on the payment provider's hosted page with its published success card, and back.
    await customer.getByRole('button', { name: 'Pay $767.50 securely' }).click();
    await customer.waitForURL((url) => url.origin === new URL(inject('paymentsFakeUrl')).origin);
    await customer.getByLabel('Card number').fill('4242 4242 4242 4242');
    await customer.getByLabel('Expiry (MM/YY)').fill('12/34');
    await customer.getByLabel('Security code').fill('123');
    await customer.getByRole('button', { name: /^Pay/ }).click();
    await customer.waitForURL((url) => url.pathname === `/c/${link}`);
    await customer.getByText(/^Paid \$767\.50 on/).waitFor();

    // The technician: imaging progress, then the recovered-file list.
    await tech.reload();
    await tech.getByLabel('Read so far (GB)').fill('500');
    await tech.getByLabel('Current rate (MB/s)').fill('125');
    await tech.getByRole('button', { name: 'Report progress' }).click();
    await tech.getByText('25 % copied').waitFor();
    await tech.getByRole('progressbar', { name: 'Imaging progress' }).waitFor();
    await tech.getByLabel('Recovered-file list (CSV)').setInputFiles({ name: 'recovered.csv', mimeType: 'text/csv', buffer: Buffer.from(manifest) });
    await tech.getByRole('button', { name: 'Upload the file list' }).click();
    await tech.getByRole('table', { name: 'Recovered files by kind' }).waitFor();

    // The customer: the files by the kinds that matter, confirmed.
    await customer.reload();
    const files = customer.getByRole('table', { name: 'Recovered files by kind' });
    await files.getByText('Priority 1: Photos of the garden, 2020–2024').waitFor();
    await files.getByText('Pictures/2021/Garden/IMG_0412.JPG').waitFor();
    await customer.getByRole('progressbar', { name: 'Imaging progress' }).waitFor();
    await customer.getByRole('button', { name: 'Yes, what matters is there' }).click();
    await customer.getByText('You confirmed these files').waitFor();

    // The lab manager gives part of the money back (only part of what was promised came back, say);
    // the form refuses more than was paid before anything is sent.
    await lab.reload();
    const refunds = lab.locator('section', { has: lab.getByRole('heading', { name: 'Refunds', exact: true }) });
    await refunds.getByText('Nothing has been refunded.').waitFor();
    await refunds.getByRole('button', { name: 'Refund the customer' }).click();
    const refund = lab.getByRole('form', { name: 'Refund' });
    await refund.waitFor();
    expect(await seriousViolations(lab)).toEqual([]);
    await refund.getByLabel('Amount (USD)').fill('800');
    await refund.getByLabel('Reason').selectOption('partial_recovery');
    await refund.getByRole('button', { name: 'Refund $800.00' }).click();
    await refund.getByText('At most $767.50 is left to refund').waitFor();
    await refund.getByLabel('Amount (USD)').fill('50');
    await refund.getByRole('button', { name: 'Refund $50.00' }).click();
    await refunds.getByText('$50.00 refunded so far; $717.50 is left.').waitFor();
    await lab.getByText(/^Refunded \$50\.00 to the customer's card\./).waitFor();
    await customer.reload();
    await customer.getByText(/\$50\.00 has been refunded to your card\./).waitFor();
    const { rows: refunded } = await db.query(`SELECT details->>'amountMinor' AS amount FROM ledger_transactions WHERE kind = 'refund' AND referral_id = $1`, [kase.id]);
    expect(refunded).toEqual([{ amount: '5000' }]);

    const { rows } = await db.query(`SELECT status FROM referrals WHERE id = $1`, [kase.id]);
    expect(rows[0].status).toBe('ready_for_review');
    const { rows: review } = await db.query(`SELECT review_status FROM recovered_file_manifests WHERE referral_id = $1`, [kase.id]);
    expect(review).toEqual([{ review_status: 'confirmed' }]);
  });
});
