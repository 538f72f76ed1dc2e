import '../../api/db/pg-types';
import type { Knex } from 'knex';
import { bindModels, createKnex } from '../../api/db/knex';

let shared: Knex | null = null;

/** One knex per test worker, bound to the Objection models. Schema is migrated by global setup. */
export function testKnex(): Knex {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set: run API tests through `npm test`, which starts PostgreSQL.');
  if (!shared) {
    shared = createKnex(url, { min: 0, max: 4 });
    bindModels(shared);
  }
  return shared;
}

export async function closeTestKnex(): Promise<void> {
  await shared?.destroy();
  shared = null;
}
