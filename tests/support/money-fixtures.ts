import { createRequire } from 'node:module';
import { randomBytes } from 'node:crypto';
import Stripe from 'stripe';
import type { DataSource, EntityManager } from 'typeorm';
import { afterAll } from 'vitest';
import { makeReference } from '@shared/domain/reference';
import type { CommissionTier } from '@shared/domain/commission';
import { createPaymentsFake, type PaymentsFake } from '../../fakes/payments/payments-fake';
import { CommissionPlan, PartnerCommissionPlan } from '../../server/commissions';
import { postCustomerPayment, type CustomerPaymentInput } from '../../server/ledger';
import { PayoutAccount } from '../../server/payouts';
import { unique } from './api';
import { createOrganization, createUser } from './factories';

// Fixtures for the money tests: a payments fake of the file's own, shops and labs with payout accounts,
// plans, and paid cases. Every record is new (unique names), so files run side by side on one database.

export interface PaymentsFakeHandle {
  fake: PaymentsFake;
  stripe: Stripe;
  /** What `setupApi` needs so the server's SDK talks to this fake. */
  env: Record<string, string>;
}

export async function startPaymentsFake(): Promise<PaymentsFakeHandle> {
  const secretKey = `sk_test_${randomBytes(8).toString('hex')}`;
  const webhookSecret = `whsec_${randomBytes(12).toString('hex')}`;
  const fake = createPaymentsFake({ port: 0, secretKey, webhookSecret, webhookRetryDelaysMs: [50, 100] });
  await fake.start();
  afterAll(() => fake.stop());
  return {
    fake,
    stripe: new Stripe(secretKey, { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0 }),
    env: {
      PAYMENTS_API_URL: fake.url,
      PAYMENTS_SECRET_KEY: secretKey,
      PAYMENTS_WEBHOOK_SECRET: webhookSecret,
      // Our own retries (jobs with back-off) are under test; the SDK's immediate ones would hide them.
      PAYMENTS_MAX_NETWORK_RETRIES: '0',
    },
  };
}

export async function fakeControl(fake: PaymentsFake, path: string, body: unknown = {}) {
  const res = await fetch(`${fake.url}/_fake${path}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  if (!res.ok) throw new Error(`fake control ${path} answered ${res.status}: ${await res.text()}`);
  return res.json();
}

/** A connected account that has finished onboarding at the fake, recorded as the organisation's payout account. */
export async function onboardedAccount(db: DataSource, handle: PaymentsFakeHandle, organizationId: string): Promise<string> {
  const account = await handle.stripe.accounts.create({ type: 'express', country: 'US', capabilities: { transfers: { requested: true } } });
  await fakeControl(handle.fake, `/accounts/${account.id}/onboard`);
  await db.getRepository(PayoutAccount).save({
    organizationId,
    providerAccountId: account.id,
    chargesEnabled: true,
    payoutsEnabled: true,
    detailsSubmitted: true,
    requirementsDue: [],
    statusAsOf: new Date(),
  });
  return account.id;
}

export interface MoneyOrgs {
  partnerId: string;
  labId: string;
  partnerAdmin: { email: string };
  labManager: { email: string };
}

/** A shop with an admin and a lab with a manager. */
export async function shopAndLab(db: DataSource): Promise<MoneyOrgs> {
  const partner = await createOrganization(db, 'partner', unique('Shop '));
  const lab = await createOrganization(db, 'lab', unique('Lab '));
  const partnerAdmin = await createUser(db, { role: 'partner_admin', organizationId: partner.id });
  const labManager = await createUser(db, { role: 'lab_manager', organizationId: lab.id });
  return { partnerId: partner.id, labId: lab.id, partnerAdmin, labManager };
}

/** A plan of the shop's own (tiers invented for the tests). */
export async function planForShop(db: DataSource, partnerId: string, tiers: CommissionTier[], networkFeeBasisPoints = 800): Promise<string> {
  const plan = await db.getRepository(CommissionPlan).save({ name: unique('Plan '), tiers, networkFeeBasisPoints, isDefault: false, archivedAt: null, createdById: null });
  await db.getRepository(PartnerCommissionPlan).save({ partnerOrganizationId: partnerId, planId: plan.id, assignedById: null, assignedAt: new Date() });
  return plan.id;
}

/** A case of the shop, held by the lab, in the given status (a bare row: intake and routing are not under test here). */
export async function insertCase(manager: EntityManager | DataSource, partnerId: string, labId: string, status = 'paid'): Promise<{ id: string; reference: string }> {
  const [{ n }]: { n: string }[] = await manager.query(`SELECT nextval('referral_number_seq')::text AS n`);
  const reference = makeReference(BigInt(n));
  const [row]: { id: string }[] = await manager.query(
    `INSERT INTO referrals (reference_number, reference, partner_organization_id, status, customer_name, customer_email, media_type,
       origin_postal_code, origin_country, origin_lat, origin_lon, triage, lab_organization_id, created_by_type, created_by_id, created_by_name)
     VALUES ($1, $2, $3, $4, 'Test Customer', 'customer@test.example', 'hdd_2_5', '80202', 'US', 39.75, -104.99,
       '{"requiredSkills":[],"cautions":[]}'::jsonb, $5, 'user', 'test', 'Test')
     RETURNING id`,
    [n, reference, partnerId, status, labId],
  );
  return { id: row!.id, reference };
}

/** A case paid at `paidAt`, posted through the ledger as the payment component will. */
export async function paidCase(
  db: DataSource,
  orgs: { partnerId: string; labId: string },
  input: Partial<CustomerPaymentInput> & { paidAt: Date; totalMinor: number; serviceLinesMinor: number },
) {
  const kase = await insertCase(db, orgs.partnerId, orgs.labId);
  const result = await db.transaction((manager) =>
    postCustomerPayment(manager, {
      referralId: kase.id,
      partnerOrganizationId: orgs.partnerId,
      labOrganizationId: orgs.labId,
      currency: 'USD',
      feeMinor: 0,
      paymentIntentId: unique('pi_'),
      ...input,
    }),
  );
  return { ...kase, ...result };
}

/** pdf-parse v1's library file (its index reads a sample PDF when loaded as a main module). */
const pdfParse = createRequire(import.meta.url)('pdf-parse/lib/pdf-parse.js') as (data: Buffer) => Promise<{ numpages: number; text: string }>;

export async function pdfText(pdf: Buffer): Promise<string> {
  return (await pdfParse(pdf)).text;
}

/** E-mails the outbox holds for a person, by template. */
export async function mailsTo(db: DataSource, email: string): Promise<{ template: string; subject: string; text_body: string }[]> {
  return db.query(`SELECT template, subject, text_body FROM outbox_messages WHERE recipient = $1 ORDER BY created_at`, [email]);
}
