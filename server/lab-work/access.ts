import type { EntityManager } from 'typeorm';
import { parseReference } from '@shared/domain/reference';
import { caseStatusLabels, type CaseStatus } from '@shared/vocabulary';
import { AppError } from '../lib/errors';
import { Referral, type TimelineActorType } from '../referrals/entities';
import { lockReferral, recordTimeline, type TimelineActor } from '../routing';

// Finding a case for the lab that holds it, who is acting, and moving a case from one status to the next.

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Who works on a lab's case: a signed-in person, or the lab's own tooling with the lab's API key. */
export type LabPrincipal =
  | { type: 'user'; organizationId: string; userId: string }
  | { type: 'api_key'; organizationId: string; apiKeyId: string; name: string };

export interface ResolvedWorker {
  organizationId: string;
  actor: TimelineActor & { type: Extract<TimelineActorType, 'user' | 'api_key'>; id: string };
  userId: string | null;
}

export async function personName(manager: EntityManager, userId: string): Promise<string> {
  const rows: { name: string }[] = await manager.query(`SELECT name FROM users WHERE id = $1`, [userId]);
  return rows[0]?.name ?? 'Unknown user';
}

export async function resolveWorker(manager: EntityManager, who: LabPrincipal): Promise<ResolvedWorker> {
  if (who.type === 'api_key') {
    return { organizationId: who.organizationId, userId: null, actor: { type: 'api_key', id: who.apiKeyId, name: who.name } };
  }
  return { organizationId: who.organizationId, userId: who.userId, actor: { type: 'user', id: who.userId, name: await personName(manager, who.userId) } };
}

/** The case's id from a uuid or a case reference (PP-…), as the lab's tooling may know either. */
export function caseKey(idOrReference: string): { id: string } | { reference: string } {
  if (UUID.test(idOrReference)) return { id: idOrReference };
  const parsed = parseReference(idOrReference);
  if (parsed.ok) return { reference: parsed.reference };
  throw AppError.notFound('That case');
}

/**
 * A case the lab holds; any other case (another lab's, one only offered to it) is simply not found.
 * With `lock`, the row is locked for the rest of the transaction, so two changes never interleave.
 */
export async function findLabCase(manager: EntityManager, labOrganizationId: string, idOrReference: string, options: { lock?: boolean } = {}): Promise<Referral> {
  const key = caseKey(idOrReference);
  const found = await manager.findOne(Referral, { where: { ...key, labOrganizationId } });
  if (!found) throw AppError.notFound('That case');
  if (!options.lock) return found;
  const locked = await lockReferral(manager, found.id);
  if (!locked || locked.labOrganizationId !== labOrganizationId) throw AppError.notFound('That case');
  return locked;
}

/** A 409 that says what the case is now, for a step that does not fit its status. */
export function requireStatus(referral: Referral, allowed: readonly CaseStatus[], what: string): void {
  if (allowed.includes(referral.status)) return;
  throw AppError.conflict(`${what} is not possible now: the case is ${caseStatusLabels[referral.status].toLowerCase()}.`);
}

/** Moves the case to its next status and writes the step on its timeline, in the caller's transaction. */
export async function moveCase(
  manager: EntityManager,
  referral: Referral,
  to: CaseStatus,
  entry: { kind: string; summary: string; actor: TimelineActor; details?: Record<string, unknown>; at?: Date },
): Promise<void> {
  const from = referral.status;
  await manager.update(Referral, referral.id, { status: to });
  referral.status = to;
  await recordTimeline(manager, referral.id, { ...entry, details: { ...entry.details, from, to } });
}

/** Marks the case changed without a status change, so partners syncing with updatedSince see it. */
export async function touchCase(manager: EntityManager, referralId: string): Promise<void> {
  await manager.query(`UPDATE referrals SET updated_at = now() WHERE id = $1`, [referralId]);
}
