import type { Knex } from 'knex';

/**
 * The temperature plan as data: specifications (a project default and per-campaign overrides),
 * a campaign's stored plan (inputs and result, versioned) and saved comparisons of campaigns.
 *
 * The CHECK constraints repeat the zod rules in api/features/plan/schemas.ts so that a write which
 * bypasses the API still cannot store an ee specification of 100 % or a probability of 1.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('plan_specifications', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('project_id').notNullable().references('id').inTable('projects').onDelete('CASCADE');
    // Null: the project's default; otherwise this campaign's override.
    t.uuid('campaign_id').references('id').inTable('campaigns').onDelete('CASCADE');
    t.text('measure').notNullable();
    t.double('minimum').notNullable();
    t.double('probability').notNullable();
    t.integer('runs').notNullable().defaultTo(1);
    t.integer('version').notNullable().defaultTo(1);
    t.uuid('updated_by_user_id').references('id').inTable('users').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['updated_by_user_id']);
  });
  await knex.raw(`
    alter table plan_specifications
      add constraint plan_specifications_measure_known check (measure in ('ee', 'er', 'dr', 'percentA')),
      add constraint plan_specifications_minimum_range check (
        (measure = 'ee' and minimum > 0 and minimum < 100) or
        (measure in ('er', 'percentA') and minimum > 50 and minimum < 100) or
        (measure = 'dr' and minimum > 1 and minimum < 'Infinity'::float8)),
      add constraint plan_specifications_probability_range check (probability > 0.5 and probability <= 0.999),
      add constraint plan_specifications_runs_range check (runs between 1 and 100),
      add constraint plan_specifications_version_positive check (version >= 1)
  `);
  await knex.raw(`create unique index plan_specifications_project_default on plan_specifications (project_id) where campaign_id is null`);
  await knex.raw(`create unique index plan_specifications_campaign on plan_specifications (campaign_id) where campaign_id is not null`);

  await knex.schema.createTable('campaign_plans', (t) => {
    t.uuid('campaign_id').primary().references('id').inTable('campaigns').onDelete('CASCADE');
    // What the user asked (temperatures, rate, hold, rule…) and what the planner answered then.
    t.jsonb('inputs').notNullable();
    t.jsonb('result').notNullable();
    t.integer('version').notNullable().defaultTo(1);
    t.uuid('updated_by_user_id').references('id').inTable('users').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['updated_by_user_id']);
  });
  await knex.raw(`
    alter table campaign_plans
      add constraint campaign_plans_objects check (jsonb_typeof(inputs) = 'object' and jsonb_typeof(result) = 'object'),
      add constraint campaign_plans_version_positive check (version >= 1)
  `);

  await knex.schema.createTable('comparisons', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    // The project it is saved in (and shared with); its campaigns may come from other projects the author can read.
    t.uuid('project_id').notNullable().references('id').inTable('projects').onDelete('CASCADE');
    t.text('name').notNullable();
    t.specificType('campaign_ids', 'uuid[]').notNullable();
    t.double('temperature_k').notNullable();
    t.uuid('created_by_user_id').references('id').inTable('users').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['project_id', 'created_at']);
    t.index(['created_by_user_id']);
  });
  await knex.raw(`
    alter table comparisons
      add constraint comparisons_name_present check (length(btrim(name)) between 1 and 200),
      add constraint comparisons_campaign_count check (cardinality(campaign_ids) between 2 and 6),
      add constraint comparisons_temperature_range check (temperature_k > 0 and temperature_k <= 1000)
  `);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('comparisons');
  await knex.schema.dropTable('campaign_plans');
  await knex.schema.dropTable('plan_specifications');
}
