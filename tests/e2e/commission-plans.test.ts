import { describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { appUrl, browserPages, signIn } from '../support/browser';

// The network admin's partners page: a new commission plan through the form (its tier rules checked as
// the admin types), an edit, and a shop moved onto the plan and back. The plan is this test's own; the
// shop it moves (Kettle Creek) is not one the settlement suite counts.

const NETWORK_ADMIN = 'ines.albright@platterpost.example';
const SHOP = 'Kettle Creek Computers';

const freshPage = browserPages();

describe('commission plans', () => {
  it('creates a plan, refuses tiers out of order, edits it and puts a shop on it', async () => {
    const page = await freshPage();
    await signIn(page, NETWORK_ADMIN, DEMO_PASSWORD);
    await page.getByRole('heading', { level: 1, name: 'Network overview', exact: true }).waitFor();
    await page.goto(appUrl('/admin/partners'));
    await page.getByRole('heading', { level: 1, name: 'Partners', exact: true }).waitFor();
    const plans = page.getByRole('table', { name: 'Commission plans', exact: true });
    await plans.getByText('Default', { exact: true }).waitFor();

    const name = `Volume partners ${Date.now().toString(36)}`;
    await page.getByRole('button', { name: 'New plan' }).click();
    const form = page.getByRole('form', { name: 'New commission plan' });
    await form.getByLabel('Name').fill(name);
    await form.getByLabel('Network fee (%)').fill('8');
    await form.getByLabel('Tier 1: commission (%)').fill('10');
    await form.getByRole('button', { name: 'Add a tier' }).click();
    await form.getByLabel('Tier 2: from paid referrals (90 days)').fill('0');
    await form.getByLabel('Tier 2: commission (%)').fill('14.125');
    await page.getByRole('button', { name: 'Create the plan' }).click();
    await form.getByText('Each tier must start at more paid referrals than the one before').waitFor();
    await form.getByText('The rate takes at most two decimals (12.25)').waitFor();

    await form.getByLabel('Tier 2: from paid referrals (90 days)').fill('20');
    await form.getByLabel('Tier 2: commission (%)').fill('14');
    await page.getByRole('button', { name: 'Create the plan' }).click();
    const row = plans.getByRole('row').filter({ hasText: name });
    await row.getByText('10 % · 14 % at 20+ paid').waitFor();
    expect(await row.getByText('8 %', { exact: true }).count()).toBe(1);

    await page.getByRole('button', { name: `Edit ${name}` }).click();
    const edit = page.getByRole('form', { name: `Edit ${name}` });
    await edit.getByLabel('Tier 2: commission (%)').fill('15');
    await page.getByRole('button', { name: 'Save the plan' }).click();
    await row.getByText('10 % · 15 % at 20+ paid').waitFor();

    const choice = page.getByLabel(`Commission plan of ${SHOP}`);
    await choice.selectOption({ label: name });
    await page.getByRole('status').getByText(`${SHOP} is on ${name}`).waitFor();
    await row.getByText(SHOP).waitFor();
    await page.reload();
    await page.getByRole('heading', { level: 1, name: 'Partners', exact: true }).waitFor();
    expect(await page.getByLabel(`Commission plan of ${SHOP}`).inputValue()).not.toBe('');

    // Back on the default plan, as the demo had it.
    await page.getByLabel(`Commission plan of ${SHOP}`).selectOption('');
    await page.getByRole('status').getByText(`${SHOP} is on the default plan`).waitFor();
  });
});
