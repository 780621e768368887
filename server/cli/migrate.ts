import { createDataSource, runMigrations } from '../db/data-source';
import { seedDemo } from '../db/seed';
import { loadConfig } from '../config';

// `npm run migration:run` (add `-- --seed` for the demo data): runs pending migrations.
const config = loadConfig();
const db = await createDataSource({ url: config.databaseUrl, poolSize: 2 }).initialize();
try {
  const ran = await runMigrations(db);
  console.log(ran.length ? `[db] ran migrations: ${ran.join(', ')}` : '[db] schema is up to date');
  if (process.argv.includes('--seed')) {
    const { seeded } = await seedDemo(db);
    console.log(seeded ? '[db] demo data seeded' : '[db] demo data already present; left as it is');
  }
} finally {
  await db.destroy();
}
