import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { GAS_CONSTANT_J_PER_MOL_K as R } from '../../../api/science/constants';
import { eyringRateConstant } from '../../../api/science/rate';
import { fitEyring, type EyringMeasurement } from '../../../api/science/eyring-fit';
import {
  newRunSigmaLnR,
  predictiveLnR,
  probabilityAtLeast,
  specificationLnRatio,
  type Specification,
} from '../../../api/science/plan-predictive';
import { fitRateFromRuns, timeToTargetAt } from '../../../api/science/rate-fit';
import { planTemperature, positiveRanges, type PlanInput } from '../../../api/science/plan';
import { checkCurvature } from '../../../api/science/segmented';
import { chooseScreenModel, predictiveLnRatio } from '../../../api/science/screen-model';
import { domainErrorOf } from './helpers';

// Invented screen [C]: ΔΔH‡ = 12 kJ/mol, ΔΔS‡ = 10 J/(mol·K), ln r = ΔΔH‡/RT − ΔΔS‡/R, five temperatures in duplicate.
const lnR = (t: number) => 12_000 / (R * t) - 10 / R;
const NOISE = [0.04, -0.03, 0.02, -0.05, 0.03, -0.01, 0.05, -0.02, 0.01, -0.04]; // fixed scatter in ln r, invented
const TEMPS = [-60, -60, -40, -40, -20, -20, 0, 0, 20, 20].map((c) => c + 273.15);
const screen = (): EyringMeasurement[] => TEMPS.map((t, i) => ({ temperatureK: t, ratio: Math.exp(lnR(t) + NOISE[i]!) }));
const fit = fitEyring(screen());

// Invented main reaction [C]: ΔH‡ = 55 kJ/mol, ΔS‡ = −100 J/(mol·K), first order; runs made exactly on it.
const kTrue = (t: number) => eyringRateConstant(55_000 + 100 * t, t);
const RATE_RUNS = [-40, -20, 0, 20].map((c, i) => {
  const t = c + 273.15;
  const timeS = 3600 * [20, 6, 1, 0.25][i]!;
  return { temperatureK: t, timeS, conversion: 1 - Math.exp(-kTrue(t) * timeS) };
});
const rate = fitRateFromRuns(RATE_RUNS);
const SPEC: Specification = { measure: 'ee', minimum: 98, probability: 0.95 };
const RANGE = { from: 203.15, to: 313.15 };
const base = (over: Partial<PlanInput> = {}): PlanInput => ({ fit, specification: SPEC, rangeK: RANGE, curvePoints: 5, ...over });
const HOLD = { barrier: { kind: 'enthalpy-entropy' as const, hJPerMol: 85_000, sJPerMolK: -10 }, timeS: 8 * 3600, floorEePercent: 98.5 };

/** Straight-line OLS by hand, independent of the engine's regression code. */
function olsByHand(x: number[], y: number[]) {
  const n = x.length;
  const xm = x.reduce((a, b) => a + b, 0) / n;
  const ym = y.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i]! - xm) ** 2;
    sxy += (x[i]! - xm) * (y[i]! - ym);
  }
  const b = sxy / sxx;
  const a = ym - b * xm;
  const ss = x.reduce((acc, xi, i) => acc + (y[i]! - a - b * xi) ** 2, 0);
  return { n, xm, sxx, a, b, s: Math.sqrt(ss / (n - 2)) };
}

describe('probability of meeting the specification', () => {
  const x = TEMPS.map((t) => 1 / t);
  const y = screen().map((m) => Math.log(m.ratio));
  const ols = olsByHand(x, y);
  it('when the screen is built, then every run is fitted (none at the quantitation limit)', () => {
    expect(fit.nFitted).toBe(TEMPS.length);
  });
  const lnSpec = Math.log(1.98 / 0.02); // [C] ee 98 % ↔ r = (1 + 0.98)/(1 − 0.98) = 99

  it.each([213.15, 253.15, 273.15, 300.15, 313.15])(
    'when the fit is unweighted and no assay precision is given, then P at %s K equals the Student t (jstat) of s·√(1 + 1/n + (x₀ − x̄)²/Sxx) on n − 2 dof',
    (t) => {
      const x0 = 1 / t;
      const scale = ols.s * Math.sqrt(1 + 1 / ols.n + (x0 - ols.xm) ** 2 / ols.sxx);
      // [C] P(ln r_new ≥ ln r_spec) = 1 − F_t((ln r_spec − ŷ)/scale); F_t from jstat 1.9.6, an independent implementation.
      const expected = 1 - jStat.studentt.cdf((lnSpec - (ols.a + ols.b * x0)) / scale, ols.n - 2);
      const p = probabilityAtLeast(predictiveLnR(fit, t), specificationLnRatio(SPEC));
      expect(p).toBeCloseTo(expected, 7);
    },
  );

  it('when the specification is for the mean of k runs, then the new-run term shrinks to s²/k', () => {
    const t = 258.15;
    const x0 = 1 / t;
    const scale = ols.s * Math.sqrt(1 / 3 + 1 / ols.n + (x0 - ols.xm) ** 2 / ols.sxx);
    const expected = 1 - jStat.studentt.cdf((lnSpec - (ols.a + ols.b * x0)) / scale, ols.n - 2); // [C] jstat 1.9.6
    expect(probabilityAtLeast(predictiveLnR(fit, t, { runs: 3 }), lnSpec)).toBeCloseTo(expected, 7);
    expect(predictiveLnR(fit, t, { runs: 3 }).scale).toBeLessThan(predictiveLnR(fit, t).scale);
  });

  it("when the assay's precision is given, then it replaces the screen's scatter for the new run", () => {
    const t = 258.15;
    const x0 = 1 / t;
    const pred = predictiveLnR(fit, t, { newRunSigma: 0.2 });
    // [C] scale² = s²(1/n + (x₀ − x̄)²/Sxx) + σ_new²
    expect(pred.scale).toBeCloseTo(Math.sqrt(ols.s ** 2 * (1 / ols.n + (x0 - ols.xm) ** 2 / ols.sxx) + 0.04), 10);
    expect(pred.dof).toBe(ols.n - 2);
  });

  it('when the assay precision is in ee points, then σ(ln r) is propagated at the predicted ee', () => {
    // [C] σ_lnr = σ_ee·200/((100 − ee)(100 + ee)); at ee 98 % and σ_ee = 0.2: 0.2·200/(2·198) = 0.10101…
    expect(newRunSigmaLnR('ee', 0.2, Math.log(1.98 / 0.02))).toBeCloseTo((0.2 * 200) / (2 * 198), 10);
    // [C] % A: σ_p·100/(p(100 − p)); at 95 % and σ = 0.5: 0.5·100/(95·5)
    expect(newRunSigmaLnR('percentA', 0.5, Math.log(95 / 5))).toBeCloseTo((0.5 * 100) / (95 * 5), 10);
  });

  it('when a specification is outside its measure or the probability outside (0.5, 0.999], then the error names the field', () => {
    expect(domainErrorOf(() => specificationLnRatio({ measure: 'ee', minimum: 100.5, probability: 0.95 }))?.field).toBe(
      'specification.minimum',
    );
    expect(domainErrorOf(() => specificationLnRatio({ measure: 'dr', minimum: 0.9, probability: 0.95 }))?.field).toBe(
      'specification.minimum',
    );
    expect(domainErrorOf(() => specificationLnRatio({ measure: 'percentA', minimum: 40, probability: 0.95 }))?.field).toBe(
      'specification.minimum',
    );
    expect(domainErrorOf(() => specificationLnRatio({ measure: 'ee', minimum: 99, probability: 0.5 }))?.field).toBe(
      'specification.probability',
    );
    expect(domainErrorOf(() => specificationLnRatio({ measure: 'ee', minimum: 99, probability: 1 }))?.field).toBe(
      'specification.probability',
    );
    // [C] dr 20:1 ↔ ln 20; er 98:2 ↔ ln 49
    expect(specificationLnRatio({ measure: 'dr', minimum: 20, probability: 0.9 })).toBeCloseTo(Math.log(20), 12);
    expect(specificationLnRatio({ measure: 'er', minimum: 98, probability: 0.9 })).toBeCloseTo(Math.log(49), 12);
  });
});

describe('rate from the campaign runs', () => {
  it('when runs lie exactly on an Eyring–Polanyi line, then ΔH‡ and ΔS‡ are recovered and times follow −ln(1 − X)/k', () => {
    expect(rate.hJPerMol).toBeCloseTo(55_000, 4); // [C]
    expect(rate.sJPerMolK).toBeCloseTo(-100, 6); // [C]
    const t = timeToTargetAt(rate, 263.15, 0.95);
    expect(t.timeS / (-Math.log(0.05) / kTrue(263.15))).toBeCloseTo(1, 9); // [C] first order
  });

  it('when runs scatter, then the time has an interval around it and a run below 10 % conversion is flagged', () => {
    const runs = [
      ...RATE_RUNS.map((r, i) => ({ ...r, timeS: r.timeS * [1.1, 0.92, 1.05, 0.97][i]! })),
      { temperatureK: 233.15, timeS: 3600, conversion: 0.05 },
    ];
    const f = fitRateFromRuns(runs);
    const t = timeToTargetAt(f, 263.15, 0.95);
    expect(t.intervalS![0]).toBeLessThan(t.timeS);
    expect(t.intervalS![1]).toBeGreaterThan(t.timeS);
    expect(f.runs.map((r) => r.lowConversion)).toEqual([false, false, false, false, true]);
    expect(f.warnings.map((w) => w.code)).toContain('low-conversion-runs');
  });

  it('when the order is second with equal concentrations, then k = X/(t·c₀(1 − X))', () => {
    const f = fitRateFromRuns(RATE_RUNS, { order: 'second', initialConcentrationM: 0.5 });
    const r0 = RATE_RUNS[0]!;
    expect(f.runs[0]!.k).toBeCloseTo(r0.conversion / (r0.timeS * 0.5 * (1 - r0.conversion)), 12); // [C]
  });

  it('when a run has 0 % or 100 % conversion, then the error names that run', () => {
    expect(domainErrorOf(() => fitRateFromRuns([...RATE_RUNS, { temperatureK: 250, timeS: 60, conversion: 1 }]))?.field).toBe(
      'runs[4].conversion',
    );
  });
});

describe('recommended temperature and window', () => {
  /** Feasibility on a dense grid, independent of the root finder. */
  const denseFeasible = (input: PlanInput, step = 0.005) => {
    const probe = planTemperature({ ...input, curvePoints: 2 });
    const out: number[] = [];
    // Each point is checked by evaluating the plan's own constraint outputs at that temperature.
    const atK: number[] = [];
    for (let t = RANGE.from; t <= RANGE.to + 1e-9; t += step) atK.push(t);
    const evals = planTemperature({ ...input, atK, curvePoints: 2 }).evaluations;
    for (const e of evals) {
      const specOk = e.probabilityMeetsSpec >= input.specification.probability;
      const timeOk = input.rate?.maxTimeS === undefined || e.timeToTargetS! <= input.rate.maxTimeS;
      const holdOk = !input.hold || e.eeAfterHoldPercent! >= input.hold.floorEePercent;
      if (specOk && timeOk && holdOk) out.push(e.temperatureK);
    }
    return { probe, feasible: out };
  };

  it('when only the specification limits it, then the warmest feasible temperature by root finding matches a 0.005 K grid search to 0.01 K', () => {
    const input = base();
    const { probe, feasible } = denseFeasible(input);
    expect(Math.abs(probe.recommended!.temperatureK - Math.max(...feasible))).toBeLessThan(0.01); // [C] grid search
    expect(probe.recommended!.probabilityMeetsSpec).toBeGreaterThanOrEqual(0.95);
    expect(probe.recommended!.probabilityMeetsSpec).toBeLessThan(0.9501);
    expect(probe.window!.fromK).toBe(RANGE.from);
    expect(probe.binding.sort()).toEqual(['jacket', 'specification']);
    expect(probe.ruleText).toMatch(/warmest/);
  });

  it('when the time limit binds at the cold end, then the coldest rule returns the time edge, matching the grid', () => {
    const input = base({ rate: { fit: rate, targetConversion: 0.95, maxTimeS: 24 * 3600 }, rule: 'coldest' });
    const { probe, feasible } = denseFeasible(input);
    expect(Math.abs(probe.recommended!.temperatureK - Math.min(...feasible))).toBeLessThan(0.01); // [C] grid search
    expect(probe.binding.sort()).toEqual(['specification', 'time']);
    // [C] with exact runs the time edge solves −ln(0.05)/k(T) = 24 h
    expect(kTrue(probe.window!.fromK) * 24 * 3600).toBeCloseTo(-Math.log(0.05), 2);
  });

  it('when the time limit is applied at the required probability, then its edge moves warmer than with the central estimate', () => {
    // Scattered runs, so the rate line has an interval.
    const runs = RATE_RUNS.map((r, i) => ({ ...r, timeS: r.timeS * [1.15, 0.9, 1.08, 0.95][i]! }));
    const scattered = fitRateFromRuns(runs);
    const rateInput = { fit: scattered, targetConversion: 0.95, maxTimeS: 24 * 3600 };
    const central = planTemperature(base({ rate: rateInput, rule: 'coldest' }));
    const sure = planTemperature(base({ rate: rateInput, rule: 'coldest', applyAtProbability: true }));
    expect(sure.window!.fromK).toBeGreaterThan(central.window!.fromK);
    // [C] at the sure edge the upper 95 % quantile of a new batch's ln t equals ln 24 h
    const line = scattered.line;
    const t = sure.window!.fromK;
    const dx = 1 / t - line.xMean;
    const se = Math.sqrt(line.varianceScale! * (1 + 1 / line.n + (dx * dx) / line.sxx));
    const q = jStat.studentt.inv(0.95, line.dof); // jstat 1.9.6, independent of the engine's quantile
    expect(Math.log(timeToTargetAt(scattered, t, 0.95).timeS) + q * se).toBeCloseTo(Math.log(24 * 3600), 4);
  });

  it('when the middle rule is chosen, then the recommendation is the middle of the window', () => {
    const p = planTemperature(base({ rate: { fit: rate, targetConversion: 0.95, maxTimeS: 24 * 3600 }, rule: 'middle' }));
    expect(p.recommended!.temperatureK).toBeCloseTo((p.window!.fromK + p.window!.toK) / 2, 9);
  });

  it('when the hold is tighter than the specification on the warm side, then the hold binds there', () => {
    const input = base({ hold: HOLD });
    const { probe, feasible } = denseFeasible(input);
    expect(probe.binding).toContain('hold');
    expect(probe.binding).not.toContain('specification');
    expect(Math.abs(probe.recommended!.temperatureK - Math.max(...feasible))).toBeLessThan(0.01); // [C]
    const at = planTemperature({ ...input, atK: [probe.recommended!.temperatureK] }).evaluations[0]!;
    expect(at.eeAfterHoldPercent!).toBeCloseTo(98.5, 2);
  });

  it('when no temperature satisfies everything, then there is no recommendation and the conflict says which constraints and by how much', () => {
    const p = planTemperature(base({ rate: { fit: rate, targetConversion: 0.95, maxTimeS: 24 * 3600 }, hold: HOLD }));
    expect(p.recommended).toBeNull();
    expect(p.window).toBeNull();
    expect(p.binding.sort()).toEqual(['hold', 'time']);
    const holdNeed = p.needs.find((n) => n.constraint === 'hold')!;
    const timeNeed = p.needs.find((n) => n.constraint === 'time')!;
    expect(holdNeed.kind).toBe('at-most');
    expect(timeNeed.kind).toBe('at-least');
    expect(p.conflict!.gapK).toBeCloseTo(timeNeed.lowK! - holdNeed.highK!, 9);
    expect(p.conflict!.message).toMatch(/the hold needs ≤ .* the reaction time limit needs ≥ .*K apart/);
    expect(p.resolutions.join(' ')).toMatch(/More time/);
    expect(p.curve.every((c) => !c.feasible)).toBe(true);
  });

  it('when the specification needs colder than the jacket allows, then the jacket and the specification conflict', () => {
    const p = planTemperature(base({ rangeK: { from: 253.15, to: 313.15 } }));
    expect(p.recommended).toBeNull();
    expect(p.binding.sort()).toEqual(['jacket', 'specification']);
    expect(p.conflict!.message).toMatch(/specification needs ≤/);
    expect(p.resolutions.join(' ')).toMatch(/colder jacket/);
  });

  it('when the range is reversed, then the error names temperatures.to', () => {
    expect(domainErrorOf(() => planTemperature(base({ rangeK: { from: 300, to: 250 } })))?.field).toBe('temperatures.to');
  });

  it('when a function is positive on two stretches, then both are found with edges to 1e-4 K', () => {
    const ranges = positiveRanges((t) => Math.cos((t - 200) / 10), 200, 300);
    // [C] cos ≥ 0 on [200, 200 + 5π] and [200 + 15π, 200 + 25π] within 200…300
    expect(ranges).toHaveLength(2);
    expect(ranges[0]![1]).toBeCloseTo(200 + 5 * Math.PI, 3);
    expect(ranges[1]![0]).toBeCloseTo(200 + 15 * Math.PI, 3);
    expect(ranges[1]![1]).toBeCloseTo(200 + 25 * Math.PI, 3);
  });
});

describe('the planner on a curved screen', () => {
  // Invented isoinversion screen [C]: slopes +1,600 K (warm side) and −900 K (cold side) meeting at −15 °C, fixed scatter.
  const xBreak = 1 / 258.15;
  const isoLnR = (t: number) => 3 + 1600 * (1 / t - xBreak) - 2500 * Math.max(0, 1 / t - xBreak);
  const scatter = [0.012, -0.018, 0.009, 0.021, -0.011, -0.016, 0.014, 0.004, -0.02, 0.008];
  const runs: EyringMeasurement[] = [40, 30, 20, 10, 0, -10, -20, -30, -40, -50].map((c, i) => ({
    temperatureK: c + 273.15,
    ratio: Math.exp(isoLnR(c + 273.15) + scatter[i]!),
  }));
  const curvedFit = fitEyring(runs);
  const model = chooseScreenModel(curvedFit, checkCurvature(runs));

  it('when curvature is accepted, then each probability is the segmented model’s Student-t tail at that temperature (jstat)', () => {
    expect(model.kind).toBe('segmented');
    const spec: Specification = { measure: 'dr', minimum: Math.exp(3), probability: 0.9 };
    const atK = [238.15, 258.15, 283.15];
    const plan = planTemperature({ fit: curvedFit, model, specification: spec, rangeK: { from: 223.15, to: 313.15 }, atK, curvePoints: 5 });
    atK.forEach((t, i) => {
      const p = predictiveLnRatio(model, t);
      // [S] jstat 1.9.6 Student t cdf, an implementation independent of the engine's.
      const expected = 1 - jStat.studentt.cdf((3 - p.mean) / p.sdNewRun!, p.dof);
      expect(plan.evaluations[i]!.probabilityMeetsSpec).toBeCloseTo(expected, 6);
      expect(plan.evaluations[i]!.lnRatio).toBeCloseTo(p.mean, 10);
    });
    // The straight line through a peaked screen would be far less sure of the peak than the branches are.
    const straight = planTemperature({
      fit: curvedFit,
      specification: spec,
      rangeK: { from: 223.15, to: 313.15 },
      atK: [258.15],
      curvePoints: 5,
    });
    expect(plan.evaluations[1]!.probabilityMeetsSpec).toBeGreaterThan(straight.evaluations[0]!.probabilityMeetsSpec);
  });
});
