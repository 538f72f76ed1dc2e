import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('audit_events', (t) => {
    t.bigIncrements('id').primary();
    // No foreign key on purpose: the history of a project outlives its deletion.
    t.uuid('project_id').notNullable();
    t.uuid('actor_user_id').references('id').inTable('users').onDelete('SET NULL');
    t.text('action').notNullable();
    t.text('entity_type').notNullable();
    t.text('entity_id').notNullable();
    t.jsonb('before');
    t.jsonb('after');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['project_id', 'id']);
    t.index(['actor_user_id']);
    t.check(`action in ('create', 'update', 'delete')`, [], 'audit_events_action_check');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('audit_events');
}
