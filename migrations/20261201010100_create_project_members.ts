import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('project_members', (t) => {
    t.uuid('project_id').notNullable().references('id').inTable('projects').onDelete('CASCADE');
    t.uuid('user_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.text('role').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['project_id', 'user_id']);
    t.index(['user_id']);
    t.check(`role in ('owner', 'editor', 'viewer')`, [], 'project_members_role_check');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('project_members');
}
