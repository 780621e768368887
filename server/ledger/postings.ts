import type { EntityManager } from 'typeorm';
import { normaliseCurrency } from '@shared/domain/money';
import { AppError } from '../lib/errors';
import { ledgerAccountKinds, type LedgerAccountKind, type LedgerTransactionKind } from './entities';

/*
 * Writing to the ledger. Every amount is signed: a debit is positive, a credit negative, so the entries of
 * a transaction sum to zero. This file checks that before writing; the database checks it again at commit
 * (a deferred constraint trigger), so no code path can leave the books out of balance.
 */

const PER_ORGANIZATION: ReadonlySet<LedgerAccountKind> = new Set(['lab_payable', 'partner_commission_payable']);

export interface AccountRef {
  kind: LedgerAccountKind;
  /** The lab or shop, for the payable accounts; absent for the network's own accounts. */
  organizationId?: string | null;
}

/** The account's id, opening it on first use. */
export async function accountId(manager: EntityManager, ref: AccountRef, currency: string): Promise<string> {
  if (!ledgerAccountKinds.includes(ref.kind)) throw new Error(`unknown ledger account kind "${ref.kind}"`);
  const org = PER_ORGANIZATION.has(ref.kind) ? (ref.organizationId ?? null) : null;
  if (PER_ORGANIZATION.has(ref.kind) && !org) throw new Error(`a ${ref.kind} account belongs to an organisation`);
  // Written so the unique index answers it (IS NOT DISTINCT FROM would not use the index).
  const find = org
    ? () => manager.query(`SELECT id FROM ledger_accounts WHERE kind = $1 AND organization_id = $2 AND currency = $3`, [ref.kind, org, currency])
    : () => manager.query(`SELECT id FROM ledger_accounts WHERE kind = $1 AND organization_id IS NULL AND currency = $2`, [ref.kind, currency]);
  const existing: { id: string }[] = await find();
  if (existing[0]) return existing[0].id;
  const inserted: { id: string }[] = await manager.query(
    `INSERT INTO ledger_accounts (kind, organization_id, currency) VALUES ($1, $2, $3)
     ON CONFLICT ON CONSTRAINT ledger_accounts_unique DO NOTHING RETURNING id`,
    [ref.kind, org, currency],
  );
  if (inserted[0]) return inserted[0].id;
  // Opened by a concurrent transaction that has committed meanwhile.
  const [again]: { id: string }[] = await find();
  return again!.id;
}

/** The ids of several accounts: one query for those that exist, `accountId` (which opens them) for the rest. */
async function accountIds_(manager: EntityManager, refs: AccountRef[], currency: string): Promise<string[]> {
  const keyOf = (kind: string, org: string | null) => `${kind}|${org ?? ''}`;
  const wanted = refs.map((r) => ({ kind: r.kind, org: PER_ORGANIZATION.has(r.kind) ? (r.organizationId ?? null) : null }));
  const rows: { id: string; kind: string; organization_id: string | null }[] = await manager.query(
    `SELECT id, kind, organization_id FROM ledger_accounts
     WHERE currency = $1 AND ((organization_id IS NULL AND kind = ANY($2)) OR (organization_id = ANY($3) AND kind = ANY($4)))`,
    [
      currency,
      wanted.filter((w) => !w.org).map((w) => w.kind),
      wanted.filter((w) => w.org).map((w) => w.org),
      wanted.filter((w) => w.org).map((w) => w.kind),
    ],
  );
  const found = new Map(rows.map((r) => [keyOf(r.kind, r.organization_id), r.id]));
  const ids: string[] = [];
  for (const [i, w] of wanted.entries()) {
    let id = found.get(keyOf(w.kind, w.org));
    if (!id) {
      id = await accountId(manager, refs[i]!, currency);
      found.set(keyOf(w.kind, w.org), id);
    }
    ids.push(id);
  }
  return ids;
}

export interface EntryInput {
  account: AccountRef;
  amountMinor: number;
  memo: string;
}

export interface TransactionInput {
  kind: LedgerTransactionKind;
  /** The provider's id of the event; a second posting with the same kind and id changes nothing. */
  sourceId: string;
  referralId?: string | null;
  currency: string;
  occurredAt: Date;
  memo: string;
  details?: Record<string, unknown>;
  entries: EntryInput[];
}

/** Checks that entries can form a transaction: whole minor units, at least two non-zero, summing to zero. */
export function balancedEntries(entries: EntryInput[]): EntryInput[] {
  for (const e of entries) {
    if (!Number.isSafeInteger(e.amountMinor)) throw new RangeError(`Ledger amounts are whole minor units; got ${e.amountMinor} (${e.memo}).`);
  }
  const kept = entries.filter((e) => e.amountMinor !== 0);
  if (kept.length < 2) throw new RangeError('A ledger transaction needs at least two non-zero entries.');
  const sum = kept.reduce((s, e) => s + e.amountMinor, 0);
  if (sum !== 0) throw new RangeError(`Ledger entries must sum to zero; these sum to ${sum}.`);
  return kept;
}

/**
 * Posts one balanced transaction in the caller's database transaction. Idempotent per (kind, sourceId):
 * the second call returns the first transaction's id with `created: false` and writes nothing.
 */
export async function postTransaction(manager: EntityManager, input: TransactionInput): Promise<{ id: string; created: boolean }> {
  const currency = normaliseCurrency(input.currency);
  const entries = balancedEntries(input.entries);
  const inserted: { id: string }[] = await manager.query(
    `INSERT INTO ledger_transactions (kind, source_id, referral_id, currency, occurred_at, memo, details)
     VALUES ($1, $2, $3, $4, $5, $6, $7)
     ON CONFLICT ON CONSTRAINT ledger_transactions_source_unique DO NOTHING RETURNING id`,
    [input.kind, input.sourceId, input.referralId ?? null, currency, input.occurredAt, input.memo, JSON.stringify(input.details ?? {})],
  );
  if (!inserted[0]) {
    const [existing]: { id: string }[] = await manager.query(`SELECT id FROM ledger_transactions WHERE kind = $1 AND source_id = $2`, [
      input.kind,
      input.sourceId,
    ]);
    return { id: existing!.id, created: false };
  }
  const id = inserted[0].id;
  const accountIds = await accountIds_(manager, entries.map((e) => e.account), currency);
  const values: unknown[] = [];
  const rows = entries.map((e, i) => {
    values.push(id, accountIds[i], e.amountMinor, currency, e.memo);
    const b = i * 5;
    return `($${b + 1}, $${b + 2}, $${b + 3}, $${b + 4}, $${b + 5})`;
  });
  await manager.query(`INSERT INTO ledger_entries (transaction_id, account_id, amount_minor, currency, memo) VALUES ${rows.join(', ')}`, values);
  return { id, created: true };
}

/** Whole minor units ≥ min, as a field error the caller can show. */
export function requireMinor(value: unknown, path: string, min = 0): number {
  if (typeof value !== 'number' || !Number.isSafeInteger(value) || value < min) {
    throw AppError.validation([{ path, message: `Must be a whole number of minor units, at least ${min}` }]);
  }
  return value;
}
