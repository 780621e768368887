import { In, type EntityManager } from 'typeorm';
import type { z } from 'zod';
import { formatMoney } from '@shared/domain/money';
import { approveQuoteInput, declineQuoteInput, QUOTE_TERMS_VERSION } from '@shared/schemas/customer';
import { recoverabilityHints, sendQuoteInput, serviceLineKinds, type QuoteDto } from '@shared/schemas/lab-work';
import { recordAudit } from '../audit';
import { issueCustomerLink, systemIssuer } from '../customer-link';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { enqueueEmail } from '../notifications';
import { Organization } from '../organizations';
import type { Referral } from '../referrals/entities';
import { findLabCase, moveCase, requireStatus, resolveWorker, type LabPrincipal } from './access';
import type { StepMeta } from './evaluation';
import { LabEvaluation, LabQuote } from './entities';

// The lab manager's quote and the customer's answer. The customer pays exactly the sum of the lines:
// the network's fee and the shop's commission come out of the lab's side, never on top of the price.

export interface CustomerMeta {
  ip: string | null;
  userAgent: string | null;
  linkId: string;
  /** The demo seed's past time; otherwise now. */
  now?: Date;
}

export function toQuoteDto(q: LabQuote): QuoteDto {
  return {
    id: q.id,
    version: q.version,
    status: q.status,
    currency: q.currency,
    lines: q.lines,
    totalMinor: q.totalMinor,
    serviceLinesMinor: q.serviceLinesMinor,
    note: q.note,
    sentAt: q.sentAt.toISOString(),
    sentBy: q.sentByName,
    approval: q.approvedAt && q.approvedName ? { at: q.approvedAt.toISOString(), fullName: q.approvedName } : null,
    decline: q.declinedAt ? { at: q.declinedAt.toISOString(), reason: q.declineReason } : null,
  };
}

/** The quote the customer sees: the open or accepted one, else the last one declined. */
export async function currentQuote(manager: EntityManager, referralId: string): Promise<LabQuote | null> {
  return manager.findOne(LabQuote, {
    where: { referralId, status: In(['sent', 'approved', 'declined']) },
    order: { version: 'DESC' },
  });
}

/** Sends a quote (or a revised one, which supersedes the open quote) and e-mails the customer the link. */
export async function sendQuote(ctx: ServiceContext, who: LabPrincipal, id: string, rawInput: unknown, meta: StepMeta = {}): Promise<string> {
  const input = parseInput(sendQuoteInput, rawInput);
  return ctx.db.transaction((manager) => sendQuoteIn(ctx, manager, who, id, input, meta));
}

export async function sendQuoteIn(
  ctx: ServiceContext,
  manager: EntityManager,
  who: LabPrincipal,
  id: string,
  input: z.output<typeof sendQuoteInput>,
  meta: StepMeta = {},
): Promise<string> {
  const worker = await resolveWorker(manager, who);
  const referral = await findLabCase(manager, worker.organizationId, id, { lock: true });
  requireStatus(referral, ['evaluating', 'quote_sent', 'quote_declined'], 'Sending a quote');
  const evaluation = await manager.findOneBy(LabEvaluation, { referralId: referral.id });
  if (!evaluation) throw AppError.conflict('Record the evaluation before sending a quote: the customer sees it with the price.');

  const previous = await manager.findOne(LabQuote, { where: { referralId: referral.id }, order: { version: 'DESC' } });
  if (previous?.status === 'sent') await manager.update(LabQuote, previous.id, { status: 'superseded' });
  const lines = input.lines.map((l) => ({ kind: l.kind, skill: l.skill ?? null, description: l.description, amountMinor: l.amountMinor }));
  const totalMinor = lines.reduce((sum, l) => sum + l.amountMinor, 0);
  const serviceLinesMinor = lines.filter((l) => serviceLineKinds.includes(l.kind)).reduce((sum, l) => sum + l.amountMinor, 0);
  const now = meta.now ?? new Date();
  const quote = await manager.save(
    manager.create(LabQuote, {
      referralId: referral.id,
      version: (previous?.version ?? 0) + 1,
      status: 'sent',
      currency: input.currency,
      lines,
      totalMinor,
      serviceLinesMinor,
      note: input.note || null,
      sentAt: now,
      sentByUserId: worker.userId,
      sentByName: worker.actor.name,
      approvedAt: null,
      approvedName: null,
      approvedIp: null,
      approvedUserAgent: null,
      termsVersion: null,
      declinedAt: null,
      declineReason: null,
    }),
  );
  const total = formatMoney(totalMinor, input.currency);
  await moveCase(manager, referral, 'quote_sent', {
    kind: 'quote_sent',
    summary: `${worker.actor.name} sent ${quote.version > 1 ? `a revised quote (version ${quote.version})` : 'the quote'}: ${total}.`,
    actor: worker.actor,
    details: { quoteId: quote.id, version: quote.version, totalMinor, serviceLinesMinor, currency: input.currency },
    at: now,
  });
  const lab = await manager.findOneBy(Organization, { id: worker.organizationId });
  const shop = await manager.findOneBy(Organization, { id: referral.partnerOrganizationId });
  const link = await issueCustomerLink(manager, { referralId: referral.id, reason: 'quote_sent', issuer: systemIssuer, appUrl: ctx.config.appUrl, now });
  await enqueueEmail(manager, referral.customerEmail, 'customer_quote_ready', {
    customerName: referral.customerName,
    reference: referral.reference,
    labName: lab?.name ?? 'The lab',
    shopName: shop?.name ?? 'your repair shop',
    total,
    recoverability: recoverabilityHints[evaluation.recoverability],
    url: link.url,
  });
  await recordAudit(manager, {
    action: 'lab_work.quote_sent',
    actorUserId: worker.userId,
    organizationId: worker.organizationId,
    targetType: 'referral',
    targetId: referral.id,
    details: { quoteId: quote.id, version: quote.version, totalMinor, currency: input.currency },
    ip: meta.ip ?? null,
  });
  return referral.id;
}

/** The open quote the customer answers; a stale page (an older version) is told to reload. */
async function openQuote(manager: EntityManager, referral: Referral, quoteId: string): Promise<LabQuote> {
  requireStatus(referral, ['quote_sent'], 'Answering the quote');
  const quote = await manager.findOne(LabQuote, { where: { referralId: referral.id, status: 'sent' }, lock: { mode: 'pessimistic_write' } });
  if (!quote) throw AppError.conflict('There is no open quote on this case.');
  if (quote.id !== quoteId) {
    throw AppError.conflict('The lab has revised the quote since this page was loaded. Reload the page to see the current one.', [
      { path: 'quoteId', message: 'Not the current quote' },
    ]);
  }
  return quote;
}

export async function approveQuote(manager: EntityManager, referral: Referral, rawInput: unknown, meta: CustomerMeta): Promise<void> {
  const input = parseInput(approveQuoteInput, rawInput);
  const quote = await openQuote(manager, referral, input.quoteId);
  const now = meta.now ?? new Date();
  await manager.update(LabQuote, quote.id, {
    status: 'approved',
    approvedAt: now,
    approvedName: input.fullName,
    approvedIp: meta.ip,
    approvedUserAgent: meta.userAgent?.slice(0, 500) ?? null,
    termsVersion: QUOTE_TERMS_VERSION,
  });
  await moveCase(manager, referral, 'approved', {
    kind: 'quote_approved',
    summary: `The customer approved the quote (${formatMoney(quote.totalMinor, quote.currency)}), signed “${input.fullName}”.`,
    actor: { type: 'customer', id: meta.linkId, name: input.fullName },
    details: { quoteId: quote.id, version: quote.version, fullName: input.fullName, termsVersion: QUOTE_TERMS_VERSION },
    at: now,
  });
  await recordAudit(manager, {
    action: 'customer.quote_approved',
    organizationId: referral.partnerOrganizationId,
    targetType: 'referral',
    targetId: referral.id,
    details: { quoteId: quote.id, fullName: input.fullName, termsVersion: QUOTE_TERMS_VERSION, userAgent: meta.userAgent?.slice(0, 500) ?? null, linkId: meta.linkId },
    ip: meta.ip,
  });
}

export async function declineQuote(manager: EntityManager, referral: Referral, rawInput: unknown, meta: CustomerMeta): Promise<void> {
  const input = parseInput(declineQuoteInput, rawInput);
  const quote = await openQuote(manager, referral, input.quoteId);
  const now = meta.now ?? new Date();
  await manager.update(LabQuote, quote.id, { status: 'declined', declinedAt: now, declineReason: input.reason || null });
  await moveCase(manager, referral, 'quote_declined', {
    kind: 'quote_declined',
    summary: `The customer declined the quote${input.reason ? `: “${input.reason}”` : '.'}`,
    actor: { type: 'customer', id: meta.linkId, name: referral.customerName },
    details: { quoteId: quote.id, version: quote.version },
    at: now,
  });
  await recordAudit(manager, {
    action: 'customer.quote_declined',
    organizationId: referral.partnerOrganizationId,
    targetType: 'referral',
    targetId: referral.id,
    details: { quoteId: quote.id, linkId: meta.linkId },
    ip: meta.ip,
  });
}
