/**
 * The plan and the comparison in a plain shape for report sheets: rows of numbers and short texts,
 * temperatures in °C and K, times in hours, nothing a sheet writer has to interpret.
 */
import type { Knex } from 'knex';
import { getCampaignPlan, getComparison, type CampaignPlanView, type ComparisonView } from './store';

const round = (v: number | null | undefined, digits = 6) =>
  v === null || v === undefined || !Number.isFinite(v) ? null : Number(v.toPrecision(digits));

export interface PlanReportData {
  /** The plan's inputs as label/value lines, in the units they were entered in. */
  inputs: { label: string; value: string }[];
  specification: { measure: string; minimum: number; probability: number; runs: number };
  rule: string;
  recommended: { celsius: number; kelvin: number; probabilityMeetsSpec: number } | null;
  window: { fromCelsius: number; toCelsius: number } | null;
  binding: string[];
  conflict: string | null;
  resolutions: string[];
  rows: {
    celsius: number;
    kelvin: number;
    probabilityMeetsSpec: number;
    predicted: number;
    bandLow: number;
    bandHigh: number;
    timeToTargetHours: number | null;
    eeAfterHoldPercent: number | null;
    feasible: boolean;
    failing: string;
  }[];
  nextRuns: { atCelsius: number; celsius: number[] } | null;
  caution: string;
  version: number;
  updatedAt: string;
}

const quantity = (q: { value: number; unit: string } | undefined | null) =>
  q ? `${String(Number(q.value.toPrecision(6))).replace(/^-/, '−')} ${q.unit === 'C' ? '°C' : q.unit === 'F' ? '°F' : q.unit}` : null;

/** The stored inputs as short label/value lines (only those that were given). */
function inputLines(plan: CampaignPlanView): { label: string; value: string }[] {
  const i = plan.inputs;
  const lines: { label: string; value: string }[] = [];
  const add = (label: string, value: string | null | undefined) => value && lines.push({ label, value });
  add('Allowed temperature range', `${quantity(i.temperatures.from)} to ${quantity(i.temperatures.to)}`);
  add('Rule chosen', i.rule ?? 'warmest');
  add('Fit weighting', i.weighting === 'uncertainty' ? 'by assay uncertainty' : 'none (ordinary least squares)');
  if (i.newRunUncertainty !== undefined) add("A new run's assay precision (in the specification's units)", String(i.newRunUncertainty));
  if (i.rate) {
    add('Rate order', i.rate.order ?? 'first');
    add('Target conversion (%)', String(i.rate.targetConversionPercent));
    add('Longest allowed reaction time', quantity(i.rate.maxTime));
    add('Rate runs', i.rate.runs ? `${i.rate.runs.length} given with the plan` : "the campaign's runs with conversion and time");
  }
  if (i.hold) {
    add('Hold before isolation', quantity(i.hold.time));
    const b = i.hold.barrier;
    add(
      'Racemization or epimerization barrier',
      b.kind === 'gibbs' ? `ΔG‡ ${quantity(b.dG)} at ${quantity(b.temperature)}` : `ΔH‡ ${quantity(b.dH)}, ΔS‡ ${quantity(b.dS)}`,
    );
    add('ee floor after the hold (%)', String(i.hold.floorEePercent));
  }
  if (i.applyAtProbability) add('Time and hold constraints', 'applied at the required probability');
  if (i.nextRuns) add('Next runs asked for', `${i.nextRuns.count}${i.nextRuns.at ? ` at ${quantity(i.nextRuns.at)}` : ''}`);
  return lines;
}

export function planReportData(plan: CampaignPlanView): PlanReportData {
  const r = plan.result;
  return {
    inputs: inputLines(plan),
    specification: {
      measure: r.specification.measure,
      minimum: r.specification.minimum,
      probability: r.specification.probability,
      runs: r.specification.runs ?? 1,
    },
    rule: r.rule.text,
    recommended: r.recommended
      ? {
          celsius: round(r.recommended.celsius, 5)!,
          kelvin: round(r.recommended.kelvin, 6)!,
          probabilityMeetsSpec: round(r.recommended.probabilityMeetsSpec, 4)!,
        }
      : null,
    window: r.window ? { fromCelsius: round(r.window.from.celsius, 5)!, toCelsius: round(r.window.to.celsius, 5)! } : null,
    binding: r.binding,
    conflict: r.conflict?.message ?? null,
    resolutions: r.resolutions,
    rows: r.curve.map((p) => ({
      celsius: round(p.celsius, 5)!,
      kelvin: round(p.kelvin, 6)!,
      probabilityMeetsSpec: round(p.probabilityMeetsSpec, 4)!,
      predicted: round(p.predicted.value, 5)!,
      bandLow: round(p.predicted.band[0], 5)!,
      bandHigh: round(p.predicted.band[1], 5)!,
      timeToTargetHours: p.timeToTarget ? round(p.timeToTarget.s / 3600, 4) : null,
      eeAfterHoldPercent: round(p.eeAfterHold, 5),
      feasible: p.feasible,
      failing: p.failing.join(', '),
    })),
    nextRuns: r.nextRuns
      ? { atCelsius: round(r.nextRuns.at.celsius, 5)!, celsius: r.nextRuns.temperatures.map((t) => round(t.celsius, 5)!) }
      : null,
    caution: r.caution,
    version: plan.version,
    updatedAt: plan.updatedAt,
  };
}

/** The stored plan of a campaign in report shape, or null when none is saved. */
export async function loadPlanReportData(db: Knex, projectId: string, campaignId: string): Promise<PlanReportData | null> {
  const plan = await getCampaignPlan(db, projectId, campaignId);
  return plan ? planReportData(plan) : null;
}

export interface ComparisonReportData {
  name: string;
  temperatureCelsius: number;
  campaigns: {
    id: string;
    title: string | null;
    available: boolean;
    ddHKJPerMol: number | null;
    ddSJPerMolK: number | null;
    valueAtTemperature: number | null;
    intervalLow: number | null;
    intervalHigh: number | null;
    problem: string | null;
    specification: { measure: string; minimum: number; probability: number } | null;
    meetsAtTemperature: string | null;
  }[];
  pairs: {
    first: string;
    second: string;
    differenceLnR: number;
    intervalLow: number;
    intervalHigh: number;
    probabilityFirstBetter: number;
    verdict: string;
    equalSlopesP: number | null;
    crossoverCelsius: number | null;
    note: string;
  }[];
  valueMeasure: string;
  caution: string;
}

export function comparisonReportData(view: ComparisonView): ComparisonReportData {
  const title = (id: string) => view.result.campaigns.find((c) => c.id === id)?.title ?? id;
  return {
    name: view.name,
    temperatureCelsius: round(view.temperature.celsius, 5)!,
    campaigns: view.result.campaigns.map((c) => ({
      id: c.id,
      title: c.title,
      available: c.available,
      ddHKJPerMol: round(c.fit?.ddH['kJ/mol']),
      ddSJPerMolK: round(c.fit?.ddS['J/(mol*K)']),
      valueAtTemperature: round(c.fit?.at.value),
      intervalLow: round(c.fit?.at.interval[0]),
      intervalHigh: round(c.fit?.at.interval[1]),
      problem: c.problem,
      specification: c.specification
        ? { measure: c.specification.measure, minimum: c.specification.minimum, probability: c.specification.probability }
        : null,
      meetsAtTemperature: c.meetsAtTemperature ?? null,
    })),
    pairs: view.result.pairs.map((p) => ({
      first: title(p.first),
      second: title(p.second),
      differenceLnR: round(p.differenceLnR)!,
      intervalLow: round(p.interval[0])!,
      intervalHigh: round(p.interval[1])!,
      probabilityFirstBetter: round(p.probabilityFirstBetter, 4)!,
      verdict: p.verdict,
      equalSlopesP: round(p.equalSlopes.p, 4),
      crossoverCelsius: p.crossover ? round(p.crossover.celsius, 5) : null,
      note: p.note,
    })),
    valueMeasure: view.result.valueMeasure,
    caution: view.result.caution,
  };
}

/** A saved comparison in report shape (recomputed from current runs, as the page shows it). */
export async function loadComparisonReportData(
  db: Knex,
  projectId: string,
  userId: string,
  comparisonId: string,
): Promise<ComparisonReportData> {
  return comparisonReportData(await getComparison(db, projectId, userId, comparisonId));
}
