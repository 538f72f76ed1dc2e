import { describe, expect, it } from 'vitest';
import { fiellerInterval } from '../../../api/science/fieller';

describe('fiellerInterval', () => {
  it('when the denominator is precise, then the set is a bounded interval whose ends solve the Fieller quadratic', () => {
    const [n, d, vn, vd, c, q] = [10, 2, 1, 0.04, 0.1, 1.96];
    const set = fiellerInterval(n, d, vn, vd, c, q);
    expect(set.kind).toBe('bounded');
    if (set.kind !== 'bounded') return;
    // [C] each end θ satisfies (N − θD)² = q²(V_NN − 2θV_ND + θ²V_DD)
    for (const t of [set.low, set.high]) expect((n - t * d) ** 2).toBeCloseTo(q * q * (vn - 2 * t * c + t * t * vd), 10);
    expect(set.low).toBeLessThan(5);
    expect(set.high).toBeGreaterThan(5);
    // [C] asymmetric about N/D = 5, wider on the side where D shrinks
    expect(set.high - 5).toBeGreaterThan(5 - set.low);
  });

  it('when the variances are tiny, then the interval tends to the delta-method one', () => {
    const [n, d, vn, vd, c, q] = [10, 2, 1e-8, 4e-10, 1e-9, 1.96];
    const set = fiellerInterval(n, d, vn, vd, c, q);
    if (set.kind !== 'bounded') throw new Error('expected bounded');
    // [C] delta method: Var(N/D) ≈ (V_NN − 2θV_ND + θ²V_DD)/D²
    const se = Math.sqrt((vn - 2 * 5 * c + 25 * vd) / 4);
    expect(set.low).toBeCloseTo(5 - q * se, 7);
    expect(set.high).toBeCloseTo(5 + q * se, 7);
  });

  it('when the denominator is not distinguishable from zero but the numerator is, then the set is the two outer pieces', () => {
    const set = fiellerInterval(10, 0.1, 1, 0.04, 0, 1.96);
    expect(set.kind).toBe('outside');
    if (set.kind !== 'outside') return;
    expect(set.below).toBeLessThan(set.above);
    expect(10 / 0.1).toBeGreaterThan(set.above); // [C] the estimate lies in the upper piece
  });

  it('when neither is distinguishable from zero, then the set is every value', () => {
    expect(fiellerInterval(0.5, 0.1, 1, 0.04, 0, 1.96)).toEqual({ kind: 'everything' });
  });
});
