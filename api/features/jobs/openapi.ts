import { z } from 'zod';
import type { OpenApiRegistrar } from '../../lib/openapi';
import { problemResponses } from '../../lib/openapi';

const signedIn: Record<string, string[]>[] = [{ session: [] }, { bearer: [] }];

/** A background job as GET /api/v1/jobs/{jobId} answers it (see `jobView`). */
export const jobViewSchema = z.object({
  id: z.string().uuid(),
  kind: z.enum(['import', 'report', 'report-email']),
  state: z.enum(['queued', 'running', 'succeeded', 'failed']),
  progress: z.object({ stage: z.string(), percent: z.number().min(0).max(100) }),
  projectId: z.string().uuid(),
  campaignId: z.string().uuid().nullable(),
  result: z
    .record(z.string(), z.unknown())
    .nullable()
    .meta({ description: "The work's answer: an import's 201 body; a report's fileName, bytes and href." }),
  error: z
    .record(z.string(), z.unknown())
    .nullable()
    .meta({ description: 'Problem details (RFC 9457) of a failed job, as the direct route would answer.' }),
  attempts: z.number().int(),
  createdAt: z.string(),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
  href: z.string(),
});

const queued = {
  description: 'Queued; poll the job at the Location header',
  content: { 'application/json': { schema: z.object({ job: jobViewSchema }) } },
};

/** Background jobs: queueing a report build or report e-mail, polling any job, downloading what it built. */
export const registerJobs: OpenApiRegistrar = (registry) => {
  const campaignIdParams = z.object({ campaignId: z.string().uuid() });
  const jobIdParams = z.object({ jobId: z.string().uuid() });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/report-jobs',
    tags: ['Jobs'],
    summary: 'Build the spreadsheet report in the background',
    security: signedIn,
    request: { params: campaignIdParams },
    responses: { 202: queued, ...problemResponses(401, 404, 429) },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/report-emails',
    tags: ['Jobs'],
    summary: 'Build the report and e-mail its link to the caller',
    security: signedIn,
    request: { params: campaignIdParams },
    responses: { 202: queued, ...problemResponses(401, 404, 429) },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/jobs/{jobId}',
    tags: ['Jobs'],
    summary: 'State, progress and outcome of a background job (members of its project)',
    description: "Imports of files above the size limit answer 202 with a job too; its result is the import route's 201 body.",
    security: signedIn,
    request: { params: jobIdParams },
    responses: {
      200: { description: 'The job', content: { 'application/json': { schema: jobViewSchema } } },
      ...problemResponses(401, 404),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/jobs/{jobId}/file',
    tags: ['Jobs'],
    summary: 'The workbook a report job built',
    security: signedIn,
    request: { params: jobIdParams },
    responses: {
      200: {
        description: 'An .xlsx workbook',
        content: { 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet': { schema: z.string().meta({ format: 'binary' }) } },
      },
      ...problemResponses(401, 404),
    },
  });
};
