import fc from 'fast-check';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { cardFeeMinor } from '@shared/domain/money';
import { ledgerCheckDto } from '@shared/schemas/money';
import { postCustomerPayment, postRefund } from '../../server/ledger';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { setupApi, signIn, unique } from '../support/api';
import { TEST_PASSWORD } from '../support/factories';
import { insertCase, paidCase, planForShop, shopAndLab } from '../support/money-fixtures';

// The double-entry ledger: what a customer payment and a refund post, idempotency per provider id, the
// database's own balance check at commit, and the network admin's balance check.
// Card fees follow the provider's published US rate (from memory: 2.9 % + 30¢), as cardFeeMinor does.

const { app, db } = await setupApi();
const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
const day = (n: number) => new Date(Date.UTC(2024, 0, 1) + n * 86_400_000);

async function entriesOf(transactionId: string) {
  const rows: { kind: string; organization_id: string | null; amount: string; memo: string; currency: string }[] = await db.query(
    `SELECT a.kind, a.organization_id, e.amount_minor::text AS amount, e.memo, e.currency FROM ledger_entries e
     JOIN ledger_accounts a ON a.id = e.account_id WHERE e.transaction_id = $1 ORDER BY e.id`,
    [transactionId],
  );
  return rows.map((r) => ({ kind: r.kind, org: r.organization_id, amount: Number(r.amount), memo: r.memo, currency: r.currency }));
}

async function linesOf(referralId: string) {
  const rows: { kind: string; amount: string; basis_points: number | null; paid_referrals: number | null }[] = await db.query(
    `SELECT kind, amount_minor::text AS amount, basis_points, paid_referrals FROM earning_lines WHERE referral_id = $1 ORDER BY created_at, kind`,
    [referralId],
  );
  return rows.map((r) => ({ kind: r.kind, amount: Number(r.amount), basisPoints: r.basis_points, paidReferrals: r.paid_referrals }));
}

describe('postCustomerPayment', () => {
  it('posts one balanced transaction: processor fee, network fee and commission out of the lab share', async () => {
    const orgs = await shopAndLab(db);
    await planForShop(db, orgs.partnerId, [{ minPaidReferrals: 0, basisPoints: 1000 }], 800);
    const fee = cardFeeMinor(48_000); // 2.9 % of $480 = $13.92, + 30¢
    expect(fee).toBe(1422);

    const paid = await paidCase(db, orgs, { totalMinor: 48_000, feeMinor: fee, serviceLinesMinor: 40_000, paidAt: day(3) });

    expect(paid.created).toBe(true);
    expect(paid.split).toEqual({ totalMinor: 48_000, feeMinor: 1422, networkFeeMinor: 3200, commissionMinor: 4000, labShareMinor: 39_378 });
    const entries = await entriesOf(paid.ledgerTransactionId);
    expect(entries.map((e) => [e.kind, e.amount])).toEqual([
      ['processor_clearing', 48_000],
      ['processor_clearing', -1422],
      ['processor_fees', 1422],
      ['network_revenue', -1422],
      ['network_revenue', -3200],
      ['partner_commission_payable', -4000],
      ['lab_payable', -39_378],
    ]);
    expect(entries.reduce((s, e) => s + e.amount, 0)).toBe(0);
    expect(entries.find((e) => e.kind === 'partner_commission_payable')!.org).toBe(orgs.partnerId);
    expect(entries.find((e) => e.kind === 'lab_payable')!.org).toBe(orgs.labId);
    expect(await linesOf(paid.id)).toEqual([
      { kind: 'commission', amount: 4000, basisPoints: 1000, paidReferrals: 1 },
      { kind: 'lab_share', amount: 39_378, basisPoints: null, paidReferrals: null },
    ]);
  });

  it('is idempotent per payment intent, also when the same payment arrives twice at once', async () => {
    const orgs = await shopAndLab(db);
    await planForShop(db, orgs.partnerId, [{ minPaidReferrals: 0, basisPoints: 1000 }]);
    const kase = await insertCase(db, orgs.partnerId, orgs.labId);
    const input = {
      referralId: kase.id,
      partnerOrganizationId: orgs.partnerId,
      labOrganizationId: orgs.labId,
      currency: 'usd',
      totalMinor: 20_000,
      feeMinor: cardFeeMinor(20_000),
      serviceLinesMinor: 18_000,
      paymentIntentId: unique('pi_'),
      paidAt: day(5),
    };
    const [a, b] = await Promise.all([db.transaction((m) => postCustomerPayment(m, input)), db.transaction((m) => postCustomerPayment(m, input))]);
    const again = await db.transaction((m) => postCustomerPayment(m, input));

    expect([a.created, b.created].sort()).toEqual([false, true]);
    expect(again).toMatchObject({ created: false, ledgerTransactionId: a.ledgerTransactionId, currency: 'USD' });
    expect(b.ledgerTransactionId).toBe(a.ledgerTransactionId);
    const [{ n }] = await db.query(`SELECT count(*)::int AS n FROM ledger_transactions WHERE source_id = $1`, [input.paymentIntentId]);
    expect(n).toBe(1);
    expect((await linesOf(kase.id)).length).toBe(2);
  });

  it("picks the tier by the shop's paid referrals in the 90 days up to the payment", async () => {
    const orgs = await shopAndLab(db);
    await planForShop(db, orgs.partnerId, [
      { minPaidReferrals: 0, basisPoints: 1000 },
      { minPaidReferrals: 3, basisPoints: 1500 },
    ]);
    const pay = (n: number) => paidCase(db, orgs, { totalMinor: 10_000, serviceLinesMinor: 10_000, paidAt: day(n) });
    const first = await pay(0);
    const second = await pay(10);
    const third = await pay(20);
    // Day 105: the window (day 15, day 105] holds the third case only, so this is the 2nd in the window.
    const fourth = await pay(105);

    expect([first, second, third, fourth].map((p) => [p.commission.paidReferrals, p.commission.basisPoints, p.split.commissionMinor])).toEqual([
      [1, 1000, 1000],
      [2, 1000, 1000],
      [3, 1500, 1500],
      [2, 1000, 1000],
    ]);
  });

  it('refuses amounts that do not fit and a shop that did not refer the case', async () => {
    const orgs = await shopAndLab(db);
    const other = await shopAndLab(db);
    const kase = await insertCase(db, orgs.partnerId, orgs.labId);
    const base = {
      referralId: kase.id,
      partnerOrganizationId: orgs.partnerId,
      labOrganizationId: orgs.labId,
      currency: 'USD',
      totalMinor: 1000,
      feeMinor: 59,
      serviceLinesMinor: 1000,
      paymentIntentId: unique('pi_'),
      paidAt: day(1),
    };
    await expect(db.transaction((m) => postCustomerPayment(m, { ...base, serviceLinesMinor: 1001 }))).rejects.toMatchObject({ status: 400 });
    await expect(db.transaction((m) => postCustomerPayment(m, { ...base, totalMinor: 10.5 }))).rejects.toMatchObject({ status: 400, code: 'validation_failed' });
    await expect(db.transaction((m) => postCustomerPayment(m, { ...base, currency: 'XYZ' }))).rejects.toMatchObject({ status: 400 });
    await expect(db.transaction((m) => postCustomerPayment(m, { ...base, partnerOrganizationId: other.partnerId }))).rejects.toMatchObject({ status: 409 });
    const [{ n }] = await db.query(`SELECT count(*)::int AS n FROM earning_lines WHERE referral_id = $1`, [kase.id]);
    expect(n).toBe(0);
  });

  it('keeps currencies apart: a JPY payment posts whole yen to JPY accounts (ISO 4217: JPY has 0 decimals)', async () => {
    const orgs = await shopAndLab(db);
    await planForShop(db, orgs.partnerId, [{ minPaidReferrals: 0, basisPoints: 1250 }], 500);
    const paid = await paidCase(db, orgs, { currency: 'JPY', totalMinor: 12_345, feeMinor: 400, serviceLinesMinor: 10_001, paidAt: day(2) });
    // 12.5 % of ¥10 001 = ¥1 250.125 → ¥1 250; 5 % = ¥500.05 → ¥500.
    expect(paid.split).toMatchObject({ commissionMinor: 1250, networkFeeMinor: 500, labShareMinor: 12_345 - 400 - 500 - 1250 });
    const entries = await entriesOf(paid.ledgerTransactionId);
    expect(new Set(entries.map((e) => e.currency))).toEqual(new Set(['JPY']));
  });
});

describe('postRefund', () => {
  it('shares a refund in proportion, claws back commission as a negative line, and reverses exactly in the end', async () => {
    const orgs = await shopAndLab(db);
    await planForShop(db, orgs.partnerId, [{ minPaidReferrals: 0, basisPoints: 1000 }], 800);
    const paid = await paidCase(db, orgs, { totalMinor: 48_000, feeMinor: 1422, serviceLinesMinor: 40_000, paidAt: day(3) });
    const first = await db.transaction((m) =>
      postRefund(m, { referralId: paid.id, amountMinor: 12_001, currency: 'USD', refundId: unique('re_'), refundedAt: day(4) }),
    );
    const rest = await db.transaction((m) =>
      postRefund(m, { referralId: paid.id, amountMinor: 48_000 - 12_001, currency: 'USD', refundId: unique('re_'), refundedAt: day(6) }),
    );

    expect(first.reversal.labMinor + first.reversal.networkMinor + first.reversal.partnerMinor).toBe(12_001);
    // The lab gives back its share and the processor fee it bore (the processor keeps its fee on a refund).
    expect({
      lab: first.reversal.labMinor + rest.reversal.labMinor,
      network: first.reversal.networkMinor + rest.reversal.networkMinor,
      partner: first.reversal.partnerMinor + rest.reversal.partnerMinor,
    }).toEqual({ lab: 39_378 + 1422, network: 3200, partner: 4000 });
    const entries = await entriesOf(first.ledgerTransactionId);
    expect(entries.reduce((s, e) => s + e.amount, 0)).toBe(0);
    expect(entries.find((e) => e.kind === 'refunds')!.amount).toBe(-12_001);
    const lines = await linesOf(paid.id);
    expect(lines.filter((l) => l.kind === 'commission_clawback').map((l) => l.amount)).toEqual([-first.reversal.partnerMinor, -rest.reversal.partnerMinor]);
    expect(lines.filter((l) => l.kind.startsWith('commission')).reduce((s, l) => s + l.amount, 0)).toBe(0);
    expect(lines.filter((l) => l.kind.startsWith('lab')).reduce((s, l) => s + l.amount, 0)).toBe(-1422);
  });

  it('is idempotent per refund id and refuses a refund beyond the payment or before any payment', async () => {
    const orgs = await shopAndLab(db);
    const paid = await paidCase(db, orgs, { totalMinor: 5000, serviceLinesMinor: 5000, paidAt: day(1) });
    const input = { referralId: paid.id, amountMinor: 1000, currency: 'USD', refundId: unique('re_'), refundedAt: day(2) };
    const once = await db.transaction((m) => postRefund(m, input));
    const twice = await db.transaction((m) => postRefund(m, input));
    expect(twice).toEqual({ ...once, created: false });

    await expect(db.transaction((m) => postRefund(m, { ...input, refundId: unique('re_'), amountMinor: 4001 }))).rejects.toMatchObject({
      status: 409,
      code: 'refund_exceeds_payment',
    });
    const unpaid = await insertCase(db, orgs.partnerId, orgs.labId, 'approved');
    await expect(db.transaction((m) => postRefund(m, { ...input, referralId: unpaid.id, refundId: unique('re_') }))).rejects.toMatchObject({
      status: 409,
      code: 'refund_without_payment',
    });
  });
});

describe('the database guards the books', () => {
  async function rawTransaction(entries: { amount: number; currency?: string }[]) {
    return db.transaction(async (m) => {
      const [t] = await m.query(
        `INSERT INTO ledger_transactions (kind, source_id, currency, occurred_at, memo) VALUES ('payout', $1, 'USD', now(), 'test') RETURNING id`,
        [unique('tr_')],
      );
      const [account] = await m.query(`SELECT id FROM ledger_accounts WHERE kind = 'processor_clearing' AND currency = 'USD'`);
      for (const e of entries) {
        await m.query(`INSERT INTO ledger_entries (transaction_id, account_id, amount_minor, currency, memo) VALUES ($1, $2, $3, $4, 'test')`, [
          t.id,
          account.id,
          e.amount,
          e.currency ?? 'USD',
        ]);
      }
    });
  }

  it('refuses at commit a transaction whose entries do not sum to zero, have one entry or mix currencies', async () => {
    await paidCase(db, await shopAndLab(db), { totalMinor: 1000, serviceLinesMinor: 0, paidAt: day(1) }); // opens the accounts
    await expect(rawTransaction([{ amount: 100 }, { amount: -99 }])).rejects.toThrow(/does not balance: its entries sum to 1/);
    await expect(rawTransaction([{ amount: 100 }])).rejects.toThrow(/needs at least two/);
    await expect(rawTransaction([{ amount: 100 }, { amount: -100, currency: 'EUR' }])).rejects.toThrow(/mixes currencies/);
    await expect(rawTransaction([{ amount: 100 }, { amount: -100 }])).resolves.toBeUndefined();
  });

  it('keeps entries append-only', async () => {
    await expect(db.query(`UPDATE ledger_entries SET amount_minor = amount_minor WHERE id = (SELECT min(id) FROM ledger_entries)`)).rejects.toThrow(
      /append-only/,
    );
    await expect(db.query(`DELETE FROM ledger_transactions WHERE id = (SELECT id FROM ledger_transactions LIMIT 1)`)).rejects.toThrow(/append-only/);
  });

  it('every transaction sums to zero and the payables agree with their lines, whatever payments and refunds come (property)', async () => {
    const orgs = await shopAndLab(db);
    await planForShop(db, orgs.partnerId, [
      { minPaidReferrals: 0, basisPoints: 1000 },
      { minPaidReferrals: 2, basisPoints: 1333 },
    ]);
    let n = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 50, max: 2_000_000 }),
        fc.integer({ min: 0, max: 100 }),
        fc.array(fc.integer({ min: 1, max: 100 }), { maxLength: 3 }),
        async (total, servicePercent, refundPercents) => {
          n += 1;
          const service = Math.floor((total * servicePercent) / 100);
          const paid = await paidCase(db, orgs, { totalMinor: total, feeMinor: Math.min(cardFeeMinor(total), total), serviceLinesMinor: service, paidAt: day(n) });
          let left = total;
          let refunds = 0;
          for (const p of refundPercents) {
            const amount = Math.max(1, Math.floor((left * p) / 100));
            if (amount > left) break;
            left -= amount;
            refunds += 1;
            await db.transaction((m) => postRefund(m, { referralId: paid.id, amountMinor: amount, currency: 'USD', refundId: unique('re_'), refundedAt: day(n) }));
          }
          const sums: { sum: string }[] = await db.query(
            `SELECT sum(e.amount_minor)::text AS sum FROM ledger_transactions t JOIN ledger_entries e ON e.transaction_id = t.id
             WHERE t.referral_id = $1 GROUP BY t.id`,
            [paid.id],
          );
          expect(sums.length).toBe(1 + refunds);
          for (const s of sums) expect(Number(s.sum)).toBe(0);
        },
      ),
      { numRuns: 15 },
    );
    const [payable] = await db.query(
      `SELECT coalesce(sum(e.amount_minor), 0)::text AS balance FROM ledger_entries e JOIN ledger_accounts a ON a.id = e.account_id
       WHERE a.kind = 'partner_commission_payable' AND a.organization_id = $1`,
      [orgs.partnerId],
    );
    const [lines] = await db.query(`SELECT sum(amount_minor)::text AS earned FROM earning_lines WHERE organization_id = $1`, [orgs.partnerId]);
    expect(Number(payable.balance)).toBe(-Number(lines.earned));
  });
});

describe('GET /api/network/ledger/check', () => {
  it('shows the network admin that every currency sums to zero and no transaction is out of balance', async () => {
    await paidCase(db, await shopAndLab(db), { totalMinor: 7000, feeMinor: 233, serviceLinesMinor: 6000, paidAt: day(8) });
    const admin = await signIn(app, 'ines.albright@platterpost.example', DEMO_PASSWORD);
    const res = await request(app).get('/api/network/ledger/check').set(auth(admin.accessToken));

    expect(res.status).toBe(200);
    const body = ledgerCheckDto.parse(res.body);
    expect(body.unbalancedTransactions).toEqual([]);
    expect(body.currencies.find((c) => c.currency === 'USD')).toMatchObject({ sumMinor: 0 });
    expect(body.currencies.every((c) => c.sumMinor === 0)).toBe(true);
    expect(body.accounts.map((a) => a.kind)).toEqual(expect.arrayContaining(['processor_clearing', 'processor_fees', 'lab_payable', 'network_revenue']));
  });

  it('is the network admin’s alone', async () => {
    const orgs = await shopAndLab(db);
    const shop = await signIn(app, orgs.partnerAdmin.email, TEST_PASSWORD);
    expect((await request(app).get('/api/network/ledger/check').set(auth(shop.accessToken))).status).toBe(403);
    expect((await request(app).get('/api/network/ledger/check')).status).toBe(401);
  });
});
