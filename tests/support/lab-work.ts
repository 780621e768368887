import request from 'supertest';
import zipcodes from 'zipcodes';
import { afterAll, expect } from 'vitest';
import type { ReferralInput } from '@shared/schemas/referrals';
import { Organization } from '../../server/organizations';
import { addTimelineEntry, createReferral } from '../../server/referrals';
import { signIn, unique, type TestContext } from './api';
import { createUser, TEST_PASSWORD } from './factories';

// Arrange steps for the lab-work, quote and customer API tests: a shop and a lab of their own at one
// ZIP centroid (each world at its own ZIP, so every shop's case goes to its own lab: nearest first), and
// cases opened through the real intake, accepted by the lab's auto-accept rule, then checked in.

export const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
export const customerAuth = (token: string) => ({ Authorization: `CustomerLink ${token}` });

export interface Person {
  id: string;
  email: string;
  name: string;
  token: string;
}

export interface LabWorld {
  shop: Organization;
  shopStaff: Person;
  lab: Organization;
  technician: Person;
  manager: Person;
  clerk: Person;
}

async function person(ctx: TestContext, role: Parameters<typeof createUser>[1]['role'], organizationId: string): Promise<Person> {
  const user = await createUser(ctx.db, { role, organizationId });
  const { accessToken } = await signIn(ctx.app, user.email, TEST_PASSWORD);
  return { id: user.id, email: user.email, name: user.name, token: accessToken };
}

/** ZIP centroids for each test file's worlds, far from the demo network and from the other files' places. */
export const worldZips = {
  labWork: ['57001', '57002', '57003', '57004', '57005', '57006', '57007', '57010', '57012', '57013', '57014', '57015', '57016', '57017', '57018', '57020', '57021', '57022', '57024', '57025', '57026', '57027', '57028', '57029', '57030', '57031', '57032', '57033', '57034', '57035', '57036', '57037', '57038', '57039', '57040', '57041', '57042', '57043', '57045', '57046'],
  quotes: ['68001', '68002', '68003', '68004', '68005', '68007', '68008', '68009', '68010', '68014', '68015', '68016', '68017', '68018', '68019', '68020', '68022', '68023', '68025', '68026', '68028', '68029', '68030', '68031', '68033', '68034', '68036', '68037', '68038', '68039', '68040', '68041', '68042', '68044', '68045', '68046', '68047', '68048', '68050', '68055'],
  customer: ['50001', '50002', '50003', '50005', '50006', '50007', '50008', '50009', '50010', '50011', '50012', '50013', '50014', '50020', '50021', '50022', '50023', '50025', '50026', '50027', '50028', '50029', '50031', '50032', '50033', '50034', '50035', '50036', '50037', '50038', '50039', '50040', '50041', '50042', '50043', '50044', '50046', '50047', '50048', '50049'],
};

/** Worlds made by one test file, each at the next of its ZIPs; their labs stop taking cases afterwards. */
export function labWorlds(ctx: TestContext, zipList: readonly string[]) {
  const zips = zipList.map((zip) => zipcodes.lookup(zip)!);
  let next = 0;
  const labs: string[] = [];
  afterAll(async () => {
    await ctx.db.query(`UPDATE lab_profiles SET accepting_new_cases = false WHERE organization_id = ANY($1)`, [labs]);
  });

  return async function makeWorld(): Promise<LabWorld> {
    const place = zips[next++];
    if (!place) throw new Error('this test file needs more ZIP codes in worldZips');
    const org = (kind: 'partner' | 'lab', name: string) =>
      ctx.db.getRepository(Organization).save({
        kind,
        name,
        slug: unique(`${kind}-`),
        addressLine1: kind === 'lab' ? '12 Bench Road' : '3 Counter Street',
        city: place.city,
        region: place.state,
        postalCode: place.zip,
        country: 'US',
        lat: place.latitude,
        lon: place.longitude,
        phone: '+1 605 555 0100',
        email: `${unique('desk')}@test.example`,
        timeZone: 'America/Chicago',
      });
    const shop = await org('partner', unique('Test Shop '));
    const lab = await org('lab', unique('Test Lab '));
    const [shopStaff, technician, manager, clerk] = await Promise.all([
      person(ctx, 'partner_staff', shop.id),
      person(ctx, 'lab_technician', lab.id),
      person(ctx, 'lab_manager', lab.id),
      person(ctx, 'shipping_clerk', lab.id),
    ]);
    const profile = await request(ctx.app)
      .put('/api/lab/profile')
      .set(auth(manager.token))
      .send({
        address: { line1: '12 Bench Road', postalCode: place.zip, country: 'US' },
        timeZone: 'America/Chicago',
        businessHours: { opensAt: '09:00', closesAt: '17:00', workdays: [1, 2, 3, 4, 5], holidayCountry: 'US' },
        mediaTypes: ['hdd_3_5', 'hdd_2_5', 'ssd_sata', 'usb_flash', 'memory_card'],
        skills: [{ skill: 'logical', turnaroundDays: 1 }],
        weeklyThroughput: 1000,
        queueCapacity: 1000,
        healthDataAgreement: { signed: false },
        acceptingNewCases: true,
        autoAcceptRules: [{ skills: ['logical'], maxDistanceKm: 5 }],
      });
    expect(profile.status, JSON.stringify(profile.body)).toBe(200);
    labs.push(lab.id);
    return { shop, shopStaff, lab, technician, manager, clerk };
  };
}

export const deletedPhotosDrive = (overrides: Partial<ReferralInput> = {}): ReferralInput => ({
  customer: { name: 'Rowan Tillery', email: `${unique('rowan')}@customer.test` },
  device: { mediaType: 'hdd_2_5', capacityGb: 500, interface: 'sata', make: 'Examplar', model: 'E-500' },
  symptoms: ['deleted_files'],
  description: 'Emptied the recycle bin by mistake; the drive has not been used since.',
  priorities: [{ category: 'photos', note: '2019–2023 family photos' }, { category: 'documents', note: 'Tax returns' }],
  sensitivity: ['none'],
  consent: { accepted: true },
  ...overrides,
});

/**
 * A case at the world's lab in `received`: opened through intake (the lab's rule accepts it), then
 * checked in. Check-in is arranged here as receiving does it — the status and a `checked_in` step —
 * because these tests are about what happens after the box has arrived.
 */
export async function receivedCase(ctx: TestContext, world: LabWorld, input: ReferralInput = deletedPhotosDrive()) {
  const referral = await createReferral(ctx, { partnerOrganizationId: world.shop.id, actor: { type: 'user', id: world.shopStaff.id, name: world.shopStaff.name } }, input);
  expect(referral.status, 'the lab’s auto-accept rule takes the case').toBe('accepted');
  expect(referral.lab?.id).toBe(world.lab.id);
  await ctx.db.transaction(async (manager) => {
    await manager.query(`UPDATE referrals SET status = 'received' WHERE id = $1`, [referral.id]);
    await addTimelineEntry(manager, referral.id, {
      kind: 'checked_in',
      summary: `Box checked in at ${world.lab.name} by ${world.clerk.name}: box intact.`,
      actor: { type: 'user', id: world.clerk.id, name: world.clerk.name },
      details: { outcome: 'received' },
    });
  });
  return { id: referral.id, reference: referral.reference, customerEmail: input.customer.email };
}

/** Findings for a healthy drive with deleted files: the parts work, the data is logical work. */
export const goodEvaluation = {
  findings: [
    { part: 'heads', condition: 'ok' },
    { part: 'electronics', condition: 'ok' },
    { part: 'firmware', condition: 'ok' },
    { part: 'surface', condition: 'degraded', note: 'A few weak sectors near the outer edge' },
  ],
  recoverability: 'high',
  plan: 'Image the drive with a hardware imager, then recover the deleted photos from the image.',
};

/** A quote that follows the rules: recovery work, new media, return shipping. */
export const standardQuote = {
  currency: 'USD',
  lines: [
    { kind: 'service', skill: 'logical', description: 'Logical recovery of deleted files', amountMinor: 45000 },
    { kind: 'target_media', description: '1 TB USB 3.2 external drive', amountMinor: 8900 },
    { kind: 'return_shipping', description: 'Ground shipping, signature on delivery', amountMinor: 1500 },
  ],
  note: 'Valid for 30 days.',
};

/** Quote total of `standardQuote`: 450.00 + 89.00 + 15.00. */
export const STANDARD_TOTAL_MINOR = 55400;

/** The customer link's token from the last e-mail of a template written to the outbox for this address. */
export async function linkFromOutbox(ctx: TestContext, to: string, template: string): Promise<string> {
  const rows: { text_body: string }[] = await ctx.db.query(
    `SELECT text_body FROM outbox_messages WHERE recipient = $1 AND template = $2 ORDER BY created_at DESC LIMIT 1`,
    [to, template],
  );
  const m = rows[0]?.text_body.match(/\/c\/([A-Za-z0-9_-]{43})/);
  if (!m) throw new Error(`no ${template} e-mail with a case link to ${to} in the outbox`);
  return m[1]!;
}

/** Evaluated and quoted through the API; answers the customer's link from the quote e-mail. */
export async function quotedCase(ctx: TestContext, world: LabWorld, input?: ReferralInput) {
  const c = await receivedCase(ctx, world, input);
  const evaluation = await request(ctx.app).put(`/api/lab/cases/${c.id}/evaluation`).set(auth(world.technician.token)).send(goodEvaluation);
  expect(evaluation.status, JSON.stringify(evaluation.body)).toBe(200);
  const quote = await request(ctx.app).post(`/api/lab/cases/${c.id}/quote`).set(auth(world.manager.token)).send(standardQuote);
  expect(quote.status, JSON.stringify(quote.body)).toBe(201);
  const token = await linkFromOutbox(ctx, c.customerEmail, 'customer_quote_ready');
  return { ...c, token, quoteId: quote.body.quote.id as string };
}

/** Quoted, then approved by the customer on the link. */
export async function approvedCase(ctx: TestContext, world: LabWorld, input?: ReferralInput) {
  const c = await quotedCase(ctx, world, input);
  const approved = await request(ctx.app)
    .post('/api/customer/case/quote/approve')
    .set(customerAuth(c.token))
    .send({ quoteId: c.quoteId, fullName: 'Rowan Tillery', acceptTerms: true });
  expect(approved.status, JSON.stringify(approved.body)).toBe(200);
  return c;
}

/** Opens the hosted payment page for the case and pays it as the page would (POST /_fake/checkout/:id/pay). */
export async function payAtFake(ctx: TestContext, fakeUrl: string, token: string, cardNumber = '4242 4242 4242 4242') {
  const checkout = await request(ctx.app).post('/api/customer/case/checkout').set(customerAuth(token)).send({});
  expect(checkout.status, JSON.stringify(checkout.body)).toBe(201);
  const sessionId = new URL(checkout.body.url as string).pathname.split('/').pop()!;
  const paid = await fetch(`${fakeUrl}/_fake/checkout/${sessionId}/pay`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ cardNumber }),
  });
  return { sessionId, url: checkout.body.url as string, status: paid.status, body: (await paid.json()) as Record<string, unknown> };
}

/** Approved and paid with the published success card, recorded through the customer's return to the page. */
export async function paidCase(ctx: TestContext, world: LabWorld, fakeUrl: string, input?: ReferralInput) {
  const c = await approvedCase(ctx, world, input);
  const { sessionId, status } = await payAtFake(ctx, fakeUrl, c.token);
  expect(status).toBe(200);
  const confirmed = await request(ctx.app).post('/api/customer/case/checkout/confirm').set(customerAuth(c.token)).send({ sessionId });
  expect(confirmed.status, JSON.stringify(confirmed.body)).toBe(200);
  expect(confirmed.body.status).toBe('paid');
  return c;
}
