import { createHash } from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { periodBounds, periodOf } from '@shared/domain/commission';
import { cardFeeMinor } from '@shared/domain/money';
import { makeReference } from '@shared/domain/reference';
import { triage } from '@shared/domain/triage';
import type { MediaType, Symptom } from '@shared/vocabulary';
import { CommissionPlan, PartnerCommissionPlan } from '../../commissions';
import { postCustomerPayment, postPayout, postRefund } from '../../ledger';
import { prepareStatementsIn, SettlementRun } from '../../payouts';
import { TimelineEntry } from '../../referrals';

/*
 * Demo money: two commission plans, four months of paid recoveries for three shops (ledger postings,
 * commission and lab-share lines through the real ledger code), a refund clawed back on a later statement,
 * and the three oldest months settled and paid, so the earnings and settlement pages have history.
 * Last month is left unsettled: running its settlement is the demo (and the browser test).
 *
 * Settled months are history: their transfers were made long ago at a payment provider this checkout
 * never talked to, so their transfer ids are marked `tr_demo_…` (the local fake keeps its state in memory
 * and knows nothing of them). No shop or lab has a payout account yet; setting one up is part of the demo.
 * Every customer, device make and amount here is invented.
 */

interface DemoPaidCase {
  shop: string;
  lab: string;
  /** 0 = this month, 1 = last month, … */
  monthsAgo: number;
  day: number;
  customer: string;
  mediaType: MediaType;
  symptoms: Symptom[];
  make: string;
  /** Recovery work, return media, return shipping (cents); tax is not charged on the demo's services. */
  serviceMinor: number;
  mediaMinor: number;
  shippingMinor: number;
  /** Refunded this many cents, this many months ago, on this day. */
  refund?: { amountMinor: number; monthsAgo: number; day: number };
}

const demoPaidCases: DemoPaidCase[] = [
  { shop: 'juniper-lane', lab: 'quillmark', monthsAgo: 4, day: 6, customer: 'Harriet Vosberg', mediaType: 'hdd_2_5', symptoms: ['clicking'], make: 'Veltrion', serviceMinor: 89_000, mediaMinor: 11_900, shippingMinor: 2_450 },
  { shop: 'juniper-lane', lab: 'cobaltmere', monthsAgo: 4, day: 19, customer: 'Oskar Lindahl', mediaType: 'memory_card', symptoms: ['not_detected'], make: 'Brightmoss', serviceMinor: 34_500, mediaMinor: 0, shippingMinor: 1_800 },
  { shop: 'bramblewood', lab: 'ferrowick', monthsAgo: 4, day: 23, customer: 'Maren Tullis', mediaType: 'ssd_m2_nvme', symptoms: ['not_detected'], make: 'Corvane', serviceMinor: 112_000, mediaMinor: 14_900, shippingMinor: 2_450 },
  { shop: 'juniper-lane', lab: 'quillmark', monthsAgo: 3, day: 3, customer: 'Desmond Achterberg', mediaType: 'hdd_3_5', symptoms: ['not_spinning'], make: 'Noctara', serviceMinor: 125_000, mediaMinor: 16_900, shippingMinor: 3_200, refund: { amountMinor: 72_550, monthsAgo: 2, day: 21 } },
  { shop: 'juniper-lane', lab: 'tidewater', monthsAgo: 3, day: 14, customer: 'Priyanka Salcedo', mediaType: 'phone', symptoms: ['liquid_damage'], make: 'Lumora', serviceMinor: 68_000, mediaMinor: 4_900, shippingMinor: 2_450 },
  { shop: 'kettle-creek', lab: 'saltgrass', monthsAgo: 3, day: 27, customer: 'Bastian Oduya', mediaType: 'hdd_2_5', symptoms: ['deleted_files'], make: 'Veltrion', serviceMinor: 29_900, mediaMinor: 8_900, shippingMinor: 1_800 },
  { shop: 'bramblewood', lab: 'quillmark', monthsAgo: 2, day: 8, customer: 'Elodie Marchbanks', mediaType: 'hdd_2_5', symptoms: ['clicking', 'dropped'], make: 'Veltrion', serviceMinor: 95_000, mediaMinor: 11_900, shippingMinor: 2_450 },
  { shop: 'juniper-lane', lab: 'lumen-ridge', monthsAgo: 2, day: 11, customer: 'Wendell Ferraro', mediaType: 'usb_flash', symptoms: ['physically_broken'], make: 'Quillby', serviceMinor: 42_000, mediaMinor: 2_900, shippingMinor: 1_800 },
  { shop: 'juniper-lane', lab: 'quillmark', monthsAgo: 2, day: 25, customer: 'Ana Tsukimoto', mediaType: 'hdd_3_5', symptoms: ['beeping'], make: 'Noctara', serviceMinor: 99_500, mediaMinor: 16_900, shippingMinor: 3_200 },
  { shop: 'juniper-lane', lab: 'brindle-oak', monthsAgo: 1, day: 4, customer: 'Rafferty Quon', mediaType: 'hdd_3_5', symptoms: ['not_detected'], make: 'Stackwell', serviceMinor: 185_000, mediaMinor: 24_900, shippingMinor: 4_800 },
  { shop: 'juniper-lane', lab: 'cobaltmere', monthsAgo: 1, day: 12, customer: 'Imogen Sallow', mediaType: 'memory_card', symptoms: ['formatted'], make: 'Brightmoss', serviceMinor: 27_500, mediaMinor: 0, shippingMinor: 1_800 },
  { shop: 'kettle-creek', lab: 'ferrowick', monthsAgo: 1, day: 17, customer: 'Thaddeus Nkemelu', mediaType: 'ssd_sata', symptoms: ['not_detected'], make: 'Corvane', serviceMinor: 88_000, mediaMinor: 11_900, shippingMinor: 2_450 },
  { shop: 'bramblewood', lab: 'tidewater', monthsAgo: 1, day: 22, customer: 'Leonie Farrant', mediaType: 'phone', symptoms: ['wont_boot'], make: 'Lumora', serviceMinor: 54_000, mediaMinor: 4_900, shippingMinor: 2_450 },
  { shop: 'juniper-lane', lab: 'quillmark', monthsAgo: 0, day: 1, customer: 'Corwin Abernethy', mediaType: 'hdd_2_5', symptoms: ['clicking'], make: 'Veltrion', serviceMinor: 79_000, mediaMinor: 11_900, shippingMinor: 2_450 },
];

/** The first instant of the UTC month `monthsAgo` before `now`'s, plus days and hours. */
function inMonth(now: Date, monthsAgo: number, day: number): Date {
  const at = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - monthsAgo, day, 16, 30));
  // This month's cases are never in the future.
  return at.getTime() > now.getTime() ? new Date(now.getTime() - 60 * 60_000) : at;
}

const demoId = (prefix: string, text: string) => `${prefix}_demo_${createHash('sha256').update(text).digest('hex').slice(0, 20)}`;

function orgOf(orgIds: Map<string, string>) {
  return (key: string) => {
    const id = orgIds.get(key);
    if (!id) throw new Error(`demo money: unknown organisation ${key}`);
    return id;
  };
}

/**
 * The commission plans, before any demo case is paid (other demo seeds pay cases through the ledger too):
 * Standard is the default; Juniper Lane and Bramblewood are on the founding shops' plan.
 */
export async function seedDemoCommissionPlans(manager: EntityManager, orgIds: Map<string, string>, now: Date): Promise<void> {
  const org = orgOf(orgIds);
  const [admin]: { id: string }[] = await manager.query(`SELECT id FROM users WHERE email = 'ines.albright@platterpost.example'`);
  await manager.save(
    manager.create(CommissionPlan, {
      name: 'Standard',
      tiers: [
        { minPaidReferrals: 0, basisPoints: 1000 },
        { minPaidReferrals: 10, basisPoints: 1250 },
        { minPaidReferrals: 25, basisPoints: 1500 },
      ],
      networkFeeBasisPoints: 800,
      isDefault: true,
      archivedAt: null,
      createdById: admin?.id ?? null,
    }),
  );
  const founding = await manager.save(
    manager.create(CommissionPlan, {
      name: 'Founding shops',
      tiers: [
        { minPaidReferrals: 0, basisPoints: 1250 },
        { minPaidReferrals: 15, basisPoints: 1500 },
      ],
      networkFeeBasisPoints: 700,
      isDefault: false,
      archivedAt: null,
      createdById: admin?.id ?? null,
    }),
  );
  for (const shop of ['juniper-lane', 'bramblewood']) {
    await manager.save(manager.create(PartnerCommissionPlan, { partnerOrganizationId: org(shop), planId: founding.id, assignedById: admin?.id ?? null, assignedAt: inMonth(now, 5, 1) }));
  }
}

export async function seedDemoMoney(manager: EntityManager, orgIds: Map<string, string>, now: Date): Promise<void> {
  const org = orgOf(orgIds);
  if (!(await manager.existsBy(CommissionPlan, { isDefault: true }))) await seedDemoCommissionPlans(manager, orgIds, now);

  // Cases and payments, oldest first (tiers count earlier payments), then refunds.
  const refunds: { referralId: string; amountMinor: number; at: Date; ref: string }[] = [];
  for (const [i, c] of demoPaidCases.entries()) {
    const paidAt = inMonth(now, c.monthsAgo, c.day);
    const openedAt = new Date(paidAt.getTime() - 9 * 86_400_000);
    const [{ n }]: { n: string }[] = await manager.query(`SELECT nextval('referral_number_seq')::text AS n`);
    const reference = makeReference(BigInt(n));
    const status = c.monthsAgo === 0 ? 'paid' : c.monthsAgo === 1 ? 'returned' : 'closed';
    const [row]: { id: string }[] = await manager.query(
      `INSERT INTO referrals (reference_number, reference, partner_organization_id, status, customer_name, customer_email, media_type,
         device_make, symptoms, priorities, origin_postal_code, origin_country, origin_lat, origin_lon, consent_recorded_at, consent_recorded_by,
         triage, lab_organization_id, created_by_type, created_by_id, created_by_name, created_at, updated_at)
       SELECT $1, $2, o.id, $3, $4, $5, $6, $7, $8, '[{"category":"photos","note":null}]'::jsonb, o.postal_code, 'US', o.lat, o.lon, $9,
              'Demo shop staff', $10, $11, 'user', 'demo-seed', 'Demo shop staff', $9, $12
       FROM organizations o WHERE o.id = $13
       RETURNING id`,
      [
        n,
        reference,
        status,
        c.customer,
        `${c.customer.toLowerCase().replace(/[^a-z]+/g, '.')}@customer.example`,
        c.mediaType,
        c.make,
        c.symptoms,
        openedAt,
        JSON.stringify({ ...triage({ mediaType: c.mediaType, symptoms: c.symptoms, sensitivity: [] }), battery: null }),
        org(c.lab),
        paidAt,
        org(c.shop),
      ],
    );
    const referralId = row!.id;
    const totalMinor = c.serviceMinor + c.mediaMinor + c.shippingMinor;
    await manager.insert(TimelineEntry, [
      { referralId, at: openedAt, kind: 'opened', summary: `Opened for ${c.customer}.`, actorType: 'user', actorId: null, actorName: 'Demo shop staff', details: {} },
      {
        referralId,
        at: paidAt,
        kind: 'paid',
        summary: `The customer paid ${(totalMinor / 100).toFixed(2)} USD online.`,
        actorType: 'customer',
        actorId: null,
        actorName: c.customer,
        details: { demoHistory: true },
      },
    ]);
    await postCustomerPayment(manager, {
      referralId,
      partnerOrganizationId: org(c.shop),
      labOrganizationId: org(c.lab),
      currency: 'USD',
      totalMinor,
      feeMinor: cardFeeMinor(totalMinor),
      serviceLinesMinor: c.serviceMinor,
      paymentIntentId: demoId('pi', `${i}:${reference}`),
      paidAt,
    });
    if (c.refund) refunds.push({ referralId, amountMinor: c.refund.amountMinor, at: inMonth(now, c.refund.monthsAgo, c.refund.day), ref: reference });
  }
  for (const r of refunds) {
    await postRefund(manager, { referralId: r.referralId, amountMinor: r.amountMinor, currency: 'USD', refundId: demoId('re', r.ref), refundedAt: r.at });
    await manager.insert(TimelineEntry, {
      referralId: r.referralId,
      at: r.at,
      kind: 'refunded',
      summary: `Part of the payment (${(r.amountMinor / 100).toFixed(2)} USD) was refunded to the customer.`,
      actorType: 'system',
      actorId: null,
      actorName: 'Platterpost',
      details: { demoHistory: true },
    });
  }

  // The three oldest months, settled on the 1st of the month after, and paid (history: see above).
  for (const monthsAgo of [4, 3, 2]) {
    const period = periodOf(inMonth(now, monthsAgo, 1));
    const { end } = periodBounds(period);
    const ranAt = new Date(end.getTime() + 6 * 3_600_000);
    const run = await manager.save(
      manager.create(SettlementRun, { period, trigger: 'schedule', scope: null, startedById: null, status: 'running', startedAt: ranAt, summary: { statementsCreated: 0, paid: 0, failed: 0, waitingForAccount: 0, carriedForward: 0, paidMinorByCurrency: {} } }),
    );
    const prepared = await prepareStatementsIn(manager, { runId: run.id, period, end, scope: null }, null);
    const due: { id: string; organization_id: string; payee_kind: 'partner' | 'lab'; payout_minor: string }[] = await manager.query(
      `SELECT id, organization_id, payee_kind, payout_minor::text FROM statements WHERE id = ANY($1) AND status = 'pending'`,
      [prepared.statementIds],
    );
    let paidMinor = 0;
    for (const s of due) {
      const transferId = demoId('tr', s.id);
      const paidAt = new Date(ranAt.getTime() + 2 * 60_000);
      const posted = await postPayout(manager, {
        organizationId: s.organization_id,
        payeeKind: s.payee_kind,
        currency: 'USD',
        amountMinor: Number(s.payout_minor),
        transferId,
        statementId: s.id,
        paidAt,
      });
      await manager.query(
        `UPDATE statements SET status = 'paid', transfer_id = $2, paid_at = $3, payout_transaction_id = $4, attempts = 0, created_at = $5, updated_at = $3 WHERE id = $1`,
        [s.id, transferId, paidAt, posted.id, ranAt],
      );
      paidMinor += Number(s.payout_minor);
    }
    await manager.update(SettlementRun, run.id, {
      status: 'completed',
      finishedAt: new Date(ranAt.getTime() + 3 * 60_000),
      summary: { statementsCreated: prepared.created, paid: due.length, failed: 0, waitingForAccount: 0, carriedForward: prepared.carriedForward, paidMinorByCurrency: { USD: paidMinor } },
    });
  }
}
