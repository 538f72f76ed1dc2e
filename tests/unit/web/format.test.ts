import { describe, expect, it } from 'vitest';
import {
  decimalsBeside,
  leverageDecimals,
  decimalsFromPrecision,
  enantiomericRatio,
  fixed,
  measureColumn,
  percent,
  percentColumn,
  percentColumnDecimals,
  probabilityPercent,
  sig,
  withUncertainty,
} from '../../../web/lib/format';
import { formatMeasure } from '../../../api/science/quantities';

describe('number formatting for the calculators', () => {
  it('when an ee is just short of 99 %, then it is not rounded onto the specification', () => {
    expect(percent(98.98)).toBe('98.98');
    expect(percent(92.5)).toBe('92.5');
    expect(percent(99.874)).toBe('99.874');
    expect(percent(-97.31)).toBe('−97.3');
  });

  it('when a value carries a standard error, then the SE has two significant figures and the value the same decimals', () => {
    expect(withUncertainty(9.9812, 0.1634)).toBe('9.98 ± 0.16');
    expect(withUncertainty(-12.3456, 1.234)).toBe('−12.3 ± 1.2');
    expect(withUncertainty(7.5, null)).toBe('7.50');
  });

  it('when numbers span many magnitudes, then large ratios use powers of ten and minus signs are typographic', () => {
    expect(sig(158.12, 3)).toBe('158');
    expect(sig(5.4081, 3)).toBe('5.41');
    expect(sig(123456, 3)).toBe('1.23 × 10⁵');
    expect(fixed(-0.0001, 2)).toBe('0.00');
    expect(enantiomericRatio(98.74)).toBe('98.74:1.26');
  });
});

describe('probabilities', () => {
  it('when a model probability rounds to 100 % or 0 %, then it reads as beyond 99.9 % or under 0.1 %, never as certainty', () => {
    expect(probabilityPercent(1 - 1e-12)).toBe('> 99.9');
    expect(probabilityPercent(0.99951)).toBe('> 99.9');
    expect(probabilityPercent(0.9994)).toBe('99.9');
    expect(probabilityPercent(0.953)).toBe('95.3');
    expect(probabilityPercent(0.0004)).toBe('< 0.1');
    expect(probabilityPercent(0)).toBe('< 0.1');
    expect(probabilityPercent(0.0006)).toBe('0.1');
  });
});

describe('decimals beside a limit', () => {
  it('when the high-leverage limit 4/n is 0.33, 0.1, 0.01 or 0.004, then leverages show 2, 2, 3 or 4 decimals', () => {
    expect(decimalsBeside(4 / 12)).toBe(2);
    expect(decimalsBeside(4 / 40)).toBe(2);
    expect(decimalsBeside(4 / 400)).toBe(3);
    expect(decimalsBeside(4 / 1000)).toBe(4);
    // The limit itself then reads with two significant digits.
    expect(fixed(4 / 1000, decimalsBeside(4 / 1000))).toBe('0.0040');
    expect(decimalsBeside(0)).toBe(2);
  });

  it("when a fit has 12, 150 or 1 000 runs, then its leverage column reads against the fit's own limit 4/n", () => {
    expect(leverageDecimals(12)).toBe(2);
    expect(leverageDecimals(150)).toBe(3);
    expect(leverageDecimals(1000)).toBe(4);
  });
});

describe('column decimals from the assay precision', () => {
  it('when the assay SD is 2, 0.3, 0.05 or 0.004 (in the unit shown), then the column shows 0, 1, 2 or 3 decimals', () => {
    expect(decimalsFromPrecision(2)).toBe(0);
    expect(decimalsFromPrecision(1)).toBe(0);
    expect(decimalsFromPrecision(0.3)).toBe(1);
    expect(decimalsFromPrecision(0.05)).toBe(2);
    expect(decimalsFromPrecision(0.004)).toBe(3);
    expect(decimalsFromPrecision(0.00001)).toBe(3); // capped
  });

  it('when no precision is known, then the fallback is used', () => {
    expect(decimalsFromPrecision(null)).toBe(1);
    expect(decimalsFromPrecision(undefined, 2)).toBe(2);
    expect(decimalsFromPrecision(0)).toBe(1);
    expect(decimalsFromPrecision(Number.NaN)).toBe(1);
  });

  it('when a column holds 88.2, 94 and 98.53 % ee at an SD of 0.3, then every cell has two decimals (98.53 needs them)', () => {
    const values = [88.2, 94, 98.53];
    expect(percentColumnDecimals(values, 0.3)).toBe(2);
    const cell = percentColumn(values, 0.3);
    expect(values.map(cell)).toEqual(['88.20', '94.00', '98.53']);
  });

  it('when no value approaches 100, then the assay precision alone sets the decimals, the same in every cell', () => {
    const values = [12.25, 50, 91.5];
    expect(values.map(percentColumn(values, 2))).toEqual(['12', '50', '92']);
    expect(values.map(percentColumn(values, 0.05))).toEqual(['12.25', '50.00', '91.50']);
    expect(values.map(percentColumn(values))).toEqual(['12.3', '50.0', '91.5']);
  });

  it('when a value is just short of 99, then the column never rounds it onto 99 (percentDecimals wins over a coarse SD)', () => {
    const values = [90, 98.96];
    expect(values.map(percentColumn(values, 2))).toEqual(['90.00', '98.96']);
  });

  it('when blanks or non-numbers are in the column, then they do not change its decimals', () => {
    expect(percentColumnDecimals([null, undefined, Number.NaN, 50], 0.3)).toBe(1);
  });

  it('when a column of ee is given as ln r, then it is converted and shares one set of decimals; negative values take a true minus', () => {
    // ee = 100·tanh(ln r / 2) [C]: ln r = 2 atanh(0.9) = 2.944 → 90 % ee; ln r = 0 → 0 %; ln r = −1 → −46.21 % ee.
    const lnRs = [2 * Math.atanh(0.9), 0, -1];
    const cell = measureColumn('ee', lnRs, 0.3);
    expect(lnRs.map(cell)).toEqual(['90.0', '0.0', '\u221246.2']);
  });

  it('when the display is a ratio (dr), then cells keep the ratio formatting', () => {
    const cell = measureColumn('dr', [Math.log(20)], 0.3);
    expect(cell(Math.log(20))).toBe(formatMeasure('dr', Math.log(20)));
  });
});
