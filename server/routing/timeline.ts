import type { EntityManager } from 'typeorm';
import { appendBufferOf, newRowId } from '../db/appends';
import { TimelineEntry, type TimelineActorType } from '../referrals/entities';
import { emitForTimelineEntry, type CaseForEvent } from '../webhooks';

export interface TimelineActor {
  type: TimelineActorType;
  id?: string | null;
  name: string;
}

export const routingActor: TimelineActor = { type: 'system', id: null, name: 'Platterpost routing' };
export const autoAcceptActor: TimelineActor = { type: 'system', id: null, name: 'system (auto-accept rule)' };
export const deadlineActor: TimelineActor = { type: 'system', id: null, name: 'Platterpost (offer deadline)' };

/** A signed-in person as the timeline names them. */
export async function personActor(manager: EntityManager, userId: string, fallbackName: string): Promise<TimelineActor> {
  const rows: { name: string }[] = await manager.query(`SELECT name FROM users WHERE id = $1`, [userId]);
  return { type: 'user', id: userId, name: rows[0]?.name ?? fallbackName };
}

export interface TimelineInput {
  kind: string;
  summary: string;
  actor: TimelineActor;
  details?: Record<string, unknown>;
  at?: Date;
}

/**
 * Appends one step to a case's timeline, in the caller's transaction, with its partner event if it has one.
 * Given the case itself (as the caller holds it, status up to date) rather than its id, the event is
 * built without reading the case again.
 */
export async function recordTimeline(manager: EntityManager, referral: string | CaseForEvent, entry: TimelineInput): Promise<void> {
  const at = entry.at ?? new Date();
  const referralId = typeof referral === 'string' ? referral : referral.id;
  await emitForTimelineEntry(manager, referral, { kind: entry.kind, summary: entry.summary, at, actorName: entry.actor.name, details: entry.details });
  const row = {
    referralId,
    at,
    kind: entry.kind,
    summary: entry.summary,
    actorType: entry.actor.type,
    actorId: entry.actor.id ?? null,
    actorName: entry.actor.name,
    details: entry.details ?? {},
  };
  const buffer = appendBufferOf(manager);
  if (buffer) buffer.timeline.push({ id: newRowId(), ...row });
  else await manager.save(manager.create(TimelineEntry, row));
}
