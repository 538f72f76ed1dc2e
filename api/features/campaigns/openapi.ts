import { z } from 'zod';
import type { OpenApiRegistrar } from '../../lib/openapi';
import { problemResponses } from '../../lib/openapi';
import {
  analysisQuerySchema,
  analysisResponseSchema,
  comparisonQuerySchema,
  comparisonResponseSchema,
  savedForecastListSchema,
  savedForecastViewSchema,
} from './analysis-schemas';
import { reportMailSchema } from './report-service';
import {
  ASSAY_METHODS,
  CAMPAIGN_STATUSES,
  SELECTIVITY_MEASURES,
  campaignCreateSchema,
  campaignReopenSchema,
  campaignSignOffSchema,
  campaignUpdateSchema,
  importPreviewRequestSchema,
  importRequestSchema,
  measurementBatchUpdateSchema,
  measurementCreateSchema,
  measurementDeleteQuerySchema,
  measurementExclusionSchema,
  measurementUpdateSchema,
  savedForecastCreateSchema,
} from './schemas';
import { batchSchema, historyQuerySchema, versionQuerySchema } from './routes';
import { jobViewSchema } from '../jobs/openapi';
import { idParams, security } from '../../lib/openapi';
import { projectRoleSchema } from '../projects/schemas';

/** A campaign as the API answers it (the stored row). */
const campaignView = z
  .object({
    id: z.string().uuid(),
    projectId: z.string().uuid(),
    title: z.string(),
    reactionDescription: z.string().nullable(),
    productNameA: z.string(),
    productNameB: z.string(),
    measure: z.enum(SELECTIVITY_MEASURES),
    assayMethod: z.enum(ASSAY_METHODS),
    defaultUncertainty: z.number().nullable(),
    newRunUncertainty: z.number().nullable(),
    quantitationLimit: z.number().nullable(),
    status: z.enum(CAMPAIGN_STATUSES),
    notes: z.string().nullable(),
    version: z.number().int().meta({ description: 'Send it back with the next change (body or If-Match: W/"<version>")' }),
    createdByUserId: z.string().uuid().nullable(),
    signedOffAt: z.string().nullable(),
    signedOffByUserId: z.string().uuid().nullable(),
    signOffNote: z.string().nullable(),
    createdAt: z.string(),
    updatedAt: z.string(),
  })
  .meta({ id: 'Campaign' });

const signOffView = z
  .object({ at: z.string(), by: z.string(), byUserId: z.string().uuid().nullable(), note: z.string().nullable() })
  .nullable()
  .meta({ id: 'SignOff' });

const campaignWithSignOff = campaignView.extend({ signOff: signOffView });

/** A stored run (temperatures in K; the value in the measure's own terms). */
const measurementView = z
  .object({
    id: z.string().uuid(),
    campaignId: z.string().uuid(),
    temperatureK: z.number(),
    measure: z.enum(SELECTIVITY_MEASURES),
    value: z.number(),
    valueB: z.number().nullable().meta({ description: 'The second figure of a ratio a:b' }),
    isLowerBound: z.boolean().meta({ description: 'Reported as "at least" (e.g. ≥ 99.8 % ee): a censored bound in fits' }),
    uncertainty: z.number().nullable(),
    replicateLabel: z.string().nullable(),
    sampleId: z.string().nullable(),
    conversionPercent: z.number().nullable(),
    reactionTimeS: z.number().nullable(),
    excluded: z.boolean(),
    excludedReason: z.string().nullable(),
    notes: z.string().nullable(),
    sourceRow: z.number().int().nullable(),
    importFileId: z.string().uuid().nullable(),
    version: z.number().int(),
    createdByUserId: z.string().uuid().nullable(),
    createdAt: z.string(),
    updatedAt: z.string(),
  })
  .meta({ id: 'Measurement' });

const historyPage = z.object({
  entries: z.array(
    z.object({
      id: z.number().int().meta({ description: 'Cursor for `before`' }),
      at: z.string(),
      who: z.string(),
      sentence: z.string().meta({ description: 'The whole change in one sentence, reason included' }),
      reason: z.string().nullable(),
    }),
  ),
  nextBefore: z.number().int().nullable(),
});

const importFileView = z.object({
  id: z.string().uuid(),
  fileName: z.string(),
  mediaType: z.string(),
  format: z.string(),
  sizeBytes: z.number().int(),
  sha256: z.string(),
  rowCount: z.number().int(),
  storedRowCount: z.number().int().meta({ description: 'Rows of this file still stored in the campaign' }),
  uploadedAt: z.string(),
  uploadedBy: z.string(),
});

const importIssue = z.object({
  severity: z.enum(['error', 'warning']),
  row: z.number().int().nullable(),
  column: z.string().nullable(),
  message: z.string(),
});

const importPreview = z.object({
  file: z
    .record(z.string(), z.unknown())
    .meta({ description: 'How the file was read: name, format, encoding, delimiter, header row, sheets' }),
  columns: z.array(z.record(z.string(), z.unknown())),
  suggestedMapping: z.record(z.string(), z.unknown()).meta({ description: 'What the headers suggest' }),
  mapping: z.record(z.string(), z.unknown()).nullable().meta({ description: 'The mapping the rows were checked with' }),
  rowCount: z.number().int(),
  validRowCount: z.number().int(),
  errorCount: z.number().int(),
  warningCount: z.number().int(),
  issues: z.array(importIssue),
  rows: z.array(z.record(z.string(), z.unknown())).meta({ description: 'The first rows as they would be stored (temperatures in K)' }),
});

const importResult = z.object({
  campaignId: z.string().uuid(),
  inserted: z.number().int(),
  temperatureRangeK: z.object({ min: z.number(), max: z.number() }),
  distinctTemperatures: z.number().int(),
  warningCount: z.number().int(),
  file: z.object({ id: z.string().uuid(), name: z.string(), sizeBytes: z.number().int(), sha256: z.string() }),
});

/** A multipart upload: the file, and the options as JSON in the `request` field. */
const upload = (request: z.ZodType) => ({
  'multipart/form-data': {
    schema: z.object({ file: z.string().meta({ format: 'binary', description: 'CSV, TSV, TXT or XLSX' }), request }),
    encoding: { request: { contentType: 'application/json' } },
  },
});

const campaignIdParams = z.object({ campaignId: z.string().uuid() });
const signedIn: Record<string, string[]>[] = [{ session: [] }, { bearer: [] }];

/** Campaign routes in the API description; the analysis and forecast routes with their full schemas. */
export const registerCampaigns: OpenApiRegistrar = (registry) => {
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/analysis',
    tags: ['Campaigns'],
    summary: "Fit a stored campaign's temperature screen",
    description:
      'The same fit as POST /api/v1/fit over the stored runs: excluded runs are kept with their reasons but not fitted, runs reported as "at least" are censored bounds, runs without an uncertainty use the campaign default (for weighting=uncertainty). `curve` holds 60 temperatures evenly spaced in 1/T over the measured range ± 15 K; `at` the prediction at ?at= (°C). Needs viewer. The answer carries a weak ETag that changes with the campaign, any of its runs or the query; send it back in If-None-Match for a 304 without a body.',
    security: signedIn,
    request: { params: campaignIdParams, query: analysisQuerySchema },
    responses: {
      200: {
        description: 'The analysis (fit is null with a problem when the runs cannot be fitted)',
        content: { 'application/json': { schema: analysisResponseSchema } },
      },
      304: { description: 'Unchanged since the ETag sent in If-None-Match' },
      ...problemResponses(400, 401, 404),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/forecasts',
    tags: ['Campaigns'],
    summary: 'Saved forecasts, each compared with runs measured within ±1 K since',
    security: signedIn,
    request: { params: campaignIdParams },
    responses: {
      200: { description: 'Newest first', content: { 'application/json': { schema: savedForecastListSchema } } },
      ...problemResponses(401, 404),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/forecasts',
    tags: ['Campaigns'],
    summary: 'Save a forecast computed by the server from the stored runs',
    description:
      'The prediction is computed here from the data as stored now (optional query weighting, uncertaintyScale, confidence as for the analysis) and kept as a snapshot with who saved it and when. Needs editor.',
    security: signedIn,
    request: { params: campaignIdParams, body: { content: { 'application/json': { schema: savedForecastCreateSchema } } } },
    responses: {
      201: { description: 'The saved forecast', content: { 'application/json': { schema: savedForecastViewSchema } } },
      ...problemResponses(400, 401, 403, 404, 422),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/projects/{projectId}/comparison',
    tags: ['Campaigns'],
    summary: "A project's campaigns side by side at one temperature",
    security: signedIn,
    request: { params: z.object({ projectId: z.string().uuid() }), query: comparisonQuerySchema },
    responses: {
      200: { description: 'One entry per campaign', content: { 'application/json': { schema: comparisonResponseSchema } } },
      ...problemResponses(400, 401, 404),
    },
  });
  const reportQuery = z.object({
    at: z.number().optional().meta({ description: 'Temperature (°C) to forecast at; omitted → the newest saved forecast' }),
  });
  const binary = z.string().meta({ format: 'binary' });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/report.xlsx',
    tags: ['Campaigns'],
    summary: 'Workbook: Summary (one printed page), Charts, Measurements, Fit, Forecast (every 5 °C plus saved forecasts)',
    description:
      'Numbers stay numbers with formats from the assay precision; key results carry defined names (ddH_kJ_per_mol, ddS_J_per_mol_K, Forecast_ratio, Runs_fitted, …). Needs viewer.',
    security: signedIn,
    request: { params: campaignIdParams, query: reportQuery },
    responses: {
      200: {
        description: 'An .xlsx workbook',
        content: { 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet': { schema: binary } },
      },
      ...problemResponses(400, 401, 404),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/report.pdf',
    tags: ['Campaigns'],
    summary: "The workbook's summary and charts as a PDF",
    security: signedIn,
    request: { params: campaignIdParams, query: reportQuery },
    responses: { 200: { description: 'A PDF', content: { 'application/pdf': { schema: binary } } }, ...problemResponses(400, 401, 404) },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/measurements.csv',
    tags: ['Campaigns'],
    summary: 'The stored runs with ln r, the campaign measure and status as CSV (UTF-8 with BOM)',
    security: signedIn,
    request: { params: campaignIdParams },
    responses: { 200: { description: 'CSV', content: { 'text/csv': { schema: z.string() } } }, ...problemResponses(401, 404) },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/forecast.csv',
    tags: ['Campaigns'],
    summary: 'Forecast every 5 °C over the screened range, plus saved forecasts and ?at=, as CSV',
    security: signedIn,
    request: { params: campaignIdParams, query: reportQuery },
    responses: { 200: { description: 'CSV', content: { 'text/csv': { schema: z.string() } } }, ...problemResponses(400, 401, 404) },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/report/email',
    tags: ['Campaigns'],
    summary: 'E-mail the workbook and/or PDF to chosen project members (viewers may send; rate limited per user)',
    security: signedIn,
    request: { params: campaignIdParams, body: { content: { 'application/json': { schema: reportMailSchema } } } },
    responses: {
      200: {
        description: 'Sent',
        content: {
          'application/json': {
            schema: z.object({ sentTo: z.array(z.object({ userId: z.string(), email: z.string() })), attachments: z.array(z.string()) }),
          },
        },
      },
      ...problemResponses(400, 401, 403, 404, 429),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/projects/{projectId}/campaigns',
    tags: ['Campaigns'],
    summary: 'Create a campaign',
    security: signedIn,
    request: {
      params: z.object({ projectId: z.string().uuid() }),
      body: { content: { 'application/json': { schema: campaignCreateSchema } } },
    },
    responses: {
      201: { description: 'The campaign', content: { 'application/json': { schema: campaignView } } },
      ...problemResponses(400, 401, 403, 404, 409),
    },
  });
  registry.registerPath({
    method: 'patch',
    path: '/api/v1/campaigns/{campaignId}',
    tags: ['Campaigns'],
    summary: 'Change a campaign (version in the body or If-Match: W/"<version>")',
    security: signedIn,
    request: { params: campaignIdParams, body: { content: { 'application/json': { schema: campaignUpdateSchema } } } },
    responses: {
      200: { description: 'The campaign', content: { 'application/json': { schema: campaignView } } },
      ...problemResponses(400, 401, 403, 404, 409, 412),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/measurements',
    tags: ['Campaigns'],
    summary: 'Add one run',
    security: signedIn,
    request: { params: campaignIdParams, body: { content: { 'application/json': { schema: measurementCreateSchema } } } },
    responses: {
      201: { description: 'The measurement', content: { 'application/json': { schema: measurementView } } },
      ...problemResponses(400, 401, 403, 404, 409),
    },
  });
  registry.registerPath({
    method: 'patch',
    path: '/api/v1/campaigns/{campaignId}/measurements',
    tags: ['Campaigns'],
    summary: 'Change several stored runs at once: each row names its id, version and reason; all are saved or none',
    description:
      'A row read at an older version makes the whole change a 409 listing every stale row in `staleRows` ({ path, id, sentVersion, currentVersion }). Refused with 409 while the campaign is signed off. Each changed run is recorded in the history with its own reason.',
    security: signedIn,
    request: { params: campaignIdParams, body: { content: { 'application/json': { schema: measurementBatchUpdateSchema } } } },
    responses: { 200: { description: 'The changed measurements, in the order sent' }, ...problemResponses(400, 401, 403, 404, 409) },
  });
  registry.registerPath({
    method: 'patch',
    path: '/api/v1/measurements/{measurementId}',
    tags: ['Campaigns'],
    summary: 'Change a stored run; `reason` is required and kept in the history',
    description: 'Refused with 409 while the campaign is signed off.',
    security: signedIn,
    request: {
      params: z.object({ measurementId: z.string().uuid() }),
      body: { content: { 'application/json': { schema: measurementUpdateSchema } } },
    },
    responses: {
      200: { description: 'The measurement', content: { 'application/json': { schema: measurementView } } },
      ...problemResponses(400, 401, 403, 404, 409, 412),
    },
  });
  registry.registerPath({
    method: 'delete',
    path: '/api/v1/measurements/{measurementId}',
    tags: ['Campaigns'],
    summary: 'Delete a stored run (?version=N&reason=…; the reason is kept in the history)',
    security: signedIn,
    request: { params: z.object({ measurementId: z.string().uuid() }), query: measurementDeleteQuerySchema },
    responses: { 204: { description: 'Deleted' }, ...problemResponses(400, 401, 403, 404, 409) },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/sign-off',
    tags: ['Campaigns'],
    summary: 'Sign a campaign off; its measurements are locked until reopened',
    description:
      'The person signing must be an owner or editor other than the last person who changed the campaign or its runs (409 otherwise). Needs editor.',
    security: signedIn,
    request: { params: campaignIdParams, body: { content: { 'application/json': { schema: campaignSignOffSchema } } } },
    responses: {
      200: {
        description: 'The campaign with `signOff` (who, when, note)',
        content: { 'application/json': { schema: campaignWithSignOff } },
      },
      ...problemResponses(400, 401, 403, 404, 409),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/reopen',
    tags: ['Campaigns'],
    summary: 'Reopen a signed-off campaign, giving a reason',
    security: signedIn,
    request: { params: campaignIdParams, body: { content: { 'application/json': { schema: campaignReopenSchema } } } },
    responses: {
      200: { description: 'The campaign, signOff null', content: { 'application/json': { schema: campaignWithSignOff } } },
      ...problemResponses(400, 401, 403, 404, 409),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/history',
    tags: ['Campaigns'],
    summary: "A campaign's history as sentences (who, when, what changed from what to what, why), newest first",
    description: 'Pages of `limit` (≤ 200) entries before the cursor `before`; `/history.csv` exports every entry. Needs viewer.',
    security: signedIn,
    request: { params: campaignIdParams, query: historyQuerySchema },
    responses: {
      200: { description: 'A page of entries', content: { 'application/json': { schema: historyPage } } },
      ...problemResponses(400, 401, 404),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/files',
    tags: ['Campaigns'],
    summary: 'Files uploaded into the campaign, kept as they arrived (name, size, SHA-256, uploader, time, rows)',
    description: 'Download one from /api/v1/import-files/{fileId}. Needs viewer.',
    security: signedIn,
    request: { params: campaignIdParams },
    responses: {
      200: { description: 'Newest first', content: { 'application/json': { schema: z.object({ files: z.array(importFileView) }) } } },
      ...problemResponses(401, 404),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/imports/template.csv',
    tags: ['Campaigns'],
    summary: 'A CSV template whose headers the import recognises, with invented example rows',
    security: signedIn,
    request: { params: campaignIdParams },
    responses: { 200: { description: 'CSV', content: { 'text/csv': { schema: z.string() } } }, ...problemResponses(401, 404) },
  });
  const projectParams = idParams('projectId');
  const measurementParams = idParams('measurementId');
  const csv = { description: 'CSV (UTF-8 with BOM)', content: { 'text/csv': { schema: z.string() } } };
  registry.registerPath({
    method: 'get',
    path: '/api/v1/projects/{projectId}/campaigns',
    tags: ['Campaigns'],
    summary: "A project's campaigns with run counts and temperature range, newest first",
    security: security.signedIn,
    request: { params: projectParams },
    responses: {
      200: {
        description: 'Campaigns',
        content: {
          'application/json': {
            schema: z.object({
              campaigns: z.array(
                campaignView.extend({
                  measurementCount: z.number().int(),
                  includedCount: z.number().int(),
                  distinctTemperatures: z.number().int(),
                  temperatureRangeK: z.object({ min: z.number(), max: z.number() }).nullable(),
                }),
              ),
            }),
          },
        },
      },
      ...problemResponses(401, 404),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}',
    tags: ['Campaigns'],
    summary: "One campaign with the caller's role and its sign-off (ETag: the version)",
    security: security.signedIn,
    request: { params: campaignIdParams },
    responses: {
      200: {
        description: 'The campaign',
        content: { 'application/json': { schema: campaignWithSignOff.extend({ role: projectRoleSchema }) } },
      },
      ...problemResponses(401, 404),
    },
  });
  registry.registerPath({
    method: 'delete',
    path: '/api/v1/campaigns/{campaignId}',
    tags: ['Campaigns'],
    summary: 'Delete a campaign with its runs (?version=N or If-Match: W/"<version>")',
    security: security.signedIn,
    request: { params: campaignIdParams, query: versionQuerySchema },
    responses: { 204: { description: 'Deleted' }, ...problemResponses(400, 401, 403, 404, 409, 412) },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/measurements',
    tags: ['Campaigns'],
    summary: 'The stored runs, coldest first',
    description:
      'Needs viewer. The answer carries a weak ETag that changes whenever a run is added, removed or changed; send it back in If-None-Match for a 304 without a body.',
    security: security.signedIn,
    request: { params: campaignIdParams },
    responses: {
      200: { description: 'Runs', content: { 'application/json': { schema: z.object({ measurements: z.array(measurementView) }) } } },
      304: { description: 'Unchanged since the ETag sent in If-None-Match' },
      ...problemResponses(401, 404),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/measurements/batch',
    tags: ['Campaigns'],
    summary: 'Add several runs in one transaction (all or nothing)',
    security: security.signedIn,
    request: { params: campaignIdParams, body: { content: { 'application/json': { schema: batchSchema } } } },
    responses: {
      201: { description: 'How many were stored', content: { 'application/json': { schema: z.object({ created: z.number().int() }) } } },
      ...problemResponses(400, 401, 403, 404, 409),
    },
  });
  registry.registerPath({
    method: 'put',
    path: '/api/v1/measurements/{measurementId}/exclusion',
    tags: ['Campaigns'],
    summary: 'Exclude a run from fits (with a reason) or include it again; the run is kept either way',
    security: security.signedIn,
    request: { params: measurementParams, body: { content: { 'application/json': { schema: measurementExclusionSchema } } } },
    responses: {
      200: { description: 'The measurement', content: { 'application/json': { schema: measurementView } } },
      ...problemResponses(400, 401, 403, 404, 409, 412),
    },
  });
  registry.registerPath({
    method: 'delete',
    path: '/api/v1/forecasts/{forecastId}',
    tags: ['Campaigns'],
    summary: 'Delete a saved forecast',
    security: security.signedIn,
    request: { params: idParams('forecastId') },
    responses: { 204: { description: 'Deleted' }, ...problemResponses(401, 403, 404, 409) },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/imports/preview',
    tags: ['Imports'],
    summary: 'Read an uploaded table and check its rows against a mapping, storing nothing',
    description:
      'The headers suggest a mapping when none is sent; every row is checked and the first rows are shown as they would be stored. Needs editor.',
    security: security.signedIn,
    request: { params: campaignIdParams, body: { content: upload(importPreviewRequestSchema.optional()) } },
    responses: {
      200: { description: 'The preview', content: { 'application/json': { schema: importPreview } } },
      ...problemResponses(400, 401, 403, 404, 413, 429),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/imports',
    tags: ['Imports'],
    summary: "Import an uploaded table's rows, all or nothing; the file is kept as it arrived",
    description:
      'Rows with errors reject the whole file (422 import-rejected with `issues`); unacknowledged warnings are a 422 warnings-need-confirmation. A large file becomes a background job (202; its result is the 201 body). Needs editor.',
    security: security.signedIn,
    request: { params: campaignIdParams, body: { content: upload(importRequestSchema) } },
    responses: {
      201: { description: 'Imported', content: { 'application/json': { schema: importResult } } },
      202: {
        description: 'Queued as a job; poll it at the Location header',
        content: { 'application/json': { schema: z.object({ job: jobViewSchema }) } },
      },
      ...problemResponses(400, 401, 403, 404, 409, 413, 422, 429),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/import-files/{fileId}',
    tags: ['Imports'],
    summary: 'Download an uploaded file exactly as it arrived (Content-Digest: its SHA-256)',
    security: security.signedIn,
    request: { params: idParams('fileId') },
    responses: {
      200: {
        description: 'The file, in its own media type',
        content: { 'application/octet-stream': { schema: z.string().meta({ format: 'binary' }) } },
      },
      ...problemResponses(401, 404),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/history.csv',
    tags: ['Campaigns'],
    summary: "Every entry of a campaign's history as CSV",
    security: security.signedIn,
    request: { params: campaignIdParams },
    responses: { 200: csv, ...problemResponses(401, 404) },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/projects/{projectId}/history',
    tags: ['Projects'],
    summary: "A project's history as sentences, newest first; owners only",
    security: security.signedIn,
    request: { params: projectParams, query: historyQuerySchema },
    responses: {
      200: { description: 'A page of entries', content: { 'application/json': { schema: historyPage } } },
      ...problemResponses(400, 401, 403, 404),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/projects/{projectId}/history.csv',
    tags: ['Projects'],
    summary: "Every entry of a project's history as CSV; owners only",
    security: security.signedIn,
    request: { params: projectParams },
    responses: { 200: csv, ...problemResponses(401, 403, 404) },
  });
};
