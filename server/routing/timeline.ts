import type { EntityManager } from 'typeorm';
import { TimelineEntry, type TimelineActorType } from '../referrals/entities';

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

/** Appends one step to a case's timeline, in the caller's transaction. */
export async function recordTimeline(manager: EntityManager, referralId: string, entry: TimelineInput): Promise<void> {
  await manager.save(
    manager.create(TimelineEntry, {
      referralId,
      at: entry.at ?? new Date(),
      kind: entry.kind,
      summary: entry.summary,
      actorType: entry.actor.type,
      actorId: entry.actor.id ?? null,
      actorName: entry.actor.name,
      details: entry.details ?? {},
    }),
  );
}
