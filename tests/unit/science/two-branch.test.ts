import { describe, expect, it } from 'vitest';
import { GAS_CONSTANT_J_PER_MOL_K as R } from '../../../api/science/constants';
import type { EyringMeasurement } from '../../../api/science/eyring-fit';
import { fitLine } from '../../../api/science/regression';
import { fitTwoBranch } from '../../../api/science/two-branch';
import { expectAllFinite } from './helpers';
import fcdf from '@stdlib/stats-base-dists-f-cdf';
import jstat from 'jstat';
import fc from 'fast-check';

// Constructed broken Eyring plot [C]: two straight branches of ln r vs 1/T meeting at T_inv = 260 K,
// y_inv = 2; low-T branch ΔΔH‡ = 20 kJ/mol, high-T branch ΔΔH‡ = 5 kJ/mol:
//   y = y_inv + (ΔΔH‡/R)(1/T − 1/T_inv). A fixed, invented scatter of ±0.01–0.02 is added.
const T_INV = 260;
const branchY = (t: number) => 2 + ((t < T_INV ? 20_000 : 5_000) / R) * (1 / t - 1 / T_INV);
const LOW = [200, 210, 220, 230, 240, 250];
const HIGH = [270, 280, 290, 300, 310, 320];
const SCATTER = [0.01, -0.015, 0.02, -0.01, 0.015, -0.02, 0.01, -0.01, 0.02, -0.015, 0.01, -0.02];
const broken: EyringMeasurement[] = [...LOW, ...HIGH].map((t, i) => ({ temperatureK: t, ratio: Math.exp(branchY(t) + SCATTER[i]!) }));
// The same temperatures on a single straight line (ΔΔH‡ = 10 kJ/mol, ΔΔS‡ = 5 J/(mol K)) with the same scatter [C].
const straight: EyringMeasurement[] = [...LOW, ...HIGH].map((t, i) => ({
  temperatureK: t,
  ratio: Math.exp(10_000 / (R * t) - 5 / R + SCATTER[i]!),
}));

describe('fitTwoBranch', () => {
  it('when the Eyring plot is a constructed broken line, then the break, the branches and the isoinversion temperature are found', () => {
    const res = fitTwoBranch(broken)!;
    expect(res).not.toBeNull();
    expect(res.lowBranch.temperatureRangeK.max).toBe(250); // [C] construction
    expect(res.highBranch.temperatureRangeK.min).toBe(270); // [C] construction
    expect(res.lowBranch.ddHJPerMol).toBeGreaterThan(17_000); // [C] 20 kJ/mol ± scatter
    expect(res.lowBranch.ddHJPerMol).toBeLessThan(23_000); // [C] construction
    expect(res.highBranch.ddHJPerMol).toBeGreaterThan(3_000); // [C] 5 kJ/mol ± scatter
    expect(res.highBranch.ddHJPerMol).toBeLessThan(7_000); // [C] construction
    expect(res.isoinversionTemperatureK!).toBeGreaterThan(250); // [C] T_inv = 260 K by construction
    expect(res.isoinversionTemperatureK!).toBeLessThan(270); // [C] construction
    expect(res.pValue).toBeLessThan(0.001); // [C] a real break of this size is unmistakable
    expect(res.preferred).toBe('two-branch');
    expectAllFinite(res);
  });

  it('when the F statistic is recomputed from the two SS values, then it and its p-value agree with an independent library', () => {
    const res = fitTwoBranch(broken)!;
    const one = fitLine(
      broken.map((m) => 1 / m.temperatureK),
      broken.map((m) => Math.log(m.ratio)),
    );
    expect(res.oneLine.ssRes).toBeCloseTo(one.ssRes, 12);
    const f = (one.ssRes - res.twoBranch.ssRes) / 2 / (res.twoBranch.ssRes / (12 - 4)); // [C] extra-sum-of-squares F
    expect(res.fStatistic).toBeCloseTo(f, 6);
    expect(res.dof1).toBe(2);
    expect(res.dof2).toBe(8);
    expect(res.pValue).toBeCloseTo(1 - fcdf(f, 2, 8), 12);
    expect(Math.abs(res.pValue - (1 - jstat.centralF.cdf(f, 2, 8)))).toBeLessThan(1e-8); // [independent library]
  });

  it('when the data lie on one straight line with scatter, then one line is preferred', () => {
    const res = fitTwoBranch(straight)!;
    expect(res.preferred).toBe('one-line');
    expect(res.reason).toMatch(/one line/i);
  });

  it('when trial branches fitted to plain scatter happen to cross near the break, then the note claims no isoinversion temperature', () => {
    // [C] one straight line, ln r = 2000/T − 5, plus fixed scatter chosen so that the best trial
    // branches cross at ≈ 239 K while the F test (p ≈ 0.13) keeps one line.
    const scatter = [0.0135, -0.0067, -0.0139, -0.0081, -0.0029, -0.0082, 0.0175, 0.0023];
    const data = [220, 230, 240, 250, 260, 270, 280, 290].map((t, i) => ({ temperatureK: t, ratio: Math.exp(2000 / t - 5 + scatter[i]!) }));
    const res = fitTwoBranch(data)!;
    expect(res.preferred).toBe('one-line');
    expect(res.isoinversionTemperatureK).not.toBeNull();
    expect(res.isoinversionNote).toMatch(/no isoinversion temperature is claimed/);
    expect(res.isoinversionNote).not.toMatch(/extremum/);
  });

  it('when fewer than 6 usable points remain, then null is returned', () => {
    expect(fitTwoBranch(broken.slice(0, 5))).toBeNull();
    const withExcluded = broken.slice(0, 6).map((m, i) => (i === 0 ? { ...m, excluded: true } : m));
    expect(fitTwoBranch(withExcluded)).toBeNull();
  });

  it('when the branch lines are parallel, then no isoinversion temperature is claimed and the note says why', () => {
    // [C] two parallel lines offset by 1.0 in ln r
    const data = [...LOW, ...HIGH].map((t, i) => ({
      temperatureK: t,
      ratio: Math.exp(5_000 / (R * t) + (t > 260 ? 1 : 0) + SCATTER[i]! * 0.01),
    }));
    const res = fitTwoBranch(data)!;
    expect(res.isoinversionTemperatureK).toBeNull();
    expect(res.isoinversionNote).toMatch(/do not cross|far from the break|parallel/);
  });
});

describe('the break search', () => {
  it('when breaks are scored from prefix sums, then the chosen break is the one a full refit at every break would choose', () => {
    // fast-check: random screens (6–30 runs, some repeated temperatures, optional σ); the reference
    // refits both branches with fitLine at every admissible break and takes the least total SS.
    fc.assert(
      fc.property(
        fc.array(fc.record({ t: fc.integer({ min: 190, max: 340 }), y: fc.double({ min: -4, max: 6, noNaN: true }), s: fc.double({ min: 0.01, max: 0.5, noNaN: true }) }), { minLength: 6, maxLength: 30 }),
        fc.boolean(),
        (rows, weighted) => {
          const data: EyringMeasurement[] = rows.map((r) => ({ temperatureK: r.t, ratio: Math.exp(r.y), ...(weighted ? { sigmaLnR: r.s } : {}) }));
          const res = fitTwoBranch(data, { weighting: weighted ? 'relative' : 'none' });
          const sorted = [...data].sort((a, b) => a.temperatureK - b.temperatureK);
          let bestSs = Infinity;
          for (let split = 3; split <= sorted.length - 3; split++) {
            if (sorted[split]!.temperatureK === sorted[split - 1]!.temperatureK) continue;
            const low = sorted.slice(0, split);
            const high = sorted.slice(split);
            if (new Set(low.map((m) => m.temperatureK)).size < 2 || new Set(high.map((m) => m.temperatureK)).size < 2) continue;
            const f = (pts: EyringMeasurement[]) =>
              fitLine(
                pts.map((m) => 1 / m.temperatureK),
                pts.map((m) => Math.log(m.ratio)),
                weighted ? { sigma: pts.map((m) => m.sigmaLnR!), sigmaMode: 'relative' } : {},
              ).ssRes;
            bestSs = Math.min(bestSs, f(low) + f(high));
          }
          if (!Number.isFinite(bestSs)) return res === null;
          expect(res).not.toBeNull();
          expect(res!.twoBranch.ssRes).toBeLessThanOrEqual(bestSs * (1 + 1e-7) + 1e-12);
        },
      ),
      { numRuns: 300 },
    );
  });
});
