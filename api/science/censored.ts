/**
 * Censored-normal maximum likelihood for a straight line (the Tobit model: Tobin, Econometrica
 * 1958, 26, 24). Runs reported only as bounds ("≥ 99.8 % ee", "> 200:1") carry the information
 * that ln r lies beyond a censoring point c; dropping them biases the slope towards zero because
 * the most selective (usually coldest) runs are the ones removed.
 *
 * Model: yᵢ = a + b·xᵢ + εᵢ, εᵢ ~ N(0, σᵢ²), σᵢ = s·vᵢ (vᵢ = 1 unweighted, vᵢ = the run's σ with
 * relative weights; s ≡ 1 with absolute weights). Log-likelihood contributions:
 *   exact run:        −ln σᵢ − ½ln 2π − ½zᵢ²,  zᵢ = (yᵢ − μᵢ)/σᵢ
 *   lower bound (y ≥ c):  ln Φ((μᵢ − cᵢ)/σᵢ)
 *   upper bound (y ≤ c):  ln Φ((cᵢ − μᵢ)/σᵢ)
 * maximised by Newton's method with step halving on (α, β, ln s) for the centred, scaled
 * regressor u = (x − x̄)/sₓ, starting from least squares on the censoring points. Standard errors
 * come from the observed information (the negative Hessian at the maximum), mapped back to (a, b)
 * linearly; this is what R's survival::survreg reports, which the tests use as the reference.
 */
import erfc from '@stdlib/math-base-special-erfc';
import { DomainError } from './errors';
import type { LineCovariance } from './regression';

export type CensorKind = 'none' | 'lower' | 'upper';

export interface CensoredLineOptions {
  /** Per-point σ of y (the vᵢ above); omit for a common, estimated scale. */
  sigma?: ArrayLike<number>;
  /** 'absolute': s is fixed at 1; 'relative' (default with sigma): s is estimated. */
  sigmaMode?: 'absolute' | 'relative';
}

export interface CensoredLineFit {
  intercept: number;
  slope: number;
  /** Covariance of (a, b) from the inverse observed information. */
  covariance: LineCovariance;
  /** Estimated scale s (residual SD of an exact run when unweighted); 1 when absolute. */
  scale: number;
  /** SE of ln s from the observed information; null when s is fixed. */
  logScaleSe: number | null;
  logLikelihood: number;
  iterations: number;
  nExact: number;
  nLower: number;
  nUpper: number;
}

const LN_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/** ln Φ(u) without underflow (asymptotic series below −35, where erfc underflows). */
export function logNormalCdf(u: number): number {
  if (u > -35) return Math.log(0.5 * erfc(-u / Math.SQRT2));
  const u2 = u * u;
  return -0.5 * u2 - Math.log(-u) - LN_SQRT_2PI + Math.log(1 - 1 / u2 + 3 / (u2 * u2) - 15 / (u2 * u2 * u2));
}

/** Inverse Mills ratio λ(u) = φ(u)/Φ(u), stable for very negative u. */
export function inverseMills(u: number): number {
  if (u > -35) return Math.exp(-0.5 * u * u - LN_SQRT_2PI) / (0.5 * erfc(-u / Math.SQRT2));
  const u2 = u * u;
  return -u / (1 - 1 / u2 + 3 / (u2 * u2) - 15 / (u2 * u2 * u2));
}

/** Solve the symmetric positive-definite system A·d = g (3×3 or 2×2) by Cholesky; null if not PD. */
function choleskySolve(a: number[][], g: number[]): number[] | null {
  const n = g.length;
  const l = a.map((row) => row.map(() => 0));
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i]![j]!;
      for (let k = 0; k < j; k++) s -= l[i]![k]! * l[j]![k]!;
      if (i === j) {
        if (!(s > 0)) return null;
        l[i]![i] = Math.sqrt(s);
      } else l[i]![j] = s / l[j]![j]!;
    }
  }
  const z = new Array<number>(n).fill(0);
  for (let i = 0; i < n; i++) {
    let s = g[i]!;
    for (let k = 0; k < i; k++) s -= l[i]![k]! * z[k]!;
    z[i] = s / l[i]![i]!;
  }
  const d = new Array<number>(n).fill(0);
  for (let i = n - 1; i >= 0; i--) {
    let s = z[i]!;
    for (let k = i + 1; k < n; k++) s -= l[k]![i]! * d[k]!;
    d[i] = s / l[i]![i]!;
  }
  return d;
}

function invert(a: number[][]): number[][] | null {
  const n = a.length;
  const cols: number[][] = [];
  for (let j = 0; j < n; j++) {
    const e = new Array<number>(n).fill(0);
    e[j] = 1;
    const c = choleskySolve(a, e);
    if (!c) return null;
    cols.push(c);
  }
  return a.map((_, i) => cols.map((c) => c[i]!));
}

/**
 * Fit y = a + b·x by censored-normal maximum likelihood. `censor[i]` says whether y[i] is exact
 * or a lower/upper bound; `bound[i]` is the censoring point used for bounds (ignored for exact runs).
 * Throws DomainError 'censored-fit-not-identified' with fewer than two distinct exact x (three
 * exact runs when the scale is estimated), or 'censored-fit-no-convergence'.
 */
export function fitCensoredLine(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  censor: readonly CensorKind[],
  bound: ArrayLike<number>,
  options: CensoredLineOptions = {},
): CensoredLineFit {
  const n = x.length;
  const sigma = options.sigma;
  const estimateScale = !(sigma && options.sigmaMode === 'absolute');
  const v = (i: number) => (sigma ? sigma[i]! : 1);
  const exactX = new Set<number>();
  let nExact = 0;
  let nLower = 0;
  let nUpper = 0;
  for (let i = 0; i < n; i++) {
    if (censor[i] === 'none') {
      nExact++;
      exactX.add(x[i]!);
    } else if (censor[i] === 'lower') nLower++;
    else nUpper++;
  }
  if (exactX.size < 2 || (estimateScale && nExact < 3)) {
    throw new DomainError(
      'censored-fit-not-identified',
      `a censored fit needs exact runs at two or more temperatures${estimateScale ? ' and at least three exact runs to estimate the scatter' : ''}`,
      'measurements',
    );
  }
  let xMean = 0;
  for (let i = 0; i < n; i++) xMean += x[i]!;
  xMean /= n;
  let sx = 0;
  for (let i = 0; i < n; i++) sx += (x[i]! - xMean) ** 2;
  sx = Math.sqrt(sx / n);
  const u = Array.from({ length: n }, (_, i) => (x[i]! - xMean) / sx);
  const obs = Array.from({ length: n }, (_, i) => (censor[i] === 'none' ? y[i]! : bound[i]!));

  // Start: weighted least squares of the observed values (bounds at their censoring points).
  let sw = 0;
  let swu = 0;
  let swy = 0;
  for (let i = 0; i < n; i++) {
    const w = 1 / (v(i) * v(i));
    sw += w;
    swu += w * u[i]!;
    swy += w * obs[i]!;
  }
  const uBar = swu / sw;
  const yBar = swy / sw;
  let suu = 0;
  let suy = 0;
  for (let i = 0; i < n; i++) {
    const w = 1 / (v(i) * v(i));
    suu += w * (u[i]! - uBar) ** 2;
    suy += w * (u[i]! - uBar) * (obs[i]! - yBar);
  }
  let beta = suy / suu;
  let alpha = yBar - beta * uBar;
  let tau = 0;
  if (estimateScale) {
    let ss = 0;
    for (let i = 0; i < n; i++) ss += ((obs[i]! - alpha - beta * u[i]!) / v(i)) ** 2;
    tau = 0.5 * Math.log(Math.max(ss / Math.max(n - 2, 1), 1e-12));
  }

  const p = estimateScale ? 3 : 2;
  /** Log-likelihood, gradient and Hessian at (α, β, τ). */
  const evaluate = (al: number, be: number, ta: number, withDerivatives: boolean) => {
    const s = Math.exp(ta);
    let ll = 0;
    const g = new Array<number>(3).fill(0);
    const h = [0, 1, 2].map(() => new Array<number>(3).fill(0));
    for (let i = 0; i < n; i++) {
      const si = s * v(i);
      const mu = al + be * u[i]!;
      // Derivatives of the standardised quantity q with respect to (α, β, τ) and its second derivatives.
      let q: number;
      let sign: number;
      if (censor[i] === 'none') {
        q = (y[i]! - mu) / si;
        sign = -1;
        ll += -Math.log(si) - LN_SQRT_2PI - 0.5 * q * q;
      } else {
        sign = censor[i] === 'lower' ? 1 : -1;
        q = (sign * (mu - bound[i]!)) / si;
        ll += logNormalCdf(q);
      }
      if (!withDerivatives) continue;
      const dq = [sign / si, (sign * u[i]!) / si, -q];
      // d²q: (α,τ) = −dq_α, (β,τ) = −dq_β, (τ,τ) = q; others 0.
      const d2q = [
        [0, 0, -dq[0]!],
        [0, 0, -dq[1]!],
        [-dq[0]!, -dq[1]!, q],
      ];
      let l1: number;
      let l2: number;
      if (censor[i] === 'none') {
        l1 = -q;
        l2 = -1;
        g[2]! -= 1;
      } else {
        const lam = inverseMills(q);
        l1 = lam;
        l2 = -lam * (q + lam);
      }
      for (let j = 0; j < 3; j++) {
        g[j]! += l1 * dq[j]!;
        for (let k = 0; k < 3; k++) h[j]![k]! += l2 * dq[j]! * dq[k]! + l1 * d2q[j]![k]!;
      }
    }
    return { ll, g: g.slice(0, p), h: h.slice(0, p).map((r) => r.slice(0, p)) };
  };

  let current = evaluate(alpha, beta, tau, true);
  let iterations = 0;
  let converged = false;
  for (; iterations < 200; iterations++) {
    const info = current.h.map((row) => row.map((e) => -e));
    let step: number[] | null = null;
    for (let damping = 0; !step && damping < 60; damping++) {
      const lambda = damping === 0 ? 0 : 1e-8 * 10 ** damping;
      step = choleskySolve(
        info.map((row, j) => row.map((e, k) => (j === k ? e + lambda * Math.max(1, Math.abs(e)) : e))),
        current.g,
      );
    }
    if (!step) break;
    let t = 1;
    let next = current;
    let accepted = false;
    for (let half = 0; half < 60; half++, t /= 2) {
      const trial = evaluate(alpha + t * step[0]!, beta + t * step[1]!, p === 3 ? tau + t * step[2]! : 0, false);
      if (Number.isFinite(trial.ll) && trial.ll >= current.ll - 1e-12 * Math.abs(current.ll)) {
        alpha += t * step[0]!;
        beta += t * step[1]!;
        if (p === 3) tau += t * step[2]!;
        next = evaluate(alpha, beta, tau, true);
        accepted = true;
        break;
      }
    }
    if (!accepted) break;
    const size = Math.max(...step.map((d) => Math.abs(d * t)));
    const change = Math.abs(next.ll - current.ll);
    current = next;
    if (size < 1e-11 || (change < 1e-15 * Math.max(1, Math.abs(current.ll)) && size < 1e-7)) {
      converged = true;
      iterations++;
      break;
    }
  }
  const inv = converged ? invert(current.h.map((row) => row.map((e) => -e))) : null;
  if (!converged || !inv || !(Math.abs(tau) < 700)) {
    throw new DomainError(
      'censored-fit-no-convergence',
      'the censored fit did not converge: the bounds and the exact runs do not pin down a line',
      'measurements',
    );
  }
  // Back to (a, b): b = β/sₓ, a = α − b·x̄; Cov = J·Cov(α, β)·Jᵀ with J = [[1, −x̄/sₓ], [0, 1/sₓ]].
  const slope = beta / sx;
  const intercept = alpha - slope * xMean;
  const vaa = inv[0]![0]!;
  const vab = inv[0]![1]!;
  const vbb = inv[1]![1]!;
  const k = xMean / sx;
  const covariance: LineCovariance = {
    interceptIntercept: vaa - 2 * k * vab + k * k * vbb,
    interceptSlope: (vab - k * vbb) / sx,
    slopeSlope: vbb / (sx * sx),
  };
  return {
    intercept,
    slope,
    covariance,
    scale: Math.exp(tau),
    logScaleSe: p === 3 ? Math.sqrt(inv[2]![2]!) : null,
    logLikelihood: current.ll,
    iterations,
    nExact,
    nLower,
    nUpper,
  };
}
