import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('invitations', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('project_id').notNullable().references('id').inTable('projects').onDelete('CASCADE');
    // Stored lower-cased; compared with the signed-in user's address on acceptance.
    t.text('email').notNullable();
    t.text('role').notNullable();
    // SHA-256 of the secret in the e-mailed link; the secret itself is never stored.
    t.text('token_hash').notNullable().unique();
    t.uuid('invited_by').references('id').inTable('users').onDelete('SET NULL');
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('accepted_at', { useTz: true });
    t.uuid('accepted_by').references('id').inTable('users').onDelete('SET NULL');
    t.timestamp('revoked_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['project_id']);
    t.index(['invited_by']);
    t.index(['accepted_by']);
    t.check(`role in ('owner', 'editor', 'viewer')`, [], 'invitations_role_check');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('invitations');
}
