/**
 * The steps of a file import as one explicit state machine:
 *
 *   file → mapping → check → confirm → importing → done
 *                                           ↘ job (a large file imported in the background) → done
 *
 * `file`: nothing chosen. `mapping`: the server has read the file; the columns are being mapped and
 * the rows are not checked with this mapping yet. `check`: every row was checked with the current
 * mapping and something blocks the import (errors, or warnings not yet acknowledged). `confirm`:
 * checked and ready. Any change of file, reading options or mapping goes back to the step it
 * invalidates, so a stale check never lets a file in.
 */
import type { ImportParseOptions } from '../../../../api/features/campaigns/schemas';
import type { ImportIssue, ImportResult } from '../api/types';
import type { MappingDraft } from './import-mapping';

export type UploadStep = 'file' | 'mapping' | 'check' | 'confirm' | 'importing' | 'job' | 'done';

export interface UploadState {
  step: UploadStep;
  file: File | null;
  parse: ImportParseOptions;
  draft: MappingDraft | null;
  /** Bumped by every change of file, reading options or mapping; a check answers one revision. */
  revision: number;
  /** What the last check found, for the revision it checked. */
  checked: { errorCount: number; warningCount: number; validRowCount: number } | null;
  acknowledge: boolean;
  /** Problems the import itself reported (422), shown instead of the preview's. */
  importIssues: ImportIssue[] | null;
  done: ImportResult | null;
}

export type UploadEvent =
  | { type: 'chosen'; file: File | null }
  | { type: 'parseChanged'; parse: ImportParseOptions }
  | {
      type: 'previewed';
      revision: number;
      /** The header guess, used when there is no mapping yet (first look, new reading options). */
      suggested: MappingDraft;
      /** Counts when the rows were checked with a mapping; null when the server only read the file. */
      checked: { errorCount: number; warningCount: number; validRowCount: number } | null;
    }
  | { type: 'mappingEdited'; draft: MappingDraft }
  | { type: 'acknowledged'; value: boolean }
  | { type: 'importStarted' }
  | { type: 'jobQueued' }
  | { type: 'imported'; result: ImportResult }
  | { type: 'importRefused'; issues: ImportIssue[] | null };

export const initialUpload: UploadState = {
  step: 'file',
  file: null,
  parse: {},
  draft: null,
  revision: 0,
  checked: null,
  acknowledge: false,
  importIssues: null,
  done: null,
};

/** Checked rows can be imported when none is an error, at least one is ready and every warning is acknowledged. */
function afterCheck(checked: NonNullable<UploadState['checked']>, acknowledge: boolean): 'check' | 'confirm' {
  const ready = checked.errorCount === 0 && checked.validRowCount > 0 && (checked.warningCount === 0 || acknowledge);
  return ready ? 'confirm' : 'check';
}

export function uploadReducer(state: UploadState, event: UploadEvent): UploadState {
  switch (event.type) {
    case 'chosen':
      return { ...initialUpload, revision: state.revision + 1, file: event.file, step: event.file ? 'mapping' : 'file' };
    case 'parseChanged':
      // New reading options change the columns: the mapping starts again from the header guess.
      if (!state.file) return state;
      return {
        ...state,
        parse: event.parse,
        draft: null,
        checked: null,
        acknowledge: false,
        importIssues: null,
        step: 'mapping',
        revision: state.revision + 1,
      };
    case 'previewed': {
      if (event.revision !== state.revision || !state.file) return state;
      const draft = state.draft ?? event.suggested;
      if (!event.checked) return { ...state, draft, checked: null, step: 'mapping', importIssues: null };
      return { ...state, draft, checked: event.checked, importIssues: null, step: afterCheck(event.checked, state.acknowledge) };
    }
    case 'mappingEdited':
      if (!state.file) return state;
      return {
        ...state,
        draft: event.draft,
        checked: null,
        acknowledge: false,
        importIssues: null,
        step: 'mapping',
        revision: state.revision + 1,
      };
    case 'acknowledged':
      if (!state.checked) return state;
      return { ...state, acknowledge: event.value, step: afterCheck(state.checked, event.value) };
    case 'importStarted':
      return state.step === 'confirm' ? { ...state, step: 'importing', importIssues: null } : state;
    case 'jobQueued':
      return state.step === 'importing' ? { ...state, step: 'job' } : state;
    case 'imported':
      return { ...initialUpload, revision: state.revision + 1, step: 'done', done: event.result };
    case 'importRefused':
      // Nothing was written; the file and mapping stay so the user can fix and retry.
      if (state.step !== 'importing' && state.step !== 'job') return state;
      return { ...state, importIssues: event.issues, step: state.checked ? afterCheck(state.checked, state.acknowledge) : 'mapping' };
  }
}
