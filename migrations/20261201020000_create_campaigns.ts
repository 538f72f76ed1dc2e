import type { Knex } from 'knex';

/**
 * Temperature-screen campaigns, their measurements and saved forecasts.
 *
 * The CHECK constraints repeat what the zod schemas in api/features/campaigns/schemas.ts
 * enforce, so a write that bypasses the API (a script, a bulk insert) still cannot store a
 * temperature at or below 0 K, an ee of 100 % or more, or a ratio that is not positive.
 * `x < limit` comparisons also keep out 'NaN' and 'Infinity', which PostgreSQL sorts above
 * every number.
 */

const MEASURES = `('ee', 'er', 'dr', 'percentA', 'ratio')`;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('campaigns', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('project_id').notNullable().references('id').inTable('projects').onDelete('CASCADE');
    t.text('title').notNullable();
    t.text('reaction_description');
    t.text('product_name_a').notNullable();
    t.text('product_name_b').notNullable();
    // How selectivity is normally reported in this campaign; each measurement still names its own measure.
    t.text('measure').notNullable();
    t.text('assay_method').notNullable();
    // Default assay standard deviation in the measure's own unit (ee: percentage points; dr/ratio: relative).
    t.double('default_uncertainty');
    t.text('status').notNullable().defaultTo('active');
    t.text('notes');
    t.integer('version').notNullable().defaultTo(1);
    t.uuid('created_by_user_id').references('id').inTable('users').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['project_id']);
    t.index(['created_by_user_id']);
  });
  await knex.raw(`
    alter table campaigns
      add constraint campaigns_title_present check (length(btrim(title)) between 1 and 200),
      add constraint campaigns_product_names_present check (
        length(btrim(product_name_a)) between 1 and 100 and length(btrim(product_name_b)) between 1 and 100),
      add constraint campaigns_measure_known check (measure in ${MEASURES}),
      add constraint campaigns_assay_method_known check (assay_method in ('chiral-hplc', 'chiral-sfc', 'chiral-gc', 'nmr', 'other')),
      add constraint campaigns_status_known check (status in ('planned', 'active', 'completed', 'archived')),
      add constraint campaigns_default_uncertainty_range check (default_uncertainty is null or (default_uncertainty >= 0 and default_uncertainty < 100)),
      add constraint campaigns_version_positive check (version >= 1)
  `);
  // Two campaigns with the same title in one project would be indistinguishable in lists.
  await knex.raw(`create unique index campaigns_project_title_unique on campaigns (project_id, lower(btrim(title)))`);

  await knex.schema.createTable('measurements', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('campaign_id').notNullable().references('id').inTable('campaigns').onDelete('CASCADE');
    t.double('temperature_k').notNullable();
    t.text('measure').notNullable();
    // The reported number; for "a:b" pairs value is a and value_b is b.
    t.double('value').notNullable();
    t.double('value_b');
    // True when the assay reports only a bound (e.g. "≥ 99.8 % ee" at the quantitation limit).
    t.boolean('is_lower_bound').notNullable().defaultTo(false);
    t.double('uncertainty');
    t.text('replicate_label');
    t.text('sample_id');
    t.double('conversion_percent');
    t.double('reaction_time_s');
    t.boolean('excluded').notNullable().defaultTo(false);
    t.text('excluded_reason');
    t.text('notes');
    // Row of the imported file this measurement came from (null when typed in).
    t.integer('source_row');
    t.integer('version').notNullable().defaultTo(1);
    t.uuid('created_by_user_id').references('id').inTable('users').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['campaign_id', 'temperature_k']);
    t.index(['created_by_user_id']);
  });
  await knex.raw(`
    alter table measurements
      add constraint measurements_temperature_range check (temperature_k > 0 and temperature_k <= 1000),
      add constraint measurements_measure_known check (measure in ${MEASURES}),
      add constraint measurements_value_finite check (value > '-Infinity'::float8 and value < 'Infinity'::float8),
      add constraint measurements_ee_range check (measure <> 'ee' or (value > -100 and value < 100 and value_b is null)),
      add constraint measurements_percent_a_range check (measure <> 'percentA' or (value > 0 and value < 100 and value_b is null)),
      add constraint measurements_er_range check (measure <> 'er' or value_b is not null or value > 0),
      add constraint measurements_ratio_positive check (measure not in ('dr', 'ratio') or value > 0),
      add constraint measurements_pair_positive check (value_b is null or (measure in ('er', 'dr', 'ratio') and value > 0 and value_b > 0 and value_b < 'Infinity'::float8)),
      add constraint measurements_uncertainty_range check (uncertainty is null or (uncertainty >= 0 and uncertainty < 100)),
      add constraint measurements_conversion_range check (conversion_percent is null or (conversion_percent >= 0 and conversion_percent <= 100)),
      add constraint measurements_reaction_time_range check (reaction_time_s is null or (reaction_time_s >= 0 and reaction_time_s < 'Infinity'::float8)),
      add constraint measurements_exclusion_reason check (
        (excluded and excluded_reason is not null and length(btrim(excluded_reason)) > 0) or (not excluded and excluded_reason is null)),
      add constraint measurements_source_row_positive check (source_row is null or source_row >= 1),
      add constraint measurements_version_positive check (version >= 1)
  `);

  await knex.schema.createTable('saved_forecasts', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('campaign_id').notNullable().references('id').inTable('campaigns').onDelete('CASCADE');
    t.double('temperature_k').notNullable();
    t.text('label');
    t.text('notes');
    // What the analysis returned when the forecast was saved, kept as it was (a snapshot, never recomputed).
    t.jsonb('result').notNullable();
    t.uuid('created_by_user_id').references('id').inTable('users').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['campaign_id', 'created_at']);
    t.index(['created_by_user_id']);
  });
  await knex.raw(`
    alter table saved_forecasts
      add constraint saved_forecasts_temperature_range check (temperature_k > 0 and temperature_k <= 1000),
      add constraint saved_forecasts_result_object check (jsonb_typeof(result) = 'object')
  `);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('saved_forecasts');
  await knex.schema.dropTable('measurements');
  await knex.schema.dropTable('campaigns');
}
