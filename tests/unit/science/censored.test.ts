import { describe, expect, it } from 'vitest';
import { fitCensoredLine, inverseMills, logNormalCdf, type CensorKind } from '../../../api/science/censored';
import { normalUpperTail } from '../../../api/science/tails';

// Invented screen, the same as tests/fixtures/r/censored-eyring.R: ln r = −0.9 + 1684/T + noise,
// runs at or above ln 999 (99.8 % ee) reported only as "at least" and censored there.
const CELSIUS = [-70, -60, -50, -40, -30, -20, -10, 0, 10, 20];
const NOISE = [0.05, -0.04, 0.03, -0.06, 0.02, 0.04, -0.03, 0.01, -0.05, 0.02];
const SIGMA = [0.06, 0.05, 0.05, 0.04, 0.04, 0.03, 0.03, 0.03, 0.02, 0.02];
const LIMIT = Math.log(999);
const x = CELSIUS.map((c) => 1 / (c + 273.15));
const yTrue = CELSIUS.map((c, i) => -0.9 + 1684 / (c + 273.15) + NOISE[i]!);
const censor: CensorKind[] = yTrue.map((y) => (y >= LIMIT ? 'lower' : 'none'));
const y = yTrue.map((v) => Math.min(v, LIMIT));
const bound = y.map(() => LIMIT);

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('fitCensoredLine (Tobit) against R survival::survreg', () => {
  it('when the two coldest runs are lower bounds, then they are the censored ones', () => {
    expect(censor.slice(0, 3)).toEqual(['lower', 'lower', 'none']);
  });

  it('when one common scale is estimated, then estimates, covariance and log-likelihood match survreg', () => {
    const fit = fitCensoredLine(x, y, censor, bound);
    // R 4.2.2, survival 3.5-3: survreg(Surv(y, exact) ~ u, dist = "gaussian"), tests/fixtures/r/censored-eyring.R
    expect(rel(fit.intercept, -0.94209988529203)).toBeLessThan(1e-7);
    expect(rel(fit.slope, 1694.15134625908445)).toBeLessThan(1e-8);
    expect(rel(fit.scale, 0.0357491793914563)).toBeLessThan(1e-6);
    expect(fit.logLikelihood).toBeCloseTo(15.2838535945636, 7);
    expect(rel(fit.covariance.interceptIntercept, 0.0198077520139686)).toBeLessThan(1e-5);
    expect(rel(fit.covariance.interceptSlope, -5.0291208008884967)).toBeLessThan(1e-5);
    expect(rel(fit.covariance.slopeSlope, 1287.2282116934788974)).toBeLessThan(1e-5);
    expect(rel(fit.logScaleSe!, 0.248445231260285)).toBeLessThan(1e-5);
    expect(fit).toMatchObject({ nExact: 8, nLower: 2, nUpper: 0 });
  });

  it('when the screen favours B, then upper bounds give the mirrored estimates', () => {
    const fit = fitCensoredLine(
      x,
      y.map((v) => -v),
      censor.map((c) => (c === 'lower' ? 'upper' : c)),
      bound.map((b) => -b),
    );
    // R 4.2.2, survival 3.5-3: survreg(Surv(y, exact, type = "left") ~ u, dist = "gaussian")
    expect(rel(fit.intercept, 0.94209988529203)).toBeLessThan(1e-7);
    expect(rel(fit.slope, -1694.15134625908445)).toBeLessThan(1e-8);
    expect(rel(fit.covariance.slopeSlope, 1287.2282116934788974)).toBeLessThan(1e-5);
  });

  it('when each run has a relative σ, then the estimates and the scale match survreg on the scaled model', () => {
    const fit = fitCensoredLine(x, y, censor, bound, { sigma: SIGMA, sigmaMode: 'relative' });
    // R 4.2.2, survival 3.5-3: survreg(Surv(y/σ, exact) ~ 0 + I(1/σ) + I(u/σ), dist = "gaussian")
    expect(rel(fit.intercept, -0.947211820725809)).toBeLessThan(1e-7);
    expect(rel(fit.slope, 1695.016866228194203)).toBeLessThan(1e-8);
    expect(rel(fit.scale, 1.23628491056092)).toBeLessThan(1e-6);
    expect(rel(fit.covariance.slopeSlope, 1528.230486007018726)).toBeLessThan(1e-5);
    expect(rel(fit.covariance.interceptSlope, -5.6875907134380377)).toBeLessThan(1e-5);
    expect(rel(fit.logScaleSe!, 0.245261721917002)).toBeLessThan(1e-5);
  });

  it('when each run has an absolute σ, then the scale stays 1 and the estimates match survreg', () => {
    const fit = fitCensoredLine(x, y, censor, bound, { sigma: SIGMA, sigmaMode: 'absolute' });
    // R 4.2.2, survival 3.5-3: the same with scale = 1
    expect(fit.scale).toBe(1);
    expect(fit.logScaleSe).toBeNull();
    expect(rel(fit.intercept, -0.940826022119853)).toBeLessThan(1e-8);
    expect(rel(fit.slope, 1693.252434436527665)).toBeLessThan(1e-9);
    expect(rel(fit.covariance.interceptIntercept, 0.0142775857822651)).toBeLessThan(1e-6);
    expect(rel(fit.covariance.slopeSlope, 1024.9905433940598414)).toBeLessThan(1e-6);
  });

  it('when too few runs are exact, then it says the fit is not identified', () => {
    const all: CensorKind[] = censor.map((c, i) => (i < 8 ? 'lower' : c));
    expect(() => fitCensoredLine(x, y, all, bound)).toThrow(/exact runs/);
  });
});

describe('normal tail helpers used by the censored fit', () => {
  it('when u is very negative, then ln Φ(u) and the inverse Mills ratio stay finite and continuous', () => {
    expect(logNormalCdf(-2)).toBeCloseTo(Math.log(normalUpperTail(2)), 13); // [C] Φ(−u) = Q(u)
    expect(Math.abs(logNormalCdf(-35.0000001) - logNormalCdf(-34.9999999))).toBeLessThan(1e-5);
    expect(Math.abs(inverseMills(-35.0000001) - inverseMills(-34.9999999))).toBeLessThan(1e-5);
    expect(inverseMills(-100)).toBeCloseTo(100.01, 2); // [C] λ(u) ≈ −u + 1/(−u) for large −u
  });
});
