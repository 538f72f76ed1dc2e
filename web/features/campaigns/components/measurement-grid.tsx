import { useCallback, useEffect, useMemo, useRef, useState, type ClipboardEvent, type KeyboardEvent } from 'react';
import { useVirtualizer } from '@tanstack/react-virtual';
import type { SelectivityMeasure, TemperatureUnit, TimeUnit } from '../../../../api/features/campaigns/schemas';
import { Button } from '../../../components/ui/form';
import { useDeleteMeasurement, useSetExclusion } from '../api/measurements';
import type { Campaign, Measurement } from '../api/types';
import { useGridEdits, type GridRow } from '../hooks/use-grid-edits';
import { GRID_COLUMNS, parsePastedBlock, type GridColumn } from '../lib/grid';
import { MEASURE_LABEL, uncertaintyUnit } from '../lib/labels';
import { ExclusionForm } from './exclusion-form';
import { measureRowAfterLayout, observeBoxAfterLayout, scrollBoxTo } from '../../../lib/virtual-rows';

const TEMPERATURE_UNITS: { value: TemperatureUnit; label: string }[] = [
  { value: 'C', label: '°C' },
  { value: 'K', label: 'K' },
  { value: 'F', label: '°F' },
];
const TIME_UNITS: { value: TimeUnit; label: string }[] = [
  { value: 'h', label: 'h' },
  { value: 'min', label: 'min' },
  { value: 's', label: 's' },
];
const MEASURES: SelectivityMeasure[] = ['ee', 'percentA', 'er', 'dr', 'ratio'];

/** Above this many rows only those in view are drawn (the grid scrolls in its own box). */
const VIRTUAL_FROM_ROWS = 120;
/**
 * Height of a row before it is measured (px): a line of cells (inputs where the runs can be edited,
 * text where they cannot), or two lines in the status cell when it also gives the replicates' mean.
 * Estimates that match what the browser then measures keep the virtualizer from drawing the grid a
 * second time, with other rows, as soon as the sizes come in.
 */
const ROW_HEIGHT = { inputs: 31, text: 29, withReplicates: 41 };
/**
 * The box before the browser has measured it: its own height cap (70 % of the window, read without
 * a layout) less its top and bottom border, the height it is then measured at.
 */
const initialRect = () => ({ width: 1200, height: typeof window === 'undefined' ? 700 : Math.floor(window.innerHeight * 0.7) - 2 });

const COLUMN_TITLE: Record<GridColumn, string> = {
  temperature: 'Temperature',
  value: 'Selectivity',
  uncertainty: 'Uncertainty',
  sampleId: 'Sample id',
  replicateLabel: 'Replicate',
  conversionPercent: 'Conversion (%)',
  reactionTime: 'Time',
  notes: 'Notes',
};
const CELL_WIDTH: Record<GridColumn, string> = {
  temperature: 'w-20',
  value: 'w-24',
  uncertainty: 'w-16',
  sampleId: 'w-32',
  replicateLabel: 'w-14',
  conversionPercent: 'w-16',
  reactionTime: 'w-16',
  notes: 'w-40',
};
const NUMERIC: GridColumn[] = ['temperature', 'value', 'uncertainty', 'conversionPercent', 'reactionTime'];

/**
 * Keyboard-first measurement grid. Arrow keys move between rows, Enter moves down (and adds a
 * row at the end), Escape restores a cell, Ctrl+Enter saves; a block copied from a spreadsheet
 * pastes from the focused cell down and right. Every cell is checked as typed with the API's
 * own schema and the reason is shown under it; the server's field errors land on the same cells.
 */
export function MeasurementGrid({
  campaign,
  measurements,
  canEdit,
}: {
  campaign: Campaign;
  measurements: Measurement[];
  canEdit: boolean;
}) {
  const grid = useGridEdits(campaign, measurements);
  const { units, setUnits, rows, clientErrors, serverErrors, rowProblems, setRowProblem, notice, saving, editReason, setEditReason } = grid;
  const { dirtyCount, editedStoredCount, reasonMissing, setCell, restoreCell, addDraft, discard, save } = grid;
  const [excluding, setExcluding] = useState<string | null>(null);
  const [confirmDelete, setConfirmDelete] = useState<string | null>(null);
  const [pendingFocus, setPendingFocus] = useState<{ row: number; col: number } | null>(null);
  const [deleteReason, setDeleteReason] = useState('');
  const tableRef = useRef<HTMLTableElement>(null);
  const scrollRef = useRef<HTMLDivElement>(null);

  const exclusion = useSetExclusion(campaign.id, campaign.projectId);
  const deleteRow = useDeleteMeasurement(campaign.id, campaign.projectId);

  const replicateSummary = useMemo(() => replicateStats(measurements), [measurements]);

  const virtual = rows.length >= VIRTUAL_FROM_ROWS;
  // Stable callbacks: the virtualizer recomputes every row position when one of them changes.
  const getItemKey = useCallback((i: number) => rows[i]?.key ?? i, [rows]);
  const estimateSize = useCallback(
    (i: number) => {
      const stored = rows[i]?.stored;
      if (stored && replicateSummary.has(stored.id)) return ROW_HEIGHT.withReplicates;
      return canEdit ? ROW_HEIGHT.inputs : ROW_HEIGHT.text;
    },
    [rows, replicateSummary, canEdit],
  );
  const virtualizer = useVirtualizer({
    count: virtual ? rows.length : 0,
    getScrollElement: () => scrollRef.current,
    estimateSize,
    overscan: 12,
    // Until the box is measured, draw what a typical screen shows.
    initialRect: initialRect(),
    getItemKey,
    measureElement: measureRowAfterLayout,
    observeElementRect: observeBoxAfterLayout,
    scrollToFn: scrollBoxTo,
  });
  const items = virtual ? virtualizer.getVirtualItems() : rows.map((_, index) => ({ index, start: 0, key: rows[index].key }));
  const padTop = virtual && items.length ? items[0].start : 0;
  const padBottom = virtual && items.length ? virtualizer.getTotalSize() - (items[items.length - 1] as { end?: number }).end! : 0;
  const firstShown = items.length ? items[0].index : 0;

  useEffect(() => {
    if (!pendingFocus) return;
    const el = tableRef.current?.querySelector<HTMLInputElement>(`[data-cell="${pendingFocus.row}:${pendingFocus.col}"]`);
    if (!el && virtual) {
      // The row is outside the drawn window: bring it in; this runs again once it is drawn.
      virtualizer.scrollToIndex(pendingFocus.row, { align: 'auto' });
      return;
    }
    el?.focus();
    el?.select();
    setPendingFocus(null);
  }, [pendingFocus, rows.length, virtual, virtualizer, firstShown]);

  const addRow = () => {
    addDraft();
    setPendingFocus({ row: rows.length, col: 0 });
  };

  const onKeyDown = (e: KeyboardEvent<HTMLInputElement>, rowIndex: number, colIndex: number, row: GridRow, col: GridColumn) => {
    if (e.key === 'Enter' && (e.ctrlKey || e.metaKey)) {
      e.preventDefault();
      void save();
    } else if (e.key === 'Enter' || e.key === 'ArrowDown') {
      e.preventDefault();
      if (rowIndex + 1 < rows.length) setPendingFocus({ row: rowIndex + 1, col: colIndex });
      else if (e.key === 'Enter') {
        addDraft();
        setPendingFocus({ row: rowIndex + 1, col: colIndex });
      }
    } else if (e.key === 'ArrowUp') {
      e.preventDefault();
      if (rowIndex > 0) setPendingFocus({ row: rowIndex - 1, col: colIndex });
    } else if ((e.key === 'ArrowLeft' || e.key === 'ArrowRight') && !e.shiftKey) {
      // Left and right move to the next cell once the caret is at the edge of the text.
      const input = e.currentTarget;
      const atStart = input.selectionStart === 0 && input.selectionEnd === 0;
      const atEnd = input.selectionStart === input.value.length && input.selectionEnd === input.value.length;
      const next = e.key === 'ArrowLeft' ? (atStart ? colIndex - 1 : -1) : atEnd ? colIndex + 1 : -1;
      if (next >= 0 && next < GRID_COLUMNS.length) {
        e.preventDefault();
        setPendingFocus({ row: rowIndex, col: next });
      }
    } else if (e.key === 'Escape') {
      restoreCell(row, col);
    }
  };

  const onPaste = (e: ClipboardEvent<HTMLInputElement>, rowIndex: number, colIndex: number) => {
    const block = parsePastedBlock(e.clipboardData.getData('text/plain'));
    if (!block) return;
    e.preventDefault();
    grid.paste(rowIndex, colIndex, block);
  };

  const measureOptions = MEASURES.map((m) => ({ value: m, label: MEASURE_LABEL[m] }));

  return (
    <div className="flex flex-col gap-2">
      {canEdit && (
        <p className="text-xs text-ink-600">
          Type into the cells, or paste a block copied from a spreadsheet (columns in this order, from the cell you paste into). ↑ ↓ and
          Enter move between rows, ← → between cells at the edge of the text, Esc restores a cell,{' '}
          <kbd className="rounded border border-slate-300 px-1">Ctrl</kbd>+<kbd className="rounded border border-slate-300 px-1">Enter</kbd>{' '}
          saves. Write a lower bound as “≥99.8”; er and dr as “95:5”.
        </p>
      )}
      <div ref={scrollRef} className={`overflow-x-auto rounded border border-slate-200 ${virtual ? 'max-h-[70vh] overflow-y-auto' : ''}`}>
        <table ref={tableRef} className="tnum w-full border-collapse text-sm" aria-label="Measurements">
          <thead className={`bg-slate-50 text-xs text-ink-600 ${virtual ? 'sticky top-0 z-10' : ''}`}>
            <tr className="border-b border-slate-200 align-bottom">
              <th scope="col" className="px-2 py-1.5 text-right font-medium">
                #
              </th>
              {GRID_COLUMNS.map((col) => (
                <th key={col} scope="col" className={`px-1.5 py-1.5 font-medium ${NUMERIC.includes(col) ? 'text-right' : 'text-left'}`}>
                  <span className="block">{COLUMN_TITLE[col]}</span>
                  {col === 'temperature' && (
                    <UnitSelect
                      label="Temperature unit"
                      value={units.temperature}
                      options={TEMPERATURE_UNITS}
                      onChange={(temperature) => setUnits((u) => ({ ...u, temperature }))}
                    />
                  )}
                  {col === 'value' && (
                    <UnitSelect
                      label="Selectivity measure"
                      value={units.measure}
                      options={measureOptions}
                      onChange={(measure) => setUnits((u) => ({ ...u, measure }))}
                    />
                  )}
                  {col === 'uncertainty' && <span className="block font-normal">± {uncertaintyUnit(units.measure)}</span>}
                  {col === 'reactionTime' && (
                    <UnitSelect
                      label="Time unit"
                      value={units.time}
                      options={TIME_UNITS}
                      onChange={(time) => setUnits((u) => ({ ...u, time }))}
                    />
                  )}
                </th>
              ))}
              <th scope="col" className="px-2 py-1.5 text-left font-medium">
                In the fit
              </th>
              {canEdit && (
                <th scope="col" className="px-2 py-1.5 text-left font-medium">
                  <span className="sr-only">Actions</span>
                </th>
              )}
            </tr>
          </thead>
          {padTop > 0 && (
            <tbody aria-hidden="true">
              <tr style={{ height: padTop }} />
            </tbody>
          )}
          <tbody>
            {rows.length === 0 && (
              <tr>
                <td colSpan={GRID_COLUMNS.length + 3} className="px-3 py-6 text-center text-sm text-ink-500">
                  No measurements yet.{canEdit ? ' Add a row, paste from a spreadsheet, or upload a file below.' : ''}
                </td>
              </tr>
            )}
          </tbody>
          {items.map(({ index: rowIndex }) => {
            const row = rows[rowIndex];
            const errs = { ...clientErrors[row.key], ...serverErrors[row.key] };
            const excluded = row.stored?.excluded ?? false;
            const problem = rowProblems[row.key];
            return (
              <tbody key={row.key} data-index={rowIndex} ref={virtual ? virtualizer.measureElement : undefined}>
                <tr
                  className={`border-b border-slate-100 align-top ${excluded ? 'bg-slate-50 text-ink-500' : ''} ${row.dirty ? 'bg-fjord-50/60' : ''}`}
                  aria-label={`Row ${rowIndex + 1}${row.stored ? '' : ' (new)'}${excluded ? ' (excluded)' : ''}`}
                >
                  <td className="px-2 py-1 text-right text-xs text-ink-500">
                    {rowIndex + 1}
                    {row.dirty && (
                      <span className="ml-0.5 text-fjord-700" title="unsaved">
                        *<span className="sr-only"> unsaved</span>
                      </span>
                    )}
                  </td>
                  {GRID_COLUMNS.map((col, colIndex) => (
                    <td key={col} className="px-1 py-0.5">
                      {canEdit ? (
                        <GridInput
                          cell={`${rowIndex}:${colIndex}`}
                          label={`${COLUMN_TITLE[col]}, row ${rowIndex + 1}`}
                          value={row.cells[col]}
                          error={errs[col]}
                          numeric={NUMERIC.includes(col)}
                          width={CELL_WIDTH[col]}
                          onChange={(t) => setCell(row, col, t)}
                          onKeyDown={(e) => onKeyDown(e, rowIndex, colIndex, row, col)}
                          onPaste={(e) => onPaste(e, rowIndex, colIndex)}
                          subtle={!!row.stored && !row.dirty}
                        />
                      ) : (
                        <span
                          className={`block px-1 py-0.5 ${NUMERIC.includes(col) ? 'text-right' : ''} ${col === 'notes' ? 'max-w-xs truncate' : ''}`}
                        >
                          {row.cells[col] || <span className="text-ink-500">—</span>}
                        </span>
                      )}
                    </td>
                  ))}
                  <td className="px-2 py-1 text-xs">
                    <StatusText m={row.stored} />
                    {row.stored && replicateSummary.get(row.stored.id) && (
                      <span
                        className="block whitespace-nowrap text-ink-600"
                        title="Mean ± standard deviation of the fitted replicates at this temperature"
                      >
                        {replicateSummary.get(row.stored.id)}
                      </span>
                    )}
                  </td>
                  {canEdit && (
                    <td className="whitespace-nowrap px-2 py-0.5 text-xs">
                      {row.stored ? (
                        confirmDelete === row.key ? (
                          <span className="flex flex-wrap items-center gap-1">
                            <label className="flex items-center gap-1">
                              Why delete?
                              <input
                                autoFocus
                                value={deleteReason}
                                onChange={(e) => setDeleteReason(e.target.value)}
                                placeholder="kept in the history"
                                className="w-40 rounded border border-slate-300 px-1.5 py-0.5"
                              />
                            </label>
                            <button
                              type="button"
                              className="rounded border border-rose-700 px-1.5 py-0.5 text-rose-700 disabled:opacity-50"
                              disabled={deleteReason.trim().length < 3 || deleteRow.isPending}
                              onClick={() =>
                                deleteRow.mutate(
                                  { id: row.key, version: row.stored!.version, reason: deleteReason.trim() },
                                  {
                                    onError: (err) => setRowProblem(row.key, err.message),
                                    onSettled: () => {
                                      setConfirmDelete(null);
                                      setDeleteReason('');
                                    },
                                  },
                                )
                              }
                            >
                              Delete
                            </button>
                            <button
                              type="button"
                              className="rounded border border-slate-300 px-1.5 py-0.5"
                              onClick={() => {
                                setConfirmDelete(null);
                                setDeleteReason('');
                              }}
                            >
                              Keep
                            </button>
                          </span>
                        ) : (
                          <span className="flex gap-1">
                            {row.stored.excluded ? (
                              <button
                                type="button"
                                className="rounded border border-slate-300 px-1.5 py-0.5 hover:bg-slate-50"
                                aria-label={`Include row ${rowIndex + 1} in the fit again`}
                                onClick={() =>
                                  exclusion.mutate(
                                    { id: row.key, body: { excluded: false, version: row.stored!.version } },
                                    { onError: (err) => setRowProblem(row.key, err.message) },
                                  )
                                }
                              >
                                Include
                              </button>
                            ) : (
                              <button
                                type="button"
                                className="rounded border border-slate-300 px-1.5 py-0.5 hover:bg-slate-50"
                                aria-label={`Exclude row ${rowIndex + 1} from the fit`}
                                aria-expanded={excluding === row.key}
                                onClick={() => setExcluding(excluding === row.key ? null : row.key)}
                              >
                                Exclude…
                              </button>
                            )}
                            <button
                              type="button"
                              className="rounded border border-slate-300 px-1.5 py-0.5 text-rose-700 hover:bg-rose-50"
                              aria-label={`Delete row ${rowIndex + 1}`}
                              onClick={() => setConfirmDelete(row.key)}
                            >
                              Delete
                            </button>
                          </span>
                        )
                      ) : (
                        <button
                          type="button"
                          className="rounded border border-slate-300 px-1.5 py-0.5 hover:bg-slate-50"
                          aria-label={`Remove new row ${rowIndex + 1}`}
                          onClick={() => grid.removeDraft(row.key)}
                        >
                          Remove
                        </button>
                      )}
                    </td>
                  )}
                </tr>
                {excluding === row.key && row.stored && (
                  <tr className="border-b border-slate-100 bg-slate-50">
                    <td />
                    <td colSpan={GRID_COLUMNS.length + 2} className="px-2 py-2">
                      <ExclusionForm
                        rowLabel={`row ${rowIndex + 1}`}
                        pending={exclusion.isPending}
                        onCancel={() => setExcluding(null)}
                        onSubmit={(reason) =>
                          exclusion
                            .mutateAsync({ id: row.key, body: { excluded: true, reason, version: row.stored!.version } })
                            .then(() => setExcluding(null))
                        }
                      />
                    </td>
                  </tr>
                )}
                {problem && (
                  <tr>
                    <td />
                    <td colSpan={GRID_COLUMNS.length + 2} className="px-2 pb-1.5">
                      <p role="alert" className="text-xs font-medium text-rose-700">
                        <span aria-hidden="true">✕ </span>
                        {problem}
                      </p>
                    </td>
                  </tr>
                )}
              </tbody>
            );
          })}
          {padBottom > 0 && (
            <tbody aria-hidden="true">
              <tr style={{ height: padBottom }} />
            </tbody>
          )}
        </table>
      </div>
      {virtual && (
        <p className="text-xs text-ink-600">{plural(rows.length, 'row')}, sorted by temperature; the grid scrolls in its own box.</p>
      )}
      {canEdit && editedStoredCount > 0 && (
        <label className="flex flex-wrap items-center gap-2 text-sm">
          <span>
            Why do {editedStoredCount === 1 ? 'this stored run' : `these ${editedStoredCount} stored runs`} change?{' '}
            <span className="text-ink-600">(kept in the history)</span>
          </span>
          <input
            value={editReason}
            onChange={(e) => setEditReason(e.target.value)}
            placeholder="e.g. integration corrected"
            aria-invalid={reasonMissing || undefined}
            className="w-72 max-w-full rounded border border-slate-300 px-2 py-1"
          />
        </label>
      )}
      {canEdit && (
        <div className="flex flex-wrap items-center gap-2">
          <Button onClick={() => addRow()}>Add row</Button>
          <Button variant="primary" disabled={dirtyCount === 0 || saving || reasonMissing} onClick={() => void save()}>
            {saving ? 'Saving…' : dirtyCount ? `Save ${dirtyCount} row${dirtyCount === 1 ? '' : 's'}` : 'Saved'}
          </Button>
          {(dirtyCount > 0 || grid.draftCount > 0) && <Button onClick={discard}>Discard changes</Button>}
          <span className="text-xs text-ink-500">New rows are saved together, all or none.</span>
        </div>
      )}
      {notice && (
        <p
          role={notice.kind === 'error' ? 'alert' : 'status'}
          className={`text-sm ${notice.kind === 'error' ? 'font-medium text-rose-700' : 'text-ink-700'}`}
        >
          {notice.kind === 'error' && <span aria-hidden="true">✕ </span>}
          {notice.text}
        </p>
      )}
    </div>
  );
}

function StatusText({ m }: { m: Measurement | null }) {
  if (!m) return <span className="text-ink-500">new</span>;
  if (m.excluded) {
    return (
      <span className="block max-w-[14rem]">
        <span aria-hidden="true">○ </span>excluded
        {m.excludedReason && <span className="block text-ink-600">“{m.excludedReason}”</span>}
      </span>
    );
  }
  if (m.isLowerBound) {
    return (
      <span title="A lower bound: used as a bound, not as an exact value">
        <span aria-hidden="true">◆ </span>lower bound
      </span>
    );
  }
  return (
    <span>
      <span aria-hidden="true">● </span>fitted
    </span>
  );
}

function UnitSelect<T extends string>({
  label,
  value,
  options,
  onChange,
}: {
  label: string;
  value: T;
  options: { value: T; label: string }[];
  onChange: (v: T) => void;
}) {
  return (
    <select
      aria-label={label}
      value={value}
      onChange={(e) => onChange(e.target.value as T)}
      className="mt-0.5 rounded border border-slate-300 bg-white px-1 py-0.5 text-xs font-normal text-ink-900"
    >
      {options.map((o) => (
        <option key={o.value} value={o.value}>
          {o.label}
        </option>
      ))}
    </select>
  );
}

function GridInput({
  cell,
  label,
  value,
  error,
  numeric,
  width,
  onChange,
  onKeyDown,
  onPaste,
  subtle,
}: {
  /** Stored, unchanged cells look like text until hovered or focused; new and edited cells look like inputs. */
  subtle: boolean;
  cell: string;
  label: string;
  value: string;
  error?: string;
  numeric: boolean;
  width: string;
  onChange: (text: string) => void;
  onKeyDown: (e: KeyboardEvent<HTMLInputElement>) => void;
  onPaste: (e: ClipboardEvent<HTMLInputElement>) => void;
}) {
  const errorId = `cell-${cell.replace(':', '-')}-error`;
  return (
    <div className="flex flex-col">
      <input
        data-cell={cell}
        aria-label={label}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? errorId : undefined}
        inputMode={numeric ? 'decimal' : 'text'}
        autoComplete="off"
        spellCheck={false}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        onKeyDown={onKeyDown}
        onPaste={onPaste}
        className={`${width} rounded border px-1.5 py-0.5 text-sm ${numeric ? 'text-right' : ''} ${
          error
            ? 'border-rose-600 bg-rose-50'
            : subtle
              ? 'border-transparent bg-transparent hover:border-slate-300 focus:border-fjord-600 focus:bg-white'
              : 'border-slate-300 bg-white focus:border-fjord-600'
        }`}
      />
      {error && (
        <span id={errorId} className={`${width} mt-0.5 text-[11px] leading-tight text-rose-700`}>
          <span aria-hidden="true">✕ </span>
          {error}
        </span>
      )}
    </div>
  );
}

const plural = (n: number, one: string) => `${n} ${n === 1 ? one : `${one}s`}`;

/**
 * "mean ± SD" of the fitted replicates at each temperature (to 0.01 K), keyed by measurement id,
 * for temperatures with two or more replicates reported as one plain number in one measure.
 */
export function replicateStats(measurements: Measurement[]): Map<string, string> {
  const groups = new Map<string, Measurement[]>();
  for (const m of measurements) {
    if (m.excluded || m.isLowerBound || m.valueB !== null) continue;
    const key = `${m.temperatureK.toFixed(2)}|${m.measure}`;
    groups.set(key, [...(groups.get(key) ?? []), m]);
  }
  const out = new Map<string, string>();
  for (const group of groups.values()) {
    if (group.length < 2) continue;
    const n = group.length;
    const mean = group.reduce((s, m) => s + m.value, 0) / n;
    const sd = Math.sqrt(group.reduce((s, m) => s + (m.value - mean) ** 2, 0) / (n - 1));
    // As many decimals as the most precise replicate, at most 2.
    const decimals = Math.min(2, Math.max(...group.map((m) => (String(m.value).split('.')[1] ?? '').length)));
    const unit = group[0].measure === 'ee' || group[0].measure === 'percentA' ? ' %' : '';
    const text = `mean ${mean.toFixed(decimals)} ± ${sd.toFixed(Math.max(decimals, 1))}${unit} (n = ${n})`.replace(/-/g, '−');
    for (const m of group) out.set(m.id, text);
  }
  return out;
}
