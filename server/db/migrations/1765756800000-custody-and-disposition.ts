import type { MigrationInterface, QueryRunner } from 'typeorm';

// The case record: the append-only custody log with its SHA-256 chain, the head kept beside it,
// the disposition of the original media and failed parts, and the certificates of sanitization.
export class CustodyAndDisposition1765756800000 implements MigrationInterface {
  name = 'CustodyAndDisposition1765756800000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE custody_entries (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE RESTRICT,
        sequence integer NOT NULL CHECK (sequence >= 1),
        action text NOT NULL CHECK (action IN ('packed_by_shop', 'handed_to_carrier', 'delivered', 'checked_in', 'to_clean_bench',
          'imaged', 'returned', 'sanitized', 'transferred')),
        at timestamptz NOT NULL,
        actor_type text NOT NULL CHECK (actor_type IN ('user', 'api_key', 'system', 'carrier', 'customer')),
        actor_id text,
        actor_name text NOT NULL,
        location text,
        details jsonb NOT NULL DEFAULT '{}'::jsonb,
        previous_hash text CHECK (previous_hash ~ '^[0-9a-f]{64}$'),
        hash text NOT NULL CHECK (hash ~ '^[0-9a-f]{64}$'),
        recorded_at timestamptz NOT NULL DEFAULT clock_timestamp(),
        CONSTRAINT custody_entries_sequence_once UNIQUE (referral_id, sequence),
        CONSTRAINT custody_entries_first_has_no_previous CHECK ((sequence = 1) = (previous_hash IS NULL))
      )`);
    // Append-only: nothing in the app updates or deletes an entry, and the database refuses it too.
    // (A superuser can still switch the trigger off; the chain then shows where the log was changed.)
    await q.query(`
      CREATE FUNCTION custody_entries_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'custody_entries is append-only: % is not allowed', TG_OP USING ERRCODE = 'insufficient_privilege';
      END $$`);
    await q.query(
      `CREATE TRIGGER custody_entries_append_only BEFORE UPDATE OR DELETE ON custody_entries FOR EACH ROW EXECUTE FUNCTION custody_entries_refuse_change()`,
    );
    await q.query(
      `CREATE TRIGGER custody_entries_no_truncate BEFORE TRUNCATE ON custody_entries FOR EACH STATEMENT EXECUTE FUNCTION custody_entries_refuse_change()`,
    );

    // The latest head of each case's chain, kept apart from the entries: a removed last entry, or a
    // log rewritten from scratch, no longer matches it.
    await q.query(`
      CREATE TABLE custody_heads (
        referral_id uuid PRIMARY KEY REFERENCES referrals(id) ON DELETE RESTRICT,
        sequence integer NOT NULL CHECK (sequence >= 1),
        head_hash text NOT NULL CHECK (head_hash ~ '^[0-9a-f]{64}$'),
        updated_at timestamptz NOT NULL DEFAULT clock_timestamp()
      )`);

    await q.query(`
      CREATE TABLE media_dispositions (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE RESTRICT,
        lab_organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        item text NOT NULL CHECK (item IN ('original_media', 'failed_part')),
        description text NOT NULL,
        serial_number text,
        media_type text NOT NULL,
        outcome text NOT NULL CHECK (outcome IN ('returned', 'sanitized')),
        note text,
        returned_to text CHECK (returned_to IN ('shop', 'customer')),
        tracking_code text,
        level text CHECK (level IN ('clear', 'purge', 'destroy')),
        technique text CHECK (technique IN ('overwrite', 'block_erase', 'cryptographic_erase', 'degauss', 'shred', 'crush', 'disintegrate', 'incinerate')),
        technique_details text,
        self_encrypting boolean NOT NULL DEFAULT false,
        drive_command boolean NOT NULL DEFAULT false,
        tool_name text,
        tool_version text,
        tool_serial_number text,
        verification_method text CHECK (verification_method IN ('full_read_back', 'sampled_read_back', 'tool_report', 'visual_inspection')),
        verification_note text,
        destination text,
        basis text,
        performed_at timestamptz NOT NULL,
        performed_by_user_id uuid NOT NULL REFERENCES users(id) ON DELETE RESTRICT,
        performed_by_name text NOT NULL,
        custody_entry_id uuid NOT NULL REFERENCES custody_entries(id) ON DELETE RESTRICT,
        created_at timestamptz NOT NULL DEFAULT clock_timestamp(),
        CONSTRAINT media_dispositions_returned_fields CHECK (outcome <> 'returned' OR (returned_to IS NOT NULL AND level IS NULL AND technique IS NULL)),
        CONSTRAINT media_dispositions_sanitized_fields CHECK (
          outcome <> 'sanitized' OR (level IS NOT NULL AND technique IS NOT NULL AND tool_name IS NOT NULL AND verification_method IS NOT NULL AND basis IS NOT NULL))
      )`);
    await q.query(`CREATE INDEX media_dispositions_referral_idx ON media_dispositions (referral_id, performed_at)`);
    // One disposition of the original media per case.
    await q.query(`CREATE UNIQUE INDEX media_dispositions_one_original ON media_dispositions (referral_id) WHERE item = 'original_media'`);

    await q.query(`
      CREATE TABLE sanitization_certificates (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE RESTRICT,
        disposition_id uuid NOT NULL UNIQUE REFERENCES media_dispositions(id) ON DELETE RESTRICT,
        number text NOT NULL UNIQUE,
        content_hash text NOT NULL CHECK (content_hash ~ '^[0-9a-f]{64}$'),
        size_bytes integer NOT NULL CHECK (size_bytes > 0),
        issued_at timestamptz NOT NULL,
        custody_head_hash text NOT NULL CHECK (custody_head_hash ~ '^[0-9a-f]{64}$')
      )`);
    await q.query(`CREATE INDEX sanitization_certificates_referral_idx ON sanitization_certificates (referral_id, issued_at)`);

    // The audit screen filters by action, actor and organisation over a date range, newest first.
    await q.query(`CREATE INDEX audit_events_at_id_idx ON audit_events (at DESC, id DESC)`);
    await q.query(`CREATE INDEX audit_events_action_prefix_idx ON audit_events (action text_pattern_ops, at DESC)`);
    await q.query(`CREATE INDEX audit_events_actor_idx ON audit_events (actor_user_id, at DESC)`);
    await q.query(`CREATE INDEX audit_events_organization_idx ON audit_events (organization_id, at DESC)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX audit_events_organization_idx`);
    await q.query(`DROP INDEX audit_events_actor_idx`);
    await q.query(`DROP INDEX audit_events_action_prefix_idx`);
    await q.query(`DROP INDEX audit_events_at_id_idx`);
    await q.query(`DROP TABLE sanitization_certificates`);
    await q.query(`DROP TABLE media_dispositions`);
    await q.query(`DROP TABLE custody_heads`);
    await q.query(`DROP TABLE custody_entries`);
    await q.query(`DROP FUNCTION custody_entries_refuse_change()`);
  }
}
