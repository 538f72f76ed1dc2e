/**
 * Confidence set for a ratio of two correlated estimates by Fieller's theorem (Fieller, J. R.
 * Stat. Soc. B 1954, 16, 175). For θ = N/D with estimates (N, D), variances V_NN, V_DD and
 * covariance V_ND, the set {θ : (N − θD)² ≤ q²(V_NN − 2θV_ND + θ²V_DD)} is
 *   A·θ² − 2B·θ + C ≤ 0,  A = D² − q²V_DD,  B = N·D − q²V_ND,  C = N² − q²V_NN.
 * When A > 0 (D is clearly non-zero) the set is the bounded interval (B ∓ √(B² − AC))/A; when
 * A < 0 it is unbounded: the two outer pieces beyond the roots, or the whole line when B² < AC.
 * Unlike the delta method this is exact for normal estimates, and it says so when the data
 * cannot bound the ratio at all.
 */
export type FiellerSet =
  { kind: 'bounded'; low: number; high: number } | { kind: 'outside'; below: number; above: number } | { kind: 'everything' };

export function fiellerInterval(
  numerator: number,
  denominator: number,
  varNumerator: number,
  varDenominator: number,
  covariance: number,
  quantile: number,
): FiellerSet {
  const q2 = quantile * quantile;
  const a = denominator * denominator - q2 * varDenominator;
  const b = numerator * denominator - q2 * covariance;
  const c = numerator * numerator - q2 * varNumerator;
  const disc = b * b - a * c;
  if (a > 0) {
    const root = Math.sqrt(Math.max(disc, 0));
    return { kind: 'bounded', low: (b - root) / a, high: (b + root) / a };
  }
  if (a < 0 && disc > 0) {
    const root = Math.sqrt(disc);
    // a < 0: (b + root)/a is the smaller root.
    return { kind: 'outside', below: (b + root) / a, above: (b - root) / a };
  }
  return { kind: 'everything' };
}
