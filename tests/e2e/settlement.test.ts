import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';
import { describe, expect, inject, it } from 'vitest';
import { formatPeriod, previousPeriod } from '@shared/domain/commission';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { appUrl, browserPages, signIn } from '../support/browser';

// The monthly settlement in the browser: the shop admin sets up a payout account on the payment
// provider's hosted page (our fake), the network admin settles last month, and the shop admin sees the
// commission paid and downloads the statement. Last month's demo commission of Juniper Lane PC Clinic is
// invented demo data (server/db/seed/demo-money.ts): 12.5 % of $1 850.00 and of $275.00 = $231.25 + $34.38
// (half to even), plus whatever other demo cases of the shop were paid last month.

const shopAdmin = 'maya.ferrante@juniperlane.example';
const networkAdmin = 'ines.albright@platterpost.example';
const lastMonth = previousPeriod(new Date());

const freshPage = browserPages({ acceptDownloads: true });

async function seesHeading(p: Page, name: string) {
  await p.getByRole('heading', { level: 1, name, exact: true }).waitFor({ state: 'visible' });
}

describe('monthly settlement', () => {
  it('pays the shop its commission once the network admin settles the month, and the shop downloads the statement', async () => {
    // The shop admin sets up payouts on the provider's hosted page.
    const shop = await freshPage();
    await signIn(shop, shopAdmin, DEMO_PASSWORD);
    await seesHeading(shop, 'Cases');
    await shop.goto(appUrl('/partner/earnings'));
    await seesHeading(shop, 'Earnings');
    await shop.getByText('Not set up', { exact: true }).waitFor();
    await shop.getByRole('button', { name: 'Set up payouts' }).click();
    await shop.waitForURL((url) => url.toString().startsWith(inject('paymentsFakeUrl')));
    await shop.getByRole('heading', { name: 'Set up payouts' }).waitFor();
    await shop.getByRole('button', { name: 'Finish setup' }).click();
    await shop.waitForURL((url) => url.pathname === '/partner/earnings');
    await seesHeading(shop, 'Earnings');
    await shop.getByText('Payouts enabled').waitFor({ timeout: 30_000 });

    // The network admin settles last month.
    const admin = await freshPage();
    await signIn(admin, networkAdmin, DEMO_PASSWORD);
    await seesHeading(admin, 'Network overview');
    await admin.goto(appUrl('/admin/settlement'));
    await seesHeading(admin, 'Settlement');
    await admin.getByLabel('Month', { exact: true }).selectOption(lastMonth);
    await admin.getByRole('button', { name: 'Run settlement' }).click();
    const result = admin.getByRole('status').filter({ hasText: `${formatPeriod(lastMonth)} settled` });
    await result.waitFor({ timeout: 30_000 });
    // Juniper Lane is the only payee with a payout account, so its transfer is the one sent.
    expect(await result.textContent()).toMatch(/1 payout sent \(\$[\d,]+\.\d\d\)/);
    // Shops and labs without a payout account wait for one; the page lists them.
    await admin.getByRole('table', { name: 'Payouts that need attention' }).getByText('Waiting for payout account').first().waitFor();
    await admin.getByRole('button', { name: `Show the statements of ${formatPeriod(lastMonth)}` }).click();
    const statements = admin.getByRole('table', { name: `Statements of ${formatPeriod(lastMonth)}` });
    await statements.getByRole('row').filter({ hasText: 'Juniper Lane PC Clinic' }).getByText('Paid', { exact: true }).waitFor();
    await admin.getByText('Balanced', { exact: true }).waitFor();

    // The shop admin sees it paid and downloads the statement.
    await shop.reload();
    await seesHeading(shop, 'Earnings');
    const row = shop.getByRole('table', { name: 'Monthly statements' }).getByRole('row').filter({ hasText: formatPeriod(lastMonth) });
    await row.getByText('Paid', { exact: true }).waitFor();
    const download = shop.waitForEvent('download');
    await shop.getByRole('button', { name: `Download the ${formatPeriod(lastMonth)} statement as CSV` }).click();
    const file = await download;
    expect(file.suggestedFilename()).toBe(`platterpost-statement-${lastMonth}.csv`);
    const csv = await readFile((await file.path())!, 'utf8');
    const lines = csv.trim().split(/\r\n/);
    expect(lines[0]).toBe('date,case_reference,case_url,line,base,rate,amount,currency');
    const caseLines = lines.slice(1).filter((l) => l.split(',')[1] !== '');
    expect(caseLines.filter((l) => l.includes(',Commission,')).map((l) => l.split(',')[6])).toEqual(expect.arrayContaining(['231.25', '34.38']));
    for (const l of caseLines) expect(l.split(',')[1]).toMatch(/^PP-[0-9A-Z]{5}-[0-9A-Z*~$=U]$/);
    // The payout is the sum of the lines (no carry on this statement), and the page shows the same amount.
    const cents = caseLines.reduce((sum, l) => sum + Math.round(Number(l.split(',')[6]) * 100), 0);
    const paidOut = (cents / 100).toFixed(2);
    expect(csv).toContain(`Paid out,,,${paidOut},USD`);
    expect(await row.textContent()).toContain(`$${Number(paidOut).toLocaleString('en-US', { minimumFractionDigits: 2 })}`);
  });
});
