import { describe, expect, it } from 'vitest';
import { fitEyring } from '../../../api/science/eyring-fit';
import { predictLine } from '../../../api/science/regression';
import { checkCurvature, predictSegmented } from '../../../api/science/segmented';
import { chooseScreenModel, predictiveLnRatio } from '../../../api/science/screen-model';

// Invented screens [C]: an isoinversion (slopes −800 K warm, +800 K cold, break at 263.15 K) and a straight line.
const TEMPS = [223.15, 233.15, 243.15, 253.15, 263.15, 273.15, 283.15, 293.15, 303.15, 313.15];
const SCATTER = [0.012, -0.018, 0.009, 0.021, -0.011, -0.016, 0.014, 0.004, -0.02, 0.008];
const xb = 1 / 263.15;
const bent = TEMPS.map((t, i) => ({
  temperatureK: t,
  ratio: Math.exp(1.2 - 800 * (1 / t - xb) + 1600 * Math.max(0, 1 / t - xb) + SCATTER[i]!),
}));
const line = TEMPS.map((t, i) => ({ temperatureK: t, ratio: Math.exp(1500 / t - 3 + SCATTER[i]!) }));

describe('predictiveLnRatio', () => {
  it('when curvature is accepted, then the segmented model is chosen and its predictive distribution names the branch', () => {
    const model = chooseScreenModel(fitEyring(bent), checkCurvature(bent));
    expect(model.kind).toBe('segmented');
    const p = predictiveLnRatio(model, 230);
    const direct = predictSegmented(model.fit as Parameters<typeof predictSegmented>[0], 230);
    expect(p.mean).toBe(direct.lnRatio);
    expect(p.sdNewRun).toBe(direct.seNewRun);
    expect(p.dof).toBe(6); // [C] n − 4 parameters (a, b, δ, break)
    expect(p.branch).toBe('low');
    expect(predictiveLnRatio(model, 350).extrapolated).toBe(true);
  });

  it('when one line is kept, then the predictive distribution is the straight line prediction with n − 2 dof', () => {
    const fit = fitEyring(line);
    const model = chooseScreenModel(fit, checkCurvature(line));
    expect(model.kind).toBe('one-line');
    const p = predictiveLnRatio(model, 250);
    const ref = predictLine(fit.line, 1 / 250);
    expect(p.mean).toBeCloseTo(ref.yHat, 12);
    expect(p.sdNewRun).toBeCloseTo(ref.seNew!, 12);
    expect(p.dof).toBe(8);
    expect(p.branch).toBeNull();
  });

  it('when a new run’s σ(ln r) is given, then it replaces the screen’s scatter in the new-run spread', () => {
    const model = chooseScreenModel(fitEyring(bent), checkCurvature(bent));
    const p = predictiveLnRatio(model, 250, { sigmaNewLnR: 0.1 });
    expect(p.sdNewRun!).toBeCloseTo(Math.sqrt(p.sdMean! ** 2 + 0.01), 12); // [C] variances add
  });
});
