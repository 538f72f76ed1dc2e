import { describe, expect, it } from 'vitest';
import type { ImportResult } from '../../../web/features/campaigns/api/types';
import { draftFromSuggestion } from '../../../web/features/campaigns/lib/import-mapping';
import { initialUpload, uploadReducer, type UploadEvent, type UploadState } from '../../../web/features/campaigns/lib/upload-steps';

const file = new File(['T,ee\n-20,91\n'], 'screen-invented.csv', { type: 'text/csv' });
const guess = draftFromSuggestion({ columns: { temperature: 0, value: 1 }, temperatureUnit: 'C', measure: 'ee', timeUnit: 'h' } as never);
const edited = { ...guess, temperatureUnit: 'K' as const };
const clean = { errorCount: 0, warningCount: 0, validRowCount: 12 };
const result = { inserted: 12, distinctTemperatures: 6 } as unknown as ImportResult;

const run = (events: UploadEvent[], from: UploadState = initialUpload) => events.reduce(uploadReducer, from);
/** A file chosen and read (revision 1), its columns guessed. */
const read = () =>
  run([
    { type: 'chosen', file },
    { type: 'previewed', revision: 1, suggested: guess, checked: null },
  ]);

describe('upload steps', () => {
  it('when a file is chosen and read, then the mapping step starts from the header guess', () => {
    const chosen = uploadReducer(initialUpload, { type: 'chosen', file });
    expect(chosen).toMatchObject({ step: 'mapping', file, draft: null, revision: 1 });
    expect(read()).toMatchObject({ step: 'mapping', draft: guess, checked: null });
  });

  it('when the rows check clean, then the import can be confirmed; importing and done follow, and done clears the file', () => {
    const checked = uploadReducer(read(), { type: 'previewed', revision: 1, suggested: guess, checked: clean });
    expect(checked.step).toBe('confirm');
    const importing = uploadReducer(checked, { type: 'importStarted' });
    expect(importing.step).toBe('importing');
    const done = uploadReducer(importing, { type: 'imported', result });
    expect(done).toMatchObject({ step: 'done', done: result, file: null, draft: null, checked: null });
  });

  it('when the check finds warnings, then the import waits in check until they are acknowledged, and again if unticked', () => {
    const warned = uploadReducer(read(), { type: 'previewed', revision: 1, suggested: guess, checked: { ...clean, warningCount: 2 } });
    expect(warned.step).toBe('check');
    expect(uploadReducer(warned, { type: 'importStarted' }).step).toBe('check');
    const ok = uploadReducer(warned, { type: 'acknowledged', value: true });
    expect(ok.step).toBe('confirm');
    expect(uploadReducer(ok, { type: 'acknowledged', value: false }).step).toBe('check');
  });

  it('when the check finds an error or no ready row, then acknowledging cannot reach confirm', () => {
    const errors = uploadReducer(read(), {
      type: 'previewed',
      revision: 1,
      suggested: guess,
      checked: { ...clean, errorCount: 1, warningCount: 1 },
    });
    expect(uploadReducer(errors, { type: 'acknowledged', value: true }).step).toBe('check');
    const empty = uploadReducer(read(), { type: 'previewed', revision: 1, suggested: guess, checked: { ...clean, validRowCount: 0 } });
    expect(empty.step).toBe('check');
  });

  it('when the mapping is edited after a check, then the step goes back to mapping, the acknowledgement is dropped and a late answer for the old mapping is ignored', () => {
    const ok = run(
      [
        { type: 'previewed', revision: 1, suggested: guess, checked: { ...clean, warningCount: 1 } },
        { type: 'acknowledged', value: true },
        { type: 'mappingEdited', draft: edited },
      ],
      read(),
    );
    expect(ok).toMatchObject({ step: 'mapping', draft: edited, acknowledge: false, checked: null, revision: 2 });
    // The check sent before the edit answers revision 1: it must not mark the new mapping as checked.
    expect(uploadReducer(ok, { type: 'previewed', revision: 1, suggested: guess, checked: clean })).toBe(ok);
    const rechecked = uploadReducer(ok, { type: 'previewed', revision: 2, suggested: guess, checked: clean });
    expect(rechecked).toMatchObject({ step: 'confirm', draft: edited });
  });

  it('when reading options change, then the mapping starts again from the new header guess', () => {
    const checked = uploadReducer(read(), { type: 'previewed', revision: 1, suggested: guess, checked: clean });
    const reparsed = uploadReducer(checked, { type: 'parseChanged', parse: { delimiter: ';' } });
    expect(reparsed).toMatchObject({ step: 'mapping', parse: { delimiter: ';' }, draft: null, checked: null, revision: 2 });
    expect(uploadReducer(reparsed, { type: 'previewed', revision: 2, suggested: edited, checked: null }).draft).toEqual(edited);
  });

  it('when a large import runs as a job and is refused, then the issues show and the step returns to where the check left it', () => {
    const confirm = uploadReducer(read(), { type: 'previewed', revision: 1, suggested: guess, checked: clean });
    const job = run([{ type: 'importStarted' }, { type: 'jobQueued' }], confirm);
    expect(job.step).toBe('job');
    const issues = [{ severity: 'error' as const, row: 4, column: 'T', message: 'not a number' }];
    const refused = uploadReducer(job, { type: 'importRefused', issues: issues as never });
    expect(refused).toMatchObject({ step: 'confirm', importIssues: issues, file });
    // A job reported when nothing is being imported changes nothing.
    expect(uploadReducer(confirm, { type: 'jobQueued' })).toBe(confirm);
  });

  it('when the file is cleared, then everything starts over at the file step', () => {
    const checked = uploadReducer(read(), { type: 'previewed', revision: 1, suggested: guess, checked: clean });
    expect(uploadReducer(checked, { type: 'chosen', file: null })).toMatchObject({ step: 'file', file: null, draft: null, checked: null });
  });
});
