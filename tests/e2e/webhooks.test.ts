import { createServer, type IncomingHttpHeaders } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Browser } from 'playwright-core';
import { Webhook } from 'standardwebhooks';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../server/db/seed/demo-accounts';
import { demoApiKeyValues } from '../../server/db/seed/demo-api-keys';
import { waitForMail } from '../support/api';
import { appUrl, launchBrowser, signIn } from '../support/browser';

// The shop's own system, listening on loopback for our events.
const received: { headers: IncomingHttpHeaders; body: string }[] = [];
const receiver = createServer((req, res) => {
  let body = '';
  req.on('data', (c) => (body += c));
  req.on('end', () => {
    received.push({ headers: req.headers, body });
    res.end('ok');
  });
});

let browser: Browser;
beforeAll(async () => {
  await new Promise<void>((r) => receiver.listen(0, '127.0.0.1', r));
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await new Promise<void>((r) => receiver.close(() => r()));
});

async function waitFor<T>(find: () => T | undefined, what: string, timeoutMs = 30_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = find();
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`${what} did not arrive within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

describe('partner webhooks in the browser', () => {
  it('a shop admin registers an endpoint and receives signed events as a case moves, with the matching e-mails', async () => {
    const admin = demoAccounts.find((a) => a.role === 'partner_admin')!;
    const url = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/platterpost`;
    const page = await (await browser.newContext()).newPage();
    await signIn(page, admin.email, 'platterpost-demo');
    await page.getByRole('heading', { level: 1, name: 'Cases' }).waitFor();
    await page.goto(appUrl('/partner/settings/webhooks'));
    await page.getByRole('button', { name: 'Add an endpoint' }).click();
    await page.getByLabel('Endpoint URL').fill(url);
    await page.getByRole('button', { name: 'Add endpoint' }).click();
    const secret = await page.getByLabel('Signing secret').inputValue();
    expect(secret).toMatch(/^whsec_/);
    await page.getByRole('button', { name: 'I have copied it' }).click();
    await page.getByRole('heading', { name: url }).waitFor();

    // The shop's ticketing system opens a logical-only case through the partner API; a demo lab
    // accepts such cases by rule, so the case moves from opened to accepted by itself.
    const res = await fetch(appUrl('/api/v1/referrals'), {
      method: 'POST',
      headers: { authorization: `Bearer ${demoApiKeyValues['juniper-lane']}`, 'content-type': 'application/json' },
      body: JSON.stringify({
        customer: { name: 'Webhook Test Customer', email: 'webhook.customer@test.example' },
        device: { mediaType: 'usb_flash', capacityGb: 64 },
        symptoms: ['deleted_files'],
        priorities: [{ category: 'documents', note: 'Thesis drafts' }],
        sensitivity: [],
      }),
    });
    expect(res.status).toBe(201);
    const referral = (await res.json()) as { id: string; reference: string; status: string };

    const wh = new Webhook(secret);
    const eventsFor = () =>
      received
        .map((r) => wh.verify(r.body, r.headers as Record<string, string>) as { type: string; data: { referral: { id: string } } })
        .filter((e) => e.data.referral.id === referral.id)
        .map((e) => e.type);
    expect(referral.status).toBe('accepted');
    await waitFor(() => (eventsFor().includes('referral.created') ? true : undefined), 'referral.created');
    await waitFor(() => (eventsFor().includes('referral.accepted') ? true : undefined), 'referral.accepted');
    const mail = await waitForMail(admin.email, (m) => m.text.includes(referral.reference));
    expect(mail.subject).toMatch(/accepted/i);

    // The delivery log shows what was sent.
    await page.getByRole('button', { name: 'Show deliveries' }).click();
    await page.getByRole('table', { name: 'Recent deliveries to this endpoint' }).getByText('Referral opened').first().waitFor();
  });
});
