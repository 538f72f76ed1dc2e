/**
 * Product distribution over N ≥ 2 competing pathways under kinetic control with rapidly
 * equilibrating precursors (Curtin–Hammett; api/science/README.md §5):
 *   pᵢ = exp(−G‡ᵢ/RT) / Σⱼ exp(−G‡ⱼ/RT),
 * evaluated with log-sum-exp (subtract the largest exponent) so no term overflows.
 * With diastereomer groups of enantiomer pairs: dr = Σ p(group 1)/Σ p(group 2), and within a
 * group ee = (p_A − p_B)/(p_A + p_B) = tanh[(ln P_A − ln P_B)/2].
 */
import { resolveBarrier, type BarrierSpec, type ResolvedBarrier } from './activation';
import { GAS_CONSTANT_J_PER_MOL_K as R } from './constants';
import { DomainError, requireFiniteResult, requireTemperatureK } from './errors';
import { MAX_TEMPERATURE_COUNT } from './forecast';
import { kelvinToCelsius } from './units';

export interface Pathway {
  id: string;
  /** G‡ relative to any common reference (at its temperature), or H‡ and S‡. */
  barrier: BarrierSpec;
  /** Diastereomer group label; give it (and `enantiomer`) on every pathway or on none. */
  diastereomer?: string;
  /** Which member of the enantiomer pair: 'A' counts positive in the group's ee. */
  enantiomer?: 'A' | 'B';
}

export interface DiastereomerGroupResult {
  group: string;
  /** Share of all product in this group, %. */
  percent: number;
  /** Signed ee within the group (A positive), %. */
  eePercent: number;
}

export interface DistributionPoint {
  temperatureK: number;
  celsius: number;
  /** % of each pathway's product, in input order. */
  percents: number[];
  /** Groups in order of first appearance; empty without a mapping. */
  groups: DiastereomerGroupResult[];
  /** dr of the first group to the second when there are exactly two groups, else null. */
  diastereomerRatio: number | null;
}

export interface ProductDistribution {
  pathwayIds: string[];
  points: DistributionPoint[];
  assumptions: string[];
}

function logSumExp(values: number[]): number {
  let max = -Infinity;
  for (const v of values) if (v > max) max = v;
  let sum = 0;
  for (const v of values) sum += Math.exp(v - max);
  return max + Math.log(sum);
}

/**
 * Percent of each product over `temperaturesK` (Boltzmann weighting over transition states,
 * api/science/README.md §5), optionally mapped to diastereomer groups with dr and per-group ee.
 */
export function productDistribution(pathways: readonly Pathway[], temperaturesK: readonly number[]): ProductDistribution {
  if (!Array.isArray(pathways) || pathways.length < 2) {
    throw new DomainError('too-few-pathways', 'at least two competing pathways are needed', 'pathways');
  }
  if (!Array.isArray(temperaturesK) || temperaturesK.length === 0 || temperaturesK.length > MAX_TEMPERATURE_COUNT) {
    throw new DomainError('count-out-of-range', `give 1 to ${MAX_TEMPERATURE_COUNT} temperatures`, 'temperaturesK');
  }
  const resolved: ResolvedBarrier[] = pathways.map((p, i) => resolveBarrier(p.barrier, `pathways[${i}].barrier`));
  const mapped = pathways.some((p) => p.diastereomer !== undefined || p.enantiomer !== undefined);
  const groupOrder: string[] = [];
  if (mapped) {
    pathways.forEach((p, i) => {
      if (p.diastereomer === undefined || p.diastereomer === '') {
        throw new DomainError('incomplete-mapping', 'give a diastereomer group on every pathway or on none', `pathways[${i}].diastereomer`);
      }
      if (p.enantiomer !== 'A' && p.enantiomer !== 'B') {
        throw new DomainError('incomplete-mapping', "enantiomer must be 'A' or 'B' on every mapped pathway", `pathways[${i}].enantiomer`);
      }
      if (!groupOrder.includes(p.diastereomer)) groupOrder.push(p.diastereomer);
    });
    for (const g of groupOrder) {
      const members = pathways.filter((p) => p.diastereomer === g);
      if (!members.some((p) => p.enantiomer === 'A') || !members.some((p) => p.enantiomer === 'B')) {
        const i = pathways.findIndex((p) => p.diastereomer === g);
        throw new DomainError(
          'incomplete-mapping',
          `diastereomer group "${g}" needs both an A and a B enantiomer`,
          `pathways[${i}].enantiomer`,
        );
      }
    }
  }

  const points = temperaturesK.map((t, ti) => {
    requireTemperatureK(t, `temperaturesK[${ti}]`);
    const u = resolved.map((b) => -(b.hJPerMol - t * b.sJPerMolK) / (R * t));
    const lse = logSumExp(u);
    const percents = u.map((v) => 100 * Math.exp(v - lse));
    const groups: DiastereomerGroupResult[] = [];
    const groupLog: number[] = [];
    for (const g of groupOrder) {
      const idx = pathways.map((p, i) => (p.diastereomer === g ? i : -1)).filter((i) => i >= 0);
      const lnA = logSumExp(idx.filter((i) => pathways[i]!.enantiomer === 'A').map((i) => u[i]!));
      const lnB = logSumExp(idx.filter((i) => pathways[i]!.enantiomer === 'B').map((i) => u[i]!));
      const lnGroup = logSumExp([lnA, lnB]);
      groupLog.push(lnGroup);
      groups.push({ group: g, percent: 100 * Math.exp(lnGroup - lse), eePercent: 100 * Math.tanh((lnA - lnB) / 2) });
    }
    const diastereomerRatio =
      groupLog.length === 2
        ? requireFiniteResult(Math.exp(groupLog[0]! - groupLog[1]!), 'diastereomer ratio', `temperaturesK[${ti}]`)
        : null;
    return { temperatureK: t, celsius: kelvinToCelsius(t), percents, groups, diastereomerRatio };
  });

  const assumptions = [
    'Kinetic control with rapidly interconverting precursors (Curtin–Hammett): product shares follow the relative transition-state free energies only.',
    'Each G‡ is taken as H‡ − T·S‡ with constant H‡ and S‡ (no heat-capacity term).',
  ];
  if (resolved.some((b) => b.entropyAssumedZero)) {
    assumptions.push(
      'Where only G‡ at one temperature was given, S‡ is assumed 0 for that pathway, so its G‡ is the same at every temperature.',
    );
  }
  return { pathwayIds: pathways.map((p) => p.id), points, assumptions };
}
