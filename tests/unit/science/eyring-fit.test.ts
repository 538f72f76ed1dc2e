import { describe, expect, it } from 'vitest';
import { GAS_CONSTANT_J_PER_MOL_K as R } from '../../../api/science/constants';
import { ddGAtTemperature, fitEyring, predictEyring, type EyringMeasurement } from '../../../api/science/eyring-fit';
import { fitLine, predictLine } from '../../../api/science/regression';
import { domainErrorOf, expectAllFinite } from './helpers';

// Constructed screen [C]: ΔΔH‡ = 12 kJ/mol, ΔΔS‡ = 10 J/(mol K); ln r = ΔΔH‡/RT − ΔΔS‡/R (api/science/README.md §1).
const DDH = 12_000;
const DDS = 10;
const lnR = (t: number) => DDH / (R * t) - DDS / R;
const SCREEN_C = [-78, -40, -20, 0, 25];
const NOISE = [0.03, -0.02, 0.025, -0.035, 0.01, -0.015, 0.02, -0.01]; // fixed small scatter in ln r, invented
const screen = (noise = true): EyringMeasurement[] =>
  SCREEN_C.map((c, i) => {
    const t = c + 273.15;
    return { temperatureK: t, ratio: Math.exp(lnR(t) + (noise ? NOISE[i]! : 0)) };
  });
const codes = (w: { code: string }[]) => w.map((x) => x.code);

describe('fitEyring', () => {
  it('when the data lie exactly on a line, then ΔΔH‡ and ΔΔS‡ used to build it are recovered', () => {
    const fit = fitEyring(screen(false));
    expect(fit.ddHJPerMol).toBeCloseTo(DDH, 5); // [C]
    expect(fit.ddSJPerMolK).toBeCloseTo(DDS, 8); // [C]
    expect(fit.convention).toBe('ΔΔX‡ = X‡(TS→B) − X‡(TS→A); positive values favour A (the numerator of r = [A]/[B])');
  });

  it('when the data scatter, then SEs, CIs and the ΔΔH‡–ΔΔS‡ correlation follow from the line covariance', () => {
    const data = screen();
    const fit = fitEyring(data);
    const x = data.map((d) => 1 / d.temperatureK);
    const y = data.map((d) => Math.log(d.ratio));
    const line = fitLine(x, y);
    expect(fit.ddHSeJPerMol!).toBeCloseTo(R * line.slopeSe!, 9); // [C] SE(ΔΔH‡) = R·SE(b)
    expect(fit.ddSSeJPerMolK!).toBeCloseTo(R * line.interceptSe!, 9); // [C] SE(ΔΔS‡) = R·SE(a)
    expect(fit.ddHDdSCorrelation!).toBeCloseTo(-line.interceptSlopeCorrelation!, 12); // [C] ΔΔS‡ = −R·a flips the sign
    expect(Math.abs(fit.ddHDdSCorrelation!)).toBeGreaterThan(0.9); // [S] Krug, Hunter & Grieger 1976: strong H–S correlation is typical
    expect(fit.ddHCiJPerMol![0]).toBeLessThan(DDH); // [C] the constructed ΔΔH‡ lies inside the 95 % CI
    expect(fit.ddHCiJPerMol![1]).toBeGreaterThan(DDH); // [C]
    expect(fit.nFitted).toBe(5);
    expect(codes(fit.warnings)).not.toContain('few-points');
    expectAllFinite(fit);
  });

  it('when ΔΔG‡ is asked at T, then its SE is RT times the SE of the mean line at 1/T', () => {
    const data = screen();
    const fit = fitEyring(data);
    const line = fitLine(
      data.map((d) => 1 / d.temperatureK),
      data.map((d) => Math.log(d.ratio)),
    );
    const g = ddGAtTemperature(fit, 230);
    expect(g.ddGJPerMol).toBeCloseTo(fit.ddHJPerMol - 230 * fit.ddSJPerMolK, 6); // [C] ΔΔG‡ = ΔΔH‡ − TΔΔS‡
    expect(g.seJPerMol!).toBeCloseTo(R * 230 * predictLine(line, 1 / 230).seMean!, 6); // [C] api/science/README.md §3
  });

  it('when predicting, then intervals nest, map monotonically to ee and %A, and extrapolation is flagged', () => {
    const fit = fitEyring(screen());
    const [inside, outside] = predictEyring(fit, [250, 330]);
    expect(inside!.extrapolated).toBe(false);
    expect(outside!.extrapolated).toBe(true);
    const m = inside!.meanInterval!;
    const p = inside!.predictionInterval!;
    expect(p.lnRatio[0]).toBeLessThan(m.lnRatio[0]);
    expect(p.lnRatio[1]).toBeGreaterThan(m.lnRatio[1]);
    expect(m.eePercent[0]).toBeCloseTo(100 * Math.tanh(m.lnRatio[0] / 2), 12); // [C] api/science/README.md §3 mapping
    expect(m.ratio[1]).toBeCloseTo(Math.exp(m.lnRatio[1]), 9); // [C]
    expect(m.percentA[0]).toBeLessThan(inside!.percentA);
    expect(codes(fitEyring(screen(), { predictAtK: [330] }).warnings)).toContain('extrapolation');
  });

  it('when predictions span racemic to saturated selectivity, then every ee and %A equals its direct formula to 1e-14', () => {
    // ln r from about −0.3 (nearly racemic, where ee is taken from tanh itself) through 0 to beyond
    // 700 (r overflows), on either side of zero: the selectivity inverts at T₀ = ΔΔH‡/ΔΔS‡.
    const inverting = [230, 250, 270, 290, 310].map((t) => ({ temperatureK: t, ratio: Math.exp(2000 / t - 8 + 0.01 * Math.sin(t)) }));
    const fit = fitEyring(inverting);
    const temperatures = [2.5, 50, 150, 200, 240, 245, 250, 255, 260, 300, 400, 1000, 1e5];
    const close = (got: number, want: number) => expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-14 * Math.max(Math.abs(want), 1e-300));
    for (const p of predictEyring(fit, temperatures)) {
      close(p.eePercent, 100 * Math.tanh(p.lnRatio / 2)); // [C] api/science/README.md §3 mapping
      close(p.percentA, 100 / (1 + Math.exp(-p.lnRatio))); // [C]
      for (const iv of [p.meanInterval!, p.predictionInterval!]) {
        for (const end of [0, 1] as const) {
          close(iv.eePercent[end], 100 * Math.tanh(iv.lnRatio[end] / 2));
          close(iv.percentA[end], 100 / (1 + Math.exp(-iv.lnRatio[end])));
        }
      }
    }
    const lnRatios = predictEyring(fit, temperatures).map((p) => p.lnRatio);
    expect(Math.min(...lnRatios.map(Math.abs))).toBeLessThan(0.5);
    expect(Math.max(...lnRatios)).toBeGreaterThan(710);
    expect(Math.min(...lnRatios)).toBeLessThan(-1);
  });

  it('when only two points are given, then the line is exact, no intervals are given and a warning says so', () => {
    const fit = fitEyring(screen(false).slice(0, 2));
    expect(fit.ddHJPerMol).toBeCloseTo(DDH, 5); // [C]
    expect(fit.ddHCiJPerMol).toBeNull();
    expect(fit.intervalsAvailable).toBe(false);
    expect(codes(fit.warnings)).toEqual(expect.arrayContaining(['two-points-exact', 'few-points']));
    expect(predictEyring(fit, [250])[0]!.meanInterval).toBeNull();
    expectAllFinite(fit);
  });

  it('when all runs are at one temperature, then a DomainError is thrown', () => {
    const data = [1, 2, 3].map((i) => ({ temperatureK: 273.15, ratio: 10 + i }));
    expect(domainErrorOf(() => fitEyring(data)).code).toBe('too-few-temperatures');
  });

  it('when a run is above 99.8 % ee, then it is censored, reported as a lower bound, and checked against the line', () => {
    const data = [...screen(), { temperatureK: 150, ratio: 1999 }]; // 99.9 % ee at 150 K; the line predicts far more
    const fit = fitEyring(data);
    const censored = fit.points[5]!;
    expect(censored.status).toBe('censored');
    expect(censored.censoredBound).toBe('lower');
    expect(censored.boundConsistent).toBe(true);
    expect(fit.nFitted).toBe(5);
    expect(fit.ddHJPerMol).toBeCloseTo(fitEyring(screen()).ddHJPerMol, 9); // [C] not in the least squares
    expect(codes(fit.warnings)).toContain('censored-points');
    // a bound the line contradicts: ≥ 99.9 % ee (r ≥ 1999) at 298 K where the line says ~37
    const bad = fitEyring([...screen(), { temperatureK: 298.15, ratio: 1999 }]);
    expect(bad.points[5]!.boundConsistent).toBe(false);
    expect(codes(bad.warnings)).toContain('censored-bound-disagrees');
  });

  it('when a run is excluded by the user, then it stays in the output, marked, and is not fitted', () => {
    const data = screen();
    data[2] = { ...data[2]!, excluded: true, exclusionReason: 'internal probe failed' };
    const fit = fitEyring(data);
    expect(fit.points).toHaveLength(5);
    expect(fit.points[2]!.status).toBe('excluded');
    expect(fit.points[2]!.exclusionReason).toBe('internal probe failed');
    const without = fitEyring(screen().filter((_, i) => i !== 2));
    expect(fit.ddHJPerMol).toBeCloseTo(without.ddHJPerMol, 9);
    expect(codes(fit.warnings)).toContain('excluded-points');
  });

  it('when one run is far off the line, then it is flagged as an outlier but still fitted', () => {
    const temps = [195, 205, 215, 225, 235, 245, 255, 265];
    const data = temps.map((t, i) => ({ temperatureK: t, ratio: Math.exp(lnR(t) + NOISE[i]! * 0.3 + (i === 4 ? 0.6 : 0)) }));
    const fit = fitEyring(data);
    expect(fit.points[4]!.flags).toContain('outlier');
    expect(fit.points[4]!.status).toBe('fitted');
    expect(fit.points.filter((p) => p.flags.includes('outlier'))).toHaveLength(1);
    expect(codes(fit.warnings)).toContain('flagged-points');
  });

  it('when the temperatures span less than 40 K, then a narrow-span warning is given', () => {
    const data = [280, 290, 300, 310].map((t, i) => ({ temperatureK: t, ratio: Math.exp(lnR(t) + NOISE[i]!) }));
    expect(codes(fitEyring(data).warnings)).toEqual(expect.arrayContaining(['narrow-temperature-span', 'few-points'])); // [CP] api/science/README.md §8: screens span ≥ 40–60 K
  });

  it('when every run carries σ(ln r), then relative-σ weighting is used and changes the fit', () => {
    const data = screen().map((d, i) => ({ ...d, sigmaLnR: i === 0 ? 0.2 : 0.02 }));
    const fit = fitEyring(data);
    expect(fit.weighting).toBe('relative');
    expect(fit.ddHJPerMol).not.toBeCloseTo(fitEyring(screen()).ddHJPerMol, 3);
    expect(fitEyring(data, { weighting: 'none' }).weighting).toBe('none');
  });

  it('when ΔΔH‡ and ΔΔS‡ have the same sign, then T₀ = ΔΔH‡/ΔΔS‡ is reported', () => {
    const fit = fitEyring(screen(false));
    expect(fit.zeroSelectivityTemperatureK!).toBeCloseTo(DDH / DDS, 4); // [C] api/science/README.md §4
    expect(codes(fit.warnings)).toContain('zero-selectivity-extrapolated');
  });

  it('when a ratio or temperature is invalid, then the DomainError points at the measurement', () => {
    expect(
      domainErrorOf(() =>
        fitEyring([
          { temperatureK: 250, ratio: 2 },
          { temperatureK: 0, ratio: 3 },
        ]),
      ).field,
    ).toBe('measurements[1].temperatureK');
    expect(
      domainErrorOf(() =>
        fitEyring([
          { temperatureK: 250, ratio: 2 },
          { temperatureK: 260, ratio: -3 },
        ]),
      ).field,
    ).toBe('measurements[1].ratio');
  });
});
