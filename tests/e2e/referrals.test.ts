import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { demoAccounts, DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { demoApiKeyValues } from '../../server/db/seed/demo-api-keys';
import { demoExtraStaff, demoOrganizations } from '../../server/db/seed/demo-data';
import { caseStatusLabels } from '@shared/vocabulary';
import { unique } from '../support/api';
import { appUrl, browserPages, signIn, seriousViolations } from '../support/browser';

// A shop clerk opens a referral at the counter, the lab it is offered to accepts it, and the shop
// sees the answer. Everything is asserted as a person sees it: headings, labels, list items, text.

const clerk = demoAccounts.find((a) => a.role === 'partner_staff')!;

/** The demo manager of the lab with this name (demo-data.ts and demo-accounts.ts). */
function managerOf(labName: string): { email: string; name: string } {
  const lab = demoOrganizations.find((o) => o.kind === 'lab' && o.name === labName);
  if (!lab) throw new Error(`no demo lab called ${labName}`);
  const manager = [...demoAccounts, ...demoExtraStaff].find((p) => p.organization === lab.key && p.role === 'lab_manager');
  if (!manager) throw new Error(`no demo lab manager for ${labName}`);
  return manager;
}

const freshPage = browserPages({ viewport: { width: 1360, height: 900 } });

async function seesHeading(p: Page, name: string | RegExp): Promise<void> {
  await p.getByRole('heading', { level: 1, name }).waitFor({ state: 'visible' });
}

/** The clerk's way to the form: the navigation, not a typed address. */
async function openIntake(): Promise<Page> {
  const page = await freshPage();
  await signIn(page, clerk.email, DEMO_PASSWORD);
  await seesHeading(page, 'Cases');
  await page.getByRole('navigation', { name: 'Shop' }).getByRole('link', { name: 'New referral' }).click();
  await seesHeading(page, 'New referral');
  return page;
}

describe('referrals in the browser', () => {
  it('a clerk refers a clicking 3.5″ drive, sees its cautions and ranked labs, the offered lab accepts it, and the shop sees that on the timeline', async () => {
    const shop = await openIntake();

    // The device and what happened: the cautions appear as the clerk ticks, before anything is sent.
    await shop.getByLabel('Kind of device').selectOption({ label: '3.5″ hard drive' });
    await shop.getByLabel('Clicking or ticking').check();
    const cautions = shop.getByRole('complementary', { name: 'Cautions for this device' });
    // Triage rules hdd-clicking and hdd-never-open (shared/domain/triage.ts; common practice, no published source).
    await cautions.getByText('Do not power the device on again.').waitFor();
    await cautions.getByText('Do not open the drive.').waitFor();
    await cautions.getByText('Head swap').waitFor();

    // The ranked labs: as a list, and as focusable markers on the map with lines from the shop.
    const map = shop.getByRole('region', { name: 'Map: Labs for this device' });
    const topMarker = map.getByRole('button', { name: /Ranked 1 of \d+/ });
    await topMarker.waitFor();
    const topLab = (await topMarker.getAttribute('aria-label'))?.split('. ')[0] ?? '';
    const ranked = shop.getByRole('list', { name: 'Ranked labs' });
    await ranked.getByRole('listitem').first().getByText(`Rank 1: ${topLab}`).waitFor();
    expect(await map.getByRole('button', { name: /Ranked \d+ of \d+/ }).count()).toBe(await ranked.locator(':scope > li').count());
    await map.getByRole('button', { name: /^Juniper Lane PC Clinic/ }).waitFor();
    // A lab left out tells why on keyboard focus, not only on hover.
    const leftOut = map.getByRole('button', { name: /Left out/ }).first();
    await leftOut.focus();
    await shop.getByRole('tooltip').filter({ hasText: 'Left out' }).waitFor();

    // What matters, who the customer is, and the consent.
    await shop.getByRole('textbox', { name: /^Make/ }).fill('Examplar');
    await shop.getByLabel('Add the most important kind of file').selectOption({ label: 'Photos' });
    await shop.getByRole('button', { name: 'Add to the list' }).click();
    await shop.getByLabel('Note for photos').fill('2019–2023 family photos');
    await shop.getByLabel('Customer’s name').fill('Alma Reyes');
    await shop.getByLabel('Customer’s e-mail').fill('alma.reyes@customer.example');
    await shop.getByLabel('The customer agrees to the network’s data-handling terms').check();
    await shop.getByRole('button', { name: 'Open referral' }).click();

    // The case page: its reference as the heading, the lab it is offered to, the same cautions.
    await shop.waitForURL(/\/partner\/cases\/[0-9a-f-]{36}$/);
    await seesHeading(shop, /^PP-/);
    const reference = (await shop.getByRole('heading', { level: 1 }).innerText()).trim();
    // "Offered to <lab>" (not the status badge "Offered to a lab").
    const offered = shop.getByRole('region', { name: 'Where the case stands' }).getByText(/^Offered to (?!a lab$).+/);
    await offered.waitFor();
    const labName = (await offered.innerText()).replace(/^Offered to /, '').trim();
    await shop.getByText('Do not power the device on again.').waitFor();
    await shop.getByRole('list', { name: 'Timeline' }).getByText(`Offered to ${labName}`, { exact: false }).waitFor();

    // The manager of that lab finds the offer and accepts it.
    const manager = managerOf(labName);
    const lab = await freshPage();
    await signIn(lab, manager.email, DEMO_PASSWORD);
    await seesHeading(lab, 'Offers');
    const row = lab.getByRole('row').filter({ hasText: reference });
    await row.getByText('left').waitFor();
    await row.getByRole('link', { name: reference }).click();
    await seesHeading(lab, reference);
    await lab.getByText('Do not power the device on again.').waitFor();
    await lab.getByText('2019–2023 family photos').waitFor();
    await lab.getByRole('button', { name: 'Accept case' }).click();
    await lab.getByText('Your lab accepted this case').waitFor();

    // Back at the counter: the answer is on the timeline and in the status.
    await shop.reload();
    await seesHeading(shop, reference);
    const accepted = shop.getByRole('list', { name: 'Timeline' }).getByRole('listitem').filter({ hasText: `Accepted by ${labName}` });
    await accepted.waitFor();
    expect(await accepted.innerText()).toContain(manager.name);
    await shop.getByText('Accepted by lab', { exact: true }).waitFor();
  });

  it('finds a case in the shop’s case list by its customer, and filters the list by status', async () => {
    // The shop's own system opens the case through the partner API with the demo key.
    const customer = unique('Customer ');
    const res = await fetch(appUrl('/api/v1/referrals'), {
      method: 'POST',
      headers: { authorization: `Bearer ${demoApiKeyValues['juniper-lane']}`, 'content-type': 'application/json' },
      body: JSON.stringify({ customer: { name: customer, email: 'search.customer@test.example' }, device: { mediaType: 'hdd_2_5' }, symptoms: ['clicking'] }),
    });
    expect(res.status).toBe(201);
    const { reference, status } = (await res.json()) as { reference: string; status: keyof typeof caseStatusLabels };
    const page = await freshPage();
    await signIn(page, clerk.email, DEMO_PASSWORD);
    await seesHeading(page, 'Cases');

    await page.getByRole('searchbox', { name: 'Search' }).fill(customer);
    await page.getByRole('button', { name: 'Search', exact: true }).click();

    // The header row and the one case that matches.
    const results = page.getByRole('table', { name: 'Cases matching your filters' });
    await expect.poll(() => results.getByRole('row').count()).toBe(2);
    const row = results.getByRole('row').filter({ hasText: customer });
    await row.getByRole('link', { name: reference }).waitFor();
    await row.getByText(caseStatusLabels[status], { exact: true }).waitFor();

    await page.getByLabel('Status').selectOption({ label: caseStatusLabels.cancelled });
    await page.getByText('No case matches.', { exact: false }).waitFor();
  });

  it('reports no serious or critical accessibility violation on the intake form with its cautions and ranking shown', async () => {
    const page = await openIntake();
    await page.getByLabel('Kind of device').selectOption({ label: 'Phone' });
    await page.getByLabel('Liquid damage').check();
    await page.getByLabel('Yes', { exact: true }).check();
    await page.getByLabel('Battery condition').selectOption({ label: 'Swollen or bulging' });
    await page.getByText('Fire risk: contact the lab before the box ships').waitFor();
    await page.getByRole('list', { name: 'Ranked labs' }).or(page.getByText('No lab can take this case right now.')).first().waitFor();
    await page.getByRole('region', { name: 'Map: Labs for this device' }).getByRole('button').first().waitFor();

    expect(await seriousViolations(page)).toEqual([]);
  });
});
