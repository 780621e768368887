import { randomUUID } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';
import { allowWrites, namedQuery, readOnlyPooledManager } from './named-query';

// Rows that nothing reads back inside the transaction that writes them — routing snapshots, timeline
// steps, outbox e-mail, partner events with their deliveries, job outbox rows — may be collected and written in one
// statement just before the transaction commits, instead of one round trip each. This is what keeps
// intake (five timeline steps, several e-mails, a job) to a handful of statements. Collection happens
// only inside `withBatchedAppends`; everywhere else each row is written at once, as before.

export interface TimelineRow {
  id: string;
  referralId: string;
  at: Date;
  kind: string;
  summary: string;
  actorType: string;
  actorId: string | null;
  actorName: string;
  details: Record<string, unknown>;
}

export interface OutboxRow {
  id: string;
  template: string;
  recipient: string;
  subject: string;
  textBody: string;
  htmlBody: string;
  requestId: string | null;
}

/** A partner event: stored, with one delivery per active endpoint subscribed to it, only when there is one. */
export interface PartnerEventRow {
  id: string;
  organizationId: string;
  type: string;
  payload: string;
}

export interface JobRow {
  id: string;
  queue: string;
  data: Record<string, unknown>;
  startAfter: Date;
  singletonKey: string | null;
  requestId: string | null;
}

/** A ranking as it stood (routing_snapshots); lab offers point at it. */
export interface SnapshotRow {
  id: string;
  referralId: string;
  trigger: string;
  originLat: number;
  originLon: number;
  candidates: unknown[];
  excluded: unknown[];
}

/**
 * A new row of an entity table (a case, an offer), held as the entity object itself: later changes in
 * the same transaction are made to the object (see updateRow) and written with it.
 */
export interface EntityRow {
  target: Function;
  entity: object;
}

export class AppendBuffer {
  readonly rows: EntityRow[] = [];
  readonly snapshots: SnapshotRow[] = [];
  readonly timeline: TimelineRow[] = [];
  readonly outbox: OutboxRow[] = [];
  readonly events: PartnerEventRow[] = [];
  readonly jobs: JobRow[] = [];

  get size(): number {
    return this.rows.length + this.snapshots.length + this.timeline.length + this.outbox.length + this.events.length + this.jobs.length;
  }
}

const buffers = new WeakMap<EntityManager, AppendBuffer>();

/** The buffer collecting this transaction's appends, or undefined when rows are written at once. */
export function appendBufferOf(manager: EntityManager): AppendBuffer | undefined {
  return buffers.get(manager);
}

export const newRowId = (): string => randomUUID();

/**
 * Inserts a new entity row, or, while appends are collected, keeps it to be written with them. Every
 * column must have its value (ids, timestamps and defaults included): the batched write sets them all.
 */
export async function insertRow<T extends object>(manager: EntityManager, target: new () => T, entity: T): Promise<T> {
  const buffer = appendBufferOf(manager);
  if (!buffer) return manager.save(entity);
  for (const column of columnsOf(manager, target)) {
    if (column.read(entity) === undefined) throw new Error(`insertRow: ${target.name}.${column.propertyName} has no value`);
  }
  buffer.rows.push({ target, entity });
  return entity;
}

/** Changes a row: in memory when it is a collected new row (it is written as it stands), else in the database. */
export async function updateRow<T extends object>(manager: EntityManager, target: new () => T, entity: T & { id: string }, changes: Partial<T>): Promise<void> {
  const buffer = appendBufferOf(manager);
  if (buffer?.rows.some((r) => r.entity === entity)) {
    Object.assign(entity, changes);
    return;
  }
  await manager.update(target, entity.id, changes as never);
}

/**
 * Runs `work` in the caller's transaction with appends collected, then writes them all in one
 * statement (still inside the transaction, so they commit or roll back with everything else).
 * Answers the work's result and what was written.
 */
export async function withBatchedAppends<T>(manager: EntityManager, work: () => Promise<T>): Promise<{ result: T; appended: AppendBuffer }> {
  if (!manager.queryRunner?.isTransactionActive) throw new Error('withBatchedAppends needs a transaction');
  if (buffers.has(manager)) throw new Error('withBatchedAppends is already collecting for this transaction');
  const buffer = new AppendBuffer();
  buffers.set(manager, buffer);
  try {
    const result = await work();
    await flushAppends(manager, buffer);
    return { result, appended: buffer };
  } finally {
    buffers.delete(manager);
  }
}

/**
 * Like withBatchedAppends, with no transaction at all: `work` gets a manager that may only read, and
 * everything it writes is collected and written by the one batched statement, which PostgreSQL runs
 * atomically on its own. That saves the BEGIN and COMMIT round trips on intake. Reads are not in one
 * snapshot, as they would not be in a READ COMMITTED transaction either; any write, locking read or
 * advisory lock sent before the batch is refused (and then nothing is written).
 */
export async function withBatchedWrite<T>(dataSource: DataSource, work: (manager: EntityManager) => Promise<T>): Promise<{ result: T; appended: AppendBuffer }> {
  const manager = readOnlyPooledManager(dataSource);
  const buffer = new AppendBuffer();
  buffers.set(manager, buffer);
  try {
    const result = await work(manager);
    allowWrites(manager);
    await flushAppends(manager, buffer);
    return { result, appended: buffer };
  } finally {
    buffers.delete(manager);
  }
}

// Each list arrives as one JSON array whose keys are the table's column names; WITH ORDINALITY keeps
// the order the rows were recorded in, so a timeline's positions follow the order of its steps.
const rows = (param: string, table: string) =>
  `jsonb_array_elements(${param}::jsonb) WITH ORDINALITY AS e(j, ord), LATERAL jsonb_populate_record(NULL::${table}, e.j) AS r`;

const flushSqlCache = new WeakMap<object, Map<number, string>>();

/** The batched write; the entity tables' column lists come from the TypeORM metadata, so it is built once per schema. */
function flushSql(manager: EntityManager, targets: Function[]): string {
  let byCount = flushSqlCache.get(manager.connection);
  if (!byCount) flushSqlCache.set(manager.connection, (byCount = new Map()));
  let sql = byCount.get(targets.length);
  if (sql === undefined) byCount.set(targets.length, (sql = buildFlushSql(manager, targets)));
  return sql;
}

function buildFlushSql(manager: EntityManager, targets: Function[]): string {
  const parts = targets.map((target, i) => {
    const meta = manager.connection.getMetadata(target);
    const columns = meta.columns.map((c) => c.databaseName);
    return `e${i} AS (
    INSERT INTO ${meta.tableName} (${columns.join(', ')})
    SELECT ${columns.map((c) => `r.${c}`).join(', ')} FROM jsonb_populate_recordset(NULL::${meta.tableName}, $${6 + i}::jsonb) AS r
    RETURNING 1
  ),`;
  });
  return FLUSH_SQL.replace('WITH\n', `WITH\n  ${parts.join('\n  ')}\n`);
}

const FLUSH_SQL = `
  WITH
  rs AS (
    INSERT INTO routing_snapshots (id, referral_id, trigger, origin_lat, origin_lon, candidates, excluded)
    SELECT r.id, r.referral_id, r.trigger, r.origin_lat, r.origin_lon, r.candidates, r.excluded
    FROM ${rows('$5', 'routing_snapshots')} ORDER BY e.ord
    RETURNING 1
  ),
  tl AS (
    INSERT INTO referral_timeline (id, referral_id, at, kind, summary, actor_type, actor_id, actor_name, details)
    SELECT r.id, r.referral_id, r.at, r.kind, r.summary, r.actor_type, r.actor_id, r.actor_name, r.details
    FROM ${rows('$1', 'referral_timeline')} ORDER BY e.ord
    RETURNING 1
  ),
  ob AS (
    INSERT INTO outbox_messages (id, template, recipient, subject, text_body, html_body, request_id)
    SELECT r.id, r.template, r.recipient, r.subject, r.text_body, r.html_body, r.request_id
    FROM ${rows('$2', 'outbox_messages')} ORDER BY e.ord
    RETURNING 1
  ),
  ev_in AS (
    SELECT r.id, r.organization_id, r.type, r.payload, e.ord FROM ${rows('$3', 'webhook_events')}
  ),
  targets AS (
    SELECT ep.id AS endpoint_id, ev_in.id AS event_id, ev_in.ord
    FROM ev_in JOIN webhook_endpoints ep
      ON ep.organization_id = ev_in.organization_id AND ep.status = 'active' AND ev_in.type = ANY(ep.events)
  ),
  ev AS (
    INSERT INTO webhook_events (id, organization_id, type, payload)
    SELECT ev_in.id, ev_in.organization_id, ev_in.type, ev_in.payload FROM ev_in
    WHERE ev_in.id IN (SELECT event_id FROM targets)
    ORDER BY ev_in.ord
    RETURNING id
  ),
  dl AS (
    INSERT INTO webhook_deliveries (endpoint_id, event_id, status, next_attempt_at)
    SELECT t.endpoint_id, ev.id, 'pending', now() FROM targets t JOIN ev ON ev.id = t.event_id
    ORDER BY t.ord
    RETURNING 1
  ),
  jb AS (
    INSERT INTO job_outbox (id, queue, data, start_after, singleton_key, request_id)
    SELECT r.id, r.queue, r.data, r.start_after, r.singleton_key, r.request_id
    FROM ${rows('$4', 'job_outbox')} ORDER BY e.ord
    RETURNING 1
  )
  SELECT (SELECT count(*) FROM rs)::int AS snapshots, (SELECT count(*) FROM tl)::int AS timeline, (SELECT count(*) FROM ob)::int AS outbox,
         (SELECT count(*) FROM ev)::int AS events, (SELECT count(*) FROM dl)::int AS deliveries, (SELECT count(*) FROM jb)::int AS jobs`;

/** The entity tables collected rows may go to, in a fixed order so that the statement's text never changes. */
const entityTargets: Function[] = [];

/** Registers an entity table for collected rows (done once by the module that owns it). */
export function collectRowsOf(target: Function): void {
  if (!entityTargets.includes(target)) entityTargets.push(target);
}

interface ColumnReader {
  databaseName: string;
  propertyName: string;
  read(entity: object): unknown;
}

const columnReaders = new WeakMap<object, Map<Function, ColumnReader[]>>();

/**
 * An entity table's columns with a reader each, built once per schema: a plain column is read as the
 * property itself, which is what TypeORM's getEntityValue does for it, without its general path.
 */
function columnsOf(manager: EntityManager, target: Function): ColumnReader[] {
  let byTarget = columnReaders.get(manager.connection);
  if (!byTarget) columnReaders.set(manager.connection, (byTarget = new Map()));
  let readers = byTarget.get(target);
  if (!readers) {
    readers = manager.connection.getMetadata(target).columns.map((column) => {
      const plain = !column.embeddedMetadata && !column.relationMetadata && !column.referencedColumn;
      const property = column.propertyName;
      return {
        databaseName: column.databaseName,
        propertyName: property,
        read: plain ? (entity: object) => (entity as Record<string, unknown>)[property] : (entity: object) => column.getEntityValue(entity),
      };
    });
    byTarget.set(target, readers);
  }
  return readers;
}

function rowJson(manager: EntityManager, target: Function, entity: object): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const column of columnsOf(manager, target)) {
    const value = column.read(entity);
    out[column.databaseName] = value instanceof Date ? value.toISOString() : value;
  }
  return out;
}

async function flushAppends(manager: EntityManager, buffer: AppendBuffer): Promise<void> {
  if (buffer.size === 0) return;
  for (const row of buffer.rows) if (!entityTargets.includes(row.target)) throw new Error(`collected rows of ${row.target.name} are not registered (collectRowsOf)`);
  const entityParams = entityTargets.map((target) => JSON.stringify(buffer.rows.filter((r) => r.target === target).map((r) => rowJson(manager, target, r.entity))));
  await namedQuery(manager, `appends.flush.${entityTargets.length}`, flushSql(manager, entityTargets), [
    JSON.stringify(
      buffer.timeline.map((t) => ({
        id: t.id,
        referral_id: t.referralId,
        at: t.at.toISOString(),
        kind: t.kind,
        summary: t.summary,
        actor_type: t.actorType,
        actor_id: t.actorId,
        actor_name: t.actorName,
        details: t.details,
      })),
    ),
    JSON.stringify(
      buffer.outbox.map((m) => ({
        id: m.id,
        template: m.template,
        recipient: m.recipient,
        subject: m.subject,
        text_body: m.textBody,
        html_body: m.htmlBody,
        request_id: m.requestId,
      })),
    ),
    JSON.stringify(buffer.events.map((e) => ({ id: e.id, organization_id: e.organizationId, type: e.type, payload: e.payload }))),
    JSON.stringify(
      buffer.jobs.map((j) => ({
        id: j.id,
        queue: j.queue,
        data: j.data,
        start_after: j.startAfter.toISOString(),
        singleton_key: j.singletonKey,
        request_id: j.requestId,
      })),
    ),
    JSON.stringify(
      buffer.snapshots.map((r) => ({
        id: r.id,
        referral_id: r.referralId,
        trigger: r.trigger,
        origin_lat: r.originLat,
        origin_lon: r.originLon,
        candidates: r.candidates,
        excluded: r.excluded,
      })),
    ),
    ...entityParams,
  ]);
}
