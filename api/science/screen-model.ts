/**
 * The model a screen's forecasts come from: one straight Eyring line, or the continuous
 * two-branch (segmented) model when the break test accepts curvature (see segmented.ts).
 * `predictiveLnRatio` is the one place that answers "what ln r do we expect at T, and how
 * uncertain is it" for either model, so forecasts, saved forecasts and planning agree.
 */
import type { EyringFit } from './eyring-fit';
import { predictLine } from './regression';
import { predictSegmented, type BreakCheck, type SegmentedFit } from './segmented';

export type ScreenModel = { kind: 'one-line'; fit: EyringFit } | { kind: 'segmented'; fit: SegmentedFit };

/** The segmented model when the break test accepted it, else the straight line. */
export function chooseScreenModel(line: EyringFit, check: BreakCheck | null): ScreenModel {
  return check?.checked && check.preferred === 'two-branch' ? { kind: 'segmented', fit: check } : { kind: 'one-line', fit: line };
}

/**
 * Predictive distribution of ln r at T: Student t with `dof` degrees of freedom (normal when
 * `dof` is Infinity, i.e. σ taken as absolute), centre `mean`, scale `sdMean` for the fitted curve
 * and `sdNewRun` for one new run. Null scales mean the data cannot give an uncertainty.
 */
export interface LnRatioPredictive {
  model: ScreenModel['kind'];
  temperatureK: number;
  mean: number;
  sdMean: number | null;
  sdNewRun: number | null;
  dof: number;
  /** Which branch covers T under the segmented model ('low' = colder than the break); null for one line. */
  branch: 'low' | 'high' | null;
  /** T lies outside the screened temperatures. */
  extrapolated: boolean;
}

/** Predictive distribution of ln r at `temperatureK` under the chosen model. */
export function predictiveLnRatio(model: ScreenModel, temperatureK: number, options: { sigmaNewLnR?: number } = {}): LnRatioPredictive {
  if (model.kind === 'segmented') {
    const p = predictSegmented(model.fit, temperatureK, options.sigmaNewLnR);
    return {
      model: 'segmented',
      temperatureK,
      mean: p.lnRatio,
      sdMean: p.seMean,
      sdNewRun: p.seNewRun,
      dof: p.dof,
      branch: p.branch,
      extrapolated: p.extrapolated,
    };
  }
  const { line, temperatureRangeK, intervalsAvailable } = model.fit;
  const p = predictLine(line, 1 / temperatureK, 0.95, options.sigmaNewLnR === undefined ? {} : { sigmaNew: options.sigmaNewLnR });
  return {
    model: 'one-line',
    temperatureK,
    mean: p.yHat,
    sdMean: intervalsAvailable ? p.seMean : null,
    sdNewRun: intervalsAvailable ? p.seNew : null,
    dof: line.sigmaMode === 'absolute' ? Infinity : line.dof,
    branch: null,
    extrapolated: temperatureK < temperatureRangeK.min - 1e-9 || temperatureK > temperatureRangeK.max + 1e-9,
  };
}
