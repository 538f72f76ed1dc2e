import { afterAll, describe, expect, it } from 'vitest';
import { createKnex } from '../../api/db/knex';
import { assertDisposableDatabase, TEST_MARKER_TABLE } from '../../api/db/test-guard';
import { closeTestKnex, testKnex } from '../support/db';

afterAll(closeTestKnex);

/** A second database on the test cluster, named like a developer's working database. */
async function withDatabase(name: string, fn: (url: string) => Promise<void>) {
  const admin = testKnex();
  await admin.raw(`drop database if exists "${name}"`);
  await admin.raw(`create database "${name}"`);
  const url = new URL(process.env.DATABASE_URL!);
  url.pathname = `/${name}`;
  try {
    await fn(url.toString());
  } finally {
    await admin.raw(`drop database if exists "${name}" with (force)`);
  }
}

describe('the test suite only wipes a database it may wipe', () => {
  it('when the database is the run’s own, then it is accepted', async () => {
    await expect(assertDisposableDatabase(testKnex())).resolves.toBeUndefined();
  });

  it('when the database name does not end in _test and it has no marker, then it is refused with a way forward', async () => {
    await withDatabase('eyrie_guard_work', async (url) => {
      const knex = createKnex(url, { min: 0, max: 1 });
      try {
        await knex.schema.createTable('projects', (t) => t.increments('id'));
        const refused = assertDisposableDatabase(knex);
        await expect(refused).rejects.toThrow(/Refusing to run the tests against database "eyrie_guard_work"/);
        await expect(refused).rejects.toThrow(/Unset DATABASE_URL/);
        expect(await knex.schema.hasTable('projects')).toBe(true);
      } finally {
        await knex.destroy();
      }
    });
  });

  it('when the database holds the marker table, then it is accepted whatever its name', async () => {
    await withDatabase('eyrie_guard_marked', async (url) => {
      const knex = createKnex(url, { min: 0, max: 1 });
      try {
        await knex.raw(`create table ${TEST_MARKER_TABLE} ()`);
        await expect(assertDisposableDatabase(knex)).resolves.toBeUndefined();
      } finally {
        await knex.destroy();
      }
    });
  });
});
