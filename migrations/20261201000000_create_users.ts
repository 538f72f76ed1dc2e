import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('users', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    // Identity at the OAuth provider (GitHub's numeric id, or the local fake provider's).
    t.text('provider').notNullable().defaultTo('github');
    t.text('provider_user_id').notNullable();
    t.text('login').notNullable();
    t.text('display_name');
    t.text('email');
    t.text('avatar_url');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['provider', 'provider_user_id']);
    t.index(['login']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('users');
}
