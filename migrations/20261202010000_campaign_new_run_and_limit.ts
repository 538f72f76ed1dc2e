import type { Knex } from 'knex';

/**
 * Two assay settings per campaign, both in the campaign measure's own units:
 * - new_run_uncertainty: SD of the assay that will measure the next run (ee and % A: percentage
 *   points; dr/ratio: relative SD of r). Forecast intervals for a new run add this error,
 *   propagated at the predicted selectivity. Null: the median of the runs' own uncertainties.
 * - quantitation_limit: values at or beyond it are bounds, not numbers (ee: %, % A/er: the major
 *   share in %, dr/ratio: r). Null: 99.8 % ee. Whether a value suits the measure is checked by the
 *   API (it depends on the measure); the CHECK only keeps out non-positive and non-finite values.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('campaigns', (t) => {
    t.double('new_run_uncertainty');
    t.double('quantitation_limit');
  });
  await knex.raw(`
    alter table campaigns
      add constraint campaigns_new_run_uncertainty_range check (new_run_uncertainty is null or (new_run_uncertainty > 0 and new_run_uncertainty < 100)),
      add constraint campaigns_quantitation_limit_range check (quantitation_limit is null or (quantitation_limit > 0 and quantitation_limit < 1e12))
  `);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`
    alter table campaigns
      drop constraint if exists campaigns_quantitation_limit_range,
      drop constraint if exists campaigns_new_run_uncertainty_range
  `);
  await knex.schema.alterTable('campaigns', (t) => {
    t.dropColumn('quantitation_limit');
    t.dropColumn('new_run_uncertainty');
  });
}
