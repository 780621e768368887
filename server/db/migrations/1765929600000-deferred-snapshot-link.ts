import type { MigrationInterface, QueryRunner } from 'typeorm';

// Intake writes a case's routing snapshot together with its timeline and e-mails, in one statement
// just before commit, after the offer that points at it: the offer's link to its snapshot is checked
// at commit instead of at once.
export class DeferredSnapshotLink1765929600000 implements MigrationInterface {
  name = 'DeferredSnapshotLink1765929600000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE lab_offers ALTER CONSTRAINT lab_offers_routing_snapshot_id_fkey DEFERRABLE INITIALLY DEFERRED`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE lab_offers ALTER CONSTRAINT lab_offers_routing_snapshot_id_fkey NOT DEFERRABLE`);
  }
}
