import { describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { appUrl, browserPages, signIn } from '../support/browser';

// The lab's own earnings page: its share of the recoveries its customers paid for (invented demo data,
// server/db/seed/demo-money.ts), each line linked to the lab's view of the case, and its payout account.
// The payout account is only looked at here: the settlement suite counts the payees that have one.

const LAB_MANAGER = 'rosa.quintero@quillmark.example';
const TECHNICIAN = 'sam.idowu@quillmark.example';

const freshPage = browserPages();

describe('lab earnings', () => {
  it('shows the lab manager the lab’s share, its lines linked to the lab’s cases, and the payout account', async () => {
    const page = await freshPage();
    await signIn(page, LAB_MANAGER, DEMO_PASSWORD);
    await page.getByRole('heading', { level: 1, name: 'Offers', exact: true }).waitFor();
    await page.getByRole('navigation', { name: 'Lab' }).getByRole('link', { name: 'Earnings' }).click();
    await page.getByRole('heading', { level: 1, name: 'Earnings', exact: true }).waitFor();

    const totals = page.getByLabel('Lab share in USD');
    await totals.waitFor();
    expect(await totals.getByText('Accrued').count()).toBe(1);

    const lines = page.getByRole('table', { name: 'Latest lab share lines' });
    await lines.waitFor();
    await lines.getByText('Lab share', { exact: true }).first().waitFor();
    const caseLink = lines.getByRole('link').first();
    expect(await caseLink.getAttribute('href')).toMatch(/^\/lab\/cases\/[0-9a-f-]{36}$/);

    await page.getByText('Where your lab share is paid').waitFor();
    await page.getByRole('button', { name: 'Set up payouts' }).waitFor();
  });

  it('is not offered to a technician, whose visit to its address goes back to the bench queue', async () => {
    const page = await freshPage();
    await signIn(page, TECHNICIAN, DEMO_PASSWORD);
    await page.getByRole('heading', { level: 1, name: 'Bench queue', exact: true }).waitFor();
    expect(await page.getByRole('navigation', { name: 'Lab' }).getByRole('link', { name: 'Earnings' }).count()).toBe(0);
    await page.goto(appUrl('/lab/earnings'));
    await page.waitForURL((url) => url.pathname === '/lab/bench');
    await page.getByRole('heading', { level: 1, name: 'Bench queue', exact: true }).waitFor();
  });
});
