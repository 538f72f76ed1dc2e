import { describe, expect, it } from 'vitest';
import {
  ABSOLUTE_ZERO,
  DISPLAY_MEASURES,
  displayHeading,
  eeFromLnRatio,
  eeFromLnRatioAndRatio,
  formatMeasure,
  formatMeasureRange,
  formatSelectivity,
  fromKelvin,
  isStrictDecimal,
  lnRatioOf,
  parseRatioPair,
  percentAFromLnRatio,
  percentAFromLnRatioAndRatio,
  readDecimal,
  readSelectivityText,
  selectivityProblem,
  splitBound,
  toKelvin,
  toSeconds,
} from '../../../api/science/quantities';

describe('units', () => {
  it('when temperatures are converted, then the SI definitions hold and −50 °C is exactly 223.15 K', () => {
    expect(toKelvin(-50, 'C')).toBe(223.15); // [S] SI Brochure, 9th ed., 2019: T(K) = t(°C) + 273.15
    expect(toKelvin(-40, 'F')).toBe(233.15); // [C] −40 °F = −40 °C
    expect(toKelvin(300, 'K')).toBe(300);
    expect(fromKelvin(273.15, 'C')).toBe(0);
    expect(fromKelvin(233.15, 'F')).toBeCloseTo(-40, 10);
    expect(ABSOLUTE_ZERO).toEqual({ K: 0, C: -273.15, F: -459.67 }); // [S] SI definitions
  });

  it('when times are converted, then minutes, hours and days give seconds', () => {
    expect(toSeconds(2, 'min')).toBe(120);
    expect(toSeconds(1.5, 'h')).toBe(5400);
    expect(toSeconds(1, 'd')).toBe(86_400);
  });
});

describe('the grammar of typed numbers', () => {
  it('when a number is typed with a true minus sign or a decimal comma, then it is read', () => {
    expect(readDecimal(' \u221278,5 ')).toBe(-78.5);
    expect(readDecimal('1e-3')).toBe(0.001);
    expect(readDecimal('.5')).toBe(0.5);
    expect(readDecimal('5.')).toBe(5);
    expect(readDecimal('98,8', ',')).toBe(98.8);
  });

  it('when the text is not a strict decimal, then nothing is read', () => {
    for (const text of ['0x10', '0b1', '0o7', 'Infinity', 'NaN', '1_000', '1,234.5', '1,2,3', 'n.d.', '--1', '1e', '']) {
      expect(readDecimal(text), text).toBeNull();
    }
    expect(readDecimal('98.8', ',')).toBeNull();
    expect(readDecimal('98,8', '.')).toBeNull();
    expect(isStrictDecimal('0x10')).toBe(false);
    expect(isStrictDecimal('\u22120.5')).toBe(true);
  });
});

describe('the grammar of ratios and bounds', () => {
  it('when a ratio is written a:b, then leading points, spaces and decimals are all read the same', () => {
    expect(parseRatioPair('.5:1')).toEqual({ a: 0.5, b: 1 });
    expect(parseRatioPair(' 12.5 : 1 ')).toEqual({ a: 12.5, b: 1 });
    expect(parseRatioPair('95:5')).toEqual({ a: 95, b: 5 });
    expect(parseRatioPair('12,5:1', ',')).toEqual({ a: 12.5, b: 1 });
  });

  it('when a ratio has signs, exponents or other radices, then it is not a ratio', () => {
    for (const text of ['-1:2', '1e2:1', '0x10:1', '1:2:3', ':1', '1:', 'a:b']) expect(parseRatioPair(text), text).toBeNull();
  });

  it('when a value carries a bound mark, then ≥, >=, > and a trailing + are lower bounds and ≤, <=, < upper', () => {
    expect(splitBound('≥99.8')).toEqual({ text: '99.8', bound: 'lower' });
    expect(splitBound('>= 99.8')).toEqual({ text: '99.8', bound: 'lower' });
    expect(splitBound('>99.8')).toEqual({ text: '99.8', bound: 'lower' });
    expect(splitBound('99.8+')).toEqual({ text: '99.8', bound: 'lower' });
    expect(splitBound('> 200:1')).toEqual({ text: '200:1', bound: 'lower' });
    expect(splitBound('≤ 5')).toEqual({ text: '5', bound: 'upper' });
    expect(splitBound('+5')).toEqual({ text: '+5', bound: null });
    expect(splitBound('92.5')).toEqual({ text: '92.5', bound: null });
  });

  it('when a selectivity is read from text, then bounds, ratios and percent signs follow one grammar', () => {
    expect(readSelectivityText('≥99.8', 'ee')).toEqual({ ok: true, value: 99.8, atLeast: true });
    expect(readSelectivityText('99.8+', 'ee')).toEqual({ ok: true, value: 99.8, atLeast: true });
    expect(readSelectivityText('92,5 %', 'ee')).toEqual({ ok: true, value: 92.5, atLeast: false });
    expect(readSelectivityText('> 200:1', 'dr')).toEqual({ ok: true, value: '200:1', atLeast: true });
    expect(readSelectivityText('.5:1', 'ratio')).toEqual({ ok: true, value: '0.5:1', atLeast: false });
    expect(readSelectivityText('12', 'dr')).toEqual({ ok: true, value: 12, atLeast: false });
    expect(readSelectivityText('< 5', 'ee').ok).toBe(false);
    expect(readSelectivityText('0x10', 'dr').ok).toBe(false);
    expect(readSelectivityText('95:5', 'ee').ok).toBe(false);
    expect(readSelectivityText('≥ −99', 'ee').ok).toBe(false);
  });

  it('when ee is ±100 or a string is not a ratio, then the one check refuses it with the same words everywhere', () => {
    expect(selectivityProblem('ee', 100)).toMatch(/infinite energy gap/);
    expect(selectivityProblem('ee', -100)).toMatch(/infinite energy gap/);
    expect(selectivityProblem('ee', 101)).toMatch(/outside/);
    expect(selectivityProblem('ee', 99.9)).toBeNull();
    expect(selectivityProblem('dr', '0x10')).toMatch(/not a ratio/);
    expect(selectivityProblem('dr', '.5:1')).toBeNull();
    expect(selectivityProblem('ee', '95')).toMatch(/must be a number/);
    expect(selectivityProblem('er', '100:0')).toMatch(/greater than zero/);
  });
});

describe('selectivity display', () => {
  const lnR = Math.log(18.5);

  it('when a dr campaign is shown, then dr, % de and % major appear and ee does not', () => {
    expect(DISPLAY_MEASURES.dr).toEqual(['dr', 'de', 'major']);
    // [C] r = 18.5: de = (r − 1)/(r + 1) = 17.5/19.5 = 89.74 %; major = r/(1 + r) = 18.5/19.5 = 94.87 %
    expect(formatSelectivity('dr', lnR)).toBe('dr 18.5:1 · 89.7 % de · 94.9 % major diastereomer');
    expect(formatSelectivity('dr', lnR)).not.toMatch(/\bee\b/);
  });

  it('when B is the major isomer, then dr is written 1:x and % major is still the larger share', () => {
    expect(formatMeasure('dr', -lnR)).toBe('1:18.5');
    expect(formatMeasure('major', -lnR)).toBe('94.9 %');
    expect(formatMeasure('de', -lnR)).toBe('\u221289.7 %');
  });

  it('when an enantiomer campaign is shown, then ee and er appear', () => {
    // [C] ee 92 % ⇒ r = 1.92/0.08 = 24, er 96:4
    expect(formatSelectivity('ee', lnRatioOf('ee', 92))).toBe('ee 92.0 % · er 96.0:4.0');
    expect(formatSelectivity('er', lnRatioOf('er', 96, 4))).toBe('er 96.0:4.0 · ee 92.0 %');
    expect(formatSelectivity('percentA', lnRatioOf('percentA', 96))).toBe('96.0 % A · r = 24.0');
  });

  it('when stored values are turned into ln r, then every measure agrees on the same selectivity', () => {
    const r = 24;
    expect(lnRatioOf('ee', 92)).toBeCloseTo(Math.log(r), 12);
    expect(lnRatioOf('percentA', 96)).toBeCloseTo(Math.log(r), 12);
    expect(lnRatioOf('er', 96, 4)).toBeCloseTo(Math.log(r), 12);
    expect(lnRatioOf('dr', 24)).toBeCloseTo(Math.log(r), 12);
  });
});

describe('selectivity intervals in a display measure', () => {
  it('when an interval of ln r is shown as dr, % de or % major, then each end is converted and % major folds at r = 1', () => {
    const lo = Math.log(12);
    const hi = Math.log(25);
    expect(formatMeasureRange('dr', lo, hi)).toBe('12.0:1 to 25.0:1');
    // [C] de = (r − 1)/(r + 1): r = 12 → 84.6 %, r = 25 → 92.3 %
    expect(formatMeasureRange('de', lo, hi)).toBe('84.6 to 92.3 %');
    expect(formatMeasureRange('major', -Math.log(2), Math.log(3))).toBe('50.0 to 75.0 %');
    expect(displayHeading('major')).toBe('major diastereomer (%)');
    expect(displayHeading('dr')).toBe('dr');
  });
});

describe('ee and %A from ln r with the ratio at hand', () => {
  it('when ln r runs from −800 to 800, then both equal the direct formulas to 1e-15 and saturate alike', () => {
    let worst = 0;
    for (let i = 0; i <= 200_000; i++) {
      const lnR = -60 + i * 6e-4 + 1e-7 * Math.sin(i); // dense over −60…60, near 0 included
      const r = Math.exp(lnR);
      for (const [got, want] of [
        [eeFromLnRatioAndRatio(lnR, r), eeFromLnRatio(lnR)],
        [percentAFromLnRatioAndRatio(lnR, r), percentAFromLnRatio(lnR)],
      ] as const) {
        if (want !== 0) worst = Math.max(worst, Math.abs(got - want) / Math.abs(want));
      }
    }
    expect(worst).toBeLessThan(1e-15);
    for (const lnR of [800, 710, -746, -800]) {
      const r = Math.exp(lnR); // Infinity or 0 at the ends
      expect(eeFromLnRatioAndRatio(lnR, r)).toBe(eeFromLnRatio(lnR));
      expect(percentAFromLnRatioAndRatio(lnR, r)).toBe(percentAFromLnRatio(lnR));
    }
    expect(eeFromLnRatioAndRatio(1e-300, 1)).toBe(eeFromLnRatio(1e-300)); // nearly racemic: tanh itself, no cancellation
    expect(percentAFromLnRatioAndRatio(0, 1)).toBe(50);
  });
});
