import type { MigrationInterface, QueryRunner } from 'typeorm';

// Partner API keys and the idempotency records of the POSTs made with them.
export class PartnerApi1764892800000 implements MigrationInterface {
  name = 'PartnerApi1764892800000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE api_keys (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        name text NOT NULL CHECK (length(name) BETWEEN 1 AND 80),
        prefix text NOT NULL UNIQUE CHECK (prefix ~ '^[a-z0-9]{12}$'),
        secret_hash text NOT NULL CHECK (secret_hash ~ '^[0-9a-f]{64}$'),
        created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        last_used_at timestamptz,
        revoked_at timestamptz,
        revoked_by_id uuid REFERENCES users(id) ON DELETE SET NULL
      )`);
    await q.query(`CREATE INDEX api_keys_organization_id_idx ON api_keys (organization_id)`);
    await q.query(`
      CREATE TABLE idempotency_records (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        api_key_id uuid NOT NULL REFERENCES api_keys(id) ON DELETE CASCADE,
        idempotency_key text NOT NULL,
        method text NOT NULL,
        path text NOT NULL,
        request_hash text NOT NULL,
        state text NOT NULL CHECK (state IN ('in_progress', 'completed')),
        lease_until timestamptz NOT NULL,
        lease_token uuid NOT NULL,
        response_status integer,
        response_body jsonb,
        created_at timestamptz NOT NULL DEFAULT now(),
        expires_at timestamptz NOT NULL,
        CONSTRAINT idempotency_records_key_unique UNIQUE (api_key_id, idempotency_key),
        CONSTRAINT idempotency_records_completed_has_response CHECK (state = 'in_progress' OR response_status IS NOT NULL)
      )`);
    // The sweep deletes what has expired.
    await q.query(`CREATE INDEX idempotency_records_expires_at_idx ON idempotency_records (expires_at)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE idempotency_records`);
    await q.query(`DROP TABLE api_keys`);
  }
}
