import '../api/db/pg-types';
import { createKnex, migrateLatest, rollbackAll } from '../api/db/knex';
import { assertDisposableDatabase } from '../api/db/test-guard';

/**
 * Runs once per `vitest run`. With a database (npm test always provides one)
 * the schema is rebuilt from zero so every run starts from the migrations.
 * Without DATABASE_URL only database-free tests can run (unit tests). A database
 * the run did not make for itself is refused unless it is marked as disposable.
 */
export default async function setup() {
  const url = process.env.DATABASE_URL;
  if (!url) return;
  const knex = createKnex(url, { min: 0, max: 2 });
  try {
    await assertDisposableDatabase(knex);
    await rollbackAll(knex);
    await migrateLatest(knex);
  } finally {
    await knex.destroy();
  }
}
