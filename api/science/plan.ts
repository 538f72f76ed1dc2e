/**
 * The temperature plan: at every temperature in the plant's allowed range, the probability that the
 * next run meets the specification, the time to the target conversion and the ee left after the
 * planned hold; the window where every constraint holds; and a recommended temperature found by
 * root finding (bisection to well under 0.01 K), not read off a display grid.
 */
import { resolveBarrier, type BarrierSpec } from './activation';
import { DomainError, requireTemperatureK, type Warning } from './errors';
import { eeAfterTime, racemizationRateConstant } from './erosion';
import type { EyringFit } from './eyring-fit';
import { predictiveLnRatio, type ScreenModel } from './screen-model';
import {
  lnRatioInMeasure,
  newRunSigmaLnR,
  predictiveLnR,
  probabilityAtLeast,
  specificationLnRatio,
  type PredictiveLnR,
  type Specification,
} from './plan-predictive';
import { lnTimeToTarget, timeToTargetAt, type RateFit } from './rate-fit';
import { studentTQuantile } from './regression';
import { describeTemperatureK, kelvinToCelsius } from './units';

export type RecommendationRule = 'warmest' | 'coldest' | 'middle';
export type PlanConstraint = 'specification' | 'time' | 'jacket' | 'hold';

export const RULE_TEXT: Record<RecommendationRule, string> = {
  warmest: 'The warmest temperature in the allowed range at which every constraint holds (fastest and cheapest to cool).',
  coldest: 'The coldest temperature in the allowed range at which every constraint holds.',
  middle: 'The middle of the widest stretch of temperatures at which every constraint holds (furthest from both edges).',
};

export interface PlanRateInput {
  fit: RateFit;
  /** Target conversion as a fraction in (0, 1). */
  targetConversion: number;
  maxTimeS?: number;
}

export interface PlanHoldInput {
  barrier: BarrierSpec;
  timeS: number;
  /** ee (or de for a dr measure) that must remain after the hold, in percent. */
  floorEePercent: number;
  kappa?: number;
}

export interface PlanInput {
  fit: EyringFit;
  /**
   * The model forecasts come from (chooseScreenModel): when curvature was accepted, the segmented model, and every
   * probability then comes from the branch that covers the temperature. Default: the straight line of `fit`.
   */
  model?: ScreenModel;
  specification: Specification;
  /** The assay's precision for one new run, in the specification measure's own units. */
  newRunUncertainty?: number;
  rangeK: { from: number; to: number };
  rule?: RecommendationRule;
  rate?: PlanRateInput;
  hold?: PlanHoldInput;
  /** Apply the time and hold constraints at the required probability instead of the central estimate. */
  applyAtProbability?: boolean;
  atK?: readonly number[];
  /** Points on the display curve (default 121). */
  curvePoints?: number;
  /** Level of the selectivity and time bands (default 0.95). */
  bandLevel?: number;
}

export interface PlanEvaluation {
  temperatureK: number;
  celsius: number;
  probabilityMeetsSpec: number;
  /** Predicted ln r and the band for one new run at bandLevel, also in the specification's measure. */
  lnRatio: number;
  value: number;
  band: [number, number];
  timeToTargetS: number | null;
  timeBandS: [number, number] | null;
  eeAfterHoldPercent: number | null;
  feasible: boolean;
  /** Constraints that fail here ('jacket' outside the allowed range). */
  failing: PlanConstraint[];
}

export interface ConstraintNeed {
  constraint: PlanConstraint;
  /** Where this constraint alone is met, searched well beyond the allowed range. */
  kind: 'everywhere' | 'at-most' | 'at-least' | 'between' | 'nowhere';
  lowK: number | null;
  highK: number | null;
  message: string;
}

export interface PlanResult {
  rule: RecommendationRule;
  ruleText: string;
  specificationLnRatio: number;
  recommended: { temperatureK: number; probabilityMeetsSpec: number } | null;
  window: { fromK: number; toK: number } | null;
  /** Every stretch of the range where all constraints hold, cold to warm. */
  feasibleRangesK: [number, number][];
  binding: PlanConstraint[];
  needs: ConstraintNeed[];
  conflict: { message: string; gapK: number | null } | null;
  resolutions: string[];
  evaluations: PlanEvaluation[];
  curve: PlanEvaluation[];
  warnings: Warning[];
}

/** Bisection tolerance in K: far finer than the 0.01 K the plan promises. */
const ROOT_TOLERANCE_K = 1e-4;
/** How far beyond the allowed range a single constraint's own region is searched, in K. */
const NEEDS_MARGIN_K = 150;
const MIN_SEARCH_K = 50;

const fmt = (k: number) => describeTemperatureK(k);

/** The planner's view of one input set: margins (≥ 0 means met) per constraint at any temperature. */
class PlanModel {
  readonly lnSpec: number;
  private readonly quantileP: number;
  constructor(private readonly input: PlanInput) {
    this.lnSpec = specificationLnRatio(input.specification);
    this.quantileP = input.specification.probability;
  }

  predictive(temperatureK: number, runs = this.input.specification.runs ?? 1): PredictiveLnR {
    const model = this.input.model;
    if (model?.kind === 'segmented') return this.segmentedPredictive(model, temperatureK, runs);
    const base = predictiveLnR(this.input.fit, temperatureK, { runs });
    if (this.input.newRunUncertainty === undefined) return base;
    const sigma = newRunSigmaLnR(this.input.specification.measure, this.input.newRunUncertainty, base.mean);
    return predictiveLnR(this.input.fit, temperatureK, { runs, newRunSigma: sigma });
  }

  /** The segmented model's predictive t: scale² = Var(mean) + σ²_new/k, σ_new the assay's (if given) or the branches' scatter. */
  private segmentedPredictive(model: ScreenModel & { kind: 'segmented' }, temperatureK: number, runs: number): PredictiveLnR {
    requireTemperatureK(temperatureK, 'temperatureK');
    const center = predictiveLnRatio(model, temperatureK);
    const sigma =
      this.input.newRunUncertainty === undefined
        ? undefined
        : newRunSigmaLnR(this.input.specification.measure, this.input.newRunUncertainty, center.mean);
    const p = sigma === undefined ? center : predictiveLnRatio(model, temperatureK, { sigmaNewLnR: sigma });
    if (p.sdMean === null || p.sdNewRun === null) {
      throw new DomainError(
        'intervals-unavailable',
        'the two-branch model has no estimate of scatter, so no probability can be given',
        'measurements',
      );
    }
    const varMean = p.sdMean * p.sdMean;
    const varRun = Math.max(0, p.sdNewRun * p.sdNewRun - varMean);
    return { mean: p.mean, scale: Math.sqrt(varMean + varRun / runs), dof: p.dof };
  }

  probability(temperatureK: number): number {
    return probabilityAtLeast(this.predictive(temperatureK), this.lnSpec);
  }

  /** ln t to the target: central, or the upper quantile at the required probability for a new batch. */
  private lnTime(temperatureK: number): number | null {
    const rate = this.input.rate;
    if (!rate) return null;
    const lnT = lnTimeToTarget(rate.fit, temperatureK, rate.targetConversion);
    const line = rate.fit.line;
    if (!this.input.applyAtProbability || line.varianceScale === null) return lnT;
    const dx = 1 / temperatureK - line.xMean;
    // A new batch: the line's uncertainty plus one run's scatter about it.
    const seBatch = Math.sqrt(line.varianceScale * (1 + 1 / line.sumWeights + (dx * dx) / line.sxx));
    return lnT + studentTQuantile(this.quantileP, line.dof) * seBatch;
  }

  /** ee (or de) after the hold, from the central ln r or its lower quantile at the required probability. */
  eeAfterHold(temperatureK: number, atProbability = this.input.applyAtProbability ?? false): number | null {
    const hold = this.input.hold;
    if (!hold) return null;
    const pred = this.predictive(temperatureK, 1);
    const ln = atProbability ? pred.mean - studentTQuantile(this.quantileP, pred.dof) * pred.scale : pred.mean;
    const ee0 = Math.abs(100 * Math.tanh(ln / 2));
    let ke: number;
    try {
      ke = racemizationRateConstant(hold.barrier, temperatureK, hold.kappa ?? 1);
    } catch (e) {
      // So cold that racemization underflows to zero: nothing is lost in the hold.
      if (e instanceof DomainError && e.code === 'result-out-of-range') return ee0;
      throw e;
    }
    return eeAfterTime(ee0, ke, hold.timeS);
  }

  margins(temperatureK: number): Partial<Record<PlanConstraint, number>> {
    const out: Partial<Record<PlanConstraint, number>> = {
      specification: this.probability(temperatureK) - this.quantileP,
    };
    const maxTime = this.input.rate?.maxTimeS;
    if (maxTime !== undefined) out.time = Math.log(maxTime) - this.lnTime(temperatureK)!;
    if (this.input.hold) out.hold = this.eeAfterHold(temperatureK)! - this.input.hold.floorEePercent;
    return out;
  }

  minMargin(temperatureK: number): number {
    return Math.min(...Object.values(this.margins(temperatureK)));
  }

  constraintNames(): PlanConstraint[] {
    return Object.keys(this.margins((this.input.rangeK.from + this.input.rangeK.to) / 2)) as PlanConstraint[];
  }
}

function validateConstraints(input: PlanInput): void {
  const { rate, hold } = input;
  if (rate) {
    if (!(rate.targetConversion > 0 && rate.targetConversion < 1)) {
      throw new DomainError(
        'conversion-out-of-range',
        'rate.targetConversionPercent must lie between 0 and 100 %',
        'rate.targetConversionPercent',
      );
    }
    if (rate.maxTimeS !== undefined && !(rate.maxTimeS > 0 && Number.isFinite(rate.maxTimeS))) {
      throw new DomainError('time-not-positive', 'rate.maxTime must be a positive duration', 'rate.maxTime.value');
    }
  }
  if (hold) {
    resolveBarrier(hold.barrier, 'hold.barrier');
    if (!(hold.timeS > 0 && Number.isFinite(hold.timeS)))
      throw new DomainError('time-not-positive', 'hold.time must be a positive duration', 'hold.time.value');
    if (!(hold.floorEePercent > 0 && hold.floorEePercent < 100)) {
      throw new DomainError('floor-out-of-range', 'hold.floorEePercent must lie between 0 and 100 %', 'hold.floorEePercent');
    }
  }
}

/** Sub-ranges of [lo, hi] where f ≥ 0, from a scan then bisection of every sign change. */
export function positiveRanges(f: (t: number) => number, lo: number, hi: number, stepK = 0.5): [number, number][] {
  const n = Math.max(2, Math.ceil((hi - lo) / stepK));
  const ts = Array.from({ length: n + 1 }, (_, i) => (i === n ? hi : lo + ((hi - lo) * i) / n));
  const ok = ts.map((t) => f(t) >= 0);
  const edge = (good: number, bad: number) => {
    // Invariant: f(good) ≥ 0 > f(bad); the answer is the feasible end.
    let g = good;
    let b = bad;
    while (Math.abs(b - g) > ROOT_TOLERANCE_K) {
      const mid = (g + b) / 2;
      if (f(mid) >= 0) g = mid;
      else b = mid;
    }
    return g;
  };
  const ranges: [number, number][] = [];
  let start: number | null = null;
  for (let i = 0; i <= n; i++) {
    if (ok[i] && start === null) start = i === 0 ? ts[0]! : edge(ts[i]!, ts[i - 1]!);
    if (!ok[i] && start !== null) {
      ranges.push([start, edge(ts[i - 1]!, ts[i]!)]);
      start = null;
    }
  }
  if (start !== null) ranges.push([start, ts[n]!]);
  return ranges;
}

const CONSTRAINT_LABEL: Record<PlanConstraint, string> = {
  specification: 'the specification',
  time: 'the reaction time limit',
  hold: 'the hold',
  jacket: 'the jacket',
};

function describeNeed(constraint: PlanConstraint, ranges: [number, number][], lo: number, hi: number): ConstraintNeed {
  const label = CONSTRAINT_LABEL[constraint];
  if (ranges.length === 0) {
    return { constraint, kind: 'nowhere', lowK: null, highK: null, message: `${label} is met nowhere between ${fmt(lo)} and ${fmt(hi)}` };
  }
  const a = ranges[0]![0];
  const b = ranges[ranges.length - 1]![1];
  const fromEdge = a <= lo + ROOT_TOLERANCE_K;
  const toEdge = b >= hi - ROOT_TOLERANCE_K;
  if (fromEdge && toEdge)
    return { constraint, kind: 'everywhere', lowK: null, highK: null, message: `${label} is met at every temperature` };
  if (fromEdge) return { constraint, kind: 'at-most', lowK: null, highK: b, message: `${label} needs ≤ ${fmt(b)}` };
  if (toEdge) return { constraint, kind: 'at-least', lowK: a, highK: null, message: `${label} needs ≥ ${fmt(a)}` };
  return { constraint, kind: 'between', lowK: a, highK: b, message: `${label} needs ${fmt(a)} to ${fmt(b)}` };
}

/**
 * Plan the temperature: evaluate every constraint, find the feasible stretches of the allowed range
 * and recommend one temperature by `rule` (default 'warmest'). A specification that cannot be met
 * is an answer, not an error: no recommendation, each constraint's own need and the conflict.
 */
export function planTemperature(input: PlanInput): PlanResult {
  const { from, to } = input.rangeK;
  requireTemperatureK(from, 'temperatures.from');
  requireTemperatureK(to, 'temperatures.to');
  if (!(to > from)) throw new DomainError('range-reversed', 'temperatures.to must be warmer than temperatures.from', 'temperatures.to');
  const rule = input.rule ?? 'warmest';
  validateConstraints(input);
  const model = new PlanModel(input);
  const warnings: Warning[] = [];
  const bandLevel = input.bandLevel ?? 0.95;

  const evaluate = (t: number): PlanEvaluation => {
    const pred = model.predictive(t, 1);
    const q = studentTQuantile((1 + bandLevel) / 2, pred.dof);
    const margins = model.margins(t);
    const failing = (Object.entries(margins) as [PlanConstraint, number][]).filter(([, m]) => m < 0).map(([c]) => c);
    if (t < from - 1e-9 || t > to + 1e-9) failing.push('jacket');
    const rate = input.rate ? timeToTargetAt(input.rate.fit, t, input.rate.targetConversion, bandLevel) : null;
    const m = input.specification.measure;
    return {
      temperatureK: t,
      celsius: kelvinToCelsius(t),
      probabilityMeetsSpec: model.probability(t),
      lnRatio: pred.mean,
      value: lnRatioInMeasure(pred.mean, m),
      band: [lnRatioInMeasure(pred.mean - q * pred.scale, m), lnRatioInMeasure(pred.mean + q * pred.scale, m)],
      timeToTargetS: rate ? rate.timeS : null,
      timeBandS: rate ? rate.intervalS : null,
      eeAfterHoldPercent: model.eeAfterHold(t, false),
      feasible: failing.length === 0,
      failing,
    };
  };

  const feasibleRangesK = positiveRanges((t) => model.minMargin(t), from, to);
  let recommendedK: number | null = null;
  let window: [number, number] | null = null;
  if (feasibleRangesK.length > 0) {
    if (rule === 'warmest') window = feasibleRangesK[feasibleRangesK.length - 1]!;
    else if (rule === 'coldest') window = feasibleRangesK[0]!;
    else window = [...feasibleRangesK].sort((a, b) => b[1] - b[0] - (a[1] - a[0]))[0]!;
    recommendedK = rule === 'warmest' ? window[1] : rule === 'coldest' ? window[0] : (window[0] + window[1]) / 2;
  }

  // Each constraint on its own, searched beyond the allowed range, to say what it needs.
  const lo = Math.max(MIN_SEARCH_K, from - NEEDS_MARGIN_K);
  const hi = to + NEEDS_MARGIN_K;
  const names = model.constraintNames();
  const needs = names.map((c) =>
    describeNeed(
      c,
      positiveRanges((t) => model.margins(t)[c]!, lo, hi, 1),
      lo,
      hi,
    ),
  );

  const binding = new Set<PlanConstraint>();
  if (window) {
    // What stops the window at each edge: the jacket at the range's end, else the constraint failing just beyond.
    const edges: [number, number][] = [
      [window[0], window[0] - 0.01],
      [window[1], window[1] + 0.01],
    ];
    for (const [edge, beyond] of edges) {
      if (edge <= from + ROOT_TOLERANCE_K || edge >= to - ROOT_TOLERANCE_K) binding.add('jacket');
      else for (const [c, mm] of Object.entries(model.margins(beyond)) as [PlanConstraint, number][]) if (mm < 0) binding.add(c);
    }
  }

  let conflict: PlanResult['conflict'] = null;
  const resolutions: string[] = [];
  if (!window) {
    // Upper limits (≤) against lower limits (≥), the jacket included; the largest gap says by how much.
    const uppers: { c: PlanConstraint; k: number; text: string }[] = [{ c: 'jacket', k: to, text: `the jacket allows ≤ ${fmt(to)}` }];
    const lowers: { c: PlanConstraint; k: number; text: string }[] = [{ c: 'jacket', k: from, text: `the jacket allows ≥ ${fmt(from)}` }];
    for (const n of needs) {
      if (n.highK !== null) uppers.push({ c: n.constraint, k: n.highK, text: n.message });
      if (n.lowK !== null) lowers.push({ c: n.constraint, k: n.lowK, text: n.message });
    }
    // Every upper limit below a lower limit is a conflict; report them widest first.
    const pairs: { u: (typeof uppers)[number]; l: (typeof lowers)[number]; gap: number }[] = [];
    for (const u of uppers) for (const l of lowers) if (u.c !== l.c && u.k < l.k) pairs.push({ u, l, gap: l.k - u.k });
    pairs.sort((a, b) => b.gap - a.gap);
    const worst = pairs[0] ?? null;
    const nowhere = needs.filter((n) => n.kind === 'nowhere');
    const parts = [...nowhere.map((n) => n.message), ...pairs.map((p) => `${p.u.text}, ${p.l.text}: ${p.gap.toFixed(1)} K apart`)];
    const blame = new Set<PlanConstraint>([...nowhere.map((n) => n.constraint), ...pairs.flatMap((p) => [p.u.c, p.l.c])]);
    if (parts.length === 0) {
      // Each constraint can be met inside the range but never all at once (e.g. two narrow stretches).
      for (const n of needs) if (n.kind !== 'everywhere') blame.add(n.constraint);
      parts.push(`no temperature meets ${[...blame].map((c) => CONSTRAINT_LABEL[c]).join(' and ')} at once`);
    }
    conflict = {
      message: `No temperature from ${fmt(from)} to ${fmt(to)} satisfies everything: ${parts.join('; ')}.`,
      gapK: worst ? worst.gap : null,
    };
    for (const c of blame) binding.add(c);
    const spec = needs.find((n) => n.constraint === 'specification');
    if (blame.has('specification')) {
      resolutions.push(
        'A more selective catalyst or conditions, or more runs near the plant temperature to narrow the prediction interval (see the suggested next runs).',
      );
    }
    if (blame.has('jacket') && spec?.highK !== undefined && spec.highK !== null && spec.highK < from) {
      resolutions.push(`A colder jacket: the specification alone is met at ${fmt(spec.highK)} or below.`);
    }
    if (blame.has('time') && input.rate) {
      // The warmest temperature the other constraints allow: the least time the target could need.
      const at = Math.min(Math.max(worst && worst.u.c !== 'time' ? worst.u.k : from, from), to);
      const t = timeToTargetAt(input.rate.fit, at, input.rate.targetConversion);
      resolutions.push(`More time: the target conversion needs about ${(t.timeS / 3600).toPrecision(3)} h at ${fmt(at)}.`);
    }
    if (blame.has('hold')) resolutions.push('A shorter hold, or holding the batch colder before isolation.');
  }

  const nCurve = Math.max(2, Math.min(input.curvePoints ?? 121, 2001));
  const curve = Array.from({ length: nCurve }, (_, i) => evaluate(i === nCurve - 1 ? to : from + ((to - from) * i) / (nCurve - 1)));
  const evaluations = (input.atK ?? []).map((t, i) => {
    requireTemperatureK(t, `at[${i}]`);
    return evaluate(t);
  });
  if (recommendedK !== null && (recommendedK < input.fit.temperatureRangeK.min || recommendedK > input.fit.temperatureRangeK.max)) {
    warnings.push({
      code: 'recommendation-extrapolated',
      message: `The recommended temperature lies outside the screened temperatures (${fmt(input.fit.temperatureRangeK.min)} to ${fmt(input.fit.temperatureRangeK.max)}): confirm it with a run there first.`,
    });
  }
  if (input.rate) warnings.push(...input.rate.fit.warnings);
  return {
    rule,
    ruleText: RULE_TEXT[rule],
    specificationLnRatio: model.lnSpec,
    recommended: recommendedK === null ? null : { temperatureK: recommendedK, probabilityMeetsSpec: model.probability(recommendedK) },
    window: window ? { fromK: window[0], toK: window[1] } : null,
    feasibleRangesK,
    binding: [...binding],
    needs,
    conflict,
    resolutions,
    evaluations,
    curve,
    warnings,
  };
}
