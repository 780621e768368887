import type { MigrationInterface, QueryRunner } from 'typeorm';

// The money back office: a double-entry ledger (accounts, transactions, entries that sum to zero — checked
// at commit by a deferred constraint trigger), commission plans and their assignment to shops, earning lines
// (what a shop or lab earns or gives back on one case), payout accounts at the payment provider, settlement
// runs and the monthly statements they produce, and the provider's webhook events handled once each.
export class LedgerAndCommissions1765411200000 implements MigrationInterface {
  name = 'LedgerAndCommissions1765411200000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE ledger_accounts (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        kind text NOT NULL CHECK (kind IN ('processor_clearing', 'processor_fees', 'lab_payable', 'network_revenue',
          'partner_commission_payable', 'transfers_out', 'refunds')),
        organization_id uuid REFERENCES organizations(id) ON DELETE RESTRICT,
        currency char(3) NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
        created_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT ledger_accounts_owner CHECK ((kind IN ('lab_payable', 'partner_commission_payable')) = (organization_id IS NOT NULL)),
        CONSTRAINT ledger_accounts_unique UNIQUE NULLS NOT DISTINCT (kind, organization_id, currency)
      )`);
    await q.query(`
      CREATE TABLE ledger_transactions (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        kind text NOT NULL CHECK (kind IN ('customer_payment', 'refund', 'payout')),
        source_id text NOT NULL CHECK (length(source_id) BETWEEN 1 AND 255),
        referral_id uuid REFERENCES referrals(id) ON DELETE RESTRICT,
        currency char(3) NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
        occurred_at timestamptz NOT NULL,
        memo text NOT NULL,
        details jsonb NOT NULL DEFAULT '{}'::jsonb,
        created_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT ledger_transactions_source_unique UNIQUE (kind, source_id)
      )`);
    await q.query(`CREATE INDEX ledger_transactions_referral_idx ON ledger_transactions (referral_id, occurred_at)`);
    await q.query(`
      CREATE TABLE ledger_entries (
        id bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
        transaction_id uuid NOT NULL REFERENCES ledger_transactions(id) ON DELETE RESTRICT,
        account_id uuid NOT NULL REFERENCES ledger_accounts(id) ON DELETE RESTRICT,
        amount_minor bigint NOT NULL CHECK (amount_minor <> 0),
        currency char(3) NOT NULL,
        memo text NOT NULL
      )`);
    await q.query(`CREATE INDEX ledger_entries_transaction_idx ON ledger_entries (transaction_id)`);
    await q.query(`CREATE INDEX ledger_entries_account_idx ON ledger_entries (account_id)`);

    // A ledger transaction balances: at commit its entries (at least two, all in its currency) sum to zero.
    // Deferred, so the entries of one transaction may be written one by one before the check.
    await q.query(`
      CREATE FUNCTION ledger_transaction_must_balance() RETURNS trigger LANGUAGE plpgsql AS $$
      DECLARE
        -- The column holding the transaction's id is the trigger's argument (transaction_id or id).
        tx_id uuid := (to_jsonb(NEW) ->> TG_ARGV[0])::uuid;
        tx_currency char(3);
        total numeric;
        entry_count integer;
        foreign_currency integer;
      BEGIN
        SELECT currency INTO tx_currency FROM ledger_transactions WHERE id = tx_id;
        SELECT coalesce(sum(amount_minor), 0), count(*), count(*) FILTER (WHERE currency <> tx_currency)
          INTO total, entry_count, foreign_currency
          FROM ledger_entries WHERE transaction_id = tx_id;
        IF entry_count < 2 THEN
          RAISE EXCEPTION 'ledger transaction % has % entries; a transaction needs at least two', tx_id, entry_count
            USING ERRCODE = 'check_violation';
        END IF;
        IF total <> 0 THEN
          RAISE EXCEPTION 'ledger transaction % does not balance: its entries sum to % minor units', tx_id, total
            USING ERRCODE = 'check_violation';
        END IF;
        IF foreign_currency > 0 THEN
          RAISE EXCEPTION 'ledger transaction % mixes currencies: every entry must be in %', tx_id, tx_currency
            USING ERRCODE = 'check_violation';
        END IF;
        RETURN NULL;
      END $$`);
    await q.query(`
      CREATE CONSTRAINT TRIGGER ledger_entries_balance AFTER INSERT ON ledger_entries
        DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION ledger_transaction_must_balance('transaction_id')`);
    await q.query(`
      CREATE CONSTRAINT TRIGGER ledger_transactions_balance AFTER INSERT ON ledger_transactions
        DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION ledger_transaction_must_balance('id')`);
    // Append-only: a mistake is corrected by a reversing transaction, never by editing history.
    await q.query(`
      CREATE FUNCTION ledger_is_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION '% is append-only: post a reversing transaction instead of changing or removing one', TG_TABLE_NAME
          USING ERRCODE = 'restrict_violation';
      END $$`);
    await q.query(`CREATE TRIGGER ledger_entries_append_only BEFORE UPDATE OR DELETE ON ledger_entries FOR EACH ROW EXECUTE FUNCTION ledger_is_append_only()`);
    await q.query(
      `CREATE TRIGGER ledger_transactions_append_only BEFORE UPDATE OR DELETE ON ledger_transactions FOR EACH ROW EXECUTE FUNCTION ledger_is_append_only()`,
    );

    await q.query(`
      CREATE TABLE commission_plans (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        name text NOT NULL CHECK (length(name) BETWEEN 1 AND 80),
        tiers jsonb NOT NULL CHECK (jsonb_typeof(tiers) = 'array' AND jsonb_array_length(tiers) BETWEEN 1 AND 10),
        network_fee_basis_points integer NOT NULL DEFAULT 0 CHECK (network_fee_basis_points BETWEEN 0 AND 5000),
        is_default boolean NOT NULL DEFAULT false,
        archived_at timestamptz,
        created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT commission_plans_default_is_live CHECK (NOT (is_default AND archived_at IS NOT NULL))
      )`);
    // At most one default plan, and plan names are unique among the plans in use.
    await q.query(`CREATE UNIQUE INDEX commission_plans_one_default ON commission_plans ((true)) WHERE is_default`);
    await q.query(`CREATE UNIQUE INDEX commission_plans_live_name ON commission_plans (lower(name)) WHERE archived_at IS NULL`);
    await q.query(`
      CREATE TABLE partner_commission_plans (
        partner_organization_id uuid PRIMARY KEY REFERENCES organizations(id) ON DELETE CASCADE,
        plan_id uuid NOT NULL REFERENCES commission_plans(id) ON DELETE RESTRICT,
        assigned_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
        assigned_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX partner_commission_plans_plan_idx ON partner_commission_plans (plan_id)`);

    await q.query(`
      CREATE TABLE payout_accounts (
        organization_id uuid PRIMARY KEY REFERENCES organizations(id) ON DELETE CASCADE,
        provider_account_id text NOT NULL UNIQUE,
        charges_enabled boolean NOT NULL DEFAULT false,
        payouts_enabled boolean NOT NULL DEFAULT false,
        details_submitted boolean NOT NULL DEFAULT false,
        requirements_due text[] NOT NULL DEFAULT '{}',
        -- When the provider said so (event time), so an older event delivered late cannot undo a newer one.
        status_as_of timestamptz NOT NULL DEFAULT now(),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);

    await q.query(`
      CREATE TABLE settlement_runs (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        period text NOT NULL CHECK (period ~ '^[0-9]{4}-(0[1-9]|1[0-2])$'),
        trigger text NOT NULL CHECK (trigger IN ('manual', 'schedule', 'retry')),
        scope uuid[],
        started_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
        status text NOT NULL CHECK (status IN ('running', 'completed', 'completed_with_failures', 'interrupted')),
        started_at timestamptz NOT NULL DEFAULT now(),
        finished_at timestamptz,
        summary jsonb NOT NULL DEFAULT '{}'::jsonb
      )`);
    await q.query(`CREATE INDEX settlement_runs_started_idx ON settlement_runs (started_at DESC)`);
    await q.query(`
      CREATE TABLE statements (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        payee_kind text NOT NULL CHECK (payee_kind IN ('partner', 'lab')),
        period text NOT NULL CHECK (period ~ '^[0-9]{4}-(0[1-9]|1[0-2])$'),
        currency char(3) NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
        run_id uuid NOT NULL REFERENCES settlement_runs(id) ON DELETE RESTRICT,
        line_count integer NOT NULL DEFAULT 0,
        opening_carry_minor bigint NOT NULL DEFAULT 0 CHECK (opening_carry_minor <= 0),
        lines_total_minor bigint NOT NULL DEFAULT 0,
        total_minor bigint NOT NULL DEFAULT 0,
        payout_minor bigint NOT NULL DEFAULT 0 CHECK (payout_minor >= 0),
        carry_forward_minor bigint NOT NULL DEFAULT 0 CHECK (carry_forward_minor <= 0),
        carried_into_statement_id uuid REFERENCES statements(id) ON DELETE RESTRICT,
        status text NOT NULL CHECK (status IN ('preparing', 'pending', 'paying', 'paid', 'failed', 'carried_forward', 'nothing_due', 'no_account')),
        idempotency_key text NOT NULL UNIQUE,
        transfer_group text NOT NULL,
        transfer_id text UNIQUE,
        attempts integer NOT NULL DEFAULT 0,
        last_error text,
        next_attempt_at timestamptz,
        claimed_at timestamptz,
        paid_at timestamptz,
        payout_transaction_id uuid REFERENCES ledger_transactions(id) ON DELETE RESTRICT,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT statements_one_per_period UNIQUE (organization_id, period, currency),
        CONSTRAINT statements_totals_add_up CHECK (status = 'preparing' OR (total_minor = opening_carry_minor + lines_total_minor
          AND payout_minor = greatest(total_minor, 0) AND carry_forward_minor = least(total_minor, 0))),
        CONSTRAINT statements_paid_has_transfer CHECK (status <> 'paid' OR transfer_id IS NOT NULL)
      )`);
    await q.query(`CREATE INDEX statements_period_idx ON statements (period, status)`);
    await q.query(`CREATE INDEX statements_organization_idx ON statements (organization_id, period DESC)`);
    await q.query(`CREATE INDEX statements_open_carry_idx ON statements (organization_id, currency) WHERE carry_forward_minor < 0 AND carried_into_statement_id IS NULL`);

    await q.query(`
      CREATE TABLE earning_lines (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        payee_kind text NOT NULL CHECK (payee_kind IN ('partner', 'lab')),
        kind text NOT NULL CHECK (kind IN ('commission', 'commission_clawback', 'lab_share', 'lab_share_reversal')),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE RESTRICT,
        ledger_transaction_id uuid NOT NULL REFERENCES ledger_transactions(id) ON DELETE RESTRICT,
        currency char(3) NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
        amount_minor bigint NOT NULL,
        base_minor bigint,
        basis_points integer,
        plan_id uuid REFERENCES commission_plans(id) ON DELETE RESTRICT,
        tier_index integer,
        paid_referrals integer,
        details jsonb NOT NULL DEFAULT '{}'::jsonb,
        accrued_at timestamptz NOT NULL,
        statement_id uuid REFERENCES statements(id) ON DELETE RESTRICT,
        created_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT earning_lines_once UNIQUE (ledger_transaction_id, organization_id, kind),
        CONSTRAINT earning_lines_payee_matches CHECK ((payee_kind = 'partner') = (kind IN ('commission', 'commission_clawback')))
      )`);
    await q.query(`CREATE INDEX earning_lines_organization_idx ON earning_lines (organization_id, accrued_at)`);
    await q.query(`CREATE INDEX earning_lines_statement_idx ON earning_lines (statement_id)`);
    await q.query(`CREATE INDEX earning_lines_unsettled_idx ON earning_lines (organization_id, currency, accrued_at) WHERE statement_id IS NULL`);
    await q.query(`CREATE INDEX earning_lines_referral_idx ON earning_lines (referral_id)`);

    await q.query(`
      CREATE TABLE payment_webhook_events (
        event_id text PRIMARY KEY,
        type text NOT NULL,
        provider_created_at timestamptz NOT NULL,
        received_at timestamptz NOT NULL DEFAULT now()
      )`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE payment_webhook_events`);
    await q.query(`DROP TABLE earning_lines`);
    await q.query(`DROP TABLE statements`);
    await q.query(`DROP TABLE settlement_runs`);
    await q.query(`DROP TABLE payout_accounts`);
    await q.query(`DROP TABLE partner_commission_plans`);
    await q.query(`DROP TABLE commission_plans`);
    await q.query(`DROP TABLE ledger_entries`);
    await q.query(`DROP TABLE ledger_transactions`);
    await q.query(`DROP TABLE ledger_accounts`);
    await q.query(`DROP FUNCTION ledger_is_append_only()`);
    await q.query(`DROP FUNCTION ledger_transaction_must_balance()`);
  }
}
