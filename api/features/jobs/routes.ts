import { Router } from 'express';
import type { Knex } from 'knex';
import { NotFoundError } from '../../lib/errors';
import { authorizeProject } from '../projects/policy';
import { uuidSchema } from '../projects/schemas';
import { JOB_COLUMNS, type JobRow } from './queue';

/** The project a job belongs to, or null (unknown or malformed id: 404 for everyone). */
export async function resolveJobProjectId(knex: Knex, jobId: unknown): Promise<string | null> {
  if (!uuidSchema.safeParse(jobId).success) return null;
  const row = await knex('jobs')
    .where({ id: String(jobId) })
    .first('projectId');
  return row?.projectId ?? null;
}

/** A job as the client polls it. */
export function jobView(row: JobRow) {
  return {
    id: row.id,
    kind: row.kind,
    state: row.state,
    progress: row.progress,
    projectId: row.projectId,
    campaignId: row.campaignId,
    result: row.result,
    /** Problem details (RFC 9457) when the job failed, as the direct route would have answered. */
    error: row.error,
    attempts: row.attempts,
    createdAt: row.createdAt,
    startedAt: row.startedAt,
    finishedAt: row.finishedAt,
    href: `/api/v1/jobs/${row.id}`,
  };
}

export type JobView = ReturnType<typeof jobView>;

/** Polling a job and downloading what it built (mounted at /api/v1/jobs); any member of its project may. */
export function jobsRouter(deps: { knex: Knex }): Router {
  const { knex } = deps;
  const router = Router();
  const byJob = authorizeProject(knex, 'viewer', (req) => resolveJobProjectId(knex, req.params.jobId));

  router.get('/:jobId', byJob, async (req, res) => {
    const row = (await knex('jobs')
      .where({ id: String(req.params.jobId) })
      .first(JOB_COLUMNS)) as JobRow;
    // Polled while it changes: never from a cache.
    res.set('Cache-Control', 'no-store').json(jobView(row));
  });

  router.get('/:jobId/file', byJob, async (req, res) => {
    const row = await knex('jobs')
      .where({ id: String(req.params.jobId) })
      .first('state', 'resultFile', 'resultFileName');
    if (!row?.resultFile)
      throw new NotFoundError(
        row?.state === 'succeeded' ? 'This job made no file.' : 'The file is not ready yet; poll the job until it has succeeded.',
      );
    res
      .status(200)
      .type('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet')
      .attachment(row.resultFileName ?? 'report.xlsx')
      .set('Cache-Control', 'no-store')
      .send(row.resultFile);
  });

  return router;
}
