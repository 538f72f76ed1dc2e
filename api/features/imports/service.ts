/**
 * File import use cases: preview (read, guess or apply a mapping, check every row; writes
 * nothing) and import (the same checks, then every row in one transaction with one audit
 * event, or nothing at all). Stateless: the client sends the file again with its mapping.
 */
import type { Knex } from 'knex';
import { recordAudit } from '../audit/service';
import { NotFoundError } from '../../lib/errors';
import { isUuid } from '../campaigns/service';
import type { ImportMapping, ImportParseOptions } from '../campaigns/schemas';
import { ImportNeedsConfirmationError, ImportRejectedError, type ImportIssue } from './errors';
import { columnLetter, IMPORT_LIMITS, parseUpload, type Cell, type ImportLimits, type ParsedTable, type UploadedFile } from './parse';
import { guessMapping, mappingFromGuess, validateRows, type ImportRow, type MappingGuess } from './mapping';

export interface PreviewColumn {
  index: number;
  letter: string;
  header: string;
  /** First few values, as read, to help the user map the column. */
  sample: Cell[];
}

export interface ImportPreview {
  file: Pick<ParsedTable, 'fileName' | 'format' | 'encoding' | 'delimiter' | 'decimalSeparator' | 'headerRow' | 'sheetName' | 'sheetNames' | 'detected'>;
  columns: PreviewColumn[];
  /** What the headers suggest; shown as the starting point of the mapping form. */
  suggestedMapping: MappingGuess;
  /** The mapping the rows were checked with: the one sent, or the guess when it was complete; null otherwise. */
  mapping: ImportMapping | null;
  rowCount: number;
  validRowCount: number;
  errorCount: number;
  warningCount: number;
  issues: ImportIssue[];
  /** The first rows as they would be stored (temperatures in K). */
  rows: ImportRow[];
}

const PREVIEW_ROWS = 50;

/** Read and check a file without writing anything. */
export async function previewImport(
  file: UploadedFile,
  request: { mapping?: ImportMapping; parse?: ImportParseOptions },
  limits: ImportLimits = IMPORT_LIMITS,
): Promise<ImportPreview> {
  const table = await parseUpload(file, request.parse ?? {}, limits);
  const suggestedMapping = guessMapping(table);
  const mapping = request.mapping ?? mappingFromGuess(suggestedMapping);
  const columns = table.headers.map((header, index) => ({
    index,
    letter: columnLetter(index),
    header,
    sample: table.rows.slice(0, 5).map((r) => r.cells[index]),
  }));
  const { fileName, format, encoding, delimiter, decimalSeparator, headerRow, sheetName, sheetNames, detected } = table;
  const base = { file: { fileName, format, encoding, delimiter, decimalSeparator, headerRow, sheetName, sheetNames, detected }, columns, suggestedMapping, mapping, rowCount: table.rows.length };
  if (!mapping) {
    return {
      ...base,
      validRowCount: 0,
      errorCount: 0,
      warningCount: 0,
      issues: [{ severity: 'error', row: null, column: null, message: `Choose the columns and units still open: ${suggestedMapping.missing.join(', ')}.` }],
      rows: [],
    };
  }
  const result = validateRows(table, mapping);
  return {
    ...base,
    validRowCount: result.rows.length,
    errorCount: result.errorCount,
    warningCount: result.warningCount,
    issues: result.issues,
    rows: result.rows.slice(0, PREVIEW_ROWS),
  };
}

export interface ImportScope {
  projectId: string;
  actorUserId: string;
}

export interface ImportRequestInput {
  mapping: ImportMapping;
  parse?: ImportParseOptions;
  acknowledgeWarnings?: boolean;
}

export interface ImportResult {
  campaignId: string;
  inserted: number;
  temperatureRangeK: { min: number; max: number };
  distinctTemperatures: number;
  /** Warnings the user acknowledged before importing. */
  warningCount: number;
}

/** Rows per INSERT statement; each column travels as one array parameter, so this only bounds statement size. */
export const INSERT_CHUNK_ROWS = 10_000;

/**
 * Import a file's rows into a campaign, all or nothing. Errors → ImportRejectedError (422,
 * nothing written); unacknowledged warnings → ImportNeedsConfirmationError (422, nothing
 * written); a campaign outside the project → NotFoundError. Rows that repeat measurements
 * already in the campaign are warnings too (the same file imported twice).
 */
export async function importMeasurements(
  db: Knex,
  scope: ImportScope,
  campaignId: string,
  file: UploadedFile,
  request: ImportRequestInput,
  limits: ImportLimits = IMPORT_LIMITS,
): Promise<ImportResult> {
  if (!isUuid(campaignId)) throw new NotFoundError('No campaign was found at this address in this project.');
  const table = await parseUpload(file, request.parse ?? {}, limits);
  const checked = validateRows(table, request.mapping);
  if (checked.errorCount > 0) {
    throw new ImportRejectedError(
      `${file.name}: ${checked.errorCount} problem${checked.errorCount === 1 ? '' : 's'} found; nothing was imported. Fix the file or the mapping and upload it again.`,
      checked.issues,
    );
  }
  if (checked.rows.length === 0) {
    throw new ImportRejectedError(`${file.name} has no rows to import.`, [{ severity: 'error', row: null, column: null, message: 'no data rows' }]);
  }

  return db.transaction(async (trx) => {
    // Lock the campaign row so two imports into one campaign cannot interleave their duplicate checks.
    const campaign = await trx('campaigns').where({ id: campaignId, projectId: scope.projectId }).forUpdate().first('id', 'title');
    if (!campaign) throw new NotFoundError('No campaign was found at this address in this project.');

    const repeats = await findRepeatsOfStoredRows(trx, campaignId, checked.rows);
    const warnings = [...checked.issues.filter((i) => i.severity === 'warning'), ...repeats];
    if (warnings.length > 0 && !request.acknowledgeWarnings) {
      throw new ImportNeedsConfirmationError(
        `${file.name}: ${warnings.length} warning${warnings.length === 1 ? '' : 's'} to confirm; nothing was imported. Review them and import again with acknowledgeWarnings.`,
        warnings,
      );
    }

    const stamp = new Date();
    for (let i = 0; i < checked.rows.length; i += INSERT_CHUNK_ROWS) {
      await insertRows(trx, campaignId, scope.actorUserId, stamp, checked.rows.slice(i, i + INSERT_CHUNK_ROWS));
    }
    await trx('campaigns').where({ id: campaignId }).update({ updatedAt: stamp });

    let min = Infinity;
    let max = -Infinity;
    const distinct = new Set<string>();
    for (const r of checked.rows) {
      min = Math.min(min, r.temperatureK);
      max = Math.max(max, r.temperatureK);
      distinct.add(r.temperatureK.toFixed(2));
    }
    const result: ImportResult = {
      campaignId,
      inserted: checked.rows.length,
      temperatureRangeK: { min, max },
      distinctTemperatures: distinct.size,
      warningCount: warnings.length,
    };
    await recordAudit(trx, {
      projectId: scope.projectId,
      actorUserId: scope.actorUserId,
      action: 'create',
      entityType: 'measurement_import',
      entityId: campaignId,
      before: null,
      after: {
        campaignTitle: campaign.title,
        fileName: file.name,
        format: table.format,
        rows: result.inserted,
        temperatureRangeK: result.temperatureRangeK,
        distinctTemperatures: result.distinctTemperatures,
        acknowledgedWarnings: warnings.length,
        mapping: request.mapping,
      },
    });
    return result;
  });
}

/**
 * One multi-row INSERT per chunk, columns sent as arrays and unnested by PostgreSQL: building
 * 10 000 × 14 placeholders in JavaScript costs more than the insert itself. The table's CHECK
 * constraints still apply to every row.
 */
async function insertRows(trx: Knex.Transaction, campaignId: string, actorUserId: string, stamp: Date, rows: ImportRow[]): Promise<void> {
  const n = rows.length;
  const col = <T>(pick: (r: ImportRow) => T): T[] => {
    const out = new Array<T>(n);
    for (let i = 0; i < n; i++) out[i] = pick(rows[i]);
    return out;
  };
  await trx.raw(
    `insert into measurements
       (campaign_id, created_by_user_id, created_at, updated_at, source_row, temperature_k, measure, value, value_b,
        is_lower_bound, uncertainty, replicate_label, sample_id, conversion_percent, reaction_time_s, notes)
     select ?::uuid, ?::uuid, ?::timestamptz, ?::timestamptz, x.*
       from unnest(?::int[], ?::float8[], ?::text[], ?::float8[], ?::float8[], ?::boolean[], ?::float8[], ?::text[], ?::text[], ?::float8[], ?::float8[], ?::text[])
         as x(source_row, temperature_k, measure, value, value_b, is_lower_bound, uncertainty, replicate_label, sample_id, conversion_percent, reaction_time_s, notes)`,
    // The driver writes JS arrays (with nulls) as PostgreSQL array literals.
    [
      campaignId,
      actorUserId,
      stamp,
      stamp,
      col((r) => r.sourceRow),
      col((r) => r.temperatureK),
      col((r) => r.measure),
      col((r) => r.value),
      col((r) => r.valueB),
      col((r) => r.isLowerBound),
      col((r) => r.uncertainty),
      col((r) => r.replicateLabel),
      col((r) => r.sampleId),
      col((r) => r.conversionPercent),
      col((r) => r.reactionTimeS),
      col((r) => r.notes),
    ] as Knex.RawBinding[],
  );
}

/** Warnings for file rows identical to measurements already stored in the campaign. */
async function findRepeatsOfStoredRows(trx: Knex.Transaction, campaignId: string, rows: ImportRow[]): Promise<ImportIssue[]> {
  const stored: { temperatureK: number; measure: string; value: number; valueB: number | null; sampleId: string | null; replicateLabel: string | null }[] = await trx(
    'measurements',
  )
    .where({ campaignId })
    .select('temperatureK', 'measure', 'value', 'valueB', 'sampleId', 'replicateLabel');
  if (stored.length === 0) return [];
  const key = (r: { temperatureK: number; measure: string; value: number; valueB: number | null; sampleId: string | null; replicateLabel: string | null }) =>
    [r.temperatureK.toFixed(3), r.measure, r.value, r.valueB, r.sampleId, r.replicateLabel].join('|');
  const known = new Set(stored.map(key));
  const issues: ImportIssue[] = [];
  let count = 0;
  for (const r of rows) {
    if (!known.has(key(r))) continue;
    count += 1;
    if (issues.length < 50) {
      issues.push({ severity: 'warning', row: r.sourceRow, column: null, message: 'the campaign already has a measurement with the same temperature, selectivity, sample id and replicate (was this file imported before?).' });
    }
  }
  if (count > issues.length) {
    issues.push({ severity: 'warning', row: null, column: null, message: `${count - issues.length} more rows repeat measurements already in the campaign.` });
  }
  return issues;
}
