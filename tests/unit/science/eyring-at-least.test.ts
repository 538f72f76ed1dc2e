import { describe, expect, it } from 'vitest';
import { GAS_CONSTANT_J_PER_MOL_K as R } from '../../../api/science/constants';
import { fitEyring, type EyringMeasurement } from '../../../api/science/eyring-fit';

// Constructed screen [C]: ΔΔH‡ = 10 kJ/mol, ΔΔS‡ = 4 J/(mol K); ln r = ΔΔH‡/RT − ΔΔS‡/R (api/science/README.md §1), small invented scatter.
const lnR = (t: number) => 10_000 / (R * t) - 4 / R;
const NOISE = [0.02, -0.03, 0.01, -0.015, 0.025];
const screen: EyringMeasurement[] = [-40, -20, 0, 20, 40].map((c, i) => ({
  temperatureK: c + 273.15,
  ratio: Math.exp(lnR(c + 273.15) + NOISE[i]!),
}));

describe('fitEyring with runs reported as bounds (atLeast)', () => {
  it('when a run below the quantitation limit is marked atLeast, then it is a lower bound at its reported value and the least-squares fit beside it equals the fit without it', () => {
    const bound: EyringMeasurement = { temperatureK: 213.15, ratio: 199, atLeast: true }; // "≥ 99.0 % ee"
    const withBound = fitEyring([...screen, bound]);
    const without = fitEyring(screen);
    const p = withBound.points[5]!;
    expect(p.status).toBe('censored');
    expect(p.censoredBound).toBe('lower');
    expect(p.censorLnRatio).toBeCloseTo(Math.log(199), 12); // [C] a weaker bound than the limit keeps its own value
    expect(withBound.nFitted).toBe(5);
    expect(withBound.nCensored).toBe(1);
    expect(withBound.estimator).toBe('censored-ml');
    expect(withBound.leastSquaresWithoutBounds!.ddHJPerMol).toBe(without.ddHJPerMol);
    expect(withBound.leastSquaresWithoutBounds!.ddSJPerMolK).toBe(without.ddSJPerMolK);
    // [C] The line without the bound gives ln r ≈ 5.16 at −60 °C, below ln 199 ≈ 5.29: the likelihood of the
    // bound pulls the censored fit's slope up, towards the bound.
    expect(withBound.ddHJPerMol).toBeGreaterThan(without.ddHJPerMol);
    expect(p.boundConsistent).toBe(p.lineLnRatio >= Math.log(199));
  });

  it('when the same run is not marked, then it is fitted like any other', () => {
    const fit = fitEyring([...screen, { temperatureK: 213.15, ratio: 199 }]);
    expect(fit.points[5]!.status).toBe('fitted');
    expect(fit.nFitted).toBe(6);
  });

  it('when a run favouring B is marked atLeast, then it bounds r from above', () => {
    const fit = fitEyring([...screen, { temperatureK: 213.15, ratio: 1 / 50, atLeast: true }]);
    expect(fit.points[5]).toMatchObject({ status: 'censored', censoredBound: 'upper' });
  });
});
