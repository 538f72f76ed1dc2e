/**
 * A barrier described either by ΔG‡ at one temperature (with ΔS‡ given or assumed 0) or by ΔH‡
 * and ΔS‡; at any T, ΔG‡(T) = ΔH‡ − T·ΔS‡ with constant ΔH‡ and ΔS‡ (no heat-capacity term).
 */
import { DomainError, requireFinite, requireTemperatureK } from './errors';

export type BarrierSpec =
  | { kind: 'gibbs'; gJPerMol: number; temperatureK: number; sJPerMolK?: number }
  | { kind: 'enthalpy-entropy'; hJPerMol: number; sJPerMolK: number };

export interface ResolvedBarrier {
  hJPerMol: number;
  sJPerMolK: number;
  /** True when ΔS‡ was not given and taken as 0. */
  entropyAssumedZero: boolean;
}

/** Resolve a barrier to (ΔH‡, ΔS‡): from ΔG‡ at T, ΔH‡ = ΔG‡ + T·ΔS‡ (ΔS‡ default 0). */
export function resolveBarrier(spec: BarrierSpec, field = 'barrier'): ResolvedBarrier {
  if (spec === null || typeof spec !== 'object') throw new DomainError('bad-barrier', `${field} must be an object`, field);
  if (spec.kind === 'gibbs') {
    const g = requireFinite(spec.gJPerMol, `${field}.gJPerMol`);
    const t = requireTemperatureK(spec.temperatureK, `${field}.temperatureK`);
    const s = spec.sJPerMolK === undefined ? 0 : requireFinite(spec.sJPerMolK, `${field}.sJPerMolK`);
    return { hJPerMol: g + t * s, sJPerMolK: s, entropyAssumedZero: spec.sJPerMolK === undefined };
  }
  if (spec.kind === 'enthalpy-entropy') {
    return {
      hJPerMol: requireFinite(spec.hJPerMol, `${field}.hJPerMol`),
      sJPerMolK: requireFinite(spec.sJPerMolK, `${field}.sJPerMolK`),
      entropyAssumedZero: false,
    };
  }
  throw new DomainError('bad-barrier', `${field}.kind must be 'gibbs' or 'enthalpy-entropy'`, `${field}.kind`);
}

/** ΔG‡(T) = ΔH‡ − T·ΔS‡. */
export function gibbsAt(barrier: ResolvedBarrier, temperatureK: number, field = 'temperatureK'): number {
  requireTemperatureK(temperatureK, field);
  return barrier.hJPerMol - temperatureK * barrier.sJPerMolK;
}
