import type { EntityManager } from 'typeorm';
import { AuditEvent } from './entities';

export interface AuditInput {
  action: string;
  actorUserId?: string | null;
  organizationId?: string | null;
  targetType?: string | null;
  targetId?: string | null;
  details?: Record<string, unknown>;
  ip?: string | null;
}

/** Written with the caller's manager so the audit line commits with the change it records. */
export async function recordAudit(manager: EntityManager, input: AuditInput): Promise<void> {
  await manager.save(
    manager.create(AuditEvent, {
    action: input.action,
    actorUserId: input.actorUserId ?? null,
    organizationId: input.organizationId ?? null,
    targetType: input.targetType ?? null,
    targetId: input.targetId ?? null,
    details: input.details ?? {},
    ip: input.ip ?? null,
    }),
  );
}
