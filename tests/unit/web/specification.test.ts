import { describe, expect, it } from 'vitest';
import { specificationLn, specificationOnAxis, specificationText, verdictOf } from '../../../web/lib/specification';
import { specificationLnRatio } from '../../../api/science';

describe('the stored specification on the campaign pages', () => {
  it('when it is read in any measure, then its ln r equals the engine’s', () => {
    for (const spec of [
      { measure: 'ee' as const, minimum: 98, probability: 0.95 },
      { measure: 'er' as const, minimum: 97.5, probability: 0.9 },
      { measure: 'percentA' as const, minimum: 80, probability: 0.9 },
      { measure: 'dr' as const, minimum: 20, probability: 0.95 },
    ]) {
      expect(specificationLn(spec)).toBeCloseTo(specificationLnRatio(spec), 12);
    }
  });

  it('when it is drawn on a chart axis, then an ee minimum lands on itself and a dr minimum on its share', () => {
    expect(specificationOnAxis({ measure: 'ee', minimum: 98, probability: 0.95 }, 'ee')).toBeCloseTo(98, 10);
    // ee 98 % = 99:1 → 99 % of A [C].
    expect(specificationOnAxis({ measure: 'ee', minimum: 98, probability: 0.95 }, 'percentA')).toBeCloseTo(99, 10);
    // dr 20:1 → 20/21 of the major isomer, de = 19/21 [C].
    expect(specificationOnAxis({ measure: 'dr', minimum: 20, probability: 0.95 }, 'percentA')).toBeCloseTo((100 * 20) / 21, 10);
    expect(specificationOnAxis({ measure: 'dr', minimum: 20, probability: 0.95 }, 'ee')).toBeCloseTo((100 * 19) / 21, 10);
  });

  it('when a run is judged, then the answer is a word and the minimum itself meets', () => {
    const ln = specificationLn({ measure: 'dr', minimum: 20, probability: 0.95 });
    expect(verdictOf(Math.log(20), ln)).toBe('meets');
    expect(verdictOf(Math.log(19.9), ln)).toBe('falls short');
    expect(specificationText({ measure: 'dr', minimum: 20, probability: 0.95, runs: 3 }, 'dr')).toBe(
      'dr ≥ 20:1, probability 0.95 that the mean of 3 new runs meets it',
    );
    expect(specificationText({ measure: 'ee', minimum: 98, probability: 0.95 }, 'dr')).toBe(
      'de ≥ 98 %, probability 0.95 that a new run meets it',
    );
  });
});
