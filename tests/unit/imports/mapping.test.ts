import { describe, expect, it } from 'vitest';
import { guessMapping, mappingFromGuess } from '../../../api/features/imports/mapping';
import { MAX_LISTED_ISSUES, ROWS_PER_STEP, validateRows, validateRowsYielding } from '../../../api/features/imports/row-checks';
import { parseUpload } from '../../../api/features/imports/parse';
import { previewImport } from '../../../api/features/imports/service';
import { importMappingSchema, type ImportMappingInput } from '../../../api/features/campaigns/schemas';
import { parseText, sample } from './helpers';

const mapping = (m: ImportMappingInput) => importMappingSchema.parse(m);
const eeInCelsius = mapping({ columns: { temperature: 0, value: 1 }, temperatureUnit: 'C', measure: 'ee' });

async function check(text: string, m = eeInCelsius, options = {}) {
  return validateRows(await parseText(text, options), m);
}

describe('guessMapping', () => {
  it("when the headers are the clean sample's, then every column is recognised with kelvin, ee and hours", async () => {
    const g = guessMapping(await parseUpload(sample('kestrelmoor-skylark-screen.csv')));
    expect(g.columns).toEqual({
      sampleId: 0,
      replicateLabel: 1,
      temperature: 2,
      value: 3,
      uncertainty: 4,
      conversionPercent: 5,
      reactionTime: 6,
      notes: 7,
    });
    expect(g).toMatchObject({ temperatureUnit: 'K', measure: 'ee', timeUnit: 'h', unmapped: [], missing: [] });
  });

  it('when the headers are German, then they are recognised too, with °C', async () => {
    const g = guessMapping(await parseUpload(sample('kestrelmoor-merlin-screen-de.csv')));
    expect(g.columns).toEqual({ sampleId: 0, temperature: 1, value: 2, conversionPercent: 3, reactionTime: 4, notes: 5 });
    expect(g.temperatureUnit).toBe('C');
  });

  it('when a header is "t (h)", then it is a time, while "T / °C" is a temperature', () => {
    const g = guessMapping({ headers: ['t (h)', 'T / °C', 'e.r.', 'Operator'] });
    expect(g.columns).toEqual({ reactionTime: 0, temperature: 1, value: 2 });
    expect(g).toMatchObject({ timeUnit: 'h', temperatureUnit: 'C', measure: 'er', unmapped: [3] });
  });

  it('when a header names no unit or measure, then the guess says what is still open and gives no mapping', () => {
    const g = guessMapping({ headers: ['Temperature', 'Selectivity'] });
    expect(g.missing).toEqual(['temperature unit', 'selectivity measure']);
    expect(mappingFromGuess(g)).toBeNull();
  });

  it('when unit and measure columns exist, then they are mapped and nothing is missing', () => {
    const g = guessMapping({ headers: ['Temp', 'Unit', 'Measure', 'Value', 'SD'] });
    expect(g.columns).toEqual({ temperature: 0, temperatureUnit: 1, measure: 2, value: 3, uncertainty: 4 });
    expect(g.missing).toEqual([]);
  });
});

describe('validateRows: the sample files', () => {
  it('when the clean file is checked, then 12 rows convert with no issue', async () => {
    const p = await previewImport(sample('kestrelmoor-skylark-screen.csv'), {});
    expect([p.errorCount, p.warningCount, p.validRowCount]).toEqual([0, 0, 12]);
    expect(p.rows[0]).toEqual({
      sourceRow: 2,
      temperatureK: 313.15,
      measure: 'ee',
      value: 95.5,
      valueB: null,
      isLowerBound: false,
      uncertainty: 0.3,
      replicateLabel: 'a',
      sampleId: 'KL7702-S-001',
      conversionPercent: 100,
      reactionTimeS: 3600,
      notes: null,
    });
  });

  it('when the German file is checked, then °C and decimal commas become kelvin and points', async () => {
    const p = await previewImport(sample('kestrelmoor-merlin-screen-de.csv'), {});
    expect(p.errorCount).toBe(0);
    expect(p.rows.map((r) => r.temperatureK)).toEqual([313.15, 298.15, 283.15, 273.15, 263.15, 253.15, 243.15, 233.15, 223.15]);
    expect(p.rows[0]).toMatchObject({ value: 84.6, conversionPercent: 100, reactionTimeS: 3600, sourceRow: 4 });
  });

  it('when the workbook is checked, then the "≥99.8" cells become lower bounds', async () => {
    const p = await previewImport(sample('kestrelmoor-skylark-methf-screen.xlsx'), {});
    expect(p.errorCount).toBe(0);
    const bounds = p.rows.filter((r) => r.isLowerBound);
    expect(bounds.map((r) => [r.temperatureK, r.value])).toEqual([
      [213.15, 99.8],
      [213.15, 99.8],
    ]);
  });

  it('when the errors file is checked, then each problem names its row and column', async () => {
    const p = await previewImport(sample('kestrelmoor-screen-with-errors.csv'), {});
    const T = 'C "T (°C)"';
    const EE = 'D "ee (%)"';
    expect(p.issues.map((i) => [i.severity, i.row, i.column])).toEqual([
      ['warning', null, 'G "Operator"'],
      ['error', 4, T],
      ['error', 5, EE],
      ['error', 6, EE],
      ['warning', 8, null],
      ['warning', 9, T],
      ['error', 10, T],
      ['error', 11, 'F "conversion (%)"'],
      ['error', 12, 'E "sd (% ee)"'],
    ]);
    expect(p.issues[1].message).toBe('the temperature is missing.');
    expect(p.issues[2].message).toBe('ee "n.d." is not a number.');
    expect(p.issues[3].message).toBe('ee 104.2 % is outside −100 to 100 %.');
    expect(p.issues[4].message).toContain('repeats row 7');
    expect(p.issues[5].message).toBe('298.15 labelled °C would be 571.3 K; it looks like a kelvin value. Check the unit.');
    expect(p.issues[6].message).toBe('−300 °C is at or below absolute zero.');
    expect([p.errorCount, p.warningCount]).toEqual([6, 3]);
  });
});

describe('validateRows: row-level checks', () => {
  it('when text sits in a numeric cell, then the error quotes it with row and column', async () => {
    const r = await check('T (°C),ee (%)\n25,96.5\nminus twenty,98.1\n');
    expect(r.issues).toEqual([{ severity: 'error', row: 3, column: 'A "T (°C)"', message: 'temperature "minus twenty" is not a number.' }]);
    expect(r.rows).toHaveLength(1);
  });

  it('when ee is exactly 100, then it asks for the detection limit as a lower bound instead', async () => {
    const r = await check('T,ee\n25,100\n');
    expect(r.issues[0].message).toContain('infinite energy gap');
    expect(r.issues[0].message).toContain('lower bound');
  });

  it('when a value is written "> 99.5" or "≥99.8", then it is a lower bound; "<0.5" is refused', async () => {
    const r = await check('T,ee\n-40,> 99.5\n-60,≥99.8\n-70,<0.5\n');
    expect(r.rows.map((x) => [x.value, x.isLowerBound])).toEqual([
      [99.5, true],
      [99.8, true],
    ]);
    expect(r.issues).toHaveLength(1);
    expect(r.issues[0]).toMatchObject({ row: 4, column: 'B "ee"' });
    expect(r.issues[0].message).toContain('upper bound');
  });

  it('when a value is written "99.8+" or a dr "> 200:1", then it is a lower bound as in the grid', async () => {
    const r = await check('T,ee\n-60,99.8+\n');
    expect(r.issues).toEqual([]);
    expect(r.rows.map((x) => [x.value, x.isLowerBound])).toEqual([[99.8, true]]);
    const m = mapping({ columns: { temperature: 0, value: 1 }, temperatureUnit: 'C', measure: 'dr' });
    const d = await check('T,dr\n-60,> 200:1\n-40,.5:1\n', m);
    expect(d.issues).toEqual([]);
    expect(d.rows.map((x) => [x.value, x.valueB, x.isLowerBound])).toEqual([
      [200, 1, true],
      [0.5, 1, false],
    ]);
  });

  it('when er and dr are written a:b (also with decimal commas), then both parts are kept', async () => {
    const m = mapping({ columns: { temperature: 0, measure: 1, value: 2 }, temperatureUnit: 'C' });
    const r = await check('T;measure;value\n25;er;97,5:2,5\n0;d.r.;12:1\n-10;ratio;0:1\n', m);
    expect(r.rows.map((x) => [x.measure, x.value, x.valueB])).toEqual([
      ['er', 97.5, 2.5],
      ['dr', 12, 1],
    ]);
    expect(r.issues).toHaveLength(1);
    expect(r.issues[0]).toMatchObject({ row: 4, column: 'C "value"' });
    expect(r.issues[0].message).toContain('greater than zero');
  });

  it('when the measure column holds an unknown word, then the words allowed are listed', async () => {
    const m = mapping({ columns: { temperature: 0, measure: 1, value: 2 }, temperatureUnit: 'C' });
    const r = await check('T,measure,value\n25,optical rotation,12\n', m);
    expect(r.issues[0]).toEqual({
      severity: 'error',
      row: 2,
      column: 'B "measure"',
      message: 'unknown measure "optical rotation"; use one of ee, er, dr, percentA, ratio.',
    });
  });

  it('when a unit column is mapped, then each row uses its own unit, and a bad unit is named', async () => {
    const m = mapping({ columns: { temperature: 0, temperatureUnit: 1, value: 2 }, measure: 'ee' });
    const r = await check('T,unit,ee\n25,°C,96\n273.15,K,97\n32,F,97.5\n25,furlongs,96\n', m);
    expect(r.rows.map((x) => x.temperatureK)).toEqual([298.15, 273.15, 273.15]);
    expect(r.issues).toEqual([
      { severity: 'error', row: 5, column: 'B "unit"', message: 'unknown temperature unit "furlongs"; use K, °C or °F.' },
    ]);
  });

  it('when a temperature cell carries its own unit, then that unit wins over the default', async () => {
    const r = await check('T,ee\n25 °C,96\n253.15 K,98\n');
    expect(r.rows.map((x) => x.temperatureK)).toEqual([298.15, 253.15]);
  });

  it('when a kelvin column holds °C-looking numbers, then it warns; below 0 K is an error', async () => {
    const m = mapping({ columns: { temperature: 0, value: 1 }, temperatureUnit: 'K', measure: 'ee' });
    const r = await check('T (K),ee\n25,96\n-20,98\n', m);
    expect(r.issues).toEqual([
      {
        severity: 'warning',
        row: 2,
        column: 'A "T (K)"',
        message: '25 K is −248.15 °C, colder than any solution screen; it looks like a °C value. Check the unit.',
      },
      { severity: 'error', row: 3, column: 'A "T (K)"', message: '−20 K is at or below absolute zero; is it in °C?' },
    ]);
  });

  it('when a file with decimal commas has a decimal point, then the row is refused rather than misread', async () => {
    const r = await check('T;ee\n25;96,5\n0;97.9\n-10;98,4\n');
    expect(r.issues).toHaveLength(1);
    expect(r.issues[0]).toMatchObject({ row: 3, column: 'B "ee"' });
    expect(r.issues[0].message).toContain('uses a decimal point, but this file uses decimal commas');
  });

  it('when two rows share a sample id but differ, then it warns about the reused id', async () => {
    const m = mapping({ columns: { temperature: 0, value: 1, sampleId: 2 }, temperatureUnit: 'C', measure: 'ee' });
    const r = await check('T,ee,sample\n25,96,S-1\n0,97.9,S-1\n', m);
    expect(r.issues).toEqual([{ severity: 'warning', row: 3, column: 'C "sample"', message: 'sample id "S-1" is also used in row 2.' }]);
    expect(r.rows).toHaveLength(2);
  });

  it('when replicates differ in replicate label, then they are not duplicates', async () => {
    const m = mapping({ columns: { temperature: 0, value: 1, replicateLabel: 2 }, temperatureUnit: 'C', measure: 'ee' });
    const r = await check('T,ee,rep\n25,96,a\n25,96,b\n25,96,b\n', m);
    expect(r.issues.map((i) => [i.row, i.message.slice(0, 24)])).toEqual([[4, 'the row repeats row 3 (s']]);
  });

  it('when a row is blank in every mapped column, then it is skipped with a warning, not silently', async () => {
    const m = mapping({ columns: { temperature: 0, value: 1 }, temperatureUnit: 'C', measure: 'ee' });
    const r = await check('T,ee,comment\n25,96,\n,,see next page\n', m);
    expect(r.rows).toHaveLength(1);
    expect(r.issues).toContainEqual({
      severity: 'warning',
      row: 3,
      column: null,
      message: 'the row is blank in every mapped column and is skipped.',
    });
  });

  it('when there are more problems than are listed, then the counts stay exact and a last line says how many are hidden', async () => {
    const text = 'T,ee\n' + Array.from({ length: 300 }, () => '25,abc').join('\n');
    const r = await check(text);
    expect(r.errorCount).toBe(300);
    expect(r.issues).toHaveLength(MAX_LISTED_ISSUES + 1);
    expect(r.issues.at(-1)!.message).toBe('100 more issues are not listed (300 errors and 0 warnings in all).');
  });
});

describe('validateRows: the mapping itself', () => {
  it('when a mapped column name does not exist, then the error lists the columns the file has', async () => {
    const r = await check(
      'T (°C),ee (%)\n25,96\n',
      mapping({ columns: { temperature: 'Temp', value: 'ee (%)' }, temperatureUnit: 'C', measure: 'ee' }),
    );
    expect(r.rows).toEqual([]);
    expect(r.issues).toEqual([
      {
        severity: 'error',
        row: null,
        column: null,
        message: 'temperature is mapped to a column named "Temp", but the file has no such column (its columns are "T (°C)", "ee (%)").',
      },
    ]);
  });

  it('when a column index is past the last column, or one column is mapped twice, then both are reported', async () => {
    const r = await check(
      'T,ee\n25,96\n',
      mapping({ columns: { temperature: 0, value: 5, notes: 0 }, temperatureUnit: 'C', measure: 'ee' }),
    );
    expect(r.issues.map((i) => i.message)).toEqual([
      'value is mapped to column F, but the file has only 2 columns.',
      'column is mapped twice, to temperature and to notes.',
    ]);
  });

  it('when header names are matched, then case and surrounding spaces do not matter', async () => {
    const r = await check(
      'T (°C),ee (%)\n25,96\n',
      mapping({ columns: { temperature: ' t (°c) ', value: 'EE (%)' }, temperatureUnit: 'C', measure: 'ee' }),
    );
    expect(r.errorCount).toBe(0);
    expect(r.rows[0].temperatureK).toBe(298.15);
  });

  it('when neither a unit column nor a unit is given, then the mapping schema says which to choose', () => {
    const parsed = importMappingSchema.safeParse({ columns: { temperature: 0, value: 1 } });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
      ['temperatureUnit', 'map a unit column or choose the temperature unit (K, C or F)'],
      ['measure', 'map a measure column or choose the measure of the value column'],
    ]);
  });
});

describe('validateRowsYielding', () => {
  it('when a long file is checked on the main thread, then other work gets turns and the result equals the one-go check', async () => {
    // 10 000 invented rows with a few errors and repeats, so issues and rows both matter.
    const lines = ['T (°C),ee (%)'];
    for (let i = 0; i < 10_000; i++) lines.push(i % 997 === 0 ? `${-40 + (i % 50)},not a number` : `${-40 + (i % 50)},${80 + (i % 19)}`);
    const table = await parseText(lines.join('\n'));
    let turns = 0;
    const tick = () => {
      turns += 1;
      if (!done) setImmediate(tick);
    };
    let done = false;
    setImmediate(tick);
    const yielded = await validateRowsYielding(table, eeInCelsius);
    done = true;
    expect(yielded).toEqual(validateRows(table, eeInCelsius));
    // One turn at least per ROWS_PER_STEP rows checked.
    expect(turns).toBeGreaterThanOrEqual(Math.floor(10_000 / ROWS_PER_STEP) - 1);
  });
});
