import '../../api/db/pg-types';
import type { Knex } from 'knex';
import { createKnex } from '../../api/db/knex';

let shared: Knex | null = null;

/**
 * One knex per test worker; factories and tests pass it to every query (`Model.query(testKnex())`), as the app passes its
 * own handle to every service: no model is bound to a database globally. Schema is migrated by global setup.
 */
export function testKnex(): Knex {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set: run API tests through `npm test`, which starts PostgreSQL.');
  if (!shared) {
    shared = createKnex(url, { min: 0, max: 4 });
  }
  return shared;
}

export async function closeTestKnex(): Promise<void> {
  await shared?.destroy();
  shared = null;
}
