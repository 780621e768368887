import type { MigrationInterface, QueryRunner } from 'typeorm';

// Shipping and receiving: shipments (prepaid labels shop → lab, returns, lab-to-lab transfers) with their
// carrier scans, the tracking webhook's processed event ids, the lab's check-ins with photos, and the
// transfers a lab owes when it declines a case after the box arrived.
export class Shipping1765238400000 implements MigrationInterface {
  name = 'Shipping1765238400000';

  async up(q: QueryRunner): Promise<void> {
    // Serial references for the SSCC-18 printed on each box.
    await q.query(`CREATE SEQUENCE shipment_sscc_seq AS bigint START WITH 1 MINVALUE 1 MAXVALUE 999999999`);
    await q.query(`
      CREATE TABLE shipments (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE RESTRICT,
        kind text NOT NULL CHECK (kind IN ('inbound', 'return', 'transfer')),
        from_organization_id uuid REFERENCES organizations(id) ON DELETE RESTRICT,
        to_organization_id uuid REFERENCES organizations(id) ON DELETE RESTRICT,
        from_address jsonb NOT NULL,
        to_address jsonb NOT NULL,
        box_preset text,
        length_in double precision NOT NULL CHECK (length_in > 0),
        width_in double precision NOT NULL CHECK (width_in > 0),
        height_in double precision NOT NULL CHECK (height_in > 0),
        weight_oz double precision NOT NULL CHECK (weight_oz > 0),
        billable_lb integer,
        zone smallint,
        provider_shipment_id text UNIQUE,
        rates jsonb NOT NULL DEFAULT '[]'::jsonb,
        selected_rate_id text,
        purchase_attempted_at timestamptz,
        purchase_attempts integer NOT NULL DEFAULT 0,
        carrier text,
        service text,
        mode text CHECK (mode IN ('ground', 'air')),
        amount_minor integer CHECK (amount_minor >= 0),
        currency text,
        status text NOT NULL CHECK (status IN ('awaiting_purchase', 'label_issued', 'in_transit', 'out_for_delivery', 'delivered',
          'exception', 'returned', 'voided')),
        status_rank smallint NOT NULL DEFAULT 0,
        tracking_code text UNIQUE,
        provider_tracker_id text,
        label_pdf_url text,
        public_tracking_url text,
        estimated_delivery_at timestamptz,
        delivered_at timestamptz,
        last_event_at timestamptz,
        last_status_detail text,
        last_message text,
        last_location text,
        overdue_at timestamptz,
        checked_in_at timestamptz,
        check_in_id uuid,
        last_reconciled_at timestamptz,
        signature_required boolean NOT NULL DEFAULT false,
        declared_value_minor integer CHECK (declared_value_minor >= 0),
        battery_mark_text text,
        sscc text UNIQUE CHECK (sscc ~ '^[0-9]{18}$'),
        historical boolean NOT NULL DEFAULT false,
        created_by_type text NOT NULL CHECK (created_by_type IN ('user', 'api_key', 'system')),
        created_by_id text,
        created_by_name text NOT NULL,
        bought_at timestamptz,
        voided_at timestamptz,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX shipments_referral_idx ON shipments (referral_id, created_at)`);
    // The inbound board: a lab's boxes not yet checked in, by status; and the ones delivered lately.
    await q.query(`
      CREATE INDEX shipments_board_open_idx ON shipments (to_organization_id, status)
      WHERE checked_in_at IS NULL AND status NOT IN ('awaiting_purchase', 'voided') AND kind IN ('inbound', 'transfer')`);
    await q.query(`
      CREATE INDEX shipments_board_delivered_idx ON shipments (to_organization_id, delivered_at)
      WHERE delivered_at IS NOT NULL AND kind IN ('inbound', 'transfer')`);
    // Outbound lists and the reconcile job's in-flight boxes.
    await q.query(`CREATE INDEX shipments_from_idx ON shipments (from_organization_id, created_at)`);
    await q.query(`
      CREATE INDEX shipments_in_flight_idx ON shipments (last_reconciled_at NULLS FIRST)
      WHERE status IN ('label_issued', 'in_transit', 'out_for_delivery', 'exception') AND NOT historical`);
    await q.query(`CREATE INDEX shipments_provider_tracker_idx ON shipments (provider_tracker_id) WHERE provider_tracker_id IS NOT NULL`);

    await q.query(`
      CREATE TABLE shipment_scans (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        shipment_id uuid NOT NULL REFERENCES shipments(id) ON DELETE CASCADE,
        occurred_at timestamptz NOT NULL,
        status text NOT NULL,
        status_detail text,
        message text NOT NULL,
        location text,
        created_at timestamptz NOT NULL DEFAULT now(),
        UNIQUE (shipment_id, occurred_at, status, message)
      )`);

    // One row per tracking event id: an event delivered twice has one effect.
    await q.query(`
      CREATE TABLE shipping_webhook_events (
        event_id text PRIMARY KEY,
        description text NOT NULL,
        shipment_id uuid REFERENCES shipments(id) ON DELETE SET NULL,
        outcome text NOT NULL CHECK (outcome IN ('applied', 'stale', 'unknown_tracker', 'ignored')),
        received_at timestamptz NOT NULL DEFAULT now()
      )`);

    await q.query(`
      CREATE TABLE check_ins (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE RESTRICT,
        shipment_id uuid REFERENCES shipments(id) ON DELETE SET NULL,
        lab_organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        box_condition text NOT NULL CHECK (box_condition IN ('intact', 'damaged')),
        seal_present boolean NOT NULL,
        seal_number text,
        seal_intact boolean,
        contents_match boolean NOT NULL,
        contents_note text,
        battery_condition text CHECK (battery_condition IN ('no_battery', 'intact', 'swollen', 'damaged', 'leaking')),
        note text,
        outcome text NOT NULL CHECK (outcome IN ('received', 'on_hold')),
        hold_reason text,
        checked_in_by_user_id uuid REFERENCES users(id) ON DELETE SET NULL,
        checked_in_by_name text NOT NULL,
        checked_in_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX check_ins_referral_idx ON check_ins (referral_id, checked_in_at DESC)`);
    await q.query(`
      ALTER TABLE shipments ADD CONSTRAINT shipments_check_in_fk FOREIGN KEY (check_in_id) REFERENCES check_ins(id) ON DELETE SET NULL`);

    await q.query(`
      CREATE TABLE check_in_photos (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        check_in_id uuid NOT NULL REFERENCES check_ins(id) ON DELETE CASCADE,
        content_hash text NOT NULL,
        content_type text NOT NULL,
        size_bytes integer NOT NULL CHECK (size_bytes > 0),
        created_at timestamptz NOT NULL DEFAULT now(),
        UNIQUE (check_in_id, content_hash)
      )`);

    // A lab that declines a case after its box arrived owes the next lab a transfer.
    await q.query(`
      CREATE TABLE lab_transfers (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE RESTRICT,
        from_lab_organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        reason text NOT NULL,
        note text,
        status text NOT NULL CHECK (status IN ('open', 'shipped')),
        shipment_id uuid REFERENCES shipments(id) ON DELETE SET NULL,
        created_by_name text NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE UNIQUE INDEX lab_transfers_one_open_idx ON lab_transfers (referral_id) WHERE status = 'open'`);
    await q.query(`CREATE INDEX lab_transfers_from_idx ON lab_transfers (from_lab_organization_id, status)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE lab_transfers`);
    await q.query(`DROP TABLE check_in_photos`);
    await q.query(`ALTER TABLE shipments DROP CONSTRAINT shipments_check_in_fk`);
    await q.query(`DROP TABLE check_ins`);
    await q.query(`DROP TABLE shipping_webhook_events`);
    await q.query(`DROP TABLE shipment_scans`);
    await q.query(`DROP TABLE shipments`);
    await q.query(`DROP SEQUENCE shipment_sscc_seq`);
  }
}
