/**
 * Comparison of stored campaigns at one temperature (pure: the caller reads the rows). Each
 * readable campaign is fitted as the campaign analysis fits it; every pair gets the difference at
 * the temperature, the probability that one beats the other, the equal-slopes test, the crossover
 * with its Fieller interval and how many runs would tell them apart.
 */
import {
  CELSIUS_OFFSET_K,
  SIGN_CONVENTION,
  compareFits,
  energyFromJPerMol,
  entropyFromJPerMolK,
  fitEyring,
  lnRatioInMeasure,
  predictLine,
  runsToTellApart,
  type EyringFit,
} from '../../science';
import { SELECTIVITY_CAUTION } from '../../lib/cautions';
import type { Campaign } from '../../models/campaign';
import type { Measurement } from '../../models/measurement';
import { toEngineMeasurements } from '../campaigns/analysis';

export interface ComparedCampaign {
  id: string;
  /** Null when the caller cannot read it (or it was deleted). */
  campaign: Campaign | null;
  measurements: Measurement[];
}

const kc = (kelvin: number) => ({ kelvin, celsius: kelvin - CELSIUS_OFFSET_K });
const CURVE_POINTS = 41;

function explain(err: unknown): string {
  if (err instanceof Error && err.name === 'DomainError') return err.message;
  throw err;
}

export function compareCampaignFits(items: readonly ComparedCampaign[], temperatureK: number) {
  const measures = items.flatMap((i) => (i.campaign ? [i.campaign.measure] : []));
  const valueMeasure =
    measures.length > 0 && measures.every((m) => m === 'dr') ? 'dr' : measures.some((m) => m === 'ee' || m === 'er') ? 'ee' : 'percentA';
  const fits: (EyringFit | null)[] = [];
  const problems: (string | null)[] = [];
  for (const item of items) {
    if (!item.campaign) {
      fits.push(null);
      problems.push('Not available: the campaign was deleted or you cannot read its project.');
      continue;
    }
    try {
      const fit = fitEyring(toEngineMeasurements(item.campaign, item.measurements));
      if (!fit.intervalsAvailable)
        throw Object.assign(new Error('needs runs at three or more distinct temperatures to be compared'), { name: 'DomainError' });
      fits.push(fit);
      problems.push(null);
    } catch (err) {
      fits.push(null);
      problems.push(explain(err));
    }
  }
  const usable = fits.filter((f): f is EyringFit => f !== null);
  const lo = Math.min(temperatureK, ...usable.map((f) => f.temperatureRangeK.min));
  const hi = Math.max(temperatureK, ...usable.map((f) => f.temperatureRangeK.max));
  const grid = Array.from({ length: CURVE_POINTS }, (_, i) => lo + ((hi - lo) * i) / (CURVE_POINTS - 1));
  const inMeasure = (y: number) => lnRatioInMeasure(y, valueMeasure);
  const band = (fit: EyringFit, t: number) => {
    const p = predictLine(fit.line, 1 / t, 0.95);
    return {
      lnRatio: p.yHat,
      lnInterval: [p.meanInterval![0], p.meanInterval![1]] as [number, number],
      value: inMeasure(p.yHat),
      interval: [inMeasure(p.meanInterval![0]), inMeasure(p.meanInterval![1])] as [number, number],
    };
  };
  const campaigns = items.map((item, i) => {
    const fit = fits[i];
    return {
      id: item.id,
      title: item.campaign?.title ?? null,
      measure: item.campaign?.measure ?? null,
      projectId: item.campaign?.projectId ?? null,
      available: item.campaign !== null,
      problem: problems[i]!,
      fit: fit
        ? {
            n: fit.nFitted,
            ddH: {
              'kJ/mol': energyFromJPerMol(fit.ddHJPerMol, 'kJ/mol'),
              'kcal/mol': energyFromJPerMol(fit.ddHJPerMol, 'kcal/mol'),
              se: fit.ddHSeJPerMol === null ? null : fit.ddHSeJPerMol / 1000,
            },
            ddS: {
              'J/(mol*K)': fit.ddSJPerMolK,
              'cal/(mol*K)': entropyFromJPerMolK(fit.ddSJPerMolK, 'cal/(mol*K)'),
              se: fit.ddSSeJPerMolK,
            },
            at: band(fit, temperatureK),
            curve: grid.map((t) => ({ ...kc(t), ...band(fit, t) })),
            eyring: fit.points.map((p) => ({
              kelvin: p.temperatureK,
              inverseKelvin: 1 / p.temperatureK,
              lnRatio: p.lnRatio,
              status: p.status,
            })),
          }
        : null,
    };
  });
  const pairs = [];
  for (let i = 0; i < items.length; i++) {
    for (let j = i + 1; j < items.length; j++) {
      const a = fits[i];
      const b = fits[j];
      if (!a || !b) continue;
      const c = compareFits(a, b, temperatureK);
      const finite = (v: number) => (Number.isFinite(v) ? v : null);
      pairs.push({
        first: items[i]!.id,
        second: items[j]!.id,
        differenceLnR: c.differenceLnR,
        interval: c.interval,
        dof: c.dof,
        differenceDdG: {
          'kJ/mol': c.differenceDdGJPerMol / 1000,
          interval: [c.differenceDdGIntervalJPerMol[0] / 1000, c.differenceDdGIntervalJPerMol[1] / 1000] as [number, number],
        },
        probabilityFirstBetter: c.probabilityFirstBetter,
        verdict: c.verdict,
        equalSlopes: { F: finite(c.equalSlopes.F), dof1: c.equalSlopes.dof1, dof2: c.equalSlopes.dof2, p: finite(c.equalSlopes.p) },
        crossover: c.crossover
          ? {
              ...kc(c.crossover.temperatureK),
              interval: [
                c.crossover.intervalK[0] === null ? null : kc(c.crossover.intervalK[0]),
                c.crossover.intervalK[1] === null ? null : kc(c.crossover.intervalK[1]),
              ] as [ReturnType<typeof kc> | null, ReturnType<typeof kc> | null],
              bounded: c.crossover.bounded,
              note: c.crossover.note,
            }
          : null,
        runsToTellApart: c.verdict === 'cannot-tell' ? runsToTellApart(a, b, temperatureK) : 0,
        note: c.note,
      });
    }
  }
  return {
    temperature: kc(temperatureK),
    campaigns,
    pairs,
    valueMeasure: valueMeasure as 'ee' | 'dr' | 'percentA',
    convention: SIGN_CONVENTION,
    caution: SELECTIVITY_CAUTION,
  };
}
