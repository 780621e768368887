import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { commissionPlanDto, commissionPlanListDto } from '@shared/schemas/money';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { setupApi, signIn, unique } from '../support/api';
import { TEST_PASSWORD } from '../support/factories';
import { paidCase, shopAndLab } from '../support/money-fixtures';

// Commission plans (network admin): create, change, retire, assign to shops, each change audited; a new
// rate applies to cases paid from then on. Rates and thresholds are invented for the tests.

const { app, db } = await setupApi();
const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
const admin = await signIn(app, 'ines.albright@platterpost.example', DEMO_PASSWORD);
const asAdmin = () => auth(admin.accessToken);
const day = (n: number) => new Date(Date.UTC(2024, 5, 1) + n * 86_400_000);

const standardTiers = [
  { minPaidReferrals: 0, basisPoints: 1000 },
  { minPaidReferrals: 10, basisPoints: 1250 },
];

async function auditOf(targetId: string) {
  return db.query(`SELECT action, details FROM audit_events WHERE target_id = $1 ORDER BY at`, [targetId]) as Promise<
    { action: string; details: Record<string, unknown> }[]
  >;
}

async function createPlan(body: Record<string, unknown>) {
  return request(app).post('/api/network/commission-plans').set(asAdmin()).send(body);
}

// A test below makes a plan the default; the one that was the default before is the default again after.
const [previousDefault] = await db.query(`SELECT id FROM commission_plans WHERE is_default`);
afterAll(async () => {
  if (!previousDefault) return;
  await db.transaction(async (m) => {
    await m.query(`UPDATE commission_plans SET is_default = false WHERE is_default`);
    await m.query(`UPDATE commission_plans SET is_default = true WHERE id = $1`, [previousDefault.id]);
  });
});

describe('commission plans', () => {
  it('lets the network admin create a plan, audited, and lists it', async () => {
    const name = unique('Counter plan ');
    const res = await createPlan({ name, tiers: standardTiers, networkFeeBasisPoints: 800 });

    expect(res.status).toBe(201);
    const plan = commissionPlanDto.parse(res.body);
    expect(plan).toMatchObject({ name, tiers: standardTiers, networkFeeBasisPoints: 800, isDefault: false, partners: [] });
    expect(await auditOf(plan.id)).toEqual([{ action: 'commission_plan.created', details: { after: { name, tiers: standardTiers, networkFeeBasisPoints: 800, isDefault: false } } }]);
    const list = commissionPlanListDto.parse((await request(app).get('/api/network/commission-plans').set(asAdmin())).body);
    expect(list.plans.map((p) => p.id)).toContain(plan.id);
  });

  it('refuses tiers out of order, rates above 50 % and a name already in use, naming the field', async () => {
    const notFromZero = await createPlan({ name: unique('P '), tiers: [{ minPaidReferrals: 5, basisPoints: 1000 }], networkFeeBasisPoints: 0 });
    expect(notFromZero.status).toBe(400);
    expect(notFromZero.body.error.fields).toEqual([{ path: 'tiers.0.minPaidReferrals', message: 'The first tier must start at 0 paid referrals' }]);

    const notIncreasing = await createPlan({
      name: unique('P '),
      tiers: [
        { minPaidReferrals: 0, basisPoints: 1000 },
        { minPaidReferrals: 0, basisPoints: 1200 },
      ],
      networkFeeBasisPoints: 0,
    });
    expect(notIncreasing.body.error.fields).toEqual([{ path: 'tiers.1.minPaidReferrals', message: 'Each tier must start at more paid referrals than the one before' }]);

    const tooHigh = await createPlan({ name: unique('P '), tiers: [{ minPaidReferrals: 0, basisPoints: 5001 }], networkFeeBasisPoints: 0 });
    expect(tooHigh.body.error.fields.map((f: { path: string }) => f.path)).toEqual(['tiers.0.basisPoints']);
    const fractional = await createPlan({ name: unique('P '), tiers: [{ minPaidReferrals: 0, basisPoints: 12.5 }], networkFeeBasisPoints: 0 });
    expect(fractional.status).toBe(400);

    const name = unique('Taken ');
    expect((await createPlan({ name, tiers: standardTiers, networkFeeBasisPoints: 0 })).status).toBe(201);
    const taken = await createPlan({ name: name.toUpperCase(), tiers: standardTiers, networkFeeBasisPoints: 0 });
    expect(taken.status).toBe(409);
    expect(taken.body.error.fields).toEqual([{ path: 'name', message: 'Choose a name no other plan has' }]);
  });

  it('applies a changed rate to cases paid from then on; lines already accrued keep theirs', async () => {
    const orgs = await shopAndLab(db);
    const plan = (await createPlan({ name: unique('Changing '), tiers: [{ minPaidReferrals: 0, basisPoints: 1000 }], networkFeeBasisPoints: 500 })).body;
    expect((await request(app).put(`/api/network/partners/${orgs.partnerId}/commission-plan`).set(asAdmin()).send({ planId: plan.id })).status).toBe(200);
    const before = await paidCase(db, orgs, { totalMinor: 10_000, serviceLinesMinor: 10_000, paidAt: day(1) });

    const patched = await request(app)
      .patch(`/api/network/commission-plans/${plan.id}`)
      .set(asAdmin())
      .send({ tiers: [{ minPaidReferrals: 0, basisPoints: 1500 }] });
    const after = await paidCase(db, orgs, { totalMinor: 10_000, serviceLinesMinor: 10_000, paidAt: day(2) });

    expect(patched.status).toBe(200);
    expect(patched.body.tiers).toEqual([{ minPaidReferrals: 0, basisPoints: 1500 }]);
    expect([before.split.commissionMinor, after.split.commissionMinor]).toEqual([1000, 1500]);
    const [line] = await db.query(`SELECT amount_minor::int AS amount, basis_points FROM earning_lines WHERE referral_id = $1 AND kind = 'commission'`, [before.id]);
    expect(line).toEqual({ amount: 1000, basis_points: 1000 });
    const audit = await auditOf(plan.id);
    expect(audit.map((a) => a.action)).toEqual(['commission_plan.created', 'commission_plan.updated']);
    expect(audit[1]!.details).toMatchObject({
      before: { tiers: [{ minPaidReferrals: 0, basisPoints: 1000 }] },
      after: { tiers: [{ minPaidReferrals: 0, basisPoints: 1500 }] },
    });
  });

  it('puts shops without a plan of their own on the default plan, and one default at a time', async () => {
    const orgs = await shopAndLab(db);
    const first = (await createPlan({ name: unique('Default A '), tiers: [{ minPaidReferrals: 0, basisPoints: 700 }], networkFeeBasisPoints: 300, isDefault: true })).body;
    const second = (await createPlan({ name: unique('Default B '), tiers: [{ minPaidReferrals: 0, basisPoints: 900 }], networkFeeBasisPoints: 300 })).body;
    const underFirst = await paidCase(db, orgs, { totalMinor: 10_000, serviceLinesMinor: 10_000, paidAt: day(3) });

    const made = await request(app).patch(`/api/network/commission-plans/${second.id}`).set(asAdmin()).send({ isDefault: true });
    const underSecond = await paidCase(db, orgs, { totalMinor: 10_000, serviceLinesMinor: 10_000, paidAt: day(4) });

    expect(made.body.isDefault).toBe(true);
    expect((await request(app).get(`/api/network/commission-plans/${first.id}`).set(asAdmin())).body.isDefault).toBe(false);
    expect([underFirst.commission.planId, underFirst.split.commissionMinor]).toEqual([first.id, 700]);
    expect([underSecond.commission.planId, underSecond.split.commissionMinor, underSecond.split.networkFeeMinor]).toEqual([second.id, 900, 300]);
    const [{ n }] = await db.query(`SELECT count(*)::int AS n FROM commission_plans WHERE is_default`);
    expect(n).toBe(1);
  });

  it('assigns a plan to a shop and back to the default, audited; refuses unknown plans and non-shops', async () => {
    const orgs = await shopAndLab(db);
    const plan = (await createPlan({ name: unique('Own '), tiers: standardTiers, networkFeeBasisPoints: 0 })).body;
    const put = (partnerId: string, planId: string | null) =>
      request(app).put(`/api/network/partners/${partnerId}/commission-plan`).set(asAdmin()).send({ planId });

    const assigned = await put(orgs.partnerId, plan.id);
    expect(assigned.body).toEqual({ partnerOrganizationId: orgs.partnerId, planId: plan.id, effectivePlanId: plan.id });
    expect((await request(app).get(`/api/network/commission-plans/${plan.id}`).set(asAdmin())).body.partners.map((p: { id: string }) => p.id)).toEqual([orgs.partnerId]);
    const back = await put(orgs.partnerId, null);
    const [def] = await db.query(`SELECT id FROM commission_plans WHERE is_default`);
    expect(back.body).toEqual({ partnerOrganizationId: orgs.partnerId, planId: null, effectivePlanId: def?.id ?? null });
    expect((await auditOf(orgs.partnerId)).map((a) => a.details)).toEqual([
      { previousPlanId: null, planId: plan.id },
      { previousPlanId: plan.id, planId: null },
    ]);

    expect((await put(orgs.partnerId, '00000000-0000-4000-8000-000000000000')).status).toBe(400);
    expect((await put(orgs.labId, plan.id)).status).toBe(404);
  });

  it('retires a plan and moves its shops to the default; the default itself cannot be retired', async () => {
    const orgs = await shopAndLab(db);
    const plan = (await createPlan({ name: unique('Retiring '), tiers: standardTiers, networkFeeBasisPoints: 0 })).body;
    await request(app).put(`/api/network/partners/${orgs.partnerId}/commission-plan`).set(asAdmin()).send({ planId: plan.id });

    const retired = await request(app).delete(`/api/network/commission-plans/${plan.id}`).set(asAdmin());

    expect(retired.status).toBe(204);
    expect((await request(app).get(`/api/network/commission-plans/${plan.id}`).set(asAdmin())).status).toBe(404);
    const [assignment] = await db.query(`SELECT 1 FROM partner_commission_plans WHERE partner_organization_id = $1`, [orgs.partnerId]);
    expect(assignment).toBeUndefined();
    expect((await auditOf(plan.id)).at(-1)).toMatchObject({ action: 'commission_plan.archived', details: { partnersMovedToDefault: [orgs.partnerId] } });
    const [def] = await db.query(`SELECT id FROM commission_plans WHERE is_default`);
    if (def) expect((await request(app).delete(`/api/network/commission-plans/${def.id}`).set(asAdmin())).status).toBe(409);
  });

  it('is the network admin’s alone', async () => {
    const orgs = await shopAndLab(db);
    const shop = await signIn(app, orgs.partnerAdmin.email, TEST_PASSWORD);
    expect((await request(app).get('/api/network/commission-plans').set(auth(shop.accessToken))).status).toBe(403);
    expect((await request(app).post('/api/network/commission-plans').set(auth(shop.accessToken)).send({ name: 'x', tiers: standardTiers })).status).toBe(403);
    expect((await request(app).put(`/api/network/partners/${orgs.partnerId}/commission-plan`).set(auth(shop.accessToken)).send({ planId: null })).status).toBe(403);
  });
});
