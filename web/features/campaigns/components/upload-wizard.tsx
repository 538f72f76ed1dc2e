import { useEffect, useId, useReducer, useRef, useState, type RefObject } from 'react';
import type { ImportParseOptions } from '../../../../api/features/campaigns/schemas';
import { Button, LabelAbove } from '../../../components/ui/form';
import { ApiError } from '../../../lib/api-client';
import { fixed } from '../../../lib/format';
import { useImportFile, usePreviewImport } from '../api/imports';
import type { ImportIssue, ImportPreview } from '../api/types';
import { draftFromSuggestion, mappingFromDraft } from '../lib/import-mapping';
import { CELSIUS, MEASURE_LABEL } from '../lib/labels';
import type { UploadProgress } from '../lib/upload';
import { initialUpload, uploadReducer } from '../lib/upload-steps';
import { SECONDS_PER } from '../../../../api/science/quantities';
import { ColumnMappingStep } from './column-mapping-step';
import { recordLinks } from '../api/records';
import { CompactSelect } from './compact-select';
import { TableHead } from '../../../components/ui/table-head';

const DELIMITER_TEXT: Record<string, string> = { ',': 'comma', ';': 'semicolon', '\t': 'tab' };

function bytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${fixed(n / 1024, 0)} kB`;
  return `${fixed(n / 1024 / 1024, 1)} MB`;
}

export function ProgressLine({ progress, label }: { progress: UploadProgress | null; label: string }) {
  if (!progress) return null;
  const pct = progress.total > 0 ? Math.round((100 * progress.loaded) / progress.total) : null;
  return (
    <div className="flex items-center gap-3 text-sm text-ink-700" role="status">
      {progress.phase === 'sending' ? (
        <>
          <progress className="h-2 w-48" max={100} value={pct ?? undefined} aria-label={`${label}: upload progress`} />
          <span className="tnum">
            Uploading {pct === null ? '' : `${pct} % · `}
            {bytes(progress.loaded)}
            {progress.total ? ` of ${bytes(progress.total)}` : ''}
          </span>
        </>
      ) : progress.stage ? (
        <>
          <progress className="h-2 w-48" max={100} value={progress.percent} aria-label={`${label}: work on the server`} />
          <span>
            Large file: working on it in the background ({progress.stage}
            {progress.percent !== undefined ? `, ${progress.percent} %` : ''})…
          </span>
        </>
      ) : (
        <>
          <progress className="h-2 w-48" aria-label={`${label}: the server is reading the file`} />
          <span>Uploaded; the server is reading and checking the rows…</span>
        </>
      )}
    </div>
  );
}

/**
 * Upload a CSV or XLSX file: the server detects delimiter, decimal comma and header row (all
 * overridable), the user maps the columns, sees every row-level problem, then imports all rows
 * or none.
 */
export function UploadWizard({ campaignId, projectId }: { campaignId: string; projectId: string }) {
  const fileId = useId();
  const [state, dispatch] = useReducer(uploadReducer, initialUpload);
  const { file, parse, draft, acknowledge, importIssues, done } = state;
  const [progress, setProgress] = useState<UploadProgress | null>(null);
  const abort = useRef<AbortController | null>(null);
  const nextSignal = () => {
    abort.current = new AbortController();
    return abort.current.signal;
  };
  const preview = usePreviewImport(campaignId, setProgress);
  const importer = useImportFile(campaignId, projectId, (p) => {
    setProgress(p);
    // Work reported in stages is a background job on the server (a large file).
    if (p.stage) dispatch({ type: 'jobQueued' });
  });
  const stepRef = useRef<HTMLElement | null>(null);
  // Keyboard and screen-reader users land on what the new step shows.
  useEffect(() => {
    if (state.step === 'check' || state.step === 'confirm' || state.step === 'done') stepRef.current?.focus();
  }, [state.step]);

  const mapped = draft ? mappingFromDraft(draft) : null;
  const data: ImportPreview | undefined = preview.data;
  const checked = data && (state.step === 'check' || state.step === 'confirm' || state.step === 'importing' || state.step === 'job');

  const runPreview = (f: File, nextParse: ImportParseOptions, revision: number, withMapping: boolean) => {
    const mapping = withMapping && mapped?.mapping ? mapped.mapping : undefined;
    preview.mutate(
      { file: f, request: { parse: nextParse, ...(mapping ? { mapping } : {}) }, signal: nextSignal() },
      {
        onSuccess: (p) =>
          dispatch({
            type: 'previewed',
            revision,
            suggested: draftFromSuggestion(p.suggestedMapping),
            checked: p.mapping ? { errorCount: p.errorCount, warningCount: p.warningCount, validRowCount: p.validRowCount } : null,
          }),
        onSettled: () => setProgress(null),
      },
    );
  };

  const choose = (f: File | null) => {
    dispatch({ type: 'chosen', file: f });
    preview.reset();
    importer.reset();
    // The reducer bumps the revision by one on every choice.
    if (f) runPreview(f, {}, state.revision + 1, false);
  };

  const setParseOption = (next: ImportParseOptions) => {
    dispatch({ type: 'parseChanged', parse: next });
    if (file) runPreview(file, next, state.revision + 1, false);
  };

  const doImport = () => {
    if (!file || !mapped?.mapping || state.step !== 'confirm') return;
    dispatch({ type: 'importStarted' });
    importer.mutate(
      { file, request: { mapping: mapped.mapping, parse, acknowledgeWarnings: acknowledge }, signal: nextSignal() },
      {
        onSuccess: (result) => {
          dispatch({ type: 'imported', result });
          preview.reset();
        },
        onError: (err) =>
          dispatch({
            type: 'importRefused',
            issues: err instanceof ApiError && Array.isArray(err.problem.issues) ? (err.problem.issues as ImportIssue[]) : null,
          }),
        onSettled: () => setProgress(null),
      },
    );
  };

  const issues = importIssues ?? (checked ? data.issues : []);
  const busy = preview.isPending || importer.isPending;

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-3">
        <LabelAbove id={fileId} label="CSV, TSV or Excel workbook (.xlsx), up to 10 MB" roomy>
          <input
            id={fileId}
            type="file"
            accept=".csv,.tsv,.txt,.xlsx,text/csv,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
            disabled={busy}
            onChange={(e) => choose(e.target.files?.[0] ?? null)}
            className="text-sm file:mr-3 file:rounded file:border file:border-slate-300 file:bg-white file:px-3 file:py-1.5 file:text-sm file:text-ink-800"
          />
        </LabelAbove>
        <a className="pb-1.5 text-sm text-fjord-700 underline" href={recordLinks.importTemplate(campaignId)} download>
          <span aria-hidden="true">⤓ </span>Download a template (CSV)
        </a>
      </div>
      {progress && (
        <div className="flex flex-wrap items-center gap-3">
          <ProgressLine progress={progress} label={importer.isPending ? 'Import' : 'Preview'} />
          {progress.phase === 'sending' && <Button onClick={() => abort.current?.abort()}>Cancel upload</Button>}
        </div>
      )}
      {done && (
        <p
          ref={(el) => {
            stepRef.current = el;
          }}
          tabIndex={-1}
          role="status"
          className="tnum rounded border border-fjord-600/40 bg-fjord-50 px-3 py-2 text-sm text-ink-900"
        >
          <span aria-hidden="true">✓ </span>Imported {done.inserted} row{done.inserted === 1 ? '' : 's'} at {done.distinctTemperatures}{' '}
          temperature
          {done.distinctTemperatures === 1 ? '' : 's'}, {fixed(done.temperatureRangeK.min - CELSIUS, 1)} to{' '}
          {fixed(done.temperatureRangeK.max - CELSIUS, 1)} °C
          {done.warningCount ? ` (${done.warningCount} warning${done.warningCount === 1 ? '' : 's'} acknowledged)` : ''}. The grid, fit and
          charts include them now.
        </p>
      )}
      {preview.error && (
        <p role="alert" className="text-sm font-medium text-rose-700">
          <span aria-hidden="true">✕ </span>
          {preview.error.message}
        </p>
      )}
      {file && data && draft && mapped && (
        <div className="flex flex-col gap-4">
          <section aria-label="How the file was read" className="flex flex-col gap-2 rounded border border-slate-200 bg-slate-50 px-3 py-2">
            <p className="text-sm text-ink-800">
              <span className="font-medium">{data.file.fileName}</span> · {data.file.format.toUpperCase()} · {data.rowCount} data row
              {data.rowCount === 1 ? '' : 's'} · {data.columns.length} columns
              {data.file.encoding ? ` · ${data.file.encoding}` : ''}
            </p>
            {data.file.detected.length > 0 && <p className="text-xs text-ink-600">Detected: {data.file.detected.join('; ')}.</p>}
            <div className="flex flex-wrap gap-4">
              {data.file.format === 'csv' && (
                <ParseSelect
                  id="parse-delimiter"
                  label="Delimiter"
                  value={parse.delimiter ?? data.file.delimiter ?? ','}
                  options={[
                    [',', 'comma ,'],
                    [';', 'semicolon ;'],
                    ['\t', 'tab'],
                  ]}
                  onChange={(v) => setParseOption({ ...parse, delimiter: v as ImportParseOptions['delimiter'] })}
                />
              )}
              <ParseSelect
                id="parse-decimal"
                label="Decimal separator"
                value={parse.decimalSeparator ?? data.file.decimalSeparator}
                options={[
                  ['.', 'point 1.5'],
                  [',', 'comma 1,5'],
                ]}
                onChange={(v) => setParseOption({ ...parse, decimalSeparator: v as ImportParseOptions['decimalSeparator'] })}
              />
              <ParseSelect
                id="parse-header"
                label="Header row"
                value={String(parse.headerRow ?? data.file.headerRow ?? 0)}
                options={[['0', 'none'], ...Array.from({ length: 10 }, (_, i) => [String(i + 1), `row ${i + 1}`] as [string, string])]}
                onChange={(v) => setParseOption({ ...parse, headerRow: Number(v) })}
              />
              {data.file.sheetNames.length > 1 && (
                <ParseSelect
                  id="parse-sheet"
                  label="Worksheet"
                  value={parse.sheet ?? data.file.sheetName ?? data.file.sheetNames[0]}
                  options={data.file.sheetNames.map((s) => [s, s] as [string, string])}
                  onChange={(v) => setParseOption({ ...parse, sheet: v })}
                />
              )}
            </div>
            {data.file.delimiter && !parse.delimiter && (
              <p className="sr-only">
                Delimiter {DELIMITER_TEXT[data.file.delimiter]}, decimal {data.file.decimalSeparator === ',' ? 'comma' : 'point'}.
              </p>
            )}
          </section>

          <ColumnMappingStep
            columns={data.columns}
            draft={draft}
            errors={mapped.errors}
            onChange={(d) => dispatch({ type: 'mappingEdited', draft: d })}
          />
          <div className="flex flex-wrap items-center gap-2">
            <Button disabled={!mapped.mapping || busy} onClick={() => file && runPreview(file, parse, state.revision, true)}>
              Check all rows with this mapping
            </Button>
            {!checked && mapped.mapping && <span className="text-xs text-ink-600">Check the rows before importing.</span>}
          </div>

          {checked && <PreviewSummary preview={data} focusRef={stepRef} />}
          {issues.length > 0 && (
            <IssueTable issues={issues} total={importIssues || !checked ? issues.length : data.errorCount + data.warningCount} />
          )}
          {checked && (
            <div className="flex flex-col gap-2">
              {data.warningCount > 0 && data.errorCount === 0 && (
                <label className="flex items-center gap-2 text-sm text-ink-800">
                  <input
                    type="checkbox"
                    checked={acknowledge}
                    onChange={(e) => dispatch({ type: 'acknowledged', value: e.target.checked })}
                  />
                  I have read the {data.warningCount} warning{data.warningCount === 1 ? '' : 's'} and want to import anyway
                </label>
              )}
              <div className="flex items-center gap-3">
                <Button variant="primary" disabled={busy || state.step !== 'confirm'} onClick={doImport}>
                  Import {data.validRowCount} row{data.validRowCount === 1 ? '' : 's'}
                </Button>
                <span className="text-xs text-ink-600">
                  {data.errorCount > 0
                    ? `Nothing can be imported until the ${data.errorCount} error${data.errorCount === 1 ? ' is' : 's are'} fixed in the file (all or nothing).`
                    : 'All rows are imported together, or none.'}
                </span>
              </div>
              {importer.error && !importIssues && (
                <p role="alert" className="text-sm font-medium text-rose-700">
                  <span aria-hidden="true">✕ </span>
                  {importer.error.message}
                </p>
              )}
            </div>
          )}
        </div>
      )}
    </div>
  );
}

function ParseSelect({
  onChange,
  ...props
}: {
  id: string;
  label: string;
  value: string;
  options: [string, string][];
  onChange: (v: string) => void;
}) {
  return <CompactSelect {...props} onChange={(v) => onChange(v ?? '')} />;
}

function PreviewSummary({ preview, focusRef }: { preview: ImportPreview; focusRef: RefObject<HTMLElement | null> }) {
  return (
    <section
      ref={(el) => {
        focusRef.current = el;
      }}
      tabIndex={-1}
      aria-label="Import preview"
      className="flex flex-col gap-2 focus:outline-none focus-visible:ring-2 focus-visible:ring-fjord-600"
    >
      <p className="tnum text-sm text-ink-800">
        <span className="font-medium">{preview.validRowCount}</span> of {preview.rowCount} rows ready ·{' '}
        <span className={preview.errorCount ? 'font-medium text-rose-700' : ''}>
          {preview.errorCount ? '✕ ' : ''}
          {preview.errorCount} error{preview.errorCount === 1 ? '' : 's'}
        </span>{' '}
        ·{' '}
        <span className={preview.warningCount ? 'font-medium text-caution-700' : ''}>
          {preview.warningCount ? '⚠ ' : ''}
          {preview.warningCount} warning{preview.warningCount === 1 ? '' : 's'}
        </span>
      </p>
      {preview.rows.length > 0 && (
        <div className="max-h-64 overflow-auto rounded border border-slate-200">
          <table className="tnum w-full border-collapse text-right text-xs">
            <caption className="sr-only">First rows as they would be stored</caption>
            <thead className="sticky top-0 bg-slate-50 text-ink-600">
              <tr className="border-b border-slate-200">
                <th scope="col" className="px-2 py-1 font-medium">
                  File row
                </th>
                <th scope="col" className="px-2 py-1 font-medium">
                  T (°C)
                </th>
                <th scope="col" className="px-2 py-1 font-medium">
                  T (K)
                </th>
                <th scope="col" className="px-2 py-1 text-left font-medium">
                  Selectivity
                </th>
                <th scope="col" className="px-2 py-1 font-medium">
                  ±
                </th>
                <th scope="col" className="px-2 py-1 text-left font-medium">
                  Sample
                </th>
                <th scope="col" className="px-2 py-1 font-medium">
                  Conv. (%)
                </th>
                <th scope="col" className="px-2 py-1 font-medium">
                  Time (h)
                </th>
              </tr>
            </thead>
            <tbody>
              {preview.rows.map((r) => (
                <tr key={r.sourceRow} className="border-b border-slate-100">
                  <td className="px-2 py-0.5 text-ink-500">{r.sourceRow}</td>
                  <td className="px-2 py-0.5">{fixed(r.temperatureK - CELSIUS, 2)}</td>
                  <td className="px-2 py-0.5 text-ink-600">{fixed(r.temperatureK, 2)}</td>
                  <td className="px-2 py-0.5 text-left">
                    {r.isLowerBound ? '≥ ' : ''}
                    {r.valueB !== null ? `${r.value}:${r.valueB}` : r.value} {MEASURE_LABEL[r.measure]}
                  </td>
                  <td className="px-2 py-0.5">{r.uncertainty ?? '—'}</td>
                  <td className="px-2 py-0.5 text-left">{r.sampleId ?? '—'}</td>
                  <td className="px-2 py-0.5">{r.conversionPercent ?? '—'}</td>
                  <td className="px-2 py-0.5">{r.reactionTimeS === null ? '—' : fixed(r.reactionTimeS / SECONDS_PER.h, 2)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {preview.rowCount > preview.rows.length && preview.rows.length > 0 && (
        <p className="text-xs text-ink-500">
          The first {preview.rows.length} rows are shown; all {preview.rowCount} were checked.
        </p>
      )}
    </section>
  );
}

export function IssueTable({ issues, total }: { issues: ImportIssue[]; total: number }) {
  return (
    <section aria-label="Problems in the file" className="flex flex-col gap-1">
      <div className="max-h-64 overflow-auto rounded border border-slate-200">
        <table className="w-full border-collapse text-left text-xs">
          <caption className="sr-only">Problems found in the file, by row</caption>
          <TableHead
            className="sticky top-0 bg-slate-50 text-ink-600"
            columns={[{ label: 'Kind' }, { label: 'Row', align: 'right' }, { label: 'Column' }, { label: 'Problem' }]}
          />
          <tbody>
            {issues.map((i, k) => (
              <tr key={k} className={`border-b border-slate-100 align-top ${i.severity === 'error' ? 'bg-rose-50/60' : 'bg-caution-50'}`}>
                <td
                  className={`whitespace-nowrap px-2 py-0.5 font-medium ${i.severity === 'error' ? 'text-rose-700' : 'text-caution-700'}`}
                >
                  {i.severity === 'error' ? '✕ error' : '⚠ warning'}
                </td>
                <td className="tnum px-2 py-0.5 text-right">{i.row ?? '—'}</td>
                <td className="px-2 py-0.5">{i.column ?? '—'}</td>
                <td className="px-2 py-0.5 text-ink-800">{i.message}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {total > issues.length && (
        <p className="text-xs text-ink-500">
          {issues.length} of {total} problems listed.
        </p>
      )}
    </section>
  );
}
