import type { MigrationInterface, QueryRunner } from 'typeorm';

// Partner webhook endpoints, the events sent to them, and every delivery attempt.
export class PartnerWebhooks1765152000000 implements MigrationInterface {
  name = 'PartnerWebhooks1765152000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE webhook_endpoints (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
        url text NOT NULL,
        description text,
        events text[] NOT NULL CHECK (cardinality(events) > 0),
        secret text NOT NULL,
        status text NOT NULL DEFAULT 'active' CHECK (status IN ('active', 'disabled')),
        failing_since timestamptz,
        disabled_at timestamptz,
        disabled_reason text,
        created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX webhook_endpoints_organization_id_idx ON webhook_endpoints (organization_id)`);
    await q.query(`
      CREATE TABLE webhook_events (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
        type text NOT NULL,
        payload text NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX webhook_events_organization_id_idx ON webhook_events (organization_id, created_at)`);
    await q.query(`
      CREATE TABLE webhook_deliveries (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        endpoint_id uuid NOT NULL REFERENCES webhook_endpoints(id) ON DELETE CASCADE,
        event_id uuid NOT NULL REFERENCES webhook_events(id) ON DELETE CASCADE,
        status text NOT NULL DEFAULT 'pending' CHECK (status IN ('pending', 'succeeded', 'failed')),
        attempt_count integer NOT NULL DEFAULT 0,
        next_attempt_at timestamptz,
        delivered_at timestamptz,
        created_at timestamptz NOT NULL DEFAULT now(),
        UNIQUE (endpoint_id, event_id)
      )`);
    await q.query(`CREATE INDEX webhook_deliveries_endpoint_idx ON webhook_deliveries (endpoint_id, created_at DESC)`);
    // The dispatcher looks only at pending deliveries that are due.
    await q.query(`CREATE INDEX webhook_deliveries_due_idx ON webhook_deliveries (next_attempt_at) WHERE status = 'pending'`);
    await q.query(`
      CREATE TABLE webhook_attempts (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        delivery_id uuid NOT NULL REFERENCES webhook_deliveries(id) ON DELETE CASCADE,
        at timestamptz NOT NULL,
        status_code integer,
        duration_ms integer NOT NULL,
        error text
      )`);
    await q.query(`CREATE INDEX webhook_attempts_delivery_id_idx ON webhook_attempts (delivery_id, at)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE webhook_attempts`);
    await q.query(`DROP TABLE webhook_deliveries`);
    await q.query(`DROP TABLE webhook_events`);
    await q.query(`DROP TABLE webhook_endpoints`);
  }
}
