import type { MigrationInterface, QueryRunner } from 'typeorm';

// Lab profiles and clean-air certificates; referrals (cases) with their routing snapshots, lab offers and
// timeline; the job outbox that hands delayed jobs (offer deadlines) to the queue after the transaction.
export class ReferralsAndRouting1764979200000 implements MigrationInterface {
  name = 'ReferralsAndRouting1764979200000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE lab_profiles (
        organization_id uuid PRIMARY KEY REFERENCES organizations(id) ON DELETE CASCADE,
        media_types text[] NOT NULL DEFAULT '{}',
        skills jsonb NOT NULL DEFAULT '[]'::jsonb,
        weekly_throughput double precision NOT NULL CHECK (weekly_throughput >= 0),
        queue_capacity integer NOT NULL CHECK (queue_capacity >= 0),
        opens_at text NOT NULL DEFAULT '09:00' CHECK (opens_at ~ '^([01][0-9]|2[0-3]):[0-5][0-9]$'),
        closes_at text NOT NULL DEFAULT '17:00' CHECK (closes_at ~ '^([01][0-9]|2[0-3]):[0-5][0-9]$'),
        workdays integer[] NOT NULL DEFAULT '{1,2,3,4,5}',
        holiday_country text NOT NULL DEFAULT 'US',
        holiday_region text,
        health_data_agreement_signed_at timestamptz,
        accepting_new_cases boolean NOT NULL DEFAULT true,
        auto_accept_rules jsonb NOT NULL DEFAULT '[]'::jsonb,
        updated_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CHECK (closes_at > opens_at)
      )`);
    await q.query(`
      CREATE TABLE clean_air_certificates (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
        tested_on date NOT NULL,
        area_name text NOT NULL,
        area_m2 double precision NOT NULL CHECK (area_m2 > 0),
        samples jsonb NOT NULL,
        iso_class smallint CHECK (iso_class BETWEEN 1 AND 9),
        valid_until date,
        problems jsonb NOT NULL DEFAULT '[]'::jsonb,
        recorded_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    // The latest certificate of a lab is the one routing reads.
    await q.query(`CREATE INDEX clean_air_certificates_latest_idx ON clean_air_certificates (organization_id, tested_on DESC, created_at DESC)`);

    // Case numbers start at 32^4 so that every reference has five Base 32 symbols (PP-10000-~).
    await q.query(`CREATE SEQUENCE referral_number_seq AS bigint START WITH 1048576 MINVALUE 1048576`);
    await q.query(`
      CREATE TABLE referrals (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        reference_number bigint NOT NULL UNIQUE,
        reference text NOT NULL UNIQUE,
        partner_organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        external_ref text,
        status text NOT NULL CHECK (status IN ('opened', 'needs_attention', 'offered', 'accepted', 'label_issued', 'in_transit',
          'received', 'evaluating', 'quote_sent', 'quote_declined', 'approved', 'recovering', 'ready_for_review', 'paid',
          'returned', 'closed', 'no_recovery', 'cancelled', 'on_hold')),
        customer_name text NOT NULL,
        customer_email text NOT NULL,
        customer_phone text,
        media_type text NOT NULL,
        capacity_gb double precision,
        device_interface text,
        device_make text,
        device_model text,
        device_serial text,
        member_count integer,
        symptoms text[] NOT NULL DEFAULT '{}',
        description text,
        priorities jsonb NOT NULL DEFAULT '[]'::jsonb,
        sensitivity text[] NOT NULL DEFAULT '{}',
        battery jsonb,
        origin_line1 text,
        origin_city text,
        origin_region text,
        origin_postal_code text NOT NULL,
        origin_country text NOT NULL,
        origin_lat double precision NOT NULL,
        origin_lon double precision NOT NULL,
        consent_recorded_at timestamptz,
        consent_recorded_by text,
        triage jsonb NOT NULL,
        lab_organization_id uuid REFERENCES organizations(id) ON DELETE RESTRICT,
        attention_reason text,
        created_by_type text NOT NULL CHECK (created_by_type IN ('user', 'api_key')),
        created_by_id text NOT NULL,
        created_by_name text NOT NULL,
        idempotency_key text,
        idempotency_hash text,
        cancelled_at timestamptz,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE UNIQUE INDEX referrals_idempotency_idx ON referrals (partner_organization_id, idempotency_key) WHERE idempotency_key IS NOT NULL`);
    // Lists are newest first, per shop and network-wide, with a keyset cursor on (created_at, id).
    await q.query(`CREATE INDEX referrals_partner_created_idx ON referrals (partner_organization_id, created_at DESC, id DESC)`);
    await q.query(`CREATE INDEX referrals_created_idx ON referrals (created_at DESC, id DESC)`);
    // A lab's open-case count is derived from the cases it holds.
    await q.query(`CREATE INDEX referrals_lab_status_idx ON referrals (lab_organization_id, status) WHERE lab_organization_id IS NOT NULL`);
    await q.query(`CREATE INDEX referrals_attention_idx ON referrals (updated_at) WHERE status = 'needs_attention'`);

    await q.query(`
      CREATE TABLE routing_snapshots (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE CASCADE,
        trigger text NOT NULL CHECK (trigger IN ('intake', 'reoffer', 'manual')),
        origin_lat double precision NOT NULL,
        origin_lon double precision NOT NULL,
        candidates jsonb NOT NULL,
        excluded jsonb NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX routing_snapshots_referral_idx ON routing_snapshots (referral_id, created_at DESC)`);

    await q.query(`
      CREATE TABLE lab_offers (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE CASCADE,
        lab_organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        routing_snapshot_id uuid REFERENCES routing_snapshots(id) ON DELETE SET NULL,
        status text NOT NULL CHECK (status IN ('pending', 'accepted', 'declined', 'expired', 'withdrawn')),
        rank integer,
        distance_km double precision,
        estimated_days double precision,
        offered_at timestamptz NOT NULL,
        deadline timestamptz NOT NULL,
        responded_at timestamptz,
        responded_by_user_id uuid REFERENCES users(id) ON DELETE SET NULL,
        responded_by_name text,
        auto_accepted boolean NOT NULL DEFAULT false,
        decline_reason text,
        decline_note text,
        assigned_by_user_id uuid REFERENCES users(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CHECK (deadline > offered_at)
      )`);
    // A case is offered to one lab at a time.
    await q.query(`CREATE UNIQUE INDEX lab_offers_one_pending_idx ON lab_offers (referral_id) WHERE status = 'pending'`);
    await q.query(`CREATE INDEX lab_offers_referral_idx ON lab_offers (referral_id, offered_at DESC)`);
    await q.query(`CREATE INDEX lab_offers_lab_idx ON lab_offers (lab_organization_id, offered_at DESC)`);
    await q.query(`CREATE INDEX lab_offers_due_idx ON lab_offers (deadline) WHERE status = 'pending'`);

    await q.query(`
      CREATE TABLE referral_timeline (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        position bigint GENERATED ALWAYS AS IDENTITY,
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE CASCADE,
        at timestamptz NOT NULL DEFAULT now(),
        kind text NOT NULL,
        summary text NOT NULL,
        actor_type text NOT NULL CHECK (actor_type IN ('user', 'api_key', 'system', 'customer', 'carrier')),
        actor_id text,
        actor_name text NOT NULL,
        details jsonb NOT NULL DEFAULT '{}'::jsonb
      )`);
    await q.query(`CREATE INDEX referral_timeline_referral_idx ON referral_timeline (referral_id, at, position)`);

    await q.query(`
      CREATE TABLE job_outbox (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        queue text NOT NULL,
        data jsonb NOT NULL DEFAULT '{}'::jsonb,
        start_after timestamptz NOT NULL DEFAULT now(),
        singleton_key text,
        request_id text,
        attempts integer NOT NULL DEFAULT 0,
        last_error text,
        relayed_at timestamptz,
        job_id uuid,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    // The relay only ever looks for rows not yet handed to the queue.
    await q.query(`CREATE INDEX job_outbox_pending_idx ON job_outbox (created_at) WHERE relayed_at IS NULL`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE job_outbox`);
    await q.query(`DROP TABLE referral_timeline`);
    await q.query(`DROP TABLE lab_offers`);
    await q.query(`DROP TABLE routing_snapshots`);
    await q.query(`DROP TABLE referrals`);
    await q.query(`DROP SEQUENCE referral_number_seq`);
    await q.query(`DROP TABLE clean_air_certificates`);
    await q.query(`DROP TABLE lab_profiles`);
  }
}
