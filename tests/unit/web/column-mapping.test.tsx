// @vitest-environment happy-dom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useState } from 'react';
import { importRequestSchema } from '../../../api/features/campaigns/schemas';
import { draftFromSuggestion, mappingFromDraft, type MappingDraft } from '../../../web/features/campaigns/lib/import-mapping';
import { ColumnMappingStep } from '../../../web/features/campaigns/components/column-mapping-step';
import { UploadWizard } from '../../../web/features/campaigns/components/upload-wizard';
import type { ImportPreview, PreviewColumn, SuggestedMapping } from '../../../web/features/campaigns/api/types';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

// Headers and first values as in samples/kestrelmoor-skylark-screen.csv (invented data).
const columns: PreviewColumn[] = [
  { index: 0, letter: 'A', header: 'sample_id', sample: ['KL7702-S-001', 'KL7702-S-002'] },
  { index: 1, letter: 'B', header: 'replicate', sample: ['a', 'b'] },
  { index: 2, letter: 'C', header: 'T (K)', sample: ['313.15', '313.15'] },
  { index: 3, letter: 'D', header: 'ee (%)', sample: ['95.5', '95.8'] },
  { index: 4, letter: 'E', header: 'sd (% ee)', sample: ['0.3', '0.3'] },
  { index: 5, letter: 'F', header: 'conversion (%)', sample: ['100', '100'] },
  { index: 6, letter: 'G', header: 'time (h)', sample: ['1', '1'] },
  { index: 7, letter: 'H', header: 'notes', sample: [null, null] },
];
const suggestion: SuggestedMapping = {
  columns: { sampleId: 0, replicateLabel: 1, temperature: 2, value: 3, uncertainty: 4, conversionPercent: 5, reactionTime: 6, notes: 7 },
  temperatureUnit: 'K',
  measure: 'ee',
  timeUnit: 'h',
  unmapped: [],
  missing: [],
};

describe('mapping form → import mapping', () => {
  it('when the header guess is complete, then the mapping passes the API schema with the guessed units', () => {
    const { mapping, errors } = mappingFromDraft(draftFromSuggestion(suggestion));
    expect(errors).toEqual({});
    expect(mapping).toMatchObject({
      columns: { temperature: 2, value: 3, uncertainty: 4, reactionTime: 6 },
      temperatureUnit: 'K',
      measure: 'ee',
      timeUnit: 'h',
    });
    expect(importRequestSchema.safeParse({ mapping }).success).toBe(true);
  });

  it('when no unit column is mapped and no unit chosen, then the unit choice carries the reason', () => {
    const draft: MappingDraft = { ...draftFromSuggestion(suggestion), temperatureUnit: null };
    const { mapping, errors } = mappingFromDraft(draft);
    expect(mapping).toBeNull();
    expect(errors.temperatureUnit).toMatch(/map a unit column or choose the temperature unit/);
  });

  it('when a unit column is mapped, then no unit needs choosing', () => {
    const draft: MappingDraft = {
      ...draftFromSuggestion(suggestion),
      temperatureUnit: null,
      columns: { ...draftFromSuggestion(suggestion).columns, temperatureUnit: 7, notes: null },
    };
    expect(mappingFromDraft(draft).mapping?.columns.temperatureUnit).toBe(7);
  });

  it('when one column feeds two fields or a required field is open, then each field says so', () => {
    const base = draftFromSuggestion(suggestion);
    const { mapping, errors } = mappingFromDraft({ ...base, columns: { ...base.columns, uncertainty: 3, temperature: null } });
    expect(mapping).toBeNull();
    expect(errors.uncertainty).toBe('this column is already mapped to selectivity value');
    expect(errors.temperature).toBe('choose the temperature column');
  });
});

function MappingHarness({ start }: { start: MappingDraft }) {
  const [draft, setDraft] = useState(start);
  return <ColumnMappingStep columns={columns} draft={draft} errors={mappingFromDraft(draft).errors} onChange={setDraft} />;
}

describe('ColumnMappingStep', () => {
  it('when a field is mapped, then its first values show; when unmapped, a required field is marked with its reason', () => {
    render(<MappingHarness start={draftFromSuggestion(suggestion)} />);
    const table = screen.getByRole('table', { name: 'Column mapping' });
    const tempRow = within(table).getByRole('row', { name: /Temperature \(required\)/ });
    expect(tempRow.textContent).toContain('313.15 · 313.15');
    const select = screen.getByLabelText('Temperature (required)') as HTMLSelectElement;
    expect(select.value).toBe('2');
    expect(
      within(select)
        .getAllByRole('option')
        .map((o) => o.textContent),
    ).toContain('C · T (K)');

    fireEvent.change(select, { target: { value: '' } });
    expect(select.getAttribute('aria-invalid')).toBe('true');
    expect(tempRow.textContent).toContain('choose the temperature column');
  });

  it('when a unit column is chosen, then the unit choice disappears; unmapping it brings the choice back with its reason', () => {
    render(<MappingHarness start={{ ...draftFromSuggestion(suggestion), temperatureUnit: null }} />);
    const unit = screen.getByLabelText('Temperatures are in');
    expect(unit.getAttribute('aria-invalid')).toBe('true');
    expect(screen.getByText(/map a unit column or choose the temperature unit/)).toBeTruthy();
    fireEvent.change(screen.getByLabelText('Temperature unit (per row)'), { target: { value: '7' } });
    expect(screen.queryByLabelText('Temperatures are in')).toBeNull();
    fireEvent.change(screen.getByLabelText('Temperature unit (per row)'), { target: { value: '' } });
    fireEvent.change(screen.getByLabelText('Temperatures are in'), { target: { value: 'C' } });
    expect(screen.getByLabelText('Temperatures are in').getAttribute('aria-invalid')).toBeNull();
  });
});

/** XMLHttpRequest stand-in: records each request; the test plays the progress and the answer. */
class FakeXhr {
  static sent: FakeXhr[] = [];
  upload: { onprogress: ((e: { loaded: number; total: number; lengthComputable: boolean }) => void) | null; onload: (() => void) | null } =
    { onprogress: null, onload: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onabort: (() => void) | null = null;
  status = 0;
  statusText = '';
  responseText = '';
  withCredentials = false;
  method = '';
  url = '';
  headers: Record<string, string> = {};
  body: FormData | null = null;
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(k: string, v: string) {
    this.headers[k.toLowerCase()] = v;
  }
  send(body: FormData) {
    this.body = body;
    FakeXhr.sent.push(this);
  }
  abort() {
    this.onabort?.();
  }
  answer(status: number, data: unknown) {
    this.status = status;
    this.responseText = JSON.stringify(data);
    act(() => {
      this.upload.onload?.();
      this.onload?.();
    });
  }
}

function preview(over: Partial<ImportPreview> = {}): ImportPreview {
  return {
    file: {
      fileName: 'screen.csv',
      format: 'csv',
      encoding: 'utf-8',
      delimiter: ',',
      decimalSeparator: '.',
      headerRow: 1,
      sheetName: null,
      sheetNames: [],
      detected: ['comma-separated', 'header in row 1'],
    },
    columns,
    suggestedMapping: { ...suggestion, temperatureUnit: undefined },
    mapping: null,
    rowCount: 3,
    validRowCount: 0,
    errorCount: 0,
    warningCount: 0,
    issues: [{ severity: 'error', row: null, column: null, message: 'Choose the columns and units still open: temperature unit.' }],
    rows: [],
    ...over,
  };
}

describe('UploadWizard', () => {
  it('when a file is chosen, then upload progress shows; the mapping starts from the headers; a checked file with an error cannot be imported', async () => {
    FakeXhr.sent = [];
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
    const client = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
    client.setQueryData(['session'], { user: null, csrfToken: 'tok-123', devTools: false });
    render(
      <QueryClientProvider client={client}>
        <UploadWizard campaignId="c1" projectId="p1" />
      </QueryClientProvider>,
    );
    const input = screen.getByLabelText(/CSV, TSV or Excel workbook/) as HTMLInputElement;
    const file = new File(['T (K),ee (%)\n313.15,95.5\n'], 'screen.csv', { type: 'text/csv' });
    Object.defineProperty(input, 'files', { value: [file] });
    fireEvent.change(input);

    await waitFor(() => expect(FakeXhr.sent).toHaveLength(1));
    const first = FakeXhr.sent[0];
    expect(first.method).toBe('POST');
    expect(first.url).toBe('/api/v1/campaigns/c1/imports/preview');
    expect(first.headers['x-csrf-token']).toBe('tok-123');
    expect(JSON.parse(String(first.body!.get('request')))).toEqual({ parse: {} });
    expect((first.body!.get('file') as File).name).toBe('screen.csv');

    act(() => first.upload.onprogress?.({ loaded: 512, total: 2048, lengthComputable: true }));
    expect(screen.getByRole('status').textContent).toContain('Uploading 25 %');

    expect(screen.getByRole('button', { name: 'Cancel upload' })).toBeTruthy();

    first.answer(200, preview());
    // Unit not guessed: the form asks for it and the check stays disabled.
    await screen.findByRole('table', { name: 'Column mapping' });
    expect(screen.getByLabelText('Temperatures are in').getAttribute('aria-invalid')).toBe('true');
    expect((screen.getByRole('button', { name: 'Check all rows with this mapping' }) as HTMLButtonElement).disabled).toBe(true);
    expect(screen.queryByRole('button', { name: /^Import/ })).toBeNull();

    fireEvent.change(screen.getByLabelText('Temperatures are in'), { target: { value: 'K' } });
    fireEvent.click(screen.getByRole('button', { name: 'Check all rows with this mapping' }));
    await waitFor(() => expect(FakeXhr.sent).toHaveLength(2));
    const second = FakeXhr.sent[1];
    const sent = JSON.parse(String(second.body!.get('request')));
    expect(sent.mapping).toMatchObject({ columns: { temperature: 2, value: 3 }, temperatureUnit: 'K', measure: 'ee' });
    expect(importRequestSchema.safeParse({ mapping: sent.mapping }).success).toBe(true);

    second.answer(
      200,
      preview({
        mapping: sent.mapping,
        validRowCount: 2,
        errorCount: 1,
        issues: [{ severity: 'error', row: 3, column: 'D "ee (%)"', message: 'ee 104.2 % is outside −100 to 100 %' }],
        rows: [],
      }),
    );
    const problems = await screen.findByRole('region', { name: 'Problems in the file' });
    expect(problems.textContent).toContain('ee 104.2 % is outside −100 to 100 %');
    expect(problems.textContent).toContain('D "ee (%)"');
    expect((screen.getByRole('button', { name: 'Import 2 rows' }) as HTMLButtonElement).disabled).toBe(true);
    expect(screen.getByText(/Nothing can be imported until the 1 error is fixed/)).toBeTruthy();
  });

  it('when an upload is cancelled, then the request is aborted and the page says so', async () => {
    FakeXhr.sent = [];
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
    const client = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
    render(
      <QueryClientProvider client={client}>
        <UploadWizard campaignId="c1" projectId="p1" />
      </QueryClientProvider>,
    );
    const input = screen.getByLabelText(/CSV, TSV or Excel workbook/) as HTMLInputElement;
    Object.defineProperty(input, 'files', { value: [new File(['x'], 'big.csv', { type: 'text/csv' })] });
    fireEvent.change(input);
    await waitFor(() => expect(FakeXhr.sent).toHaveLength(1));
    act(() => FakeXhr.sent[0].upload.onprogress?.({ loaded: 1, total: 100, lengthComputable: true }));
    const abort = vi.spyOn(FakeXhr.sent[0], 'abort');
    fireEvent.click(screen.getByRole('button', { name: 'Cancel upload' }));
    expect(abort).toHaveBeenCalled();
    expect((await screen.findByRole('alert')).textContent).toContain('The upload was cancelled.');
  });
});
