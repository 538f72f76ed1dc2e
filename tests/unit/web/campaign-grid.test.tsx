// @vitest-environment happy-dom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { measurementCreateSchema } from '../../../api/features/campaigns/schemas';
import {
  batchErrorsToCells,
  cellsFromMeasurement,
  emptyCells,
  parseNumber,
  parsePastedBlock,
  pasteBlock,
  rowToCreate,
  rowToUpdate,
  type ColumnUnits,
  type GridCells,
} from '../../../web/features/campaigns/lib/grid';
import { MeasurementGrid } from '../../../web/features/campaigns/components/measurement-grid';
import type { Campaign, Measurement } from '../../../web/features/campaigns/api/types';
import { webCampaign } from '../../factories/web-campaign';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
  vi.restoreAllMocks();
});

const C_EE: ColumnUnits = { temperature: 'C', measure: 'ee', time: 'h' };
const cells = (over: Partial<GridCells>): GridCells => ({ ...emptyCells(), ...over });

const campaign: Campaign = webCampaign({
  id: '11111111-1111-4111-8111-111111111111',
  projectId: '22222222-2222-4222-8222-222222222222',
  title: 'Grid test (invented)',
});

function stored(over: Partial<Measurement> = {}): Measurement {
  return {
    id: '33333333-3333-4333-8333-333333333333',
    campaignId: campaign.id,
    temperatureK: 253.15,
    measure: 'ee',
    value: 98.8,
    valueB: null,
    isLowerBound: false,
    uncertainty: 0.3,
    replicateLabel: 'a',
    sampleId: 'KL-1',
    conversionPercent: 99.3,
    reactionTimeS: 48 * 3600,
    excluded: false,
    excludedReason: null,
    notes: null,
    sourceRow: null,
    importFileId: null,
    version: 4,
    createdByUserId: null,
    createdAt: '2026-12-01T00:00:00Z',
    updatedAt: '2026-12-01T00:00:00Z',
    ...over,
  };
}

/** Every alert on screen, as one text. */
const alertText = () =>
  screen
    .getAllByRole('alert')
    .map((a) => a.textContent)
    .join(' ');

describe('grid cells: numbers as typed', () => {
  it('when a number has a true minus, a decimal comma or spaces, then it is read; words are invalid; empty is null', () => {
    expect(parseNumber(' \u221278,5 ')).toBe(-78.5);
    expect(parseNumber('1e-3')).toBe(0.001);
    expect(parseNumber('')).toBeNull();
    expect(parseNumber('n.d.')).toBe('invalid');
    expect(parseNumber('1,234.5')).toBe('invalid');
  });
});

describe('grid rows → API bodies, checked with the shared schema', () => {
  it('when every cell is good, then the body carries the column units and passes measurementCreateSchema', () => {
    const { body, errors } = rowToCreate(
      cells({ temperature: '−20', value: '98.8', uncertainty: '0,3', sampleId: 'KL-1', reactionTime: '48' }),
      C_EE,
    );
    expect(errors).toEqual({});
    expect(body).toMatchObject({
      temperature: { value: -20, unit: 'C' },
      selectivity: { measure: 'ee', value: 98.8 },
      uncertainty: 0.3,
      reactionTime: { value: 48, unit: 'h' },
    });
    expect(measurementCreateSchema.safeParse(body).success).toBe(true);
  });

  it('when cells are wrong, then each cell gets its own reason and there is no body', () => {
    const { body, errors } = rowToCreate(cells({ temperature: '-300', value: '101', uncertainty: '-1', conversionPercent: 'lots' }), C_EE);
    expect(body).toBeNull();
    expect(errors.temperature).toMatch(/absolute zero/);
    expect(errors.value).toMatch(/outside −100 to 100 %/);
    expect(errors.uncertainty).toMatch(/at least 0/);
    expect(errors.conversionPercent).toBe('conversion “lots” is not a number');
  });

  it('when temperature or value is missing, then the cell says it is required', () => {
    const { errors } = rowToCreate(cells({ sampleId: 'x' }), C_EE);
    expect(errors.temperature).toBe('temperature is required');
    expect(errors.value).toBe('ee is required');
  });

  it('when the value is "≥99.8" or a pair for er, then it is a lower bound or an a:b string', () => {
    expect(rowToCreate(cells({ temperature: '-60', value: '≥ 99.8' }), C_EE).body?.selectivity).toEqual({
      measure: 'ee',
      value: 99.8,
      atLeast: true,
    });
    const er = rowToCreate(cells({ temperature: '233.15', value: '95 : 5' }), { ...C_EE, temperature: 'K', measure: 'er' });
    expect(er.body?.selectivity).toEqual({ measure: 'er', value: '95:5' });
    expect(er.body?.temperature).toEqual({ value: 233.15, unit: 'K' });
    expect(rowToCreate(cells({ temperature: '0', value: '95:0' }), { ...C_EE, measure: 'er' }).errors.value).toMatch(/greater than zero/);
  });

  it('when a stored row is shown in other units, then the cells convert; an edit sends only the changed fields with the version', () => {
    const m = stored();
    const shown = cellsFromMeasurement(m, { temperature: 'K', measure: 'percentA', time: 'min' });
    expect(shown.temperature).toBe('253.15');
    expect(shown.value).toBe('99.4');
    expect(shown.reactionTime).toBe('2880');
    // 0.3 % ee at 98.8 % ee is 0.15 points of % A; as a relative SD of r it is 2(0.003)/(1 − 0.988²) ≈ 0.2515.
    expect(shown.uncertainty).toBe('0.15');
    expect(cellsFromMeasurement(m, { ...C_EE, measure: 'ratio' }).uncertainty).toBe('0.252');
    const inC = cellsFromMeasurement(m, C_EE);
    expect(inC.temperature).toBe('−20');
    const { body } = rowToUpdate(m, { ...inC, uncertainty: '0.5', notes: 'reweighed' }, C_EE);
    expect(body).toEqual({ version: 4, uncertainty: 0.5, notes: 'reweighed' });
    expect(rowToUpdate(m, inC, C_EE).body).toBeNull();
    // A value re-entered as % A carries the uncertainty shown in % A with it.
    const asA = cellsFromMeasurement(m, { ...C_EE, measure: 'percentA' });
    expect(rowToUpdate(m, { ...asA, value: '99.5' }, { ...C_EE, measure: 'percentA' }).body).toEqual({
      version: 4,
      selectivity: { measure: 'percentA', value: 99.5 },
      uncertainty: 0.15,
    });
  });
});

describe('paste from a spreadsheet', () => {
  it('when a tab-separated block with CRLF and a trailing newline is pasted, then rows and cells come out trimmed', () => {
    expect(parsePastedBlock('-20\t98.8\t0.3\r\n0\t97.9\t0.3\r\n')).toEqual([
      ['-20', '98.8', '0.3'],
      ['0', '97.9', '0.3'],
    ]);
    expect(parsePastedBlock('-20;98,8\n0;97,9')).toEqual([
      ['-20', '98,8'],
      ['0', '97,9'],
    ]);
    expect(parsePastedBlock('98.8')).toBeNull();
    expect(parsePastedBlock('98,8')).toBeNull();
  });

  it('when a block with a header row lands on a stored row, then the header is skipped, the stored row is edited and the rest become new rows', () => {
    let n = 0;
    const block = parsePastedBlock('T (°C)\tee (%)\tsd\tsample\n-40\t99.1\t0.2\tS1\n-30\t98.9\t0.2\tS2\t\textra\t\t\t\textra-2\n')!;
    const result = pasteBlock({ edits: {}, drafts: [] }, ['m1'], new Set(['m1']), 0, 0, block, () => `d${++n}`);
    expect(result.headerSkipped).toBe(true);
    expect(result.rows).toBe(2);
    expect(result.state.edits.m1).toEqual({ temperature: '-40', value: '99.1', uncertainty: '0.2', sampleId: 'S1' });
    expect(result.state.drafts).toHaveLength(1);
    expect(result.state.drafts[0].cells).toMatchObject({ temperature: '-30', value: '98.9', sampleId: 'S2', conversionPercent: 'extra' });
    expect(result.droppedColumns).toBe(2);
  });

  it('when pasted from the second column, then cells shift right', () => {
    const result = pasteBlock(
      { edits: {}, drafts: [{ key: 'd0', cells: emptyCells() }] },
      ['d0'],
      new Set(),
      0,
      1,
      [['97.5', '0.4']],
      () => 'new',
    );
    expect(result.state.drafts[0].cells).toMatchObject({ temperature: '', value: '97.5', uncertainty: '0.4' });
  });

  it('when the batch answer names measurements.<i>.<field>, then the error lands on that draft cell', () => {
    const mapped = batchErrorsToCells(
      [
        { path: 'measurements.1.temperature.value', message: 'temperature.value is above 1000 K' },
        { path: 'measurements.0.selectivity.value', message: 'selectivity.value must be below 100' },
        { path: 'measurements', message: 'at most 5000 measurements per request' },
      ],
      ['k0', 'k1'],
    );
    expect(mapped.byKey.k1.temperature).toBe('temperature is above 1000 K');
    expect(mapped.byKey.k0.value).toBe('selectivity must be below 100');
    expect(mapped.other).toEqual(['at most 5000 measurements per request']);
  });
});

function renderGrid(measurements: Measurement[] = [], canEdit = true) {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  return render(
    <QueryClientProvider client={client}>
      <MeasurementGrid campaign={campaign} measurements={measurements} canEdit={canEdit} />
    </QueryClientProvider>,
  );
}

function paste(target: HTMLElement, text: string) {
  fireEvent.paste(target, { clipboardData: { getData: (type: string) => (type === 'text/plain' ? text : '') } });
}

describe('MeasurementGrid', () => {
  it('when a block is pasted into a new row, then rows appear, a bad cell shows its reason, and nothing is sent until it is fixed', async () => {
    const fetchMock = vi.fn(
      async () => new Response(JSON.stringify({ created: 2 }), { status: 201, headers: { 'content-type': 'application/json' } }),
    );
    vi.stubGlobal('fetch', fetchMock);
    renderGrid();
    fireEvent.click(screen.getByRole('button', { name: 'Add row' }));
    paste(screen.getByLabelText('Temperature, row 1'), '-20\t98.8\t0.3\n0\t104\t0.3\n');
    expect((screen.getByLabelText('Temperature, row 2') as HTMLInputElement).value).toBe('0');
    const bad = screen.getByLabelText('Selectivity, row 2');
    expect(bad.getAttribute('aria-invalid')).toBe('true');
    expect(document.getElementById(bad.getAttribute('aria-describedby')!)!.textContent).toMatch(/ee 104 % is outside −100 to 100 %/);
    expect(screen.getByRole('status').textContent).toContain('Pasted 2 rows');

    fireEvent.click(screen.getByRole('button', { name: 'Save 2 rows' }));
    expect(screen.getByRole('alert').textContent).toContain('fix the marked cells');
    expect(fetchMock).not.toHaveBeenCalled();

    fireEvent.change(bad, { target: { value: '97.9' } });
    expect(bad.getAttribute('aria-invalid')).toBeNull();
    fireEvent.keyDown(bad, { key: 'Enter', ctrlKey: true });
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe(`/api/v1/campaigns/${campaign.id}/measurements/batch`);
    const sent = JSON.parse(String(init.body));
    expect(sent.measurements).toHaveLength(2);
    expect(sent.measurements[1]).toMatchObject({
      temperature: { value: 0, unit: 'C' },
      selectivity: { measure: 'ee', value: 97.9 },
      uncertainty: 0.3,
    });
  });

  it('when the server refuses a row of the batch, then its message sits on that cell and the rows stay for fixing', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(
        async () =>
          new Response(
            JSON.stringify({
              type: 'about:blank',
              title: 'Invalid request',
              status: 400,
              detail: 'The body is invalid.',
              errors: [{ path: 'measurements.0.sampleId', message: 'sampleId already used in this campaign' }],
            }),
            { status: 400, headers: { 'content-type': 'application/problem+json' } },
          ),
      ),
    );
    renderGrid();
    fireEvent.click(screen.getByRole('button', { name: 'Add row' }));
    fireEvent.change(screen.getByLabelText('Temperature, row 1'), { target: { value: '10' } });
    fireEvent.change(screen.getByLabelText('Selectivity, row 1'), { target: { value: '97.5' } });
    fireEvent.change(screen.getByLabelText('Sample id, row 1'), { target: { value: 'S-9' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save 1 row' }));
    await waitFor(() => expect(screen.getByLabelText('Sample id, row 1').getAttribute('aria-invalid')).toBe('true'));
    expect(screen.getByText('sampleId already used in this campaign')).toBeTruthy();
    expect((screen.getByLabelText('Temperature, row 1') as HTMLInputElement).value).toBe('10');
    expect(screen.getByRole('alert').textContent).toContain('all or nothing');
  });

  it('when keys are pressed, then arrows and Enter move between rows, Enter on the last row adds one, Escape restores a cell', async () => {
    vi.stubGlobal('fetch', vi.fn());
    renderGrid([stored(), stored({ id: '44444444-4444-4444-8444-444444444444', temperatureK: 273.15, value: 97.9 })]);
    const first = screen.getByLabelText('Selectivity, row 1') as HTMLInputElement;
    fireEvent.change(first, { target: { value: '50' } });
    expect(first.value).toBe('50');
    fireEvent.keyDown(first, { key: 'Escape' });
    expect(first.value).toBe('98.8');
    first.focus();
    fireEvent.keyDown(first, { key: 'ArrowDown' });
    await waitFor(() => expect(document.activeElement).toBe(screen.getByLabelText('Selectivity, row 2')));
    fireEvent.keyDown(document.activeElement!, { key: 'Enter' });
    await waitFor(() => expect(document.activeElement).toBe(screen.getByLabelText('Selectivity, row 3')));
    expect(screen.getByRole('row', { name: 'Row 3 (new)' })).toBeTruthy();
  });

  it('when left and right are pressed at the edge of a cell, then the focus moves to the neighbouring cell', async () => {
    vi.stubGlobal('fetch', vi.fn());
    renderGrid([stored()]);
    const value = screen.getByLabelText('Selectivity, row 1') as HTMLInputElement;
    value.focus();
    value.setSelectionRange(value.value.length, value.value.length);
    fireEvent.keyDown(value, { key: 'ArrowRight' });
    await waitFor(() => expect(document.activeElement).toBe(screen.getByLabelText('Uncertainty, row 1')));
    const unc = document.activeElement as HTMLInputElement;
    unc.setSelectionRange(0, 0);
    fireEvent.keyDown(unc, { key: 'ArrowLeft' });
    await waitFor(() => expect(document.activeElement).toBe(value));
    // Inside the text the caret moves, not the focus.
    value.setSelectionRange(1, 1);
    fireEvent.keyDown(value, { key: 'ArrowLeft' });
    expect(document.activeElement).toBe(value);
  });

  it('when replicates share a temperature, then each shows their mean ± SD', () => {
    vi.stubGlobal('fetch', vi.fn());
    renderGrid([
      stored({ id: '55555555-5555-4555-8555-555555555551', value: 98.8 }),
      stored({ id: '55555555-5555-4555-8555-555555555552', value: 98.6 }),
      stored({ id: '55555555-5555-4555-8555-555555555553', value: 98.4 }),
    ]);
    // mean (98.8 + 98.6 + 98.4)/3 = 98.6, sample SD 0.2 [C].
    expect(screen.getAllByText('mean 98.6 ± 0.2 % (n = 3)')).toHaveLength(3);
  });

  it('when a stored run is deleted, then a reason is asked for and sent with the version', async () => {
    const fetchMock = vi.fn(async () => new Response(null, { status: 204 }));
    vi.stubGlobal('fetch', fetchMock);
    renderGrid([stored()]);
    fireEvent.click(screen.getByRole('button', { name: 'Delete row 1' }));
    const confirm = screen.getByRole('button', { name: 'Delete' }) as HTMLButtonElement;
    expect(confirm.disabled).toBe(true);
    fireEvent.change(screen.getByLabelText('Why delete?'), { target: { value: 'entered twice' } });
    fireEvent.click(confirm);
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe('/api/v1/measurements/33333333-3333-4333-8333-333333333333?version=4&reason=entered%20twice');
    expect(init.method).toBe('DELETE');
  });

  it('when a campaign has thousands of runs, then only a window of rows is drawn and none is cut off', async () => {
    vi.stubGlobal('fetch', vi.fn());
    // happy-dom lays nothing out: give the box a screen's height and each row a row's height.
    const proto = Object.getPrototypeOf(Object.getPrototypeOf(document.createElement('div'))) as object;
    const owner = ['clientHeight', 'clientWidth', 'offsetHeight'].map((k) => {
      let p: object | null = proto;
      while (p && !Object.getOwnPropertyDescriptor(p, k)) p = Object.getPrototypeOf(p) as object | null;
      return p ?? proto;
    });
    vi.spyOn(owner[0] as HTMLElement, 'clientHeight', 'get').mockReturnValue(700);
    vi.spyOn(owner[1] as HTMLElement, 'clientWidth', 'get').mockReturnValue(1200);
    vi.spyOn(owner[2] as HTMLElement, 'offsetHeight', 'get').mockReturnValue(33);
    const many = Array.from({ length: 3000 }, (_, i) =>
      stored({ id: `66666666-6666-4666-8666-${String(i).padStart(12, '0')}`, temperatureK: 200 + i * 0.01 }),
    );
    renderGrid(many, false);
    await waitFor(() => expect(document.querySelectorAll('tbody[data-index]').length).toBeGreaterThan(0));
    const drawn = document.querySelectorAll('tbody[data-index]').length;
    expect(drawn).toBeLessThan(200);
    expect(screen.getByText('3000 rows, sorted by temperature; the grid scrolls in its own box.')).toBeTruthy();
    expect(screen.queryByText(/Showing the first/)).toBeNull();
  });

  it('when a stored row is edited and someone else changed it first, then only the changed field is sent with the version and the row says it was not saved', async () => {
    const fetchMock = vi.fn(
      async () =>
        new Response(
          JSON.stringify({ type: 'about:blank', title: 'Conflict', status: 409, detail: 'The measurement changed.', currentVersion: 5 }),
          {
            status: 409,
            headers: { 'content-type': 'application/problem+json' },
          },
        ),
    );
    vi.stubGlobal('fetch', fetchMock);
    renderGrid([stored()]);
    fireEvent.change(screen.getByLabelText('Uncertainty, row 1'), { target: { value: '0.5' } });
    // A stored run changes only with a reason, which the history keeps.
    expect((screen.getByRole('button', { name: 'Save 1 row' }) as HTMLButtonElement).disabled).toBe(true);
    fireEvent.change(screen.getByLabelText(/Why do this stored run change\?/), { target: { value: 'assay repeated' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save 1 row' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe(`/api/v1/campaigns/${campaign.id}/measurements`);
    expect(init.method).toBe('PATCH');
    expect(JSON.parse(String(init.body))).toEqual({
      measurements: [{ id: '33333333-3333-4333-8333-333333333333', version: 4, uncertainty: 0.5, reason: 'assay repeated' }],
    });
    await waitFor(() => expect(alertText()).toContain('Changed by someone else'));
    expect((screen.getByLabelText('Uncertainty, row 1') as HTMLInputElement).value).toBe('0.5');
  });

  it('when two stored rows are edited, then one batched change is sent and a stale row the server names is marked, the other kept', async () => {
    const second = stored({ id: '44444444-4444-4444-8444-444444444444', temperatureK: 273.15, sampleId: 'KL-2', version: 2 });
    const fetchMock = vi.fn(async (url: string, init?: RequestInit) =>
      init?.method === 'PATCH'
        ? new Response(
            JSON.stringify({
              type: 'about:blank',
              title: 'Conflict',
              status: 409,
              detail: 'A run was changed by someone else: row 2 (version 2, now 3).',
              currentVersion: 3,
              staleRows: [{ path: 'measurements.1', id: second.id, sentVersion: 2, currentVersion: 3 }],
            }),
            { status: 409, headers: { 'content-type': 'application/problem+json' } },
          )
        : new Response(JSON.stringify({ measurements: [] }), { status: 200, headers: { 'content-type': 'application/json' } }),
    );
    vi.stubGlobal('fetch', fetchMock);
    renderGrid([stored(), second]);
    fireEvent.change(screen.getByLabelText('Notes, row 1'), { target: { value: 'repeat injection' } });
    fireEvent.change(screen.getByLabelText('Notes, row 2'), { target: { value: 'bath checked' } });
    fireEvent.change(screen.getByLabelText(/Why do these 2 stored runs change\?/), { target: { value: 'notes added' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save 2 rows' }));
    await waitFor(() => expect(alertText()).toContain('Changed by someone else'));
    const patches = fetchMock.mock.calls.filter(([, init]) => init?.method === 'PATCH');
    expect(patches).toHaveLength(1);
    expect(JSON.parse(String(patches[0]![1]!.body)).measurements.map((m: { id: string }) => m.id)).toEqual([stored().id, second.id]);
    const row2 = screen.getByRole('row', { name: /^Row 2/ }).closest('tbody')!;
    expect(within(row2).getByRole('alert').textContent).toContain('Changed by someone else');
    const row1 = screen.getByRole('row', { name: /^Row 1/ }).closest('tbody')!;
    expect(within(row1).queryByRole('alert')).toBeNull();
    // Nothing was saved, so both edits stay for another try.
    expect((screen.getByLabelText('Notes, row 1') as HTMLInputElement).value).toBe('repeat injection');
    expect(
      screen
        .getAllByRole('alert')
        .map((a) => a.textContent)
        .join(' '),
    ).toContain('all or nothing');
  });

  it('when a run is excluded, then a reason is required and sent with the version', async () => {
    const fetchMock = vi.fn(
      async () => new Response(JSON.stringify(stored({ excluded: true, excludedReason: 'probe failed', version: 5 })), { status: 200 }),
    );
    vi.stubGlobal('fetch', fetchMock);
    renderGrid([stored()]);
    fireEvent.click(screen.getByRole('button', { name: 'Exclude row 1 from the fit' }));
    fireEvent.click(screen.getByRole('button', { name: 'Exclude' }));
    // The form checks the reason before sending (react-hook-form validates asynchronously).
    expect(await screen.findByText(/give a reason/)).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();
    fireEvent.change(screen.getByLabelText(/Why exclude row 1/), { target: { value: 'probe failed' } });
    fireEvent.click(screen.getByRole('button', { name: 'Exclude' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe('/api/v1/measurements/33333333-3333-4333-8333-333333333333/exclusion');
    expect(init.method).toBe('PUT');
    expect(JSON.parse(String(init.body))).toEqual({ excluded: true, reason: 'probe failed', version: 4 });
  });

  it('when the reader is a viewer, then no input or button is rendered and an excluded run shows its reason', () => {
    renderGrid([stored({ excluded: true, excludedReason: 'probe failed' })], false);
    const table = screen.getByRole('table', { name: 'Measurements' });
    expect(within(table).queryAllByRole('textbox')).toHaveLength(0);
    expect(screen.queryAllByRole('button')).toHaveLength(0);
    expect(table.textContent).toContain('excluded');
    expect(table.textContent).toContain('“probe failed”');
    expect(table.textContent).toContain('KL-1');
  });
});
