import { Router, type Request, type RequestHandler } from 'express';
import type { Knex } from 'knex';
import { z } from 'zod';
import { BadRequestError } from '../../lib/errors';
import { parseBody } from '../../lib/validation';
import { authorizeProject } from '../projects/policy';
import { importUpload, jsonField, uploadedFile } from '../imports/upload';
import { historyCsv, readHistory } from '../audit/history';
import { importTemplateCsv, listImportFiles } from '../imports/files';
import { importMeasurements, storedRowKeys } from '../imports/service';
import { previewInPool } from '../imports/parse-pool';
import { serialisedCampaignAnalysis } from './analysis';
import { listCampaignForecasts, saveCampaignForecast } from './analysis-forecasts';
import { analysisQuerySchema } from './analysis-schemas';
import { reportFileName } from './report';
import {
  forecastCsv,
  loadCampaignReportData,
  measurementsCsv,
  pdfOf,
  prepareReport,
  reportMailSchema,
  reportQuerySchema,
  sendCampaignReport,
  xlsxOf,
} from './report-service';
import { buildReportModel, type ReportMeta } from './report-model';
import type { Mailer } from '../mail/mailer';
import { limiter } from '../auth/setup';
import type { JobQueue } from '../jobs/queue';
import { jobView } from '../jobs/routes';
import { actorOf, deleteVersion, etag, safeFileName, sendDownload, sendSerialised, withVersion } from './route-helpers';
import {
  campaignUpdateSchema,
  importPreviewRequestSchema,
  campaignReopenSchema,
  campaignSignOffSchema,
  importRequestSchema,
  measurementCreateSchema,
  measurementBatchUpdateSchema,
  savedForecastCreateSchema,
} from './schemas';
import {
  MAX_BATCH_MEASUREMENTS,
  createMeasurement,
  createMeasurementsBatch,
  deleteCampaign,
  getCampaign,
  serialisedMeasurementList,
  reopenCampaign,
  signOffCampaign,
  signOffOf,
  resolveCampaignProjectId,
  updateCampaign,
  updateMeasurementsBatch,
} from './service';

export const batchSchema = z.strictObject({
  measurements: z
    .array(measurementCreateSchema, { error: 'measurements must be a list' })
    .min(1, 'give at least one measurement')
    .max(MAX_BATCH_MEASUREMENTS, `at most ${MAX_BATCH_MEASUREMENTS} measurements per request`),
});

/** Kept here for the OpenAPI registrar, which names it with the routes that read it. */
export { versionQuerySchema } from './route-helpers';

export const historyQuerySchema = z.object({
  limit: z.coerce
    .number({ error: 'limit must be a number' })
    .int('limit must be an integer')
    .min(1, 'limit must be at least 1')
    .max(200, 'limit must be at most 200')
    .default(50),
  before: z.coerce
    .number({ error: 'before must be a number' })
    .int('before must be an integer')
    .min(1, 'before must be at least 1')
    .optional(),
});

/** Report e-mails a user may send per window (each may carry several recipients). */
export const REPORT_MAIL_LIMIT = { windowMs: 15 * 60_000, limit: 10 };

/**
 * One campaign and what hangs off it (its measurements list and batch writes, imports, history,
 * analysis, saved forecasts, reports), mounted at /v1/campaigns. The views reached through a
 * project are in project-routes.ts; one measurement, one saved forecast and one import file by id
 * have their own routers (measurement-routes.ts, forecast-routes.ts, imports/file-routes.ts).
 * Each route names its minimum role once; routes reached through a campaign id resolve its project
 * first (unknown ids are 404 for everyone).
 */
export function campaignsRouter(deps: {
  knex: Knex;
  version: string;
  jobs: JobQueue;
  uploadLimit: RequestHandler;
  importJobBytes: number;
  mailer?: Mailer;
  reportMailLimit?: number;
}): Router {
  const { knex, jobs, uploadLimit } = deps;
  const meta = (req: Request): ReportMeta => ({
    appVersion: deps.version,
    generatedAt: new Date(),
    exportedBy: req.user ? (req.user.displayName ?? req.user.login) : null,
  });
  const reportOf = async (req: Request) => {
    const { at } = parseBody(reportQuerySchema, req.query);
    const data = await loadCampaignReportData(knex, req.project!.id, campaignId(req), {
      ...(at === undefined ? {} : { atC: at }),
      userId: req.user!.id,
    });
    return prepareReport(data, meta(req));
  };
  const mailLimit = limiter(REPORT_MAIL_LIMIT.windowMs, deps.reportMailLimit ?? REPORT_MAIL_LIMIT.limit, 'report e-mail', true);
  const router = Router();
  const byCampaign = (role: 'viewer' | 'editor') =>
    authorizeProject(knex, role, (req) => resolveCampaignProjectId(knex, req.params.campaignId));
  const campaignId = (req: Request) => String(req.params.campaignId);

  router.get('/:campaignId', byCampaign('viewer'), async (req, res) => {
    const campaign = await getCampaign(knex, req.project!.id, campaignId(req));
    // The body carries the caller's role, which the version ETag does not capture: never let a
    // browser answer a second account from its cache (304 on If-None-Match).
    res
      .set({ ETag: etag(campaign.version), 'Cache-Control': 'private, no-store', Vary: 'Cookie, Authorization' })
      .json({ ...campaign.toJSON(), projectId: req.project!.id, role: req.project!.role, signOff: await signOffOf(knex, campaign) });
  });

  router.post('/:campaignId/sign-off', byCampaign('editor'), async (req, res) => {
    const campaign = await signOffCampaign(knex, actorOf(req), campaignId(req), parseBody(campaignSignOffSchema, req.body ?? {}));
    res.set('ETag', etag(campaign.version)).json({ ...campaign.toJSON(), signOff: await signOffOf(knex, campaign) });
  });

  router.post('/:campaignId/reopen', byCampaign('editor'), async (req, res) => {
    const campaign = await reopenCampaign(knex, actorOf(req), campaignId(req), parseBody(campaignReopenSchema, req.body));
    res.set('ETag', etag(campaign.version)).json({ ...campaign.toJSON(), signOff: null });
  });

  router.patch('/:campaignId', byCampaign('editor'), async (req, res) => {
    const campaign = await updateCampaign(knex, actorOf(req), campaignId(req), parseBody(campaignUpdateSchema, withVersion(req)));
    res.set('ETag', etag(campaign.version)).json(campaign);
  });

  router.delete('/:campaignId', byCampaign('editor'), async (req, res) => {
    await deleteCampaign(knex, actorOf(req), campaignId(req), deleteVersion(req));
    res.status(204).end();
  });

  router.get('/:campaignId/measurements', byCampaign('viewer'), async (req, res) => {
    await sendSerialised(req, res, await serialisedMeasurementList(knex, req.project!.id, campaignId(req)));
  });

  router.post('/:campaignId/measurements', byCampaign('editor'), async (req, res) => {
    const measurement = await createMeasurement(knex, actorOf(req), campaignId(req), parseBody(measurementCreateSchema, req.body));
    res.status(201).location(`/api/v1/measurements/${measurement.id}`).json(measurement);
  });

  router.post('/:campaignId/measurements/batch', byCampaign('editor'), async (req, res) => {
    const { measurements } = parseBody(batchSchema, req.body);
    res.status(201).json({ created: await createMeasurementsBatch(knex, actorOf(req), campaignId(req), measurements) });
  });

  router.patch('/:campaignId/measurements', byCampaign('editor'), async (req, res) => {
    const { measurements } = parseBody(measurementBatchUpdateSchema, req.body);
    res.json({ measurements: await updateMeasurementsBatch(knex, actorOf(req), campaignId(req), measurements) });
  });

  // Authorization runs before the upload is read, so a caller without the role never streams a file in.
  router.post('/:campaignId/imports/preview', byCampaign('editor'), uploadLimit, importUpload(), async (req, res) => {
    await getCampaign(knex, req.project!.id, campaignId(req));
    // Read and checked in a worker thread (a large file never holds the event loop); the stored runs' keys go with it
    // so the preview can warn about repeats.
    const stored = await storedRowKeys(knex, campaignId(req));
    res.json(await previewInPool(uploadedFile(req), jsonField(req, 'request', importPreviewRequestSchema), undefined, stored));
  });

  router.post('/:campaignId/imports', byCampaign('editor'), uploadLimit, importUpload(), async (req, res) => {
    const request = jsonField(req, 'request', importRequestSchema);
    const file = uploadedFile(req);
    if (file.buffer.length > deps.importJobBytes) {
      // A large file becomes a background job: 202 with the job to poll (its result is this route's 201 body).
      await getCampaign(knex, req.project!.id, campaignId(req));
      const job = await jobs.enqueue({
        kind: 'import',
        projectId: req.project!.id,
        campaignId: campaignId(req),
        userId: req.user!.id,
        input: { fileName: file.name, request },
        file: file.buffer,
      });
      res
        .status(202)
        .location(`/api/v1/jobs/${job.id}`)
        .json({ job: jobView(job) });
      return;
    }
    res.status(201).json(await importMeasurements(knex, actorOf(req), campaignId(req), file, request));
  });

  router.get('/:campaignId/imports/template.csv', byCampaign('viewer'), async (req, res) => {
    const campaign = await getCampaign(knex, req.project!.id, campaignId(req));
    sendDownload(res, 'csv', `${safeFileName(campaign.title)}-template.csv`, importTemplateCsv(campaign.measure));
  });

  router.get('/:campaignId/files', byCampaign('viewer'), async (req, res) => {
    await getCampaign(knex, req.project!.id, campaignId(req));
    res.json({ files: await listImportFiles(knex, campaignId(req)) });
  });

  router.get('/:campaignId/history', byCampaign('viewer'), async (req, res) => {
    await getCampaign(knex, req.project!.id, campaignId(req));
    res
      .set('Cache-Control', 'private, no-store')
      .json(await readHistory(knex, { projectId: req.project!.id, campaignId: campaignId(req) }, parseBody(historyQuerySchema, req.query)));
  });

  router.get('/:campaignId/history.csv', byCampaign('viewer'), async (req, res) => {
    const campaign = await getCampaign(knex, req.project!.id, campaignId(req));
    const csv = await historyCsv(knex, { projectId: req.project!.id, campaignId: campaign.id });
    sendDownload(res, 'csv', `${safeFileName(campaign.title)}-history.csv`, csv);
  });

  router.get('/:campaignId/analysis', byCampaign('viewer'), async (req, res) => {
    await sendSerialised(
      req,
      res,
      await serialisedCampaignAnalysis(knex, req.project!.id, campaignId(req), parseBody(analysisQuerySchema, req.query)),
    );
  });

  router.get('/:campaignId/forecasts', byCampaign('viewer'), async (req, res) => {
    res.json({ forecasts: await listCampaignForecasts(knex, req.project!.id, campaignId(req)) });
  });

  router.post('/:campaignId/forecasts', byCampaign('editor'), async (req, res) => {
    const input = parseBody(savedForecastCreateSchema, req.body);
    const { weighting, uncertaintyScale, confidence, newRunUncertainty, quantitationLimit } = parseBody(analysisQuerySchema, req.query);
    const view = await saveCampaignForecast(knex, actorOf(req), campaignId(req), input, {
      weighting,
      uncertaintyScale,
      confidence,
      ...(newRunUncertainty === undefined ? {} : { newRunUncertainty }),
      ...(quantitationLimit === undefined ? {} : { quantitationLimitValue: quantitationLimit }),
    });
    res.status(201).json(view);
  });

  // The report built in the background (202 and a job; the file at /jobs/:id/file) or e-mailed to the caller.
  for (const [path, kind] of [
    ['/:campaignId/report-jobs', 'report'],
    ['/:campaignId/report-emails', 'report-email'],
  ] as const) {
    router.post(path, byCampaign('viewer'), uploadLimit, async (req, res) => {
      await getCampaign(knex, req.project!.id, campaignId(req));
      const job = await jobs.enqueue({ kind, projectId: req.project!.id, campaignId: campaignId(req), userId: req.user!.id });
      res
        .status(202)
        .location(`/api/v1/jobs/${job.id}`)
        .json({ job: jobView(job) });
    });
  }

  router.get('/:campaignId/report.xlsx', byCampaign('viewer'), async (req, res) => {
    const report = await reportOf(req);
    sendDownload(res, 'xlsx', reportFileName(report.model.data.campaign.title), await xlsxOf(report));
  });

  router.get('/:campaignId/report.pdf', byCampaign('viewer'), async (req, res) => {
    const report = await reportOf(req);
    sendDownload(res, 'pdf', reportFileName(report.model.data.campaign.title, 'summary.pdf'), await pdfOf(report));
  });

  router.get('/:campaignId/measurements.csv', byCampaign('viewer'), async (req, res) => {
    const data = await loadCampaignReportData(knex, req.project!.id, campaignId(req));
    const model = buildReportModel(data, meta(req));
    sendDownload(res, 'csv', reportFileName(data.campaign.title, 'measurements.csv'), measurementsCsv(model));
  });

  router.get('/:campaignId/forecast.csv', byCampaign('viewer'), async (req, res) => {
    const { at } = parseBody(reportQuerySchema, req.query);
    const data = await loadCampaignReportData(knex, req.project!.id, campaignId(req), at === undefined ? {} : { atC: at });
    const model = buildReportModel(data, meta(req));
    sendDownload(res, 'csv', reportFileName(data.campaign.title, 'forecast.csv'), forecastCsv(model));
  });

  router.post('/:campaignId/report/email', byCampaign('viewer'), mailLimit, async (req, res) => {
    const request = parseBody(reportMailSchema, req.body);
    if (!deps.mailer) throw new BadRequestError('This server has no mail transport configured.');
    const sent = await sendCampaignReport(knex, deps.mailer, {
      projectId: req.project!.id,
      campaignId: campaignId(req),
      request,
      meta: meta(req),
      userId: req.user!.id,
    });
    res.status(200).json(sent);
  });

  return router;
}
