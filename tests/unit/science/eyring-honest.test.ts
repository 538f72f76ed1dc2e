import { describe, expect, it } from 'vitest';
import { seededNormals } from '../../support/seeded-normals';
import { sigmaLnRatioAt } from '../../../api/science/assay-precision';
import { GAS_CONSTANT_J_PER_MOL_K as R } from '../../../api/science/constants';
import { fitEyring, type EyringMeasurement } from '../../../api/science/eyring-fit';
import { fitLine } from '../../../api/science/regression';

const codes = (w: { code: string }[]) => w.map((x) => x.code);

// The invented screen of tests/fixtures/r/censored-eyring.R: ln r = −0.9 + 1684/T + noise.
const CELSIUS = [-70, -60, -50, -40, -30, -20, -10, 0, 10, 20];
const NOISE = [0.05, -0.04, 0.03, -0.06, 0.02, 0.04, -0.03, 0.01, -0.05, 0.02];
const rScreen: EyringMeasurement[] = CELSIUS.map((c, i) => ({
  temperatureK: c + 273.15,
  ratio: Math.exp(-0.9 + 1684 / (c + 273.15) + NOISE[i]!),
}));

describe('fitEyring with runs beyond the quantitation limit (censored ML)', () => {
  it('when the coldest runs read above 99.8 % ee, then they are bounds at the limit and ΔΔH‡ matches R survreg', () => {
    const fit = fitEyring(rScreen);
    expect(fit.estimator).toBe('censored-ml');
    expect(fit.nCensored).toBe(2);
    // The reported digits (ln r 7.33 and 6.96) are not used: each bound sits at the limit ln 999.
    expect(fit.points[0]!.censorLnRatio).toBeCloseTo(Math.log(999), 12);
    expect(fit.points[1]!.censorLnRatio).toBeCloseTo(Math.log(999), 12);
    // R 4.2.2, survival 3.5-3, survreg Gaussian right-censored (tests/fixtures/r/censored-eyring.R): b = 1694.15134625908445 K
    expect(Math.abs(fit.slopeK / 1694.15134625908445 - 1)).toBeLessThan(1e-8);
    expect(Math.abs(fit.ddHJPerMol / (R * 1694.15134625908445) - 1)).toBeLessThan(1e-8); // [C] ΔΔH‡ = R·b
    expect(Math.abs(fit.ddHSeJPerMol! / (R * Math.sqrt(1287.2282116934788974)) - 1)).toBeLessThan(1e-5); // R survreg Var(b)
    // The least-squares fit of the 8 exact runs is shown beside it.
    const exact = rScreen.slice(2);
    const ls = fitLine(
      exact.map((m) => 1 / m.temperatureK),
      exact.map((m) => Math.log(m.ratio)),
    );
    expect(fit.leastSquaresWithoutBounds!.ddHJPerMol).toBeCloseTo(R * ls.slope, 6); // [C]
    expect(fit.leastSquaresWithoutBounds!.nFitted).toBe(8);
    expect(fit.points.slice(0, 2).every((p) => p.boundConsistent)).toBe(true);
  });

  it('when many screens are censored at the limit, then the censored fit is nearly unbiased while dropping the bounds biases ΔΔH‡ low (fixed seed)', () => {
    const z = seededNormals(20261202);
    const truthB = 2000;
    let tobitSum = 0;
    let dropSum = 0;
    let count = 0;
    for (let s = 0; s < 300; s++) {
      const runs = CELSIUS.map((c) => {
        const t = c + 273.15;
        return { temperatureK: t, ratio: Math.exp(-2 + truthB / t + 0.15 * z()) };
      });
      const fit = fitEyring(runs);
      if (fit.estimator !== 'censored-ml') continue;
      tobitSum += fit.slopeK;
      dropSum += fit.leastSquaresWithoutBounds!.ddHJPerMol / R;
      count++;
    }
    expect(count).toBeGreaterThan(250);
    const tobitBias = tobitSum / count / truthB - 1;
    const dropBias = dropSum / count / truthB - 1;
    expect(dropBias).toBeLessThan(-0.02); // [C] the coldest runs are censored only when high, so dropping them flattens the line
    expect(Math.abs(tobitBias)).toBeLessThan(Math.abs(dropBias) / 3);
  });
});

describe('honest flags on small screens', () => {
  const wild: EyringMeasurement[] = [-40, -20, 0, 20].map((c, i) => ({
    temperatureK: c + 273.15,
    ratio: Math.exp(1500 / (c + 273.15) - 3 + (i === 2 ? 0.5 : 0)),
  }));

  it('when there are fewer than 3 residual degrees of freedom, then no run is flagged and the page says why', () => {
    const fit = fitEyring(wild);
    expect(fit.dof).toBe(2);
    expect(fit.points.every((p) => p.flags.length === 0 && p.flagReason === null)).toBe(true);
    expect(codes(fit.warnings)).toContain('too-few-runs-to-flag');
    expect(codes(fit.warnings)).not.toContain('flagged-points');
    expect(fit.points[2]!.studentizedInternal).not.toBeNull();
  });

  it('when a run is flagged, then one line says why and never suggests excluding it', () => {
    const runs: EyringMeasurement[] = [-60, -40, -20, 0, 20, 40].map((c, i) => ({
      temperatureK: c + 273.15,
      ratio: Math.exp(1500 / (c + 273.15) - 3 + [0.01, -0.01, 0.01, 0.8, -0.01, 0.01][i]!),
    }));
    const fit = fitEyring(runs);
    const p = fit.points[3]!;
    expect(p.flags).toContain('outlier');
    expect(p.flagReason).toMatch(/studentized residuals from the line/);
    expect(p.flagReason).not.toMatch(/exclud/i);
    expect(fit.warnings.find((w) => w.code === 'flagged-points')!.message).not.toMatch(/exclude one/i);
  });

  it('when a screen is large, then a flagged run reads its leverage and the limit with enough digits to tell them apart', () => {
    // 500 runs: 490 spread over 0–20 °C, ten at −40 °C. The limit 2p/n is 0.008; the cold runs' leverage is about 0.1.
    const normal = seededNormals(7);
    const runs: EyringMeasurement[] = Array.from({ length: 500 }, (_, i) => {
      const e = normal();
      const celsius = i < 10 ? -40 : (i % 49) * (20 / 48);
      return { temperatureK: celsius + 273.15, ratio: Math.exp(1500 / (celsius + 273.15) - 3 + 0.02 * e) };
    });
    const fit = fitEyring(runs);
    const cold = fit.points[0]!;
    expect(cold.flags).toContain('high-leverage');
    const [, shown, limit] = /leverage (\S+) > (\S+)\)/.exec(cold.flagReason!)!;
    expect(Number(limit)).toBeCloseTo((2 * 2) / 500, 12);
    expect(Number(shown)).toBeGreaterThan(Number(limit));
    expect(Math.abs(Number(shown) - cold.leverage!) / cold.leverage!).toBeLessThan(0.05);
  });

  it('when the assay precision is known and a residual lies within it, then the run is not called an outlier', () => {
    const runs: EyringMeasurement[] = [-60, -40, -20, 0, 20, 40].map((c, i) => ({
      temperatureK: c + 273.15,
      ratio: Math.exp(1500 / (c + 273.15) - 3 + [0.001, -0.001, 0.001, 0.08, -0.001, 0.001][i]!),
      sigmaLnR: 0.05,
    }));
    const fit = fitEyring(runs, { weighting: 'absolute' });
    const p = fit.points[3]!;
    expect(p.flags).not.toContain('outlier');
    expect(p.withinAssayPrecision).toBe(true);
    expect(p.residualInAssaySigmas!).toBeLessThan(2);
    expect(codes(fit.warnings)).toContain('residuals-within-assay');
  });
});

describe('new-run prediction interval with the assay precision', () => {
  // A cold, highly selective screen: about 99.5 % ee at −40 °C.
  const screen: EyringMeasurement[] = [-40, -20, 0, 20, 40].map((c, i) => ({
    temperatureK: c + 273.15,
    ratio: Math.exp(2200 / (c + 273.15) - 3.5 + [0.01, -0.015, 0.005, 0.01, -0.01][i]!),
  }));

  it('when σ_ee is given, then it is propagated at the predicted ee: σ_lnr = σ_ee·200/((100 − ee)(100 + ee))', () => {
    const y = Math.log(399); // ee = 99.5 %
    const ee = 100 * Math.tanh(y / 2);
    expect(sigmaLnRatioAt({ measure: 'ee', uncertainty: 0.2 }, y)).toBeCloseTo((0.2 * 200) / ((100 - ee) * (100 + ee)), 12); // [C]
    const pA = 100 / (1 + Math.exp(-y));
    expect(sigmaLnRatioAt({ measure: 'percentA', uncertainty: 0.1 }, y)).toBeCloseTo((0.1 * 100) / (pA * (100 - pA)), 12); // [C] σ_p/(p(1 − p))
    expect(sigmaLnRatioAt({ measure: 'dr', uncertainty: 0.05 }, y)).toBe(0.05); // [C] relative SD of r is σ(ln r)
  });

  it('when a new run is predicted near 99.5 % ee, then the assay widens the interval far beyond the screen scatter', () => {
    const plain = fitEyring(screen, { predictAtK: [233.15] });
    const assay = fitEyring(screen, { predictAtK: [233.15], newRun: { measure: 'ee', uncertainty: 0.2 } });
    const a = assay.predictions[0]!;
    const p = plain.predictions[0]!;
    expect(a.eePercent).toBeGreaterThan(99.4);
    const halfA = (a.predictionInterval!.lnRatio[1] - a.predictionInterval!.lnRatio[0]) / 2;
    const halfP = (p.predictionInterval!.lnRatio[1] - p.predictionInterval!.lnRatio[0]) / 2;
    expect(halfA).toBeGreaterThan(5 * halfP);
    // [C] unweighted: Var_new = Var(ŷ₀) + max(s², σ²_assay), t on n − 2 dof
    const vm = assay.model.varianceOfMean(1 / 233.15)!;
    const q = assay.model.quantile(0.95)!;
    expect(halfA).toBeCloseTo(q * Math.sqrt(vm + Math.max(assay.residualSdLnR! ** 2, a.newRunSigmaLnR! ** 2)), 10);
    expect(assay.newRunBasis).toEqual({ source: 'assay', precision: { measure: 'ee', uncertainty: 0.2 } });
    // The mean-line interval does not change.
    expect(a.meanInterval!.lnRatio).toEqual(p.meanInterval!.lnRatio);
  });
});

describe('χ²/dof of weighted fits', () => {
  const base = [-60, -40, -20, 0, 20, 40];
  const wiggle = [0.03, -0.04, 0.02, 0.05, -0.03, -0.02];
  const runs = (sigma: number): EyringMeasurement[] =>
    base.map((c, i) => ({ temperatureK: c + 273.15, ratio: Math.exp(1500 / (c + 273.15) - 3 + wiggle[i]!), sigmaLnR: sigma }));

  it('when the stated σ are far smaller than the scatter, then the fit says the scatter is larger and absolute intervals are too narrow', () => {
    const fit = fitEyring(runs(0.005), { weighting: 'absolute' });
    expect(fit.precisionCheck!.verdict).toBe('scatter-larger');
    expect(fit.precisionCheck!.reducedChiSquare).toBeCloseTo(fit.line.ssRes / 4, 12); // [C] χ²/(n − 2)
    expect(fit.precisionCheck!.message).toMatch(/too narrow/);
    expect(codes(fit.warnings)).toContain('stated-precision-mismatch');
  });

  it('when the stated σ match the scatter, then it says they can be read as absolute', () => {
    const fit = fitEyring(runs(0.045), { weighting: 'relative' });
    expect(fit.precisionCheck!.verdict).toBe('consistent');
    expect(fit.precisionCheck!.message).toMatch(/absolute/);
  });

  it('when the fit is unweighted, then there is no precision check', () => {
    expect(fitEyring(runs(0.045), { weighting: 'none' }).precisionCheck).toBeNull();
  });
});

describe('T₀ with a Fieller interval', () => {
  it('when ΔΔS‡ is well determined, then T₀ has a bounded interval around it', () => {
    // ΔΔH‡/R = 1500 K, ΔΔS‡/R = 3 → T₀ = 500 K, measured over 213–313 K
    const runs = [-60, -40, -20, 0, 20, 40].map((c, i) => ({
      temperatureK: c + 273.15,
      ratio: Math.exp(1500 / (c + 273.15) - 3 + [0.01, -0.01, 0.005, 0.0, -0.005, 0.01][i]!),
    }));
    const fit = fitEyring(runs);
    const iv = fit.zeroSelectivityInterval!;
    expect(iv.bounded).toBe(true);
    expect(iv.ranges[0]!.fromK!).toBeLessThan(fit.zeroSelectivityTemperatureK!);
    expect(iv.ranges[0]!.toK!).toBeGreaterThan(fit.zeroSelectivityTemperatureK!);
    expect(fit.zeroSelectivityFar).toBe(true);
  });

  it('when ΔΔS‡ cannot be told from zero, then the interval is unbounded and the fit says so', () => {
    const runs = [-40, -20, 0, 20, 40].map((c, i) => ({
      temperatureK: c + 273.15,
      ratio: Math.exp(300 / (c + 273.15) - 0.05 + [0.05, -0.06, 0.04, 0.05, -0.05][i]!),
    }));
    const fit = fitEyring(runs);
    expect(fit.zeroSelectivityTemperatureK).not.toBeNull();
    expect(fit.zeroSelectivityInterval!.bounded).toBe(false);
    expect(fit.zeroSelectivityInterval!.message).toMatch(/unbounded|no limit/);
    expect(codes(fit.warnings)).toContain('zero-selectivity-unbounded');
  });

  it('when T₀ lies inside the temperatures asked about, then it is not called a far extrapolation', () => {
    const runs = [-60, -40, -20, 0, 20, 40].map((c) => ({ temperatureK: c + 273.15, ratio: Math.exp(1500 / (c + 273.15) - 3) * 1.0001 }));
    const fit = fitEyring(runs, { predictAtK: [450, 550] });
    expect(fit.zeroSelectivityFar).toBe(false);
    expect(codes(fit.warnings)).not.toContain('zero-selectivity-extrapolated');
  });
});

describe('correctness details', () => {
  it('when a screen runs from −40 to 0 °C, then it spans 40 K and is not called narrow', () => {
    const runs = [-40, -30, -20, -10, 0].map((c, i) => ({
      temperatureK: c + 273.15,
      ratio: Math.exp(1500 / (c + 273.15) - 3 + [0.01, -0.01, 0, 0.01, -0.01][i]!),
    }));
    expect(codes(fitEyring(runs).warnings)).not.toContain('narrow-temperature-span');
  });

  it('when one prediction lies far below the data, then it is flagged with ln r and ΔΔG‡ and the rest of the fit stands', () => {
    const runs = [-40, -20, 0, 20, 40].map((c, i) => ({
      temperatureK: c + 273.15,
      ratio: Math.exp(1500 / (c + 273.15) - 3 + [0.01, -0.01, 0, 0.01, -0.01][i]!),
    }));
    const fit = fitEyring(runs, { predictAtK: [2, 250] });
    const [far, near] = fit.predictions;
    expect(far!.outOfRange).toBe(true);
    expect(far!.lnRatio).toBeCloseTo(fit.model.intercept + fit.model.slope / 2, 9); // [C] ŷ = a + b/T
    expect(far!.lnRatio).toBeGreaterThan(709.8); // [C] beyond ln(Number.MAX_VALUE): r itself overflows
    expect(Number.isFinite(far!.ddGJPerMol)).toBe(true);
    expect(far!.eePercent).toBe(100); // saturates
    expect(far!.meanInterval!.lnRatio.every(Number.isFinite)).toBe(true);
    expect(near!.outOfRange).toBe(false);
    expect(codes(fit.warnings)).toContain('prediction-out-of-range');
  });
});
