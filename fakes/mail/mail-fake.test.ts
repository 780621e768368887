import nodemailer from 'nodemailer';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { createMailFake, type MailFake, type StoredMessage } from './mail-fake';

let fake: MailFake;

function transport() {
  return nodemailer.createTransport({ host: fake.host, port: fake.smtpPort, secure: false, ignoreTLS: true });
}

function api(path: string, init?: RequestInit) {
  return fetch(`http://${fake.host}:${fake.httpPort}${path}`, init);
}

beforeAll(async () => {
  fake = createMailFake({ smtpPort: 0, httpPort: 0 });
  await fake.start();
});

afterAll(async () => {
  await fake.stop();
});

beforeEach(() => {
  fake.clear();
});

describe('mail fake', () => {
  it('starts on free ports when asked for port 0', () => {
    expect(fake.smtpPort).toBeGreaterThan(0);
    expect(fake.httpPort).toBeGreaterThan(0);
  });

  it('stores a message sent through nodemailer and returns it from the JSON API', async () => {
    const info = await transport().sendMail({
      from: 'Platterpost <no-reply@platterpost.test>',
      to: 'shop@example.test',
      bcc: 'audit@example.test',
      subject: 'Your label is ready',
      text: 'Print the label and pack the drive.',
      html: '<p>Print the label and <strong>pack</strong> the drive.</p>',
    });
    expect(info.accepted).toEqual(['shop@example.test', 'audit@example.test']);

    const list = (await (await api('/api/messages?to=shop@example.test')).json()) as StoredMessage[];
    expect(list).toHaveLength(1);
    const [message] = list;
    expect(message.subject).toBe('Your label is ready');
    expect(message.from).toBe('"Platterpost" <no-reply@platterpost.test>');
    expect(message.to).toEqual(['shop@example.test', 'audit@example.test']);
    expect(message.text.trim()).toBe('Print the label and pack the drive.');
    expect(message.html).toContain('<strong>pack</strong>');
    expect(message.messageId).toBe(info.messageId);
    expect(message.headers.subject).toBe('Your label is ready');
    expect(Number.isNaN(Date.parse(message.date))).toBe(false);

    const one = await api(`/api/messages/${message.id}`);
    expect(one.status).toBe(200);
    expect(((await one.json()) as StoredMessage).subject).toBe('Your label is ready');
  });

  it('filters by recipient, case-insensitively, and lists newest first', async () => {
    const t = transport();
    await t.sendMail({ from: 'a@platterpost.test', to: 'lab@example.test', subject: 'first', text: '1' });
    await t.sendMail({ from: 'a@platterpost.test', to: 'other@example.test', subject: 'second', text: '2' });
    await t.sendMail({ from: 'a@platterpost.test', to: 'Lab@Example.test', subject: 'third', text: '3' });

    const all = (await (await api('/api/messages')).json()) as StoredMessage[];
    expect(all.map((m) => m.subject)).toEqual(['third', 'second', 'first']);
    const forLab = (await (await api('/api/messages?to=lab@example.test')).json()) as StoredMessage[];
    expect(forLab.map((m) => m.subject)).toEqual(['third', 'first']);
  });

  it('answers 404 for an unknown message id', async () => {
    const response = await api('/api/messages/does-not-exist');
    expect(response.status).toBe(404);
    expect(((await response.json()) as { error: { message: string } }).error.message).toContain('does-not-exist');
  });

  it('clears every message on DELETE /api/messages', async () => {
    await transport().sendMail({ from: 'a@platterpost.test', to: 'b@example.test', subject: 'x', text: 'x' });
    expect(fake.messages()).toHaveLength(1);
    const response = await api('/api/messages', { method: 'DELETE' });
    expect(response.status).toBe(204);
    expect(fake.messages()).toHaveLength(0);
  });

  it('shows the inbox page newest first and a message page with the HTML part in a sandboxed iframe', async () => {
    const t = transport();
    await t.sendMail({ from: 'a@platterpost.test', to: 'b@example.test', subject: 'Older <one>', text: 'old' });
    await t.sendMail({ from: 'a@platterpost.test', to: 'b@example.test', subject: 'Newer', html: '<p>Hello "shop"</p><script>alert(1)</script>' });

    const inbox = await (await api('/')).text();
    expect(inbox.indexOf('Newer')).toBeLessThan(inbox.indexOf('Older &lt;one&gt;'));
    expect(inbox).not.toContain('Older <one>');

    const newest = fake.messages()[0];
    const page = await (await api(`/messages/${newest.id}`)).text();
    expect(page).toContain('<iframe title="Message body" sandbox=""');
    expect(page).toContain('srcdoc="&lt;p&gt;Hello &quot;shop&quot;&lt;/p&gt;&lt;script&gt;');
    expect(page).toContain('b@example.test');
  });

  it('refuses mail after stopSmtp and accepts it again after startSmtp', async () => {
    const port = fake.smtpPort;
    await fake.stopSmtp();
    await expect(
      transport().sendMail({ from: 'a@platterpost.test', to: 'b@example.test', subject: 'lost', text: 'x' }),
    ).rejects.toThrow();

    await fake.startSmtp();
    expect(fake.smtpPort).toBe(port);
    await transport().sendMail({ from: 'a@platterpost.test', to: 'b@example.test', subject: 'delivered', text: 'x' });
    expect(fake.messages().map((m) => m.subject)).toEqual(['delivered']);
  });

  it('waitForMessage resolves when a matching message arrives', async () => {
    const waiting = fake.waitForMessage((m) => m.subject === 'later');
    await transport().sendMail({ from: 'a@platterpost.test', to: 'b@example.test', subject: 'later', text: 'x' });
    expect((await waiting).to).toEqual(['b@example.test']);
  });
});
