import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '@shared/vocabulary';
import { demoAccounts, DEMO_PASSWORD, type DemoAccount } from '../../server/db/seed/demo-accounts';
import { linkToken, unique, waitForMail } from '../support/api';
import { appUrl, launchBrowser, signIn, seriousViolations } from '../support/browser';

// Each role's first page after sign-in and the heading it shows (product brief: "Homes per role").
const homes: Record<Role, { path: string; heading: string }> = {
  partner_admin: { path: '/partner/cases', heading: 'Cases' },
  partner_staff: { path: '/partner/cases', heading: 'Cases' },
  shipping_clerk: { path: '/lab/inbound', heading: 'Inbound boxes' },
  lab_manager: { path: '/lab/offers', heading: 'Offers' },
  lab_technician: { path: '/lab/bench', heading: 'Bench queue' },
  network_admin: { path: '/admin', heading: 'Network overview' },
};

const account = (role: Role): DemoAccount => {
  const found = demoAccounts.find((candidate) => candidate.role === role);
  if (!found) throw new Error(`no demo account for ${role}`);
  return found;
};

let browser: Browser;
let context: BrowserContext;
let page: Page;

beforeAll(async () => {
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
});

async function freshPage(): Promise<Page> {
  context = await browser.newContext();
  page = await context.newPage();
  return page;
}

afterEach(async () => {
  await context?.close();
});

const pathname = (p: Page) => new URL(p.url()).pathname;

async function seesHeading(p: Page, name: string): Promise<void> {
  await p.getByRole('heading', { level: 1, name, exact: true }).waitFor({ state: 'visible' });
}

/** The lab manager invites a new technician through the Staff page; returns the address invited. */
async function inviteTechnician(p: Page, name: string): Promise<string> {
  const email = `${unique('tech-')}@quillmark.example`;
  await signIn(p, account('lab_manager').email, DEMO_PASSWORD);
  await seesHeading(p, 'Offers');
  await p.getByRole('navigation', { name: 'Lab' }).getByRole('link', { name: 'Staff' }).click();
  await seesHeading(p, 'Staff');
  await p.getByRole('button', { name: 'Invite a person' }).click();
  const dialog = p.getByRole('dialog', { name: 'Invite a person' });
  await dialog.getByLabel('Name').fill(name);
  await dialog.getByLabel('E-mail').fill(email);
  await dialog.getByLabel('Role').selectOption({ label: 'Lab technician' });
  await dialog.getByRole('button', { name: 'Send invitation' }).click();
  await p.getByRole('row').filter({ hasText: email }).filter({ hasText: 'Invitation sent' }).waitFor();
  return email;
}

/** Opens the e-mailed invitation in a new browser context and joins with this password. */
async function acceptInvitation(email: string, password: string): Promise<Page> {
  const token = linkToken((await waitForMail(email, (mail) => mail.text.includes('/accept-invitation'))).text, '/accept-invitation');
  await context.close();
  const p = await freshPage();
  await p.goto(appUrl(`/accept-invitation?token=${encodeURIComponent(token)}`));
  await p.getByRole('heading', { level: 1, name: /^Join / }).waitFor();
  await p.getByLabel('Choose a password').fill(password);
  await p.getByLabel('Password again').fill(password);
  await p.getByRole('button', { name: 'Join and sign in' }).click();
  return p;
}

describe('app shell', () => {
  it.each(demoAccounts)('signs in the demo $role through the form and shows its own home', async (demo) => {
    const p = await freshPage();

    await signIn(p, demo.email, DEMO_PASSWORD);

    const home = homes[demo.role];
    await seesHeading(p, home.heading);
    expect(pathname(p)).toBe(home.path);
    const header = p.getByRole('banner');
    expect(await header.getByText(demo.name, { exact: true }).isVisible()).toBe(true);
  });

  it('shows the navigation a lab technician may use and hides the manager-only pages', async () => {
    const p = await freshPage();
    await signIn(p, account('lab_technician').email, DEMO_PASSWORD);
    await seesHeading(p, 'Bench queue');

    const nav = p.getByRole('navigation', { name: 'Lab' });
    const links = (await nav.getByRole('link').allTextContents()).map((text) => text.trim());
    expect(links).toEqual(['Bench queue']);
  });

  it('signs out back to the sign-in page, and the session does not come back on reload', async () => {
    const p = await freshPage();
    await signIn(p, account('partner_staff').email, DEMO_PASSWORD);
    await seesHeading(p, 'Cases');

    await p.getByRole('button', { name: 'Sign out' }).click();

    await seesHeading(p, 'Sign in');
    expect(pathname(p)).toBe('/sign-in');
    await p.goto(appUrl('/partner/cases'));
    await seesHeading(p, 'Sign in');
    expect(pathname(p)).toBe('/sign-in');
  });

  it('keeps the session across a page reload', async () => {
    const p = await freshPage();
    await signIn(p, account('shipping_clerk').email, DEMO_PASSWORD);
    await seesHeading(p, 'Inbound boxes');

    await p.reload();

    await seesHeading(p, 'Inbound boxes');
    expect(pathname(p)).toBe('/lab/inbound');
  });

  it('shows the server’s message when the password is wrong, and stays on sign-in', async () => {
    const p = await freshPage();
    // The server answers an unknown address with the same message as a wrong password;
    // asking with an unknown address does not count a failure against a real account.
    const probe = await p.request.post(appUrl('/api/auth/sign-in'), { data: { email: 'nobody-here@platterpost.example', password: 'wrong-password' } });
    expect(probe.status()).toBe(401);
    const expected = ((await probe.json()) as { error: { message: string } }).error.message;

    await signIn(p, account('partner_admin').email, 'not-the-demo-password');

    const alert = p.getByRole('alert').filter({ hasText: expected });
    await alert.waitFor({ state: 'visible' });
    expect(pathname(p)).toBe('/sign-in');
    expect(await p.getByLabel('Password').getAttribute('type')).toBe('password');
  });

  it('sends a signed-out visitor to sign-in and, after signing in, on to the page they asked for', async () => {
    const p = await freshPage();

    await p.goto(appUrl('/lab/bench'));
    await seesHeading(p, 'Sign in');
    expect(new URL(p.url()).searchParams.get('next')).toBe('/lab/bench');
    await p.getByLabel('E-mail').fill(account('lab_manager').email);
    await p.getByLabel('Password').fill(DEMO_PASSWORD);
    await p.getByRole('button', { name: 'Sign in' }).click();

    await seesHeading(p, 'Bench queue');
    expect(pathname(p)).toBe('/lab/bench');
  });

  it('sends a person who opens another portal’s page to their own home', async () => {
    const p = await freshPage();
    await signIn(p, account('partner_staff').email, DEMO_PASSWORD);
    await seesHeading(p, 'Cases');

    await p.goto(appUrl('/admin/settlement'));

    await seesHeading(p, 'Cases');
    expect(pathname(p)).toBe('/partner/cases');
  });

  it('lets a lab manager invite a technician, who joins from the e-mailed link and lands on the bench queue', async () => {
    const name = 'Dana Okafor';
    const email = await inviteTechnician(await freshPage(), name);

    const p = await acceptInvitation(email, 'a-new-technician-password');

    await seesHeading(p, 'Bench queue');
    expect(pathname(p)).toBe('/lab/bench');
    expect(await p.getByRole('banner').getByText(name, { exact: true }).isVisible()).toBe(true);
  });

  it('lets a person reset a forgotten password from the e-mailed link and sign in with the new one', async () => {
    const email = await inviteTechnician(await freshPage(), 'Rory Castellan');
    const joined = await acceptInvitation(email, 'first-password-chosen');
    await seesHeading(joined, 'Bench queue');
    await joined.getByRole('button', { name: 'Sign out' }).click();
    await seesHeading(joined, 'Sign in');

    await joined.getByRole('link', { name: 'Forgot your password?' }).click();
    // The sign-in page has an E-mail field too: fill the new page's, not the one on its way out.
    await seesHeading(joined, 'Choose a new password');
    await joined.getByLabel('E-mail').fill(email);
    await joined.getByRole('button', { name: 'Send me a link' }).click();
    await joined.getByText('Check your inbox').waitFor();
    const mail = await waitForMail(email, (message) => message.text.includes('/reset-password'));
    await joined.goto(appUrl(`/reset-password?token=${encodeURIComponent(linkToken(mail.text, '/reset-password'))}`));
    await joined.getByLabel('New password', { exact: true }).fill('second-password-chosen');
    await joined.getByLabel('New password again').fill('second-password-chosen');
    await joined.getByRole('button', { name: 'Save new password' }).click();
    await seesHeading(joined, 'Sign in');
    await joined.getByText('Your password is changed').waitFor();
    await signIn(joined, email, 'second-password-chosen');

    await seesHeading(joined, 'Bench queue');
  });

  it('reports no serious or critical accessibility violation on the sign-in page', async () => {
    const p = await freshPage();
    await p.goto(appUrl('/sign-in'));
    await seesHeading(p, 'Sign in');

    expect(await seriousViolations(p)).toEqual([]);
  });

  it('reports no serious or critical accessibility violation on a home page', async () => {
    const p = await freshPage();
    await signIn(p, account('partner_admin').email, DEMO_PASSWORD);
    await seesHeading(p, 'Cases');

    expect(await seriousViolations(p)).toEqual([]);
  });
});
