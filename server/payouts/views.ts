import type { EntityManager } from 'typeorm';
import type { EarningLineDto, SettlementRunDto, StatementDetailDto, StatementDto } from '@shared/schemas/money';
import { AppError } from '../lib/errors';
import type { SettlementRun } from './entities';

/*
 * Reading statements and runs back: the DTOs the routes answer with, and the statement's lines with the
 * case each is about. Every read is scoped by the caller (the payee's own organisation, or the network).
 */

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export interface StatementRow {
  id: string;
  organization_id: string;
  organization_name: string;
  payee_kind: 'partner' | 'lab';
  period: string;
  currency: string;
  line_count: number;
  opening_carry_minor: string;
  lines_total_minor: string;
  total_minor: string;
  payout_minor: string;
  carry_forward_minor: string;
  status: StatementDto['status'];
  transfer_id: string | null;
  attempts: number;
  last_error: string | null;
  next_attempt_at: Date | null;
  paid_at: Date | null;
  created_at: Date;
}

export const STATEMENT_COLUMNS = `s.id, s.organization_id, o.name AS organization_name, s.payee_kind, s.period, s.currency, s.line_count,
  s.opening_carry_minor::text, s.lines_total_minor::text, s.total_minor::text, s.payout_minor::text, s.carry_forward_minor::text,
  s.status, s.transfer_id, s.attempts, s.last_error, s.next_attempt_at, s.paid_at, s.created_at`;

export function toStatementDto(r: StatementRow): StatementDto {
  return {
    id: r.id,
    organizationId: r.organization_id,
    organizationName: r.organization_name,
    payeeKind: r.payee_kind,
    period: r.period,
    currency: r.currency.trim(),
    lineCount: r.line_count,
    openingCarryMinor: Number(r.opening_carry_minor),
    linesTotalMinor: Number(r.lines_total_minor),
    totalMinor: Number(r.total_minor),
    payoutMinor: Number(r.payout_minor),
    carryForwardMinor: Number(r.carry_forward_minor),
    status: r.status,
    transferId: r.transfer_id,
    attempts: r.attempts,
    lastError: r.last_error,
    nextAttemptAt: r.next_attempt_at ? new Date(r.next_attempt_at).toISOString() : null,
    paidAt: r.paid_at ? new Date(r.paid_at).toISOString() : null,
    createdAt: new Date(r.created_at).toISOString(),
  };
}

export interface LineRow {
  id: string;
  kind: EarningLineDto['kind'];
  referral_id: string;
  reference: string;
  currency: string;
  amount_minor: string;
  base_minor: string | null;
  basis_points: number | null;
  accrued_at: Date;
  statement_id: string | null;
}

export const LINE_COLUMNS = `l.id, l.kind, l.referral_id, r.reference, l.currency, l.amount_minor::text, l.base_minor::text, l.basis_points,
  l.accrued_at, l.statement_id`;

export function toLineDto(r: LineRow): EarningLineDto {
  return {
    id: r.id,
    kind: r.kind,
    referralId: r.referral_id,
    reference: r.reference,
    currency: r.currency.trim(),
    amountMinor: Number(r.amount_minor),
    baseMinor: r.base_minor === null ? null : Number(r.base_minor),
    basisPoints: r.basis_points,
    accruedAt: new Date(r.accrued_at).toISOString(),
    statementId: r.statement_id,
  };
}

/** Statements of one organisation (its own view) or of everyone (the network's), newest first. */
export async function listStatements(
  manager: EntityManager,
  scope: { organizationId?: string; period?: string; statuses?: StatementDto['status'][]; limit?: number },
): Promise<StatementDto[]> {
  const rows: StatementRow[] = await manager.query(
    `SELECT ${STATEMENT_COLUMNS} FROM statements s JOIN organizations o ON o.id = s.organization_id
     WHERE ($1::uuid IS NULL OR s.organization_id = $1) AND ($2::text IS NULL OR s.period = $2) AND s.status <> 'preparing'
       AND ($4::text[] IS NULL OR s.status = ANY($4))
     ORDER BY s.period DESC, o.name, s.currency LIMIT $3`,
    [scope.organizationId ?? null, scope.period ?? null, scope.limit ?? 500, scope.statuses ?? null],
  );
  return rows.map(toStatementDto);
}

/** One statement with its lines; another organisation's statement is simply not found. */
export async function getStatementDetail(manager: EntityManager, scope: { organizationId?: string }, id: string): Promise<StatementDetailDto> {
  if (!UUID.test(id)) throw AppError.notFound('That statement');
  const [row]: StatementRow[] = await manager.query(
    `SELECT ${STATEMENT_COLUMNS} FROM statements s JOIN organizations o ON o.id = s.organization_id
     WHERE s.id = $1 AND ($2::uuid IS NULL OR s.organization_id = $2) AND s.status <> 'preparing'`,
    [id, scope.organizationId ?? null],
  );
  if (!row) throw AppError.notFound('That statement');
  const lines: LineRow[] = await manager.query(
    `SELECT ${LINE_COLUMNS} FROM earning_lines l JOIN referrals r ON r.id = l.referral_id
     WHERE l.statement_id = $1 ORDER BY l.accrued_at, r.reference, l.kind`,
    [id],
  );
  return { ...toStatementDto(row), lines: lines.map(toLineDto) };
}

export async function runDtos(manager: EntityManager, runs: SettlementRun[]): Promise<SettlementRunDto[]> {
  const userIds = [...new Set(runs.map((r) => r.startedById).filter((id): id is string => Boolean(id)))];
  const users: { id: string; name: string }[] = userIds.length ? await manager.query(`SELECT id, name FROM users WHERE id = ANY($1)`, [userIds]) : [];
  const names = new Map(users.map((u) => [u.id, u.name]));
  return runs.map((r) => ({
    id: r.id,
    period: r.period,
    trigger: r.trigger,
    status: r.status,
    startedAt: r.startedAt.toISOString(),
    finishedAt: r.finishedAt?.toISOString() ?? null,
    startedByName: r.startedById ? (names.get(r.startedById) ?? null) : null,
    summary: {
      statementsCreated: r.summary.statementsCreated ?? 0,
      paid: r.summary.paid ?? 0,
      failed: r.summary.failed ?? 0,
      waitingForAccount: r.summary.waitingForAccount ?? 0,
      carriedForward: r.summary.carriedForward ?? 0,
      paidMinorByCurrency: r.summary.paidMinorByCurrency ?? {},
    },
  }));
}
