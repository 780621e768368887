import { randomBytes } from 'node:crypto';
import { firstRoleOf, onboardOrganizationInput, organizationActiveInput, type OnboardedOrganizationDto, type OrganizationDto } from '@shared/schemas/organizations';
import { recordAudit } from '../audit';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { inviteInto, Organization, toOrganizationDto } from '../organizations';
import { lockReferral, routeAndOffer, withdrawPendingOffer } from './dispatch';
import { LabOffer } from './entities';
import { resolvePostalCode } from './places';
import { personActor } from './timeline';

// The network admin adds a shop or a lab: the organisation, placed by its postal code (routing measures
// from it), and its first person, invited by e-mail; and switches one off or on again. It lives with
// routing because a place is a routing matter (organisations know nothing of postal codes) and
// because switching a lab off hands its open offers to the next lab.

function slugFor(name: string): string {
  const base = name
    .normalize('NFKD')
    .replace(/[^\w\s-]/g, '')
    .trim()
    .toLowerCase()
    .replace(/[\s_]+/g, '-')
    .slice(0, 40);
  // The suffix keeps two shops of one name (in two towns) apart; the slug is only a stable key.
  return `${base || 'organization'}-${randomBytes(3).toString('hex')}`;
}

export async function onboardOrganization(ctx: ServiceContext, actor: Actor, rawInput: unknown): Promise<OnboardedOrganizationDto> {
  const input = parseInput(onboardOrganizationInput, rawInput);
  const place = resolvePostalCode(input.address, 'address');
  return ctx.db.transaction(async (manager) => {
    // Two admins adding the same name at once get one organisation and one clear refusal.
    await manager.query(`SELECT pg_advisory_xact_lock(hashtext('onboard'), hashtext($1))`, [`${input.kind}:${input.name.toLowerCase()}`]);
    const [same]: { id: string }[] = await manager.query(`SELECT id FROM organizations WHERE kind = $1 AND lower(name) = lower($2) AND coalesce(postal_code, '') = $3`, [
      input.kind,
      input.name,
      place.postalCode,
    ]);
    if (same) {
      throw AppError.conflict(`A ${input.kind === 'lab' ? 'lab' : 'shop'} of that name is already in the network at that postal code`, [
        { path: 'name', message: 'Already in the network at this postal code' },
      ]);
    }
    const org = await manager.save(
      manager.create(Organization, {
        kind: input.kind,
        name: input.name,
        slug: slugFor(input.name),
        email: input.email ?? null,
        phone: input.phone || null,
        addressLine1: input.address.line1 || null,
        // A blank city or region is the postal code's own.
        city: input.address.city || place.city,
        region: input.address.region || place.region,
        postalCode: place.postalCode,
        country: place.country,
        lat: place.lat,
        lon: place.lon,
        timeZone: input.timeZone,
        active: true,
      }),
    );
    await recordAudit(manager, {
      action: 'organization.onboarded',
      actorUserId: actor.userId,
      organizationId: org.id,
      targetType: 'organization',
      targetId: org.id,
      details: { kind: org.kind, name: org.name, postalCode: org.postalCode },
    });
    const admin = await inviteInto(ctx, manager, org, actor.userId, { name: input.admin.name, email: input.admin.email, role: firstRoleOf[input.kind] }, { fields: 'admin.' });
    return { organization: toOrganizationDto(org), admin };
  });
}

/**
 * Switches a shop or a lab off (or on again). Off, its people cannot sign in and its API keys stop
 * working (both check the organisation on every request); a lab leaves routing, and each offer it has
 * not answered yet is withdrawn and goes to the next lab at once, in the same transaction. Cases it
 * already holds stay with it. Audited with the reason.
 */
export async function setOrganizationActive(ctx: ServiceContext, actor: Actor, id: string, rawInput: unknown): Promise<OrganizationDto> {
  const input = parseInput(organizationActiveInput, rawInput);
  return ctx.db.transaction(async (manager) => {
    const org = await manager.findOne(Organization, { where: { id }, lock: { mode: 'pessimistic_write' } });
    if (!org || org.kind === 'network') throw AppError.notFound('That shop or lab');
    if (org.active === input.active) return toOrganizationDto(org);
    await manager.update(Organization, org.id, { active: input.active });
    org.active = input.active;
    let reoffered = 0;
    if (!input.active && org.kind === 'lab') {
      const now = new Date();
      const admin = await personActor(manager, actor.userId, 'Network admin');
      const pending = await manager.find(LabOffer, { where: { labOrganizationId: org.id, status: 'pending' } });
      for (const offer of pending) {
        const referral = await lockReferral(manager, offer.referralId);
        if (!referral) continue;
        if (!(await withdrawPendingOffer(manager, referral, { reason: 'the network switched the lab off.', actor: admin, now }))) continue;
        await routeAndOffer(ctx, manager, referral, { trigger: 'reoffer', now });
        reoffered++;
      }
    }
    await recordAudit(manager, {
      action: input.active ? 'organization.switched_on' : 'organization.switched_off',
      actorUserId: actor.userId,
      organizationId: org.id,
      targetType: 'organization',
      targetId: org.id,
      details: { kind: org.kind, name: org.name, reason: input.reason ?? null, ...(org.kind === 'lab' && !input.active ? { offersPassedOn: reoffered } : {}) },
    });
    return toOrganizationDto(org);
  });
}
