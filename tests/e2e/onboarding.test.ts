import { describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { unique } from '../support/api';
import { appUrl, browserPages, signIn, seriousViolations } from '../support/browser';

// The network admin adds a shop and a lab through their forms: the fields say what is missing, the
// newcomer is listed at once, and the lab shows as not yet set up; the shop is switched off and on. Both sit in Anchorage, far from the
// demo shops, so no other suite's ranking meets them.

const NETWORK_ADMIN = 'ines.albright@platterpost.example';
const freshPage = browserPages();

describe('onboarding', () => {
  it('adds a shop and a lab, each with the person who runs it invited, and switches the shop off and on', async () => {
    const page = await freshPage();
    await signIn(page, NETWORK_ADMIN, DEMO_PASSWORD);
    await page.getByRole('heading', { level: 1, name: 'Network overview', exact: true }).waitFor();

    await page.goto(appUrl('/admin/partners'));
    await page.getByRole('heading', { level: 1, name: 'Partners', exact: true }).waitFor();
    await page.getByRole('button', { name: 'Add a shop' }).click();
    const shopForm = page.getByRole('form', { name: 'Add a shop' });
    await page.getByRole('button', { name: 'Add the shop and invite' }).click();
    await shopForm.getByText('Enter the name it trades under').waitFor();
    await shopForm.getByText('Enter a postal code').waitFor();
    expect(await seriousViolations(page)).toEqual([]);

    const shop = `Northern Lights Repair ${unique('')}`;
    await shopForm.getByLabel('Name', { exact: true }).fill(shop);
    await shopForm.getByLabel('ZIP or postal code').fill('00000');
    await shopForm.getByLabel('Time zone').selectOption('America/Anchorage');
    await shopForm.getByLabel("Shop admin's name").fill('Aurora Quist');
    const shopAdmin = `${unique('aurora')}@northernlights.example`;
    await shopForm.getByLabel("Shop admin's e-mail").fill(shopAdmin);
    await page.getByRole('button', { name: 'Add the shop and invite' }).click();
    // The server's answer lands on its field.
    await shopForm.getByText('Unknown ZIP code "00000"').waitFor();
    await shopForm.getByLabel('ZIP or postal code').fill('99501');
    await page.getByRole('button', { name: 'Add the shop and invite' }).click();
    await page.getByRole('status').getByText(`${shop} added`).waitFor();
    await page.getByRole('status').getByText(`The invitation went to ${shopAdmin}.`, { exact: false }).waitFor();
    const shops = page.getByRole('table', { name: 'Shops and their commission plans' });
    const shopRow = shops.getByRole('row').filter({ hasText: shop });
    await shopRow.getByText('Anchorage, AK').waitFor();

    // Switched off, with a reason the form asks for, and on again.
    await page.getByRole('button', { name: `Switch ${shop} off` }).click();
    const off = page.getByRole('form', { name: `Switch ${shop} off` });
    await off.getByText('its API keys stop working', { exact: false }).waitFor();
    await page.getByRole('dialog').getByRole('button', { name: 'Switch off', exact: true }).click();
    await off.getByText('Say why it is switched off; the audit log keeps it').waitFor();
    await off.getByLabel('Why').fill('Closed for the winter');
    await page.getByRole('dialog').getByRole('button', { name: 'Switch off', exact: true }).click();
    await shopRow.getByText('Switched off').waitFor();
    await page.getByRole('button', { name: `Switch ${shop} on` }).click();
    await shopRow.getByText('Active', { exact: true }).waitFor();

    await page.goto(appUrl('/admin/labs'));
    await page.getByRole('heading', { level: 1, name: 'Labs', exact: true }).waitFor();
    await page.getByRole('button', { name: 'Add a lab' }).click();
    const labForm = page.getByRole('form', { name: 'Add a lab' });
    const lab = `Midnight Sun Data ${unique('')}`;
    await labForm.getByLabel('Name', { exact: true }).fill(lab);
    await labForm.getByLabel('ZIP or postal code').fill('99501');
    await labForm.getByLabel('Time zone').selectOption('America/Anchorage');
    await labForm.getByLabel("Lab manager's name").fill('Birch Halvorsen');
    const labManager = `${unique('birch')}@midnightsun.example`;
    await labForm.getByLabel("Lab manager's e-mail").fill(labManager);
    await page.getByRole('button', { name: 'Add the lab and invite' }).click();
    await page.getByRole('status').getByText(`${lab} added`).waitFor();
    await page.getByRole('status').getByText(`no case is offered to the lab until it is saved. The invitation went to ${labManager}.`, { exact: false }).waitFor();
    await page.getByRole('table', { name: 'All labs' }).getByRole('row').filter({ hasText: lab }).getByText('Profile not completed').waitFor();
  });
});
