import type { MigrationInterface, QueryRunner } from 'typeorm';

// Organisations, users and sign-in, the mail outbox and the audit log.
export class Foundation1764633600000 implements MigrationInterface {
  name = 'Foundation1764633600000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE organizations (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        kind text NOT NULL CHECK (kind IN ('partner', 'lab', 'network')),
        name text NOT NULL,
        slug text NOT NULL UNIQUE,
        email text,
        phone text,
        address_line1 text,
        city text,
        region text,
        postal_code text,
        country text NOT NULL DEFAULT 'US',
        lat double precision,
        lon double precision,
        time_zone text NOT NULL DEFAULT 'America/New_York',
        active boolean NOT NULL DEFAULT true,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`
      CREATE TABLE users (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        email text NOT NULL UNIQUE CHECK (email = lower(email)),
        name text NOT NULL,
        role text NOT NULL CHECK (role IN ('partner_admin', 'partner_staff', 'shipping_clerk', 'lab_technician', 'lab_manager', 'network_admin')),
        status text NOT NULL DEFAULT 'active' CHECK (status IN ('active', 'invited', 'disabled')),
        password_hash text,
        failed_sign_ins integer NOT NULL DEFAULT 0,
        locked_until timestamptz,
        last_sign_in_at timestamptz,
        notification_preferences jsonb NOT NULL DEFAULT '{}'::jsonb,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX users_organization_id_idx ON users (organization_id)`);
    await q.query(`
      CREATE TABLE refresh_tokens (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
        family_id uuid NOT NULL,
        token_hash text NOT NULL,
        expires_at timestamptz NOT NULL,
        revoked_at timestamptz,
        replaced_by_id uuid,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX refresh_tokens_user_id_idx ON refresh_tokens (user_id)`);
    await q.query(`CREATE INDEX refresh_tokens_family_id_idx ON refresh_tokens (family_id)`);
    await q.query(`
      CREATE TABLE one_time_tokens (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
        purpose text NOT NULL CHECK (purpose IN ('password_reset', 'invitation')),
        token_hash text NOT NULL,
        expires_at timestamptz NOT NULL,
        used_at timestamptz,
        created_by_id uuid REFERENCES users(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX one_time_tokens_user_id_idx ON one_time_tokens (user_id)`);
    await q.query(`
      CREATE TABLE outbox_messages (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        channel text NOT NULL DEFAULT 'email',
        template text NOT NULL,
        recipient text NOT NULL,
        subject text NOT NULL,
        text_body text NOT NULL,
        html_body text NOT NULL,
        status text NOT NULL DEFAULT 'pending' CHECK (status IN ('pending', 'sent', 'failed')),
        attempts integer NOT NULL DEFAULT 0,
        next_attempt_at timestamptz NOT NULL DEFAULT now(),
        last_error text,
        sent_at timestamptz,
        request_id text,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    // The worker only ever looks for pending messages that are due.
    await q.query(`CREATE INDEX outbox_messages_due_idx ON outbox_messages (next_attempt_at) WHERE status = 'pending'`);
    await q.query(`
      CREATE TABLE audit_events (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        at timestamptz NOT NULL DEFAULT now(),
        action text NOT NULL,
        actor_user_id uuid,
        organization_id uuid,
        target_type text,
        target_id text,
        details jsonb NOT NULL DEFAULT '{}'::jsonb,
        ip text
      )`);
    await q.query(`CREATE INDEX audit_events_at_idx ON audit_events (at)`);
    await q.query(`CREATE INDEX audit_events_action_idx ON audit_events (action, at)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE audit_events`);
    await q.query(`DROP TABLE outbox_messages`);
    await q.query(`DROP TABLE one_time_tokens`);
    await q.query(`DROP TABLE refresh_tokens`);
    await q.query(`DROP TABLE users`);
    await q.query(`DROP TABLE organizations`);
  }
}
