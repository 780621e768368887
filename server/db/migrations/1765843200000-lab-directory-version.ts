import type { MigrationInterface, QueryRunner } from 'typeorm';

// Routing keeps the network's labs in memory between requests. Any change to what it reads about a lab
// (the organisation, its profile, its clean-air certificates) gives the directory a new version, set
// in the changing transaction: a server that reads a version other than the one it holds reloads.
// A random value rather than a counter, so a version seen inside a transaction that then rolls back
// never comes back as a committed one.
export class LabDirectoryVersion1765843200000 implements MigrationInterface {
  name = 'LabDirectoryVersion1765843200000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE lab_directory_version (
        only_row boolean PRIMARY KEY DEFAULT true CHECK (only_row),
        version uuid NOT NULL DEFAULT gen_random_uuid()
      )`);
    await q.query(`INSERT INTO lab_directory_version DEFAULT VALUES`);
    await q.query(`
      CREATE FUNCTION bump_lab_directory_version() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        UPDATE lab_directory_version SET version = gen_random_uuid();
        RETURN NULL;
      END $$`);
    for (const table of ['organizations', 'lab_profiles', 'clean_air_certificates']) {
      await q.query(`
        CREATE TRIGGER ${table}_bump_lab_directory AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON ${table}
        FOR EACH STATEMENT EXECUTE FUNCTION bump_lab_directory_version()`);
    }
  }

  async down(q: QueryRunner): Promise<void> {
    for (const table of ['organizations', 'lab_profiles', 'clean_air_certificates']) {
      await q.query(`DROP TRIGGER ${table}_bump_lab_directory ON ${table}`);
    }
    await q.query(`DROP FUNCTION bump_lab_directory_version()`);
    await q.query(`DROP TABLE lab_directory_version`);
  }
}
