import type Stripe from 'stripe';
import type { DataSource, EntityManager } from 'typeorm';
import { periodBounds } from '@shared/domain/commission';
import { formatMoney } from '@shared/domain/money';
import type { SettlementRunDto } from '@shared/schemas/money';
import { recordAudit } from '../audit';
import { enqueueJob, queues } from '../jobs';
import type { Actor, ServiceContext } from '../lib/context';
import { AppError } from '../lib/errors';
import { logger } from '../lib/logger';
import { postPayout } from '../ledger';
import { enqueueEmailToUser } from '../notifications';
import { paymentsClient } from './client';
import { updateReturning } from './sql';
import { SettlementRun, Statement, type SettlementRunSummary, type SettlementTrigger } from './entities';
import { runDtos } from './views';

/*
 * The monthly settlement. For a period (a UTC month that has ended):
 *
 *   1. Prepare, in one database transaction: every shop and lab with earning lines accrued before the
 *      period's end and not on a statement yet gets a statement for the period (one per currency); its
 *      lines are attached to it, a negative balance carried from earlier statements is added, and the
 *      total decides: positive → a payout is due; negative → carried forward, nothing paid; zero → done.
 *   2. Pay: one transfer per statement to the payee's connected account, with the idempotency key
 *      `settlement:<payee>:<period>` and the same text as its transfer group. Each statement holds its
 *      payout's state: marked `paying` (committed) before the provider is called, `paid` with the
 *      transfer id and the ledger posting in one transaction after. A run that dies between the two
 *      leaves `paying`; the next run looks the transfer up by its group (and the idempotency key makes a
 *      repeated create return the first transfer), so nobody is ever paid twice.
 *   3. A failed transfer is marked `failed` with its error, e-mailed about once, and retried by a job
 *      with back-off (1 min, 5 min, 30 min, 2 h, 12 h …) up to PAYOUT_MAX_ATTEMPTS; a run of the period
 *      by a person retries it at once.
 *
 * Only one run per period at a time: a session-level advisory lock, which PostgreSQL drops by itself
 * when the process holding it dies.
 */

const BACKOFF_MINUTES = [1, 5, 30, 120, 720];
/** A payout left `paying` this long by a process that is gone is taken over by the sweep. */
const STALE_CLAIM_MS = 10 * 60_000;

export function backoffMs(attempts: number): number {
  return BACKOFF_MINUTES[Math.min(Math.max(attempts, 1), BACKOFF_MINUTES.length) - 1]! * 60_000;
}

const BUSY = Symbol('busy');

/** Runs `fn` holding the period's settlement lock, or returns BUSY when another process holds it. */
async function withPeriodLock<T>(db: DataSource, period: string, fn: () => Promise<T>): Promise<T | typeof BUSY> {
  const runner = db.createQueryRunner();
  await runner.connect();
  try {
    const [{ locked }]: { locked: boolean }[] = await runner.query(
      `SELECT pg_try_advisory_lock(hashtext('settlement-period'), hashtext($1)) AS locked`,
      [period],
    );
    if (!locked) return BUSY;
    try {
      return await fn();
    } finally {
      await runner.query(`SELECT pg_advisory_unlock(hashtext('settlement-period'), hashtext($1))`, [period]).catch(() => undefined);
    }
  } finally {
    await runner.release();
  }
}

export interface RunSettlementOptions {
  period: string;
  trigger: SettlementTrigger;
  /** Settle only these shops and labs (the whole network when absent). */
  organizationIds?: string[];
  actor?: Actor | null;
  now?: Date;
}

function assertPeriodOver(period: string, now: Date) {
  let end: Date;
  try {
    end = periodBounds(period).end;
  } catch (err) {
    throw AppError.validation([{ path: 'period', message: (err as Error).message }]);
  }
  if (end.getTime() > now.getTime()) {
    throw new AppError('period_not_over', 422, `${period} has not ended yet; a month is settled once it is over`, [
      { path: 'period', message: 'Choose a month that has ended' },
    ]);
  }
  return end;
}

/** Runs the settlement of a period: prepares what is new, then pays everything still unpaid in it. */
export async function runSettlement(ctx: ServiceContext, options: RunSettlementOptions): Promise<SettlementRunDto> {
  const now = options.now ?? new Date();
  const end = assertPeriodOver(options.period, now);
  const scope = options.organizationIds?.length ? [...new Set(options.organizationIds)] : null;
  const outcome = await withPeriodLock(ctx.db, options.period, async () => {
    const runId = await ctx.db.transaction(async (manager) => {
      // We hold the lock, so a run of this period still marked running died on the way.
      await manager.update(SettlementRun, { period: options.period, status: 'running' }, { status: 'interrupted', finishedAt: now });
      const run = await manager.save(
        manager.create(SettlementRun, {
          period: options.period,
          trigger: options.trigger,
          scope,
          startedById: options.actor?.userId ?? null,
          status: 'running',
          startedAt: now,
          summary: emptySummary(),
        }),
      );
      await recordAudit(manager, {
        action: 'settlement.run_started',
        actorUserId: options.actor?.userId ?? null,
        organizationId: options.actor?.organizationId ?? null,
        targetType: 'settlement_run',
        targetId: run.id,
        details: { period: options.period, trigger: options.trigger, scope },
      });
      return run.id;
    });

    const created = await prepareStatements(ctx, { runId, period: options.period, end, scope });
    const due: { id: string }[] = await ctx.db.query(
      `SELECT id FROM statements WHERE period = $1 AND status IN ('pending', 'failed', 'paying', 'no_account')
         AND ($2::uuid[] IS NULL OR organization_id = ANY($2)) ORDER BY payee_kind DESC, organization_id`,
      [options.period, scope],
    );
    // Who hears about each payout, read once for the run rather than once per payout.
    const orgs: { organization_id: string }[] = await ctx.db.query(`SELECT DISTINCT organization_id FROM statements WHERE id = ANY($1)`, [due.map((d) => d.id)]);
    const recipients = new Map<string, Recipient[]>();
    for (const r of await recipientsOf(ctx.db.manager, orgs.map((o) => o.organization_id))) {
      recipients.set(r.organization_id, [...(recipients.get(r.organization_id) ?? []), r]);
    }
    const results = await inParallel(due, ctx.config.settlementConcurrency, (s) =>
      payStatement(ctx, s.id, { now: new Date(), manual: options.trigger !== 'schedule', recipients }),
    );

    const summary = emptySummary();
    summary.statementsCreated = created.created;
    summary.carriedForward = created.carriedForward;
    for (const r of results) {
      if (r.outcome === 'paid') {
        summary.paid += 1;
        summary.paidMinorByCurrency[r.currency] = (summary.paidMinorByCurrency[r.currency] ?? 0) + r.amountMinor;
      } else if (r.outcome === 'failed') summary.failed += 1;
      else if (r.outcome === 'no_account') summary.waitingForAccount += 1;
    }
    await ctx.db.transaction(async (manager) => {
      await manager.update(SettlementRun, runId, {
        status: summary.failed > 0 ? 'completed_with_failures' : 'completed',
        finishedAt: new Date(),
        summary,
      });
      await recordAudit(manager, {
        action: 'settlement.run_finished',
        actorUserId: options.actor?.userId ?? null,
        organizationId: options.actor?.organizationId ?? null,
        targetType: 'settlement_run',
        targetId: runId,
        details: { period: options.period, ...summary },
      });
    });
    return runId;
  });
  if (outcome === BUSY) throw new AppError('settlement_running', 409, `A settlement of ${options.period} is running already; try again when it has finished`);
  const run = await ctx.db.manager.findOneByOrFail(SettlementRun, { id: outcome });
  return (await runDtos(ctx.db.manager, [run]))[0]!;
}

function emptySummary(): SettlementRunSummary {
  return { statementsCreated: 0, paid: 0, failed: 0, waitingForAccount: 0, carriedForward: 0, paidMinorByCurrency: {} };
}

async function inParallel<T, R>(items: T[], concurrency: number, fn: (item: T) => Promise<R>): Promise<R[]> {
  const results: R[] = new Array(items.length);
  let next = 0;
  const worker = async () => {
    while (next < items.length) {
      const index = next++;
      results[index] = await fn(items[index]!);
    }
  };
  await Promise.all(Array.from({ length: Math.min(concurrency, items.length) }, worker));
  return results;
}

interface PreparedStatement {
  id: string;
  organization_id: string;
  payee_kind: 'partner' | 'lab';
  currency: string;
  status: string;
  total_minor: string;
  payout_minor: string;
}

/** Step 1, in one transaction: statements for everything accrued before the period's end and not yet on one. */
async function prepareStatements(
  ctx: ServiceContext,
  input: { runId: string; period: string; end: Date; scope: string[] | null },
): Promise<{ created: number; carriedForward: number }> {
  return ctx.db.transaction((manager) => prepareStatementsIn(manager, input, ctx));
}

/**
 * Step 1 in the caller's transaction. `notify` (the service context) e-mails each payee that its
 * statement is ready; the demo seed, writing history, passes null.
 */
export async function prepareStatementsIn(
  manager: EntityManager,
  input: { runId: string; period: string; end: Date; scope: string[] | null },
  notify: ServiceContext | null,
): Promise<{ created: number; carriedForward: number; statementIds: string[] }> {
  const inserted: { id: string }[] = await manager.query(
    `INSERT INTO statements (organization_id, payee_kind, period, currency, run_id, status, idempotency_key, transfer_group)
     SELECT d.organization_id, d.payee_kind, $1, d.currency, $2, 'preparing', d.key, d.key
     FROM (
       SELECT DISTINCT organization_id, payee_kind, currency,
              -- The key names payee and period; a second currency in the same month gets its code added.
              'settlement:' || organization_id || ':' || $1 || CASE WHEN currency = 'USD' THEN '' ELSE ':' || lower(currency) END AS key
       FROM earning_lines
       WHERE statement_id IS NULL AND accrued_at < $3 AND ($4::uuid[] IS NULL OR organization_id = ANY($4))
     ) d
     ON CONFLICT ON CONSTRAINT statements_one_per_period DO NOTHING
     RETURNING id`,
    [input.period, input.runId, input.end, input.scope],
  );
  const ids = inserted.map((r) => r.id);
  if (ids.length === 0) return { created: 0, carriedForward: 0, statementIds: [] };
  await manager.query(
    `UPDATE earning_lines l SET statement_id = s.id
     FROM statements s
     WHERE s.id = ANY($1) AND l.statement_id IS NULL AND l.organization_id = s.organization_id
       AND l.currency = s.currency AND l.accrued_at < $2`,
    [ids, input.end],
  );
  // Earlier negative balances are taken in (and marked as such), then the totals decide the status.
  await manager.query(
    `UPDATE statements c SET carried_into_statement_id = s.id, updated_at = now()
     FROM statements s
     WHERE s.id = ANY($1) AND c.organization_id = s.organization_id AND c.currency = s.currency
       AND c.carry_forward_minor < 0 AND c.carried_into_statement_id IS NULL AND c.period < s.period`,
    [ids],
  );
  const prepared = await updateReturning<PreparedStatement>(
    manager,
    `WITH sums AS (
       SELECT statement_id, count(*)::int AS n, sum(amount_minor) AS lines FROM earning_lines WHERE statement_id = ANY($1) GROUP BY statement_id
     ), carried AS (
       SELECT carried_into_statement_id AS id, sum(carry_forward_minor) AS carry FROM statements
       WHERE carried_into_statement_id = ANY($1) GROUP BY carried_into_statement_id
     ), totals AS (
       SELECT s.id, coalesce(x.n, 0) AS n, coalesce(x.lines, 0) AS lines, coalesce(c.carry, 0) AS carry,
              coalesce(c.carry, 0) + coalesce(x.lines, 0) AS total
       FROM statements s LEFT JOIN sums x ON x.statement_id = s.id LEFT JOIN carried c ON c.id = s.id
       WHERE s.id = ANY($1)
     )
     UPDATE statements s SET line_count = t.n, lines_total_minor = t.lines, opening_carry_minor = t.carry, total_minor = t.total,
            payout_minor = greatest(t.total, 0), carry_forward_minor = least(t.total, 0), updated_at = now(),
            status = CASE WHEN t.total > 0 THEN 'pending' WHEN t.total < 0 THEN 'carried_forward' ELSE 'nothing_due' END
     FROM totals t WHERE s.id = t.id
     RETURNING s.id, s.organization_id, s.payee_kind, s.currency, s.status, s.total_minor::text, s.payout_minor::text`,
    [ids],
  );
  if (notify) await notifyStatementsReady(notify, manager, input.period, prepared);
  return { created: prepared.length, carriedForward: prepared.filter((p) => p.status === 'carried_forward').length, statementIds: ids };
}

interface Recipient {
  organization_id: string;
  organization_name: string;
  email: string;
  name: string;
}

/** The people who hear about a payee's money: a shop's admins, a lab's managers. */
async function recipientsOf(manager: EntityManager, organizationIds: string[]): Promise<Recipient[]> {
  if (organizationIds.length === 0) return [];
  return manager.query(
    `SELECT u.organization_id, o.name AS organization_name, u.email, u.name
     FROM users u JOIN organizations o ON o.id = u.organization_id
     WHERE u.organization_id = ANY($1) AND u.status = 'active'
       AND ((o.kind = 'partner' AND u.role = 'partner_admin') OR (o.kind = 'lab' AND u.role = 'lab_manager'))`,
    [organizationIds],
  );
}

function statementsUrl(ctx: ServiceContext, payeeKind: string) {
  return `${ctx.config.appUrl}${payeeKind === 'lab' ? '/lab/earnings' : '/partner/earnings'}`;
}

async function notifyStatementsReady(ctx: ServiceContext, manager: EntityManager, period: string, prepared: PreparedStatement[]) {
  const recipients = await recipientsOf(
    manager,
    prepared.map((p) => p.organization_id),
  );
  const byOrg = new Map<string, Recipient[]>();
  for (const r of recipients) byOrg.set(r.organization_id, [...(byOrg.get(r.organization_id) ?? []), r]);
  for (const s of prepared) {
    const note =
      s.status === 'pending'
        ? 'The payout goes to your payout account in the next few minutes.'
        : s.status === 'carried_forward'
          ? 'Refunds outweigh this month’s earnings, so nothing is paid this time; the balance is set against your next statement.'
          : 'Nothing is due this month.';
    for (const r of byOrg.get(s.organization_id) ?? []) {
      await enqueueEmailToUser(manager, { email: r.email }, 'statement_ready', {
        name: r.name,
        organizationName: r.organization_name,
        period,
        total: formatMoney(Number(s.total_minor), s.currency),
        payout: formatMoney(Number(s.payout_minor), s.currency),
        note,
        url: statementsUrl(ctx, s.payee_kind),
      });
    }
  }
}

export type PayOutcome =
  | { outcome: 'paid'; statementId: string; currency: string; amountMinor: number; transferId: string }
  | { outcome: 'failed'; statementId: string; error: string }
  | { outcome: 'no_account'; statementId: string }
  | { outcome: 'skipped'; statementId: string };

interface ClaimedStatement {
  id: string;
  organization_id: string;
  payee_kind: 'partner' | 'lab';
  period: string;
  currency: string;
  payout_minor: string;
  idempotency_key: string;
  transfer_group: string;
  attempts: number;
  previous_status: string;
  provider_account_id: string | null;
  payouts_enabled: boolean;
}

/** Looks up a transfer already made for this statement (after a crash, or once the idempotency key expired). */
async function existingTransfer(stripe: Stripe, s: ClaimedStatement): Promise<Stripe.Transfer | null> {
  const list = await stripe.transfers.list({ transfer_group: s.transfer_group, limit: 10 });
  return list.data.find((t) => t.metadata?.statementId === s.id) ?? list.data[0] ?? null;
}

function errorText(err: unknown): string {
  const e = err as { message?: string; statusCode?: number; code?: string };
  const status = e?.statusCode ? ` (HTTP ${e.statusCode}${e.code ? `, ${e.code}` : ''})` : '';
  return `${e?.message ?? String(err)}${status}`.slice(0, 500);
}

/**
 * Step 2 for one statement: sends its transfer, or finds the one already sent, and records it. Safe to
 * call again at any point: a paid statement is left alone; an unsure one is looked up before paying.
 */
export async function payStatement(
  ctx: ServiceContext,
  statementId: string,
  options: { now?: Date; manual?: boolean; recipients?: Map<string, Recipient[]> } = {},
): Promise<PayOutcome> {
  const recipients = async (manager: EntityManager, organizationId: string) =>
    options.recipients?.get(organizationId) ?? (options.recipients ? [] : await recipientsOf(manager, [organizationId]));
  const now = options.now ?? new Date();
  // The claim also reads the payee's payout account (one round trip).
  const [claimed] = await updateReturning<ClaimedStatement>(
    ctx.db,
    `WITH prev AS (SELECT id, status, organization_id FROM statements WHERE id = $1 FOR UPDATE)
     UPDATE statements s SET status = 'paying', claimed_at = $2, updated_at = now()
     FROM prev LEFT JOIN payout_accounts pa ON pa.organization_id = prev.organization_id
     WHERE s.id = prev.id AND prev.status IN ('pending', 'failed', 'paying', 'no_account')
     RETURNING s.id, s.organization_id, s.payee_kind, s.period, s.currency, s.payout_minor::text, s.idempotency_key, s.transfer_group,
               s.attempts, prev.status AS previous_status, pa.provider_account_id, coalesce(pa.payouts_enabled, false) AS payouts_enabled`,
    [statementId, now],
  );
  if (!claimed) return { outcome: 'skipped', statementId };
  const amountMinor = Number(claimed.payout_minor);
  const account = claimed.provider_account_id ? { provider_account_id: claimed.provider_account_id, payouts_enabled: claimed.payouts_enabled } : null;
  if (!account?.payouts_enabled) {
    await ctx.db.transaction(async (manager) => {
      await manager.query(
        `UPDATE statements SET status = 'no_account', claimed_at = NULL, updated_at = now(), last_error = $2 WHERE id = $1`,
        [claimed.id, account ? 'The payout account has not finished onboarding' : 'No payout account is set up'],
      );
      if (claimed.previous_status !== 'no_account') {
        await tellAboutFailure(ctx, manager, claimed, amountMinor, 'there is no payout account ready to receive it yet.', 'Set up your payout account in Platterpost; the payout is sent as soon as it is ready.', await recipients(manager, claimed.organization_id));
      }
    });
    return { outcome: 'no_account', statementId };
  }

  const stripe = paymentsClient(ctx.config);
  let transfer: Stripe.Transfer | null = null;
  try {
    // Unsure whether an earlier attempt reached the provider: a crash mid-call, or an error that may have
    // come after the transfer was made (a timeout). Look before paying.
    if (claimed.previous_status === 'paying' || claimed.attempts > 0) transfer = await existingTransfer(stripe, claimed);
    transfer ??= await stripe.transfers.create(
      {
        amount: amountMinor,
        currency: claimed.currency.toLowerCase(),
        destination: account.provider_account_id,
        transfer_group: claimed.transfer_group,
        description: `Platterpost ${claimed.payee_kind === 'partner' ? 'commission' : 'lab share'} for ${claimed.period}`,
        metadata: { statementId: claimed.id, organizationId: claimed.organization_id, period: claimed.period },
      },
      { idempotencyKey: claimed.idempotency_key },
    );
    if (transfer.amount !== amountMinor || transfer.currency.toUpperCase() !== claimed.currency.trim()) {
      throw new Error(`transfer ${transfer.id} found for this statement is for ${transfer.amount} ${transfer.currency}, not ${amountMinor} ${claimed.currency}`);
    }
  } catch (err) {
    return recordFailure(ctx, claimed, amountMinor, err, now, options.manual ?? false, (m) => recipients(m, claimed.organization_id));
  }

  const paid = transfer;
  await ctx.db.transaction(async (manager) => {
    const posted = await postPayout(manager, {
      organizationId: claimed.organization_id,
      payeeKind: claimed.payee_kind,
      currency: claimed.currency.trim(),
      amountMinor,
      transferId: paid.id,
      statementId: claimed.id,
      paidAt: new Date(paid.created * 1000),
    });
    await manager.query(
      `UPDATE statements SET status = 'paid', transfer_id = $2, paid_at = $3, payout_transaction_id = $4, claimed_at = NULL,
              last_error = NULL, next_attempt_at = NULL, updated_at = now()
       WHERE id = $1`,
      [claimed.id, paid.id, new Date(paid.created * 1000), posted.id],
    );
    await recordAudit(manager, {
      action: 'payout.sent',
      organizationId: claimed.organization_id,
      targetType: 'statement',
      targetId: claimed.id,
      details: { period: claimed.period, amountMinor, currency: claimed.currency.trim(), transferId: paid.id, attempts: claimed.attempts + 1 },
    });
    for (const r of await recipients(manager, claimed.organization_id)) {
      await enqueueEmailToUser(manager, { email: r.email }, 'payout_sent', {
        name: r.name,
        organizationName: r.organization_name,
        period: claimed.period,
        amount: formatMoney(amountMinor, claimed.currency.trim()),
        transferId: paid.id,
        url: statementsUrl(ctx, claimed.payee_kind),
      });
    }
  });
  return { outcome: 'paid', statementId: claimed.id, currency: claimed.currency.trim(), amountMinor, transferId: paid.id };
}

async function tellAboutFailure(
  ctx: ServiceContext,
  manager: EntityManager,
  s: ClaimedStatement,
  amountMinor: number,
  reason: string,
  nextStep: string,
  to: Recipient[],
) {
  for (const r of to) {
    await enqueueEmailToUser(manager, { email: r.email }, 'payout_failed', {
      name: r.name,
      organizationName: r.organization_name,
      period: s.period,
      amount: formatMoney(amountMinor, s.currency.trim()),
      reason,
      nextStep,
      url: statementsUrl(ctx, s.payee_kind),
    });
  }
}

async function recordFailure(
  ctx: ServiceContext,
  s: ClaimedStatement,
  amountMinor: number,
  err: unknown,
  now: Date,
  manual: boolean,
  recipients: (manager: EntityManager) => Promise<Recipient[]>,
): Promise<PayOutcome> {
  const attempts = s.attempts + 1;
  const message = errorText(err);
  const giveUp = attempts >= ctx.config.payoutMaxAttempts;
  const nextAttemptAt = giveUp ? null : new Date(now.getTime() + backoffMs(attempts));
  logger.warn({ statementId: s.id, attempts, err: message }, 'payout failed');
  await ctx.db.transaction(async (manager) => {
    await manager.query(
      `UPDATE statements SET status = 'failed', attempts = $2, last_error = $3, next_attempt_at = $4, claimed_at = NULL, updated_at = now()
       WHERE id = $1`,
      [s.id, attempts, message, nextAttemptAt],
    );
    if (nextAttemptAt) await enqueueJob(manager, queues.payoutRetry, { statementId: s.id }, { startAfter: nextAttemptAt, singletonKey: s.id });
    await recordAudit(manager, {
      action: 'payout.failed',
      organizationId: s.organization_id,
      targetType: 'statement',
      targetId: s.id,
      details: { period: s.period, amountMinor, attempts, error: message, nextAttemptAt: nextAttemptAt?.toISOString() ?? null, manual },
    });
    // Once, on the first failure, and again when the retries are used up.
    if (attempts === 1 || giveUp) {
      await tellAboutFailure(
        ctx,
        manager,
        s,
        amountMinor,
        'the payment provider did not accept the transfer.',
        giveUp ? 'Our team has been told and will send it by hand once the cause is fixed.' : 'We try again by ourselves over the next hours.',
        await recipients(manager),
      );
    }
  });
  return { outcome: 'failed', statementId: s.id, error: message };
}

/**
 * The retry job for one payout: pays it when it is still failed and due (or was left `paying` by a
 * process that is gone). Does nothing while a run of the same period is going (that run pays it).
 */
export async function retryPayout(ctx: ServiceContext, statementId: string, now = new Date()): Promise<PayOutcome | null> {
  const statement = await ctx.db.manager.findOneBy(Statement, { id: statementId });
  if (!statement) return null;
  const due =
    (statement.status === 'failed' && statement.nextAttemptAt !== null && statement.nextAttemptAt.getTime() <= now.getTime()) ||
    statement.status === 'no_account' ||
    (statement.status === 'paying' && statement.claimedAt !== null && statement.claimedAt.getTime() <= now.getTime() - STALE_CLAIM_MS);
  if (!due) return null;
  const result = await withPeriodLock(ctx.db, statement.period, () => payStatement(ctx, statementId, { now }));
  return result === BUSY ? null : result;
}

/** A person's "retry now" on one payout (network admin): ignores the back-off, still never pays twice. */
export async function retryPayoutNow(ctx: ServiceContext, actor: Actor, statementId: string): Promise<PayOutcome> {
  const statement = await ctx.db.manager.findOneBy(Statement, { id: statementId });
  if (!statement) throw AppError.notFound('That statement');
  if (!['failed', 'no_account', 'paying', 'pending'].includes(statement.status)) {
    throw AppError.conflict(`This payout is ${statement.status.replace('_', ' ')}; there is nothing to retry`);
  }
  const result = await withPeriodLock(ctx.db, statement.period, () => payStatement(ctx, statementId, { manual: true }));
  if (result === BUSY) throw new AppError('settlement_running', 409, `A settlement of ${statement.period} is running; it pays this statement`);
  await ctx.db.transaction((manager) =>
    recordAudit(manager, {
      action: 'payout.retried',
      actorUserId: actor.userId,
      organizationId: statement.organizationId,
      targetType: 'statement',
      targetId: statementId,
      details: { outcome: result.outcome },
    }),
  );
  return result;
}

/** The sweep: payouts whose retry is due but whose job went missing, and payouts a dead process left open. */
export async function sweepPayouts(ctx: ServiceContext, now = new Date()): Promise<number> {
  const rows: { id: string }[] = await ctx.db.query(
    `SELECT id FROM statements
     WHERE (status = 'failed' AND next_attempt_at <= $1) OR (status = 'paying' AND claimed_at <= $2)
     ORDER BY updated_at LIMIT 200`,
    [now, new Date(now.getTime() - STALE_CLAIM_MS)],
  );
  let handled = 0;
  for (const r of rows) if (await retryPayout(ctx, r.id, now)) handled += 1;
  return handled;
}
