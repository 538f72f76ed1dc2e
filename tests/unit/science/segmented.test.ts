import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fitEyring, type EyringMeasurement } from '../../../api/science/eyring-fit';
import { checkCurvature, predictSegmented, type SegmentedFit } from '../../../api/science/segmented';
import { expectAllFinite } from './helpers';

/** Seeded uniform (mulberry32) and Box–Muller normals for the simulations, independent of the engine's generator. */
function rng(seed: number) {
  let s = seed >>> 0;
  const uniform = () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = Math.imul(s ^ (s >>> 15), s | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (((t ^ (t >>> 14)) >>> 0) + 0.5) / 4294967296;
  };
  const normal = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
  return { uniform, normal };
}

const K = 273.15;
const run = (temperatureK: number, lnR: number, sigmaLnR?: number): EyringMeasurement => ({
  temperatureK,
  ratio: Math.exp(lnR),
  ...(sigmaLnR ? { sigmaLnR } : {}),
});
const fitted = (r: ReturnType<typeof checkCurvature>): SegmentedFit => {
  expect(r.checked).toBe(true);
  return r as SegmentedFit;
};

// Data sets A–D are the ones in tests/fixtures/r/segmented-reference.R (invented, fixed scatter);
// reference values from R 4.2.2 with segmented 1.6-2 (Muggeo), printed in segmented-reference.out.
const X_BREAK = 1 / 263.15;
const TA = [223.15, 233.15, 243.15, 253.15, 263.15, 273.15, 283.15, 293.15, 303.15, 313.15];
const EA = [0.012, -0.018, 0.009, 0.021, -0.011, -0.016, 0.014, 0.004, -0.02, 0.008];
const YA = TA.map((t, i) => 1.2 - 800 * (1 / t - X_BREAK) + 1600 * Math.max(0, 1 / t - X_BREAK) + EA[i]!);
const SET_A = TA.map((t, i) => run(t, YA[i]!));
const TB = [233.15, 253.15, 273.15, 293.15].flatMap((t) => [t, t]);
const EB = [0.031, -0.024, -0.012, 0.027, 0.018, -0.035, -0.006, 0.021];
const SET_B = TB.map((t, i) => run(t, 1 + 1000 * (1 / t - X_BREAK) + 1500 * Math.max(0, 1 / t - X_BREAK) + EB[i]!));
const SC = [0.01, 0.01, 0.02, 0.02, 0.015, 0.015, 0.03, 0.03, 0.02, 0.01];
const SET_C = TA.map((t, i) => run(t, YA[i]!, SC[i]));

describe('checkCurvature against R segmented', () => {
  it('when the branches have opposite slopes (set A), then break, its SE and CI and both slopes equal R segmented 1.6-2', () => {
    const r = fitted(checkCurvature(SET_A));
    const c = r.coefficients;
    expect(1 / r.breakTemperatureK).toBeCloseTo(0.00379506008975, 10); // R 4.2.2 segmented 1.6-2: psi
    expect(c.scale * Math.sqrt(c.covariance![3]![3]!)).toBeCloseTo(1.50669550735e-5, 12); // R segmented: St.Err of psi
    expect(r.breakCiK![0]).toBeCloseTo(260.9652645, 4); // R segmented confint(method = "delta")
    expect(r.breakCiK![1]!).toBeCloseTo(266.0853533, 4); // R segmented confint(method = "delta")
    expect(r.high.slopeK).toBeCloseTo(-812.598865201, 4); // R segmented slope(): slope1
    expect(r.high.slopeSeK!).toBeCloseTo(48.9248485537, 4); // R segmented slope(): St.Err
    expect(r.low.slopeK).toBeCloseTo(803.767054475, 4); // R segmented slope(): slope2
    expect(r.low.slopeSeK!).toBeCloseTo(33.5855626345, 4); // R segmented slope(): St.Err
    expect(r.ssSegmented).toBeCloseTo(0.00196338338339, 10); // R: sum(residuals(seg)^2)
    expect(r.ssOneLine).toBeCloseTo(0.281737375033, 10); // R: sum(residuals(lm)^2)
    // R davies.test(k = 10) gives p = 2.5e-5 (an upper bound for its grid); our Monte Carlo p is
    // floored at 1/(B + 1) = 0.0005: both reject a straight line clearly.
    expect(r.pValue).toBeLessThan(0.001);
    expect(r.preferred).toBe('two-branch');
    expectAllFinite(r);
  });

  it('when four temperatures are run in duplicate with a slope change (set B), then the fit and the lack-of-fit F equal R', () => {
    const r = fitted(checkCurvature(SET_B));
    expect(r.breakTemperatureK).toBeCloseTo(264.3458152, 5); // R 4.2.2 segmented 1.6-2: 1/psi
    expect(r.breakCiK![0]).toBeCloseTo(258.2528149, 4); // R segmented confint(method = "delta")
    expect(r.breakCiK![1]!).toBeCloseTo(270.7332689, 4); // R segmented confint(method = "delta")
    expect(r.high.slopeK).toBeCloseTo(935.940863556, 4); // R segmented slope()
    expect(r.high.slopeSeK!).toBeCloseTo(127.270944364, 4); // R segmented slope()
    expect(r.low.slopeK).toBeCloseTo(2488.19561665, 4); // R segmented slope()
    expect(r.low.slopeSeK!).toBeCloseTo(93.810513838, 4); // R segmented slope()
    expect(r.lackOfFit!.fStatistic).toBeCloseTo(49.0363168338, 8); // R anova(lm(y ~ I(1/T)), lm(y ~ factor(T)))
    expect(r.lackOfFit!.dofLackOfFit).toBe(2); // R anova: Df
    expect(r.lackOfFit!.dofPureError).toBe(4); // R anova: Res.Df
    expect(r.lackOfFit!.pValue).toBeCloseTo(0.00153568216875, 10); // R anova: Pr(>F)
    // R davies.test(k = 10): p = 0.000905; ours agrees that the break is real.
    expect(r.pValue).toBeLessThan(0.01);
    expect(r.claim).toBe('change-of-slope');
    expect(r.extremum).toBeNull();
  });

  it('when runs carry σ (set C), then the weights 1/σ² are used and the fit equals R weighted segmented', () => {
    const r = fitted(checkCurvature(SET_C));
    expect(r.weighted).toBe(true);
    expect(1 / r.breakTemperatureK).toBeCloseTo(0.00379276111547, 10); // R segmented, lm(weights = 1/σ²)
    expect(r.coefficients.scale * Math.sqrt(r.coefficients.covariance![3]![3]!)).toBeCloseTo(1.52057833533e-5, 12); // R segmented St.Err
    expect(r.high.slopeK).toBeCloseTo(-840.17666624, 4); // R segmented slope()
    expect(r.low.slopeK).toBeCloseTo(813.655808593, 4); // R segmented slope()
    const unweighted = fitted(checkCurvature(SET_C, { weighting: 'none' }));
    expect(unweighted.breakTemperatureK).toBeCloseTo(263.5004391, 5); // R: set A unweighted
  });
});

describe('checkCurvature wording and claims', () => {
  it('when the slopes have opposite signs and the break is accepted, then an isoinversion temperature with its extremum is claimed', () => {
    const r = fitted(checkCurvature(SET_A));
    expect(r.claim).toBe('isoinversion');
    // [C] ln r falls with 1/T on the warm side and rises on the cold side: r is smallest at the break.
    expect(r.extremum).toBe('minimum');
    expect(r.reason).toMatch(/isoinversion temperature, where r passes through a minimum/);
    const mirrored = fitted(checkCurvature(SET_A.map((m) => ({ ...m, ratio: 1 / m.ratio }))));
    expect(mirrored.extremum).toBe('maximum'); // [C] r → 1/r turns the minimum into a maximum
  });

  it('when the slopes have the same sign, then only a change of slope is named, never an isoinversion', () => {
    const r = fitted(checkCurvature(SET_B));
    expect(r.reason).toMatch(/change of slope at/);
    expect(r.reason).not.toMatch(/isoinversion/);
  });

  it('when the data lie on one line with scatter, then one line is kept and no break is claimed', () => {
    const { normal } = rng(5);
    const data = TA.map((t) => run(t, 1500 / t - 3 + 0.02 * normal()));
    const r = fitted(checkCurvature(data));
    expect(r.preferred).toBe('one-line');
    expect(r.claim).toBeNull();
    expect(r.extremum).toBeNull();
    expect(r.reason).not.toMatch(/isoinversion|extremum/);
  });

  it('when too few runs or temperatures remain, then the check is skipped with an explained note, never an error', () => {
    const five = checkCurvature(SET_A.slice(0, 5));
    expect(five.checked).toBe(false);
    expect(five.reason).toMatch(
      /Not enough data.*3 or more fitted runs at 2 or more distinct temperatures.*5 fitted runs at 5 temperatures/,
    );
    const threeTemps = checkCurvature([233.15, 253.15, 273.15].flatMap((t) => [run(t, 1), run(t, 1.1), run(t, 0.9)]));
    expect(threeTemps.checked).toBe(false);
    const excluded = checkCurvature(SET_A.map((m, i) => (i < 5 ? { ...m, excluded: true } : m)));
    expect(excluded.checked).toBe(false);
  });

  it('when the same data are checked twice, then the verdict and p are identical (fixed seed)', () => {
    const a = fitted(checkCurvature(SET_B));
    const b = fitted(checkCurvature([...SET_B].reverse()));
    expect(b.pValue).toBe(a.pValue);
    expect(b.breakTemperatureK).toBeCloseTo(a.breakTemperatureK, 9);
  });

  it('when the runs are listed coldest first, warmest first or mixed, with replicates, then every result is the same', () => {
    // SET_B is coldest first with duplicates; the check orders runs itself (without sorting when they come in order).
    const mixed = [5, 0, 7, 2, 1, 6, 3, 4].map((i) => SET_B[i]!);
    const coldFirst = fitted(checkCurvature(SET_B));
    for (const order of [[...SET_B].reverse(), mixed]) {
      const r = fitted(checkCurvature(order));
      expect(r.pValue).toBe(coldFirst.pValue);
      expect(r.breakTemperatureK).toBeCloseTo(coldFirst.breakTemperatureK, 9);
      expect(r.ssSegmented).toBeCloseTo(coldFirst.ssSegmented, 12);
      expect(r.lackOfFit!.fStatistic).toBeCloseTo(coldFirst.lackOfFit!.fStatistic, 9);
      expect(r.low.n).toBe(coldFirst.low.n);
      expect(r.distinctTemperatures).toBe(4);
    }
  });
});

describe('the break search is exact least squares', () => {
  it('when the profile is compared with a dense scan of breaks, then no scanned break fits better', () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ t: fc.integer({ min: 200, max: 330 }), y: fc.double({ min: -3, max: 4, noNaN: true }) }), {
          minLength: 6,
          maxLength: 16,
        }),
        (rows) => {
          const data = rows.map((r) => run(r.t, r.y));
          const res = checkCurvature(data, { resamples: 19 });
          if (!res.checked) return;
          const temps = [...new Set(rows.map((r) => r.t))].sort((a, b) => b - a);
          const xs = temps.map((t) => 1 / t);
          const counts = temps.map((t) => rows.filter((r) => r.t === t).length);
          // Allowed break range: the union of gaps of splits with ≥ 3 runs and ≥ 2 temperatures per side.
          for (let j = 0; j < temps.length - 1; j++) {
            const left = counts.slice(0, j + 1).reduce((s, v) => s + v, 0);
            if (j + 1 < 2 || temps.length - j - 1 < 2 || left < 3 || rows.length - left < 3) continue;
            for (let k = 0; k <= 20; k++) {
              const psi = xs[j]! + ((xs[j + 1]! - xs[j]!) * k) / 20;
              // [C] ordinary least squares of y on [1, x, (x − psi)₊] by normal equations in centred x.
              const x = rows.map((r) => 1 / r.t - psi);
              const h = x.map((v) => Math.max(0, v));
              const y = rows.map((r) => r.y);
              const cols = [x.map(() => 1), x, h];
              const a = cols.map((ci) => cols.map((cj) => ci.reduce((s, v, i) => s + v * cj[i]!, 0)));
              const b = cols.map((ci) => ci.reduce((s, v, i) => s + v * y[i]!, 0));
              const beta = solve3(a, b);
              if (!beta) continue;
              const ss = y.reduce((s, v, i) => s + (v - beta[0]! - beta[1]! * x[i]! - beta[2]! * h[i]!) ** 2, 0);
              expect(res.ssSegmented).toBeLessThanOrEqual(ss * (1 + 1e-6) + 1e-9);
            }
          }
        },
      ),
      { numRuns: 80 },
    );
  });
});

function solve3(a: number[][], b: number[]): number[] | null {
  const det = (m: number[][]) =>
    m[0]![0]! * (m[1]![1]! * m[2]![2]! - m[1]![2]! * m[2]![1]!) -
    m[0]![1]! * (m[1]![0]! * m[2]![2]! - m[1]![2]! * m[2]![0]!) +
    m[0]![2]! * (m[1]![0]! * m[2]![1]! - m[1]![1]! * m[2]![0]!);
  const d = det(a);
  if (!(Math.abs(d) > 1e-30)) return null;
  return [0, 1, 2].map((c) => det(a.map((row, i) => row.map((v, j) => (j === c ? b[i]! : v)))) / d);
}

describe('predictSegmented', () => {
  it('when predicting, then each temperature is on its branch, the break lies on both lines, and the ends are flagged as extrapolation', () => {
    const r = fitted(checkCurvature(SET_A));
    const atBreak = predictSegmented(r, r.breakTemperatureK);
    expect(atBreak.lnRatio).toBeCloseTo(r.low.intercept + r.low.slopeK / r.breakTemperatureK, 9); // [C] continuity
    expect(atBreak.lnRatio).toBeCloseTo(r.high.intercept + r.high.slopeK / r.breakTemperatureK, 9); // [C] continuity
    const cold = predictSegmented(r, 240);
    expect(cold.branch).toBe('low');
    expect(cold.lnRatio).toBeCloseTo(r.low.intercept + r.low.slopeK / 240, 9);
    expect(predictSegmented(r, 300).branch).toBe('high');
    expect(cold.extrapolated).toBe(false);
    expect(predictSegmented(r, 200).extrapolated).toBe(true);
    expect(predictSegmented(r, 330).extrapolated).toBe(true);
    expect(cold.seNewRun!).toBeGreaterThan(cold.seMean!);
  });
});

// ── Simulations (fixed seeds) ───────────────────────────────────────────────────────────────
// Measured figures are listed in api/science/README.md-style notes in DEVELOPERS.md.

/** Four temperatures in duplicate, −40 to +20 °C, σ(ln r) = 0.03, break at −10 °C. */
const DUPLICATE_DESIGN = [-40, -20, 0, 20].flatMap((c) => [c + K, c + K]);
const screen = (normal: () => number, slopeChangeK: number, temps = DUPLICATE_DESIGN) =>
  temps.map((t) => run(t, 1 + 1000 * (1 / t - 1 / 263.15) + slopeChangeK * Math.max(0, 1 / t - 1 / 263.15) + 0.03 * normal()));

describe('break test by simulation', () => {
  it('when four temperatures in duplicate (σ = 0.03) carry a 1,500 K slope change, then the break is found in ≥ 90 % of screens', () => {
    const { normal } = rng(101);
    const screens = 400;
    let found = 0;
    for (let i = 0; i < screens; i++) if (fitted(checkCurvature(screen(normal, 1500))).preferred === 'two-branch') found++;
    expect(found / screens).toBeGreaterThanOrEqual(0.9); // issue target; measured 1.000
  });

  it('when the data are one straight line, then they are called curved in ≤ 6 % of screens for every n from 6 to 16', () => {
    const { normal } = rng(2026);
    const screens = 2000;
    for (let n = 6; n <= 16; n++) {
      const temps = Array.from({ length: n }, (_, i) => 233.15 + (60 * i) / (n - 1));
      let curved = 0;
      for (let i = 0; i < screens; i++) {
        const r = checkCurvature(temps.map((t) => run(t, 1200 / t - 2 + 0.03 * normal())));
        if (r.checked && r.preferred === 'two-branch') curved++;
      }
      expect(curved / screens, `n = ${n}`).toBeLessThanOrEqual(0.06);
    }
  });

  it('when a run lying on the accepted branches is added, then the verdict never flips', () => {
    const { normal, uniform } = rng(303);
    let accepted = 0;
    for (const slopeChange of [300, 500, 800, 1500]) {
      for (let i = 0; i < 60; i++) {
        const data = screen(normal, slopeChange);
        const r = fitted(checkCurvature(data));
        if (r.preferred !== 'two-branch') continue;
        accepted++;
        // A screened temperature or one between them (few distinct designs, so the null samples are reused).
        const t = [-40, -30, -20, -10, 0, 10, 20][Math.floor(uniform() * 7)]! + K;
        const added = [...data, run(t, predictSegmented(r, t).lnRatio)];
        expect(fitted(checkCurvature(added)).preferred).toBe('two-branch');
      }
    }
    expect(accepted).toBeGreaterThan(100);
  });

  it('when one straight line is accepted and a run on that line is added at a screened temperature, then one line stays', () => {
    const { normal, uniform } = rng(404);
    for (let i = 0; i < 200; i++) {
      const data = screen(normal, 0);
      const r = fitted(checkCurvature(data));
      if (r.preferred !== 'one-line' || r.pValue < 0.1) continue;
      const line = fitEyring(data);
      const t = DUPLICATE_DESIGN[Math.floor(uniform() * DUPLICATE_DESIGN.length)]!;
      expect(fitted(checkCurvature([...data, run(t, line.intercept + line.slopeK / t)])).preferred).toBe('one-line');
    }
  });
});
