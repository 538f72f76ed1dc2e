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
  campaignCreateSchema,
  campaignReopenSchema,
  campaignSignOffSchema,
  campaignUpdateSchema,
  measurementBatchUpdateSchema,
  measurementCreateSchema,
  measurementUpdateSchema,
  savedForecastCreateSchema,
} from './schemas';

const campaignIdParams = z.object({ campaignId: z.string().uuid() });
const signedIn: Record<string, string[]>[] = [{ session: [] }, { bearer: [] }];

/** Campaign routes in the API description; the analysis and forecast routes with their full schemas. */
export const registerCampaigns: OpenApiRegistrar = (registry) => {
  registry.registerComponent('securitySchemes', 'session', { type: 'apiKey', in: 'cookie', name: 'eyrie.sid' });
  registry.registerComponent('securitySchemes', 'bearer', { type: 'http', scheme: 'bearer' });

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
    responses: { 201: { description: 'The campaign' }, ...problemResponses(400, 401, 403, 404, 409) },
  });
  registry.registerPath({
    method: 'patch',
    path: '/api/v1/campaigns/{campaignId}',
    tags: ['Campaigns'],
    summary: 'Change a campaign (version in the body or If-Match: W/"<version>")',
    security: signedIn,
    request: { params: campaignIdParams, body: { content: { 'application/json': { schema: campaignUpdateSchema } } } },
    responses: { 200: { description: 'The campaign' }, ...problemResponses(400, 401, 403, 404, 409) },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/measurements',
    tags: ['Campaigns'],
    summary: 'Add one run',
    security: signedIn,
    request: { params: campaignIdParams, body: { content: { 'application/json': { schema: measurementCreateSchema } } } },
    responses: { 201: { description: 'The measurement' }, ...problemResponses(400, 401, 403, 404) },
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
    responses: { 200: { description: 'The measurement' }, ...problemResponses(400, 401, 403, 404, 409) },
  });
  registry.registerPath({
    method: 'delete',
    path: '/api/v1/measurements/{measurementId}',
    tags: ['Campaigns'],
    summary: 'Delete a stored run (?version=N&reason=…; the reason is kept in the history)',
    security: signedIn,
    request: { params: z.object({ measurementId: z.string().uuid() }), query: z.object({ version: z.number().int(), reason: z.string() }) },
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
    responses: { 200: { description: 'The campaign with `signOff` (who, when, note)' }, ...problemResponses(400, 401, 403, 404, 409) },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/campaigns/{campaignId}/reopen',
    tags: ['Campaigns'],
    summary: 'Reopen a signed-off campaign, giving a reason',
    security: signedIn,
    request: { params: campaignIdParams, body: { content: { 'application/json': { schema: campaignReopenSchema } } } },
    responses: { 200: { description: 'The campaign, signOff null' }, ...problemResponses(400, 401, 403, 404, 409) },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/history',
    tags: ['Campaigns'],
    summary: "A campaign's history as sentences (who, when, what changed from what to what, why), newest first",
    description: 'Pages of `limit` (≤ 200) entries before the cursor `before`; `/history.csv` exports every entry. Needs viewer.',
    security: signedIn,
    request: { params: campaignIdParams, query: z.object({ limit: z.number().int().optional(), before: z.number().int().optional() }) },
    responses: { 200: { description: '{ entries: [{ id, at, who, sentence, reason }], nextBefore }' }, ...problemResponses(400, 401, 404) },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/files',
    tags: ['Campaigns'],
    summary: 'Files uploaded into the campaign, kept as they arrived (name, size, SHA-256, uploader, time, rows)',
    description: 'Download one from /api/v1/import-files/{fileId}. Needs viewer.',
    security: signedIn,
    request: { params: campaignIdParams },
    responses: { 200: { description: '{ files: [...] }, newest first' }, ...problemResponses(401, 404) },
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
};
