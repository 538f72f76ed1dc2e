/**
 * Rates from barriers and from measured runs (api/science/README.md §6).
 *
 * Eyring–Polanyi: k = κ·(k_B·T/h)·exp(−ΔG‡/RT) = κ·(k_B·T/h)·exp(ΔS‡/R)·exp(−ΔH‡/RT)
 * (Eyring, J. Chem. Phys. 1935, 3, 107), κ = 1 by default; for bimolecular steps k is in
 * M⁻¹·s⁻¹ for a 1 M standard state.
 */
import { resolveBarrier, type BarrierSpec } from './activation';
import { BOLTZMANN_OVER_PLANCK_PER_K_S, GAS_CONSTANT_J_PER_MOL_K as R } from './constants';
import { DomainError, requireFinite, requireFiniteResult, requirePositive, requireTemperatureK, type Warning } from './errors';
import { MAX_TEMPERATURE_COUNT } from './forecast';
import { describeTemperatureK, kelvinToCelsius } from './units';

export type KineticOrder = 'first' | 'pseudo-first' | 'second';

/**
 * - first: k in s⁻¹.
 * - pseudo-first: A + B with B in excess; k is k₂ (M⁻¹·s⁻¹), k_obs = k₂·[B]₀; ≥ 10-fold excess expected.
 * - second: A + B with equal starting concentrations c₀; k in M⁻¹·s⁻¹.
 */
export type KineticSetup =
  | { order: 'first' }
  | { order: 'pseudo-first'; limitingConcentrationM: number; excessConcentrationM: number }
  | { order: 'second'; initialConcentrationM: number };

/** A measured run: fractional conversion X (0 < X < 1) reached after timeS at temperatureK. */
export interface KineticRun {
  conversion: number;
  timeS: number;
  temperatureK: number;
}

function requireKappa(kappa: number): number {
  requireFinite(kappa, 'kappa');
  if (!(kappa > 0 && kappa <= 1)) throw new DomainError('kappa-out-of-range', 'the transmission coefficient κ must lie in (0, 1]', 'kappa');
  return kappa;
}

function requireRate(k: number, field: string): number {
  requireFinite(k, field);
  if (!(k > 0)) throw new DomainError('rate-not-positive', `${field} must be a positive rate constant`, field);
  return k;
}

/**
 * Eyring–Polanyi rate constant k = κ(k_B T/h)·exp(−ΔG‡/RT) (api/science/README.md §6).
 * Throws `result-out-of-range` if k under- or overflows.
 */
export function eyringRateConstant(gJPerMol: number, temperatureK: number, kappa = 1): number {
  requireFinite(gJPerMol, 'gJPerMol');
  requireTemperatureK(temperatureK, 'temperatureK');
  requireKappa(kappa);
  const k = kappa * BOLTZMANN_OVER_PLANCK_PER_K_S * temperatureK * Math.exp(-gJPerMol / (R * temperatureK));
  if (!(k > 0))
    throw new DomainError(
      'result-out-of-range',
      'the rate constant underflows to zero: the barrier is too high for this temperature',
      'gJPerMol',
    );
  return requireFiniteResult(k, 'rate constant', 'gJPerMol');
}

/** k = κ(k_B T/h)·exp(ΔS‡/R)·exp(−ΔH‡/RT), i.e. {@link eyringRateConstant} at ΔG‡ = ΔH‡ − TΔS‡. */
export function rateConstantFromActivation(hJPerMol: number, sJPerMolK: number, temperatureK: number, kappa = 1): number {
  requireFinite(hJPerMol, 'hJPerMol');
  requireFinite(sJPerMolK, 'sJPerMolK');
  requireTemperatureK(temperatureK, 'temperatureK');
  return eyringRateConstant(hJPerMol - temperatureK * sJPerMolK, temperatureK, kappa);
}

/** Inverse Eyring: ΔG‡ = RT·ln(κ k_B T/(h k)). */
export function gibbsBarrierFromRateConstant(k: number, temperatureK: number, kappa = 1): number {
  requireRate(k, 'k');
  requireTemperatureK(temperatureK, 'temperatureK');
  requireKappa(kappa);
  return R * temperatureK * Math.log((kappa * BOLTZMANN_OVER_PLANCK_PER_K_S * temperatureK) / k);
}

/** Arrhenius activation energy from ΔH‡ for a unimolecular step in solution: Ea = ΔH‡ + RT (api/science/README.md §6). */
export function arrheniusEa(hJPerMol: number, temperatureK: number): number {
  requireFinite(hJPerMol, 'hJPerMol');
  requireTemperatureK(temperatureK, 'temperatureK');
  return hJPerMol + R * temperatureK;
}

/** ΔH‡ = Ea − RT (inverse of {@link arrheniusEa}). */
export function enthalpyFromArrheniusEa(eaJPerMol: number, temperatureK: number): number {
  requireFinite(eaJPerMol, 'eaJPerMol');
  requireTemperatureK(temperatureK, 'temperatureK');
  return eaJPerMol - R * temperatureK;
}

function validateSetup(setup: KineticSetup, warnings: Warning[] = []): KineticSetup {
  switch (setup?.order) {
    case 'first':
      return setup;
    case 'pseudo-first': {
      requirePositive(setup.limitingConcentrationM, 'setup.limitingConcentrationM');
      requirePositive(setup.excessConcentrationM, 'setup.excessConcentrationM');
      const excess = setup.excessConcentrationM / setup.limitingConcentrationM;
      if (excess < 10) {
        warnings.push({
          code: 'excess-below-tenfold',
          message: `The reagent excess is only ${excess.toFixed(1)}-fold; pseudo-first-order treatment needs about 10-fold or more, so rates and times are approximate.`,
        });
      }
      return setup;
    }
    case 'second':
      requirePositive(setup.initialConcentrationM, 'setup.initialConcentrationM');
      return setup;
    default:
      throw new DomainError('unknown-order', "setup.order must be 'first', 'pseudo-first' or 'second'", 'setup.order');
  }
}

function requireConversion(x: number, field: string): number {
  requireFinite(x, field);
  if (!(x > 0 && x < 1)) throw new DomainError('conversion-out-of-range', `${field} must be a fraction strictly between 0 and 1`, field);
  return x;
}

/**
 * Rate constant from one run (api/science/README.md §6): first/pseudo-first order k_obs = −ln(1 − X)/t
 * (pseudo-first k = k_obs/[B]₀); second order, equal c₀: k = X/[t·c₀·(1 − X)].
 */
export function rateConstantFromRun(
  run: KineticRun,
  setup: KineticSetup,
  field = 'run',
): { k: number; kObsPerS: number | null; warnings: Warning[] } {
  const warnings: Warning[] = [];
  validateSetup(setup, warnings);
  const x = requireConversion(run.conversion, `${field}.conversion`);
  const t = requirePositive(run.timeS, `${field}.timeS`);
  requireTemperatureK(run.temperatureK, `${field}.temperatureK`);
  if (setup.order === 'second') {
    return { k: x / (t * setup.initialConcentrationM * (1 - x)), kObsPerS: null, warnings };
  }
  const kObs = -Math.log1p(-x) / t;
  if (setup.order === 'pseudo-first') return { k: kObs / setup.excessConcentrationM, kObsPerS: kObs, warnings };
  return { k: kObs, kObsPerS: kObs, warnings };
}

/** The first-order rate that governs the time course: k (first), k·[B]₀ (pseudo-first); null for second order. */
export function effectiveFirstOrderRate(k: number, setup: KineticSetup): number | null {
  if (setup.order === 'first') return k;
  if (setup.order === 'pseudo-first') return k * setup.excessConcentrationM;
  return null;
}

/** Half-life: ln2/k (first), ln2/(k[B]₀) (pseudo-first), 1/(k·c₀) (second order, equal c₀). */
export function halfLifeS(k: number, setup: KineticSetup): number {
  requireRate(k, 'k');
  validateSetup(setup);
  const t = setup.order === 'second' ? 1 / (k * setup.initialConcentrationM) : Math.LN2 / effectiveFirstOrderRate(k, setup)!;
  return requireFiniteResult(t, 'half-life', 'k');
}

/** Time to conversion X: −ln(1 − X)/k_eff (first, pseudo-first); X/[k·c₀·(1 − X)] (second, equal c₀). */
export function timeToConversionS(k: number, conversion: number, setup: KineticSetup): number {
  requireRate(k, 'k');
  const x = requireConversion(conversion, 'conversion');
  validateSetup(setup);
  const t =
    setup.order === 'second' ? x / (k * setup.initialConcentrationM * (1 - x)) : -Math.log1p(-x) / effectiveFirstOrderRate(k, setup)!;
  return requireFiniteResult(t, 'time', 'k');
}

/**
 * ΔH‡ and ΔS‡ from two runs at two temperatures via the linear Eyring form
 * ln(k/T) = ln(κk_B/h) + ΔS‡/R − ΔH‡/(RT):
 *   ΔH‡ = R·ln[(k₂/T₂)/(k₁/T₁)] / (1/T₁ − 1/T₂),  ΔS‡ = R·ln(k₁h/(κk_B T₁)) + ΔH‡/T₁.
 */
export function activationFromTwoRuns(
  run1: KineticRun,
  run2: KineticRun,
  setup: KineticSetup,
  kappa = 1,
): { hJPerMol: number; sJPerMolK: number; k1: number; k2: number; eaJPerMol: number; warnings: Warning[] } {
  const a = rateConstantFromRun(run1, setup, 'runs[0]');
  const b = rateConstantFromRun(run2, setup, 'runs[1]');
  const t1 = run1.temperatureK;
  const t2 = run2.temperatureK;
  if (Math.abs(t1 - t2) < 1e-6)
    throw new DomainError('same-temperature', 'the two runs must be at different temperatures', 'runs[1].temperatureK');
  const h = (R * Math.log(b.k / t2 / (a.k / t1))) / (1 / t1 - 1 / t2);
  const s = (gibbsBarrierFromRateConstant(a.k, t1, kappa) - h) / -t1;
  const warnings = [...a.warnings];
  if (Math.abs(t1 - t2) < 10) {
    warnings.push({
      code: 'close-temperatures',
      message: 'The two runs are less than 10 K apart, so ΔH‡ from them is very sensitive to timing errors.',
    });
  }
  return { hJPerMol: h, sJPerMolK: s, k1: a.k, k2: b.k, eaJPerMol: arrheniusEa(h, (t1 + t2) / 2), warnings };
}

export type RateBasis =
  | { kind: 'barrier'; barrier: BarrierSpec }
  | { kind: 'one-run'; run: KineticRun; assumedHJPerMol: number }
  | { kind: 'two-runs'; runs: [KineticRun, KineticRun] };

export interface RatePoint {
  temperatureK: number;
  celsius: number;
  gJPerMol: number;
  /** Rate constant in s⁻¹ (first) or M⁻¹·s⁻¹ (pseudo-first k₂, second). */
  k: number;
  /** Effective first-order rate governing the time course; null for second order. */
  kObsPerS: number | null;
  halfLifeS: number;
  timeToTargetS: number | null;
  /** Arrhenius Ea = ΔH‡ + RT at this temperature. */
  arrheniusEaJPerMol: number;
}

export interface RateForecast {
  hJPerMol: number;
  sJPerMolK: number;
  kUnit: 's^-1' | 'M^-1 s^-1';
  targetConversion: number | null;
  points: RatePoint[];
  assumptions: string[];
  warnings: Warning[];
}

/**
 * Rate constant, half-life and time to a target conversion over temperature, from a barrier,
 * from one run plus an assumed ΔH‡ (ΔS‡ then follows from the run), or from two runs.
 */
export function forecastRate(
  basis: RateBasis,
  setup: KineticSetup,
  temperaturesK: readonly number[],
  options: { targetConversion?: number; kappa?: number } = {},
): RateForecast {
  const warnings: Warning[] = [];
  validateSetup(setup, warnings);
  const kappa = requireKappa(options.kappa ?? 1);
  const target = options.targetConversion === undefined ? null : requireConversion(options.targetConversion, 'targetConversion');
  const assumptions: string[] = [];
  let h: number;
  let s: number;
  switch (basis.kind) {
    case 'barrier': {
      const b = resolveBarrier(basis.barrier, 'basis.barrier');
      h = b.hJPerMol;
      s = b.sJPerMolK;
      if (b.entropyAssumedZero) {
        assumptions.push(
          'ΔS‡ assumed 0: ΔG‡ is treated as purely enthalpic, so the rate changes with temperature more steeply than for a typical negative ΔS‡ with the same ΔG‡.',
        );
      }
      break;
    }
    case 'one-run': {
      const { k } = rateConstantFromRun(basis.run, setup, 'basis.run');
      h = requireFinite(basis.assumedHJPerMol, 'basis.assumedHJPerMol');
      const g = gibbsBarrierFromRateConstant(k, basis.run.temperatureK, kappa);
      s = (h - g) / basis.run.temperatureK;
      assumptions.push(
        `ΔH‡ assumed ${(h / 1000).toFixed(1)} kJ/mol (not measured); ΔS‡ follows from the one run. Rates away from ${describeTemperatureK(basis.run.temperatureK)} depend directly on this assumption: try a range of values.`,
      );
      break;
    }
    case 'two-runs': {
      const act = activationFromTwoRuns(basis.runs[0], basis.runs[1], setup, kappa);
      h = act.hJPerMol;
      s = act.sJPerMolK;
      warnings.push(...act.warnings.filter((w) => !warnings.some((x) => x.code === w.code)));
      assumptions.push('ΔH‡ and ΔS‡ come from two runs only: no check of linearity, and each timing error goes straight into ΔH‡.');
      break;
    }
    default:
      throw new DomainError('unknown-basis', "basis.kind must be 'barrier', 'one-run' or 'two-runs'", 'basis.kind');
  }
  assumptions.push(
    `Eyring–Polanyi with κ = ${kappa}; ΔH‡ and ΔS‡ constant over temperature; the same mechanism and kinetic order at every temperature.`,
  );
  if (setup.order !== 'first') assumptions.push('Bimolecular rate constants refer to a 1 M standard state (M⁻¹·s⁻¹).');
  if (!Array.isArray(temperaturesK) || temperaturesK.length === 0 || temperaturesK.length > MAX_TEMPERATURE_COUNT) {
    throw new DomainError('count-out-of-range', `give 1 to ${MAX_TEMPERATURE_COUNT} temperatures`, 'temperaturesK');
  }
  const points = temperaturesK.map((t, i) => {
    const field = `temperaturesK[${i}]`;
    requireTemperatureK(t, field);
    const g = h - t * s;
    let k: number;
    try {
      k = eyringRateConstant(g, t, kappa);
    } catch (e) {
      if (e instanceof DomainError) throw new DomainError(e.code, `${e.message} (at ${t} K)`, field);
      throw e;
    }
    return {
      temperatureK: t,
      celsius: kelvinToCelsius(t),
      gJPerMol: g,
      k,
      kObsPerS: effectiveFirstOrderRate(k, setup),
      halfLifeS: halfLifeS(k, setup),
      timeToTargetS: target === null ? null : timeToConversionS(k, target, setup),
      arrheniusEaJPerMol: h + R * t,
    };
  });
  return {
    hJPerMol: h,
    sJPerMolK: s,
    kUnit: setup.order === 'first' ? 's^-1' : 'M^-1 s^-1',
    targetConversion: target,
    points,
    assumptions,
    warnings,
  };
}
