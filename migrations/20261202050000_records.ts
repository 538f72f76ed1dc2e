import type { Knex } from 'knex';

/**
 * Records a reviewer can read:
 * - audit events carry the reason the person gave and the campaign they concern, so a
 *   campaign's history is one indexed query and every edit or delete says why;
 * - a campaign can be signed off (its measurements are then locked until reopened with a reason);
 * - each uploaded file is kept as it arrived (bytes, name, size, SHA-256, uploader, time) and
 *   the measurements it produced point back to it and to their row.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('audit_events', (t) => {
    t.text('reason');
    // No foreign key, as for project_id: the history of a campaign outlives the campaign.
    t.uuid('campaign_id');
    t.index(['campaign_id', 'id']);
  });
  await knex.raw(`alter table audit_events add constraint audit_events_reason_length check (reason is null or length(reason) <= 500)`);
  // Events recorded before this migration name their campaign in the row itself or in its snapshot.
  await knex.raw(`
    update audit_events
       set campaign_id = case
         when entity_type in ('campaign', 'measurement_batch', 'measurement_import') then entity_id::uuid
         else coalesce("after"->>'campaignId', "before"->>'campaignId')::uuid end
     where entity_type in ('campaign', 'measurement_batch', 'measurement_import', 'measurement', 'saved_forecast')
       and entity_id ~* '^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$'
  `);

  await knex.schema.alterTable('campaigns', (t) => {
    t.timestamp('signed_off_at', { useTz: true });
    t.uuid('signed_off_by_user_id').references('id').inTable('users').onDelete('SET NULL');
    t.text('sign_off_note');
  });
  await knex.raw(
    `alter table campaigns add constraint campaigns_sign_off_note_length check (sign_off_note is null or length(sign_off_note) <= 500)`,
  );

  await knex.schema.createTable('import_files', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('campaign_id').notNullable().references('id').inTable('campaigns').onDelete('CASCADE');
    t.text('file_name').notNullable();
    t.text('media_type').notNullable();
    t.text('format').notNullable();
    t.integer('size_bytes').notNullable();
    t.text('sha256').notNullable();
    t.binary('content').notNullable();
    t.integer('row_count').notNullable();
    t.uuid('uploaded_by_user_id').references('id').inTable('users').onDelete('SET NULL');
    t.timestamp('uploaded_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['campaign_id', 'uploaded_at']);
    t.index(['uploaded_by_user_id']);
  });
  await knex.raw(`
    alter table import_files
      add constraint import_files_size check (size_bytes >= 0 and size_bytes <= 10485760 and size_bytes = octet_length(content)),
      add constraint import_files_sha256_hex check (sha256 ~ '^[0-9a-f]{64}$'),
      add constraint import_files_row_count check (row_count >= 0),
      add constraint import_files_name_present check (length(btrim(file_name)) between 1 and 255)
  `);

  await knex.schema.alterTable('measurements', (t) => {
    t.uuid('import_file_id').references('id').inTable('import_files').onDelete('SET NULL');
    t.index(['import_file_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('measurements', (t) => {
    t.dropColumn('import_file_id');
  });
  await knex.schema.dropTable('import_files');
  await knex.raw(`alter table campaigns drop constraint campaigns_sign_off_note_length`);
  await knex.schema.alterTable('campaigns', (t) => {
    t.dropColumn('sign_off_note');
    t.dropColumn('signed_off_by_user_id');
    t.dropColumn('signed_off_at');
  });
  await knex.raw(`alter table audit_events drop constraint audit_events_reason_length`);
  await knex.schema.alterTable('audit_events', (t) => {
    t.dropIndex(['campaign_id', 'id']);
    t.dropColumn('campaign_id');
    t.dropColumn('reason');
  });
}
