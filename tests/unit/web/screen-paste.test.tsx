// @vitest-environment happy-dom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { parseScreen } from '../../../web/features/calculators/lib/parse-screen';
import { buildFitRequest, predictionGridK, GRID_SIZE } from '../../../web/features/calculators/lib/fit-request';
import { FitPanel } from '../../../web/features/calculators/components/fit-panel';
import { fitRequestSchema } from '../../../api/features/calculators/schemas';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('parseScreen', () => {
  it('when a paste uses comma, semicolon, tab or space separators, then every run is read with its line number', () => {
    // One table, one separator (the reader shared with the grid and the file import decides it for the whole paste).
    const expected = [
      { line: 2, temperature: -78, selectivity: 98.9, uncertainty: 0.2 },
      { line: 4, temperature: -40, selectivity: 96.9, uncertainty: 0.3 },
      { line: 5, temperature: 0, selectivity: 93.7 },
    ];
    for (const [sep, decimal] of [
      [', ', '.'],
      [';', ','],
      ['\t', ','],
      [' ', '.'],
    ]) {
      const line = (...v: string[]) => v.map((x) => x.replace('.', decimal)).join(sep);
      const text = ['# a comment', line('-78', '98.9', '0.2'), '', line('-40', '96.9', '0.3'), line('0', '93.7')].join('\n');
      const result = parseScreen(text, 'ee', 'C');
      expect(result.errors, JSON.stringify(sep)).toEqual([]);
      expect(result.rows).toEqual(expected);
    }
  });

  it('when a run is a bound ("≥99.8", ">99.8", "99.8+", "> 200:1"), then it is read as at least that selective, as in the grid', () => {
    const ee = parseScreen('-78, ≥99.8\n-60, >99.8\n-40, 99.8+\n0, 93.7', 'ee', 'C');
    expect(ee.errors).toEqual([]);
    expect(ee.rows.map((r) => [r.selectivity, r.atLeast ?? false])).toEqual([
      [99.8, true],
      [99.8, true],
      [99.8, true],
      [93.7, false],
    ]);
    const dr = parseScreen('-78; > 200:1\n0; .5:1', 'dr', 'C');
    expect(dr.errors).toEqual([]);
    expect(dr.rows.map((r) => [r.selectivity, r.atLeast ?? false])).toEqual([
      ['200:1', true],
      ['0.5:1', false],
    ]);
    const request = buildFitRequest(ee.rows, {
      measure: 'ee',
      unit: 'C',
      weighting: 'none',
      uncertaintyScale: 'absolute',
      proposed: null,
      excludedLines: [],
    });
    expect(fitRequestSchema.safeParse(request).success).toBe(true);
    expect(request.measurements[0].selectivity).toEqual({ measure: 'ee', value: 99.8, atLeast: true });
    expect(request.measurements[3].selectivity).toEqual({ measure: 'ee', value: 93.7 });
  });

  it('when a selectivity is an upper bound, ee = 100 or not a strict decimal, then the line is refused', () => {
    const result = parseScreen('-78, <5\n-60, 100\n-40, 0x10', 'ee', 'C');
    expect(result.rows).toEqual([]);
    expect(result.errors.map((e) => e.line)).toEqual([1, 2, 3]);
    expect(result.errors[0].message).toContain('upper bound');
    expect(result.errors[1].message).toContain('infinite energy gap');
    expect(result.errors[2].message).toContain('not a number');
  });

  it('when the first line holds column headings, then it is skipped and reported', () => {
    const result = parseScreen('T (°C), ee (%)\n−20, 95.6', 'ee', 'C');
    expect(result.headerLine).toBe(1);
    expect(result.rows).toEqual([{ line: 2, temperature: -20, selectivity: 95.6 }]);
  });

  it('when values are wrong, then each problem names its line and nothing from those lines is kept', () => {
    const text = ['-40, 96.9', '-20, abc', '-300, 90', '0, 93.7, -1', '10', '20, 101'].join('\n');
    const result = parseScreen(text, 'ee', 'C');
    expect(result.rows.map((r) => r.line)).toEqual([1]);
    expect(result.errors.map((e) => e.line)).toEqual([2, 3, 4, 5, 6]);
    expect(result.errors[0].message).toContain('not a number');
    expect(result.errors[1].message).toContain('absolute zero');
    expect(result.errors[2].message).toContain('greater than zero');
    expect(result.errors[3].message).toContain('expected 2 or 3 values');
    expect(result.errors[4].message).toContain('outside');
  });

  it('when the measure is dr, then "a:b" text is kept for the API to read', () => {
    const result = parseScreen('-20; 12:1\n0; 8.5 : 1', 'dr', 'C');
    expect(result.errors).toEqual([]);
    expect(result.rows.map((r) => r.selectivity)).toEqual(['12:1', '8.5:1']);
  });

  it('when a fit request is built, then it passes the API schema and predicts on a grid spanning the data plus the proposed temperature last', () => {
    const { rows } = parseScreen('-78, 98.9, 0.2\n-40, 96.9, 0.3\n25, 91.3, 0.4', 'ee', 'C');
    const request = buildFitRequest(rows, {
      measure: 'ee',
      unit: 'C',
      weighting: 'uncertainty',
      uncertaintyScale: 'absolute',
      proposed: -90,
      excludedLines: [3],
    });
    expect(fitRequestSchema.safeParse(request).success).toBe(true);
    expect(request.predict).toHaveLength(GRID_SIZE + 1);
    expect(request.predict![GRID_SIZE]).toEqual({ value: -90, unit: 'C' });
    const gridK = request.predict!.slice(0, GRID_SIZE).map((t) => t.value);
    expect(Math.min(...gridK)).toBeLessThan(-90 + 273.15);
    expect(Math.max(...gridK)).toBeGreaterThan(25 + 273.15);
    expect(request.measurements[2].excluded).toBe(true);
    expect(request.measurements[0].excluded).toBeUndefined();
    // evenly spaced in 1/T
    const grid = predictionGridK([200, 300], null, 5);
    const steps = grid.slice(1).map((k, i) => 1 / k - 1 / grid[i]);
    for (const s of steps) expect(s).toBeCloseTo(steps[0], 12);
  });
});

describe('the screen paste box in the fit panel', () => {
  function renderPanel() {
    const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
    return render(
      <QueryClientProvider client={client}>
        <FitPanel />
      </QueryClientProvider>,
    );
  }

  it('when a pasted screen has bad lines, then the line numbers are shown and nothing is sent', async () => {
    const fetchSpy = vi.fn();
    vi.stubGlobal('fetch', fetchSpy);
    renderPanel();
    const box = screen.getByLabelText(/Screen: one run per line/);
    fireEvent.change(box, { target: { value: '-40, 96.9\n-20; ninety\n0, 93.7, 0.4, 7' } });
    const problems = screen.getByRole('alert', { name: 'Problems in the pasted screen' });
    expect(problems.textContent).toContain('Line 2:');
    expect(problems.textContent).toContain('Line 3:');
    expect(problems.textContent).not.toContain('Line 1:');
    expect(box.getAttribute('aria-invalid')).toBe('true');
    fireEvent.click(screen.getByRole('button', { name: 'Fit screen' }));
    // The form's submit runs through react-hook-form, which answers asynchronously.
    expect(await screen.findByText('Fix the lines listed under the screen first.')).toBeTruthy();
    expect(fetchSpy).not.toHaveBeenCalled();
  });

  it('when the invented example is loaded, then its runs are read without problems', () => {
    renderPanel();
    fireEvent.click(screen.getByRole('button', { name: 'Load invented example' }));
    const box = screen.getByLabelText(/Screen: one run per line/) as HTMLTextAreaElement;
    expect(box.value).toContain('Invented example');
    expect(screen.getByText(/6 runs read/)).toBeTruthy();
    expect(screen.queryByRole('alert', { name: 'Problems in the pasted screen' })).toBeNull();
  });
});
