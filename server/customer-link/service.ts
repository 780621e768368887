import type { EntityManager } from 'typeorm';
import { issueCustomerLinkInput, type CustomerLinkDto, type IssuedCustomerLinkDto } from '@shared/schemas/lab-work';
import { recordAudit } from '../audit';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { enqueueEmail } from '../notifications';
import { Referral } from '../referrals/entities';
import { lockReferral, recordTimeline } from '../routing';
import { issueCustomerLink, listCaseLinks, revokeCaseLinks, toCustomerLinkDto } from './links';

// The shop's side of the customer link: see which links exist, hand a new one over (shown once,
// optionally e-mailed), and switch them all off when a link went astray.

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Statuses with nothing left for the customer to see or do. */
const FINISHED = ['cancelled', 'closed'];

export interface RequestMeta {
  ip?: string | null;
}

async function personName(manager: EntityManager, userId: string): Promise<string> {
  const rows: { name: string }[] = await manager.query(`SELECT name FROM users WHERE id = $1`, [userId]);
  return rows[0]?.name ?? 'Unknown user';
}

/** The shop's own case (or any case, for the network); another organisation's case is not found. */
async function visibleCase(manager: EntityManager, actor: Actor, id: string, lock = false): Promise<Referral> {
  if (!UUID.test(id)) throw AppError.notFound('That case');
  const referral = lock ? await lockReferral(manager, id) : await manager.findOneBy(Referral, { id });
  const visible =
    referral && (actor.organizationKind === 'network' || (actor.organizationKind === 'partner' && referral.partnerOrganizationId === actor.organizationId));
  if (!visible) throw AppError.notFound('That case');
  return referral;
}

export async function listLinks(ctx: ServiceContext, actor: Actor, id: string): Promise<{ data: CustomerLinkDto[] }> {
  const referral = await visibleCase(ctx.db.manager, actor, id);
  return { data: (await listCaseLinks(ctx.db.manager, referral.id)).map(toCustomerLinkDto) };
}

export async function issueLinkForShop(ctx: ServiceContext, actor: Actor, id: string, rawInput: unknown, meta: RequestMeta = {}): Promise<IssuedCustomerLinkDto> {
  const input = parseInput(issueCustomerLinkInput, rawInput ?? {});
  return ctx.db.transaction(async (manager) => {
    const referral = await visibleCase(manager, actor, id, true);
    if (FINISHED.includes(referral.status)) throw AppError.conflict('The case is finished; there is nothing for the customer to see any more.');
    const name = await personName(manager, actor.userId);
    const issued = await issueCustomerLink(manager, {
      referralId: referral.id,
      reason: 'shop',
      issuer: { type: 'user', id: actor.userId, name },
      appUrl: ctx.config.appUrl,
    });
    if (input.sendEmail) {
      const shop: { name: string }[] = await manager.query(`SELECT name FROM organizations WHERE id = $1`, [referral.partnerOrganizationId]);
      await enqueueEmail(manager, referral.customerEmail, 'customer_case_link', {
        customerName: referral.customerName,
        reference: referral.reference,
        shopName: shop[0]?.name ?? 'Your repair shop',
        url: issued.url,
      });
    }
    await recordTimeline(manager, referral.id, {
      kind: 'customer_link_issued',
      summary: `${name} issued a new private link for the customer${input.sendEmail ? ` and e-mailed it to ${referral.customerEmail}` : ''}.`,
      actor: { type: 'user', id: actor.userId, name },
      details: { linkId: issued.link.id, emailed: input.sendEmail },
    });
    await recordAudit(manager, {
      action: 'customer_link.issued',
      actorUserId: actor.userId,
      organizationId: actor.organizationId,
      targetType: 'referral',
      targetId: referral.id,
      details: { linkId: issued.link.id, emailed: input.sendEmail },
      ip: meta.ip ?? null,
    });
    return { link: toCustomerLinkDto(issued.link), url: issued.url };
  });
}

/** Switches off every live link of the case; the customer's page then answers "not found". */
export async function revokeLinksForShop(ctx: ServiceContext, actor: Actor, id: string, meta: RequestMeta = {}): Promise<{ data: CustomerLinkDto[] }> {
  return ctx.db.transaction(async (manager) => {
    const referral = await visibleCase(manager, actor, id, true);
    const name = await personName(manager, actor.userId);
    const revoked = await revokeCaseLinks(manager, referral.id, name);
    if (revoked > 0) {
      await recordTimeline(manager, referral.id, {
        kind: 'customer_links_revoked',
        summary: `${name} switched off the customer’s ${revoked === 1 ? 'link' : `${revoked} links`}.`,
        actor: { type: 'user', id: actor.userId, name },
        details: { revoked },
      });
      await recordAudit(manager, {
        action: 'customer_link.revoked',
        actorUserId: actor.userId,
        organizationId: actor.organizationId,
        targetType: 'referral',
        targetId: referral.id,
        details: { revoked },
        ip: meta.ip ?? null,
      });
    }
    return { data: (await listCaseLinks(manager, referral.id)).map(toCustomerLinkDto) };
  });
}
