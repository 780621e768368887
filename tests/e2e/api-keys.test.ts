import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts, DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { unique } from '../support/api';
import { appUrl, launchBrowser, signIn } from '../support/browser';

const shopAdmin = demoAccounts.find((a) => a.role === 'partner_admin')!;

let browser: Browser;
let context: BrowserContext;

beforeAll(async () => {
  browser = await launchBrowser();
});

afterEach(async () => {
  await context?.close();
});

afterAll(async () => {
  await browser?.close();
});

async function adminPage(): Promise<Page> {
  context = await browser.newContext();
  await context.grantPermissions(['clipboard-read', 'clipboard-write'], { origin: new URL(appUrl()).origin });
  const page = await context.newPage();
  await signIn(page, shopAdmin.email, DEMO_PASSWORD);
  await page.getByRole('heading', { level: 1, name: 'Cases' }).waitFor();
  return page;
}

describe('partner API keys in the browser', () => {
  it('shows a new key once, with a copy button, and after a reload only its prefix', async () => {
    const page = await adminPage();
    await page.getByRole('navigation', { name: 'Shop' }).getByRole('link', { name: 'API keys' }).click();
    await page.getByRole('heading', { level: 1, name: 'API keys' }).waitFor();
    const name = unique('Front desk ');

    await page.getByRole('button', { name: 'Create a key' }).click();
    await page.getByRole('dialog', { name: 'Create an API key' }).getByLabel('Name').fill(name);
    await page.getByRole('button', { name: 'Create key' }).click();

    const shown = page.getByRole('dialog', { name: 'Your new API key' });
    await shown.getByText('you will not see it again').waitFor();
    const key = await shown.getByLabel(`API key “${name}”`).inputValue();
    // ppk_live_<prefix>_<secret> (shared/schemas/partner-api.ts).
    const [, prefix, secret] = key.match(/^ppk_live_([a-z0-9]{12})_([A-Za-z0-9_-]{32,128})$/) ?? [];
    expect(prefix).toBeTruthy();
    await shown.getByRole('button', { name: 'Copy key' }).click();
    await shown.getByText('Copied to the clipboard.').waitFor();
    expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(key);
    await shown.getByRole('button', { name: 'I have copied it' }).click();

    // The key works against the partner API.
    const me = await fetch(appUrl('/api/v1/me'), { headers: { authorization: `Bearer ${key}` } });
    expect(me.status).toBe(200);

    await page.reload();
    const row = page.getByRole('row').filter({ hasText: name });
    await row.waitFor();
    expect(await row.innerText()).toContain(`ppk_live_${prefix}_…`);
    expect(await page.content()).not.toContain(secret);
    await row.getByText('Active').waitFor();
  });

  it('revokes a key, and the partner API refuses it afterwards', async () => {
    const page = await adminPage();
    await page.goto(appUrl('/partner/settings/api-keys'));
    const name = unique('Old till ');
    await page.getByRole('button', { name: 'Create a key' }).click();
    await page.getByRole('dialog', { name: 'Create an API key' }).getByLabel('Name').fill(name);
    await page.getByRole('button', { name: 'Create key' }).click();
    const key = await page.getByRole('dialog', { name: 'Your new API key' }).getByLabel(`API key “${name}”`).inputValue();
    await page.getByRole('button', { name: 'I have copied it' }).click();

    await page.getByRole('row').filter({ hasText: name }).getByRole('button', { name: `Revoke ${name}` }).click();
    await page.getByRole('dialog', { name: `Revoke “${name}”?` }).getByRole('button', { name: 'Revoke key' }).click();

    await page.getByRole('row').filter({ hasText: name }).getByText(/^Revoked /).waitFor();
    const me = await fetch(appUrl('/api/v1/me'), { headers: { authorization: `Bearer ${key}` } });
    expect(me.status).toBe(401);
  });

  it('explains the API from its own description, with curl examples that leave a place for the key', async () => {
    const page = await adminPage();
    await page.getByRole('navigation', { name: 'Shop' }).getByRole('link', { name: 'API guide' }).click();
    await page.getByRole('heading', { level: 1, name: 'API guide' }).waitFor();

    const open = page.getByRole('region', { name: 'Open a referral' });
    await open.getByText('/api/v1/referrals', { exact: true }).waitFor();
    await open.getByRole('table', { name: 'Body fields of Open a referral' }).getByText('device.mediaType').waitFor();
    expect(await open.getByRole('figure', { name: 'Try it with curl' }).innerText()).toContain('Authorization: Bearer <your API key>');
  });
});
