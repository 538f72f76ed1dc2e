/**
 * One reading of a campaign for every export: the summary lines, the forecast grid and the
 * chart series, computed once from the stored runs and the engine's analysis. The workbook,
 * the PDF, the CSVs and the e-mail all render this model, so they cannot disagree.
 */
import type { Campaign } from '../../models/campaign';
import type { Measurement } from '../../models/measurement';
import { CELSIUS_OFFSET_K, SIGN_CONVENTION, kelvinToCelsius, specificationLnRatio, type SpecificationMeasure } from '../../science';
import { SELECTIVITY_CAUTION } from '../../lib/cautions';
import { analyseScreen } from '../calculators/fit';
import type { FitResponse } from '../calculators/schemas';
import type { AnalysisResponse, SavedForecastView } from './analysis-schemas';
import { assaySettings, toEngineMeasurements } from './analysis';
import type { ComparisonReportData, PlanReportData } from '../plan/report-data';
import {
  decimalsForSe,
  fixed,
  lnOf,
  lnRange,
  measureLabels,
  ratioOf,
  ratioRange,
  readSelectivity,
  selectivityDecimals,
  type MeasureLabels,
} from './report-format';

export type FitPrediction = FitResponse['predictions'][number];

/**
 * A minimum selectivity the campaign must reach, in one of the measures (e.g. dr ≥ 10, ee ≥ 95;
 * er and percentA as the major isomer's share in %, 98 for 98:2).
 */
export interface ReportSpecification {
  measure: SpecificationMeasure;
  minimum: number;
  /** How sure a single new run (or the mean of `runs` runs) must be to meet it, e.g. 0.95. */
  probability?: number | null;
  runs?: number | null;
  /** Where it is stored: the campaign's own or the project's default. */
  source?: 'campaign' | 'project' | null;
  /** How the team wrote it, shown as is (optional). */
  text?: string | null;
}

export interface ReportData {
  campaign: Campaign;
  measurements: Measurement[];
  analysis: AnalysisResponse;
  forecasts: SavedForecastView[];
  /** The project's name; omitted → the summary leaves it out. */
  project?: { name: string } | null;
  /** The campaign's specification; null or omitted → "no specification set". */
  specification?: ReportSpecification | null;
  /** The temperature proposed for the process (K); omitted → the newest saved forecast's. */
  proposedK?: number | null;
  /** The jacket's working range (°C); omitted → the screened range. */
  jacketRangeC?: [number, number] | null;
  /** The campaign's stored plan in report shape; omitted → no Plan sheet. */
  plan?: PlanReportData | null;
  /** The project's saved comparisons (recomputed from current runs); omitted or empty → no Comparison sheet. */
  comparisons?: ComparisonReportData[] | null;
}

export interface ReportMeta {
  appVersion: string;
  generatedAt: Date;
  /** Who asked for the export (display name or login). */
  exportedBy?: string | null;
}

export type SummaryValue = string | number | Date | null;

/** One line of the summary: a label and a value, with SE, interval and unit where they apply. */
export interface SummaryLine {
  section: string;
  label: string;
  value: SummaryValue;
  /** Decimals shown for the value, its SE and its interval. */
  decimals?: number;
  se?: number | null;
  interval?: [number, number] | null;
  unit?: string;
  /** A defined name for the value cell in the workbook. */
  name?: string;
}

export interface GridRow {
  source: 'grid' | 'saved' | 'proposed' | 'recommended';
  /** Label of a saved forecast, or "proposed". */
  note: string | null;
  prediction: FitPrediction;
  /** Pass/fail of this row against the specification in words; null without a specification. */
  meets: string | null;
}

/** How a forecast reads against the specification, in words (never colour only). */
export const MEETS = {
  clear: 'meets: whole prediction interval at or above',
  central: 'forecast meets; interval reaches below',
  short: 'falls short',
} as const;

/** A forecast against ln r_spec: the whole prediction interval above, only the central value, or short. */
export function meetsSpecification(
  p: Pick<FitPrediction, 'lnRatio' | 'ratio' | 'predictionInterval'>,
  specLn: number | null,
): string | null {
  if (specLn === null) return null;
  if (!(lnOf(p) >= specLn)) return MEETS.short;
  const pi = p.predictionInterval;
  return pi && lnRange(pi)[0] >= specLn ? MEETS.clear : MEETS.central;
}

/** A measured run against ln r_spec: "meets" or "falls short" (a bound that reaches it meets). */
export function runMeetsSpecification(lnRatio: number, specLn: number | null): string | null {
  if (specLn === null) return null;
  return lnRatio >= specLn ? 'meets' : 'falls short';
}

/** Drop the last-bit noise of a kelvin round trip: −40.00000000000003 → −40. */
export const clean = (x: number) => Math.round(x * 1e9) / 1e9;

/**
 * One run's cells as the measurement tables list them (workbook sheet and CSV share the order).
 * `text` receives each field the user typed, so the workbook can mark it as text; the CSV passes it through.
 */
export function measurementRunCells<T>(model: ReportModel, i: number, text: (value: string | null) => T): (T | string | number | null)[] {
  const { data, labels, decimals: d } = model;
  const m = data.measurements[i]!;
  const p = data.analysis.points[i]!;
  const ratio = Math.exp(p.lnRatio);
  const reading = readSelectivity(ratio, d.ratio);
  return [
    text(m.sampleId),
    text(m.replicateLabel),
    clean(p.celsius),
    m.temperatureK,
    m.measure,
    m.value,
    m.valueB,
    m.isLowerBound ? 'yes' : 'no',
    m.uncertainty,
    ratio,
    ...(labels.excess ? [reading.excessPercent] : []),
    reading.majorPercent,
    p.lnRatio,
    p.status,
    text(m.excluded ? (m.excludedReason ?? 'no reason given') : null),
    m.conversionPercent,
    m.reactionTimeS === null ? null : m.reactionTimeS / 3600,
    text(m.notes),
  ];
}

export interface ReportModel {
  data: ReportData;
  meta: ReportMeta;
  labels: MeasureLabels;
  decimals: { percent: number; ratio: number; ddH: number; ddS: number; celsius: number; kelvin: number; ln: number };
  fit: FitResponse | null;
  summary: SummaryLine[];
  grid: GridRow[];
  proposed: GridRow | null;
  /** ln r at the specification's minimum, when there is one. */
  specificationLnRatio: number | null;
  specificationText: string;
  level: number;
}

export const GRID_STEP_C = 5;
const MAX_LISTED_EXCLUSIONS = 8;

const ASSAY_NAMES: Record<string, string> = {
  'chiral-hplc': 'chiral HPLC',
  'chiral-sfc': 'chiral SFC',
  'chiral-gc': 'chiral GC',
  nmr: 'NMR',
  other: 'other method',
};

export function celsiusText(celsius: number, decimals = 1): string {
  return `${fixed(celsius, decimals)} °C`;
}

/** Temperatures (°C) every 5 °C over the jacket range, or over the screened range widened to round values. */
export function roundGridC(data: Pick<ReportData, 'measurements' | 'jacketRangeC'>): number[] {
  let low: number;
  let high: number;
  if (data.jacketRangeC) [low, high] = data.jacketRangeC;
  else {
    if (data.measurements.length === 0) return [];
    low = Infinity;
    high = -Infinity;
    for (const m of data.measurements) {
      low = Math.min(low, kelvinToCelsius(m.temperatureK));
      high = Math.max(high, kelvinToCelsius(m.temperatureK));
    }
  }
  const from = Math.floor(low / GRID_STEP_C + 1e-9) * GRID_STEP_C;
  const to = Math.ceil(high / GRID_STEP_C - 1e-9) * GRID_STEP_C;
  const out: number[] = [];
  for (let c = from; c <= to + 1e-9; c += GRID_STEP_C) out.push(Math.round(c));
  return out;
}

function specificationOf(
  spec: ReportSpecification | null | undefined,
  labels: MeasureLabels,
  dec: { percent: number; ratio: number },
): { lnRatio: number | null; text: string } {
  if (!spec) return { lnRatio: null, text: 'no specification set' };
  let lnRatio: number | null = null;
  try {
    lnRatio = specificationLnRatio({ measure: spec.measure, minimum: spec.minimum, probability: spec.probability ?? 0.95 });
  } catch {
    lnRatio = null;
  }
  const pct = (v: number) => fixed(v, Math.max(dec.percent, v % 1 === 0 ? 0 : 1));
  const shown =
    spec.measure === 'ee'
      ? `${labels.family === 'diastereomers' ? 'de' : 'ee'} ≥ ${pct(spec.minimum)} %`
      : spec.measure === 'dr'
        ? `dr ≥ ${fixed(spec.minimum, Math.max(dec.ratio, spec.minimum % 1 === 0 ? 0 : 1))}:1`
        : `${spec.measure === 'er' ? 'er' : 'major isomer'} ≥ ${pct(spec.minimum)}:${pct(100 - spec.minimum)}`;
  const sure = spec.probability
    ? `, with probability ${fixed(spec.probability, 3).replace(/0+$/, '')} that ${spec.runs && spec.runs > 1 ? `the mean of ${spec.runs} new runs` : 'a new run'} meets it`
    : '';
  const from = spec.source ? ` (${spec.source === 'campaign' ? "the campaign's own" : "the project's default"})` : '';
  const base = `${shown}${sure}${from}`;
  return { lnRatio, text: spec.text ? `${base}; ${spec.text}` : base };
}

function runName(m: Measurement): string {
  const label = [m.sampleId, m.replicateLabel].filter(Boolean).join(' ');
  return `${label ? `${label} ` : ''}at ${celsiusText(kelvinToCelsius(m.temperatureK))}`;
}

/** The model the analysis chose, with its reason, in one or two sentences. */
export function modelSentence(fit: FitResponse): string {
  const tb = fit.twoBranch;
  if (!tb.checked) return `One straight line: ${tb.note}`;
  const p = tb.breakTest.p < 0.001 ? 'p < 0.001' : `p = ${fixed(tb.breakTest.p, 3)}`;
  if (tb.preferred === 'two-branch' && tb.break) {
    return `Two straight branches meeting at a break (break test ${p}, against ${tb.breakTest.resamples} simulated straight-line screens). ${tb.break.label}. Forecasts use the branch that covers their temperature.`;
  }
  return `One straight line (break test ${p}: the data do not support a break).`;
}

/** Curvature rows: the check always; a break row only when a break is accepted, named an isoinversion only when claimed. */
function curvatureLines(fit: FitResponse): SummaryLine[] {
  const tb = fit.twoBranch;
  if (!tb.checked) return [{ section: 'Fit', label: 'Curvature check', value: tb.note }];
  const lines: SummaryLine[] = [
    {
      section: 'Fit',
      label: 'Curvature check',
      value: `${tb.preferred === 'two-branch' ? 'Two branches meeting at a break describe the runs better than one line' : 'One straight line is adequate'} (break test p ${tb.breakTest.p < 0.001 ? '< 0.001' : `= ${fixed(tb.breakTest.p, 3)}`}${tb.lackOfFit ? `; lack-of-fit F test of one line p ${tb.lackOfFit.p < 0.001 ? '< 0.001' : `= ${fixed(tb.lackOfFit.p, 3)}`}` : ''}). A curved plot can mean two competing pathways (isoinversion) or a change of the selectivity-determining step.`,
    },
  ];
  if (tb.break && tb.low && tb.high) {
    const ci = tb.break.ci;
    lines.push({
      section: 'Fit',
      label: tb.claim === 'isoinversion' ? `Isoinversion temperature, where r has a ${tb.extremum} (°C)` : 'Change of slope at (°C)',
      value: tb.break.celsius,
      decimals: 1,
      interval: ci && ci.celsius[1] !== null ? [ci.celsius[0], ci.celsius[1]] : null,
      unit: '°C',
      name: 'Break_T_C',
    });
    lines.push({
      section: 'Fit',
      label: 'Low-temperature branch ΔΔH‡',
      value: tb.low.ddH['kJ/mol'],
      decimals: 1,
      se: tb.low.ddH.se?.['kJ/mol'] ?? null,
      unit: 'kJ/mol',
    });
    lines.push({
      section: 'Fit',
      label: 'High-temperature branch ΔΔH‡',
      value: tb.high.ddH['kJ/mol'],
      decimals: 1,
      se: tb.high.ddH.se?.['kJ/mol'] ?? null,
      unit: 'kJ/mol',
    });
  }
  return lines;
}

/** The saved plan's answer on the Summary: the recommended temperature, its rule and probability, the window. */
function planLines(plan: PlanReportData): SummaryLine[] {
  const lines: SummaryLine[] = [];
  const section = 'Plan';
  if (plan.recommended) {
    lines.push({
      section,
      label: 'Recommended temperature',
      value: plan.recommended.celsius,
      decimals: 1,
      unit: '°C',
      name: 'Recommended_T_C',
    });
    lines.push({ section, label: 'Rule', value: plan.rule });
    lines.push({
      section,
      label: 'Probability a new run meets the specification there',
      value: plan.recommended.probabilityMeetsSpec,
      decimals: 3,
      unit: '−',
      name: 'Recommended_probability',
    });
  } else {
    lines.push({
      section,
      label: 'Recommended temperature',
      value: `none: ${plan.conflict ?? 'no temperature in the allowed range meets every constraint'}`,
    });
  }
  lines.push({
    section,
    label: 'Operating window',
    value: plan.window ? `${celsiusText(plan.window.fromCelsius)} to ${celsiusText(plan.window.toCelsius)}` : 'none in the allowed range',
  });
  lines.push({ section, label: 'Binding constraints', value: plan.binding.length ? plan.binding.join(', ') : 'none' });
  lines.push({
    section,
    label: 'Saved plan',
    value: `version ${plan.version}, ${plan.updatedAt.slice(0, 16).replace('T', ' ')} UTC (details on the Plan sheet)`,
  });
  return lines;
}

export function buildReportModel(data: ReportData, meta: ReportMeta): ReportModel {
  const { campaign, analysis } = data;
  const fit = analysis.fit;
  const labels = measureLabels(campaign.measure);
  const sel = selectivityDecimals(campaign.measure, campaign.defaultUncertainty);
  const decimals = {
    ...sel,
    ddH: decimalsForSe(fit?.ddH.se?.['kJ/mol'], 2),
    ddS: decimalsForSe(fit?.ddS.se?.['J/(mol*K)'], 1),
    celsius: 1,
    kelvin: 2,
    ln: 4,
  };
  const level = Math.round((fit?.confidence ?? 0.95) * 100);

  const spec = specificationOf(data.specification, labels, sel);
  // Grid, saved forecasts and the proposed temperature in one engine call, so every row shares the fit.
  const gridC = roundGridC(data);
  const saved = data.forecasts;
  const proposedK = data.proposedK ?? (saved.length ? saved[0]!.temperatureK : null);
  const grid: GridRow[] = [];
  let proposed: GridRow | null = null;
  if (fit) {
    const recommendedK = data.plan?.recommended?.kelvin ?? null;
    const temps = [
      ...gridC.map((c) => c + CELSIUS_OFFSET_K),
      ...saved.map((f) => f.temperatureK),
      ...(recommendedK === null ? [] : [recommendedK]),
      ...(proposedK === null ? [] : [proposedK]),
    ];
    const engine = toEngineMeasurements(campaign, data.measurements);
    // The campaign's own assay settings (new-run precision, quantitation limit), as on the campaign page.
    const options = { weighting: fit.weighting, uncertaintyScale: 'absolute' as const, confidence: fit.confidence };
    const predictions = temps.length
      ? analyseScreen(engine, { ...options, ...assaySettings(campaign, data.measurements, options) }, temps).predictions
      : [];
    const meets = (p: FitPrediction) => meetsSpecification(p, spec.lnRatio);
    gridC.forEach((_, i) => grid.push({ source: 'grid', note: null, prediction: predictions[i]!, meets: meets(predictions[i]!) }));
    saved.forEach((f, i) =>
      grid.push({
        source: 'saved',
        note: f.label ?? `saved ${f.createdAt.slice(0, 10)}`,
        prediction: predictions[gridC.length + i]!,
        meets: meets(predictions[gridC.length + i]!),
      }),
    );
    if (recommendedK !== null) {
      const p = predictions[gridC.length + saved.length]!;
      grid.push({ source: 'recommended', note: 'recommended by the saved plan', prediction: p, meets: meets(p) });
    }
    if (proposedK !== null) {
      proposed = {
        source: 'proposed',
        note: 'proposed',
        prediction: predictions[predictions.length - 1]!,
        meets: meets(predictions[predictions.length - 1]!),
      };
      grid.push(proposed);
    }
    grid.sort((a, b) => a.prediction.kelvin - b.prediction.kelvin || a.source.localeCompare(b.source));
  }

  const summary: SummaryLine[] = [];
  const add = (line: SummaryLine) => summary.push(line);

  add({ section: 'Campaign', label: 'Project', value: data.project?.name ?? null });
  add({ section: 'Campaign', label: 'Campaign', value: campaign.title });
  add({ section: 'Campaign', label: 'Step and reaction', value: campaign.reactionDescription ?? 'not described' });
  add({ section: 'Campaign', label: 'Products', value: `A: ${campaign.productNameA}; B: ${campaign.productNameB} (r = [A]/[B])` });
  const precision =
    campaign.defaultUncertainty === null
      ? 'precision not stated'
      : campaign.measure === 'ee' || campaign.measure === 'percentA'
        ? `± ${fixed(campaign.defaultUncertainty, Math.max(sel.percent, 1))} percentage points (1 SD)`
        : `± ${fixed(100 * campaign.defaultUncertainty, 1)} % of the ratio (1 SD)`;
  add({
    section: 'Campaign',
    label: 'Assay and precision',
    value: `${ASSAY_NAMES[campaign.assayMethod] ?? campaign.assayMethod}, reported as ${campaign.measure}; ${precision}`,
  });
  add({ section: 'Campaign', label: 'Specification', value: spec.text });
  if (data.plan) planLines(data.plan).forEach(add);

  if (!fit) {
    add({ section: 'Result', label: 'Fit', value: `No fit: ${analysis.problem?.message ?? 'not enough data'}` });
  } else {
    if (proposed) {
      const p = proposed.prediction;
      const pi = p.predictionInterval;
      const r = readSelectivity(ratioOf(p), sel.ratio);
      const meets = proposed.meets === null ? '' : `; against the specification: ${proposed.meets}`;
      const headline =
        labels.family === 'enantiomers'
          ? `${fixed(p.eePercent, sel.percent)} % ee (er ${r.ratioText})${pi ? ` (${level} % prediction interval ${fixed(pi.eePercent[0], sel.percent)} to ${fixed(pi.eePercent[1], sel.percent)} % ee)` : ''}`
          : `${r.ratioText}${labels.family === 'ratio' ? ' A:B' : ''}${pi ? ` (${level} % prediction interval ${readSelectivity(ratioRange(pi)[0], sel.ratio).ratioText} to ${readSelectivity(ratioRange(pi)[1], sel.ratio).ratioText})` : ''}`;
      add({
        section: 'Forecast',
        label: 'Proposed temperature',
        value: Math.round(p.celsius * 1e9) / 1e9,
        decimals: 1,
        unit: '°C',
        name: 'Proposed_T_C',
      });
      add({
        section: 'Forecast',
        label: `Forecast ${labels.word}`,
        value: `${headline}${p.extrapolated ? '; outside the screened range' : ''}${meets}`,
      });
      add({
        section: 'Forecast',
        label: `Forecast ${labels.ratio}`,
        value: ratioOf(p),
        decimals: sel.ratio,
        interval: pi ? ratioRange(pi) : null,
        unit: 'A/B',
        name: 'Forecast_ratio',
      });
      if (labels.excess)
        add({
          section: 'Forecast',
          label: `Forecast ${labels.excess}`,
          value: p.eePercent,
          decimals: sel.percent,
          interval: pi ? pi.eePercent : null,
          unit: '%',
          name: 'Forecast_excess_percent',
        });
      add({
        section: 'Forecast',
        label: `Forecast ${labels.major}`,
        value: Math.max(p.percentA, 100 - p.percentA),
        decimals: sel.percent,
        interval: pi ? (p.percentA >= 50 ? pi.percentA : [100 - pi.percentA[1], 100 - pi.percentA[0]]) : null,
        unit: '%',
        name: 'Forecast_major_percent',
      });
      if (proposed.meets !== null)
        add({ section: 'Forecast', label: 'Meets specification', value: proposed.meets, name: 'Forecast_meets_spec' });
    } else {
      add({
        section: 'Forecast',
        label: 'Proposed temperature',
        value: 'none yet: save a forecast in the campaign or ask for one when exporting',
      });
    }
    add({
      section: 'Fit',
      label: 'ΔΔH‡',
      value: fit.ddH['kJ/mol'],
      decimals: decimals.ddH,
      se: fit.ddH.se?.['kJ/mol'] ?? null,
      interval: fit.ddH.ci?.['kJ/mol'] ?? null,
      unit: 'kJ/mol',
      name: 'ddH_kJ_per_mol',
    });
    add({
      section: 'Fit',
      label: 'ΔΔH‡',
      value: fit.ddH['kcal/mol'],
      decimals: decimals.ddH,
      se: fit.ddH.se?.['kcal/mol'] ?? null,
      interval: fit.ddH.ci?.['kcal/mol'] ?? null,
      unit: 'kcal/mol',
      name: 'ddH_kcal_per_mol',
    });
    add({
      section: 'Fit',
      label: 'ΔΔS‡',
      value: fit.ddS['J/(mol*K)'],
      decimals: decimals.ddS,
      se: fit.ddS.se?.['J/(mol*K)'] ?? null,
      interval: fit.ddS.ci?.['J/(mol*K)'] ?? null,
      unit: 'J/(mol·K)',
      name: 'ddS_J_per_mol_K',
    });
    add({
      section: 'Fit',
      label: 'ΔΔS‡',
      value: fit.ddS['cal/(mol*K)'],
      decimals: decimals.ddS,
      se: fit.ddS.se?.['cal/(mol*K)'] ?? null,
      interval: fit.ddS.ci?.['cal/(mol*K)'] ?? null,
      unit: 'cal/(mol·K)',
      name: 'ddS_cal_per_mol_K',
    });
    add({
      section: 'Fit',
      label: 'Intervals',
      value: `${level} % confidence; ${fit.weighting === 'none' ? 'unweighted' : 'weighted'} least squares of ln r on 1/T`,
    });
    add({ section: 'Fit', label: 'Model', value: modelSentence(fit) });
    curvatureLines(fit).forEach(add);
    const excluded = data.measurements.filter((m) => m.excluded);
    const censored = analysis.points.filter((p) => p.status === 'censored').length;
    add({ section: 'Runs', label: 'Runs fitted', value: fit.n, decimals: 0, unit: 'runs', name: 'Runs_fitted' });
    const listed = excluded.slice(0, MAX_LISTED_EXCLUSIONS).map((m) => `${runName(m)}: ${m.excludedReason ?? 'no reason given'}`);
    if (excluded.length > MAX_LISTED_EXCLUSIONS) listed.push(`and ${excluded.length - MAX_LISTED_EXCLUSIONS} more (see Measurements)`);
    add({ section: 'Runs', label: 'Runs excluded', value: excluded.length ? `${excluded.length}: ${listed.join('; ')}` : 'none' });
    if (censored)
      add({
        section: 'Runs',
        label: 'Runs reported as bounds',
        value: `${censored} (kept as "at least" values, not as points on the line)`,
      });
    add({
      section: 'Runs',
      label: 'Screened range',
      value: `${celsiusText(kelvinToCelsius(fit.temperatureRange.minKelvin))} to ${celsiusText(kelvinToCelsius(fit.temperatureRange.maxKelvin))}`,
    });
    add({ section: 'Warnings', label: 'Warnings', value: fit.warnings.length ? fit.warnings.map((w) => w.message).join(' ') : 'none' });
  }
  add({ section: 'Notes', label: 'Sign convention', value: `${SIGN_CONVENTION}; much of the literature uses the opposite sign.` });
  add({ section: 'Notes', label: 'Caution', value: SELECTIVITY_CAUTION });
  add({ section: 'Export', label: 'Exported by', value: meta.exportedBy ?? 'not recorded' });
  add({ section: 'Export', label: 'Exported (UTC)', value: meta.generatedAt });
  add({ section: 'Export', label: 'Eyrie version', value: meta.appVersion });

  return {
    data,
    meta,
    labels,
    decimals,
    fit,
    summary,
    grid,
    proposed,
    specificationLnRatio: spec.lnRatio,
    specificationText: spec.text,
    level,
  };
}

/** The value of a summary line as text, with SE, interval and unit (PDF, e-mail). */
export function summaryLineText(line: SummaryLine): string {
  const v = line.value;
  if (v === null) return '—';
  if (v instanceof Date) return `${v.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
  if (typeof v === 'string') return v;
  const d = line.decimals ?? 2;
  const unit = line.unit && line.unit !== 'runs' ? ` ${line.unit}` : '';
  let text = `${fixed(v, d)}${unit}`;
  if (line.se !== undefined && line.se !== null) text += ` (SE ${fixed(line.se, d)})`;
  if (line.interval) text += `, interval ${fixed(line.interval[0], d)} to ${fixed(line.interval[1], d)}${unit}`;
  return text;
}
