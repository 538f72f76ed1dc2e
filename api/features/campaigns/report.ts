/**
 * The campaign's spreadsheet report: Summary, Measurements, Forecast (the fitted curve with its
 * prediction interval) and Saved forecasts. Every header names its unit; numbers stay numbers
 * (with display formats), so the workbook can be recomputed from.
 */
import ExcelJS from 'exceljs';
import type { Campaign } from '../../models/campaign';
import type { Measurement } from '../../models/measurement';
import type { AnalysisResponse, SavedForecastView } from './analysis-schemas';
import { SELECTIVITY_CAUTION } from '../../lib/cautions';
import { fromSeconds } from '../../science/quantities';

export interface ReportData {
  campaign: Campaign;
  measurements: Measurement[];
  analysis: AnalysisResponse;
  forecasts: SavedForecastView[];
}

const FMT = {
  energy: '0.00',
  entropy: '0.0',
  kelvin: '0.00',
  celsius: '0.0',
  percent: '0.00',
  ln: '0.0000',
  ratio: '0.00',
  stat: '0.000',
  integer: '0',
  time: 'yyyy-mm-dd hh:mm:ss',
} as const;

const HEADER_FILL: ExcelJS.Fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFE6E9EF' } };

function styleHeader(row: ExcelJS.Row) {
  row.font = { bold: true };
  row.fill = HEADER_FILL;
  row.alignment = { vertical: 'middle', wrapText: true };
}

interface Column {
  header: string;
  width: number;
  numFmt?: string;
}

function addTable(wb: ExcelJS.Workbook, name: string, columns: Column[], rows: (string | number | boolean | Date | null)[][]): ExcelJS.Worksheet {
  const ws = wb.addWorksheet(name, { views: [{ state: 'frozen', ySplit: 1 }] });
  ws.columns = columns.map((c) => ({ header: c.header, width: c.width, style: c.numFmt ? { numFmt: c.numFmt } : {} }));
  styleHeader(ws.getRow(1));
  for (const r of rows) ws.addRow(r);
  return ws;
}

const ASSAY_NAMES: Record<string, string> = { 'chiral-hplc': 'chiral HPLC', 'chiral-sfc': 'chiral SFC', 'chiral-gc': 'chiral GC', nmr: 'NMR', other: 'other' };

/** Summary rows: label, value, SE, CI low, CI high, unit. */
function summaryRows(data: ReportData, meta: { appVersion: string; generatedAt: Date }): (string | number | Date | null)[][] {
  const { campaign, analysis } = data;
  const fit = analysis.fit;
  const rows: (string | number | Date | null)[][] = [
    ['Campaign', campaign.title, null, null, null, null],
    ['Product A (numerator of r)', campaign.productNameA, null, null, null, null],
    ['Product B', campaign.productNameB, null, null, null, null],
    ['Reported measure', campaign.measure, null, null, null, null],
    ['Assay method', ASSAY_NAMES[campaign.assayMethod] ?? campaign.assayMethod, null, null, null, null],
    ['Default assay uncertainty (units of the measure)', campaign.defaultUncertainty, null, null, null, null],
    ['Sign convention', `${analysis.convention}. Much of the literature uses the opposite sign (A minus B).`, null, null, null, null],
  ];
  if (!fit) {
    rows.push(['Fit', `No fit: ${analysis.problem?.message ?? 'not enough data'}`, null, null, null, null]);
  } else {
    const ci = fit.confidence * 100;
    rows.push(
      ['Fit', `${fit.weighting === 'none' ? 'Unweighted' : 'Weighted'} least squares of ln r on 1/T; intervals at ${ci} % confidence`, null, null, null, null],
      ['ΔΔH‡ (kJ/mol)', fit.ddH['kJ/mol'], fit.ddH.se?.['kJ/mol'] ?? null, fit.ddH.ci?.['kJ/mol'][0] ?? null, fit.ddH.ci?.['kJ/mol'][1] ?? null, 'kJ/mol'],
      ['ΔΔH‡ (kcal/mol)', fit.ddH['kcal/mol'], fit.ddH.se?.['kcal/mol'] ?? null, fit.ddH.ci?.['kcal/mol'][0] ?? null, fit.ddH.ci?.['kcal/mol'][1] ?? null, 'kcal/mol'],
      ['ΔΔS‡ (J/(mol·K))', fit.ddS['J/(mol*K)'], fit.ddS.se?.['J/(mol*K)'] ?? null, fit.ddS.ci?.['J/(mol*K)'][0] ?? null, fit.ddS.ci?.['J/(mol*K)'][1] ?? null, 'J/(mol·K)'],
      ['ΔΔS‡ (cal/(mol·K))', fit.ddS['cal/(mol*K)'], fit.ddS.se?.['cal/(mol*K)'] ?? null, fit.ddS.ci?.['cal/(mol*K)'][0] ?? null, fit.ddS.ci?.['cal/(mol*K)'][1] ?? null, 'cal/(mol·K)'],
      ['Correlation of ΔΔH‡ and ΔΔS‡ (−)', fit.correlation, null, null, null, '−'],
      ['ΔΔG‡ at 25 °C (kJ/mol)', fit.ddGAt25C['kJ/mol'], fit.ddGAt25C.se?.['kJ/mol'] ?? null, fit.ddGAt25C.ci?.['kJ/mol'][0] ?? null, fit.ddGAt25C.ci?.['kJ/mol'][1] ?? null, 'kJ/mol'],
      ['ΔΔG‡ at 25 °C (kcal/mol)', fit.ddGAt25C['kcal/mol'], fit.ddGAt25C.se?.['kcal/mol'] ?? null, fit.ddGAt25C.ci?.['kcal/mol'][0] ?? null, fit.ddGAt25C.ci?.['kcal/mol'][1] ?? null, 'kcal/mol'],
      ['R² (−)', fit.rSquared, null, null, null, '−'],
      ['Runs fitted, n', fit.n, null, null, null, 'runs'],
      ['Degrees of freedom', fit.dof, null, null, null, '−'],
      ['Fitted range (K)', fit.temperatureRange.minKelvin, null, null, fit.temperatureRange.maxKelvin, 'K'],
    );
    for (const w of fit.warnings) rows.push(['Warning', w.message, null, null, null, null]);
    rows.push(...curvatureRows(fit.twoBranch));
  }
  rows.push(
    ['Caution', SELECTIVITY_CAUTION, null, null, null, null],
    ['Generated (UTC)', meta.generatedAt, null, null, null, null],
    ['Eyrie version', meta.appVersion, null, null, null, null],
  );
  return rows;
}

type Row = (string | number | Date | null)[];

/** Curvature rows; a break temperature row only when a break is accepted, an isoinversion only when claimed. */
function curvatureRows(tb: NonNullable<AnalysisResponse['fit']>['twoBranch']): Row[] {
  if (!tb.checked) return [['Curvature check', tb.note, null, null, null, null]];
  const rows: Row[] = [
    ['Curvature check', tb.preferred === 'two-branch' ? 'Two branches meeting at a break describe the data better than one line; forecasts use them' : 'One straight line is adequate', null, null, null, null],
    ['Break test p (sup-F, simulated) (−)', tb.breakTest.p, null, null, null, '−'],
  ];
  if (tb.lackOfFit) rows.push(['Lack-of-fit F test of one line, p (−)', tb.lackOfFit.p, null, null, null, '−']);
  if (tb.break && tb.low && tb.high) {
    const name = tb.claim === 'isoinversion' ? `Isoinversion temperature, where r has a ${tb.extremum} (°C)` : 'Change of slope at (°C)';
    rows.push(
      [name, tb.break.celsius, null, tb.break.ci?.celsius[0] ?? null, tb.break.ci?.celsius[1] ?? null, '°C'],
      ['Low-temperature branch ΔΔH‡ (kJ/mol)', tb.low.ddH['kJ/mol'], tb.low.ddH.se?.['kJ/mol'] ?? null, null, null, 'kJ/mol'],
      ['High-temperature branch ΔΔH‡ (kJ/mol)', tb.high.ddH['kJ/mol'], tb.high.ddH.se?.['kJ/mol'] ?? null, null, null, 'kJ/mol'],
    );
  }
  rows.push(['Curvature note', tb.note, null, null, null, null]);
  return rows;
}

/** Which model a forecast came from (snapshots saved before the segmented model have neither field). */
function modelLabel(p: { model?: string; branch?: 'low' | 'high' | null }): string {
  if (p.model !== 'segmented') return 'one line';
  return p.branch === 'low' ? 'two branches: low-temperature branch' : 'two branches: high-temperature branch';
}

export function reportFileName(title: string): string {
  const slug = title.normalize('NFKD').replace(/[^\w\s-]/g, '').trim().replace(/\s+/g, '-').slice(0, 60) || 'campaign';
  return `eyrie-${slug}-report.xlsx`;
}

export async function buildCampaignReport(data: ReportData, meta: { appVersion: string; generatedAt: Date }): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Eyrie';
  wb.created = meta.generatedAt;

  const summary = addTable(
    wb,
    'Summary',
    [
      { header: 'Quantity', width: 42 },
      { header: 'Value', width: 60 },
      { header: 'Standard error', width: 16 },
      { header: 'CI low', width: 14 },
      { header: 'CI high', width: 14 },
      { header: 'Unit', width: 14 },
    ],
    summaryRows(data, meta),
  );
  summary.eachRow((row, i) => {
    if (i === 1) return;
    const unit = String(row.getCell(6).value ?? '');
    const fmt = unit.includes('J/(mol') || unit.includes('cal/(mol') ? FMT.entropy : unit.endsWith('/mol') ? FMT.energy : unit === 'K' ? FMT.kelvin : unit === '°C' ? FMT.celsius : unit === '−' ? FMT.stat : unit === 'runs' ? FMT.integer : undefined;
    for (const c of [2, 3, 4, 5]) {
      const cell = row.getCell(c);
      if (cell.value instanceof Date) cell.numFmt = FMT.time;
      else if (fmt && typeof cell.value === 'number') cell.numFmt = fmt;
    }
    row.getCell(2).alignment = { wrapText: true, vertical: 'top' };
  });

  const residuals = data.analysis.fit?.residuals ?? [];
  addTable(
    wb,
    'Measurements',
    [
      { header: 'Sample', width: 14 },
      { header: 'Replicate', width: 10 },
      { header: 'T (K)', width: 10, numFmt: FMT.kelvin },
      { header: 'T (°C)', width: 10, numFmt: FMT.celsius },
      { header: 'Measure', width: 10 },
      { header: 'Value (as reported; er/dr: A part)', width: 16, numFmt: '0.00' },
      { header: 'Value B part (er/dr)', width: 12, numFmt: '0.00' },
      { header: 'Lower bound (≥)', width: 10 },
      { header: 'Uncertainty (units of the measure)', width: 16, numFmt: '0.00' },
      { header: 'ln r (−)', width: 10, numFmt: FMT.ln },
      { header: 'ee (%)', width: 10, numFmt: FMT.percent },
      { header: 'Residual (ln r)', width: 12, numFmt: FMT.ln },
      { header: 'Studentized residual (−)', width: 12, numFmt: '0.00' },
      { header: 'Status', width: 10 },
      { header: 'Flags', width: 20 },
      { header: 'Exclusion reason', width: 30 },
      { header: 'Conversion (%)', width: 12, numFmt: '0.0' },
      { header: 'Reaction time (h)', width: 12, numFmt: '0.00' },
      { header: 'Notes', width: 30 },
      { header: 'Model', width: 28 },
    ],
    data.measurements.map((m, i) => {
      const p = data.analysis.points[i]!;
      const r = residuals[i];
      return [
        m.sampleId,
        m.replicateLabel,
        m.temperatureK,
        p.celsius,
        m.measure,
        m.value,
        m.valueB,
        m.isLowerBound ? 'yes' : 'no',
        m.uncertainty,
        p.lnRatio,
        p.eePercent,
        r?.residual ?? null,
        r?.studentized ?? null,
        p.status,
        r ? r.flags.filter((f) => !f.startsWith('excluded:')).join(', ') : '',
        p.exclusionReason,
        m.conversionPercent,
        m.reactionTimeS === null ? null : fromSeconds(m.reactionTimeS, 'h'),
        m.notes,
      ];
    }),
  );

  const level = Math.round((data.analysis.fit?.confidence ?? 0.95) * 100);
  addTable(
    wb,
    'Forecast',
    [
      { header: 'T (K)', width: 10, numFmt: FMT.kelvin },
      { header: 'T (°C)', width: 10, numFmt: FMT.celsius },
      { header: 'ee (%)', width: 10, numFmt: FMT.percent },
      { header: 'A (%)', width: 10, numFmt: FMT.percent },
      { header: 'Ratio A/B (−)', width: 12, numFmt: FMT.ratio },
      { header: 'ΔΔG‡ (kJ/mol)', width: 12, numFmt: FMT.energy },
      { header: `${level} % prediction interval, ee low (%)`, width: 16, numFmt: FMT.percent },
      { header: `${level} % prediction interval, ee high (%)`, width: 16, numFmt: FMT.percent },
      { header: `${level} % prediction interval, ratio low (−)`, width: 16, numFmt: FMT.ratio },
      { header: `${level} % prediction interval, ratio high (−)`, width: 16, numFmt: FMT.ratio },
      { header: 'Extrapolated', width: 12 },
      { header: 'Model', width: 28 },
    ],
    data.analysis.curve.map((p) => [
      p.kelvin,
      p.celsius,
      p.eePercent,
      p.percentA,
      p.ratio,
      p.ddG['kJ/mol'],
      p.predictionInterval?.eePercent[0] ?? null,
      p.predictionInterval?.eePercent[1] ?? null,
      p.predictionInterval?.ratio[0] ?? null,
      p.predictionInterval?.ratio[1] ?? null,
      p.extrapolated ? 'yes' : 'no',
      modelLabel(p),
    ]),
  );

  addTable(
    wb,
    'Saved forecasts',
    [
      { header: 'Saved (UTC)', width: 20, numFmt: FMT.time },
      { header: 'By', width: 16 },
      { header: 'Label', width: 20 },
      { header: 'T (K)', width: 10, numFmt: FMT.kelvin },
      { header: 'T (°C)', width: 10, numFmt: FMT.celsius },
      { header: 'Forecast ee (%)', width: 12, numFmt: FMT.percent },
      { header: 'Prediction interval, ee low (%)', width: 14, numFmt: FMT.percent },
      { header: 'Prediction interval, ee high (%)', width: 14, numFmt: FMT.percent },
      { header: 'Forecast ratio A/B (−)', width: 12, numFmt: FMT.ratio },
      { header: 'Runs measured within ±1 K (count)', width: 14, numFmt: FMT.integer },
      { header: 'Of those inside the prediction interval (count)', width: 16, numFmt: FMT.integer },
      { header: 'Notes', width: 30 },
      { header: 'Model', width: 28 },
    ],
    data.forecasts.map((f) => [
      new Date(f.createdAt),
      f.createdBy?.displayName ?? f.createdBy?.login ?? null,
      f.label,
      f.temperatureK,
      f.celsius,
      f.result.eePercent,
      f.result.predictionInterval?.eePercent[0] ?? null,
      f.result.predictionInterval?.eePercent[1] ?? null,
      f.result.ratio,
      f.measured.length,
      f.measured.filter((m) => m.insidePredictionInterval === true).length,
      f.notes,
      modelLabel(f.result),
    ]),
  );

  const out = await wb.xlsx.writeBuffer();
  return Buffer.from(out as ArrayBuffer);
}
