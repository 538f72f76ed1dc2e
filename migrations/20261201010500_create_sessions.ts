import type { Knex } from 'knex';

/** Browser sessions, in the shape connect-pg-simple reads and writes. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('sessions', (t) => {
    t.string('sid').primary();
    t.json('sess').notNullable();
    t.timestamp('expire', { useTz: true, precision: 6 }).notNullable();
    t.index(['expire']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('sessions');
}
