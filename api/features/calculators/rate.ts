/** POST /api/v1/rate: rate constants, half-lives and times to a conversion over temperature. */
import {
  DomainError,
  arrheniusEa,
  energyToJPerMol,
  entropyFromJPerMolK,
  forecastRate,
  kelvinToCelsius,
  rateConstantFromRun,
  temperatureToK,
  type KineticRun,
  type KineticSetup,
  type RateBasis,
} from '../../science';
import type { z } from 'zod';
import type { RateRequest, RateResponse, measuredRunSchema } from './kinetics-schemas';
import { KINETICS_CAUTION } from '../../lib/cautions';
import { SECONDS_PER } from '../../science/quantities';
import { expandTemperatures, type ExpandedTemperatures } from './temperatures';
import {
  energyOut,
  readableDuration,
  toBarrierSpec,
  relabel,
  temperatureRule,
  barrierRule,
  farFromAnchor,
  type FieldRule,
  type ReadableDuration,
} from './kinetics-fields';

/** Only a rough check for the one-run sensitivity band; api/science/README.md §6 asks to show how the answer depends on ΔH‡. */
const SENSITIVITY_STEP_J_PER_MOL = 10_000;

function toSetup(s: RateRequest['setup']): KineticSetup {
  switch (s.order) {
    case 'first':
      return { order: 'first' };
    case 'pseudo-first':
      return { order: 'pseudo-first', limitingConcentrationM: s.limiting.value, excessConcentrationM: s.excess.value };
    case 'second':
      return { order: 'second', initialConcentrationM: s.initial.value };
  }
}

function toRun(r: z.infer<typeof measuredRunSchema>, field: string): KineticRun {
  return {
    conversion: r.conversionPercent / 100,
    timeS: r.time.value * SECONDS_PER[r.time.unit],
    temperatureK: temperatureToK(r.temperature.value, r.temperature.unit, `${field}.temperature.value`),
  };
}

const RUN_FIELDS: Record<string, string> = { conversion: 'conversionPercent', timeS: 'time.value', temperatureK: 'temperature.value' };

function rateRules(temps: ExpandedTemperatures): FieldRule[] {
  return [
    temperatureRule(temps),
    barrierRule('basis\\.barrier', () => 'basis'),
    [/^basis\.run\.(conversion|timeS|temperatureK)$/, (m) => `basis.run.${RUN_FIELDS[m[1]!]}`],
    [/^runs\[(\d)\]\.(conversion|timeS|temperatureK)$/, (m) => `basis.runs.${m[1]}.${RUN_FIELDS[m[2]!]}`],
    [/^basis\.assumedHJPerMol$/, () => 'basis.assumedDH.value'],
    [/^setup\.(limiting|excess|initial)ConcentrationM$/, (m) => `setup.${m[1]}.value`],
    [/^targetConversion$/, () => 'targetConversionPercent'],
    [/^basis\.kind$/, () => 'basis.kind'],
  ];
}

/** k, k_obs, half-life and time to a target conversion over temperature from a barrier or from runs (api/science/README.md §6). */
export function computeRate(req: RateRequest): RateResponse {
  const temps = expandTemperatures(req.temperatures);
  const setup = toSetup(req.setup);
  const rules = rateRules(temps);
  const target = req.targetConversionPercent / 100;
  let basis: RateBasis;
  let source: RateResponse['activation']['source'];
  let runs: KineticRun[] = [];
  let anchors: number[] = [];
  const b = req.basis;
  switch (b.kind) {
    case 'gibbs':
    case 'activation': {
      const barrier = toBarrierSpec(b, 'basis');
      basis = { kind: 'barrier', barrier };
      source = 'given';
      if (barrier.kind === 'gibbs') anchors = [barrier.temperatureK];
      break;
    }
    case 'one-run':
      runs = [toRun(b.run, 'basis.run')];
      basis = {
        kind: 'one-run',
        run: runs[0]!,
        assumedHJPerMol: energyToJPerMol(b.assumedDH.value, b.assumedDH.unit, 'basis.assumedDH.value'),
      };
      source = 'assumed';
      anchors = [runs[0]!.temperatureK];
      break;
    case 'two-runs':
      runs = [toRun(b.runs[0], 'basis.runs.0'), toRun(b.runs[1], 'basis.runs.1')];
      basis = { kind: 'two-runs', runs: [runs[0]!, runs[1]!] };
      source = 'derived';
      anchors = runs.map((r) => r.temperatureK);
      break;
  }
  const forecast = relabel(() => forecastRate(basis, setup, temps.kelvins, { targetConversion: target }), rules, 'temperatures');
  const measured = runs.map((run, i) => {
    const field = b.kind === 'one-run' ? 'basis.run' : `basis.runs.${i}`;
    const { k, kObsPerS } = relabel(
      () => rateConstantFromRun(run, setup),
      [...rules, [/^run\.(\w+)$/, (m) => `${field}.${RUN_FIELDS[m[1]!] ?? m[1]}`]],
      field,
    );
    return { kelvin: run.temperatureK, celsius: kelvinToCelsius(run.temperatureK), k, kObsPerS };
  });

  const eaAt = runs.length > 0 ? runs.reduce((sum, r) => sum + r.temperatureK, 0) / runs.length : (anchors[0] ?? 298.15);
  const assumptions = [...forecast.assumptions];
  if (setup.order === 'pseudo-first') {
    assumptions.push('Pseudo-first order: the excess reagent stays at its starting concentration, so k_obs = k·[excess]₀.');
  }
  if (setup.order === 'second') {
    assumptions.push('Second order with both reactants starting at the same concentration; times scale inversely with that concentration.');
  }
  const warnings = [...forecast.warnings];
  const far = farFromAnchor(temps.kelvins, anchors);
  if (far) warnings.push(far);

  let sensitivity: RateResponse['sensitivity'] = null;
  if (basis.kind === 'one-run') {
    const oneRun = basis;
    sensitivity = {
      note: 'Times to the target conversion if ΔH‡ were 10 kJ/mol lower or higher than assumed; ΔS‡ is re-derived from the same run each time, so all variants agree at the run temperature.',
      variants: [-SENSITIVITY_STEP_J_PER_MOL, SENSITIVITY_STEP_J_PER_MOL].map((step) => {
        const h = oneRun.assumedHJPerMol + step;
        let points: { kelvin: number; celsius: number; timeToTarget: ReadableDuration }[] | null;
        try {
          const alt = forecastRate({ ...oneRun, assumedHJPerMol: h }, setup, temps.kelvins, { targetConversion: target });
          points = alt.points.map((p) => ({
            kelvin: p.temperatureK,
            celsius: p.celsius,
            timeToTarget: readableDuration(p.timeToTargetS!),
          }));
        } catch (e) {
          // A variant that leaves the representable range is reported as missing, not as a failure of the whole request.
          if (!(e instanceof DomainError)) throw e;
          points = null;
          warnings.push({
            code: 'sensitivity-out-of-range',
            message: `With ΔH‡ = ${(h / 1000).toFixed(1)} kJ/mol the times fall outside the representable range.`,
          });
        }
        return { dH: energyOut(h), points };
      }),
    };
  }

  return {
    order: setup.order,
    kUnit: setup.order === 'first' ? 's^-1' : 'L/(mol*s)',
    targetConversionPercent: req.targetConversionPercent,
    activation: {
      source,
      dH: energyOut(forecast.hJPerMol),
      dS: { 'J/(mol*K)': forecast.sJPerMolK, 'cal/(mol*K)': entropyFromJPerMolK(forecast.sJPerMolK, 'cal/(mol*K)') },
      ea: { ...energyOut(arrheniusEa(forecast.hJPerMol, eaAt)), kelvin: eaAt },
    },
    runs: measured,
    points: forecast.points.map((p) => ({
      kelvin: p.temperatureK,
      celsius: p.celsius,
      k: p.k,
      kObsPerS: p.kObsPerS,
      halfLife: readableDuration(p.halfLifeS),
      timeToTarget: readableDuration(p.timeToTargetS!),
      dG: energyOut(p.gJPerMol),
      ea: energyOut(p.arrheniusEaJPerMol),
    })),
    sensitivity,
    assumptions,
    warnings,
    caution: KINETICS_CAUTION,
  };
}
