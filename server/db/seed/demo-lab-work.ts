import type { EntityManager } from 'typeorm';
import { cardFeeMinor } from '@shared/domain/money';
import { parseManifestCsv } from '@shared/domain/file-categories';
import { referralInput, type ReferralInput } from '@shared/schemas/referrals';
import type { EvaluationInput, SendQuoteInput } from '@shared/schemas/lab-work';
import { evaluationInput, sendQuoteInput } from '@shared/schemas/lab-work';
import { User } from '../../auth';
import type { Config } from '../../config';
import { CustomerLink, hashCustomerToken } from '../../customer-link';
import { appendCustody, organizationPlace } from '../../custody';
import type { ServiceContext } from '../../lib/context';
import { openReferral } from '../../referrals';
import { acceptInTransaction, assignInTransaction, LabOffer, loadLabs, lockReferral, recordTimeline, withdrawPendingOffer } from '../../routing';
import { storageFromConfig } from '../../uploads';
import {
  applyPayment,
  approveQuote,
  CustomerCheckout,
  LabQuote,
  recordEvaluationIn,
  reportImagingIn,
  sendQuoteIn,
  startEvaluationIn,
  uploadManifestIn,
} from '../../lab-work';

// Demo cases on Quillmark Recovery Lab's bench (the demo technician's and lab manager's lab), one at
// each stage of the lab's work: evaluating, quote sent, approved, paid, recovering, ready for review,
// and one with no recovery possible. They go through the real intake, routing, lab-work and payment
// code with past times. The box's arrival is written as receiving writes a check-in (status and a
// `checked_in` step), as the demo carrier holds no parcels for these cases; the payments are recorded
// as the provider would report them (invented payment ids, the published card fee). Customers, people,
// device makes and amounts are invented.

const H = 60;
const D = 24 * H;

/**
 * A fixed link for one demo customer (the case waiting for the files to be reviewed), so the README can
 * point at the customer's page. Demo only; every other link is random and only its hash is stored.
 */
export const DEMO_CUSTOMER_TOKEN = 'demo-only-customer-link-ready-for-review-01';

type Stage = 'evaluating' | 'quote_sent' | 'approved' | 'paid' | 'recovering' | 'ready_for_review' | 'no_recovery';

interface DemoWork {
  shop: string;
  openedBy: string;
  minutesAgo: number;
  input: ReferralInput;
  stage: Stage;
  evaluation: EvaluationInput;
  quote?: SendQuoteInput;
  /** Share of the drive imaged, for a case still recovering. */
  imaged?: { percent: number; rateBytesPerSec: number; unreadableSectors: number };
  manifest?: string;
}

const consent = { accepted: true as const };

const headSwapPlan = 'Replace the head stack with a matched donor on the clean-air bench, then image the drive with a hardware imager, weakest heads last.';

/** A recovered-file list: photos by year, some documents and spreadsheets, a few damaged files. */
function demoManifest(): string {
  const rows = ['path,size,state'];
  for (let year = 2019; year <= 2023; year++) {
    for (let i = 1; i <= 24; i++) {
      const n = String(i * 37).padStart(4, '0');
      const state = i % 11 === 0 ? 'partial' : i % 17 === 0 ? 'unreadable' : 'intact';
      rows.push(`Pictures/${year}/IMG_${n}.JPG,${3_100_000 + i * 41_000},${state}`);
      if (i % 4 === 0) rows.push(`Pictures/${year}/Raw/IMG_${n}.CR2,${24_800_000 + i * 9_000},intact`);
    }
  }
  rows.push('Videos/2022/Birthday.MOV,1482003311,intact', 'Videos/2023/Beach day.mp4,902113004,partial');
  ['Contract - lease 2021.pdf', 'Scanned passport.pdf', 'Letter to the council.docx', 'Notes, school year.docx'].forEach((name, i) =>
    // RFC 4180: a field holding a comma is quoted.
    rows.push(`${name.includes(',') ? `"Documents/${name}"` : `Documents/${name}`},${88_000 + i * 12_500},intact`),
  );
  rows.push('Documents/Household budget 2023.xlsx,61204,intact', 'Documents/Old thesis draft.doc,403112,unreadable');
  rows.push('AppData/Local/Temp/~tmp0931.tmp,4096,intact');
  return rows.join('\n');
}

const standardEvaluation = (recoverability: 'high' | 'partial', surfaceNote: string): EvaluationInput => ({
  findings: [
    { part: 'heads', condition: 'failed', note: 'Head 2 reads nothing; clicking at spin-up' },
    { part: 'electronics', condition: 'ok' },
    { part: 'firmware', condition: 'ok' },
    { part: 'surface', condition: recoverability === 'high' ? 'ok' : 'degraded', note: surfaceNote },
  ],
  recoverability,
  plan: headSwapPlan,
});

const headSwapQuote = (service: number, media: string, mediaMinor: number): SendQuoteInput => ({
  currency: 'USD',
  lines: [
    { kind: 'service', skill: 'hdd_head_swap', description: 'Head stack replacement with a matched donor', amountMinor: service },
    { kind: 'target_media', description: media, amountMinor: mediaMinor },
    { kind: 'return_shipping', description: 'Ground shipping, signature on delivery', amountMinor: 1800 },
  ],
  note: 'Donor drive included. Valid for 30 days.',
});

export const demoLabWork: DemoWork[] = [
  {
    shop: 'bramblewood',
    openedBy: 'nadia.castellanos@bramblewood.example',
    minutesAgo: 9 * D,
    stage: 'ready_for_review',
    input: {
      customer: { name: 'Corinne Adebayo-Marsh', email: 'corinne.adebayomarsh@customer.example', phone: '+1 520 555 0133' },
      device: { mediaType: 'hdd_2_5', capacityGb: 1000, interface: 'sata', make: 'Veltrion', model: 'VT-1000M' },
      symptoms: ['clicking', 'dropped'],
      description: 'Laptop knocked off the sofa while on; clicks and is not detected since.',
      priorities: [{ category: 'photos', note: 'Photos of the children, 2019–2023' }, { category: 'documents', note: 'Lease and passport scans' }],
      consent,
    },
    evaluation: standardEvaluation('high', 'No visible damage under the scope'),
    quote: headSwapQuote(68000, '1 TB USB 3.2 external drive', 8900),
    manifest: demoManifest(),
  },
  {
    shop: 'juniper-lane',
    openedBy: 'theo.brandt@juniperlane.example',
    minutesAgo: 7 * D,
    stage: 'recovering',
    input: {
      customer: { name: 'Leopold Nakashima-Reyes', email: 'leopold.nakashimareyes@customer.example' },
      device: { mediaType: 'hdd_3_5', capacityGb: 4000, interface: 'sata', make: 'Noctara', model: 'N4-Desk' },
      symptoms: ['clicking'],
      description: 'Desktop drive started clicking during a backup; the backup never finished.',
      priorities: [{ category: 'accounting', note: 'Bookkeeping for the bakery, 2024' }, { category: 'spreadsheets' }],
      consent,
    },
    evaluation: standardEvaluation('partial', 'Light scoring on one surface near the spindle'),
    quote: headSwapQuote(89000, '4 TB USB 3.2 external drive', 11900),
    imaged: { percent: 41, rateBytesPerSec: 62_000_000, unreadableSectors: 18_240 },
  },
  {
    shop: 'bramblewood',
    openedBy: 'nadia.castellanos@bramblewood.example',
    minutesAgo: 6 * D,
    stage: 'paid',
    input: {
      customer: { name: 'Augustin Oyelowo', email: 'augustin.oyelowo@customer.example' },
      device: { mediaType: 'hdd_2_5', capacityGb: 2000, interface: 'usb', make: 'Examplar', model: 'Passage 2' },
      symptoms: ['clicking', 'dropped'],
      description: 'Portable drive dropped from a desk; clicks three times and stops.',
      priorities: [{ category: 'videos', note: 'Drone footage of the canyon trip' }],
      consent,
    },
    evaluation: standardEvaluation('high', 'Surface looks clean'),
    quote: headSwapQuote(72000, '2 TB USB 3.2 external drive', 9900),
  },
  {
    shop: 'juniper-lane',
    openedBy: 'maya.ferrante@juniperlane.example',
    minutesAgo: 5 * D,
    stage: 'approved',
    input: {
      customer: { name: 'Henrietta Solberg-Achebe', email: 'henrietta.solbergachebe@customer.example' },
      device: { mediaType: 'hdd_3_5', capacityGb: 8000, make: 'Noctara', model: 'N8 Archive' },
      symptoms: ['beeping'],
      description: 'Archive drive beeps at power-on and does not spin up.',
      priorities: [{ category: 'design_files', note: 'Studio project archive' }, { category: 'photos' }],
      consent,
    },
    evaluation: {
      findings: [
        { part: 'heads', condition: 'failed', note: 'Heads parked off the ramp; stiction' },
        { part: 'electronics', condition: 'ok' },
        { part: 'surface', condition: 'degraded', note: 'Stiction marks on the outer zone' },
      ],
      recoverability: 'partial',
      plan: 'Free the heads and replace them on the clean-air bench, then image with the damaged zone left for last.',
    },
    quote: headSwapQuote(115000, '8 TB USB 3.2 external drive', 18900),
  },
  {
    shop: 'bramblewood',
    openedBy: 'nadia.castellanos@bramblewood.example',
    minutesAgo: 4 * D,
    stage: 'quote_sent',
    input: {
      customer: { name: 'Rupert Valdés-Kimani', email: 'rupert.valdeskimani@customer.example' },
      device: { mediaType: 'hdd_2_5', capacityGb: 500, make: 'Examplar', model: 'E-500' },
      symptoms: ['clicking'],
      description: 'Old laptop drive with the only copy of a novel manuscript.',
      priorities: [{ category: 'documents', note: 'Manuscript drafts, all versions' }],
      consent,
    },
    evaluation: standardEvaluation('high', 'Surface clean'),
    quote: headSwapQuote(59000, '500 GB USB flash drive', 4900),
  },
  {
    shop: 'juniper-lane',
    openedBy: 'theo.brandt@juniperlane.example',
    minutesAgo: 3 * D,
    stage: 'evaluating',
    input: {
      customer: { name: 'Marguerite Oduya-Lindqvist', email: 'marguerite.oduyalindqvist@customer.example' },
      device: { mediaType: 'hdd_3_5', capacityGb: 3000, make: 'Veltrion', model: 'DeskVault 3' },
      symptoms: ['clicking', 'not_detected'],
      description: 'External drive clicks after a power cut; not seen by the computer.',
      priorities: [{ category: 'photos', note: 'Wedding photos, 2016' }, { category: 'email' }],
      consent,
    },
    evaluation: standardEvaluation('high', ''),
  },
  {
    shop: 'bramblewood',
    openedBy: 'nadia.castellanos@bramblewood.example',
    minutesAgo: 8 * D,
    stage: 'no_recovery',
    input: {
      customer: { name: 'Bartholomew Ingersoll', email: 'bartholomew.ingersoll@customer.example' },
      device: { mediaType: 'hdd_3_5', capacityGb: 2000, make: 'Noctara', model: 'N2' },
      symptoms: ['clicking', 'burnt_smell'],
      description: 'Drive was opened at home to “fix the clicking”, then powered for a day.',
      priorities: [{ category: 'photos' }],
      consent,
    },
    evaluation: {
      findings: [
        { part: 'heads', condition: 'failed', note: 'Heads crashed; debris throughout the assembly' },
        { part: 'surface', condition: 'failed', note: 'Platters scored down to the substrate on every surface' },
        { part: 'electronics', condition: 'failed', note: 'Motor driver burnt' },
      ],
      recoverability: 'none',
      plan: 'The platters are scored through the magnetic layer on every surface; nothing can be read back. Returned with no charge.',
    },
  },
];

const order: Stage[] = ['evaluating', 'quote_sent', 'approved', 'paid', 'recovering', 'ready_for_review'];
const reached = (stage: Stage, step: Stage) => stage !== 'no_recovery' && order.indexOf(stage) >= order.indexOf(step);

export async function seedDemoLabWork(manager: EntityManager, orgIds: Map<string, string>, options: { config: Config; now: Date }): Promise<void> {
  const ctx: ServiceContext = { db: manager.connection, config: options.config };
  const storage = storageFromConfig(options.config);
  const labId = orgIds.get('quillmark')!;
  const person = (email: string) => manager.findOneByOrFail(User, { email });
  // One after another: the seed runs in one transaction, on one connection.
  const technician = await person('sam.idowu@quillmark.example');
  const labManager = await person('rosa.quintero@quillmark.example');
  const clerk = await person('lee.varga@quillmark.example');
  const admin = await person('ines.albright@platterpost.example');
  const tech = { type: 'user' as const, organizationId: labId, userId: technician.id };
  const mgr = { type: 'user' as const, organizationId: labId, userId: labManager.id };

  for (const demo of demoLabWork) {
    let t = options.now.getTime() - demo.minutesAgo * 60_000;
    const at = (minutesLater: number) => new Date((t += minutesLater * 60_000));
    const opener = await person(demo.openedBy);
    const id = await openReferral(ctx, manager, { partnerOrganizationId: orgIds.get(demo.shop)!, actor: { type: 'user', id: opener.id, name: opener.name } }, referralInput.parse(demo.input), {
      now: at(0),
    });

    // Onto Quillmark's bench: accepted by its manager, or routed there by the network when another lab ranked first.
    let referral = (await lockReferral(manager, id))!;
    let offer = await manager.findOneBy(LabOffer, { referralId: id, status: 'pending' });
    if (offer?.labOrganizationId !== labId) {
      const actor = { type: 'user' as const, id: admin.id, name: admin.name };
      await withdrawPendingOffer(manager, referral, { reason: 'the network routed the case by hand (demo).', actor, now: at(30) });
      const [lab] = await loadLabs(manager, { labId });
      await assignInTransaction(ctx, manager, referral, lab!, { actor, note: 'Demo: Quillmark holds the matching donor', now: at(1) });
      referral = (await lockReferral(manager, id))!;
      offer = await manager.findOneBy(LabOffer, { referralId: id, status: 'pending' });
    }
    if (offer) {
      await acceptInTransaction(ctx, manager, referral, offer, { id: labId, name: 'Quillmark Recovery Lab' }, { actor: { type: 'user', id: labManager.id, name: labManager.name }, now: at(2 * H) });
    }
    await manager.query(`UPDATE lab_offers SET created_at = offered_at, updated_at = coalesce(responded_at, offered_at) WHERE referral_id = $1`, [id]);

    const arrived = at(2 * D);
    // The device's custody up to the lab's bench, as the shipping and check-in flows would have logged it.
    const before = (minutes: number) => new Date(arrived.getTime() - minutes * 60_000);
    const shopPlace = await organizationPlace(manager, orgIds.get(demo.shop)!);
    const tracking = { trackingCode: `BW${referral.reference.replace(/-/g, '')}` };
    await appendCustody(manager, id, { action: 'packed_by_shop', actor: { type: 'user', id: opener.id, name: opener.name }, location: shopPlace, at: before(44 * 60), details: tracking });
    await appendCustody(manager, id, { action: 'handed_to_carrier', actor: { type: 'carrier', id: null, name: 'Brambleway' }, location: shopPlace, at: before(42 * 60), details: tracking });
    await appendCustody(manager, id, { action: 'delivered', actor: { type: 'carrier', id: null, name: 'Brambleway' }, location: await organizationPlace(manager, labId), at: before(40), details: tracking });
    await appendCustody(manager, id, {
      action: 'checked_in',
      actor: { type: 'user', id: clerk.id, name: clerk.name },
      location: await organizationPlace(manager, labId, 'Receiving'),
      at: arrived,
      details: { boxCondition: 'intact', contentsMatch: true, outcome: 'received' },
    });
    await manager.query(`UPDATE referrals SET status = 'received' WHERE id = $1`, [id]);
    await recordTimeline(manager, id, {
      kind: 'checked_in',
      summary: `Box checked in at Quillmark Recovery Lab by ${clerk.name}: box intact, seal intact, contents match the intake.`,
      actor: { type: 'user', id: clerk.id, name: clerk.name },
      at: arrived,
      details: { outcome: 'received', boxCondition: 'intact' },
    });

    await startEvaluationIn(manager, tech, id, { now: at(3 * H) });
    if (demo.stage === 'evaluating') continue;
    await recordEvaluationIn(ctx, manager, tech, id, evaluationInput.parse(demo.evaluation), { now: at(5 * H) });
    if (demo.stage === 'no_recovery' || !demo.quote) continue;

    await sendQuoteIn(ctx, manager, mgr, id, sendQuoteInput.parse(demo.quote), { now: at(2 * H) });
    if (!reached(demo.stage, 'approved')) continue;
    const quote = await manager.findOneByOrFail(LabQuote, { referralId: id, status: 'sent' });
    referral = (await lockReferral(manager, id))!;
    await approveQuote(manager, referral, { quoteId: quote.id, fullName: demo.input.customer.name, acceptTerms: true }, { ip: '203.0.113.24', userAgent: 'Demo browser', linkId: 'demo', now: at(10 * H) });
    if (!reached(demo.stage, 'paid')) continue;

    const paidAt = at(20);
    const paymentIntentId = `pi_demo_${referral.reference.replace(/-/g, '').toLowerCase()}`;
    await manager.insert(CustomerCheckout, {
      referralId: id,
      quoteId: quote.id,
      sessionId: `cs_demo_${referral.reference.replace(/-/g, '').toLowerCase()}`,
      paymentIntentId,
      url: null,
      amountMinor: quote.totalMinor,
      currency: quote.currency,
      status: 'open',
      expiresAt: new Date(paidAt.getTime() + D * 60_000),
      feeMinor: null,
      paidAt: null,
      lastFailure: null,
      lastFailureChargeId: null,
      createdAt: new Date(paidAt.getTime() - 5 * 60_000),
    });
    // The provider's published US card rate (from memory: 2.9 % + 30¢); demo payments only.
    await applyPayment(manager, { paymentIntentId, amountReceivedMinor: quote.totalMinor, currency: quote.currency, feeMinor: cardFeeMinor(quote.totalMinor), paidAt, recordedAt: paidAt });
    if (!reached(demo.stage, 'recovering')) continue;

    const totalBytes = demo.input.device.capacityGb! * 1e9;
    const imaged = demo.imaged ?? { percent: 100, rateBytesPerSec: 0, unreadableSectors: 412 };
    await reportImagingIn(manager, tech, id, { bytesRead: Math.round((totalBytes * imaged.percent) / 200), unreadableSectors: 0, rateBytesPerSec: 95_000_000, sectorSizeBytes: 512 }, { now: at(D) });
    await reportImagingIn(
      manager,
      tech,
      id,
      { bytesRead: Math.round((totalBytes * imaged.percent) / 100), unreadableSectors: imaged.unreadableSectors, rateBytesPerSec: imaged.rateBytesPerSec, sectorSizeBytes: 512 },
      // A case still imaging reported a few minutes ago, so its estimate lies ahead when the demo starts.
      { now: demo.imaged ? new Date(options.now.getTime() - 10 * 60_000) : at(H) },
    );
    if (!reached(demo.stage, 'ready_for_review') || !demo.manifest) continue;

    const parsed = parseManifestCsv(demo.manifest);
    if (!parsed.ok) throw new Error(`demo data: manifest of ${referral.reference}: ${parsed.errors[0]?.message}`);
    await uploadManifestIn(ctx, manager, storage, tech, id, Buffer.from(demo.manifest), parsed.rows, { now: at(D) });
    await manager.insert(CustomerLink, {
      referralId: id,
      tokenHash: hashCustomerToken(DEMO_CUSTOMER_TOKEN),
      reason: 'shop',
      issuedAt: at(5),
      issuedByType: 'system',
      issuedById: null,
      issuedByName: 'Platterpost demo',
      expiresAt: new Date(options.now.getTime() + 365 * D * 60_000),
      lastUsedAt: null,
      revokedAt: null,
      revokedByName: null,
    });
  }
}
