import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import { evaluationInput, evaluationPartLabels, partConditionLabels, recoverabilityLabels, type EvaluationDto } from '@shared/schemas/lab-work';
import { recordAudit } from '../audit';
import { issueCustomerLink, systemIssuer } from '../customer-link';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { enqueueEmail } from '../notifications';
import { Organization } from '../organizations';
import { recordTimeline } from '../routing';
import { findLabCase, moveCase, requireStatus, resolveWorker, touchCase, type LabPrincipal } from './access';
import { LabEvaluation } from './entities';

// The technician's evaluation: findings per part, how much data can come back, and the plan. "None"
// ends the case as no_recovery: the customer is charged nothing and nobody is owed anything, so
// nothing is posted to the ledger; the device goes back to the shop.

export function toEvaluationDto(e: LabEvaluation): EvaluationDto {
  return {
    findings: e.findings,
    recoverability: e.recoverability,
    plan: e.plan,
    recordedAt: e.recordedAt.toISOString(),
    recordedBy: e.recordedByName,
  };
}

/** When and from where a step is taken; `now` lets the demo seed write its history in the past. */
export interface StepMeta {
  ip?: string | null;
  now?: Date;
}

export async function startEvaluation(ctx: ServiceContext, who: LabPrincipal, id: string, meta: StepMeta = {}): Promise<string> {
  return ctx.db.transaction((manager) => startEvaluationIn(manager, who, id, meta));
}

export async function startEvaluationIn(manager: EntityManager, who: LabPrincipal, id: string, meta: StepMeta = {}): Promise<string> {
  const worker = await resolveWorker(manager, who);
  const referral = await findLabCase(manager, worker.organizationId, id, { lock: true });
  requireStatus(referral, ['received'], 'Starting the evaluation');
  await moveCase(manager, referral, 'evaluating', { kind: 'evaluation_started', summary: `${worker.actor.name} started the evaluation.`, actor: worker.actor, at: meta.now });
  await recordAudit(manager, {
    action: 'lab_work.evaluation_started',
    actorUserId: worker.userId,
    organizationId: worker.organizationId,
    targetType: 'referral',
    targetId: referral.id,
    ip: meta.ip ?? null,
  });
  return referral.id;
}

/** Records (or, while the case is still being evaluated, replaces) the evaluation. */
export async function recordEvaluation(ctx: ServiceContext, who: LabPrincipal, id: string, rawInput: unknown, meta: StepMeta = {}): Promise<string> {
  const input = parseInput(evaluationInput, rawInput);
  return ctx.db.transaction((manager) => recordEvaluationIn(ctx, manager, who, id, input, meta));
}

export async function recordEvaluationIn(
  ctx: ServiceContext,
  manager: EntityManager,
  who: LabPrincipal,
  id: string,
  input: z.output<typeof evaluationInput>,
  meta: StepMeta = {},
): Promise<string> {
  const worker = await resolveWorker(manager, who);
  const referral = await findLabCase(manager, worker.organizationId, id, { lock: true });
  requireStatus(referral, ['received', 'evaluating'], 'Recording an evaluation');
  const now = meta.now ?? new Date();
  if (referral.status === 'received') {
    await moveCase(manager, referral, 'evaluating', { kind: 'evaluation_started', summary: `${worker.actor.name} started the evaluation.`, actor: worker.actor, at: now });
  }
  const findings = input.findings.map((f) => ({ part: f.part, condition: f.condition, note: f.note || null }));
  const existing = await manager.findOneBy(LabEvaluation, { referralId: referral.id });
  await manager.save(
    manager.create(LabEvaluation, {
      ...(existing ? { id: existing.id } : {}),
      referralId: referral.id,
      findings,
      recoverability: input.recoverability,
      plan: input.plan,
      recordedByUserId: worker.userId,
      recordedByName: worker.actor.name,
      recordedAt: now,
    }),
  );

  const faults = findings.filter((f) => f.condition === 'failed' || f.condition === 'degraded');
  const faultText = faults.length
    ? faults.map((f) => `${evaluationPartLabels[f.part].toLowerCase()} ${partConditionLabels[f.condition].toLowerCase()}`).join(', ')
    : 'no faulty part found';
  const details = { recoverability: input.recoverability, findings, replaced: Boolean(existing) };

  if (input.recoverability === 'none') {
    await moveCase(manager, referral, 'no_recovery', {
      kind: 'no_recovery',
      summary: `${worker.actor.name} found that no recovery is possible (${faultText}). No charge to the customer.`,
      actor: worker.actor,
      details,
      at: now,
    });
    const lab = await manager.findOneBy(Organization, { id: worker.organizationId });
    const shop = await manager.findOneBy(Organization, { id: referral.partnerOrganizationId });
    const link = await issueCustomerLink(manager, { referralId: referral.id, reason: 'no_recovery', issuer: systemIssuer, appUrl: ctx.config.appUrl, now });
    await enqueueEmail(manager, referral.customerEmail, 'customer_no_recovery', {
      customerName: referral.customerName,
      reference: referral.reference,
      labName: lab?.name ?? 'The lab',
      shopName: shop?.name ?? 'Your repair shop',
      url: link.url,
    });
  } else {
    await touchCase(manager, referral.id);
    await recordTimeline(manager, referral.id, {
      kind: 'evaluation_recorded',
      summary: `${worker.actor.name} recorded the evaluation: recoverability ${recoverabilityLabels[input.recoverability].toLowerCase()} (${faultText}).`,
      actor: worker.actor,
      details,
      at: now,
    });
  }
  await recordAudit(manager, {
    action: input.recoverability === 'none' ? 'lab_work.no_recovery' : 'lab_work.evaluation_recorded',
    actorUserId: worker.userId,
    organizationId: worker.organizationId,
    targetType: 'referral',
    targetId: referral.id,
    details: { recoverability: input.recoverability, replaced: Boolean(existing) },
    ip: meta.ip ?? null,
  });
  return referral.id;
}
