import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  AVOGADRO_PER_MOL,
  BOLTZMANN_J_PER_K,
  CELSIUS_OFFSET_K,
  GAS_CONSTANT_J_PER_MOL_K,
  PLANCK_J_S,
  THERMOCHEMICAL_CALORIE_J,
} from '../../../api/science/constants';
import { DomainError } from '../../../api/science/errors';
import {
  ENERGY_UNITS,
  ENTROPY_UNITS,
  TEMPERATURE_UNITS,
  energyFromJPerMol,
  energyToJPerMol,
  entropyFromJPerMolK,
  entropyToJPerMolK,
  temperatureFromK,
  temperatureToK,
} from '../../../api/science/units';

describe('constants', () => {
  it('when read, then they are the exact CODATA 2018 / 2019 SI values', () => {
    expect(BOLTZMANN_J_PER_K).toBe(1.380649e-23); // [S] CODATA 2018, exact
    expect(PLANCK_J_S).toBe(6.62607015e-34); // [S] CODATA 2018, exact
    expect(AVOGADRO_PER_MOL).toBe(6.02214076e23); // [S] CODATA 2018, exact
    expect(GAS_CONSTANT_J_PER_MOL_K).toBeCloseTo(8.314462618, 9); // [S] CODATA 2018, R = N_A k_B = 8.314462618... J/(mol K)
    expect(THERMOCHEMICAL_CALORIE_J).toBe(4.184); // [S] NIST SP 811, exact
    expect(CELSIUS_OFFSET_K).toBe(273.15); // [S] SI definition of the degree Celsius
  });
});

describe('units', () => {
  it('when converting known energies, then the factors are the thermochemical calorie and kilo', () => {
    expect(energyToJPerMol(1, 'kcal/mol')).toBe(4184); // [S] NIST SP 811: 1 cal_th = 4.184 J
    expect(energyToJPerMol(1, 'cal/mol')).toBe(4.184); // [S] NIST SP 811
    expect(energyToJPerMol(2.5, 'kJ/mol')).toBe(2500); // [CP] SI prefix
    expect(energyFromJPerMol(4184, 'kcal/mol')).toBe(1); // [S] NIST SP 811
    expect(entropyToJPerMolK(1, 'cal/(mol*K)')).toBe(4.184); // [S] 1 e.u. = 1 cal/(mol K), NIST SP 811
  });

  it('when converting known temperatures, then Celsius and Fahrenheit map onto kelvin', () => {
    expect(temperatureToK(0, 'C')).toBe(273.15); // [S] SI definition
    expect(temperatureToK(-78, 'C')).toBeCloseTo(195.15, 12); // [C] −78 + 273.15
    expect(temperatureToK(32, 'F')).toBeCloseTo(273.15, 12); // [S] water freezes at 32 °F
    expect(temperatureToK(-40, 'F')).toBeCloseTo(233.15, 12); // [S] −40 °F = −40 °C
    expect(temperatureFromK(373.15, 'F')).toBeCloseTo(212, 12); // [S] water boils at 212 °F at 1 atm
  });

  it('when a temperature is at or below absolute zero, then a DomainError names the field', () => {
    expect(() => temperatureToK(-273.15, 'C')).toThrow(DomainError);
    expect(() => temperatureToK(0, 'K')).toThrow(DomainError);
    try {
      temperatureToK(-500, 'F', 'run.temperature');
    } catch (e) {
      expect(e).toBeInstanceOf(DomainError);
      expect((e as DomainError).code).toBe('temperature-not-positive');
      expect((e as DomainError).field).toBe('run.temperature');
    }
    expect(() => energyToJPerMol(Number.NaN, 'kJ/mol')).toThrow(DomainError);
    expect(() => energyToJPerMol(1, 'eV' as never)).toThrow(DomainError);
  });

  it('when any energy, entropy or temperature is converted there and back, then it is unchanged', () => {
    const finite = fc.double({ min: -1e7, max: 1e7, noNaN: true });
    fc.assert(
      fc.property(finite, fc.constantFrom(...ENERGY_UNITS), (v, u) => {
        const back = energyFromJPerMol(energyToJPerMol(v, u), u);
        expect(Math.abs(back - v)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(v)));
      }),
    );
    fc.assert(
      fc.property(finite, fc.constantFrom(...ENTROPY_UNITS), (v, u) => {
        const back = entropyFromJPerMolK(entropyToJPerMolK(v, u), u);
        expect(Math.abs(back - v)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(v)));
      }),
    );
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1e5, noNaN: true }), fc.constantFrom(...TEMPERATURE_UNITS), (k, u) => {
        const back = temperatureToK(temperatureFromK(k, u), u);
        expect(Math.abs(back - k)).toBeLessThanOrEqual(1e-9 * Math.max(1, k));
      }),
    );
  });
});
