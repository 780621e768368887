import { In, IsNull, type EntityManager } from 'typeorm';
import { tierProblems } from '@shared/domain/commission';
import {
  commissionPlanInput,
  commissionPlanPatch,
  planAssignmentInput,
  type CommissionPlanDto,
} from '@shared/schemas/money';
import { recordAudit } from '../audit';
import type { Actor, ServiceContext } from '../lib/context';
import { AppError } from '../lib/errors';
import { parseInput } from '../lib/validate';
import { Organization } from '../organizations/entities';
import { CommissionPlan, PartnerCommissionPlan } from './entities';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The plan a shop's cases accrue under: its own, else the default; null when the network has neither. */
export async function planFor(manager: EntityManager, partnerOrganizationId: string): Promise<CommissionPlan | null> {
  const rows: CommissionPlan[] = await manager
    .createQueryBuilder(CommissionPlan, 'p')
    .leftJoin(PartnerCommissionPlan, 'a', 'a.plan_id = p.id AND a.partner_organization_id = :partner', { partner: partnerOrganizationId })
    .where('p.archived_at IS NULL AND (a.partner_organization_id IS NOT NULL OR p.is_default)')
    // The shop's own plan first, the default after it.
    .orderBy('a.partner_organization_id IS NULL', 'ASC')
    .limit(1)
    .getMany();
  return rows[0] ?? null;
}

async function toDtos(manager: EntityManager, plans: CommissionPlan[]): Promise<CommissionPlanDto[]> {
  const ids = plans.map((p) => p.id);
  const assigned: { plan_id: string; id: string; name: string }[] = ids.length
    ? await manager.query(
        `SELECT a.plan_id, o.id, o.name FROM partner_commission_plans a JOIN organizations o ON o.id = a.partner_organization_id
         WHERE a.plan_id = ANY($1) ORDER BY o.name`,
        [ids],
      )
    : [];
  return plans.map((p) => ({
    id: p.id,
    name: p.name,
    tiers: p.tiers,
    networkFeeBasisPoints: p.networkFeeBasisPoints,
    isDefault: p.isDefault,
    partners: assigned.filter((a) => a.plan_id === p.id).map((a) => ({ id: a.id, name: a.name })),
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  }));
}

export async function listPlans(ctx: ServiceContext): Promise<{ plans: CommissionPlanDto[] }> {
  const plans = await ctx.db.manager.find(CommissionPlan, { where: { archivedAt: IsNull() }, order: { isDefault: 'DESC', name: 'ASC' } });
  return { plans: await toDtos(ctx.db.manager, plans) };
}

export async function getPlan(ctx: ServiceContext, id: string): Promise<CommissionPlanDto> {
  const plan = UUID.test(id) ? await ctx.db.manager.findOneBy(CommissionPlan, { id, archivedAt: IsNull() }) : null;
  if (!plan) throw AppError.notFound('That commission plan');
  return (await toDtos(ctx.db.manager, [plan]))[0]!;
}

function assertTiers(tiers: CommissionPlan['tiers']) {
  const problems = tierProblems(tiers);
  if (problems.length) {
    throw AppError.validation(problems.map((p) => ({ path: `tiers.${p.index}${p.field ? `.${p.field}` : ''}`, message: p.message })));
  }
}

function nameTaken(err: unknown): boolean {
  const e = err as { code?: string; constraint?: string; driverError?: { code?: string; constraint?: string } };
  const code = e.driverError?.code ?? e.code;
  const constraint = e.driverError?.constraint ?? e.constraint;
  return code === '23505' && constraint === 'commission_plans_live_name';
}

const nameConflict = () => AppError.conflict('Another plan already has that name', [{ path: 'name', message: 'Choose a name no other plan has' }]);

function auditView(p: CommissionPlan) {
  return { name: p.name, tiers: p.tiers, networkFeeBasisPoints: p.networkFeeBasisPoints, isDefault: p.isDefault };
}

export async function createPlan(ctx: ServiceContext, actor: Actor, raw: unknown): Promise<CommissionPlanDto> {
  const input = parseInput(commissionPlanInput, raw);
  assertTiers(input.tiers);
  try {
    const id = await ctx.db.transaction(async (manager) => {
      if (input.isDefault) await manager.update(CommissionPlan, { isDefault: true }, { isDefault: false });
      const plan = await manager.save(
        manager.create(CommissionPlan, {
          name: input.name,
          tiers: input.tiers,
          networkFeeBasisPoints: input.networkFeeBasisPoints,
          isDefault: input.isDefault,
          archivedAt: null,
          createdById: actor.userId,
        }),
      );
      await recordAudit(manager, {
        action: 'commission_plan.created',
        actorUserId: actor.userId,
        organizationId: actor.organizationId,
        targetType: 'commission_plan',
        targetId: plan.id,
        details: { after: auditView(plan) },
      });
      return plan.id;
    });
    return getPlan(ctx, id);
  } catch (err) {
    if (nameTaken(err)) throw nameConflict();
    throw err;
  }
}

export async function updatePlan(ctx: ServiceContext, actor: Actor, id: string, raw: unknown): Promise<CommissionPlanDto> {
  if (!UUID.test(id)) throw AppError.notFound('That commission plan');
  const patch = parseInput(commissionPlanPatch, raw);
  if (patch.tiers) assertTiers(patch.tiers);
  try {
    await ctx.db.transaction(async (manager) => {
      const plan = await manager.findOne(CommissionPlan, { where: { id, archivedAt: IsNull() }, lock: { mode: 'pessimistic_write' } });
      if (!plan) throw AppError.notFound('That commission plan');
      const before = auditView(plan);
      if (patch.isDefault && !plan.isDefault) await manager.update(CommissionPlan, { isDefault: true }, { isDefault: false });
      if (patch.name !== undefined) plan.name = patch.name;
      if (patch.tiers !== undefined) plan.tiers = patch.tiers;
      if (patch.networkFeeBasisPoints !== undefined) plan.networkFeeBasisPoints = patch.networkFeeBasisPoints;
      if (patch.isDefault) plan.isDefault = true;
      await manager.save(plan);
      await recordAudit(manager, {
        action: 'commission_plan.updated',
        actorUserId: actor.userId,
        organizationId: actor.organizationId,
        targetType: 'commission_plan',
        targetId: plan.id,
        details: { before, after: auditView(plan) },
      });
    });
  } catch (err) {
    if (nameTaken(err)) throw nameConflict();
    throw err;
  }
  return getPlan(ctx, id);
}

/** Retires a plan: its shops go back to the default plan; lines already accrued keep their rate. */
export async function archivePlan(ctx: ServiceContext, actor: Actor, id: string): Promise<void> {
  if (!UUID.test(id)) throw AppError.notFound('That commission plan');
  await ctx.db.transaction(async (manager) => {
    const plan = await manager.findOne(CommissionPlan, { where: { id, archivedAt: IsNull() }, lock: { mode: 'pessimistic_write' } });
    if (!plan) throw AppError.notFound('That commission plan');
    if (plan.isDefault) throw AppError.conflict('The default plan cannot be retired; make another plan the default first');
    const assigned = await manager.find(PartnerCommissionPlan, { where: { planId: id } });
    await manager.delete(PartnerCommissionPlan, { planId: id });
    plan.archivedAt = new Date();
    await manager.save(plan);
    await recordAudit(manager, {
      action: 'commission_plan.archived',
      actorUserId: actor.userId,
      organizationId: actor.organizationId,
      targetType: 'commission_plan',
      targetId: plan.id,
      details: { before: auditView(plan), partnersMovedToDefault: assigned.map((a) => a.partnerOrganizationId) },
    });
  });
}

/** Puts a shop on a plan of its own, or (planId null) back on the default plan. */
export async function assignPlan(
  ctx: ServiceContext,
  actor: Actor,
  partnerOrganizationId: string,
  raw: unknown,
): Promise<{ partnerOrganizationId: string; planId: string | null; effectivePlanId: string | null }> {
  const { planId } = parseInput(planAssignmentInput, raw);
  if (!UUID.test(partnerOrganizationId)) throw AppError.notFound('That shop');
  await ctx.db.transaction(async (manager) => {
    const partner = await manager.findOneBy(Organization, { id: partnerOrganizationId, kind: 'partner' });
    if (!partner) throw AppError.notFound('That shop');
    const previous = await manager.findOneBy(PartnerCommissionPlan, { partnerOrganizationId });
    if (planId) {
      const plan = await manager.findOneBy(CommissionPlan, { id: planId, archivedAt: IsNull() });
      if (!plan) throw AppError.validation([{ path: 'planId', message: 'No plan in use has that id' }]);
      await manager.upsert(
        PartnerCommissionPlan,
        { partnerOrganizationId, planId, assignedById: actor.userId, assignedAt: new Date() },
        ['partnerOrganizationId'],
      );
    } else {
      await manager.delete(PartnerCommissionPlan, { partnerOrganizationId });
    }
    await recordAudit(manager, {
      action: 'commission_plan.assigned',
      actorUserId: actor.userId,
      organizationId: actor.organizationId,
      targetType: 'organization',
      targetId: partnerOrganizationId,
      details: { previousPlanId: previous?.planId ?? null, planId },
    });
  });
  const effective = await planFor(ctx.db.manager, partnerOrganizationId);
  return { partnerOrganizationId, planId, effectivePlanId: effective?.id ?? null };
}

/** Which plan each of these shops is on (for the admin's shop list). */
export async function plansForPartners(manager: EntityManager, partnerIds: string[]): Promise<Map<string, string | null>> {
  const assigned = partnerIds.length ? await manager.find(PartnerCommissionPlan, { where: { partnerOrganizationId: In(partnerIds) } }) : [];
  const def = await manager.findOneBy(CommissionPlan, { isDefault: true });
  const byPartner = new Map(assigned.map((a) => [a.partnerOrganizationId, a.planId]));
  return new Map(partnerIds.map((id) => [id, byPartner.get(id) ?? def?.id ?? null]));
}
