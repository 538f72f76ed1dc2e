import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('api_tokens', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('user_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.text('name').notNullable();
    // SHA-256 of the secret; the secret is shown once and never stored.
    t.text('token_hash').notNullable().unique();
    // First characters of the secret, so people can tell their tokens apart.
    t.text('prefix').notNullable();
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('last_used_at', { useTz: true });
    t.timestamp('revoked_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['user_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('api_tokens');
}
