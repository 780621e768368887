import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { labCaseDto } from '@shared/schemas/lab-work';
import { referralDto } from '@shared/schemas/referrals';
import { setupApi } from '../support/api';
import {
  auth,
  customerAuth,
  goodEvaluation,
  labWorlds,
  linkFromOutbox,
  quotedCase,
  receivedCase,
  STANDARD_TOTAL_MINOR,
  standardQuote,
  worldZips,
} from '../support/lab-work';

const ctx = await setupApi();
const { app, db } = ctx;
const makeWorld = labWorlds(ctx, worldZips.quotes);

async function count(sql: string, params: unknown[]): Promise<number> {
  const [row] = await db.query(sql, params);
  return Number((row as { n: string }).n);
}

async function evaluatedCase(world: Awaited<ReturnType<typeof makeWorld>>) {
  const c = await receivedCase(ctx, world);
  const res = await request(app).put(`/api/lab/cases/${c.id}/evaluation`).set(auth(world.technician.token)).send(goodEvaluation);
  expect(res.status).toBe(200);
  return c;
}

describe('POST /api/lab/cases/:id/quote', () => {
  it('sends the quote line by line: the case is quote_sent, the customer gets the link and the total, and the shop sees the amounts', async () => {
    const world = await makeWorld();
    const c = await evaluatedCase(world);

    const res = await request(app).post(`/api/lab/cases/${c.id}/quote`).set(auth(world.manager.token)).send(standardQuote);

    expect(res.status).toBe(201);
    const body = labCaseDto.parse(res.body);
    expect(body.status).toBe('quote_sent');
    expect(body.quote).toMatchObject({
      version: 1,
      status: 'sent',
      currency: 'USD',
      // The customer pays the sum of the lines and nothing more: the network adds no fee on top.
      totalMinor: STANDARD_TOTAL_MINOR,
      // Service lines are the lab's work (the commission base); media and shipping are not.
      serviceLinesMinor: 45000,
      sentBy: world.manager.name,
      note: 'Valid for 30 days.',
      approval: null,
      decline: null,
    });
    expect(body.quote!.lines).toEqual([
      { kind: 'service', skill: 'logical', description: 'Logical recovery of deleted files', amountMinor: 45000 },
      { kind: 'target_media', skill: null, description: '1 TB USB 3.2 external drive', amountMinor: 8900 },
      { kind: 'return_shipping', skill: null, description: 'Ground shipping, signature on delivery', amountMinor: 1500 },
    ]);
    expect(body.timeline.at(-1)).toMatchObject({ kind: 'quote_sent', summary: `${world.manager.name} sent the quote: $554.00.` });
    expect(await count(`SELECT count(*) AS n FROM audit_events WHERE action = 'lab_work.quote_sent' AND target_id = $1`, [c.id])).toBe(1);

    const [mail] = await db.query(`SELECT subject, text_body FROM outbox_messages WHERE recipient = $1 AND template = 'customer_quote_ready'`, [c.customerEmail]);
    expect(mail.subject).toBe(`Your recovery quote is ready: $554.00 (case ${c.reference})`);
    expect(mail.text_body).toContain('most or all of the data is expected back');
    const token = await linkFromOutbox(ctx, c.customerEmail, 'customer_quote_ready');
    expect(mail.text_body).toContain(`http://app.test/c/${token}`);
    const page = await request(app).get('/api/customer/case').set(customerAuth(token));
    expect(page.body.quote.lines).toHaveLength(3);

    const shop = await request(app).get(`/api/referrals/${c.id}`).set(auth(world.shopStaff.token));
    expect(referralDto.parse(shop.body).amounts).toEqual({
      currency: 'USD',
      quoteStatus: 'sent',
      quotedTotalMinor: STANDARD_TOTAL_MINOR,
      serviceLinesMinor: 45000,
      paidMinor: null,
      paidAt: null,
    });
  });

  it('counts an expedite line as the lab’s work', async () => {
    const world = await makeWorld();
    const c = await evaluatedCase(world);
    const res = await request(app)
      .post(`/api/lab/cases/${c.id}/quote`)
      .set(auth(world.manager.token))
      .send({ ...standardQuote, lines: [...standardQuote.lines, { kind: 'expedite', description: 'Priority bench slot', amountMinor: 12500 }] });
    expect(res.status).toBe(201);
    expect(res.body.quote).toMatchObject({ totalMinor: STANDARD_TOTAL_MINOR + 12500, serviceLinesMinor: 45000 + 12500 });
  });

  it('answers a quote that breaks the rules with 400 naming each field, and writes nothing', async () => {
    const world = await makeWorld();
    const c = await evaluatedCase(world);
    const cases: [unknown, string[]][] = [
      [{ lines: [] }, ['lines']],
      [{ lines: [{ kind: 'target_media', description: 'Drive', amountMinor: 100 }, { kind: 'return_shipping', description: 'Post', amountMinor: 0 }] }, ['lines']],
      [
        {
          lines: [
            { kind: 'service', description: 'Work', amountMinor: 0 },
            { kind: 'target_media', skill: 'logical', description: 'Drive', amountMinor: 100 },
            { kind: 'target_media', description: 'Second drive', amountMinor: 100 },
            { kind: 'return_shipping', description: 'Post', amountMinor: 0 },
          ],
        },
        ['lines.0.skill', 'lines.0.amountMinor', 'lines.1.skill', 'lines'],
      ],
      [{ lines: [{ kind: 'service', skill: 'levitation', description: '', amountMinor: 12.5 }] }, ['lines.0.skill', 'lines.0.description', 'lines.0.amountMinor']],
      [{ ...standardQuote, currency: 'EUR' }, ['currency']],
      [
        {
          lines: [
            { kind: 'service', skill: 'logical', description: 'Work', amountMinor: 20 },
            { kind: 'target_media', description: 'Drive', amountMinor: 0 },
            { kind: 'return_shipping', description: 'Post', amountMinor: 0 },
          ],
        },
        ['lines'],
      ],
    ];
    for (const [body, paths] of cases) {
      const res = await request(app).post(`/api/lab/cases/${c.id}/quote`).set(auth(world.manager.token)).send(body as object);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect((res.body.error.fields as { path: string }[]).map((f) => f.path), JSON.stringify(body)).toEqual(expect.arrayContaining(paths));
    }
    expect(await count(`SELECT count(*) AS n FROM lab_quotes WHERE referral_id = $1`, [c.id])).toBe(0);
    expect(await count(`SELECT count(*) AS n FROM outbox_messages WHERE recipient = $1 AND template = 'customer_quote_ready'`, [c.customerEmail])).toBe(0);
    const [{ status }] = await db.query(`SELECT status FROM referrals WHERE id = $1`, [c.id]);
    expect(status).toBe('evaluating');
  });

  it('needs the evaluation first', async () => {
    const world = await makeWorld();
    const c = await receivedCase(ctx, world);
    const received = await request(app).post(`/api/lab/cases/${c.id}/quote`).set(auth(world.manager.token)).send(standardQuote);
    expect(received.status).toBe(409);
    await request(app).post(`/api/lab/cases/${c.id}/evaluation/start`).set(auth(world.technician.token));
    const unevaluated = await request(app).post(`/api/lab/cases/${c.id}/quote`).set(auth(world.manager.token)).send(standardQuote);
    expect(unevaluated.status).toBe(409);
    expect(unevaluated.body.error.message).toMatch(/Record the evaluation/);
  });

  it('sends a revised quote that replaces the open one; the customer’s page for the old one is told to reload', async () => {
    const world = await makeWorld();
    const c = await quotedCase(ctx, world);

    const revised = await request(app)
      .post(`/api/lab/cases/${c.id}/quote`)
      .set(auth(world.manager.token))
      .send({ ...standardQuote, lines: standardQuote.lines.map((l) => (l.kind === 'service' ? { ...l, amountMinor: 39000 } : l)) });

    expect(revised.status).toBe(201);
    expect(revised.body.quote).toMatchObject({ version: 2, status: 'sent', totalMinor: STANDARD_TOTAL_MINOR - 6000 });
    const versions = await db.query(`SELECT version, status FROM lab_quotes WHERE referral_id = $1 ORDER BY version`, [c.id]);
    expect(versions).toEqual([
      { version: 1, status: 'superseded' },
      { version: 2, status: 'sent' },
    ]);
    expect(revised.body.timeline.at(-1).summary).toMatch(/revised quote \(version 2\): \$494\.00/);
    const stale = await request(app).post('/api/customer/case/quote/approve').set(customerAuth(c.token)).send({ quoteId: c.quoteId, fullName: 'Rowan Tillery', acceptTerms: true });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/Reload the page/);
    expect((await db.query(`SELECT status FROM referrals WHERE id = $1`, [c.id]))[0].status).toBe('quote_sent');
  });

  it('may follow a declined quote with a new one', async () => {
    const world = await makeWorld();
    const c = await quotedCase(ctx, world);
    const declined = await request(app).post('/api/customer/case/quote/decline').set(customerAuth(c.token)).send({ quoteId: c.quoteId, reason: 'More than I can spend now' });
    expect(declined.status).toBe(200);
    expect(declined.body.status).toBe('quote_declined');

    const again = await request(app).post(`/api/lab/cases/${c.id}/quote`).set(auth(world.manager.token)).send(standardQuote);
    expect(again.status).toBe(201);
    expect(again.body).toMatchObject({ status: 'quote_sent', quote: { version: 2, status: 'sent' } });
  });

  it('is for the lab manager of the lab that holds the case', async () => {
    const world = await makeWorld();
    const other = await makeWorld();
    const c = await evaluatedCase(world);
    expect((await request(app).post(`/api/lab/cases/${c.id}/quote`).set(auth(world.technician.token)).send(standardQuote)).status).toBe(403);
    expect((await request(app).post(`/api/lab/cases/${c.id}/quote`).set(auth(world.shopStaff.token)).send(standardQuote)).status).toBe(403);
    expect((await request(app).post(`/api/lab/cases/${c.id}/quote`).set(auth(other.manager.token)).send(standardQuote)).status).toBe(404);
    expect(await count(`SELECT count(*) AS n FROM lab_quotes WHERE referral_id = $1`, [c.id])).toBe(0);
  });
});
