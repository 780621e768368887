import type { EntityManager } from 'typeorm';
import { TimelineEntry, type TimelineActorType } from '../referrals/entities';
import { emitForTimelineEntry } from '../webhooks';

export interface TimelineActor {
  type: TimelineActorType;
  id?: string | null;
  name: string;
}

export const routingActor: TimelineActor = { type: 'system', id: null, name: 'Platterpost routing' };
export const autoAcceptActor: TimelineActor = { type: 'system', id: null, name: 'system (auto-accept rule)' };
export const deadlineActor: TimelineActor = { type: 'system', id: null, name: 'Platterpost (offer deadline)' };

export interface TimelineInput {
  kind: string;
  summary: string;
  actor: TimelineActor;
  details?: Record<string, unknown>;
  at?: Date;
}

/** Appends one step to a case's timeline, in the caller's transaction, with its partner event if it has one. */
export async function recordTimeline(manager: EntityManager, referralId: string, entry: TimelineInput): Promise<void> {
  const at = entry.at ?? new Date();
  await emitForTimelineEntry(manager, referralId, { kind: entry.kind, summary: entry.summary, at, actorName: entry.actor.name, details: entry.details });
  await manager.save(
    manager.create(TimelineEntry, {
      referralId,
      at,
      kind: entry.kind,
      summary: entry.summary,
      actorType: entry.actor.type,
      actorId: entry.actor.id ?? null,
      actorName: entry.actor.name,
      details: entry.details ?? {},
    }),
  );
}
