import type { EntityManager } from 'typeorm';
import { periodBounds, previousPeriod } from '@shared/domain/commission';
import type { EarningLineDto, EarningsDto, SettlementOverviewDto } from '@shared/schemas/money';
import type { Actor, ServiceContext } from '../lib/context';
import { AppError } from '../lib/errors';
import { toPayoutAccountDto } from './accounts';
import { PayoutAccount, SettlementRun } from './entities';
import { LINE_COLUMNS, listStatements, runDtos, toLineDto, type LineRow } from './views';
import { readTogether } from '../db/reads';

/** A payee's earnings page: totals, twelve months, statements, the latest lines and the payout account. */
export async function getEarnings(ctx: ServiceContext, actor: Actor, now = new Date()): Promise<EarningsDto> {
  return earningsOf(ctx.db.manager, actor.organizationId, now);
}

export async function earningsOf(manager: EntityManager, organizationId: string, now = new Date()): Promise<EarningsDto> {
  const since = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 11, 1));
  const [totals, months, paidByPeriod, recent, account, statements] = await readTogether(manager, [
    () => manager.query(
      `WITH lines AS (
         SELECT currency, sum(amount_minor) AS accrued, sum(amount_minor) FILTER (WHERE statement_id IS NULL) AS unsettled
         FROM earning_lines WHERE organization_id = $1 GROUP BY currency
       ), st AS (
         SELECT currency, sum(payout_minor) FILTER (WHERE status = 'paid') AS paid,
                sum(carry_forward_minor) FILTER (WHERE carry_forward_minor < 0 AND carried_into_statement_id IS NULL) AS carried
         FROM statements WHERE organization_id = $1 GROUP BY currency
       )
       SELECT l.currency, l.accrued::text, coalesce(l.unsettled, 0)::text AS unsettled, coalesce(st.paid, 0)::text AS paid,
              coalesce(st.carried, 0)::text AS carried
       FROM lines l LEFT JOIN st ON st.currency = l.currency ORDER BY l.currency`,
      [organizationId],
    ),
    () => manager.query(
      `SELECT to_char(accrued_at AT TIME ZONE 'UTC', 'YYYY-MM') AS period, currency, sum(amount_minor)::text AS accrued, count(*)::int AS n
       FROM earning_lines WHERE organization_id = $1 AND accrued_at >= $2 GROUP BY 1, 2 ORDER BY 1`,
      [organizationId, since],
    ),
    () => manager.query(
      `SELECT period, currency, sum(payout_minor)::text AS paid FROM statements
       WHERE organization_id = $1 AND status = 'paid' AND period >= $2 GROUP BY 1, 2`,
      [organizationId, since.toISOString().slice(0, 7)],
    ),
    () => manager.query(
      `SELECT ${LINE_COLUMNS} FROM earning_lines l JOIN referrals r ON r.id = l.referral_id
       WHERE l.organization_id = $1 ORDER BY l.accrued_at DESC, l.id LIMIT 20`,
      [organizationId],
    ),
    () => manager.findOneBy(PayoutAccount, { organizationId }),
    () => listStatements(manager, { organizationId, limit: 24 }),
  ]);

  const paidMap = new Map((paidByPeriod as { period: string; currency: string; paid: string }[]).map((p) => [`${p.period}|${p.currency.trim()}`, Number(p.paid)]));
  const monthRows = (months as { period: string; currency: string; accrued: string; n: number }[]).map((m) => ({
    period: m.period,
    currency: m.currency.trim(),
    accruedMinor: Number(m.accrued),
    paidMinor: paidMap.get(`${m.period}|${m.currency.trim()}`) ?? 0,
    lineCount: m.n,
  }));
  // Months with a payout but no lines of their own (a carried balance paid off) still show.
  for (const [key, paid] of paidMap) {
    const [period, currency] = key.split('|') as [string, string];
    if (!monthRows.some((m) => m.period === period && m.currency === currency)) monthRows.push({ period, currency, accruedMinor: 0, paidMinor: paid, lineCount: 0 });
  }
  monthRows.sort((a, b) => a.period.localeCompare(b.period) || a.currency.localeCompare(b.currency));

  return {
    totals: (totals as { currency: string; accrued: string; unsettled: string; paid: string; carried: string }[]).map((t) => ({
      currency: t.currency.trim(),
      accruedMinor: Number(t.accrued),
      paidMinor: Number(t.paid),
      pendingMinor: Number(t.accrued) - Number(t.paid),
      unsettledMinor: Number(t.unsettled),
      carriedForwardMinor: Number(t.carried),
    })),
    months: monthRows,
    statements,
    recentLines: (recent as LineRow[]).map(toLineDto),
    payoutAccount: toPayoutAccountDto(account),
  };
}

/** Lines of one accrual month (UTC), for the earnings page's month detail. */
export async function getEarningLines(ctx: ServiceContext, actor: Actor, period: string): Promise<{ period: string; lines: EarningLineDto[] }> {
  let bounds: { start: Date; end: Date };
  try {
    bounds = periodBounds(period);
  } catch (err) {
    throw AppError.validation([{ path: 'period', message: (err as Error).message }]);
  }
  const rows: LineRow[] = await ctx.db.query(
    `SELECT ${LINE_COLUMNS} FROM earning_lines l JOIN referrals r ON r.id = l.referral_id
     WHERE l.organization_id = $1 AND l.accrued_at >= $2 AND l.accrued_at < $3 ORDER BY l.accrued_at, l.id LIMIT 5000`,
    [actor.organizationId, bounds.start, bounds.end],
  );
  return { period, lines: rows.map(toLineDto) };
}

/** The network admin's settlement page: runs, period totals, failures and what is not settled yet. */
export async function settlementOverview(ctx: ServiceContext, now = new Date()): Promise<SettlementOverviewDto> {
  const m = ctx.db.manager;
  const [runs, periods, failures, unsettled] = await Promise.all([
    m.find(SettlementRun, { order: { startedAt: 'DESC' }, take: 20 }),
    m.query(
      `SELECT period, currency, count(*)::int AS statements,
              coalesce(sum(payout_minor) FILTER (WHERE status = 'paid'), 0)::text AS paid,
              coalesce(sum(payout_minor) FILTER (WHERE status IN ('pending', 'paying', 'failed', 'no_account')), 0)::text AS due,
              count(*) FILTER (WHERE status = 'failed')::int AS failed,
              count(*) FILTER (WHERE status = 'no_account')::int AS waiting,
              coalesce(sum(carry_forward_minor), 0)::text AS carried
       FROM statements WHERE status <> 'preparing' GROUP BY period, currency ORDER BY period DESC, currency LIMIT 24`,
    ),
    listStatements(m, { statuses: ['failed', 'no_account', 'paying'], limit: 100 }),
    m.query(
      `SELECT currency, coalesce(sum(amount_minor) FILTER (WHERE payee_kind = 'partner'), 0)::text AS partner,
              coalesce(sum(amount_minor) FILTER (WHERE payee_kind = 'lab'), 0)::text AS lab, count(*)::int AS n
       FROM earning_lines WHERE statement_id IS NULL GROUP BY currency ORDER BY currency`,
    ),
  ]);
  return {
    runs: await runDtos(m, runs),
    periods: (periods as { period: string; currency: string; statements: number; paid: string; due: string; failed: number; waiting: number; carried: string }[]).map((p) => ({
      period: p.period,
      currency: p.currency.trim(),
      statements: p.statements,
      paidMinor: Number(p.paid),
      dueMinor: Number(p.due),
      failed: p.failed,
      waitingForAccount: p.waiting,
      carriedForwardMinor: Number(p.carried),
    })),
    failures,
    suggestedPeriod: previousPeriod(now),
    unsettled: (unsettled as { currency: string; partner: string; lab: string; n: number }[]).map((u) => ({
      currency: u.currency.trim(),
      partnerMinor: Number(u.partner),
      labMinor: Number(u.lab),
      lineCount: u.n,
    })),
  };
}

export async function settlementPeriod(ctx: ServiceContext, period: string) {
  try {
    periodBounds(period);
  } catch (err) {
    throw AppError.validation([{ path: 'period', message: (err as Error).message }]);
  }
  const [statements, runs] = await Promise.all([
    listStatements(ctx.db.manager, { period, limit: 10_000 }),
    ctx.db.manager.find(SettlementRun, { where: { period }, order: { startedAt: 'DESC' } }),
  ]);
  return { period, statements, runs: await runDtos(ctx.db.manager, runs) };
}
