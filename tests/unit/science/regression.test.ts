import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import jstat from 'jstat';
import { SimpleLinearRegression } from 'ml-regression-simple-linear';
import { linearRegression } from 'simple-statistics';
import { DomainError } from '../../../api/science/errors';
import { fitLine, predictLine, studentTQuantile } from '../../../api/science/regression';
import { expectAllFinite } from './helpers';

// NIST Statistical Reference Datasets, "Norris" (public domain), tests/fixtures/nist-strd-norris.dat.
const norrisText = readFileSync(fileURLToPath(new URL('../../fixtures/nist-strd-norris.dat', import.meta.url)), 'utf8');

function parseNorris(text: string) {
  const lines = text.split(/\r?\n/);
  const num = (line: string | undefined, index: number) => Number((line ?? '').trim().split(/\s+/)[index]);
  const find = (re: RegExp) => lines.find((l) => re.test(l));
  const b0 = find(/^\s*B0\s/);
  const b1 = find(/^\s*B1\s/);
  const certified = {
    intercept: num(b0, 1),
    interceptSd: num(b0, 2),
    slope: num(b1, 1),
    slopeSd: num(b1, 2),
    residualSd: Number(
      find(/Standard Deviation\s+[\d.]/)
        ?.trim()
        .split(/\s+/)
        .pop(),
    ),
    rSquared: Number(
      find(/R-Squared/)
        ?.trim()
        .split(/\s+/)
        .pop(),
    ),
  };
  const start = lines.findIndex((l) => /^\s*Data:\s+y\s+x\s*$/.test(l));
  const x: number[] = [];
  const y: number[] = [];
  for (const line of lines.slice(start + 1)) {
    const parts = line.trim().split(/\s+/);
    if (parts.length !== 2) continue;
    y.push(Number(parts[0]));
    x.push(Number(parts[1]));
  }
  return { certified, x, y };
}

const relErr = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('fitLine against NIST StRD Norris', () => {
  const { certified, x, y } = parseNorris(norrisText);

  it('when the fixture is parsed, then it has 36 observations and finite certified values', () => {
    expect(x).toHaveLength(36); // [S] NIST StRD Norris header: 36 observations
    for (const v of Object.values(certified)) expect(Number.isFinite(v)).toBe(true);
  });

  it('when fitted by OLS, then every certified statistic is reproduced to 1e-9 relative', () => {
    const fit = fitLine(x, y);
    expect(relErr(fit.slope, certified.slope)).toBeLessThan(1e-9); // [S] NIST StRD Norris certified B1
    expect(relErr(fit.intercept, certified.intercept)).toBeLessThan(1e-9); // [S] NIST StRD Norris certified B0
    expect(relErr(fit.slopeSe!, certified.slopeSd)).toBeLessThan(1e-9); // [S] NIST StRD Norris SD of B1
    expect(relErr(fit.interceptSe!, certified.interceptSd)).toBeLessThan(1e-9); // [S] NIST StRD Norris SD of B0
    expect(relErr(fit.residualSd!, certified.residualSd)).toBeLessThan(1e-9); // [S] NIST StRD Norris residual SD
    expect(relErr(fit.rSquared!, certified.rSquared)).toBeLessThan(1e-12); // [S] NIST StRD Norris R²
    expect(fit.dof).toBe(34); // [S] NIST StRD Norris ANOVA residual dof
    expect(relErr(fit.ssRes, 26.6173985294224)).toBeLessThan(1e-9); // [S] NIST StRD Norris residual sum of squares
  });
});

describe('studentTQuantile', () => {
  it('when compared with jstat.studentt.inv, then they agree to 1e-6 relative', () => {
    // [independent library] jstat 1.9.6 is slightly inexact, hence the loose tolerance
    fc.assert(
      fc.property(fc.double({ min: 0.51, max: 0.9995, noNaN: true }), fc.integer({ min: 1, max: 200 }), (p, dof) => {
        expect(relErr(studentTQuantile(p, dof), jstat.studentt.inv(p, dof))).toBeLessThan(1e-6); // [independent library] jstat
      }),
    );
  });

  it('when dof = 34 and p = 0.975, then t = 2.032245', () => {
    expect(studentTQuantile(0.975, 34)).toBeCloseTo(2.032245, 6); // [S] standard t table, ν = 34, two-sided 95 %
  });

  it('when quantiles are asked for again, also after more than the kept number of them, then each is the first answer', () => {
    const first = new Map<string, number>();
    for (let dof = 1; dof <= 300; dof++) for (const p of [0.9, 0.975, 0.995]) first.set(`${p}|${dof}`, studentTQuantile(p, dof));
    for (let dof = 300; dof >= 1; dof--) {
      for (const p of [0.995, 0.975, 0.9]) expect(studentTQuantile(p, dof)).toBe(first.get(`${p}|${dof}`)); // [C] a pure function
    }
    expect(studentTQuantile(0.975, 34)).toBeCloseTo(2.032245, 6); // [S] standard t table, ν = 34, two-sided 95 %
  });
});

describe('fitLine against independent libraries on generated data', () => {
  const point = fc.record({ x: fc.double({ min: -1e3, max: 1e3, noNaN: true }), y: fc.double({ min: -1e3, max: 1e3, noNaN: true }) });
  const data = fc.array(point, { minLength: 3, maxLength: 60 }).filter((pts) => {
    const xs = pts.map((p) => p.x);
    return Math.max(...xs) - Math.min(...xs) > 1e-3;
  });

  it('when OLS is fitted, then slope and intercept match ml-regression-simple-linear and simple-statistics', () => {
    fc.assert(
      fc.property(data, (pts) => {
        const x = pts.map((p) => p.x);
        const y = pts.map((p) => p.y);
        const fit = fitLine(x, y);
        const ml = new SimpleLinearRegression(x, y); // [independent library]
        const ss = linearRegression(pts.map((p) => [p.x, p.y])); // [independent library]
        const scale = 1 + Math.abs(ml.slope) + Math.abs(ml.intercept);
        expect(Math.abs(fit.slope - ml.slope)).toBeLessThan(1e-6 * scale); // [independent library] ml-regression-simple-linear
        expect(Math.abs(fit.intercept - ml.intercept)).toBeLessThan(1e-6 * scale);
        expect(Math.abs(fit.slope - ss.m)).toBeLessThan(1e-6 * scale); // [independent library] simple-statistics
        expect(Math.abs(fit.intercept - ss.b)).toBeLessThan(1e-6 * scale);
      }),
    );
  });

  it('when every weight is equal, then WLS (relative σ) equals OLS including its covariance', () => {
    fc.assert(
      fc.property(data, fc.double({ min: 0.01, max: 100, noNaN: true }), (pts, sigma) => {
        const x = pts.map((p) => p.x);
        const y = pts.map((p) => p.y);
        const ols = fitLine(x, y);
        const wls = fitLine(x, y, { sigma: x.map(() => sigma), sigmaMode: 'relative' });
        const tol = (v: number) => 1e-8 * (1 + Math.abs(v));
        expect(Math.abs(wls.slope - ols.slope)).toBeLessThan(tol(ols.slope));
        expect(Math.abs(wls.covariance!.slopeSlope - ols.covariance!.slopeSlope)).toBeLessThan(tol(ols.covariance!.slopeSlope));
        expect(Math.abs(wls.covariance!.interceptSlope - ols.covariance!.interceptSlope)).toBeLessThan(tol(ols.covariance!.interceptSlope));
      }),
    );
  });
});

describe('fitLine behaviour', () => {
  it('when σ is absolute, then the covariance is (XᵀWX)⁻¹ without χ² scaling', () => {
    // [C] y = 1 + 2x with residuals ±0.1; σ = 0.5 everywhere: Var(b) = σ²/Sxx = 0.25/10 for x = 0..4
    const x = [0, 1, 2, 3, 4];
    const y = [1.1, 2.9, 5.1, 6.9, 9.0];
    const fit = fitLine(x, y, { sigma: [0.5, 0.5, 0.5, 0.5, 0.5], sigmaMode: 'absolute' });
    expect(fit.covariance!.slopeSlope).toBeCloseTo(0.025, 12); // [C] 0.25/10
    expect(fit.covariance!.interceptIntercept).toBeCloseTo(0.25 * (1 / 5 + 4 / 10), 12); // [C] σ²(1/n + x̄²/Sxx)
    expect(fit.covariance!.interceptSlope).toBeCloseTo((-0.25 * 2) / 10, 12); // [C] −σ² x̄/Sxx
  });

  it('when a point is far off the line, then its externally studentized residual is large and Cook D is reported', () => {
    const x = [1, 2, 3, 4, 5, 6, 7, 8];
    const y = x.map((v, i) => 2 * v + 1 + [0.05, -0.04, 0.03, -0.02, 0.04, -0.05, 0.02, -0.03][i]!);
    y[3] = y[3]! + 3;
    const fit = fitLine(x, y);
    expect(Math.abs(fit.studentizedExternal[3]!)).toBeGreaterThan(10);
    for (let i = 0; i < 8; i++) if (i !== 3) expect(Math.abs(fit.studentizedExternal[i]!)).toBeLessThan(3);
    // [C] leverages sum to the number of parameters
    expect(fit.leverages.reduce((a, b) => a + b, 0)).toBeCloseTo(2, 12); // [C] trace of the hat matrix = p = 2
    expect(fit.cooksDistance[3]!).toBeGreaterThan(0.3);
  });

  it('when the diagnostics are read one point at a time, then they equal the arrays, nulls included', () => {
    const x = [1, 2, 3, 4, 5, 6, 7, 8];
    const y = [3.05, 4.96, 10.03, 8.98, 11.04, 12.95, 15.02, 16.97];
    for (const fit of [fitLine(x, y), fitLine(x, y, { sigma: [1, 2, 1, 2, 1, 2, 1, 2] }), fitLine([1, 2], [1, 3])]) {
      for (let i = 0; i < fit.n; i++) {
        expect(fit.studentizedInternalAt(i)).toBe(fit.studentizedInternal[i]); // [C] one formula, two ways to read it
        expect(fit.studentizedExternalAt(i)).toBe(fit.studentizedExternal[i]);
        expect(fit.cooksDistanceAt(i)).toBe(fit.cooksDistance[i]);
      }
    }
    expect(fitLine([1, 2], [1, 3]).studentizedExternal).toEqual([null, null]); // [C] n = 2: no scatter, nothing to studentize
  });

  it('when predicting at x₀, then SEs follow s²[1/n + (x₀ − x̄)²/Sxx] and s² + that (api/science/README.md §3)', () => {
    const x = [1, 2, 3, 4, 5];
    const y = [2.1, 3.9, 6.2, 7.8, 10.1];
    const fit = fitLine(x, y);
    const s2 = fit.residualSd! ** 2;
    const p = predictLine(fit, 7, 0.95);
    const varMean = s2 * (1 / 5 + (7 - 3) ** 2 / 10); // [C] api/science/README.md §3
    expect(p.seMean!).toBeCloseTo(Math.sqrt(varMean), 12); // [C] api/science/README.md §3
    expect(p.seNew!).toBeCloseTo(Math.sqrt(s2 + varMean), 12); // [C] api/science/README.md §3
    // the same variance from the full covariance matrix, Var(a) + 2x₀Cov(a,b) + x₀²Var(b) [C]
    const c = fit.covariance!;
    expect(p.seMean!).toBeCloseTo(Math.sqrt(c.interceptIntercept + 2 * 7 * c.interceptSlope + 49 * c.slopeSlope), 10);
    const t = jstat.studentt.inv(0.975, 3); // [independent library]
    expect(p.meanInterval![1] - p.yHat).toBeCloseTo(t * p.seMean!, 5);
  });

  it('when there are only two points, then the line is exact and undefined statistics are null, never NaN', () => {
    const fit = fitLine([1, 2], [3, 5]);
    expect(fit.slope).toBe(2);
    expect(fit.residualSd).toBeNull();
    expect(fit.slopeSe).toBeNull();
    expect(fit.studentizedInternal.every((v) => v === null)).toBe(true);
    expectAllFinite(fit);
    expect(predictLine(fit, 3, 0.95).meanInterval).toBeNull();
  });

  it('when all x are equal or inputs are bad, then DomainError', () => {
    expect(() => fitLine([1, 1, 1], [1, 2, 3])).toThrow(DomainError);
    expect(() => fitLine([1, 2], [1])).toThrow(DomainError);
    expect(() => fitLine([1, 2, Number.NaN], [1, 2, 3])).toThrow(DomainError);
    expect(() => fitLine([1, 2, 3], [1, 2, 3], { sigma: [1, 0, 1] })).toThrow(DomainError);
  });

  // Speed is measured in `npm run bench engine`, never asserted here (a loaded machine would fail it).
  it('when fitting 10⁶ points with a large offset, then it recovers the line', () => {
    const n = 1_000_000;
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      x[i] = 1e6 + i * 1e-3; // large offset: tests the centring
      y[i] = 3 - 0.5 * (x[i]! - 1e6) + (i % 2 === 0 ? 1e-3 : -1e-3);
    }
    const fit = fitLine(x, y);
    expect(fit.slope).toBeCloseTo(-0.5, 8);
  });
});
