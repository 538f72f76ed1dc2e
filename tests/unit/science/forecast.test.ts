import { describe, expect, it } from 'vitest';
import { GAS_CONSTANT_J_PER_MOL_K as R } from '../../../api/science/constants';
import { forecastSelectivity, temperatureList } from '../../../api/science/forecast';
import { energyToJPerMol } from '../../../api/science/units';
import { domainErrorOf, expectAllFinite, expectSigFigs } from './helpers';

describe('forecastSelectivity', () => {
  it('when ΔΔH‡ and ΔΔS‡ are given, then ln r = ΔΔH‡/RT − ΔΔS‡/R and T₀ = ΔΔH‡/ΔΔS‡', () => {
    const f = forecastSelectivity({ kind: 'enthalpy-entropy', ddHJPerMol: 10_000, ddSJPerMolK: 20 }, [250, 300, 600]);
    expect(f.points[1]!.ddGJPerMol).toBeCloseTo(4000, 9); // [C] 10000 − 300·20
    expect(f.points[1]!.ratio).toBeCloseTo(Math.exp(10_000 / (R * 300) - 20 / R), 10); // [C] api/science/README.md §1
    expect(f.points[1]!.celsius).toBeCloseTo(26.85, 10); // [C] 300 − 273.15
    expect(f.zeroSelectivityTemperatureK).toBeCloseTo(500, 10); // [C] 10000/20
    expect(f.points[2]!.eePercent).toBeLessThan(0); // [C] above T₀ the selectivity inverts (api/science/README.md §4)
    expect(f.assumptions.join(' ')).toMatch(/heat-capacity/);
    expect(f.assumptions.join(' ')).toMatch(/inverts/);
    expectAllFinite(f);
  });

  it('when ΔΔG‡ is given at one temperature without ΔΔS‡, then ΔΔS‡ is assumed 0 and said so', () => {
    const ddG = energyToJPerMol(1, 'kcal/mol');
    const f = forecastSelectivity({ kind: 'gap-at-temperature', ddGJPerMol: ddG, temperatureK: 298.15 }, [298.15, 273.15]);
    expectSigFigs(f.points[0]!.ratio, 5.408); // [C] api/science/README.md §10
    expect(f.points[1]!.ratio).toBeCloseTo(Math.exp(ddG / (R * 273.15)), 10); // [C] purely enthalpic gap
    expect(f.ddSJPerMolK).toBe(0);
    expect(f.zeroSelectivityTemperatureK).toBeNull();
    expect(f.assumptions.some((a) => a.startsWith('ΔΔS‡ assumed 0'))).toBe(true);
  });

  it('when ΔΔG‡ at one temperature and ΔΔS‡ are given, then ΔΔH‡ = ΔΔG‡ + TΔΔS‡', () => {
    const f = forecastSelectivity({ kind: 'gap-at-temperature', ddGJPerMol: 5000, temperatureK: 250, ddSJPerMolK: -8 }, [300]);
    expect(f.ddHJPerMol).toBeCloseTo(5000 + 250 * -8, 9); // [C]
    expect(f.points[0]!.ddGJPerMol).toBeCloseTo(3000 + 300 * 8, 9); // [C] ΔΔH‡ − TΔΔS‡
  });

  it('when an observed ee at 0 °C is forecast to −20 °C with ΔΔS‡ = 0, then ΔΔG‡ is carried over', () => {
    const f = forecastSelectivity({ kind: 'observed', selectivity: { measure: 'ee', value: 90 }, temperatureK: 273.15 }, [253.15]);
    const ddG = 2 * R * 273.15 * Math.atanh(0.9); // [C] api/science/README.md §1 inverse
    expect(f.points[0]!.eePercent).toBeCloseTo(100 * Math.tanh(ddG / (2 * R * 253.15)), 10); // [C]
    expect(f.points[0]!.percentA).toBeCloseTo(50 + f.points[0]!.eePercent / 2, 10); // [C] %A = 50 + ee/2
  });

  it('when inputs are invalid, then DomainErrors name the field', () => {
    expect(domainErrorOf(() => forecastSelectivity({ kind: 'enthalpy-entropy', ddHJPerMol: 1, ddSJPerMolK: 0 }, [300, -5])).field).toBe(
      'temperaturesK[1]',
    );
    expect(
      domainErrorOf(() => forecastSelectivity({ kind: 'observed', selectivity: { measure: 'ee', value: 100 }, temperatureK: 273 }, [300]))
        .code,
    ).toBe('ee-at-limit');
    // r overflows at the second temperature only: the error names it, with the temperature in the message.
    const overflow = domainErrorOf(() => forecastSelectivity({ kind: 'enthalpy-entropy', ddHJPerMol: 1e6, ddSJPerMolK: 0 }, [300, 0.1]));
    expect(overflow).toEqual({ code: 'result-out-of-range', field: 'temperaturesK[1]' });
    expect(() => forecastSelectivity({ kind: 'enthalpy-entropy', ddHJPerMol: 1e6, ddSJPerMolK: 0 }, [300, 0.1])).toThrow(/at 0\.1 K$/);
    expect(domainErrorOf(() => forecastSelectivity({ kind: 'enthalpy-entropy', ddHJPerMol: 1, ddSJPerMolK: 0 }, [Number.NaN])).field).toBe(
      'temperaturesK[0]',
    );
  });
});

describe('temperatureList', () => {
  it('when −78 to 25 °C in 5 steps is asked, then evenly spaced kelvin values are returned', () => {
    const list = temperatureList({ from: -78, to: 25, count: 5, unit: 'C' });
    expect(list).toHaveLength(5);
    expect(list[0]).toBeCloseTo(195.15, 10); // [C]
    expect(list[4]).toBeCloseTo(298.15, 10); // [C]
    expect(list[1]! - list[0]!).toBeCloseTo(25.75, 10); // [C] 103/4
  });

  it('when count is out of range, then DomainError', () => {
    expect(domainErrorOf(() => temperatureList({ from: 200, to: 300, count: 5001 })).code).toBe('count-out-of-range');
    expect(domainErrorOf(() => temperatureList({ from: 200, to: 300, count: 0 })).code).toBe('count-out-of-range');
    expect(temperatureList({ from: 250, to: 250, count: 1 })).toEqual([250]);
  });
});
