import type { Knex } from 'knex';

/** Project updates name the version they were made from, like campaigns: a stale one is a 409. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('projects', (t) => {
    t.integer('version').notNullable().defaultTo(1);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('projects', (t) => {
    t.dropColumn('version');
  });
}
