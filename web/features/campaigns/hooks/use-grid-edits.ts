import { useMemo, useState } from 'react';
import { ApiError } from '../../../lib/api-client';
import { useSaveGridRows } from '../api/measurements';
import type { Campaign, Measurement } from '../api/types';
import {
  batchErrorsToCells,
  cellsFromMeasurement,
  emptyCells,
  GRID_COLUMNS,
  isBlank,
  pasteBlock,
  rowToCreate,
  rowToUpdate,
  staleRowKeys,
  type CellErrors,
  type ColumnUnits,
  type GridCells,
  type GridColumn,
  type GridEdits,
} from '../lib/grid';

let draftCounter = 0;
const newDraftKey = () => `draft-${++draftCounter}`;

export interface GridRow {
  key: string;
  stored: Measurement | null;
  cells: GridCells;
  dirty: boolean;
}

export interface GridNotice {
  kind: 'info' | 'error';
  text: string;
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

const STALE_ROW = 'Changed by someone else since you loaded it — your edit was not saved. Discard it to see the current values.';

/**
 * The grid's edit state: typed cells of stored rows and new rows, the units they are read in, the
 * errors of each cell (as typed and from the server) and the save. A save sends the new rows in one
 * batch and the changed rows in one batched change (each all or nothing), then refreshes once.
 */
export function useGridEdits(campaign: Campaign, measurements: Measurement[]) {
  const [units, setUnits] = useState<ColumnUnits>({ temperature: 'C', measure: campaign.measure, time: 'h' });
  const [state, setState] = useState<GridEdits>({ edits: {}, drafts: [] });
  const [serverErrors, setServerErrors] = useState<Record<string, CellErrors>>({});
  const [rowProblems, setRowProblems] = useState<Record<string, string>>({});
  const [notice, setNotice] = useState<GridNotice | null>(null);
  const [saving, setSaving] = useState(false);
  const [editReason, setEditReason] = useState('');
  const saveRows = useSaveGridRows(campaign.id, campaign.projectId);

  const rows: GridRow[] = useMemo(() => {
    const stored = measurements.map((m) => {
      const base = cellsFromMeasurement(m, units);
      const edit = state.edits[m.id];
      const cells = edit ? { ...base, ...edit } : base;
      const dirty = !!edit && GRID_COLUMNS.some((c) => cells[c].trim() !== base[c].trim());
      return { key: m.id, stored: m, cells, dirty };
    });
    const drafts = state.drafts.map((d) => ({ key: d.key, stored: null, cells: d.cells, dirty: !isBlank(d.cells) }));
    return [...stored, ...drafts];
  }, [measurements, units, state]);

  // Check the rows being edited as they are typed.
  const clientErrors = useMemo(() => {
    const out: Record<string, CellErrors> = {};
    for (const r of rows) {
      if (!r.dirty) continue;
      const { errors } = rowToCreate(r.cells, units);
      if (Object.keys(errors).length) out[r.key] = errors;
    }
    return out;
  }, [rows, units]);

  const dirtyCount = rows.filter((r) => r.dirty).length;
  const editedStoredCount = rows.filter((r) => r.stored && r.dirty).length;
  const reasonMissing = editedStoredCount > 0 && editReason.trim().length < 3;

  const setCell = (row: GridRow, col: GridColumn, text: string) => {
    setServerErrors((all) => {
      if (!all[row.key]?.[col]) return all;
      const { [col]: _gone, ...rest } = all[row.key];
      return { ...all, [row.key]: rest };
    });
    setState((s) =>
      row.stored
        ? { ...s, edits: { ...s.edits, [row.key]: { ...s.edits[row.key], [col]: text } } }
        : { ...s, drafts: s.drafts.map((d) => (d.key === row.key ? { ...d, cells: { ...d.cells, [col]: text } } : d)) },
    );
  };

  const restoreCell = (row: GridRow, col: GridColumn) => {
    if (row.stored) {
      setState((s) => {
        const { [col]: _gone, ...rest } = s.edits[row.key] ?? {};
        return { ...s, edits: { ...s.edits, [row.key]: rest } };
      });
    } else setCell(row, col, '');
  };

  const addDraft = () => setState((s) => ({ ...s, drafts: [...s.drafts, { key: newDraftKey(), cells: emptyCells() }] }));
  const removeDraft = (key: string) => setState((s) => ({ ...s, drafts: s.drafts.filter((d) => d.key !== key) }));
  const setRowProblem = (key: string, text: string) => setRowProblems((p) => ({ ...p, [key]: text }));

  const paste = (rowIndex: number, colIndex: number, block: string[][]) => {
    const result = pasteBlock(
      state,
      rows.map((r) => r.key),
      new Set(measurements.map((m) => m.id)),
      rowIndex,
      colIndex,
      block,
      newDraftKey,
    );
    setState(result.state);
    const parts = [`Pasted ${plural(result.rows, 'row')}; check the marked cells, then save.`];
    if (result.headerSkipped) parts.push('The first line looked like headings and was skipped.');
    if (result.droppedColumns)
      parts.push(`${plural(result.droppedColumns, 'column')} beyond Notes ${result.droppedColumns === 1 ? 'was' : 'were'} left out.`);
    setNotice({ kind: 'info', text: parts.join(' ') });
  };

  const discard = () => {
    setState({ edits: {}, drafts: [] });
    setServerErrors({});
    setRowProblems({});
    setNotice(null);
  };

  async function save() {
    if (saving) return;
    const drafts = rows.filter((r) => !r.stored && r.dirty);
    const edited = rows.filter((r) => r.stored && r.dirty);
    if (Object.keys(clientErrors).length > 0) {
      setNotice({ kind: 'error', text: 'Nothing saved: fix the marked cells first (the reason is under each one).' });
      return;
    }
    if (edited.length > 0 && editReason.trim().length < 3) {
      setNotice({ kind: 'error', text: 'Nothing saved: say why the stored runs change (at least 3 characters); the history keeps it.' });
      return;
    }
    setSaving(true);
    setNotice(null);
    const nextServer: Record<string, CellErrors> = {};
    const problems: Record<string, string> = {};
    const general: string[] = [];
    let savedDrafts = false;
    let savedEdits: string[] = [];
    try {
      if (drafts.length) {
        try {
          await saveRows.create(drafts.map((r) => rowToCreate(r.cells, units).body!));
          savedDrafts = true;
        } catch (err) {
          if (err instanceof ApiError && err.fieldErrors.length) {
            const mapped = batchErrorsToCells(
              err.fieldErrors,
              drafts.map((d) => d.key),
            );
            Object.assign(nextServer, mapped.byKey);
            general.push(...mapped.other);
            if (!mapped.other.length) general.push('No new row was saved (all or nothing): fix the marked cells and save again.');
          } else general.push(err instanceof Error ? err.message : 'Saving the new rows failed.');
        }
      }
      // Rows whose cells were retyped to what is stored change nothing and need no request.
      const changes = edited.flatMap((r) => {
        const { body } = rowToUpdate(r.stored!, r.cells, units);
        return body ? [{ key: r.key, body: { ...body, id: r.key, reason: editReason.trim() } }] : [];
      });
      const unchanged = edited.filter((r) => !changes.some((c) => c.key === r.key)).map((r) => r.key);
      savedEdits = unchanged;
      if (changes.length) {
        const sentKeys = changes.map((c) => c.key);
        try {
          await saveRows.update(changes.map((c) => c.body));
          savedEdits = [...unchanged, ...sentKeys];
        } catch (err) {
          const conflict = err instanceof ApiError && err.status === 409;
          const stale = conflict ? staleRowKeys(err.problem, sentKeys) : [];
          if (conflict && err.problem.signedOff) {
            general.push(err.message);
          } else if (conflict) {
            // Without a list of stale rows, every row sent may be the stale one.
            for (const key of stale.length ? stale : sentKeys) problems[key] = STALE_ROW;
            if (sentKeys.length > 1) general.push('No changed row was saved (all or nothing): someone else changed the marked rows first.');
          } else if (err instanceof ApiError && err.fieldErrors.length) {
            const mapped = batchErrorsToCells(err.fieldErrors, sentKeys);
            Object.assign(nextServer, mapped.byKey);
            Object.assign(problems, mapped.rowOther);
            const unplaced = err.fieldErrors.filter((e) => !/^measurements\.\d+/.test(e.path)).map((e) => e.message);
            general.push(...unplaced);
          } else general.push(err instanceof Error ? err.message : 'Saving the changed rows failed.');
        }
      }
    } finally {
      setSaving(false);
      // One refresh for the whole save, whatever was stored.
      void saveRows.refresh();
    }
    setServerErrors(nextServer);
    setRowProblems(problems);
    if (!Object.keys(problems).length && !Object.keys(nextServer).length && !general.length) setEditReason('');
    setState((s) => ({
      edits: Object.fromEntries(Object.entries(s.edits).filter(([k]) => !savedEdits.includes(k))),
      drafts: savedDrafts ? [] : s.drafts,
    }));
    const failed = general.length + Object.keys(problems).length + Object.keys(nextServer).length;
    setNotice(
      failed
        ? { kind: 'error', text: general.join(' ') || 'Some rows were not saved; see the marked rows.' }
        : {
            kind: 'info',
            text: `Saved ${plural(savedDrafts ? drafts.length : 0, 'new row')} and ${plural(savedEdits.length, 'changed row')}. The fit below is up to date.`,
          },
    );
  }

  return {
    units,
    setUnits,
    rows,
    clientErrors,
    serverErrors,
    rowProblems,
    setRowProblem,
    notice,
    setNotice,
    saving,
    editReason,
    setEditReason,
    dirtyCount,
    draftCount: state.drafts.length,
    editedStoredCount,
    reasonMissing,
    setCell,
    restoreCell,
    addDraft,
    removeDraft,
    paste,
    discard,
    save,
  };
}
