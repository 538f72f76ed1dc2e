/**
 * File import use cases: preview (read, guess or apply a mapping, check every row; writes
 * nothing) and import (the same checks, then every row in one transaction with one audit
 * event, or nothing at all). Stateless: the client sends the file again with its mapping.
 */
import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { PoolClient as PgClient } from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import type { Knex } from 'knex';
import { recordAudit } from '../../lib/audit';
import { NotFoundError } from '../../lib/errors';
import { assertMeasurementsOpen, isUuid } from '../campaigns/service';
import { Campaign } from '../../models/campaign';
import type { ImportMapping, ImportParseOptions } from '../campaigns/schemas';
import { ImportNeedsConfirmationError, ImportRejectedError, type ImportIssue } from './errors';
import {
  columnLetter,
  extensionOf,
  IMPORT_LIMITS,
  parseUpload,
  readsInWorker,
  type Cell,
  type ImportLimits,
  type ParsedTable,
  type UploadedFile,
} from './parse';
import { guessMapping, mappingFromGuess, type MappingGuess } from './mapping';
import { validateRows, validateRowsYielding, type ImportRow, type IssueCounts, type ValidationResult } from './row-checks';

export interface PreviewColumn {
  index: number;
  letter: string;
  header: string;
  /** First few values, as read, to help the user map the column. */
  sample: Cell[];
}

export interface ImportPreview {
  file: Pick<
    ParsedTable,
    'fileName' | 'format' | 'encoding' | 'delimiter' | 'decimalSeparator' | 'headerRow' | 'sheetName' | 'sheetNames' | 'detected'
  >;
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
  /**
   * Keys of the rows the campaign already holds (storedRowKeys), so the preview warns about repeats before the import
   * asks. Plain data, so the preview can run in a worker thread that has no database connection.
   */
  stored?: StoredRowKeys,
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
  const base = {
    file: { fileName, format, encoding, delimiter, decimalSeparator, headerRow, sheetName, sheetNames, detected },
    columns,
    suggestedMapping,
    mapping,
    rowCount: table.rows.length,
  };
  if (!mapping) {
    return {
      ...base,
      validRowCount: 0,
      errorCount: 0,
      warningCount: 0,
      issues: [
        {
          severity: 'error',
          row: null,
          column: null,
          message: `Choose the columns and units still open: ${suggestedMapping.missing.join(', ')}.`,
        },
      ],
      rows: [],
    };
  }
  const result = validateRows(table, mapping);
  const repeats = stored && result.errorCount === 0 ? repeatsAgainst(stored, result.rows) : [];
  return {
    ...base,
    validRowCount: result.rows.length,
    errorCount: result.errorCount,
    warningCount: result.warningCount + repeats.length,
    issues: [...result.issues, ...repeats],
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
  /** The kept original: download it from `/api/v1/import-files/{id}`. */
  file: { id: string; name: string; sizeBytes: number; sha256: string };
}

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
  if (readsInWorker(file, limits)) {
    // A large file or a workbook: the worker checks it and sends the checked rows in batches, which
    // are inserted (in the transaction) while it reads on. A row error, an unacknowledged warning
    // or a failed read found later throws, and the transaction takes back what was written.
    const { checkInPool } = await import('./parse-pool');
    const format = extensionOf(file.name) === 'xlsx' ? 'xlsx' : 'csv';
    const parse = request.parse ? { parse: request.parse } : {};
    return writeImport(db, scope, campaignId, file, request, format, async (take) => {
      const { result } = await checkInPool(file, { mapping: request.mapping, ...parse }, limits, take);
      refuseUnimportable(file, result);
      return result;
    });
  }
  // A small text file: read and checked here first, so a file with errors never opens a transaction.
  const table = await parseUpload(file, request.parse ?? {}, limits);
  const { rows, ...result } = await validateRowsYielding(table, request.mapping);
  refuseUnimportable(file, result);
  if (rows.length === 0) throw noRowsError(file);
  return writeImport(db, scope, campaignId, file, request, table.format, async (take) => {
    await take(rows, result);
    return result;
  });
}

/** Row errors → ImportRejectedError, naming every issue. */
function refuseUnimportable(file: UploadedFile, result: Omit<ValidationResult, 'rows'>): void {
  if (result.errorCount > 0) {
    throw new ImportRejectedError(
      `${file.name}: ${result.errorCount} problem${result.errorCount === 1 ? '' : 's'} found; nothing was imported. Fix the file or the mapping and upload it again.`,
      result.issues,
    );
  }
}

const noRowsError = (file: UploadedFile) =>
  new ImportRejectedError(`${file.name} has no rows to import.`, [{ severity: 'error', row: null, column: null, message: 'no data rows' }]);

type TakeRows = (rows: ImportRow[], counts: IssueCounts) => Promise<void>;

/**
 * The import's transaction: lock the campaign, keep the file, insert the rows `check` hands over
 * (warning about rows the campaign already holds), then the audit entry. Anything thrown rolls
 * back everything, so an import is all or nothing.
 */
async function writeImport(
  db: Knex,
  scope: ImportScope,
  campaignId: string,
  file: UploadedFile,
  request: ImportRequestInput,
  format: 'csv' | 'xlsx',
  check: (take: TakeRows) => Promise<Omit<ValidationResult, 'rows'>>,
): Promise<ImportResult> {
  return db.transaction(async (trx) => {
    // Lock the campaign row so two imports into one campaign cannot interleave their duplicate checks.
    const campaign = await Campaign.query(trx).findOne({ id: campaignId, projectId: scope.projectId }).forUpdate();
    if (!campaign) throw new NotFoundError('No campaign was found at this address in this project.');
    await assertMeasurementsOpen(trx, campaign);
    const repeats = repeatTally(await storedRowKeys(trx, campaignId));

    const stamp = new Date();
    // The file is kept as it arrived, so every stored row can be traced to its file and row.
    const sha256 = createHash('sha256').update(file.buffer).digest('hex');
    const [kept] = await trx('importFiles')
      .insert({
        campaignId,
        fileName: file.name,
        mediaType: mediaTypeOf(format, file.name),
        format,
        sizeBytes: file.buffer.length,
        sha256,
        content: file.buffer,
        rowCount: 0,
        uploadedByUserId: scope.actorUserId,
        uploadedAt: stamp,
      })
      .returning('id');
    const fileId = String(kept.id);

    let inserted = 0;
    let min = Infinity;
    let max = -Infinity;
    const distinct = new Set<string>();
    // Once the import is bound to be refused (a row error, or a warning not yet acknowledged), the
    // remaining batches are only counted: the transaction will be rolled back.
    let refused = false;
    const checked = await check(async (rows, counts) => {
      repeats.add(rows);
      refused ||= counts.errorCount > 0 || (!request.acknowledgeWarnings && counts.warningCount + repeats.count > 0);
      for (const r of rows) {
        min = Math.min(min, r.temperatureK);
        max = Math.max(max, r.temperatureK);
        distinct.add(r.temperatureK.toFixed(2));
      }
      inserted += rows.length;
      if (refused) return;
      await insertRows(trx, campaignId, scope.actorUserId, stamp, fileId, rows);
    });
    if (inserted === 0) throw noRowsError(file);
    const warnings = [...checked.issues.filter((i) => i.severity === 'warning'), ...repeats.issues()];
    if (warnings.length > 0 && !request.acknowledgeWarnings) {
      throw new ImportNeedsConfirmationError(
        `${file.name}: ${warnings.length} warning${warnings.length === 1 ? '' : 's'} to confirm; nothing was imported. Review them and import again with acknowledgeWarnings.`,
        warnings,
      );
    }
    await trx('importFiles').where({ id: fileId }).update({ rowCount: inserted });
    await trx('campaigns').where({ id: campaignId }).update({ updatedAt: stamp });

    const result: ImportResult = {
      campaignId,
      inserted,
      temperatureRangeK: { min, max },
      distinctTemperatures: distinct.size,
      warningCount: warnings.length,
      file: { id: fileId, name: file.name, sizeBytes: file.buffer.length, sha256 },
    };
    await recordAudit(trx, {
      projectId: scope.projectId,
      actorUserId: scope.actorUserId,
      action: 'create',
      entityType: 'measurement_import',
      entityId: campaignId,
      campaignId,
      before: null,
      after: {
        campaignTitle: campaign.title,
        fileName: file.name,
        fileId,
        sizeBytes: file.buffer.length,
        sha256,
        format,
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
 * The rows by COPY on the transaction's own connection (COPY … FROM STDIN, text format): about a
 * third faster than a multi-row INSERT over unnested arrays, which in turn beat 14 placeholders a
 * row. Column defaults, CHECK constraints and foreign keys apply to every row as for an INSERT,
 * and a refused row fails the COPY and with it the transaction.
 */
async function insertRows(
  trx: Knex.Transaction,
  campaignId: string,
  actorUserId: string,
  stamp: Date,
  importFileId: string,
  rows: ImportRow[],
): Promise<void> {
  const fixed = `${campaignId}\t${actorUserId}\t${stamp.toISOString()}\t${stamp.toISOString()}\t${importFileId}\t`;
  function* lines(): Generator<string> {
    let chunk = '';
    for (const r of rows) {
      chunk += `${fixed}${r.sourceRow}\t${r.temperatureK}\t${r.measure}\t${r.value}\t${copyNumber(r.valueB)}\t${r.isLowerBound ? 't' : 'f'}\t${copyNumber(r.uncertainty)}\t${copyText(r.replicateLabel)}\t${copyText(r.sampleId)}\t${copyNumber(r.conversionPercent)}\t${copyNumber(r.reactionTimeS)}\t${copyText(r.notes)}\n`;
      if (chunk.length >= 64 * 1024) {
        yield chunk;
        chunk = '';
      }
    }
    if (chunk) yield chunk;
  }
  const connection = (await trx.client.acquireConnection()) as PgClient;
  try {
    const copy = connection.query(
      copyFrom(
        `copy measurements (campaign_id, created_by_user_id, created_at, updated_at, import_file_id, source_row, temperature_k, measure,
           value, value_b, is_lower_bound, uncertainty, replicate_label, sample_id, conversion_percent, reaction_time_s, notes) from stdin`,
      ),
    );
    await pipeline(Readable.from(lines()), copy);
  } finally {
    await trx.client.releaseConnection(connection);
  }
}

/** A number in COPY's text format; null as \N. The checks have refused NaN and infinities. */
const copyNumber = (v: number | null) => (v === null ? '\\N' : String(v));
/** Text in COPY's text format: backslash, tab, newline and carriage return escaped; null as \N. */
const copyText = (v: string | null) => (v === null ? '\\N' : /[\\\t\n\r]/.test(v) ? v.replace(/[\\\t\n\r]/g, (c) => COPY_ESCAPES[c]!) : v);
const COPY_ESCAPES: Record<string, string> = { '\\': '\\\\', '\t': '\\t', '\n': '\\n', '\r': '\\r' };

type StoredKeyFields = Pick<ImportRow, 'temperatureK' | 'measure' | 'value' | 'valueB' | 'sampleId' | 'replicateLabel'>;

/** Same sample and replicate: the same vial measured again. */
const sampleKey = (r: StoredKeyFields) =>
  r.sampleId ? `${r.sampleId.trim().toLowerCase()}|${(r.replicateLabel ?? '').trim().toLowerCase()}` : null;
/** Same temperature (to 0.01 K) and the same reported value. */
const readingKey = (r: StoredKeyFields) => `${r.temperatureK.toFixed(2)}|${r.measure}|${r.value}|${r.valueB ?? ''}`;

const describeRun = (r: StoredKeyFields) =>
  `${r.sampleId ? `sample ${r.sampleId}${r.replicateLabel ? ` ${r.replicateLabel}` : ''}` : 'a run'}`;

/**
 * Warnings for file rows that repeat measurements already stored in the campaign: the same
 * sample id and replicate, or the same temperature and value (the same file imported twice,
 * or a run typed in and then imported).
 */
/** The keys of a campaign's stored runs: sample id + replicate, and temperature + reading. */
export interface StoredRowKeys {
  samples: string[];
  readings: string[];
}

export async function storedRowKeys(trx: Knex | Knex.Transaction, campaignId: string): Promise<StoredRowKeys> {
  const stored: StoredKeyFields[] = await trx('measurements')
    .where({ campaignId })
    .select('temperatureK', 'measure', 'value', 'valueB', 'sampleId', 'replicateLabel');
  return { samples: stored.map(sampleKey).filter((k): k is string => k !== null), readings: stored.map(readingKey) };
}

/** Warnings for rows that repeat stored runs (same sample id and replicate, or the same temperature and reading). */
export function repeatsAgainst(stored: StoredRowKeys, rows: ImportRow[]): ImportIssue[] {
  const tally = repeatTally(stored);
  tally.add(rows);
  return tally.issues();
}

/** As `repeatsAgainst`, for rows that arrive in batches: the first 50 repeats are listed, the rest counted. */
function repeatTally(stored: StoredRowKeys) {
  const samples = new Set(stored.samples);
  const readings = new Set(stored.readings);
  const listed: ImportIssue[] = [];
  let count = 0;
  return {
    add(rows: ImportRow[]) {
      if (samples.size === 0 && readings.size === 0) return;
      for (const r of rows) {
        const sk = sampleKey(r);
        const sameSample = sk !== null && samples.has(sk);
        const sameReading = readings.has(readingKey(r));
        if (!sameSample && !sameReading) continue;
        count += 1;
        if (listed.length >= 50) continue;
        const message = sameSample
          ? `${describeRun(r)} is already in the campaign (same sample id and replicate); importing adds it again.`
          : 'the campaign already has a measurement at this temperature with this value; importing adds it again (was this file imported before?).';
        listed.push({ severity: 'warning', row: r.sourceRow, column: null, message });
      }
    },
    get count() {
      return count;
    },
    issues(): ImportIssue[] {
      if (count <= listed.length) return listed;
      return [
        ...listed,
        {
          severity: 'warning',
          row: null,
          column: null,
          message: `${count - listed.length} more rows repeat measurements already in the campaign.`,
        },
      ];
    },
  };
}

function mediaTypeOf(format: 'csv' | 'xlsx', name: string): string {
  if (format === 'xlsx') return 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';
  return /\.tsv$/i.test(name) ? 'text/tab-separated-values' : 'text/csv';
}
