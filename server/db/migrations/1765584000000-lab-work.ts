import type { MigrationInterface, QueryRunner } from 'typeorm';

// The lab's work on a received case and the customer's side of it: evaluations, quotes, imaging
// reports, recovered-file manifests, the customer's private links, checkout sessions and the return
// address. Sorts after the referrals migration, whose table every one of these references.
export class LabWork1765584000000 implements MigrationInterface {
  name = 'LabWork1765584000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE lab_evaluations (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL UNIQUE REFERENCES referrals(id) ON DELETE CASCADE,
        findings jsonb NOT NULL,
        recoverability text NOT NULL CHECK (recoverability IN ('high', 'partial', 'low', 'none')),
        plan text NOT NULL,
        recorded_by_user_id uuid REFERENCES users(id) ON DELETE SET NULL,
        recorded_by_name text NOT NULL,
        recorded_at timestamptz NOT NULL DEFAULT now()
      )`);

    await q.query(`
      CREATE TABLE lab_quotes (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE CASCADE,
        version integer NOT NULL CHECK (version > 0),
        status text NOT NULL CHECK (status IN ('sent', 'approved', 'declined', 'superseded')),
        currency text NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
        lines jsonb NOT NULL,
        total_minor bigint NOT NULL CHECK (total_minor > 0),
        service_lines_minor bigint NOT NULL CHECK (service_lines_minor >= 0 AND service_lines_minor <= total_minor),
        note text,
        sent_at timestamptz NOT NULL DEFAULT now(),
        sent_by_user_id uuid REFERENCES users(id) ON DELETE SET NULL,
        sent_by_name text NOT NULL,
        approved_at timestamptz,
        approved_name text,
        approved_ip text,
        approved_user_agent text,
        terms_version text,
        declined_at timestamptz,
        decline_reason text,
        CONSTRAINT lab_quotes_version_once UNIQUE (referral_id, version),
        CONSTRAINT lab_quotes_approval_complete CHECK (status <> 'approved' OR (approved_at IS NOT NULL AND approved_name IS NOT NULL))
      )`);
    // At most one quote is open or accepted per case; earlier ones are superseded or declined.
    await q.query(`CREATE UNIQUE INDEX lab_quotes_one_current_idx ON lab_quotes (referral_id) WHERE status IN ('sent', 'approved')`);

    await q.query(`
      CREATE TABLE imaging_reports (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE CASCADE,
        total_bytes bigint NOT NULL CHECK (total_bytes > 0),
        bytes_read bigint NOT NULL CHECK (bytes_read >= 0 AND bytes_read <= total_bytes),
        unreadable_sectors bigint NOT NULL CHECK (unreadable_sectors >= 0),
        sector_size_bytes integer NOT NULL CHECK (sector_size_bytes IN (512, 4096)),
        rate_bytes_per_sec double precision NOT NULL CHECK (rate_bytes_per_sec >= 0),
        reported_by_type text NOT NULL CHECK (reported_by_type IN ('user', 'api_key')),
        reported_by_id text NOT NULL,
        reported_by_name text NOT NULL,
        reported_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);
    await q.query(`CREATE INDEX imaging_reports_referral_idx ON imaging_reports (referral_id, reported_at DESC)`);

    await q.query(`
      CREATE TABLE recovered_file_manifests (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE CASCADE,
        version integer NOT NULL CHECK (version > 0),
        content_hash text NOT NULL CHECK (content_hash ~ '^[0-9a-f]{64}$'),
        size_bytes integer NOT NULL CHECK (size_bytes > 0),
        file_count integer NOT NULL CHECK (file_count >= 0),
        total_bytes bigint NOT NULL CHECK (total_bytes >= 0),
        summary jsonb NOT NULL,
        examples jsonb NOT NULL,
        uploaded_by_type text NOT NULL CHECK (uploaded_by_type IN ('user', 'api_key')),
        uploaded_by_id text NOT NULL,
        uploaded_by_name text NOT NULL,
        uploaded_at timestamptz NOT NULL DEFAULT now(),
        review_status text NOT NULL DEFAULT 'pending' CHECK (review_status IN ('pending', 'confirmed', 'disputed', 'superseded')),
        reviewed_at timestamptz,
        review_note text,
        reviewed_ip text,
        CONSTRAINT recovered_file_manifests_version_once UNIQUE (referral_id, version)
      )`);

    await q.query(`
      CREATE TABLE customer_links (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE CASCADE,
        token_hash text NOT NULL UNIQUE CHECK (token_hash ~ '^[0-9a-f]{64}$'),
        reason text NOT NULL,
        issued_at timestamptz NOT NULL DEFAULT now(),
        issued_by_type text NOT NULL CHECK (issued_by_type IN ('user', 'api_key', 'system')),
        issued_by_id text,
        issued_by_name text NOT NULL,
        expires_at timestamptz NOT NULL,
        last_used_at timestamptz,
        revoked_at timestamptz,
        revoked_by_name text
      )`);
    await q.query(`CREATE INDEX customer_links_referral_idx ON customer_links (referral_id, issued_at DESC)`);

    await q.query(`
      CREATE TABLE customer_checkouts (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE CASCADE,
        quote_id uuid NOT NULL REFERENCES lab_quotes(id) ON DELETE RESTRICT,
        session_id text NOT NULL UNIQUE,
        payment_intent_id text NOT NULL UNIQUE,
        url text,
        amount_minor bigint NOT NULL CHECK (amount_minor > 0),
        currency text NOT NULL,
        status text NOT NULL CHECK (status IN ('open', 'paid', 'expired')),
        expires_at timestamptz NOT NULL,
        fee_minor bigint,
        paid_at timestamptz,
        last_failure text,
        last_failure_charge_id text,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX customer_checkouts_referral_idx ON customer_checkouts (referral_id, created_at DESC)`);
    // One payment per case: a second paid checkout would charge the customer twice.
    await q.query(`CREATE UNIQUE INDEX customer_checkouts_one_paid_idx ON customer_checkouts (referral_id) WHERE status = 'paid'`);

    await q.query(`
      CREATE TABLE customer_return_addresses (
        referral_id uuid PRIMARY KEY REFERENCES referrals(id) ON DELETE CASCADE,
        name text NOT NULL,
        line1 text NOT NULL,
        line2 text,
        city text NOT NULL,
        region text NOT NULL,
        postal_code text NOT NULL,
        country text NOT NULL,
        phone text,
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE customer_return_addresses`);
    await q.query(`DROP TABLE customer_checkouts`);
    await q.query(`DROP TABLE customer_links`);
    await q.query(`DROP TABLE recovered_file_manifests`);
    await q.query(`DROP TABLE imaging_reports`);
    await q.query(`DROP TABLE lab_quotes`);
    await q.query(`DROP TABLE lab_evaluations`);
  }
}
