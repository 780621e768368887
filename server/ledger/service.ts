import type { EntityManager } from 'typeorm';
import type { LedgerCheckDto } from '@shared/schemas/money';
import type { ServiceContext } from '../lib/context';
import type { PayeeKind } from './entities';
import { postTransaction } from './postings';
import { readTogether } from '../db/reads';

/** Records money sent to a shop's or lab's connected account at settlement (one transfer, one transaction). */
export async function postPayout(
  manager: EntityManager,
  input: { organizationId: string; payeeKind: PayeeKind; currency: string; amountMinor: number; transferId: string; statementId: string; paidAt: Date },
): Promise<{ id: string; created: boolean }> {
  const payable = input.payeeKind === 'partner' ? 'partner_commission_payable' : 'lab_payable';
  return postTransaction(manager, {
    kind: 'payout',
    sourceId: input.transferId,
    currency: input.currency,
    occurredAt: input.paidAt,
    memo: input.payeeKind === 'partner' ? 'Commission paid to the shop' : 'Share paid to the lab',
    details: { statementId: input.statementId, organizationId: input.organizationId },
    entries: [
      { account: { kind: payable, organizationId: input.organizationId }, amountMinor: input.amountMinor, memo: 'Paid out' },
      { account: { kind: 'transfers_out' }, amountMinor: -input.amountMinor, memo: 'Transfer to the connected account' },
    ],
  });
}

const asNumber = (v: string | number | null) => Number(v ?? 0);

/**
 * The books' self-check for the network admin: every entry adds up to zero per currency and per
 * transaction, and each payable account agrees with its earning lines less what was paid out.
 */
export async function ledgerCheck(ctx: ServiceContext): Promise<LedgerCheckDto> {
  // One snapshot, so a payment posted meanwhile cannot show up in one query and not in the next.
  return ctx.db.transaction('REPEATABLE READ', (m) => checkIn(m));
}

async function checkIn(m: EntityManager): Promise<LedgerCheckDto> {
  const [currencies, unbalanced, counts, accounts, mismatches] = await readTogether(m, [
    () => m.query(`SELECT currency, sum(amount_minor)::text AS sum, count(*)::int AS entries FROM ledger_entries GROUP BY currency ORDER BY currency`),
    () => m.query(
      `SELECT t.id, t.kind, t.currency, coalesce(sum(e.amount_minor), 0)::text AS sum
       FROM ledger_transactions t LEFT JOIN ledger_entries e ON e.transaction_id = t.id
       GROUP BY t.id HAVING coalesce(sum(e.amount_minor), 0) <> 0 OR count(e.id) < 2 LIMIT 50`,
    ),
    () => m.query(`SELECT (SELECT count(*) FROM ledger_transactions)::int AS transactions, (SELECT count(*) FROM ledger_entries)::int AS entries`),
    () => m.query(
      `SELECT a.kind, a.currency, count(DISTINCT a.id)::int AS accounts, coalesce(sum(e.amount_minor), 0)::text AS balance
       FROM ledger_accounts a LEFT JOIN ledger_entries e ON e.account_id = a.id
       GROUP BY a.kind, a.currency ORDER BY a.currency, a.kind`,
    ),
    // Payable balance (credit, negative) + lines (what was earned) − payouts should be 0 for every payee.
    () => m.query(
      `WITH ledger AS (
         SELECT a.organization_id, a.kind, a.currency, sum(e.amount_minor) AS balance
         FROM ledger_accounts a JOIN ledger_entries e ON e.account_id = a.id
         WHERE a.kind IN ('lab_payable', 'partner_commission_payable')
         GROUP BY a.organization_id, a.kind, a.currency
       ), lines AS (
         SELECT organization_id, CASE payee_kind WHEN 'partner' THEN 'partner_commission_payable' ELSE 'lab_payable' END AS kind,
                currency, sum(amount_minor) AS earned
         FROM earning_lines GROUP BY 1, 2, 3
       ), paid AS (
         SELECT organization_id, CASE payee_kind WHEN 'partner' THEN 'partner_commission_payable' ELSE 'lab_payable' END AS kind,
                currency, sum(payout_minor) AS paid
         FROM statements WHERE status = 'paid' GROUP BY 1, 2, 3
       )
       SELECT coalesce(l.organization_id, x.organization_id) AS organization_id, coalesce(l.kind, x.kind) AS kind,
              coalesce(l.currency, x.currency) AS currency,
              coalesce(l.balance, 0)::text AS ledger, (coalesce(x.earned, 0) - coalesce(p.paid, 0))::text AS lines
       FROM ledger l
       FULL JOIN lines x ON x.organization_id = l.organization_id AND x.kind = l.kind AND x.currency = l.currency
       LEFT JOIN paid p ON p.organization_id = coalesce(l.organization_id, x.organization_id)
                       AND p.kind = coalesce(l.kind, x.kind) AND p.currency = coalesce(l.currency, x.currency)
       WHERE coalesce(l.balance, 0) + coalesce(x.earned, 0) - coalesce(p.paid, 0) <> 0
       LIMIT 50`,
    ),
  ]);
  const currencyRows = (currencies as { currency: string; sum: string; entries: number }[]).map((c) => ({
    currency: c.currency.trim(),
    sumMinor: asNumber(c.sum),
    entries: c.entries,
  }));
  const unbalancedRows = (unbalanced as { id: string; kind: string; currency: string; sum: string }[]).map((u) => ({
    id: u.id,
    kind: u.kind,
    currency: u.currency.trim(),
    sumMinor: asNumber(u.sum),
  }));
  const mismatchRows = (mismatches as { organization_id: string; kind: string; currency: string; ledger: string; lines: string }[]).map((r) => ({
    organizationId: r.organization_id,
    kind: r.kind,
    currency: r.currency.trim(),
    ledgerMinor: asNumber(r.ledger),
    linesMinor: asNumber(r.lines),
  }));
  return {
    balanced: currencyRows.every((c) => c.sumMinor === 0) && unbalancedRows.length === 0 && mismatchRows.length === 0,
    checkedAt: new Date().toISOString(),
    transactionCount: counts[0].transactions,
    entryCount: counts[0].entries,
    currencies: currencyRows,
    unbalancedTransactions: unbalancedRows,
    subledgerMismatches: mismatchRows,
    accounts: (accounts as { kind: string; currency: string; accounts: number; balance: string }[]).map((a) => ({
      kind: a.kind,
      currency: a.currency.trim(),
      accounts: a.accounts,
      balanceMinor: asNumber(a.balance),
    })),
  };
}
