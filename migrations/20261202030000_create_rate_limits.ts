import type { Knex } from 'knex';

/**
 * Request counters shared by every app instance, in the shape rate-limiter-flexible's
 * PostgreSQL store reads and writes (key, points used, expiry in epoch milliseconds).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('rate_limits', (t) => {
    t.string('key', 255).primary();
    t.integer('points').notNullable().defaultTo(0);
    t.bigInteger('expire');
    t.index(['expire']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('rate_limits');
}
