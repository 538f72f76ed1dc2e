import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { GAS_CONSTANT_J_PER_MOL_K as R } from '../../../api/science/constants';
import { DomainError } from '../../../api/science/errors';
import {
  ddGFromEe,
  ddGFromRatio,
  drFromRatio,
  eeFromDdG,
  eeFromRatio,
  erFromRatio,
  parseSelectivity,
  percentAFromRatio,
  ratioFromDdG,
  ratioFromEe,
  ratioFromEr,
  ratioFromPercentA,
  sigmaLnRatio,
} from '../../../api/science/selectivity';
import { energyFromJPerMol, energyToJPerMol } from '../../../api/science/units';

const T25 = 298.15;
const kcal = (v: number) => energyToJPerMol(v, 'kcal/mol');

/** Compare to n significant figures. */
function sigFigs(value: number, expected: number, n = 4) {
  const rel = Math.abs(value - expected) / Math.abs(expected);
  expect(rel).toBeLessThan(0.5 * 10 ** (1 - n));
}

function codeOf(fn: () => unknown): { code: string; field?: string } {
  try {
    fn();
  } catch (e) {
    if (e instanceof DomainError) return { code: e.code, field: e.field };
    throw e;
  }
  throw new Error('expected a DomainError');
}

describe('selectivity conversions at 298.15 K (api/science/README.md §10)', () => {
  it('when ΔΔG‡ = 1.000 kcal/mol, then r = 5.408 and ee = 68.79 %', () => {
    sigFigs(ratioFromDdG(kcal(1), T25), 5.408); // [C] api/science/README.md §10, exp(4184/(R·298.15))
    sigFigs(eeFromDdG(kcal(1), T25), 68.79); // [C] api/science/README.md §10, tanh(ΔΔG‡/2RT)
    sigFigs(eeFromRatio(ratioFromDdG(kcal(1), T25)), 68.79); // [C] api/science/README.md §10, (r−1)/(r+1)
  });

  it('when ΔΔG‡ = 3.000 kcal/mol, then r = 158.1 and ee = 98.74 %', () => {
    sigFigs(ratioFromDdG(kcal(3), T25), 158.1); // [C] api/science/README.md §10
    sigFigs(eeFromDdG(kcal(3), T25), 98.74); // [C] api/science/README.md §10
  });

  it('when 90 % and 99 % ee are wanted, then 1.745 and 3.136 kcal/mol are needed', () => {
    sigFigs(energyFromJPerMol(ddGFromEe(90, T25), 'kcal/mol'), 1.745); // [C] api/science/README.md §10, 2RT·artanh(0.90)
    sigFigs(energyFromJPerMol(ddGFromEe(99, T25), 'kcal/mol'), 3.136); // [C] api/science/README.md §10, 2RT·artanh(0.99)
  });

  it('when the rules of thumb are applied, then 1.36 kcal/mol is one decade and 2 kcal/mol ≈ 96.7 % A', () => {
    // [CP] api/science/README.md §10: at 25 °C a factor of ten in r costs about 1.36 kcal/mol (5.71 kJ/mol)
    expect(energyFromJPerMol(ddGFromRatio(10, T25), 'kcal/mol')).toBeCloseTo(1.36, 2); // [CP] api/science/README.md §10
    expect(energyFromJPerMol(ddGFromRatio(10, T25), 'kJ/mol')).toBeCloseTo(5.71, 2); // [CP] api/science/README.md §10
    // [CP] api/science/README.md §10: a 2 kcal/mol gap gives about 96.7 % of A
    expect(percentAFromRatio(ratioFromDdG(kcal(2), T25))).toBeCloseTo(96.7, 1); // [CP] api/science/README.md §10
  });

  it('when ΔΔG‡ is negative, then B is favoured and ee is negative (sign convention api/science/README.md §1)', () => {
    expect(ratioFromDdG(-kcal(1), T25)).toBeCloseTo(1 / ratioFromDdG(kcal(1), T25), 12); // [C] r(−x) = 1/r(x)
    expect(eeFromDdG(-kcal(1), T25)).toBeCloseTo(-eeFromDdG(kcal(1), T25), 12); // [C] ee odd in ΔΔG‡
    expect(ddGFromEe(-50, 250)).toBeLessThan(0); // [C] artanh(−0.5) < 0
  });

  it('when er and dr are formed, then they follow A:B normalised to 100 and r:1', () => {
    const er = erFromRatio(3);
    expect(er.a).toBeCloseTo(75, 12); // [C] 100·3/4
    expect(er.b).toBeCloseTo(25, 12); // [C] 100·1/4
    expect(drFromRatio(7.5)).toEqual({ a: 7.5, b: 1 }); // [C] dr = r:1
    expect(ratioFromEr(95, 5)).toBeCloseTo(19, 12); // [C] 95/5
  });

  it('when ee → ΔΔG‡ → ee round-trips over the whole open range, then ee is recovered', () => {
    fc.assert(
      fc.property(fc.double({ min: -99.9999, max: 99.9999, noNaN: true }), fc.double({ min: 50, max: 500, noNaN: true }), (ee, t) => {
        const back = eeFromDdG(ddGFromEe(ee, t), t);
        expect(Math.abs(back - ee)).toBeLessThan(1e-9);
      }),
    );
  });

  it('when r → er → r and r → %A → r round-trip, then r is recovered', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 1e6, noNaN: true }), (r) => {
        const er = erFromRatio(r);
        expect(er.a + er.b).toBeCloseTo(100, 10);
        expect(Math.abs(ratioFromEr(er.a, er.b) / r - 1)).toBeLessThan(1e-9);
        expect(Math.abs(ratioFromPercentA(percentAFromRatio(r)) / r - 1)).toBeLessThan(1e-8);
        expect(Math.abs(ratioFromEe(eeFromRatio(r)) / r - 1)).toBeLessThan(1e-8);
        expect(Math.abs(Math.exp(ddGFromRatio(r, 300) / (R * 300)) / r - 1)).toBeLessThan(1e-12);
      }),
    );
  });
});

describe('parseSelectivity', () => {
  it('when each measure is given, then the same r = 9 is obtained', () => {
    expect(parseSelectivity({ measure: 'ee', value: 80 })).toBeCloseTo(9, 12); // [C] (1+0.8)/(1−0.8)
    expect(parseSelectivity({ measure: 'percentA', value: 90 })).toBeCloseTo(9, 12); // [C] 90/10
    expect(parseSelectivity({ measure: 'er', value: '90:10' })).toBeCloseTo(9, 12); // [C] 90/10
    expect(parseSelectivity({ measure: 'er', value: 9 })).toBeCloseTo(9, 12); // [C] a numeric er is r itself (9 ≡ 90:10)
    expect(parseSelectivity({ measure: 'dr', value: '9:1' })).toBeCloseTo(9, 12); // [C]
    expect(parseSelectivity({ measure: 'dr', value: 9 })).toBeCloseTo(9, 12); // [C]
    expect(parseSelectivity({ measure: 'ratio', value: ' 18 : 2 ' })).toBeCloseTo(9, 12); // [C]
    expect(parseSelectivity({ measure: 'ee', value: -80 })).toBeCloseTo(1 / 9, 12); // [C] signed ee
  });

  it('when the input is physically invalid, then a DomainError with a specific code and field is thrown', () => {
    expect(codeOf(() => parseSelectivity({ measure: 'ee', value: 100 }))).toEqual({ code: 'ee-at-limit', field: 'selectivity.value' });
    expect(codeOf(() => parseSelectivity({ measure: 'ee', value: -101 })).code).toBe('ee-out-of-range');
    expect(codeOf(() => parseSelectivity({ measure: 'er', value: '100:0' })).code).toBe('zero-minor-component');
    expect(codeOf(() => parseSelectivity({ measure: 'dr', value: '0:5' })).code).toBe('zero-minor-component');
    expect(codeOf(() => parseSelectivity({ measure: 'er', value: '95-5' })).code).toBe('bad-ratio-string');
    expect(codeOf(() => parseSelectivity({ measure: 'ratio', value: 0 })).code).toBe('ratio-not-positive');
    expect(codeOf(() => parseSelectivity({ measure: 'ratio', value: -2 })).code).toBe('ratio-not-positive');
    expect(codeOf(() => parseSelectivity({ measure: 'percentA', value: 100 })).code).toBe('percent-a-at-limit');
    expect(codeOf(() => parseSelectivity({ measure: 'ee', value: Number.NaN })).code).toBe('not-finite');
    expect(parseSelectivity({ measure: 'ee', value: 50 }, 'runs[2].selectivity')).toBeCloseTo(3, 12); // [C] 1.5/0.5
  });

  it('when a field path is given, then errors carry it', () => {
    expect(codeOf(() => parseSelectivity({ measure: 'ee', value: 100 }, 'runs[2].selectivity')).field).toBe('runs[2].selectivity.value');
  });
});

describe('sigmaLnRatio (api/science/README.md §3 propagation)', () => {
  it('when σ is on ee or %A, then σ(ln r) = 2σ_ee/(1−ee²) = σ_p/[p(1−p)]', () => {
    // ee 90 % ± 0.5 %: 2·0.005/(1−0.81) [C]
    expect(sigmaLnRatio({ measure: 'ee', value: 90 }, 0.5)).toBeCloseTo((2 * 0.005) / (1 - 0.81), 12); // [C] api/science/README.md §3
    // the same run as %A: 95 % ± 0.25 %: 0.0025/(0.95·0.05) [C], identical by construction
    expect(sigmaLnRatio({ measure: 'percentA', value: 95 }, 0.25)).toBeCloseTo(0.0025 / (0.95 * 0.05), 12); // [C] api/science/README.md §3
    expect(sigmaLnRatio({ measure: 'percentA', value: 95 }, 0.25)).toBeCloseTo(sigmaLnRatio({ measure: 'ee', value: 90 }, 0.5), 12);
    expect(sigmaLnRatio({ measure: 'er', value: '95:5' }, 0.25)).toBeCloseTo(0.0025 / (0.95 * 0.05), 12); // [C] api/science/README.md §3, er read as the A share
  });

  it('when σ is on a ratio-type measure, then it is read as a relative SD of r', () => {
    expect(sigmaLnRatio({ measure: 'dr', value: '10:1' }, 0.05)).toBe(0.05); // [C] σ(ln r) ≈ σ_r/r
    expect(sigmaLnRatio({ measure: 'ratio', value: 3 }, 0.1)).toBe(0.1); // [C]
  });

  it('when σ is negative or non-finite, then DomainError', () => {
    expect(() => sigmaLnRatio({ measure: 'ee', value: 90 }, -1)).toThrow(DomainError);
    expect(() => sigmaLnRatio({ measure: 'ee', value: 90 }, Number.POSITIVE_INFINITY)).toThrow(DomainError);
  });
});
