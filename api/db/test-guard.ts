import type { Knex } from 'knex';

/** A table whose presence marks a database as one the test suite may wipe, whatever its name. */
export const TEST_MARKER_TABLE = 'eyrie_test_marker';

/**
 * The test suite rolls back every migration of the database it is given. It only
 * does so to a database whose name ends in `_test` or that holds the marker table,
 * so pointing DATABASE_URL at a working database cannot wipe it.
 */
export async function assertDisposableDatabase(knex: Knex): Promise<void> {
  const row = (await knex.raw('select current_database() as name, to_regclass(?) is not null as marked', [TEST_MARKER_TABLE])).rows[0] as {
    name: string;
    marked: boolean;
  };
  if (row.name.endsWith('_test') || row.marked) return;
  throw new Error(
    `Refusing to run the tests against database "${row.name}": the suite rolls back every migration of its database, which would delete its data. ` +
      'Unset DATABASE_URL so that `npm test` starts its own throwaway PostgreSQL, or point DATABASE_URL at an empty database whose name ends in "_test" ' +
      `(createdb eyrie_test), or, if this database really may be wiped, create the marker table in it: create table ${TEST_MARKER_TABLE} ();`,
  );
}
