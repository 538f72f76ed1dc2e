import { describe, expect, it } from 'vitest';
import { chiSquareLowerTail, chiSquareUpperTail, fUpperTail, normalUpperTail, studentTUpperTail } from '../../../api/science/tails';

// Reference values from R 4.2.2 (pchisq, pf, pt, pnorm with lower.tail = FALSE), printed by
// tests/fixtures/r/censored-eyring.R.
describe('upper-tail probabilities', () => {
  it('when χ² is far in the tail, then its p-value keeps its digits instead of printing as 0', () => {
    expect(chiSquareUpperTail(200, 5)).toBeGreaterThan(0);
    expect(chiSquareUpperTail(200, 5)).toBeCloseTo(2.84062289864153e-41, 52); // R 4.2.2 pchisq(200, 5, lower.tail = FALSE)
    expect(chiSquareUpperTail(200, 5) / 2.84062289864153e-41).toBeCloseTo(1, 10);
  });

  it('when χ² is ordinary, then the two tails match R and add up to one', () => {
    expect(chiSquareUpperTail(3.2, 6)).toBeCloseTo(0.783358489819263, 12); // R 4.2.2 pchisq(3.2, 6, lower.tail = FALSE)
    expect(chiSquareLowerTail(3.2, 6)).toBeCloseTo(0.216641510180737, 12); // R 4.2.2 pchisq(3.2, 6)
  });

  it('when F is large, then the upper tail is computed directly from the incomplete beta', () => {
    expect(fUpperTail(400, 2, 12) / 1.04172071616489e-11).toBeCloseTo(1, 10); // R 4.2.2 pf(400, 2, 12, lower.tail = FALSE)
    expect(fUpperTail(2.5, 3, 10)).toBeCloseTo(0.119039562658278, 12); // R 4.2.2 pf(2.5, 3, 10, lower.tail = FALSE)
    expect(fUpperTail(0, 3, 10)).toBe(1);
  });

  it('when t or z are large, then their upper tails match R', () => {
    expect(studentTUpperTail(25, 4) / 7.59876288165787e-6).toBeCloseTo(1, 10); // R 4.2.2 pt(25, 4, lower.tail = FALSE)
    expect(studentTUpperTail(-25, 4)).toBeCloseTo(1 - 7.59876288165787e-6, 14); // [C] symmetry
    expect(normalUpperTail(12) / 1.77648211207768e-33).toBeCloseTo(1, 10); // R 4.2.2 pnorm(12, lower.tail = FALSE)
  });

  it('when the degrees of freedom are not positive, then it refuses', () => {
    expect(() => chiSquareUpperTail(1, 0)).toThrow(/dof/);
    expect(() => fUpperTail(1, 1, -1)).toThrow(/dof2/);
  });
});
