import { parse } from 'csv-parse/sync';
import fc from 'fast-check';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { earningsDto, settlementOverviewDto, settlementRunDto, statementDetailDto, statementListDto } from '@shared/schemas/money';
import { postRefund } from '../../server/ledger';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { runSettlement } from '../../server/payouts';
import { setupApi, signIn, unique } from '../support/api';
import { TEST_PASSWORD } from '../support/factories';
import { mailsTo, onboardedAccount, paidCase, pdfText, planForShop, shopAndLab, startPaymentsFake, type MoneyOrgs } from '../support/money-fixtures';

// The monthly settlement against the payments fake, through the official SDK: statements, one transfer
// per shop and lab with the idempotency key settlement:<payee>:<period>, runs that pay nobody twice,
// negative totals carried forward, claw-backs, statements as CSV and PDF, the earnings and admin views.
// Every run here is scoped to the test's own shops and labs, and this file settles months of 2023 only,
// so it never touches what other test files (which use other months) are settling.

const payments = await startPaymentsFake();
const { app, db, config } = await setupApi(payments.env);
const ctx = { db, config };
const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
const admin = await signIn(app, 'ines.albright@platterpost.example', DEMO_PASSWORD);
const at = (period: string, dayOfMonth = 10) => new Date(`${period}-${String(dayOfMonth).padStart(2, '0')}T15:00:00Z`);

async function settle(period: string, orgs: string[]) {
  const res = await request(app).post('/api/network/settlements').set(auth(admin.accessToken)).send({ period, organizationIds: orgs });
  expect(res.status).toBe(201);
  return settlementRunDto.parse(res.body);
}

function transfersTo(account: string) {
  return [...payments.fake.state.store.collections.transfers.values()].filter((t) => t.destination === account);
}

async function statementsOf(organizationId: string) {
  const rows: { period: string; status: string; total: string; payout: string; carry: string; opening: string; transfer_id: string | null }[] = await db.query(
    `SELECT period, status, total_minor::text AS total, payout_minor::text AS payout, carry_forward_minor::text AS carry,
            opening_carry_minor::text AS opening, transfer_id
     FROM statements WHERE organization_id = $1 ORDER BY period`,
    [organizationId],
  );
  return rows.map((r) => ({ period: r.period, status: r.status, total: Number(r.total), payout: Number(r.payout), carry: Number(r.carry), opening: Number(r.opening), transferId: r.transfer_id }));
}

/** A shop and a lab with onboarded payout accounts and a plan of 10 % commission, 8 % network fee. */
async function payees(): Promise<MoneyOrgs & { partnerAccount: string; labAccount: string }> {
  const orgs = await shopAndLab(db);
  await planForShop(db, orgs.partnerId, [{ minPaidReferrals: 0, basisPoints: 1000 }], 800);
  return { ...orgs, partnerAccount: await onboardedAccount(db, payments, orgs.partnerId), labAccount: await onboardedAccount(db, payments, orgs.labId) };
}

describe('POST /api/network/settlements', () => {
  it('pays each shop and lab its period total with one transfer under settlement:<payee>:<period>', async () => {
    const p = await payees();
    const a = await paidCase(db, p, { totalMinor: 48_000, feeMinor: 1422, serviceLinesMinor: 40_000, paidAt: at('2023-03', 4) });
    const b = await paidCase(db, p, { totalMinor: 12_345, feeMinor: 388, serviceLinesMinor: 12_345, paidAt: at('2023-03', 28) });
    await paidCase(db, p, { totalMinor: 9_000, serviceLinesMinor: 9_000, paidAt: at('2023-04', 1) }); // next month: not in this run

    const run = await settle('2023-03', [p.partnerId, p.labId]);

    expect(run).toMatchObject({ period: '2023-03', trigger: 'manual', status: 'completed', startedByName: expect.any(String) });
    expect(run.summary).toMatchObject({ statementsCreated: 2, paid: 2, failed: 0, waitingForAccount: 0, carriedForward: 0 });
    // 10 % of $400.00 = 4000 cents; 10 % of $123.45 = 1234.5 cents, rounded half to even → 1234.
    expect([a.split.commissionMinor, b.split.commissionMinor]).toEqual([4000, 1234]);
    const expectedCommission = 5234;
    const toShop = transfersTo(p.partnerAccount);
    const toLab = transfersTo(p.labAccount);
    expect(toShop.map((t) => [t.amount, t.currency, t.transfer_group])).toEqual([[expectedCommission, 'usd', `settlement:${p.partnerId}:2023-03`]]);
    expect(toLab.map((t) => t.amount)).toEqual([a.split.labShareMinor + b.split.labShareMinor]);
    expect(payments.fake.state.idempotency.has(`settlement:${p.partnerId}:2023-03`)).toBe(true);
    expect(payments.fake.state.idempotency.has(`settlement:${p.labId}:2023-03`)).toBe(true);
    expect(await statementsOf(p.partnerId)).toEqual([
      { period: '2023-03', status: 'paid', total: expectedCommission, payout: expectedCommission, carry: 0, opening: 0, transferId: toShop[0]!.id },
    ]);

    // The ledger: the payable is debited by the payout, and the books still balance.
    const [payout] = await db.query(
      `SELECT sum(e.amount_minor) FILTER (WHERE a.kind = 'partner_commission_payable')::int AS payable,
              sum(e.amount_minor) FILTER (WHERE a.kind = 'transfers_out')::int AS out
       FROM ledger_transactions t JOIN ledger_entries e ON e.transaction_id = t.id JOIN ledger_accounts a ON a.id = e.account_id
       WHERE t.kind = 'payout' AND t.source_id = $1`,
      [toShop[0]!.id],
    );
    expect(payout).toEqual({ payable: expectedCommission, out: -expectedCommission });
    const check = await request(app).get('/api/network/ledger/check').set(auth(admin.accessToken));
    expect(check.body.subledgerMismatches.filter((m: { organizationId: string }) => [p.partnerId, p.labId].includes(m.organizationId))).toEqual([]);

    // Told by e-mail; audited.
    expect((await mailsTo(db, p.partnerAdmin.email)).map((m) => m.template)).toEqual(['statement_ready', 'payout_sent']);
    expect((await mailsTo(db, p.labManager.email)).map((m) => m.template)).toEqual(['statement_ready', 'payout_sent']);
    const audit = await db.query(`SELECT action FROM audit_events WHERE target_id = $1 ORDER BY at`, [run.id]);
    expect(audit.map((r: { action: string }) => r.action)).toEqual(['settlement.run_started', 'settlement.run_finished']);
  });

  it('pays nobody twice when run again, and puts a late line of the month on the next statement', async () => {
    const p = await payees();
    await paidCase(db, p, { totalMinor: 20_000, serviceLinesMinor: 20_000, paidAt: at('2023-05') });
    await settle('2023-05', [p.partnerId, p.labId]);

    const again = await settle('2023-05', [p.partnerId, p.labId]);
    // A payment dated May, recorded only after May was settled (a late webhook).
    await paidCase(db, p, { totalMinor: 5_000, serviceLinesMinor: 5_000, paidAt: at('2023-05', 30) });
    const againAfterLate = await settle('2023-05', [p.partnerId, p.labId]);
    const june = await settle('2023-06', [p.partnerId, p.labId]);

    expect(again.summary).toMatchObject({ statementsCreated: 0, paid: 0 });
    expect(againAfterLate.summary).toMatchObject({ statementsCreated: 0, paid: 0 });
    expect(june.summary).toMatchObject({ statementsCreated: 2, paid: 2 });
    expect(transfersTo(p.partnerAccount).map((t) => [t.transfer_group, t.amount])).toEqual([
      [`settlement:${p.partnerId}:2023-05`, 2000],
      [`settlement:${p.partnerId}:2023-06`, 500],
    ]);
    expect(transfersTo(p.labAccount)).toHaveLength(2);
  });

  it('carries a negative total forward, pays nothing for it, and sets it against the next statement', async () => {
    const p = await payees();
    const may = await paidCase(db, p, { totalMinor: 30_000, serviceLinesMinor: 30_000, paidAt: at('2023-07') });
    await settle('2023-07', [p.partnerId]);
    // After July was paid, the customer is refunded in full: the commission comes back as a negative line.
    await db.transaction((m) => postRefund(m, { referralId: may.id, amountMinor: 30_000, currency: 'USD', refundId: unique('re_'), refundedAt: at('2023-08', 2) }));
    await paidCase(db, p, { totalMinor: 10_000, serviceLinesMinor: 10_000, paidAt: at('2023-08', 20) }); // +1000
    const august = await settle('2023-08', [p.partnerId]);
    await paidCase(db, p, { totalMinor: 50_000, serviceLinesMinor: 50_000, paidAt: at('2023-09') }); // +5000
    await settle('2023-09', [p.partnerId]);

    expect(august.summary).toMatchObject({ statementsCreated: 1, paid: 0, carriedForward: 1 });
    expect(await statementsOf(p.partnerId)).toEqual([
      { period: '2023-07', status: 'paid', total: 3000, payout: 3000, carry: 0, opening: 0, transferId: expect.any(String) },
      { period: '2023-08', status: 'carried_forward', total: -2000, payout: 0, carry: -2000, opening: 0, transferId: null },
      { period: '2023-09', status: 'paid', total: 3000, payout: 3000, carry: 0, opening: -2000, transferId: expect.any(String) },
    ]);
    expect(transfersTo(p.partnerAccount).map((t) => t.amount)).toEqual([3000, 3000]);
    const mails = await mailsTo(db, p.partnerAdmin.email);
    expect(mails.filter((m) => m.template === 'statement_ready')).toHaveLength(3);
    expect(mails.find((m) => m.template === 'statement_ready' && m.subject.includes('2023-08'))!.text_body).toMatch(/nothing is paid this time/);
  });

  it('waits for a payout account, tells the shop once, and pays when the account is ready', async () => {
    const orgs = await shopAndLab(db);
    await planForShop(db, orgs.partnerId, [{ minPaidReferrals: 0, basisPoints: 1000 }]);
    await paidCase(db, orgs, { totalMinor: 10_000, serviceLinesMinor: 10_000, paidAt: at('2023-10') });

    const first = await settle('2023-10', [orgs.partnerId]);
    const second = await settle('2023-10', [orgs.partnerId]);
    const account = await onboardedAccount(db, payments, orgs.partnerId);
    const third = await settle('2023-10', [orgs.partnerId]);

    expect([first.summary.waitingForAccount, second.summary.waitingForAccount, third.summary.paid]).toEqual([1, 1, 1]);
    expect(transfersTo(account).map((t) => t.amount)).toEqual([1000]);
    expect((await mailsTo(db, orgs.partnerAdmin.email)).map((m) => m.template)).toEqual(['statement_ready', 'payout_failed', 'payout_sent']);
  });

  it('settles twice exactly as once (property)', async () => {
    let run = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.array(fc.record({ total: fc.integer({ min: 100, max: 500_000 }), share: fc.integer({ min: 0, max: 100 }), refund: fc.boolean() }), {
          minLength: 1,
          maxLength: 4,
        }),
        async (cases) => {
          run += 1;
          const once = await payees();
          const twice = await payees();
          for (const world of [once, twice]) {
            for (const [i, c] of cases.entries()) {
              const paid = await paidCase(db, world, { totalMinor: c.total, serviceLinesMinor: Math.floor((c.total * c.share) / 100), paidAt: at('2023-11', 1 + i) });
              if (c.refund) {
                await db.transaction((m) =>
                  postRefund(m, { referralId: paid.id, amountMinor: Math.ceil(c.total / 3), currency: 'USD', refundId: unique('re_'), refundedAt: at('2023-11', 20) }),
                );
              }
            }
          }
          await runSettlement(ctx, { period: '2023-11', trigger: 'manual', organizationIds: [once.partnerId, once.labId] });
          await runSettlement(ctx, { period: '2023-11', trigger: 'manual', organizationIds: [twice.partnerId, twice.labId] });
          await runSettlement(ctx, { period: '2023-11', trigger: 'manual', organizationIds: [twice.partnerId, twice.labId] });

          const view = async (w: typeof once) => ({
            shop: (await statementsOf(w.partnerId)).map(({ transferId: _t, ...s }) => s),
            lab: (await statementsOf(w.labId)).map(({ transferId: _t, ...s }) => s),
            shopTransfers: transfersTo(w.partnerAccount).map((t) => t.amount),
            labTransfers: transfersTo(w.labAccount).map((t) => t.amount),
          });
          const settledOnce = await view(once);
          // Not vacuous: whatever was due once is paid once.
          for (const s of [...settledOnce.shop, ...settledOnce.lab]) expect(s.status).toBe(s.payout > 0 ? 'paid' : s.total < 0 ? 'carried_forward' : 'nothing_due');
          expect(settledOnce.shopTransfers.length).toBe(settledOnce.shop.filter((s) => s.payout > 0).length);
          expect(await view(twice)).toEqual(settledOnce);
        },
      ),
      { numRuns: 5 },
    );
    expect(run).toBe(5);
  });

  it('refuses a month that has not ended, a malformed month, and anyone but the network admin', async () => {
    const p = await shopAndLab(db);
    const next = new Date();
    next.setUTCMonth(next.getUTCMonth() + 1);
    const future = next.toISOString().slice(0, 7);
    const notOver = await request(app).post('/api/network/settlements').set(auth(admin.accessToken)).send({ period: future });
    expect(notOver.status).toBe(422);
    expect(notOver.body.error.code).toBe('period_not_over');
    const malformed = await request(app).post('/api/network/settlements').set(auth(admin.accessToken)).send({ period: '2023-13' });
    expect(malformed.status).toBe(400);
    expect(malformed.body.error.fields[0].path).toBe('period');
    const shop = await signIn(app, p.partnerAdmin.email, TEST_PASSWORD);
    expect((await request(app).post('/api/network/settlements').set(auth(shop.accessToken)).send({ period: '2023-01' })).status).toBe(403);
    expect((await request(app).get('/api/network/settlements').set(auth(shop.accessToken))).status).toBe(403);
  });
});

describe('statements and earnings', () => {
  it('lets the shop admin download its statement as CSV and PDF, every line with its case', async () => {
    const p = await payees();
    const a = await paidCase(db, p, { totalMinor: 48_000, serviceLinesMinor: 40_000, paidAt: at('2023-12', 3) });
    const b = await paidCase(db, p, { totalMinor: 7_777, serviceLinesMinor: 7_777, paidAt: at('2023-12', 9) });
    await db.transaction((m) => postRefund(m, { referralId: a.id, amountMinor: 4_800, currency: 'USD', refundId: unique('re_'), refundedAt: at('2023-12', 12) }));
    await settle('2023-12', [p.partnerId]);
    const shop = await signIn(app, p.partnerAdmin.email, TEST_PASSWORD);

    const list = statementListDto.parse((await request(app).get('/api/partner/statements').set(auth(shop.accessToken))).body);
    expect(list.statements).toHaveLength(1);
    const statement = list.statements[0]!;
    const detail = statementDetailDto.parse((await request(app).get(`/api/partner/statements/${statement.id}`).set(auth(shop.accessToken))).body);
    expect(detail.lines.map((l) => [l.reference, l.kind, l.amountMinor])).toEqual([
      [a.reference, 'commission', 4000],
      [b.reference, 'commission', 778], // 10 % of 77.77 = 7.777 → 7.78
      [a.reference, 'commission_clawback', -400],
    ]);
    expect(detail.totalMinor).toBe(4000 + 778 - 400);

    const csv = await request(app).get(`/api/partner/statements/${statement.id}/csv`).set(auth(shop.accessToken));
    expect(csv.status).toBe(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    expect(csv.headers['content-disposition']).toMatch(/attachment; filename="platterpost-statement-.*-2023-12\.csv"/);
    const rows: Record<string, string>[] = parse(csv.text, { columns: true });
    expect(rows.slice(0, 3).map((r) => [r.case_reference, r.line, r.amount, r.currency])).toEqual([
      [a.reference, 'Commission', '40.00', 'USD'],
      [b.reference, 'Commission', '7.78', 'USD'],
      [a.reference, 'Refund clawback', '-4.00', 'USD'],
    ]);
    expect(rows[0]!.case_url).toBe(`http://app.test/partner/cases/${a.id}`);
    expect(rows[0]).toMatchObject({ base: '400.00', rate: '10 %' });
    expect(rows.find((r) => r.line === 'Paid out')!.amount).toBe('43.78');

    const pdf = await request(app).get(`/api/partner/statements/${statement.id}/pdf`).set(auth(shop.accessToken)).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(pdf.headers['content-type']).toBe('application/pdf');
    const text = await pdfText(pdf.body as Buffer);
    expect(text).toContain(a.reference);
    expect(text).toContain(b.reference);
    expect(text).toContain('$43.78');

    // Another shop's admin does not find it.
    const other = await shopAndLab(db);
    const stranger = await signIn(app, other.partnerAdmin.email, TEST_PASSWORD);
    expect((await request(app).get(`/api/partner/statements/${statement.id}/csv`).set(auth(stranger.accessToken))).status).toBe(404);
  });

  it('writes JPY statements in whole yen (ISO 4217 minor unit 0, from Intl) and keys a second currency apart', async () => {
    const p = await payees();
    await planForShop(db, p.partnerId, [{ minPaidReferrals: 0, basisPoints: 1250 }], 0);
    await paidCase(db, p, { currency: 'JPY', totalMinor: 120_000, serviceLinesMinor: 100_003, paidAt: at('2023-02') });
    await paidCase(db, p, { totalMinor: 10_000, serviceLinesMinor: 10_000, paidAt: at('2023-02', 5) });
    await settle('2023-02', [p.partnerId]);

    const groups = transfersTo(p.partnerAccount).map((t) => [t.transfer_group, t.currency, t.amount]).sort();
    // 12.5 % of ¥100 003 = ¥12 500.375 → ¥12 500.
    expect(groups).toEqual([
      [`settlement:${p.partnerId}:2023-02`, 'usd', 1250],
      [`settlement:${p.partnerId}:2023-02:jpy`, 'jpy', 12_500],
    ]);
    const shop = await signIn(app, p.partnerAdmin.email, TEST_PASSWORD);
    const list = statementListDto.parse((await request(app).get('/api/partner/statements').set(auth(shop.accessToken))).body);
    const jpy = list.statements.find((s) => s.currency === 'JPY')!;
    const csv = await request(app).get(`/api/partner/statements/${jpy.id}/csv`).set(auth(shop.accessToken));
    const rows: Record<string, string>[] = parse(csv.text, { columns: true });
    expect(rows[0]).toMatchObject({ base: '100003', amount: '12500', currency: 'JPY' });
  });

  it("shows the shop its accrued, pending and paid commission by month", async () => {
    const p = await payees();
    await paidCase(db, p, { totalMinor: 10_000, serviceLinesMinor: 10_000, paidAt: at('2023-01') });
    await settle('2023-01', [p.partnerId]);
    const recent = await paidCase(db, p, { totalMinor: 30_000, serviceLinesMinor: 30_000, paidAt: new Date() });
    const shop = await signIn(app, p.partnerAdmin.email, TEST_PASSWORD);

    const res = await request(app).get('/api/partner/earnings').set(auth(shop.accessToken));

    expect(res.status).toBe(200);
    const earnings = earningsDto.parse(res.body);
    expect(earnings.totals).toEqual([{ currency: 'USD', accruedMinor: 4000, paidMinor: 1000, pendingMinor: 3000, unsettledMinor: 3000, carriedForwardMinor: 0 }]);
    expect(earnings.statements.map((s) => [s.period, s.status])).toEqual([['2023-01', 'paid']]);
    expect(earnings.recentLines[0]).toMatchObject({ reference: recent.reference, amountMinor: 3000, statementId: null });
    expect(earnings.payoutAccount).toMatchObject({ status: 'enabled', payoutsEnabled: true });
    const thisMonth = new Date().toISOString().slice(0, 7);
    expect(earnings.months.find((m) => m.period === thisMonth)).toMatchObject({ accruedMinor: 3000, paidMinor: 0, lineCount: 1 });
    const lines = await request(app).get('/api/partner/earnings/lines').query({ period: thisMonth }).set(auth(shop.accessToken));
    expect(lines.body.lines.map((l: { reference: string }) => l.reference)).toEqual([recent.reference]);
  });

  it('shows the network admin the runs, the period totals and each statement', async () => {
    const p = await payees();
    await paidCase(db, p, { totalMinor: 10_000, serviceLinesMinor: 10_000, paidAt: at('2023-04', 15) });
    const run = await settle('2023-04', [p.partnerId, p.labId]);

    const overview = settlementOverviewDto.parse((await request(app).get('/api/network/settlements').set(auth(admin.accessToken))).body);
    const period = await request(app).get('/api/network/settlements/2023-04').set(auth(admin.accessToken));

    expect(overview.runs.map((r) => r.id)).toContain(run.id);
    expect(overview.periods.find((x) => x.period === '2023-04' && x.currency === 'USD')!.paidMinor).toBeGreaterThanOrEqual(1000);
    expect(overview.suggestedPeriod).toMatch(/^\d{4}-\d{2}$/);
    const ours = period.body.statements.filter((s: { organizationId: string }) => [p.partnerId, p.labId].includes(s.organizationId));
    expect(ours.map((s: { payeeKind: string; status: string }) => [s.payeeKind, s.status]).sort()).toEqual([
      ['lab', 'paid'],
      ['partner', 'paid'],
    ]);
    const csv = await request(app).get(`/api/network/statements/${ours[0].id}/csv`).set(auth(admin.accessToken));
    expect(csv.status).toBe(200);
  });
});
