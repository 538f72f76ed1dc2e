/**
 * Analysis of a stored campaign: its measurements go through the same engine call as POST
 * /api/v1/fit (`analyseScreen`), so the numbers are identical for identical data. Adds what a
 * stored campaign knows and the calculator does not: exclusions with reasons, "at least" runs
 * (censored as bounds) and the campaign's default assay precision for runs without their own.
 * Saved forecasts live in `analysis-forecasts.ts`, the side-by-side of a project's campaigns in
 * `analysis-comparison.ts` and what the report reads in `report-data.ts`.
 */
import type { Knex } from 'knex';
import { SIGN_CONVENTION, kelvinToCelsius, parseSelectivity, sigmaLnRatio, type EyringMeasurement } from '../../science';
import { BadRequestError } from '../../lib/errors';
import { quantitationLimitProblem } from '../calculators/schemas';
import { medianUncertainty } from '../../science/assay-precision';
import type { Campaign } from '../../models/campaign';
import { Measurement } from '../../models/measurement';
import { SELECTIVITY_CAUTION } from '../../lib/cautions';
import { analyseScreen, type FitOptions } from '../calculators/fit';
import type { FitResponse } from '../calculators/schemas';
import type { AnalysisPoint, AnalysisQuery, AnalysisResponse } from './analysis-schemas';
import { getCampaign } from './service';
import { entityTag, runsStamp, serialisedCache, type SerialisedBody } from './serialised';
import { toKelvin } from './schemas';
import { eeFromLnRatio } from '../../science/quantities';

/** Shown beside every forecast and in every export (api/science/README.md §9). */
/** Temperatures in the fitted-line curve, spaced evenly in 1/T. */
export const CURVE_POINTS = 60;
/** The curve runs this far beyond the coldest and warmest measured runs (K). */
export const CURVE_MARGIN_K = 15;
/** Runs within this distance of a saved forecast's temperature are compared with it (K). */
export const MEASURED_MATCH_K = 1;

const ENGINE_FLAGS = new Set(['outlier', 'high-leverage', 'influential']);

/** The columns of a stored run that the analysis reads (the bulk read selects only these). */
export const ANALYSED_COLUMNS = [
  'id',
  'temperatureK',
  'measure',
  'value',
  'valueB',
  'isLowerBound',
  'uncertainty',
  'replicateLabel',
  'sampleId',
  'excluded',
  'excludedReason',
] as const;

/** A stored run as the analysis reads it: a model instance or a plain row of ANALYSED_COLUMNS. */
export type AnalysedMeasurement = Pick<Measurement, (typeof ANALYSED_COLUMNS)[number]>;

/** The stored selectivity as the engine reads it. */
export function selectivityOf(m: Pick<Measurement, 'measure' | 'value' | 'valueB'>) {
  return { measure: m.measure, value: m.valueB === null ? m.value : `${m.value}:${m.valueB}` };
}

/**
 * σ(ln r) of a run: its own assay uncertainty, else the campaign's default when the run is reported
 * in the campaign's measure (the default is in that measure's units). Zero means "not known".
 */
function sigmaOf(campaign: Pick<Campaign, 'measure' | 'defaultUncertainty'>, m: AnalysedMeasurement): number | undefined {
  const u = m.uncertainty ?? (m.measure === campaign.measure ? campaign.defaultUncertainty : null);
  if (u === null || !(u > 0)) return undefined;
  return sigmaLnRatio(selectivityOf(m), u);
}

const runLabel = (m: Pick<Measurement, 'sampleId' | 'replicateLabel'>) => [m.sampleId, m.replicateLabel].filter(Boolean).join(' ') || null;

/** Stored runs → the engine's SI form, in the same order. */
export function toEngineMeasurements(
  campaign: Pick<Campaign, 'measure' | 'defaultUncertainty'>,
  measurements: readonly AnalysedMeasurement[],
): EyringMeasurement[] {
  return measurements.map((m) => {
    const out: EyringMeasurement = { temperatureK: m.temperatureK, ratio: parseSelectivity(selectivityOf(m)) };
    const sigma = sigmaOf(campaign, m);
    if (sigma !== undefined) out.sigmaLnR = sigma;
    if (m.excluded) {
      out.excluded = true;
      if (m.excludedReason) out.exclusionReason = m.excludedReason;
    }
    if (m.isLowerBound) out.atLeast = true;
    const label = runLabel(m);
    if (label) out.label = label;
    return out;
  });
}

/** `count` temperatures from `lowK` to `highK`, evenly spaced in 1/T (as they sit on an Eyring plot). */
export function curveTemperatures(lowK: number, highK: number, count = CURVE_POINTS): number[] {
  const a = 1 / lowK;
  const b = 1 / highK;
  return Array.from({ length: count }, (_, i) => (i === 0 ? lowK : i === count - 1 ? highK : 1 / (a + ((b - a) * i) / (count - 1))));
}

function isDomainError(err: unknown): err is Error & { code: string } {
  return err instanceof Error && err.name === 'DomainError' && typeof (err as { code?: unknown }).code === 'string';
}

export interface AnalysisOptions extends FitOptions {
  /** Extra temperature (K) to predict at, reported as `at`. */
  atK?: number;
  /** Overrides of the campaign's settings, in the campaign measure's units. */
  newRunUncertainty?: number;
  quantitationLimitValue?: number;
}

export function analysisOptions(
  query: Pick<AnalysisQuery, 'weighting' | 'uncertaintyScale' | 'confidence' | 'at' | 'newRunUncertainty' | 'quantitationLimit'>,
): AnalysisOptions {
  return {
    weighting: query.weighting,
    uncertaintyScale: query.uncertaintyScale,
    confidence: query.confidence,
    ...(query.at === undefined ? {} : { atK: toKelvin(query.at, 'C') }),
    ...(query.newRunUncertainty === undefined ? {} : { newRunUncertainty: query.newRunUncertainty }),
    ...(query.quantitationLimit === undefined ? {} : { quantitationLimitValue: query.quantitationLimit }),
  };
}

type AnalysedCampaign = Pick<Campaign, 'id' | 'version' | 'measure' | 'defaultUncertainty'> &
  Partial<Pick<Campaign, 'newRunUncertainty' | 'quantitationLimit'>>;

/**
 * The campaign's assay settings for this analysis: the query's, else the campaign's, else the
 * defaults (new run: median of the runs' own or default uncertainties in the campaign measure;
 * limit: 99.8 % ee). A limit that does not suit the measure is a 400 naming the field.
 */
export function assaySettings(
  campaign: AnalysedCampaign,
  measurements: readonly AnalysedMeasurement[],
  options: AnalysisOptions,
): Pick<FitOptions, 'newRun' | 'newRunOrigin' | 'quantitationLimit'> {
  const limitValue = options.quantitationLimitValue ?? campaign.quantitationLimit ?? null;
  let quantitationLimit: FitOptions['quantitationLimit'];
  if (limitValue !== null) {
    const problem = quantitationLimitProblem(campaign.measure, limitValue);
    if (problem) {
      const path = options.quantitationLimitValue === undefined ? 'campaign.quantitationLimit' : 'quantitationLimit';
      throw new BadRequestError(`quantitationLimit ${problem} for a campaign reported as ${campaign.measure}.`, [
        { path, message: `quantitationLimit ${problem}` },
      ]);
    }
    quantitationLimit = { measure: campaign.measure, value: limitValue };
  }
  const given = options.newRunUncertainty ?? campaign.newRunUncertainty ?? null;
  if (given !== null) {
    return {
      newRun: { measure: campaign.measure, uncertainty: given },
      newRunOrigin: options.newRunUncertainty === undefined ? 'campaign' : 'request',
      ...(quantitationLimit ? { quantitationLimit } : {}),
    };
  }
  const median = medianUncertainty(
    measurements.filter((m) => m.measure === campaign.measure && !m.excluded).map((m) => m.uncertainty ?? campaign.defaultUncertainty ?? 0),
  );
  return {
    newRun: median === null ? null : { measure: campaign.measure, uncertainty: median },
    newRunOrigin: 'median',
    ...(quantitationLimit ? { quantitationLimit } : {}),
  };
}

/** The analysis of one campaign's runs (pure: no database). */
export function computeAnalysis(
  campaign: AnalysedCampaign,
  measurements: readonly AnalysedMeasurement[],
  options: AnalysisOptions,
): AnalysisResponse {
  const engine = toEngineMeasurements(campaign, measurements);
  options = { ...options, ...assaySettings(campaign, measurements, options) };
  let fit: FitResponse | null = null;
  let problem: AnalysisResponse['problem'] = null;
  let curveK: number[] = [];
  if (measurements.length === 0) {
    problem = { code: 'no-measurements', message: 'The campaign has no measurements yet; add runs at two or more temperatures to fit.' };
  } else {
    let minK = Infinity;
    let maxK = -Infinity;
    for (const m of measurements) {
      minK = Math.min(minK, m.temperatureK);
      maxK = Math.max(maxK, m.temperatureK);
    }
    curveK = maxK > minK ? curveTemperatures(Math.max(minK - CURVE_MARGIN_K, 1), maxK + CURVE_MARGIN_K) : [];
    try {
      fit = analyseScreen(engine, options, options.atK === undefined ? curveK : [...curveK, options.atK]);
    } catch (err) {
      if (!isDomainError(err)) throw err;
      problem = { code: err.code, message: explainProblem(err, measurements) };
    }
  }
  const predictions = fit?.predictions ?? [];
  const curve = fit ? predictions.slice(0, curveK.length) : [];
  const at = fit && options.atK !== undefined ? (predictions[predictions.length - 1] ?? null) : null;
  if (fit) {
    // The drawing grid runs past the data on purpose; warn about extrapolation only for the
    // temperature the user asked about.
    const others = fit.warnings.filter((w) => w.code !== 'extrapolation');
    const asked = fit.warnings.find((w) => w.code === 'extrapolation');
    fit.warnings =
      at?.extrapolated && asked
        ? [
            ...others,
            {
              code: 'extrapolation',
              message: `${at.celsius.toFixed(1).replace('-', '−')} °C lies outside the screened range; the forecast assumes the ${at.model === 'segmented' ? `${at.branch === 'low' ? 'low' : 'high'}-temperature branch` : 'same straight line'} continues, which a change of mechanism would break.`,
            },
          ]
        : others;
  }

  const points: AnalysisPoint[] = measurements.map((m, i) => {
    const e = engine[i]!;
    const y = Math.log(e.ratio);
    const sigma = e.sigmaLnR ?? 0;
    const residual = fit?.residuals[i];
    const status: AnalysisPoint['status'] = residual?.status ?? (m.excluded ? 'excluded' : m.isLowerBound ? 'censored' : 'fitted');
    return {
      measurementId: m.id,
      kelvin: m.temperatureK,
      celsius: kelvinToCelsius(m.temperatureK),
      lnRatio: y,
      lnRatioLow: y - sigma,
      lnRatioHigh: y + sigma,
      eePercent: eeFromLnRatio(y),
      percentA: 100 / (1 + Math.exp(-y)),
      status,
      flagged: residual ? residual.flags.some((f) => ENGINE_FLAGS.has(f) || f.endsWith('-disagrees')) : false,
      exclusionReason: m.excluded ? m.excludedReason : null,
      label: runLabel(m),
    };
  });

  return {
    campaignId: campaign.id,
    campaignVersion: campaign.version,
    fit,
    problem,
    curve,
    at,
    points,
    convention: SIGN_CONVENTION,
    caution: SELECTIVITY_CAUTION,
  };
}

/** Engine messages name array paths; a stored campaign's user needs to hear which run. */
function explainProblem(err: Error & { code: string }, measurements: readonly AnalysedMeasurement[]): string {
  const field = (err as { field?: string }).field ?? '';
  const index = /measurements\[(\d+)\]/.exec(field)?.[1];
  if (err.code === 'sigma-missing' && index !== undefined) {
    const m = measurements[Number(index)]!;
    return `Weighting by uncertainty needs an assay uncertainty for every fitted run; the run at ${kelvinToCelsius(m.temperatureK).toFixed(2)} °C${runLabel(m) ? ` (${runLabel(m)})` : ''} has none and the campaign has no default for its measure. Enter one, set the campaign's default, or fit unweighted.`;
  }
  if (err.code === 'too-few-temperatures') {
    const excluded = measurements.filter((m) => m.excluded).length;
    const bounds = measurements.filter((m) => !m.excluded && m.isLowerBound).length;
    const set = [excluded ? `${excluded} excluded` : '', bounds ? `${bounds} reported only as a bound` : ''].filter(Boolean).join(', ');
    return `A fit needs fitted runs at two or more distinct temperatures${set ? ` (${set})` : ''}; add runs at another temperature.`;
  }
  return err.message;
}

/** Load a campaign of the project with its runs in display order. */
export async function loadCampaignData(
  db: Knex,
  projectId: string,
  campaignId: string,
): Promise<{ campaign: Campaign; measurements: Measurement[] }> {
  const campaign = await getCampaign(db, projectId, campaignId);
  const measurements = await Measurement.query(db)
    .where({ campaignId })
    .orderBy('temperatureK')
    .orderBy('createdAt')
    .orderBy('sourceRow')
    .orderBy('id');
  return { campaign, measurements };
}

export async function analyseCampaign(db: Knex, projectId: string, campaignId: string, query: AnalysisQuery): Promise<AnalysisResponse> {
  const { campaign, measurements } = await loadCampaignData(db, projectId, campaignId);
  return computeAnalysis(campaign, measurements, analysisOptions(query));
}

/**
 * Serialised analyses by campaign id, campaign version, the stamp of its runs and the query (see
 * serialised.ts). Bounded by total body size.
 */
const analysisCache = serialisedCache(32 * 1024 * 1024);

/** For tests: forget every cached analysis. */
export function clearAnalysisCache(): void {
  analysisCache.clear();
}

/**
 * The campaign's analysis as a JSON string with a weak ETag that changes whenever the campaign, one
 * of its runs or the query changes. The body carries nothing about the caller (no role), so one
 * entry serves every member who may read the campaign; authorization runs before this.
 */
export async function serialisedCampaignAnalysis(
  db: Knex,
  projectId: string,
  campaignId: string,
  query: AnalysisQuery,
): Promise<SerialisedBody> {
  const options = analysisOptions(query);
  const [campaign, stamp] = await Promise.all([getCampaign(db, projectId, campaignId), runsStamp(db, campaignId)]);
  const key = JSON.stringify([campaign.id, campaign.version, stamp.n, stamp.digest, options]);
  const cached = analysisCache.get(key);
  if (cached) return cached;
  // Plain rows of the columns the engine reads, no model instances.
  const measurements = (await db('measurements')
    .where({ campaignId })
    .select(...ANALYSED_COLUMNS)
    .orderBy('temperatureK')
    .orderBy('createdAt')
    .orderBy('sourceRow')
    .orderBy('id')) as AnalysedMeasurement[];
  const body = JSON.stringify(computeAnalysis(campaign, measurements, options));
  const entry = { etag: entityTag('a', key), body };
  analysisCache.set(key, entry);
  return entry;
}
