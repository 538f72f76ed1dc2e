/**
 * A stored specification on the campaign pages: its ln r threshold, how it reads, and whether a
 * run or a forecast meets it, in words (pass/fail is never shown by colour alone).
 */
import { fixed } from './format';

export interface StoredSpecification {
  measure: 'ee' | 'er' | 'dr' | 'percentA';
  minimum: number;
  probability: number;
  runs?: number | null;
}

/** ln r at the specification's minimum: ee → ln((100 + ee)/(100 − ee)); er, percentA → ln(p/(100 − p)); dr → ln dr. */
export function specificationLn(spec: StoredSpecification): number {
  const m = spec.minimum;
  if (spec.measure === 'ee') return Math.log1p(m / 100) - Math.log1p(-m / 100);
  if (spec.measure === 'dr') return Math.log(m);
  return Math.log(m) - Math.log(100 - m);
}

/** The threshold on a chart axis: the signed excess (ee, de) or the share of A (%). */
export function specificationOnAxis(spec: StoredSpecification, axis: 'ee' | 'percentA'): number {
  const ln = specificationLn(spec);
  return axis === 'ee' ? 100 * Math.tanh(ln / 2) : 100 / (1 + Math.exp(-ln));
}

/** e.g. "ee ≥ 98 %, probability 0.95 per new run". */
export function specificationText(spec: StoredSpecification, family: string): string {
  const d = (v: number) => fixed(v, v % 1 === 0 ? 0 : 1);
  const shown =
    spec.measure === 'ee'
      ? `${family === 'dr' ? 'de' : 'ee'} ≥ ${d(spec.minimum)} %`
      : spec.measure === 'dr'
        ? `dr ≥ ${d(spec.minimum)}:1`
        : `${spec.measure === 'er' ? 'er' : 'major isomer'} ≥ ${d(spec.minimum)}:${d(100 - spec.minimum)}`;
  const runs = spec.runs && spec.runs > 1 ? `the mean of ${spec.runs} new runs` : 'a new run';
  return `${shown}, probability ${spec.probability} that ${runs} meets it`;
}

export type Verdict = 'meets' | 'falls short';

export const verdictOf = (lnRatio: number, specLn: number): Verdict => (lnRatio >= specLn ? 'meets' : 'falls short');
