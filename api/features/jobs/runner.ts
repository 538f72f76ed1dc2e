/**
 * What each kind of job does, and the rule that makes it happen once.
 *
 * A job runs inside one transaction that first takes a transaction-level advisory lock on the
 * job's id and re-reads its row:
 * - finished already (succeeded or failed)? nothing to do: a repeat delivery is harmless;
 * - lock taken? another instance is still running it: throw, and pg-boss retries later;
 * - otherwise run it and write the outcome in the same transaction as the work itself (an
 *   import's rows and the job's "succeeded" commit together, or neither does).
 * When an instance dies, PostgreSQL ends its connection, which rolls its transaction back and
 * frees the lock; pg-boss expires the job and another instance runs it from the start.
 * Progress is written from outside that transaction so pollers see it while the job runs.
 */
import os from 'node:os';
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { AppError, MailNotSentError, UnprocessableError } from '../../lib/errors';
import { problemOf, toProblem } from '../../lib/problem';
import type { Mailer } from '../mail/mailer';
import { reportFileName } from '../campaigns/report';
import { loadCampaignReportData, prepareReport, sendCampaignReport, xlsxOf } from '../campaigns/report-service';
import type { ImportRequestInput } from '../imports/service';
import { importMeasurements } from '../imports/service';
import type { JobHandler, JobKind, JobRow } from './queue';

export interface RunnerDeps {
  knex: Knex;
  mailer: Mailer;
  version: string;
  publicUrl: string;
  logger?: Logger;
}

/** Which instance started a job, for operators reading the jobs table. */
const WORKER_ID = `${os.hostname()}:${process.pid}`;

/** Thrown when another instance holds the job's lock; pg-boss retries the delivery later. */
export class JobBusyError extends Error {
  constructor(id: string) {
    super(`job ${id} is running elsewhere`);
  }
}

/** The transactions of jobs running in this process, so a shutdown can hand them back. */
const running = new Set<Knex.Transaction>();

/** Raised inside a job whose instance is shutting down: its work is rolled back and pg-boss retries it elsewhere. */
export class JobAbandonedError extends Error {
  constructor() {
    super('the instance is shutting down; the job goes back to the queue');
  }
}

/**
 * Roll back every job still running here (after the shutdown's grace period): nothing half-done
 * is committed, the connections return to the pool, and another instance runs the jobs again.
 */
export function abandonRunningJobs(): void {
  for (const trx of running) void trx.rollback(new JobAbandonedError()).catch(() => undefined);
  running.clear();
}

interface Outcome {
  result: Record<string, unknown>;
  file?: { name: string; bytes: Buffer };
}

type Work = (
  trx: Knex.Transaction,
  job: JobRow & { file: Buffer | null },
  progress: (stage: string, percent: number) => Promise<void>,
) => Promise<Outcome>;

/** Run `work` for job `id` at most once to completion (see the file comment). */
export async function runOnce(
  deps: RunnerDeps,
  delivery: { id: string; retryCount: number; retryLimit: number },
  work: Work,
): Promise<void> {
  const { knex } = deps;
  const { id } = delivery;
  let current: Knex.Transaction | null = null;
  const progress = async (stage: string, percent: number) => {
    await knex('jobs')
      .where({ id })
      .whereIn('state', ['queued', 'running'])
      .update({ progress: JSON.stringify({ stage, percent }) });
  };
  try {
    await knex.transaction(async (trx) => {
      running.add(trx);
      current = trx;
      const locked = await trx.raw(`select pg_try_advisory_xact_lock(hashtextextended(?, 0)) as ok`, [`eyrie-job:${id}`]);
      if (!locked.rows[0].ok) throw new JobBusyError(id);
      const job = (await trx('jobs').where({ id }).first()) as (JobRow & { file: Buffer | null }) | undefined;
      if (!job || job.state === 'succeeded' || job.state === 'failed') return;
      // Visible at once to pollers (another connection), not tied to this transaction.
      await knex('jobs')
        .where({ id })
        .update({
          state: 'running',
          worker: WORKER_ID,
          startedAt: new Date(),
          attempts: knex.raw('attempts + 1'),
          progress: JSON.stringify({ stage: 'started', percent: 5 }),
        });
      let outcome: Outcome;
      try {
        outcome = await work(trx, job, progress);
      } catch (err) {
        // A mail server that failed may answer next time: that one goes back for another delivery.
        if (!(err instanceof AppError) || err instanceof MailNotSentError) throw err;
        // A refusal (rows with errors, warnings to confirm, campaign gone…) is the job's answer, not a crash.
        await trx('jobs')
          .where({ id })
          .update({
            state: 'failed',
            file: null,
            error: JSON.stringify(toProblem(err)),
            finishedAt: new Date(),
            progress: JSON.stringify({ stage: 'failed', percent: 100 }),
          });
        return;
      }
      await trx('jobs')
        .where({ id })
        .update({
          state: 'succeeded',
          file: null,
          result: JSON.stringify(outcome.result),
          resultFile: outcome.file?.bytes ?? null,
          resultFileName: outcome.file?.name ?? null,
          finishedAt: new Date(),
          progress: JSON.stringify({ stage: 'done', percent: 100 }),
        });
    });
  } catch (err) {
    if (err instanceof JobBusyError || err instanceof JobAbandonedError) throw err;
    deps.logger?.error({ err, jobId: id, attempt: delivery.retryCount }, 'job failed');
    if (delivery.retryCount >= delivery.retryLimit) {
      // No delivery is left: say so rather than leave the job "running" for ever.
      await knex('jobs')
        .where({ id })
        .whereIn('state', ['queued', 'running'])
        .update({
          state: 'failed',
          file: null,
          finishedAt: new Date(),
          error: JSON.stringify(problemOf('job-failed', 'The job could not be finished; start it again.')),
        })
        .catch(() => undefined);
    }
    throw err;
  } finally {
    if (current) running.delete(current);
  }
}

/** Import the stored file into its campaign (the same all-or-nothing import as the direct route). */
export function importWork(): Work {
  return async (trx, job, progress) => {
    if (!job.file || !job.campaignId || !job.createdByUserId)
      throw new UnprocessableError('The import job has no file or campaign left to import.');
    const input = job.input as { fileName: string; request: ImportRequestInput };
    await progress('reading and checking rows', 20);
    const result = await importMeasurements(
      trx,
      { projectId: job.projectId, actorUserId: job.createdByUserId },
      job.campaignId,
      { name: input.fileName, buffer: job.file },
      input.request,
    );
    await progress('saving', 90);
    return { result: { ...result } };
  };
}

/** Build the campaign's spreadsheet report and keep it on the job for download. */
export function reportWork(deps: RunnerDeps): Work {
  return async (trx, job, progress) => {
    if (!job.campaignId) throw new UnprocessableError('The campaign of this report no longer exists.');
    await progress('reading the campaign', 20);
    const data = await loadCampaignReportData(
      trx,
      job.projectId,
      job.campaignId,
      job.createdByUserId ? { userId: job.createdByUserId } : {},
    );
    await progress('building the workbook', 50);
    // The same report as the direct download: one model, charts rendered off the event loop.
    const bytes = await xlsxOf(await prepareReport(data, { appVersion: deps.version, generatedAt: new Date(), exportedBy: null }));
    const name = reportFileName(data.campaign.title);
    return { result: { fileName: name, bytes: bytes.length, href: `/api/v1/jobs/${job.id}/file` }, file: { name, bytes } };
  };
}

/**
 * E-mail the report to the person who asked, built in the background: the same message and attachments as the
 * direct "e-mail the report" route (sendCampaignReport), so the two never differ.
 */
export function reportEmailWork(deps: RunnerDeps): Work {
  return async (trx, job, progress) => {
    if (!job.campaignId) throw new UnprocessableError('The campaign of this report no longer exists.');
    const user = job.createdByUserId
      ? await trx('users').where({ id: job.createdByUserId }).first('id', 'email', 'displayName', 'login')
      : null;
    if (!user?.email) throw new UnprocessableError('Your account has no e-mail address to send the report to.');
    await progress('building and sending the report', 40);
    const sent = await sendCampaignReport(trx, deps.mailer, {
      projectId: job.projectId,
      campaignId: job.campaignId,
      request: { recipients: [user.id], attach: ['xlsx', 'pdf'] },
      meta: { appVersion: deps.version, generatedAt: new Date(), exportedBy: user.displayName ?? user.login },
      userId: user.id,
    });
    return { result: { sentTo: user.email, attachments: sent.attachments } };
  };
}

export function jobHandlers(deps: RunnerDeps): Record<JobKind, JobHandler> {
  const works: Record<JobKind, Work> = { import: importWork(), report: reportWork(deps), 'report-email': reportEmailWork(deps) };
  const handler =
    (kind: JobKind): JobHandler =>
    (delivery) =>
      runOnce(deps, delivery, works[kind]);
  return { import: handler('import'), report: handler('report'), 'report-email': handler('report-email') };
}
