import type { MigrationInterface, QueryRunner } from 'typeorm';

// Intake e-mails the lab's managers, the shop's staff or the network admins, and a server keeps those
// lists in memory between requests. Any change to who they are (a user's organisation, role, status,
// address, name or e-mail preferences; an organisation switched off) gives the lists a new version in
// the changing transaction, as lab_directory_version does for the labs: a server that reads another
// version reads the people again.
export class RecipientDirectoryVersion1766016000000 implements MigrationInterface {
  name = 'RecipientDirectoryVersion1766016000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE recipient_directory_version (
        only_row boolean PRIMARY KEY DEFAULT true CHECK (only_row),
        version uuid NOT NULL DEFAULT gen_random_uuid()
      )`);
    await q.query(`INSERT INTO recipient_directory_version DEFAULT VALUES`);
    await q.query(`
      CREATE FUNCTION bump_recipient_directory_version() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        UPDATE recipient_directory_version SET version = gen_random_uuid();
        RETURN NULL;
      END $$`);
    // Sign-ins update users too (last sign-in, failed attempts); only the columns the lists read count.
    await q.query(`
      CREATE TRIGGER users_bump_recipient_directory
      AFTER INSERT OR DELETE OR TRUNCATE OR UPDATE OF organization_id, role, status, email, name, notification_preferences ON users
      FOR EACH STATEMENT EXECUTE FUNCTION bump_recipient_directory_version()`);
    await q.query(`
      CREATE TRIGGER organizations_bump_recipient_directory
      AFTER DELETE OR TRUNCATE OR UPDATE OF active, kind ON organizations
      FOR EACH STATEMENT EXECUTE FUNCTION bump_recipient_directory_version()`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TRIGGER organizations_bump_recipient_directory ON organizations`);
    await q.query(`DROP TRIGGER users_bump_recipient_directory ON users`);
    await q.query(`DROP FUNCTION bump_recipient_directory_version()`);
    await q.query(`DROP TABLE recipient_directory_version`);
  }
}
