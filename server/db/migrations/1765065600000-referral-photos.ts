import type { MigrationInterface, QueryRunner } from 'typeorm';

// Condition photos of a case's device. Sorts after the referrals migration, whose table it references.
export class ReferralPhotos1765065600000 implements MigrationInterface {
  name = 'ReferralPhotos1765065600000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE referral_photos (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        referral_id uuid NOT NULL REFERENCES referrals(id) ON DELETE CASCADE,
        content_hash text NOT NULL CHECK (content_hash ~ '^[0-9a-f]{64}$'),
        content_type text NOT NULL CHECK (content_type IN ('image/jpeg', 'image/png', 'image/webp', 'image/heic', 'image/heif')),
        size_bytes integer NOT NULL CHECK (size_bytes > 0),
        uploaded_by_type text NOT NULL CHECK (uploaded_by_type IN ('user', 'api_key')),
        uploaded_by_id text NOT NULL,
        uploaded_by_name text NOT NULL,
        uploaded_at timestamptz NOT NULL DEFAULT clock_timestamp(),
        CONSTRAINT referral_photos_once_per_case UNIQUE (referral_id, content_hash)
      )`);
    await q.query(`CREATE INDEX referral_photos_referral_idx ON referral_photos (referral_id, uploaded_at)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE referral_photos`);
  }
}
