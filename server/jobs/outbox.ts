import type PgBoss from 'pg-boss';
import type { DataSource, EntityManager } from 'typeorm';
import { appendBufferOf, newRowId } from '../db/appends';
import { currentRequestId, logger } from '../lib/logger';
import { JobOutboxRow } from './entities';
import { queueNames, type QueueName } from './queue';

export interface EnqueueOptions {
  /** Not before this instant (an offer's deadline). */
  startAfter?: Date;
  /** At most one waiting job per key in the queue (the offer id). */
  singletonKey?: string;
}

/** Writes a job inside the caller's transaction; the relay hands it to pg-boss once committed. */
export async function enqueueJob(manager: EntityManager, queue: QueueName, data: Record<string, unknown>, options: EnqueueOptions = {}): Promise<string> {
  if (!queueNames.includes(queue)) throw new Error(`unknown queue "${queue}"`);
  const buffer = appendBufferOf(manager);
  if (buffer) {
    const id = newRowId();
    buffer.jobs.push({
      id,
      queue,
      data: { ...data, requestId: currentRequestId() ?? null },
      startAfter: options.startAfter ?? new Date(),
      singletonKey: options.singletonKey ?? null,
      requestId: currentRequestId() ?? null,
    });
    return id;
  }
  const row = await manager.save(
    manager.create(JobOutboxRow, {
      queue,
      data: { ...data, requestId: currentRequestId() ?? null },
      startAfter: options.startAfter ?? new Date(),
      singletonKey: options.singletonKey ?? null,
      requestId: currentRequestId() ?? null,
    }),
  );
  return row.id;
}

/**
 * Moves committed outbox rows into pg-boss. The pg-boss insert runs on the relay's own transaction
 * (pg-boss's `db` option), so a row is marked relayed exactly when its job exists; rows are claimed with
 * SKIP LOCKED so several workers can relay side by side.
 */
export async function relayJobOutbox(db: DataSource, boss: PgBoss, batchSize = 50): Promise<number> {
  return db.transaction(async (manager) => {
    const rows = await manager
      .createQueryBuilder(JobOutboxRow, 'j')
      .where('j.relayed_at IS NULL')
      .orderBy('j.created_at', 'ASC')
      .limit(batchSize)
      .setLock('pessimistic_write')
      .setOnLocked('skip_locked')
      .getMany();
    const executor = { executeSql: async (text: string, values: unknown[]) => ({ rows: (await manager.query(text, values)) as unknown[] }) };
    for (const row of rows) {
      const jobId = await boss.send(row.queue, row.data, {
        startAfter: row.startAfter,
        ...(row.singletonKey ? { singletonKey: row.singletonKey } : {}),
        db: executor,
      });
      // null: a job with the same singleton key is already waiting, which is the point of the key.
      if (jobId === null) logger.info({ outboxId: row.id, queue: row.queue, singletonKey: row.singletonKey }, 'job already queued; outbox row closed');
      await manager.update(JobOutboxRow, row.id, { relayedAt: new Date(), jobId, attempts: row.attempts + 1, lastError: null });
    }
    return rows.length;
  });
}

export interface JobRelay {
  stop(): Promise<void>;
}

/** Relays committed outbox rows every `intervalMs` until stopped. */
export function startJobRelay(db: DataSource, boss: PgBoss, onError: (err: unknown) => void, intervalMs = 500): JobRelay {
  let stopped = false;
  let running: Promise<unknown> = Promise.resolve();
  let timer: NodeJS.Timeout;
  const tick = () => {
    if (stopped) return;
    running = relayJobOutbox(db, boss)
      .catch(onError)
      .finally(() => {
        if (!stopped) timer = setTimeout(tick, intervalMs);
      });
  };
  timer = setTimeout(tick, 100);
  return {
    async stop() {
      stopped = true;
      clearTimeout(timer);
      await running;
    },
  };
}
