import type { Knex } from 'knex';
import PgBoss from 'pg-boss';

/** pg-boss's schema and the queues of background work (imports, report builds, report e-mail). */
export const JOB_SCHEMA = 'pgboss';
const QUEUES = ['eyrie-import', 'eyrie-report', 'eyrie-report-email'];

// pg-boss's construction script manages its own transaction (BEGIN … COMMIT).
export const config = { transaction: false };

/**
 * Background jobs as the app sees them: who asked, in which project, how far it got and what came
 * of it. pg-boss (schema "pgboss") decides which instance runs a job and when; this table is what
 * the client polls and what makes a job run once (see api/features/jobs/runner.ts).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.raw(PgBoss.getConstructionPlans(JOB_SCHEMA));
  for (const name of QUEUES) {
    const exists = await knex.raw(`select 1 from ${JOB_SCHEMA}.queue where name = ?`, [name]);
    if (exists.rows.length === 0)
      await knex.raw(`select ${JOB_SCHEMA}.create_queue(?, ?::json)`, [name, JSON.stringify({ policy: 'standard' })]);
  }
  await knex.schema.createTable('jobs', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.string('kind', 40).notNullable();
    t.uuid('project_id').notNullable().references('id').inTable('projects').onDelete('CASCADE');
    t.uuid('campaign_id').references('id').inTable('campaigns').onDelete('SET NULL');
    t.uuid('created_by_user_id').references('id').inTable('users').onDelete('SET NULL');
    t.string('state', 20).notNullable().defaultTo('queued');
    t.jsonb('progress').notNullable().defaultTo(knex.raw(`'{"stage":"queued","percent":0}'::jsonb`));
    t.jsonb('input').notNullable().defaultTo('{}');
    /** The uploaded file of an import, kept until the job ends. */
    t.binary('file');
    t.jsonb('result');
    /** A built report, downloadable from the job. */
    t.binary('result_file');
    t.string('result_file_name', 300);
    /** Problem details when the job failed. */
    t.jsonb('error');
    t.integer('attempts').notNullable().defaultTo(0);
    /** Host and process id of the instance that last started the job (for operators). */
    t.string('worker', 200);
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('started_at', { useTz: true });
    t.timestamp('finished_at', { useTz: true });
    t.index(['project_id', 'created_at']);
  });
  await knex.raw(`alter table jobs add constraint jobs_state_check check (state in ('queued', 'running', 'succeeded', 'failed'))`);
  await knex.raw(`alter table jobs add constraint jobs_kind_check check (kind in ('import', 'report', 'report-email'))`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('jobs');
  await knex.raw(`drop schema if exists ${JOB_SCHEMA} cascade`);
}
