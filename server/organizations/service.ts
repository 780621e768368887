import type { EntityManager } from 'typeorm';
import { roleLabels, roleOrganizationKind } from '@shared/vocabulary';
import type { InviteStaffInput, StaffMember } from '@shared/schemas/auth';
import { recordAudit } from '../audit';
import { issueOneTimeToken, User } from '../auth';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { enqueueEmailToUser } from '../notifications';
import { Organization } from './entities';

export function toOrganizationDto(o: Organization) {
  return {
    id: o.id,
    kind: o.kind,
    name: o.name,
    email: o.email,
    phone: o.phone,
    address: { line1: o.addressLine1, city: o.city, region: o.region, postalCode: o.postalCode, country: o.country },
    location: o.lat != null && o.lon != null ? { lat: o.lat, lon: o.lon } : null,
    timeZone: o.timeZone,
    active: o.active,
  };
}

const toStaff = (u: User): StaffMember => ({
  id: u.id,
  email: u.email,
  name: u.name,
  role: u.role,
  status: u.status,
  createdAt: u.createdAt.toISOString(),
});

export async function getOwnOrganization(ctx: ServiceContext, actor: Actor) {
  const org = await ctx.db.getRepository(Organization).findOneBy({ id: actor.organizationId });
  if (!org) throw AppError.notFound('Your organisation');
  return toOrganizationDto(org);
}

export async function listStaff(ctx: ServiceContext, actor: Actor): Promise<StaffMember[]> {
  const users = await ctx.db.getRepository(User).find({ where: { organizationId: actor.organizationId }, order: { name: 'ASC' } });
  return users.map(toStaff);
}

/** Scoped by organisation in the query itself: another organisation's user is simply not found. */
export async function getStaffMember(ctx: ServiceContext, actor: Actor, userId: string): Promise<StaffMember> {
  const user = await ctx.db.getRepository(User).findOneBy({ id: userId, organizationId: actor.organizationId });
  if (!user) throw AppError.notFound('That staff member');
  return toStaff(user);
}

export async function inviteStaff(ctx: ServiceContext, actor: Actor, input: InviteStaffInput): Promise<StaffMember> {
  if (roleOrganizationKind[input.role] !== actor.organizationKind) {
    throw AppError.validation([{ path: 'role', message: `A ${actor.organizationKind} organisation cannot have the role ${roleLabels[input.role]}` }]);
  }
  return ctx.db.transaction(async (manager) => {
    const org = await manager.findOneByOrFail(Organization, { id: actor.organizationId });
    return inviteInto(ctx, manager, org, actor.userId, input);
  });
}

/**
 * Adds an invited person to an organisation inside the caller's transaction and mails them the link
 * that lets them choose a password; audited. `fields` prefixes the e-mail's field path in errors.
 */
export async function inviteInto(
  ctx: ServiceContext,
  manager: EntityManager,
  org: Organization,
  inviterId: string,
  input: InviteStaffInput,
  options: { fields?: string } = {},
): Promise<StaffMember> {
  const existing = await manager.findOneBy(User, { email: input.email });
  if (existing) throw AppError.conflict('Someone with that e-mail already has an account', [{ path: `${options.fields ?? ''}email`, message: 'Already has an account' }]);
  const inviter = await manager.findOneByOrFail(User, { id: inviterId });
  const user = await manager.save(manager.create(User, { ...input, organizationId: org.id, status: 'invited', passwordHash: null }));
  const token = await issueOneTimeToken(manager, {
    userId: user.id,
    purpose: 'invitation',
    ttlMs: ctx.config.invitationTtlHours * 3_600_000,
    createdById: inviterId,
  });
  await enqueueEmailToUser(manager, user.id, 'staff_invitation', {
    name: user.name,
    inviterName: inviter.name,
    organizationName: org.name,
    roleLabel: roleLabels[user.role],
    url: `${ctx.config.appUrl}/accept-invitation?token=${encodeURIComponent(token)}`,
    hours: ctx.config.invitationTtlHours,
  });
  await recordAudit(manager, { action: 'staff.invited', actorUserId: inviterId, organizationId: org.id, targetType: 'user', targetId: user.id, details: { role: user.role } });
  return toStaff(user);
}

export async function listOrganizations(ctx: ServiceContext, filter: { kind?: Organization['kind'] }) {
  const orgs = await ctx.db.getRepository(Organization).find({ where: filter.kind ? { kind: filter.kind } : {}, order: { name: 'ASC' } });
  return orgs.map(toOrganizationDto);
}

export async function getOrganization(ctx: ServiceContext, id: string) {
  const org = await ctx.db.getRepository(Organization).findOneBy({ id });
  if (!org) throw AppError.notFound('That organisation');
  return toOrganizationDto(org);
}
