import { describe, expect, it } from 'vitest';
import { enantiomericRatio, fixed, percent, sig, withUncertainty } from '../../../web/lib/format';

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
