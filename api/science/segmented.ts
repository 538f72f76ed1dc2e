/**
 * Curvature of a selectivity Eyring plot: a continuous segmented ("join-point") model of ln r on
 * x = 1/T, two straight lines that meet at a break x_b = 1/T_b,
 *   ln r = a + b·x + δ·(x − x_b)₊,
 * with the break estimated as a parameter (Muggeo, Stat. Med. 2003, 22, 3055). The high-temperature
 * branch (x < x_b) has slope b, the low-temperature branch (x > x_b) slope b + δ.
 *
 * Fitting: exact least squares by profiling over the break. For a fixed split of the runs into two
 * sides, the residual sum of squares as a function of x_b is smallest where the two separate side
 * lines cross (if that point lies in the gap of the split) and otherwise at an end of the gap, i.e.
 * at a run's temperature; so the global optimum is among these finitely many candidates. Only
 * splits with ≥ 3 runs at ≥ 2 distinct temperatures on each side are tried.
 *
 * Standard errors: the Gauss–Newton covariance at the optimum, s²(JᵀWJ)⁻¹ with s² = SS/(n − 4),
 * as Muggeo's method reports it; the break's interval is x̂_b ± t(n − 4)·SE, mapped to kelvin.
 *
 * Decision: the statistic F = [(SS_line − SS_seg)/2] / [SS_seg/(n − 4)] maximised over the break
 * (sup-F) has no F distribution, because the break exists only under the alternative (Davies,
 * Biometrika 1987, 74, 33). Its null distribution is simulated: both fits are invariant to the
 * straight line and to the error scale, so under Gaussian errors the statistic depends only on
 * the design (temperatures, replicates, weights), and a fixed-seed parametric bootstrap of the
 * residuals gives a Monte Carlo p = (1 + #{F* ≥ F})/(B + 1). With replicates the classical
 * lack-of-fit F test of the straight line (pure error against lack of fit; Draper & Smith,
 * Applied Regression Analysis) is reported alongside; it does not decide.
 *
 * Wording: an "isoinversion temperature, where r passes through an extremum" only when the
 * branch slopes have opposite signs (Buschmann, Scharf, Hoffmann & Esser, Angew. Chem. Int. Ed.
 * Engl. 1991, 30, 477); otherwise a "change of slope". A curved plot can also mean a change of the
 * selectivity-determining step (Gypser & Norrby, J. Chem. Soc., Perkin Trans. 2, 1997).
 */
import { float64Columns, int32Column } from './columns';
import { GAS_CONSTANT_J_PER_MOL_K as R } from './constants';
import { DEFAULT_CENSOR_EE_PERCENT, fittedRuns, resolveWeightingOf, type EyringMeasurement, type EyringWeighting } from './eyring-fit';
import type { Warning } from './errors';
import { studentTQuantile } from './regression';
import { fUpperTail } from './tails';
import { describeTemperatureK } from './units';

/** Resamples of the null distribution: Monte Carlo SE of p near 0.05 is about 0.005. */
export const BREAK_TEST_RESAMPLES = 1999;
/**
 * Work budget of one null simulation (resamples × distinct temperatures): screens with more than
 * ~100 distinct temperatures get fewer resamples (never below BREAK_TEST_MIN_RESAMPLES), so a
 * 5,000-run request stays interactive. The number used is reported with the p-value.
 */
export const BREAK_TEST_BUDGET = 200_000;
export const BREAK_TEST_MIN_RESAMPLES = 199;
/** Fixed seed, so the same data always get the same verdict. */
export const BREAK_TEST_SEED = 20_261_202;
export const BREAK_TEST_ALPHA = 0.05;
/** Runs and distinct temperatures each side of a break needs. */
export const MIN_RUNS_PER_BRANCH = 3;
export const MIN_TEMPERATURES_PER_BRANCH = 2;

export interface SegmentedOptions {
  weighting?: EyringWeighting;
  censorEePercent?: number;
  /** Significance level of the break test; default 0.05. */
  alpha?: number;
  /** Resamples of the null distribution; default BREAK_TEST_RESAMPLES. */
  resamples?: number;
  seed?: number;
  /** Confidence level of the break's interval and the branch slopes; default 0.95. */
  confidenceLevel?: number;
}

export interface LackOfFitTest {
  /** F = [(SS_line − SS_pure)/(m − 2)] / [SS_pure/(n − m)]. */
  fStatistic: number;
  dofLackOfFit: number;
  dofPureError: number;
  pValue: number;
}

export interface SegmentedBranch {
  /** Runs on this side of the break (a run exactly at the break counts on both). */
  n: number;
  temperatureRangeK: { min: number; max: number };
  slopeK: number;
  slopeSeK: number | null;
  intercept: number;
  ddHJPerMol: number;
  ddHSeJPerMol: number | null;
  ddSJPerMolK: number;
}

/** Internal coordinates u = (x − center)/scale keep the normal equations well conditioned. */
interface Coefficients {
  center: number;
  scale: number;
  /** a, b, δ, ψ in u. */
  theta: [number, number, number, number];
  /** Covariance of theta, or null when singular. */
  covariance: number[][] | null;
  /** s² = SS/(n − 4) in (weighted) ln r units. */
  residualVariance: number;
  /** n/Σw: the average σ² of a run relative to the weights (1 when unweighted). */
  meanRelativeVariance: number;
  dof: number;
  temperatureRangeK: { min: number; max: number };
}

export interface SegmentedFit {
  checked: true;
  n: number;
  distinctTemperatures: number;
  weighted: boolean;
  dof: number;
  breakTemperatureK: number;
  /** Confidence interval of the break temperature; the upper end is null when unbounded. */
  breakCiK: [number, number | null] | null;
  confidenceLevel: number;
  low: SegmentedBranch;
  high: SegmentedBranch;
  ssOneLine: number;
  ssSegmented: number;
  fStatistic: number;
  pValue: number;
  resamples: number;
  seed: number;
  alpha: number;
  preferred: 'one-line' | 'two-branch';
  /** Set only when a break is accepted. */
  claim: 'isoinversion' | 'change-of-slope' | null;
  /** Only for an isoinversion: whether r = [A]/[B] has a maximum or a minimum at the break. */
  extremum: 'maximum' | 'minimum' | null;
  lackOfFit: LackOfFitTest | null;
  reason: string;
  notes: string[];
  warnings: Warning[];
  coefficients: Coefficients;
}

export interface BreakCheckSkipped {
  checked: false;
  n: number;
  distinctTemperatures: number;
  lackOfFit: LackOfFitTest | null;
  reason: string;
  warnings: Warning[];
}

export type BreakCheck = SegmentedFit | BreakCheckSkipped;

// ── Small linear algebra ───────────────────────────────────────────────────────────────────

/** Augmented matrix of `solve`, row-major p × (p + 1), reused (p ≤ 4): the solves run per request. */
const augmented = new Float64Array(4 * 5);

/** Solve A·z = r (A symmetric positive definite, p ≤ 4) by Gauss–Jordan elimination with partial pivoting; null if singular. */
function solve(a: readonly (readonly number[])[], r: readonly number[]): number[] | null {
  const p = r.length;
  const w = p + 1;
  const m = augmented;
  for (let i = 0; i < p; i++) {
    for (let k = 0; k < p; k++) m[i * w + k] = a[i]![k]!;
    m[i * w + p] = r[i]!;
  }
  for (let c = 0; c < p; c++) {
    let piv = c;
    let scale = 1e-300;
    for (let i = 0; i < p; i++) scale = Math.max(scale, Math.abs(m[i * w + c]!));
    for (let i = c + 1; i < p; i++) if (Math.abs(m[i * w + c]!) > Math.abs(m[piv * w + c]!)) piv = i;
    if (Math.abs(m[piv * w + c]!) <= 1e-13 * scale) return null;
    if (piv !== c) {
      for (let k = 0; k <= p; k++) {
        const t = m[c * w + k]!;
        m[c * w + k] = m[piv * w + k]!;
        m[piv * w + k] = t;
      }
    }
    for (let i = 0; i < p; i++) {
      if (i === c) continue;
      const f = m[i * w + c]! / m[c * w + c]!;
      for (let k = c; k <= p; k++) m[i * w + k]! -= f * m[c * w + k]!;
    }
  }
  const z = new Array<number>(p);
  for (let i = 0; i < p; i++) z[i] = m[i * w + p]! / m[i * w + i]!;
  return z;
}

function invert(a: readonly (readonly number[])[]): number[][] | null {
  const p = a.length;
  const e = new Array<number>(p).fill(0);
  const cols: number[][] = [];
  for (let j = 0; j < p; j++) {
    e.fill(0);
    e[j] = 1;
    const z = solve(a, e);
    if (!z) return null;
    cols.push(z);
  }
  return a.map((_, i) => cols.map((col) => col[i]!));
}

// ── Seeded random numbers ──────────────────────────────────────────────────────────────────

/** mulberry32: a small 32-bit generator, uniform on (0, 1). */
function uniformSource(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (((t ^ (t >>> 14)) >>> 0) + 0.5) / 4294967296;
  };
}

function normalSource(uniform: () => number): () => number {
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const v = spare;
      spare = null;
      return v;
    }
    const r = Math.sqrt(-2 * Math.log(uniform()));
    const phi = 2 * Math.PI * uniform();
    spare = r * Math.sin(phi);
    return r * Math.cos(phi);
  };
}

/** Gamma(shape, 1) by Marsaglia & Tsang (ACM TOMS 2000, 26, 363), boosted for shape < 1. */
function gamma(shape: number, normal: () => number, uniform: () => number): number {
  if (shape < 1) return gamma(shape + 1, normal, uniform) * Math.pow(uniform(), 1 / shape);
  const d = shape - 1 / 3;
  const c = 1 / Math.sqrt(9 * d);
  for (;;) {
    const z = normal();
    const v0 = 1 + c * z;
    if (v0 <= 0) continue;
    const v = v0 * v0 * v0;
    const u = uniform();
    if (Math.log(u) < 0.5 * z * z + d - d * v + d * Math.log(v)) return d * v;
  }
}

// ── The design: runs grouped by temperature ────────────────────────────────────────────────

interface Group {
  temperatureK: number;
  /** u = (1/T − center)/scale. */
  u: number;
  runs: number;
  weight: number;
  /** Weighted mean of ln r. */
  mean: number;
  /** Σw(y − mean)². */
  pureSs: number;
}

interface Design {
  /** Sorted by u ascending (temperature descending). */
  groups: Group[];
  n: number;
  center: number;
  scale: number;
  /** Splits j (between groups j and j + 1) with enough runs and temperatures on each side. */
  validSplits: boolean[];
}

/** Weighted straight line through group means; returns its SS about the means. */
function lineSs(
  u: ArrayLike<number>,
  w: ArrayLike<number>,
  y: ArrayLike<number>,
  from: number,
  to: number,
): { a: number; b: number; ss: number } {
  let sw = 0;
  let su = 0;
  let sy = 0;
  for (let i = from; i < to; i++) {
    sw += w[i]!;
    su += w[i]! * u[i]!;
    sy += w[i]! * y[i]!;
  }
  const um = su / sw;
  const ym = sy / sw;
  let suu = 0;
  let suy = 0;
  for (let i = from; i < to; i++) {
    suu += w[i]! * (u[i]! - um) ** 2;
    suy += w[i]! * (u[i]! - um) * (y[i]! - ym);
  }
  const b = suu > 0 ? suy / suu : 0;
  const a = ym - b * um;
  let ss = 0;
  for (let i = from; i < to; i++) ss += w[i]! * (y[i]! - a - b * u[i]!) ** 2;
  return { a, b, ss };
}

/** Least squares of y on [1, u, (u − psi)₊]; null when singular. */
function kneeFit(
  u: ArrayLike<number>,
  w: ArrayLike<number>,
  y: ArrayLike<number>,
  psi: number,
): { beta: [number, number, number]; ss: number } | null {
  const m = u.length;
  const ata = [
    [0, 0, 0],
    [0, 0, 0],
    [0, 0, 0],
  ];
  const aty = [0, 0, 0];
  const row = new Float64Array(3);
  row[0] = 1;
  for (let i = 0; i < m; i++) {
    row[1] = u[i]!;
    row[2] = Math.max(0, u[i]! - psi);
    for (let r = 0; r < 3; r++) {
      aty[r]! += w[i]! * row[r]! * y[i]!;
      for (let c = 0; c < 3; c++) ata[r]![c]! += w[i]! * row[r]! * row[c]!;
    }
  }
  const beta = solve(ata, aty);
  if (!beta) return null;
  let ss = 0;
  for (let i = 0; i < m; i++) ss += w[i]! * (y[i]! - beta[0]! - beta[1]! * u[i]! - beta[2]! * Math.max(0, u[i]! - psi)) ** 2;
  return { beta: beta as [number, number, number], ss };
}

/** Scratch space for the O(m) profile: prefix sums over the groups (sorted by u). */
interface Sums {
  w: Float64Array;
  u: Float64Array;
  uu: Float64Array;
  y: Float64Array;
  uy: Float64Array;
  yy: Float64Array;
}

function newSums(m: number): Sums {
  const [w, u, uu, y, uy, yy] = float64Columns(m + 1, 6);
  return { w, u, uu, y, uy, yy };
}

/**
 * The exact least-squares break over the allowed range: its position (in u) and SS about the
 * group means. O(m) per call: straight lines on each side and the kinked fit at each knot come
 * from prefix sums of weighted moments (y centred first, so the sums keep their digits); the
 * winner is refitted directly by the caller.
 */
function profile(design: Design, y: ArrayLike<number>, sums: Sums = newSums(design.groups.length)): { psi: number; ss: number } | null {
  const { groups, validSplits } = design;
  const m = groups.length;
  let sw0 = 0;
  let swy0 = 0;
  for (let i = 0; i < m; i++) {
    sw0 += groups[i]!.weight;
    swy0 += groups[i]!.weight * y[i]!;
  }
  const ym = swy0 / sw0;
  for (let i = 0; i < m; i++) {
    const g = groups[i]!;
    const wi = g.weight;
    const ui = g.u;
    const yi = y[i]! - ym;
    sums.w[i + 1] = sums.w[i]! + wi;
    sums.u[i + 1] = sums.u[i]! + wi * ui;
    sums.uu[i + 1] = sums.uu[i]! + wi * ui * ui;
    sums.y[i + 1] = sums.y[i]! + wi * yi;
    sums.uy[i + 1] = sums.uy[i]! + wi * ui * yi;
    sums.yy[i + 1] = sums.yy[i]! + wi * yi * yi;
  }
  const seg = (from: number, to: number) => {
    const s0 = sums.w[to]! - sums.w[from]!;
    const su = sums.u[to]! - sums.u[from]!;
    const sy = sums.y[to]! - sums.y[from]!;
    const suu = sums.uu[to]! - sums.uu[from]! - (su * su) / s0;
    const suy = sums.uy[to]! - sums.uy[from]! - (su * sy) / s0;
    const syy = sums.yy[to]! - sums.yy[from]! - (sy * sy) / s0;
    const b = suu > 0 ? suy / suu : 0;
    return { a: (sy - b * su) / s0, b, ss: Math.max(0, syy - b * suy) };
  };
  let bestPsi = NaN;
  let bestSs = Infinity;
  for (let j = 0; j < m - 1; j++) {
    if (!validSplits[j]) continue;
    const left = seg(0, j + 1);
    const right = seg(j + 1, m);
    const db = left.b - right.b;
    if (db !== 0) {
      const cross = (right.a - left.a) / db;
      if (cross > groups[j]!.u && cross < groups[j + 1]!.u && left.ss + right.ss < bestSs) {
        bestSs = left.ss + right.ss;
        bestPsi = cross;
      }
    }
  }
  // Kinked fit with the knot on a group: columns [1, u, (u − ψ)₊], normal equations from the sums.
  const S0 = sums.w[m]!;
  const S1 = sums.u[m]!;
  const S2 = sums.uu[m]!;
  const Sy = sums.y[m]!;
  const Suy = sums.uy[m]!;
  const Syy = sums.yy[m]!;
  for (let k = 1; k < m - 1; k++) {
    if (!validSplits[k - 1] && !validSplits[k]) continue;
    const psi = groups[k]!.u;
    const r0 = S0 - sums.w[k + 1]!;
    const r1 = S1 - sums.u[k + 1]!;
    const r2 = S2 - sums.uu[k + 1]!;
    const ry = Sy - sums.y[k + 1]!;
    const ruy = Suy - sums.uy[k + 1]!;
    const a13 = r1 - psi * r0;
    const a23 = r2 - psi * r1;
    const a33 = r2 - 2 * psi * r1 + psi * psi * r0;
    const b3 = ruy - psi * ry;
    // Symmetric 3×3 solve by Cholesky, allocation-free.
    const l11 = Math.sqrt(S0);
    const l21 = S1 / l11;
    const l31 = a13 / l11;
    const d22 = S2 - l21 * l21;
    if (!(d22 > 1e-14 * S2)) continue;
    const l22 = Math.sqrt(d22);
    const l32 = (a23 - l31 * l21) / l22;
    const d33 = a33 - l31 * l31 - l32 * l32;
    if (!(d33 > 1e-14 * Math.max(a33, 1e-300))) continue;
    const l33 = Math.sqrt(d33);
    const z1 = Sy / l11;
    const z2 = (Suy - l21 * z1) / l22;
    const z3 = (b3 - l31 * z1 - l32 * z2) / l33;
    const ss = Math.max(0, Syy - z1 * z1 - z2 * z2 - z3 * z3);
    if (ss < bestSs) {
      bestSs = ss;
      bestPsi = psi;
    }
  }
  return Number.isFinite(bestSs) ? { psi: bestPsi, ss: bestSs } : null;
}

/**
 * Run indices ordered warmest first, equal temperatures in their given order (a stable sort). A
 * screen listed coldest or warmest first, as most are, is ordered without sorting.
 */
function warmestFirst(temperatureK: Float64Array): Int32Array {
  const n = temperatureK.length;
  const order = int32Column(n);
  let rising = true;
  let falling = true;
  for (let i = 1; i < n; i++) {
    if (temperatureK[i]! > temperatureK[i - 1]!) falling = false;
    else if (temperatureK[i]! < temperatureK[i - 1]!) rising = false;
  }
  if (falling) {
    for (let i = 0; i < n; i++) order[i] = i;
  } else if (rising) {
    // Blocks of equal temperature from the last to the first, each in its given order.
    let k = 0;
    for (let end = n; end > 0;) {
      let start = end - 1;
      while (start > 0 && temperatureK[start - 1] === temperatureK[end - 1]) start--;
      for (let i = start; i < end; i++) order[k++] = i;
      end = start;
    }
  } else {
    const sorted = Array.from({ length: n }, (_, i) => i).sort((p, q) => temperatureK[q]! - temperatureK[p]!);
    for (let i = 0; i < n; i++) order[i] = sorted[i]!;
  }
  return order;
}

function groupRuns(temperatureK: Float64Array, y: Float64Array, w: Float64Array): Design | null {
  const n = temperatureK.length;
  // Runs within 1e-6 K of a group's first run (warmest first) join it.
  const order = warmestFirst(temperatureK);
  const starts: number[] = [];
  for (let k = 0; k < n; k++) {
    if (k === 0 || !(Math.abs(temperatureK[order[starts[starts.length - 1]!]!]! - temperatureK[order[k]!]!) <= 1e-6)) starts.push(k);
  }
  const m = starts.length;
  const end = (g: number) => (g + 1 < m ? starts[g + 1]! : n);
  const xs = starts.map((k) => 1 / temperatureK[order[k]!]!);
  const scale = xs[m - 1]! - xs[0]!;
  if (!(scale > 0)) return null;
  const weights = starts.map((k, g) => {
    let wg = 0;
    for (let j = k; j < end(g); j++) wg += w[order[j]!]!;
    return wg;
  });
  let sw = 0;
  let swx = 0;
  for (let g = 0; g < m; g++) {
    sw += weights[g]!;
    swx += weights[g]! * xs[g]!;
  }
  const center = swx / sw;
  const groups: Group[] = starts.map((k, g) => {
    const weight = weights[g]!;
    let swy = 0;
    for (let j = k; j < end(g); j++) swy += w[order[j]!]! * y[order[j]!]!;
    const mean = swy / weight;
    let pureSs = 0;
    for (let j = k; j < end(g); j++) pureSs += w[order[j]!]! * (y[order[j]!]! - mean) ** 2;
    return { temperatureK: temperatureK[order[k]!]!, u: (xs[g]! - center) / scale, runs: end(g) - k, weight, mean, pureSs };
  });
  let leftRuns = 0;
  const validSplits = groups.map((g, j) => {
    leftRuns += g.runs;
    if (j >= m - 1) return false;
    return (
      j + 1 >= MIN_TEMPERATURES_PER_BRANCH &&
      m - j - 1 >= MIN_TEMPERATURES_PER_BRANCH &&
      leftRuns >= MIN_RUNS_PER_BRANCH &&
      n - leftRuns >= MIN_RUNS_PER_BRANCH
    );
  });
  return { groups, n, center, scale, validSplits };
}

function supF(ssLine: number, ssSeg: number, n: number): number {
  const drop = ssLine - ssSeg;
  if (!(drop > 1e-12 * Math.max(ssLine, 1e-300))) return 0;
  if (!(ssSeg > 0)) return Number.MAX_VALUE;
  return Math.min(drop / 2 / (ssSeg / (n - 4)), Number.MAX_VALUE);
}

// ── Null distribution of sup-F, kept per design ────────────────────────────────────────────

const NULL_CACHE_SIZE = 64;
/** Simulated null samples by design signature; FIFO, bounded. Keyed by a hash of the signature, checked in full on a hit. */
const nullCache = new Map<number, { signature: Float64Array; sample: Float64Array }[]>();
const nullCacheOrder: { hash: number; signature: Float64Array }[] = [];

/** Where the signature of the design being looked up is written; a hit then allocates nothing, a miss keeps a copy. */
let signatureScratch = new Float64Array(3 + 4 * 64);

/**
 * Everything the null distribution depends on, as numbers: n, resamples, seed, then u, weight, runs, valid split per group.
 * A view on a shared scratch buffer, valid until the next call: copy it to keep it.
 */
function designSignature(design: Design, resamples: number, seed: number): Float64Array {
  const m = design.groups.length;
  if (signatureScratch.length < 3 + 4 * m) signatureScratch = new Float64Array(2 * (3 + 4 * m));
  const sig = signatureScratch.subarray(0, 3 + 4 * m);
  sig[0] = design.n;
  sig[1] = resamples;
  sig[2] = seed;
  for (let g = 0; g < m; g++) {
    const group = design.groups[g]!;
    sig[3 + 4 * g] = group.u;
    sig[4 + 4 * g] = group.weight;
    sig[5 + 4 * g] = group.runs;
    sig[6 + 4 * g] = design.validSplits[g] ? 1 : 0;
  }
  return sig;
}

/** FNV-1a over the signature's bytes, 32 bits. */
function hashSignature(sig: Float64Array): number {
  const words = new Uint32Array(sig.buffer, sig.byteOffset, sig.length * 2);
  let h = 0x811c9dc5;
  for (let i = 0; i < words.length; i++) h = Math.imul(h ^ words[i]!, 0x01000193);
  return h >>> 0;
}

function sameSignature(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * sup-F statistics simulated under "one straight line" for this design: group means
 * ȳ*_g ~ N(0, 1/W_g) and pure-error SS* ~ χ²(n − m), independent (Gaussian errors with σ² ∝ 1/w).
 * Sorted ascending. Depends only on the design, resamples and seed, so it is kept (bounded cache).
 */
function simulateNullSupF(design: Design, resamples: number, seed: number): Float64Array {
  const looked = designSignature(design, resamples, seed);
  const hash = hashSignature(looked);
  const hit = nullCache.get(hash)?.find((e) => sameSignature(e.signature, looked));
  if (hit) return hit.sample;
  const signature = looked.slice();
  const uniform = uniformSource(seed);
  const normal = normalSource(uniform);
  const { groups, n } = design;
  const m = groups.length;
  const u = groups.map((g) => g.u);
  const w = groups.map((g) => g.weight);
  const sd = w.map((wg) => 1 / Math.sqrt(wg));
  const pureDof = n - m;
  const y = new Float64Array(m);
  const sums = newSums(m);
  const out = new Float64Array(resamples);
  for (let b = 0; b < resamples; b++) {
    for (let g = 0; g < m; g++) y[g] = normal() * sd[g]!;
    const pure = pureDof > 0 ? 2 * gamma(pureDof / 2, normal, uniform) : 0;
    const line = lineSs(u, w, y, 0, m).ss + pure;
    const seg = profile(design, y, sums);
    out[b] = seg ? supF(line, seg.ss + pure, n) : 0;
  }
  out.sort();
  if (nullCacheOrder.length >= NULL_CACHE_SIZE) {
    const oldest = nullCacheOrder.shift()!;
    const bucket = nullCache.get(oldest.hash)!.filter((e) => e.signature !== oldest.signature);
    if (bucket.length) nullCache.set(oldest.hash, bucket);
    else nullCache.delete(oldest.hash);
  }
  nullCache.set(hash, [...(nullCache.get(hash) ?? []), { signature, sample: out }]);
  nullCacheOrder.push({ hash, signature });
  return out;
}

/** Monte Carlo p: (1 + #{F* ≥ F})/(B + 1), from the sorted null sample. */
function monteCarloP(sortedNull: Float64Array, f: number): number {
  let lo = 0;
  let hi = sortedNull.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sortedNull[mid]! < f) lo = mid + 1;
    else hi = mid;
  }
  return (1 + sortedNull.length - lo) / (sortedNull.length + 1);
}

// ── Lack of fit ────────────────────────────────────────────────────────────────────────────

function lackOfFit(design: Design, ssLine: number): LackOfFitTest | null {
  const m = design.groups.length;
  const pureDof = design.n - m;
  const pure = design.groups.reduce((s, g) => s + g.pureSs, 0);
  if (m < 3 || pureDof < 1 || !(pure > 0)) return null;
  const dofLackOfFit = m - 2;
  const fStatistic = Math.max(0, (ssLine - pure) / dofLackOfFit) / (pure / pureDof);
  // Upper tail without cancellation: P(F(d₁, d₂) > f) = P(F(d₂, d₁) < 1/f).
  // Upper tail computed directly, so a p of 1e-40 is not printed as 0.
  const pValue = fStatistic > 0 ? fUpperTail(fStatistic, dofLackOfFit, pureDof) : 1;
  return { fStatistic, dofLackOfFit, dofPureError: pureDof, pValue };
}

// ── The fit ────────────────────────────────────────────────────────────────────────────────

/** Distinct temperatures, rounded to the microkelvin. */
function countDistinctMicrokelvin(temperatureK: Float64Array): number {
  const [rounded] = float64Columns(temperatureK.length, 1);
  for (let i = 0; i < temperatureK.length; i++) rounded[i] = Math.round(temperatureK[i]! * 1e6);
  rounded.sort();
  let count = 0;
  for (let i = 0; i < rounded.length; i++) if (i === 0 || rounded[i] !== rounded[i - 1]) count++;
  return count;
}

const notEnoughReason = (n: number, m: number) =>
  `Not enough data for a break check: each side of a break needs ${MIN_RUNS_PER_BRANCH} or more fitted runs at ${MIN_TEMPERATURES_PER_BRANCH} or more distinct temperatures (this screen has ${n} fitted run${n === 1 ? '' : 's'} at ${m} temperature${m === 1 ? '' : 's'}).`;

/**
 * Fit the continuous two-branch model and decide between it and one straight line. Excluded and
 * censored runs take no part. Never throws for too little data: returns `checked: false` with the reason.
 */
export function checkCurvature(measurements: readonly EyringMeasurement[], options: SegmentedOptions = {}): BreakCheck {
  const alpha = options.alpha ?? BREAK_TEST_ALPHA;
  const requestedResamples = options.resamples ?? BREAK_TEST_RESAMPLES;
  const seed = options.seed ?? BREAK_TEST_SEED;
  const level = options.confidenceLevel ?? 0.95;
  const runs = fittedRuns(measurements, options.censorEePercent ?? DEFAULT_CENSOR_EE_PERCENT);
  const n = runs.index.length;
  const warnings: Warning[] = [];
  const distinct = countDistinctMicrokelvin(runs.temperatureK);
  if (n < 2 * MIN_RUNS_PER_BRANCH || distinct < 2 * MIN_TEMPERATURES_PER_BRANCH) {
    return {
      checked: false,
      n,
      distinctTemperatures: distinct,
      lackOfFit: null,
      reason: notEnoughReason(n, distinct),
      warnings,
    };
  }
  const { mode, sigma } = resolveWeightingOf(
    n,
    (k) => measurements[runs.index[k]!]!.sigmaLnR,
    (k) => runs.index[k]!,
    options.weighting ?? 'auto',
    warnings,
  );
  if (mode === 'absolute') {
    warnings.push({
      code: 'absolute-sigma-as-relative',
      message: 'The break check treats σ as relative (scale estimated from the scatter), so the test does not depend on it.',
    });
  }
  const [runW] = float64Columns(n, 1);
  for (let i = 0; i < n; i++) runW[i] = sigma ? 1 / sigma[i]! ** 2 : 1;
  const design = groupRuns(runs.temperatureK, runs.y, runW);
  const m = design?.groups.length ?? 0;
  if (!design || !design.validSplits.some(Boolean)) {
    return { checked: false, n, distinctTemperatures: m, lackOfFit: null, reason: notEnoughReason(n, m), warnings };
  }
  const { groups } = design;
  const resamples = Math.min(requestedResamples, Math.max(BREAK_TEST_MIN_RESAMPLES, Math.floor(BREAK_TEST_BUDGET / m)));
  const u = groups.map((g) => g.u);
  const w = groups.map((g) => g.weight);
  const means = groups.map((g) => g.mean);
  const pure = groups.reduce((s, g) => s + g.pureSs, 0);
  const ssLine = lineSs(u, w, means, 0, m).ss + pure;
  const lof = lackOfFit(design, ssLine);
  const best = profile(design, means);
  if (!best) return { checked: false, n, distinctTemperatures: m, lackOfFit: lof, reason: notEnoughReason(n, m), warnings };
  const knee = kneeFit(u, w, means, best.psi)!;
  const ssSeg = knee.ss + pure;
  const fStatistic = supF(ssLine, ssSeg, n);
  const pValue = monteCarloP(simulateNullSupF(design, resamples, seed), fStatistic);
  const preferred = pValue < alpha ? 'two-branch' : 'one-line';

  // Gauss–Newton covariance of (a, b, δ, ψ) in u.
  const [a, b, delta] = knee.beta;
  const psi = best.psi;
  const dof = n - 4;
  const s2 = ssSeg / dof;
  // JᵀWJ, symmetric: its upper triangle accumulated in scalars (no array per group), then mirrored.
  let s00 = 0;
  let s01 = 0;
  let s02 = 0;
  let s03 = 0;
  let s11 = 0;
  let s12 = 0;
  let s13 = 0;
  let s22 = 0;
  let s23 = 0;
  let s33 = 0;
  for (let g = 0; g < m; g++) {
    const ug = u[g]!;
    const wg = w[g]!;
    const hinge = Math.max(0, ug - psi);
    const dPsi = ug > psi ? -delta : 0;
    s00 += wg;
    s01 += wg * ug;
    s02 += wg * hinge;
    s03 += wg * dPsi;
    s11 += wg * ug * ug;
    s12 += wg * ug * hinge;
    s13 += wg * ug * dPsi;
    s22 += wg * hinge * hinge;
    s23 += wg * hinge * dPsi;
    s33 += wg * dPsi * dPsi;
  }
  const jtj = [
    [s00, s01, s02, s03],
    [s01, s11, s12, s13],
    [s02, s12, s22, s23],
    [s03, s13, s23, s33],
  ];
  const inv = invert(jtj);
  const covariance = inv ? inv.map((row) => row.map((v) => v * s2)) : null;
  const sumW = w.reduce((s, v) => s + v, 0);
  const temps = groups.map((g) => g.temperatureK);
  const coefficients: Coefficients = {
    center: design.center,
    scale: design.scale,
    theta: [a, b, delta, psi],
    covariance,
    residualVariance: s2,
    meanRelativeVariance: n / sumW,
    dof,
    temperatureRangeK: { min: Math.min(...temps), max: Math.max(...temps) },
  };

  const { center, scale } = design;
  const xBreak = center + scale * psi;
  const breakTemperatureK = 1 / xBreak;
  const q = studentTQuantile((1 + level) / 2, dof);
  let breakCiK: SegmentedFit['breakCiK'] = null;
  if (covariance && covariance[3]![3]! >= 0) {
    const seX = scale * Math.sqrt(covariance[3]![3]!);
    const hiX = xBreak + q * seX;
    const loX = xBreak - q * seX;
    breakCiK = [1 / hiX, loX > 0 ? 1 / loX : null];
  }
  const se = (v: number | undefined) => (covariance && v !== undefined && v >= 0 ? Math.sqrt(v) : null);
  const slopeHigh = b / scale;
  const slopeLow = (b + delta) / scale;
  const slopeHighSe = covariance ? se(covariance[1]![1]!)! / scale : null;
  const slopeLowSe = covariance ? se(covariance[1]![1]! + 2 * covariance[1]![2]! + covariance[2]![2]!)! / scale : null;
  const yBreak = a + b * psi;
  const lowRuns = groups.filter((g) => g.u >= psi - 1e-12);
  const highRuns = groups.filter((g) => g.u <= psi + 1e-12);
  const branch = (runs: Group[], slopeK: number, slopeSeK: number | null): SegmentedBranch => {
    const intercept = yBreak - slopeK * xBreak;
    const ts = runs.map((g) => g.temperatureK);
    return {
      n: runs.reduce((s, g) => s + g.runs, 0),
      temperatureRangeK: { min: Math.min(...ts), max: Math.max(...ts) },
      slopeK,
      slopeSeK,
      intercept,
      ddHJPerMol: R * slopeK,
      ddHSeJPerMol: slopeSeK === null ? null : R * slopeSeK,
      ddSJPerMolK: -R * intercept,
    };
  };
  const low = branch(lowRuns, slopeLow, slopeLowSe);
  const high = branch(highRuns, slopeHigh, slopeHighSe);

  const opposite = slopeLow * slopeHigh < 0;
  const claim = preferred === 'two-branch' ? (opposite ? 'isoinversion' : 'change-of-slope') : null;
  // r peaks where ln r rises with 1/T on the warm side (positive slope) and falls on the cold side.
  const extremum = claim === 'isoinversion' ? (slopeHigh > 0 ? 'maximum' : 'minimum') : null;
  const pText = pValue < 0.001 ? 'p < 0.001' : `p = ${pValue.toFixed(3)}`;
  const ciText = breakCiK
    ? ` (${Math.round(level * 100)} % CI ${breakCiK[0].toFixed(0)}–${breakCiK[1] === null ? 'unbounded' : breakCiK[1].toFixed(0)} K)`
    : '';
  const reason =
    claim === 'isoinversion'
      ? `Two branches: the break test gives ${pText} < ${alpha}. The branch slopes have opposite signs, so ${describeTemperatureK(breakTemperatureK)}${ciText} is an isoinversion temperature, where r passes through a ${extremum}.`
      : claim === 'change-of-slope'
        ? `Two branches: the break test gives ${pText} < ${alpha}; change of slope at ${describeTemperatureK(breakTemperatureK)}${ciText}. Both branches have the same sign of slope, so r has no extremum there.`
        : `One line: the break test gives ${pText} ≥ ${alpha}; a break is not supported by the data.`;
  const notes = [
    `Break test: sup-F over the break position, calibrated by ${resamples} simulated straight-line screens of the same design (fixed seed ${seed}).`,
    'A curved Eyring plot can mean two competing pathways (isoinversion) or a change of the selectivity-determining step.',
  ];
  if (lof) {
    notes.push(
      `Lack of fit of one line against the replicates: F = ${lof.fStatistic.toPrecision(3)} on (${lof.dofLackOfFit}, ${lof.dofPureError}) dof, p = ${lof.pValue < 0.001 ? '< 0.001' : lof.pValue.toFixed(3)}.`,
    );
  }
  if (low.n < 4 || high.n < 4) notes.push('A branch rests on only 3 runs; its slope is poorly determined.');

  return {
    checked: true,
    n,
    distinctTemperatures: m,
    weighted: sigma !== undefined,
    dof,
    breakTemperatureK,
    breakCiK,
    confidenceLevel: level,
    low,
    high,
    ssOneLine: ssLine,
    ssSegmented: ssSeg,
    fStatistic,
    pValue,
    resamples,
    seed,
    alpha,
    preferred,
    claim,
    extremum,
    lackOfFit: lof,
    reason,
    notes,
    warnings,
    coefficients,
  };
}

// ── Prediction ─────────────────────────────────────────────────────────────────────────────

export interface SegmentedPrediction {
  lnRatio: number;
  /** SE of the fitted curve at T. */
  seMean: number | null;
  /** SE for one new run at T (curve + a run's own scatter). */
  seNewRun: number | null;
  dof: number;
  /** Which branch covers T: 'low' (colder than the break) or 'high'. */
  branch: 'low' | 'high';
  /** T lies outside the screened temperatures. */
  extrapolated: boolean;
}

/** ln r at T on the segmented model, with the delta-method SE from the Gauss–Newton covariance. */
export function predictSegmented(fit: Pick<SegmentedFit, 'coefficients'>, temperatureK: number, sigmaNewLnR?: number): SegmentedPrediction {
  const c = fit.coefficients;
  const [a, b, delta, psi] = c.theta;
  const u0 = (1 / temperatureK - c.center) / c.scale;
  const h = Math.max(0, u0 - psi);
  const lnRatio = a + b * u0 + delta * h;
  let seMean: number | null = null;
  let seNewRun: number | null = null;
  if (c.covariance) {
    const g = [1, u0, h, u0 > psi ? -delta : 0];
    let v = 0;
    for (let r = 0; r < 4; r++) for (let k = 0; k < 4; k++) v += g[r]! * c.covariance[r]![k]! * g[k]!;
    seMean = Math.sqrt(Math.max(0, v));
    const runVariance = sigmaNewLnR !== undefined ? sigmaNewLnR * sigmaNewLnR : c.residualVariance * c.meanRelativeVariance;
    seNewRun = Math.sqrt(seMean * seMean + runVariance);
  }
  const { min, max } = c.temperatureRangeK;
  return {
    lnRatio,
    seMean,
    seNewRun,
    dof: c.dof,
    branch: u0 > psi ? 'low' : 'high',
    extrapolated: temperatureK < min - 1e-9 || temperatureK > max + 1e-9,
  };
}
