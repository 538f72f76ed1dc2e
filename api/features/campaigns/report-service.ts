/**
 * Building and sending a campaign's exports: the workbook, the summary PDF, the two CSVs and the
 * e-mail to chosen project members. Plain async functions, so a route or a background job can
 * call them alike.
 */
import type { Knex } from 'knex';
import { z } from 'zod';
import { BadRequestError, MailNotSentError } from '../../lib/errors';
import { CELSIUS_OFFSET_K } from '../../science';
import { Project } from '../../models/project';
import { User } from '../../models/user';
import type { Mailer } from '../mail/mailer';
import { getCampaignSpecification } from '../plan/store';
import { loadComparisonReportData, loadPlanReportData, type ComparisonReportData } from '../plan/report-data';
import { loadReportData } from './report-data';
import { buildCampaignReport, reportFileName } from './report';
import { renderReportChartsAsync, type ReportCharts } from './report-charts';
import { fixed, safeText } from './report-format';
import {
  buildReportModel,
  clean,
  measurementRunCells,
  summaryLineText,
  type ReportData,
  type ReportMeta,
  type ReportModel,
} from './report-model';
import { buildCampaignReportPdf } from './report-pdf';

const atField = z.coerce
  .number({ error: 'at must be a temperature in °C' })
  .refine(Number.isFinite, 'at must be a finite number')
  .gt(-273.15, 'at must lie above absolute zero (−273.15 °C)')
  .max(726.85, 'at must be at most 726.85 °C (1000 K)');

/** ?at= (°C): the temperature the report forecasts at; omitted → the newest saved forecast's. */
export const reportQuerySchema = z.object({ at: atField.optional() });

export const MAX_REPORT_RECIPIENTS = 20;

export const reportMailSchema = z.strictObject({
  recipients: z
    .array(z.string({ error: 'each recipient must be a user id' }).uuid('each recipient must be a user id'), {
      error: 'recipients must be a list of user ids',
    })
    .min(1, 'choose at least one recipient')
    .max(MAX_REPORT_RECIPIENTS, `at most ${MAX_REPORT_RECIPIENTS} recipients`),
  message: z.string({ error: 'message must be text' }).max(2000, 'message must be at most 2000 characters').optional(),
  attach: z
    .array(z.enum(['xlsx', 'pdf'], { error: 'attach lists xlsx and/or pdf' }))
    .min(1, 'attach at least one file')
    .default(['xlsx', 'pdf']),
  at: atField.optional(),
});
export type ReportMailRequest = z.infer<typeof reportMailSchema>;

/** The stored campaign with its project name, ready for `buildReportModel`. */
/** At most this many saved comparisons go into one report (those with the campaign first, then the newest). */
export const MAX_REPORT_COMPARISONS = 5;

/**
 * The project's saved comparisons for the report, recomputed from current runs as the page shows
 * them; campaigns the reader cannot read stay unavailable. Without a reader, none.
 */
async function reportComparisons(
  db: Knex,
  projectId: string,
  campaignId: string,
  userId: string | undefined,
): Promise<ComparisonReportData[]> {
  if (!userId) return [];
  const rows: { id: string; campaignIds: string[] }[] = await db('comparisons')
    .where({ projectId })
    .orderBy('createdAt', 'desc')
    .select('id', 'campaignIds')
    .limit(200);
  const chosen = [
    ...rows.filter((r) => r.campaignIds.includes(campaignId)),
    ...rows.filter((r) => !r.campaignIds.includes(campaignId)),
  ].slice(0, MAX_REPORT_COMPARISONS);
  const out: ComparisonReportData[] = [];
  for (const r of chosen) out.push(await loadComparisonReportData(db, projectId, userId, r.id));
  return out;
}

export async function loadCampaignReportData(
  db: Knex,
  projectId: string,
  campaignId: string,
  options: { atC?: number; userId?: string } = {},
): Promise<ReportData> {
  const data = await loadReportData(db, projectId, campaignId);
  const project = await Project.query(db).findById(projectId);
  const specs = await getCampaignSpecification(db, projectId, campaignId);
  const spec = specs.effective;
  return {
    ...data,
    project: project ? { name: project.name } : null,
    specification: spec
      ? { measure: spec.measure, minimum: spec.minimum, probability: spec.probability, runs: spec.runs, source: specs.source }
      : null,
    plan: await loadPlanReportData(db, projectId, campaignId),
    comparisons: await reportComparisons(db, projectId, campaignId, options.userId),
    ...(options.atC === undefined ? {} : { proposedK: options.atC + CELSIUS_OFFSET_K }),
  };
}

export interface PreparedReport {
  model: ReportModel;
  charts: ReportCharts | null;
}

/** The report model and its chart images (rendered off the event loop). */
export async function prepareReport(data: ReportData, meta: ReportMeta): Promise<PreparedReport> {
  const model = buildReportModel(data, meta);
  return { model, charts: await renderReportChartsAsync(model) };
}

export const xlsxOf = (p: PreparedReport) => buildCampaignReport(p.model.data, p.model.meta, p);
export const pdfOf = (p: PreparedReport) => buildCampaignReportPdf(p.model, p.charts);

// ── CSV ──────────────────────────────────────────────────────────────────────────────────────

/** One CSV field: formula-like text neutralised, quotes doubled, quoted when needed. */
function csvField(value: string | number | null | undefined, decimals?: number): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return decimals === undefined ? String(value) : fixed(value, decimals).replace('−', '-');
  const text = safeText(value) ?? '';
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

function csv(header: string[], rows: (string | number | null)[][], decimals: (number | undefined)[]): string {
  const lines = [header.map((h) => csvField(h)).join(',')];
  for (const r of rows) lines.push(r.map((v, i) => csvField(v, decimals[i])).join(','));
  // A byte-order mark so spreadsheet programs read °, ‡ and − as UTF-8.
  return `\uFEFF${lines.join('\r\n')}\r\n`;
}

export function measurementsCsv(model: ReportModel): string {
  const { data, labels, decimals: d } = model;
  const header = [
    'sample',
    'replicate',
    'T (°C)',
    'T (K)',
    'reported as',
    'value',
    'value B',
    'at least',
    'assay SD',
    `${labels.word} A:B`,
    ...(labels.excess ? [labels.excess] : []),
    labels.major,
    'ln r',
    'status',
    'exclusion reason',
    'conversion (%)',
    'time (h)',
    'notes',
  ];
  const rows = data.measurements.map((_, i) => measurementRunCells(model, i, (text) => text));
  const decimals = [
    undefined,
    undefined,
    2,
    2,
    undefined,
    undefined,
    undefined,
    undefined,
    undefined,
    d.ratio + 1,
    ...(labels.excess ? [d.percent + 1] : []),
    d.percent + 1,
    4,
  ];
  return csv(header, rows, decimals);
}

export function forecastCsv(model: ReportModel): string {
  const { labels, decimals: d, level } = model;
  const withSpec = model.specificationLnRatio !== null;
  const header = [
    'T (°C)',
    'T (K)',
    'row',
    `${labels.word} A:B`,
    `${level} % PI low A:B`,
    `${level} % PI high A:B`,
    ...(labels.excess ? [labels.excess, `${level} % PI low ${labels.excess}`, `${level} % PI high ${labels.excess}`] : []),
    labels.major,
    'ΔΔG‡ (kJ/mol)',
    'outside screened range',
    ...(withSpec ? ['meets specification'] : []),
  ];
  const rows = model.grid.map((g) => {
    const p = g.prediction;
    const pi = p.predictionInterval;
    return [
      clean(p.celsius),
      p.kelvin,
      g.source === 'saved' ? `saved: ${g.note ?? ''}` : g.source === 'recommended' ? 'recommended by the saved plan' : g.source,
      p.ratio,
      pi?.ratio[0] ?? null,
      pi?.ratio[1] ?? null,
      ...(labels.excess ? [p.eePercent, pi?.eePercent[0] ?? null, pi?.eePercent[1] ?? null] : []),
      Math.max(p.percentA, 100 - p.percentA),
      p.ddG['kJ/mol'],
      p.extrapolated ? 'yes' : 'no',
      ...(withSpec ? [g.meets] : []),
    ];
  });
  const r = d.ratio + 1;
  const pc = d.percent + 1;
  const decimals = [2, 2, undefined, r, r, r, ...(labels.excess ? [pc, pc, pc] : []), pc, d.ddH];
  return csv(header, rows, decimals);
}

// ── E-mail ───────────────────────────────────────────────────────────────────────────────────

export interface SentReport {
  sentTo: { userId: string; email: string }[];
  attachments: string[];
}

/**
 * E-mail the report to members of the project. Every recipient must be a member with an
 * e-mail address; otherwise nothing is sent and the request names the recipient at fault.
 */
export async function sendCampaignReport(
  db: Knex,
  mailer: Mailer,
  args: {
    projectId: string;
    campaignId: string;
    request: ReportMailRequest;
    meta: ReportMeta;
    /** Whose reading of the saved comparisons goes in. */ userId?: string;
  },
): Promise<SentReport> {
  const { projectId, campaignId, request, meta } = args;
  const ids = [...new Set(request.recipients)];
  const members = await User.query(db)
    .select('users.id', 'users.email', 'users.login', 'users.displayName')
    .join('projectMembers', 'projectMembers.userId', 'users.id')
    .where('projectMembers.projectId', projectId)
    .whereIn('users.id', ids);
  const byId = new Map(members.map((u) => [u.id, u]));
  const errors = request.recipients.flatMap((id, i) => {
    const u = byId.get(id);
    if (!u) return [{ path: `recipients.${i}`, message: 'is not a member of this project' }];
    if (!u.email) return [{ path: `recipients.${i}`, message: `${u.displayName ?? u.login} has no e-mail address on file` }];
    return [];
  });
  if (errors.length)
    throw new BadRequestError('Every recipient must be a member of the project with an e-mail address; nothing was sent.', errors);

  const data = await loadCampaignReportData(db, projectId, campaignId, {
    ...(request.at === undefined ? {} : { atC: request.at }),
    ...(args.userId ? { userId: args.userId } : {}),
  });
  const prepared = await prepareReport(data, meta);
  const title = data.campaign.title;
  const attachments = [];
  if (request.attach.includes('xlsx'))
    attachments.push({
      filename: reportFileName(title),
      content: await xlsxOf(prepared),
      contentType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
    });
  if (request.attach.includes('pdf'))
    attachments.push({ filename: reportFileName(title, 'summary.pdf'), content: await pdfOf(prepared), contentType: 'application/pdf' });

  const key = prepared.model.summary.filter((l) => ['Forecast', 'Fit', 'Runs'].includes(l.section) && l.label !== 'Intervals').slice(0, 8);
  const text = [
    `${meta.exportedBy ?? 'A project member'} sent you the selectivity report of "${title}"${data.project ? ` (project ${data.project.name})` : ''}.`,
    ...(request.message ? ['', request.message] : []),
    '',
    ...key.map((l) => `${l.label}: ${summaryLineText(l)}`),
    '',
    `The attached ${attachments.map((a) => a.filename).join(' and ')} hold the full summary, charts and data.`,
    '',
    prepared.model.summary.find((l) => l.label === 'Caution')?.value as string,
    '',
    `Eyrie ${meta.appVersion}`,
  ].join('\n');
  const sentTo: SentReport['sentTo'] = [];
  for (const id of ids) {
    const u = byId.get(id)!;
    try {
      await mailer.send({ to: u.email!, subject: `Selectivity report: ${title}`, text, attachments });
    } catch (err) {
      // The mail server's own reply stays in the log (as the cause); the caller reads only what happened.
      const already = sentTo.length ? ` It was already sent to ${sentTo.map((s) => s.email).join(', ')}.` : '';
      throw new MailNotSentError(`The report could not be e-mailed to ${u.email}; try again in a few minutes.${already}`, err);
    }
    sentTo.push({ userId: u.id, email: u.email! });
  }
  return { sentTo, attachments: attachments.map((a) => a.filename) };
}
