import AxeBuilder from '@axe-core/playwright';
import { afterAll, afterEach, beforeAll, inject } from 'vitest';
import { chromium, type Browser, type BrowserContext, type BrowserContextOptions, type Page } from 'playwright-core';

// Debian's Chromium, never a downloaded browser. Background networking is off because
// the machines running the suite have no network beyond loopback.
export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run'],
  });
}

/** Base URL of the built app served by the real server that the global set-up started. */
export function appUrl(path = '/'): string {
  return new URL(path, inject('appUrl')).toString();
}

export async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto(appUrl('/sign-in'));
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/**
 * One browser for the test file and a fresh context (cookies, storage) per page, closed after each test.
 * Call at the top of the file; the function it returns opens a page.
 */
export function browserPages(options: BrowserContextOptions = {}): () => Promise<Page> {
  let browser: Browser | undefined;
  const contexts: BrowserContext[] = [];
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });
  afterEach(async () => {
    for (const c of contexts.splice(0)) await c.close();
  });
  return async () => {
    const context = await browser!.newContext(options);
    contexts.push(context);
    return context.newPage();
  };
}

/** An axe check of the page as it is now: only the serious and critical findings, each with where it is. */
export async function seriousViolations(page: Page): Promise<string[]> {
  const results = await new AxeBuilder({ page }).analyze();
  return results.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id} (${v.impact}): ${v.nodes.map((node) => node.target.join(' ')).join(', ')}`);
}
