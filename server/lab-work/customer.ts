import type { EntityManager } from 'typeorm';
import { formatMoney } from '@shared/domain/money';
import { QUOTE_TERMS_VERSION, returnAddressInput, type CustomerCaseDto } from '@shared/schemas/customer';
import { recordAudit } from '../audit';
import { findActiveLink, touchLink, type CustomerLink } from '../customer-link';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { Organization } from '../organizations';
import { Referral, TimelineEntry } from '../referrals/entities';
import { lockReferral, recordTimeline } from '../routing';
import { requireStatus } from './access';
import { CustomerReturnAddress, LabEvaluation } from './entities';
import { latestImaging, toImagingDto } from './imaging';
import { currentManifest, toManifestDto } from './manifest';
import { currentQuote, toQuoteDto, type CustomerMeta } from './quotes';
import { paymentOf, toReturnAddressDto } from './views';

// The customer's page: no account, one case, reached only with a live link. An unknown, revoked or
// expired link is "not found", exactly like a case that does not exist.

export interface CustomerRequest {
  token: string;
  ip: string | null;
  userAgent: string | null;
}

const notFound = () => new AppError('not_found', 404, 'This link does not open a case. It may have been switched off; ask your repair shop for a new one.');

/** Statuses in which the customer may still say where the data goes. */
const ADDRESS_STATUSES = ['quote_sent', 'approved', 'paid', 'recovering', 'ready_for_review'] as const;

/** Runs one customer action in one transaction, with the case locked and the link checked inside it. */
export async function asCustomer<T>(
  ctx: ServiceContext,
  request: CustomerRequest,
  action: (manager: EntityManager, referral: Referral, meta: CustomerMeta) => Promise<T>,
): Promise<T> {
  return ctx.db.transaction(async (manager) => {
    const link = await findActiveLink(manager, request.token);
    if (!link) throw notFound();
    const referral = await lockReferral(manager, link.referralId);
    if (!referral) throw notFound();
    await touchLink(manager, link);
    return action(manager, referral, { ip: request.ip, userAgent: request.userAgent, linkId: link.id });
  });
}

/** The link behind a token for a read; touched, so the shop sees when the customer last looked. */
export async function customerLinkFor(ctx: ServiceContext, token: string): Promise<CustomerLink> {
  const link = await findActiveLink(ctx.db.manager, token);
  if (!link) throw notFound();
  await touchLink(ctx.db.manager, link);
  return link;
}

type Words = (e: TimelineEntry, names: { shop: string; lab: string }) => string | null;

const money = (d: Record<string, unknown>) =>
  typeof d.totalMinor === 'number' && typeof d.currency === 'string' ? formatMoney(d.totalMinor, d.currency) : null;

/** The steps the customer sees, in words for them; internal steps (routing, offers, triage) are left out. */
const customerWords: Record<string, Words> = {
  opened: (_e, n) => `${n.shop} opened your case.`,
  offer_accepted: (_e, n) => `${n.lab || 'A recovery lab'} took your case.`,
  assigned: (_e, n) => `${n.lab || 'A recovery lab'} took your case.`,
  label_issued: (_e, n) => `${n.shop} prepared your device for shipping to the lab.`,
  shipment_in_transit: () => 'The carrier has the box.',
  shipment_delivered: () => 'The box was delivered.',
  checked_in: (_e, n) => `${n.lab || 'The lab'} received your device.`,
  on_hold: (_e, n) => `The case is on hold; ${n.shop} will be in touch.`,
  evaluation_started: () => 'The lab started examining your device.',
  evaluation_recorded: () => 'The lab finished examining your device.',
  no_recovery: () => 'The lab found that the data cannot be recovered. You owe nothing.',
  quote_sent: (e) => `The lab sent ${money(e.details) ? `a quote of ${money(e.details)}` : 'a quote'}.`,
  quote_approved: () => 'You approved the quote.',
  quote_declined: () => 'You declined the quote.',
  payment_received: (e) => `Your payment${typeof e.details.amountMinor === 'number' && typeof e.details.currency === 'string' ? ` of ${formatMoney(e.details.amountMinor, e.details.currency)}` : ''} arrived. Thank you.`,
  payment_failed: () => 'A card payment did not go through; nothing was charged.',
  imaging_started: () => 'The lab started copying your device, sector by sector.',
  imaging_finished: () => 'The copy of your device is complete.',
  files_ready: () => 'The lab listed the recovered files for you to check.',
  files_confirmed: () => 'You confirmed the recovered files.',
  files_disputed: () => 'You told the lab what is missing; the lab will answer with an updated list.',
  return_address_set: () => 'You gave the address for your data.',
  return_label_issued: () => 'The lab is shipping your data back.',
  cancelled: () => 'The case was cancelled.',
};

export async function getCustomerCase(ctx: ServiceContext, token: string): Promise<CustomerCaseDto> {
  const link = await customerLinkFor(ctx, token);
  const manager = ctx.db.manager;
  const r = await manager.findOneByOrFail(Referral, { id: link.referralId });
  const [shop, lab, timeline, evaluation, quote, imaging, manifest, payment, address] = await Promise.all([
    manager.findOneBy(Organization, { id: r.partnerOrganizationId }),
    r.labOrganizationId ? manager.findOneBy(Organization, { id: r.labOrganizationId }) : null,
    manager.find(TimelineEntry, { where: { referralId: r.id }, order: { at: 'ASC', position: 'ASC' } }),
    manager.findOneBy(LabEvaluation, { referralId: r.id }),
    currentQuote(manager, r.id),
    latestImaging(manager, r.id),
    currentManifest(manager, r.id),
    paymentOf(manager, r.id),
    manager.findOneBy(CustomerReturnAddress, { referralId: r.id }),
  ]);
  const names = { shop: shop?.name ?? 'Your repair shop', lab: lab?.name ?? '' };
  const files = manifest ? toManifestDto(manifest, r.priorities) : null;
  return {
    reference: r.reference,
    status: r.status,
    customerName: r.customerName,
    shop: { name: names.shop, phone: shop?.phone ?? null, email: shop?.email ?? null },
    lab: lab ? { name: lab.name } : null,
    device: { mediaType: r.mediaType, make: r.deviceMake, model: r.deviceModel, capacityGb: r.capacityGb },
    priorities: r.priorities,
    timeline: timeline.flatMap((e) => {
      const summary = customerWords[e.kind]?.(e, names);
      return summary ? [{ at: e.at.toISOString(), kind: e.kind, summary }] : [];
    }),
    // The findings stay with the lab; the customer sees the estimate and the plan.
    evaluation: evaluation && ['quote_sent', 'quote_declined', 'approved', 'paid', 'recovering', 'ready_for_review', 'returned', 'closed', 'no_recovery'].includes(r.status)
      ? { recoverability: evaluation.recoverability, plan: evaluation.plan }
      : null,
    quote: quote ? toQuoteDto(quote) : null,
    imaging: imaging ? toImagingDto(imaging) : null,
    files,
    payment,
    returnAddress: address ? toReturnAddressDto(address) : null,
    actions: {
      respondToQuote: r.status === 'quote_sent' && quote?.status === 'sent',
      pay: r.status === 'approved' && payment.state === 'unpaid',
      reviewFiles: r.status === 'ready_for_review' && !!files && files.review.status !== 'confirmed',
      setReturnAddress: (ADDRESS_STATUSES as readonly string[]).includes(r.status),
    },
    termsVersion: QUOTE_TERMS_VERSION,
  };
}

export async function setReturnAddress(manager: EntityManager, referral: Referral, rawInput: unknown, meta: CustomerMeta): Promise<void> {
  const input = parseInput(returnAddressInput, rawInput);
  requireStatus(referral, ADDRESS_STATUSES, 'Changing the return address');
  const existing = await manager.findOneBy(CustomerReturnAddress, { referralId: referral.id });
  const now = meta.now ?? new Date();
  await manager.save(
    manager.create(CustomerReturnAddress, {
      referralId: referral.id,
      name: input.name,
      line1: input.line1,
      line2: input.line2 || null,
      city: input.city,
      region: input.region,
      postalCode: input.postalCode,
      country: input.country,
      phone: input.phone || null,
      updatedAt: now,
    }),
  );
  await manager.query(`UPDATE referrals SET updated_at = now() WHERE id = $1`, [referral.id]);
  await recordTimeline(manager, referral.id, {
    kind: 'return_address_set',
    summary: `The customer ${existing ? 'changed' : 'gave'} the return address (${input.city}, ${input.region} ${input.postalCode}).`,
    actor: { type: 'customer', id: meta.linkId, name: referral.customerName },
    details: { changed: Boolean(existing) },
    at: now,
  });
  await recordAudit(manager, {
    action: 'customer.return_address_set',
    organizationId: referral.partnerOrganizationId,
    targetType: 'referral',
    targetId: referral.id,
    details: { linkId: meta.linkId, changed: Boolean(existing) },
    ip: meta.ip,
  });
}
