import { describe, expect, it } from 'vitest';
import {
  atropisomerClass,
  eeAfterTime,
  eeHalfLifeS,
  epimerization,
  epimerizationHoldAboveFloor,
  equilibriumExcessPercent,
  erosionForecast,
  longestHoldS,
  racemizationRateConstant,
} from '../../../api/science/erosion';
import { eyringRateConstant } from '../../../api/science/rate';
import { energyToJPerMol } from '../../../api/science/units';
import { domainErrorOf, expectAllFinite } from './helpers';

const kcal = (v: number) => energyToJPerMol(v, 'kcal/mol');

describe('racemization', () => {
  it('when the ee half-life has passed, then ee has halved: t½ = ln2/(2k_e)', () => {
    const ke = racemizationRateConstant({ kind: 'gibbs', gJPerMol: kcal(24), temperatureK: 298.15 }, 298.15);
    expect(ke).toBeCloseTo(eyringRateConstant(kcal(24), 298.15), 15); // [C] one-way Eyring constant
    const half = eeHalfLifeS(ke);
    expect(half).toBeCloseTo(Math.LN2 / (2 * ke), 6); // [C] api/science/README.md §7
    expect(eeAfterTime(98, ke, half)).toBeCloseTo(49, 10); // [C] ee(t) = ee₀·exp(−2k_e t)
  });

  it('when holding to a floor, then the longest hold ends exactly at the floor', () => {
    const ke = 1e-5;
    const t = longestHoldS(99.5, 99.0, ke);
    expect(eeAfterTime(99.5, ke, t)).toBeCloseTo(99.0, 10); // [C]
    expect(longestHoldS(98.0, 99.0, ke)).toBe(0); // [C] already below the floor
  });

  it('when a forecast is asked, then it labels k_rac = 2k_e and gives finite times', () => {
    const f = erosionForecast({ kind: 'enthalpy-entropy', hJPerMol: 95_000, sJPerMolK: -10 }, [298.15, 333.15], {
      ee0Percent: 99.5,
      holdTimeS: 86_400,
      floorEePercent: 99.0,
    });
    expect(f.points[0]!.kRacPerS).toBeCloseTo(2 * f.points[0]!.kOneWayPerS, 20); // [C] definition
    expect(f.points[1]!.eeAfterHoldPercent!).toBeLessThan(f.points[0]!.eeAfterHoldPercent!);
    expect(f.definitions.join(' ')).toMatch(/k_rac/);
    expectAllFinite(f);
  });
});

describe('epimerization towards K ≠ 1', () => {
  it('when relaxing, then the deviation from equilibrium halves every ln2/(k_f + k_r) and the end point is K', () => {
    const kf = 2e-4;
    const kr = 5e-5; // K = [B]/[A] = kf/kr = 4 [C]
    const start = epimerization(kf, kr, 1, 0);
    expect(start.equilibriumFractionA).toBeCloseTo(0.2, 12); // [C] 1/(1 + K)
    const half = start.relaxationHalfLifeS;
    expect(half).toBeCloseTo(Math.LN2 / (kf + kr), 9); // [C] api/science/README.md §7
    const mid = epimerization(kf, kr, 1, half);
    expect(mid.fractionA - 0.2).toBeCloseTo((1 - 0.2) / 2, 10); // [C]
    expect(epimerization(kf, kr, 1, 1e7).fractionA).toBeCloseTo(0.2, 10); // [C]
  });
});

describe('atropisomer class at 37 °C', () => {
  it('when barriers of 18, 25 and 32 kcal/mol are classed, then they fall in classes 1, 2 and 3', () => {
    expect(atropisomerClass({ kind: 'gibbs', gJPerMol: kcal(18), temperatureK: 310.15 }).atropisomerClass).toBe(1); // [M: LaPlante et al. 2011] < 20 kcal/mol
    expect(atropisomerClass({ kind: 'gibbs', gJPerMol: kcal(25), temperatureK: 310.15 }).atropisomerClass).toBe(2); // [M: LaPlante et al. 2011] 20–30
    expect(atropisomerClass({ kind: 'gibbs', gJPerMol: kcal(32), temperatureK: 310.15 }).atropisomerClass).toBe(3); // [M: LaPlante et al. 2011] > 30
  });

  it('when the class boundaries are converted to half-lives, then 20 kcal/mol is seconds and 30 kcal/mol is years', () => {
    const c20 = atropisomerClass({ kind: 'gibbs', gJPerMol: kcal(20), temperatureK: 310.15 });
    const c30 = atropisomerClass({ kind: 'gibbs', gJPerMol: kcal(30), temperatureK: 310.15 });
    expect(c20.eeHalfLifeS).toBeLessThan(60); // [M: LaPlante et al. 2011] "minutes or less"; [C] ≈ 7 s
    expect(c30.eeHalfLifeS / (365.25 * 86_400)).toBeGreaterThan(1); // [M: LaPlante et al. 2011] "years"; [C] ≈ 2.4 y
    expect(c30.definition).toMatch(/ln 2\/\(2k_e\)/);
  });

  it('when ee inputs are outside ±100 %, then DomainError', () => {
    expect(domainErrorOf(() => eeAfterTime(101, 1e-3, 10)).code).toBe('ee-out-of-range');
    expect(domainErrorOf(() => longestHoldS(99, 0, 1e-3)).field).toBe('floorEePercent');
  });
});

describe('epimerization towards an equilibrium excess', () => {
  it('when K = [B]/[A] is 1 or 1/3, then the excess at equilibrium is 0 % or 50 %', () => {
    expect(equilibriumExcessPercent(1)).toBe(0); // [C] A = B at equilibrium
    expect(equilibriumExcessPercent(1 / 3)).toBeCloseTo(50, 12); // [C] 75 : 25 → (75 − 25)/100
    expect(equilibriumExcessPercent(3)).toBeCloseTo(-50, 12); // [C] B favoured: the excess of A is negative
  });

  it('when the excess relaxes at rate λ, then after the longest hold it sits exactly on the floor', () => {
    const lambda = 2e-5;
    const hold = epimerizationHoldAboveFloor(98, 90, 20, lambda);
    expect(hold.status).toBe('above');
    // [C] excess(t) = eq + (e₀ − eq)·exp(−λt)
    expect(20 + (98 - 20) * Math.exp(-lambda * hold.seconds!)).toBeCloseTo(90, 10);
  });

  it('when the floor is not below the start, or not above equilibrium, then there is no hold to compute', () => {
    expect(epimerizationHoldAboveFloor(90, 95, 20, 1e-5)).toEqual({ seconds: 0, status: 'already-below' });
    expect(epimerizationHoldAboveFloor(98, 20, 20, 1e-5)).toEqual({ seconds: null, status: 'never-reached' });
  });
});
