import { afterAll, describe, expect, it } from 'vitest';
import '../../api/db/pg-types';
import { createKnex, migrateLatest } from '../../api/db/knex';
import pg from 'pg';

// Runs in a database of its own so that going down does not disturb other test files.
const baseUrl = process.env.DATABASE_URL ?? '';
const dbName = `eyrie_migrations_${process.pid}`;

afterAll(async () => {
  const admin = new pg.Client({ connectionString: baseUrl });
  await admin.connect();
  await admin.query(`drop database if exists "${dbName}"`);
  await admin.end();
});

describe('migrations', () => {
  it('when migrated up, down and up again, then the schema works each time and data round-trips', async () => {
    const admin = new pg.Client({ connectionString: baseUrl });
    await admin.connect();
    await admin.query(`drop database if exists "${dbName}"`);
    await admin.query(`create database "${dbName}"`);
    await admin.end();
    const url = new URL(baseUrl);
    url.pathname = `/${dbName}`;
    const knex = createKnex(url.toString(), { min: 0, max: 2 });
    try {
      const applied = await migrateLatest(knex);
      expect(applied.length).toBeGreaterThan(0);
      await knex('users').insert({ provider: 'test', providerUserId: '1', login: 'first' });
      expect(await knex('users').count({ n: '*' }).first()).toEqual({ n: 1 });

      await knex.migrate.rollback(undefined, true);
      const left = await knex.raw(
        `select table_name from information_schema.tables where table_schema = 'public' and table_name not like 'knex_%'`,
      );
      expect(left.rows).toEqual([]);

      await migrateLatest(knex);
      await knex('users').insert({ provider: 'test', providerUserId: '2', login: 'second' });
      const rows = await knex('users').select('login');
      expect(rows).toEqual([{ login: 'second' }]);
    } finally {
      await knex.destroy();
    }
  });
});
