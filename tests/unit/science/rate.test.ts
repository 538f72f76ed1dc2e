import { describe, expect, it } from 'vitest';
import { BOLTZMANN_J_PER_K, GAS_CONSTANT_J_PER_MOL_K as R, PLANCK_J_S } from '../../../api/science/constants';
import {
  activationFromTwoRuns,
  arrheniusEa,
  eyringRateConstant,
  forecastRate,
  gibbsBarrierFromRateConstant,
  halfLifeS,
  rateConstantFromActivation,
  rateConstantFromRun,
  timeToConversionS,
} from '../../../api/science/rate';
import { energyToJPerMol } from '../../../api/science/units';
import { domainErrorOf, expectAllFinite, expectSigFigs } from './helpers';

const kcal = (v: number) => energyToJPerMol(v, 'kcal/mol');

describe('Eyring–Polanyi rate constant', () => {
  it('when ΔG‡ = 15.00 kcal/mol at 298.15 K, then k = 62.83 s⁻¹ and t½ = 11.03 ms', () => {
    const k = eyringRateConstant(kcal(15), 298.15);
    expectSigFigs(k, 62.83); // [C] api/science/README.md §10, (k_B T/h)·exp(−ΔG‡/RT)
    expectSigFigs(halfLifeS(k, { order: 'first' }) * 1000, 11.03); // [C] api/science/README.md §10, ln2/k
    expect(k).toBeCloseTo(((BOLTZMANN_J_PER_K * 298.15) / PLANCK_J_S) * Math.exp(-kcal(15) / (R * 298.15)), 9); // [C]
  });

  it('when the barrier is 20 vs 23 kcal/mol at 25 °C, then t½ goes from under minutes to hours', () => {
    // [CP] api/science/README.md §10: near 20–23 kcal/mol room-temperature interconversion turns from seconds-to-minutes into hours
    expect(halfLifeS(eyringRateConstant(kcal(20), 298.15), { order: 'first' })).toBeLessThan(600); // [CP] api/science/README.md §10; [C] ≈ 51 s
    expect(halfLifeS(eyringRateConstant(kcal(23), 298.15), { order: 'first' })).toBeGreaterThan(3600); // [CP] api/science/README.md §10; [C] ≈ 2.2 h
  });

  it('when given as ΔH‡/ΔS‡, then k equals the ΔG‡ form and the barrier inverts it', () => {
    const k = rateConstantFromActivation(70_000, -30, 310);
    expect(k).toBeCloseTo(eyringRateConstant(70_000 + 310 * 30, 310), 12); // [C] ΔG‡ = ΔH‡ − TΔS‡
    expect(gibbsBarrierFromRateConstant(k, 310)).toBeCloseTo(70_000 + 310 * 30, 6); // [C]
    expect(arrheniusEa(70_000, 310)).toBeCloseTo(70_000 + R * 310, 9); // [S] Ea = ΔH‡ + RT (api/science/README.md §6)
  });
});

describe('rate from measured runs', () => {
  it('when 95 % conversion takes 4 h (first order), then k = −ln(0.05)/14400 s', () => {
    const r = rateConstantFromRun({ conversion: 0.95, timeS: 4 * 3600, temperatureK: 273.15 }, { order: 'first' });
    expect(r.k).toBeCloseTo(-Math.log(0.05) / 14_400, 15); // [C] api/science/README.md §6
    expect(timeToConversionS(r.k, 0.95, { order: 'first' })).toBeCloseTo(14_400, 6); // [C] round trip
  });

  it('when second order with equal concentrations, then k = X/(t·c₀·(1 − X)) and t½ = 1/(k c₀)', () => {
    const setup = { order: 'second', initialConcentrationM: 0.5 } as const;
    const r = rateConstantFromRun({ conversion: 0.8, timeS: 1000, temperatureK: 298.15 }, setup);
    expect(r.k).toBeCloseTo(0.8 / (1000 * 0.5 * 0.2), 12); // [C] api/science/README.md §6
    expect(halfLifeS(r.k, setup)).toBeCloseTo(1 / (r.k * 0.5), 9); // [C]
    expect(timeToConversionS(r.k, 0.8, setup)).toBeCloseTo(1000, 9); // [C] round trip
  });

  it('when pseudo-first order with only 5-fold excess, then k₂ = k_obs/[B]₀ and a warning is given', () => {
    const r = rateConstantFromRun(
      { conversion: 0.5, timeS: 600, temperatureK: 298.15 },
      { order: 'pseudo-first', limitingConcentrationM: 0.1, excessConcentrationM: 0.5 },
    );
    expect(r.kObsPerS!).toBeCloseTo(Math.LN2 / 600, 12); // [C]
    expect(r.k).toBeCloseTo(Math.LN2 / 600 / 0.5, 12); // [C] k₂ = k_obs/[B]₀
    expect(r.warnings.map((w) => w.code)).toContain('excess-below-tenfold');
  });

  it('when two runs are built from ΔH‡ = 60 kJ/mol and ΔS‡ = −50 J/(mol K), then both are recovered', () => {
    // [C] construction: k from Eyring at 0 and 25 °C, then the time to 90 % conversion of a first-order reaction
    const runAt = (t: number) => ({ conversion: 0.9, timeS: -Math.log(0.1) / rateConstantFromActivation(60_000, -50, t), temperatureK: t });
    const act = activationFromTwoRuns(runAt(273.15), runAt(298.15), { order: 'first' });
    expect(act.hJPerMol).toBeCloseTo(60_000, 5); // [C] construction value
    expect(act.sJPerMolK).toBeCloseTo(-50, 8); // [C] construction value
  });

  it('when one run and an assumed ΔH‡ are given, then the forecast reproduces the run and states the assumption', () => {
    const run = { conversion: 0.95, timeS: 4 * 3600, temperatureK: 273.15 };
    const f = forecastRate({ kind: 'one-run', run, assumedHJPerMol: 50_000 }, { order: 'first' }, [273.15, 293.15], {
      targetConversion: 0.95,
    });
    expect(f.points[0]!.timeToTargetS!).toBeCloseTo(4 * 3600, 4); // [C] same temperature, same time
    expect(f.points[1]!.timeToTargetS!).toBeLessThan(4 * 3600);
    const steeper = forecastRate({ kind: 'one-run', run, assumedHJPerMol: 80_000 }, { order: 'first' }, [293.15], {
      targetConversion: 0.95,
    });
    expect(steeper.points[0]!.timeToTargetS!).toBeLessThan(f.points[1]!.timeToTargetS!); // [C] larger ΔH‡, stronger T-dependence
    expect(f.assumptions.join(' ')).toMatch(/ΔH‡ assumed 50\.0 kJ\/mol/);
    expectAllFinite(f);
  });

  it('when the barrier is given at one temperature without ΔS‡, then ΔS‡ = 0 is assumed and said so', () => {
    const f = forecastRate(
      { kind: 'barrier', barrier: { kind: 'gibbs', gJPerMol: kcal(15), temperatureK: 298.15 } },
      { order: 'first' },
      [298.15],
    );
    expectSigFigs(f.points[0]!.k, 62.83); // [C] api/science/README.md §10
    expect(f.assumptions.join(' ')).toMatch(/ΔS‡ assumed 0/);
  });

  it('when inputs are impossible, then DomainErrors name the field', () => {
    expect(domainErrorOf(() => rateConstantFromRun({ conversion: 1, timeS: 10, temperatureK: 300 }, { order: 'first' })).field).toBe(
      'run.conversion',
    );
    expect(domainErrorOf(() => rateConstantFromRun({ conversion: 0.5, timeS: 0, temperatureK: 300 }, { order: 'first' })).field).toBe(
      'run.timeS',
    );
    expect(
      domainErrorOf(() =>
        activationFromTwoRuns(
          { conversion: 0.5, timeS: 10, temperatureK: 300 },
          { conversion: 0.6, timeS: 10, temperatureK: 300 },
          { order: 'first' },
        ),
      ).code,
    ).toBe('same-temperature');
  });
});
