/**
 * The campaign's workbook: Summary (one printed page), Fit (parameters and the server-rendered
 * charts, one printed page), then Measurements (with each run's residual), Forecast, and Plan and
 * Comparison when they exist: a campaign of a few dozen runs prints on six pages. Numbers stay numbers with display formats chosen from the
 * assay's precision; every header names its unit; key results carry defined names; every sheet
 * is set up to print landscape, fitted to the page width, with its header row repeated.
 * User text that a spreadsheet could evaluate is neutralised (see `safeText`).
 */
import { setImmediate } from 'node:timers/promises';
import ExcelJS from 'exceljs';
import { numFmt, ratioOf, ratioRange, safeFileName, safeText } from './report-format';
import {
  buildReportModel,
  clean,
  measurementRunCells,
  runMeetsSpecification,
  type ReportData,
  type ReportMeta,
  type ReportModel,
} from './report-model';
import { renderReportChartsAsync, type ReportCharts } from './report-charts';

export type { ReportData, ReportMeta, ReportSpecification } from './report-model';

const HEADER_FILL: ExcelJS.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFE6E9EF' } };
const SECTION_FILL: ExcelJS.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFECFDFB' } };
const TIME_FMT = 'yyyy-mm-dd hh:mm';
const TEXT_FMT = '@';

type Cell = string | number | boolean | Date | null;

/** A cell that holds user text: neutralised and formatted as Text, so re-entering it keeps it text. */
class UserText {
  constructor(readonly text: string | null) {}
}
const user = (text: string | null | undefined) => new UserText(text ?? null);

interface Column {
  header: string;
  width: number;
  numFmt?: string;
}

function styleHeader(row: ExcelJS.Row) {
  row.font = { bold: true };
  row.fill = HEADER_FILL;
  row.alignment = { vertical: 'middle', wrapText: true };
}

/** A sheet frozen below its styled header row, its columns given as [header, width]; grid lines hidden when asked. */
function headedSheet(wb: ExcelJS.Workbook, name: string, columns: [string, number][], gridLines = true): ExcelJS.Worksheet {
  const ws = wb.addWorksheet(name, { views: [{ state: 'frozen', ySplit: 1, ...(gridLines ? {} : { showGridLines: false }) }] });
  ws.columns = columns.map(([header, width]) => ({ header, width }));
  styleHeader(ws.getRow(1));
  return ws;
}

/** Escape `&` for the header/footer codes and keep the text short. */
const hfText = (s: string) => s.replace(/&/g, '&&').slice(0, 80);

function printSetup(ws: ExcelJS.Worksheet, model: ReportModel, titleRows: string | undefined, onePage = false) {
  ws.pageSetup = {
    orientation: 'landscape',
    paperSize: 9,
    fitToPage: true,
    fitToWidth: 1,
    fitToHeight: onePage ? 1 : 0,
    horizontalCentered: false,
    margins: { left: 0.5, right: 0.5, top: 0.7, bottom: 0.7, header: 0.3, footer: 0.3 },
    ...(titleRows ? { printTitlesRow: titleRows } : {}),
  };
  ws.headerFooter = {
    oddHeader: `&L&B${hfText(model.data.campaign.title)}&B&R${hfText(ws.name)}`,
    oddFooter: `&LEyrie ${hfText(model.meta.appVersion)}&CPage &P of &N&R${model.meta.generatedAt.toISOString().slice(0, 10)}`,
  };
}

function setCell(cell: ExcelJS.Cell, value: Cell | UserText) {
  if (value instanceof UserText) {
    cell.value = safeText(value.text);
    cell.numFmt = TEXT_FMT;
  } else {
    cell.value = value;
  }
}

/** Rows written between two turns of the event loop while a sheet is built. */
const ROWS_PER_TURN = 250;

/**
 * A sheet with one header row and a row per item. Columns that hold user text are formatted as
 * Text as a whole (cells added later inherit the column's format), so a row costs one addRow.
 * Every ROWS_PER_TURN rows the event loop gets a turn: other requests are answered meanwhile
 * (10 000 runs take about half a second to lay out), and a chart rasterised on the thread pool
 * goes on to its PNG encoding while the sheet is still being built.
 */
async function addTable(
  wb: ExcelJS.Workbook,
  model: ReportModel,
  name: string,
  columns: Column[],
  rows: Iterable<(Cell | UserText)[]>,
): Promise<ExcelJS.Worksheet> {
  const ws = wb.addWorksheet(name, { views: [{ state: 'frozen', ySplit: 1 }] });
  const textColumns = new Set<number>();
  const first = rows[Symbol.iterator]();
  let next = first.next();
  if (!next.done) next.value.forEach((v, i) => v instanceof UserText && textColumns.add(i));
  ws.columns = columns.map((c, i) => ({
    header: c.header,
    width: c.width,
    style: textColumns.has(i) ? { numFmt: TEXT_FMT } : c.numFmt ? { numFmt: c.numFmt } : {},
  }));
  styleHeader(ws.getRow(1));
  // Room for headers wrapped over up to three lines.
  ws.getRow(1).height = 45;
  // One style object per column, shared by its cells: exceljs gives every new cell its own copy of
  // the column's style and, when writing, turns each distinct object into XML to find its style
  // id (a fifth of the whole export); a shared object is looked up once. Frozen, so a later
  // `cell.numFmt = …` on one cell throws instead of restyling the column.
  const columnStyles = columns.map((c, i) => Object.freeze({ numFmt: textColumns.has(i) ? TEXT_FMT : (c.numFmt ?? 'General') }));
  const textStyle = Object.freeze({ numFmt: TEXT_FMT });
  for (let written = 0; !next.done; next = first.next()) {
    if (++written % ROWS_PER_TURN === 0) await setImmediate();
    const values = next.value;
    const row = ws.addRow(values.map((v) => (v instanceof UserText ? safeText(v.text) : v)));
    values.forEach((v, i) => {
      row.getCell(i + 1).style = v instanceof UserText && !textColumns.has(i) ? textStyle : columnStyles[i]!;
    });
  }
  printSetup(ws, model, '1:1');
  return ws;
}

function addSummary(wb: ExcelJS.Workbook, model: ReportModel) {
  const ws = headedSheet(
    wb,
    'Summary',
    [
      ['Item', 31],
      ['Value', 70],
      ['Standard error', 13],
      ['Interval low', 13],
      ['Interval high', 13],
      ['Unit', 12],
    ],
    false,
  );
  let section = '';
  let r = 2;
  for (const line of model.summary) {
    if (line.section !== section) {
      section = line.section;
      sectionTitle(ws, r++, section, 6);
    }
    const row = ws.getRow(r);
    row.getCell(1).value = line.label;
    const v = line.value;
    const value = row.getCell(2);
    if (typeof v === 'string') setCell(value, user(v));
    else {
      value.value = v;
      if (v instanceof Date) value.numFmt = TIME_FMT;
      else if (typeof v === 'number') value.numFmt = numFmt(line.decimals ?? 2);
      value.alignment = { horizontal: 'left' };
    }
    if (typeof v === 'number') {
      const fmt = numFmt(line.decimals ?? 2);
      if (line.se !== undefined && line.se !== null) Object.assign(row.getCell(3), { value: line.se, numFmt: fmt });
      if (line.interval) {
        Object.assign(row.getCell(4), { value: line.interval[0], numFmt: fmt });
        Object.assign(row.getCell(5), { value: line.interval[1], numFmt: fmt });
      }
    }
    if (line.unit) row.getCell(6).value = line.unit;
    value.alignment = { ...value.alignment, wrapText: true, vertical: 'top' };
    row.getCell(1).alignment = { vertical: 'top', wrapText: true };
    for (let c = 3; c <= 6; c++) row.getCell(c).alignment = { ...row.getCell(c).alignment, vertical: 'top' };
    // Wrapped text needs its height set: about 90 characters fit on a line of the Value column and
    // about 32 on a line of the Item column (a long label must not run under its value).
    const lines = Math.max(typeof v === 'string' ? Math.ceil(v.length / 90) : 1, Math.ceil(line.label.length / 32));
    if (lines > 1) row.height = 15 * lines;
    if (line.name) wb.definedNames.add(`'Summary'!$B$${r}`, line.name);
    r++;
  }
  printSetup(ws, model, '1:1', true);
  return ws;
}

/** Rows the two chart images take on the Fit sheet (315 px high at the default 20 px a row). */
const CHART_ROWS = 17;

/**
 * The Eyring plot and the selectivity chart side by side under the fit's parameters, so that the
 * Fit sheet prints as one page right after the Summary: the charts land on page 2.
 */
function addChartsToFit(wb: ExcelJS.Workbook, ws: ExcelJS.Worksheet, firstRow: number, charts: ReportCharts) {
  const note = ws.getCell(firstRow, 1);
  note.value = 'Charts drawn from the same data and fit as the Summary (bands at the stated level).';
  note.font = { italic: true };
  const eyring = wb.addImage({ buffer: charts.eyring as unknown as ExcelJS.Buffer, extension: 'png' });
  const selectivity = wb.addImage({ buffer: charts.selectivity as unknown as ExcelJS.Buffer, extension: 'png' });
  ws.addImage(eyring, { tl: { col: 0, row: firstRow }, ext: { width: 540, height: 315 } });
  ws.addImage(selectivity, { tl: { col: 5, row: firstRow }, ext: { width: 540, height: 315 } });
  ws.pageSetup.printArea = `A1:J${firstRow + CHART_ROWS}`;
}

type Residual = NonNullable<ReportModel['fit']>['residuals'][number];

/** A run's residual columns (empty cells for a run the fit did not report on). */
function residualCells(res: Residual | undefined): (Cell | UserText)[] {
  if (!res) return [null, null, null, null, null, user(null)];
  // Flags may quote an exclusion reason the user typed.
  return [res.fitted, res.residual, res.studentized, res.leverage, res.cooksDistance, user(res.flags.join(', ') || null)];
}

async function addMeasurements(wb: ExcelJS.Workbook, model: ReportModel) {
  const { data, decimals: d, labels, fit } = model;
  const specLn = model.specificationLnRatio;
  const pct = numFmt(d.percent);
  const columns: Column[] = [
    { header: 'Sample', width: 14 },
    { header: 'Replicate', width: 10 },
    { header: 'T (°C)', width: 9, numFmt: numFmt(d.celsius) },
    { header: 'T (K)', width: 9, numFmt: numFmt(d.kelvin) },
    { header: 'Reported as', width: 9 },
    { header: 'Value as reported (A part for a:b)', width: 14, numFmt: 'General' },
    { header: 'B part (a:b)', width: 9, numFmt: 'General' },
    { header: 'At least (bound)', width: 9 },
    { header: 'Assay SD (units of the measure)', width: 12, numFmt: 'General' },
    { header: `${labels.ratio.replace(' (A:B)', '')} A:B (−)`, width: 10, numFmt: numFmt(d.ratio) },
    ...(labels.excess ? [{ header: labels.excess, width: 9, numFmt: pct }] : []),
    { header: labels.major, width: 11, numFmt: pct },
    { header: 'ln r (−)', width: 9, numFmt: numFmt(d.ln) },
    { header: 'Status', width: 10 },
    { header: 'Exclusion reason', width: 22 },
    { header: 'Conversion (%)', width: 10, numFmt: '0.0' },
    { header: 'Time (h)', width: 8, numFmt: '0.00' },
    { header: 'Notes', width: 22 },
    ...(specLn !== null ? [{ header: 'Meets specification', width: 13 }] : []),
    // The fit's residuals, on the run they belong to.
    ...(fit
      ? [
          { header: 'Fitted ln r (−)', width: 9, numFmt: '0.0000' },
          { header: 'Residual (−)', width: 9, numFmt: '0.0000' },
          { header: 'Studentized residual (−)', width: 11, numFmt: '0.00' },
          { header: 'Leverage (−)', width: 9, numFmt: '0.000' },
          { header: "Cook's distance (−)", width: 9, numFmt: '0.000' },
          { header: 'Flags', width: 18 },
        ]
      : []),
  ];
  function* rows() {
    for (let i = 0; i < data.measurements.length; i++) {
      const p = data.analysis.points[i]!;
      yield [
        ...measurementRunCells(model, i, user),
        ...(specLn !== null ? [runMeetsSpecification(p.lnRatio, specLn)] : []),
        ...(fit ? residualCells(fit.residuals[i]) : []),
      ] as (Cell | UserText)[];
    }
  }
  await addTable(wb, model, 'Measurements', columns, rows());
}

/** The fit's parameters and covariance; returns the first free row (for the charts), or null without a fit. */
function addFit(wb: ExcelJS.Workbook, model: ReportModel): { ws: ExcelJS.Worksheet; next: number | null } {
  const fit = model.fit;
  const ws = headedSheet(
    wb,
    'Fit',
    [
      ['Quantity', 30],
      ['Estimate', 13],
      ['Standard error', 13],
      ['Interval low', 13],
      ['Interval high', 13],
      ['Unit', 12],
      ['', 12],
      ['', 14],
      ['', 24],
      ['', 14],
    ],
    false,
  );
  if (!fit) {
    ws.getCell('A2').value = `No fit: ${model.data.analysis.problem?.message ?? 'not enough data'}`;
    printSetup(ws, model, '1:1');
    return { ws, next: null };
  }
  const d = model.decimals;
  const rows: [string, number | null, number | null, [number, number] | null, string, string][] = [
    ['Slope of ln r on 1/T', fit.slope, fit.covariance ? Math.sqrt(fit.covariance.slopeSlope) : null, null, 'K', '0.0'],
    ['Intercept of ln r', fit.intercept, fit.covariance ? Math.sqrt(fit.covariance.interceptIntercept) : null, null, '−', '0.0000'],
    ['ΔΔH‡', fit.ddH['kJ/mol'], fit.ddH.se?.['kJ/mol'] ?? null, fit.ddH.ci?.['kJ/mol'] ?? null, 'kJ/mol', numFmt(d.ddH)],
    ['ΔΔS‡', fit.ddS['J/(mol*K)'], fit.ddS.se?.['J/(mol*K)'] ?? null, fit.ddS.ci?.['J/(mol*K)'] ?? null, 'J/(mol·K)', numFmt(d.ddS)],
    [
      'ΔΔG‡ at 25 °C',
      fit.ddGAt25C['kJ/mol'],
      fit.ddGAt25C.se?.['kJ/mol'] ?? null,
      fit.ddGAt25C.ci?.['kJ/mol'] ?? null,
      'kJ/mol',
      numFmt(d.ddH),
    ],
    ['Correlation of ΔΔH‡ and ΔΔS‡', fit.correlation, null, null, '−', '0.000'],
    ['R²', fit.rSquared, null, null, '−', '0.0000'],
    ['Residual SD of ln r', fit.residualSD, null, null, '−', '0.0000'],
    ['Runs fitted', fit.n, null, null, 'runs', '0'],
    ['Degrees of freedom', fit.dof, null, null, '−', '0'],
    ['Covariance slope·slope', fit.covariance?.slopeSlope ?? null, null, null, 'K²', '0.00E+00'],
    ['Covariance slope·intercept', fit.covariance?.slopeIntercept ?? null, null, null, 'K', '0.00E+00'],
    ['Covariance intercept·intercept', fit.covariance?.interceptIntercept ?? null, null, null, '−', '0.00E+00'],
  ];
  let r = 2;
  for (const [label, value, se, ci, unit, fmt] of rows) {
    const row = ws.getRow(r++);
    row.getCell(1).value = label;
    for (const [c, v] of [
      [2, value],
      [3, se],
      [4, ci?.[0] ?? null],
      [5, ci?.[1] ?? null],
    ] as const) {
      if (v === null) continue;
      Object.assign(row.getCell(c), { value: v, numFmt: fmt });
    }
    row.getCell(6).value = unit;
  }
  printSetup(ws, model, '1:1', true);
  return { ws, next: r + 1 };
}

async function addForecast(wb: ExcelJS.Workbook, model: ReportModel) {
  const { decimals: d, labels, level } = model;
  const withSpec = model.specificationLnRatio !== null;
  const pct = numFmt(d.percent);
  const ratio = numFmt(d.ratio);
  const columns: Column[] = [
    { header: 'T (°C)', width: 9, numFmt: numFmt(d.celsius) },
    { header: 'T (K)', width: 9, numFmt: numFmt(d.kelvin) },
    { header: 'Row', width: 20 },
    { header: `${labels.ratio.replace(' (A:B)', '')} A:B (−)`, width: 10, numFmt: ratio },
    { header: `${level} % PI low, A:B (−)`, width: 11, numFmt: ratio },
    { header: `${level} % PI high, A:B (−)`, width: 11, numFmt: ratio },
    ...(labels.excess
      ? [
          { header: labels.excess, width: 9, numFmt: pct },
          { header: `${level} % PI low, ${labels.excess}`, width: 11, numFmt: pct },
          { header: `${level} % PI high, ${labels.excess}`, width: 11, numFmt: pct },
        ]
      : []),
    { header: labels.major, width: 11, numFmt: pct },
    { header: 'ΔΔG‡ (kJ/mol)', width: 10, numFmt: numFmt(d.ddH) },
    { header: 'Outside screened range', width: 10 },
    { header: 'Model', width: 22 },
    ...(withSpec ? [{ header: `Meets specification (${model.specificationText})`, width: 24 }] : []),
  ];
  function* rows() {
    for (const g of model.grid) {
      const p = g.prediction;
      const pi = p.predictionInterval;
      yield [
        clean(p.celsius),
        p.kelvin,
        g.source === 'grid'
          ? 'grid'
          : g.source === 'proposed'
            ? 'proposed temperature'
            : g.source === 'recommended'
              ? 'recommended by the saved plan'
              : user(`saved: ${g.note ?? ''}`),
        ratioOf(p),
        pi ? ratioRange(pi)[0] : null,
        pi ? ratioRange(pi)[1] : null,
        ...(labels.excess ? [p.eePercent, pi?.eePercent[0] ?? null, pi?.eePercent[1] ?? null] : []),
        Math.max(p.percentA, 100 - p.percentA),
        p.ddG['kJ/mol'],
        p.extrapolated ? 'yes' : 'no',
        p.model === 'segmented' ? `two branches: ${p.branch === 'low' ? 'low' : 'high'}-temperature branch` : 'one line',
        ...(withSpec ? [g.meets] : []),
      ] as (Cell | UserText)[];
    }
  }
  const ws = await addTable(wb, model, 'Forecast', columns, rows());
  if (model.grid.length === 0) ws.getCell('A2').value = model.fit ? 'No temperatures to forecast.' : 'No fit, so no forecast.';
}

const MEASURE_WORDS: Record<string, string> = { ee: '% ee', er: '% major isomer (er)', percentA: '% major isomer', dr: 'dr (r:1)' };

/** A bold section title in row `r`, its first `width` cells on the section fill. */
function sectionTitle(ws: ExcelJS.Worksheet, r: number, title: Cell | UserText, width: number) {
  const row = ws.getRow(r);
  setCell(row.getCell(1), title);
  row.font = { bold: true };
  for (let c = 1; c <= width; c++) row.getCell(c).fill = SECTION_FILL;
}

/** Write a section title and label/value rows from `r`; returns the next free row. */
function keyValues(ws: ExcelJS.Worksheet, r: number, title: string, lines: [string, Cell | UserText, string?, string?][]): number {
  sectionTitle(ws, r++, title, 3);
  for (const [label, value, unit, fmt] of lines) {
    const row = ws.getRow(r++);
    row.getCell(1).value = label;
    setCell(row.getCell(2), value);
    if (fmt) row.getCell(2).numFmt = fmt;
    row.getCell(2).alignment = { horizontal: 'left', wrapText: true, vertical: 'top' };
    if (typeof value === 'string' && value.length > 45) row.height = 15 * Math.ceil(value.length / 45);
    if (unit) row.getCell(3).value = unit;
  }
  return r + 1;
}

/** A column of a table inside a sheet: its header, an item's cell (empty when null) and the cell's number format. */
type InnerColumn<T> = [header: string, cell: (item: T) => Cell | UserText, fmt?: string];

/** A table inside a sheet from row `r`: a header row, then a row per item; returns the next free row. */
function innerTable<T>(ws: ExcelJS.Worksheet, r: number, items: readonly T[], columns: InnerColumn<T>[]): number {
  const head = ws.getRow(r++);
  columns.forEach(([header], i) => (head.getCell(i + 1).value = header));
  styleHeader(head);
  for (const item of items) {
    const row = ws.getRow(r++);
    columns.forEach(([, cell, fmt], i) => {
      const v = cell(item);
      if (v === null) return;
      setCell(row.getCell(i + 1), v);
      if (fmt) row.getCell(i + 1).numFmt = fmt;
    });
  }
  return r;
}

/** The saved plan: its inputs, the answer with its rule and probability, the window chart and the curve. */
function addPlan(wb: ExcelJS.Workbook, model: ReportModel, window: Buffer | null | undefined) {
  const plan = model.data.plan!;
  const ws = headedSheet(wb, 'Plan', [
    ['Item', 34],
    ['Value', 46],
    ['Unit', 10],
    ['', 12],
    ['', 12],
    ['', 12],
    ['', 13],
    ['', 13],
    ['', 10],
    ['', 24],
  ]);
  const spec = plan.specification;
  let r = 2;
  r = keyValues(ws, r, 'Specification used by the plan', [
    ['Measure', MEASURE_WORDS[spec.measure] ?? spec.measure],
    ['Minimum', spec.minimum, MEASURE_WORDS[spec.measure] ?? spec.measure, 'General'],
    ['Required probability', spec.probability, '−', '0.000'],
    ['Judged on', spec.runs > 1 ? `the mean of ${spec.runs} new runs` : 'a single new run'],
  ]);
  r = keyValues(
    ws,
    r,
    'Inputs',
    plan.inputs.map((l): [string, Cell | UserText] => [l.label, l.value]),
  );
  const rec = plan.recommended;
  const answer: [string, Cell | UserText, string?, string?][] = rec
    ? [
        ['Recommended temperature', rec.celsius, '°C', '0.0'],
        ['Recommended temperature (K)', rec.kelvin, 'K', '0.00'],
        ['Rule', plan.rule],
        ['Probability a new run meets the specification there', rec.probabilityMeetsSpec, '−', '0.000'],
      ]
    : [['Recommended temperature', 'none: no temperature in the allowed range meets every constraint']];
  answer.push(
    [
      'Operating window from',
      plan.window ? plan.window.fromCelsius : 'none',
      plan.window ? '°C' : undefined,
      plan.window ? '0.0' : undefined,
    ],
    ['Operating window to', plan.window ? plan.window.toCelsius : 'none', plan.window ? '°C' : undefined, plan.window ? '0.0' : undefined],
    ['Binding constraints', plan.binding.length ? plan.binding.join(', ') : 'none'],
    ['Conflict', plan.conflict ?? 'none'],
  );
  if (plan.resolutions.length) answer.push(['What would resolve it', plan.resolutions.join(' ')]);
  answer.push([
    'Next runs',
    plan.nextRuns
      ? `${plan.nextRuns.celsius.map((c) => `${c.toFixed(1).replace('-', '−')} °C`).join(', ')} (to narrow the forecast at ${plan.nextRuns.atCelsius.toFixed(1).replace('-', '−')} °C)`
      : 'none asked for',
  ]);
  answer.push(['Saved plan', `version ${plan.version}, ${plan.updatedAt.slice(0, 16).replace('T', ' ')} UTC`]);
  answer.push(['Caution', plan.caution]);
  const answerStart = r + 1;
  r = keyValues(ws, r, 'Answer', answer);
  if (rec) {
    wb.definedNames.add(`'Plan'!$B$${answerStart}`, 'Plan_recommended_T_C');
    wb.definedNames.add(`'Plan'!$B$${answerStart + 3}`, 'Plan_probability');
  }
  if (window) {
    const image = wb.addImage({ buffer: window as unknown as ExcelJS.Buffer, extension: 'png' });
    ws.addImage(image, { tl: { col: 3.2, row: 1 }, ext: { width: 540, height: 315 } });
    r = Math.max(r, 20);
  }
  const unit = MEASURE_WORDS[spec.measure] ?? spec.measure;
  innerTable(ws, r, plan.rows, [
    ['Curve: T (°C)', (row) => row.celsius, '0.0'],
    ['T (K)', (row) => row.kelvin, '0.00'],
    ['P(new run meets) (−)', (row) => row.probabilityMeetsSpec, '0.000'],
    [`Predicted (${unit})`, (row) => row.predicted, 'General'],
    [`Band low (${unit})`, (row) => row.bandLow, 'General'],
    [`Band high (${unit})`, (row) => row.bandHigh, 'General'],
    ['Time to target (h)', (row) => row.timeToTargetHours, '0.00'],
    ['ee after hold (%)', (row) => row.eeAfterHoldPercent, '0.0'],
    ['All constraints hold', (row) => (row.feasible ? 'yes' : 'no')],
    ['Failing constraints', (row) => row.failing || null],
  ]);
  printSetup(ws, model, '1:1');
}

/** Saved comparisons of the project: each campaign at the chosen temperature, and each pair's verdict. */
function addComparisons(wb: ExcelJS.Workbook, model: ReportModel) {
  const list = model.data.comparisons ?? [];
  const ws = wb.addWorksheet('Comparison', { views: [{ showGridLines: true }] });
  ws.columns = [30, 14, 14, 14, 14, 14, 26, 24, 40].map((width) => ({ width }));
  ws.getCell('A1').value = 'Saved comparisons of the project, recomputed from the current runs (95 % intervals).';
  ws.getCell('A1').font = { bold: true };
  let r = 2;
  for (const c of list) {
    sectionTitle(
      ws,
      r++,
      user(
        `${c.name}: at ${c.temperatureCelsius.toFixed(1).replace('-', '−')} °C, values in ${MEASURE_WORDS[c.valueMeasure] ?? c.valueMeasure}`,
      ),
      9,
    );
    r = innerTable(ws, r, c.campaigns, [
      ['Campaign', (x) => user(x.title ?? 'not available to this reader')],
      ['ΔΔH‡ (kJ/mol)', (x) => x.ddHKJPerMol, '0.00'],
      ['ΔΔS‡ (J/(mol·K))', (x) => x.ddSJPerMolK, '0.0'],
      [`Value at T (${MEASURE_WORDS[c.valueMeasure] ?? c.valueMeasure})`, (x) => x.valueAtTemperature, 'General'],
      ['95 % CI low', (x) => x.intervalLow, 'General'],
      ['95 % CI high', (x) => x.intervalHigh, 'General'],
      [
        'Its specification',
        (x) =>
          x.specification
            ? `${MEASURE_WORDS[x.specification.measure] ?? x.specification.measure} ≥ ${x.specification.minimum}, probability ${x.specification.probability}`
            : 'none set',
      ],
      ['Meets at T', (x) => x.meetsAtTemperature ?? (x.specification ? 'no fit' : '—')],
      ['Problem', (x) => x.problem],
    ]);
    r = innerTable(ws, r, c.pairs, [
      ['Pair (first against second)', (p) => user(`${p.first} against ${p.second}`)],
      ['Difference in ln r', (p) => p.differenceLnR, '0.000'],
      ['95 % low', (p) => p.intervalLow, '0.000'],
      ['95 % high', (p) => p.intervalHigh, '0.000'],
      ['P(first more selective)', (p) => p.probabilityFirstBetter, '0.000'],
      ['Equal slopes p', (p) => p.equalSlopesP, '0.000'],
      ['Crossover (°C)', (p) => p.crossoverCelsius, '0.0'],
      [
        'Verdict',
        (p) =>
          p.verdict === 'first'
            ? 'the first is more selective'
            : p.verdict === 'second'
              ? 'the second is more selective'
              : 'the data cannot tell them apart',
      ],
      ['Note', (p) => p.note || null],
    ]);
    r++;
  }
  if (list[0]) {
    const row = ws.getRow(r);
    row.getCell(1).value = list[0].caution;
    row.getCell(1).alignment = { wrapText: true, vertical: 'top' };
    ws.mergeCells(r, 1, r, 9);
    row.height = 45;
  }
  printSetup(ws, model, undefined);
}

/**
 * The workbook's ZIP at deflate level 1 rather than 6: about a quarter larger (200 KB instead of
 * 160 KB for 1 000 runs) and written in half the time; the PNG charts inside compress no further
 * at any level.
 */
const REPORT_ZIP: Partial<ExcelJS.XlsxWriteOptions['zip']> = { compression: 'DEFLATE', compressionOptions: { level: 1 } };

/** The file name of a campaign export, e.g. eyrie-Route-screen-report.xlsx. */
export function reportFileName(title: string, suffix = 'report.xlsx'): string {
  return safeFileName(title, suffix);
}

/**
 * The workbook as a buffer. Pure apart from rendering: no database, no clock. Without prepared
 * charts, they are rasterised on the thread pool while the sheets are built.
 */
export async function buildCampaignReport(
  data: ReportData,
  meta: ReportMeta,
  prepared?: { model?: ReportModel; charts?: ReportCharts | null },
): Promise<Buffer> {
  const model = prepared?.model ?? buildReportModel(data, meta);
  const pending = prepared?.charts !== undefined ? Promise.resolve(prepared.charts) : renderReportChartsAsync(model);
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Eyrie';
  wb.created = meta.generatedAt;
  wb.title = `${data.campaign.title}: selectivity report`;

  // Between sheets (and within long ones) the event loop gets a turn, so a chart whose
  // rasterising finished goes on to its PNG encoding while the next rows are built.
  addSummary(wb, model);
  await setImmediate();
  // The Fit sheet comes second; its chart images are added when rendering is done.
  const fitSheet = addFit(wb, model);
  await setImmediate();
  await addMeasurements(wb, model);
  await addForecast(wb, model);
  const charts = await pending;
  if (charts && fitSheet.next !== null) addChartsToFit(wb, fitSheet.ws, fitSheet.next, charts);
  if (data.plan) addPlan(wb, model, charts?.window);
  if (data.comparisons?.length) addComparisons(wb, model);

  const out = await wb.xlsx.writeBuffer({ zip: REPORT_ZIP });
  return Buffer.from(out as ArrayBuffer);
}
