/**
 * Saved forecasts of a stored campaign: the prediction is computed from the runs as they are when
 * saved (never taken from the client), kept with what it was computed from, and shown later beside
 * the runs measured near its temperature since.
 */
import type { Knex } from 'knex';
import { kelvinToCelsius, parseSelectivity } from '../../science';
import { UnprocessableError } from '../../lib/errors';
import type { Campaign } from '../../models/campaign';
import type { Measurement } from '../../models/measurement';
import { SavedForecast } from '../../models/saved-forecast';
import type { FitResponse } from '../calculators/schemas';
import { eeFromLnRatio } from '../../science/quantities';
import type { SavedForecastView } from './analysis-schemas';
import { MEASURED_MATCH_K, computeAnalysis, loadCampaignData, selectivityOf, type AnalysisOptions } from './analysis';
import { saveForecast, type ProjectActor } from './service';
import { toKelvin, type SavedForecastCreate } from './schemas';

type FitPrediction = FitResponse['predictions'][number];

/** What is stored in saved_forecasts.result: the prediction and what it was computed from. */
interface ForecastSnapshot {
  prediction: FitPrediction;
  basis: {
    campaignVersion: number;
    measurementCount: number;
    n: number;
    weighting: FitResponse['weighting'];
    confidence: number;
    ddH: { 'kJ/mol': number };
    ddS: { 'J/(mol*K)': number };
    preferred: 'one-line' | 'two-branch' | null;
    warnings: string[];
  };
}

/** Compute the prediction from the stored runs as they are now and keep it (never a client-sent result). */
export async function saveCampaignForecast(
  db: Knex,
  actor: ProjectActor,
  campaignId: string,
  input: SavedForecastCreate,
  fitOptions: AnalysisOptions,
): Promise<SavedForecastView> {
  const { campaign, measurements } = await loadCampaignData(db, actor.projectId, campaignId);
  const temperatureK = toKelvin(input.temperature.value, input.temperature.unit);
  const analysis = computeAnalysis(campaign, measurements, { ...fitOptions, atK: temperatureK });
  if (!analysis.fit || !analysis.at) {
    throw new UnprocessableError(
      `No forecast can be made from this campaign yet: ${analysis.problem?.message ?? 'the data cannot be fitted'}`,
      [{ path: 'temperature', message: analysis.problem?.message ?? 'no fit' }],
    );
  }
  const { fit } = analysis;
  const snapshot: ForecastSnapshot = {
    prediction: analysis.at,
    basis: {
      campaignVersion: campaign.version,
      measurementCount: measurements.length,
      n: fit.n,
      weighting: fit.weighting,
      confidence: fit.confidence,
      ddH: { 'kJ/mol': fit.ddH['kJ/mol'] },
      ddS: { 'J/(mol*K)': fit.ddS['J/(mol*K)'] },
      preferred: fit.twoBranch?.preferred ?? null,
      warnings: fit.warnings.map((w) => w.code),
    },
  };
  const saved = await saveForecast(db, actor, campaignId, {
    temperatureK,
    label: input.label,
    notes: input.notes,
    result: snapshot as unknown as Record<string, unknown>,
  });
  const [view] = await forecastViews(db, campaign, [saved], measurements);
  return view!;
}

/** Lower-bound runs can only contradict an interval (by lying above it), never confirm one. */
function insideInterval(prediction: FitPrediction, m: Measurement, ratio: number): boolean | null {
  const interval = prediction.predictionInterval?.ratio;
  if (!interval) return null;
  // A null end is r beyond the representable range: 0 below, unbounded above.
  const a = interval[0] ?? 0;
  const b = interval[1] ?? Infinity;
  const [lo, hi] = a <= b ? [a, b] : [b, a];
  if (m.isLowerBound) {
    const beyond = ratio >= 1 ? ratio > hi : ratio < lo;
    return beyond ? false : null;
  }
  return ratio >= lo && ratio <= hi;
}

export async function forecastViews(
  db: Knex,
  campaign: Campaign,
  forecasts: SavedForecast[],
  measurements: Measurement[],
): Promise<SavedForecastView[]> {
  const userIds = [...new Set(forecasts.map((f) => f.createdByUserId).filter((id): id is string => id !== null))];
  const users: { id: string; login: string; displayName: string | null }[] = userIds.length
    ? await db('users').whereIn('id', userIds).select('id', 'login', 'displayName')
    : [];
  const byId = new Map(users.map((u) => [u.id, u]));
  const included = measurements.filter((m) => !m.excluded);
  return forecasts.map((f) => {
    const snapshot = f.result as unknown as ForecastSnapshot;
    // Snapshots saved before forecasts named their model came from the one line.
    const stored = snapshot.prediction as Omit<FitPrediction, 'model' | 'branch'> & Partial<Pick<FitPrediction, 'model' | 'branch'>>;
    const result: FitPrediction = { ...stored, model: stored.model ?? 'one-line', branch: stored.branch ?? null };
    const measured = included
      .filter((m) => Math.abs(m.temperatureK - f.temperatureK) <= MEASURED_MATCH_K)
      .map((m) => {
        const ratio = parseSelectivity(selectivityOf(m));
        return {
          measurementId: m.id,
          kelvin: m.temperatureK,
          eePercent: eeFromLnRatio(Math.log(ratio)),
          ratio,
          insidePredictionInterval: insideInterval(result, m, ratio),
        };
      });
    const creator = f.createdByUserId ? byId.get(f.createdByUserId) : undefined;
    return {
      id: f.id,
      campaignId: campaign.id,
      temperatureK: f.temperatureK,
      celsius: kelvinToCelsius(f.temperatureK),
      label: f.label,
      notes: f.notes,
      createdAt: new Date(f.createdAt).toISOString(),
      createdBy: creator ? { id: creator.id, login: creator.login, displayName: creator.displayName } : null,
      result,
      measured,
    };
  });
}

/** A campaign's saved forecasts, newest first, each compared with the runs stored near its temperature now. */
export async function listCampaignForecasts(db: Knex, projectId: string, campaignId: string): Promise<SavedForecastView[]> {
  const { campaign, measurements } = await loadCampaignData(db, projectId, campaignId);
  const forecasts = await SavedForecast.query(db).where({ campaignId }).orderBy('createdAt', 'desc').orderBy('id');
  return forecastViews(db, campaign, forecasts, measurements);
}
