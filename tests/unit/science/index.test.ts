import { describe, expect, it } from 'vitest';
import * as science from '../../../api/science';

describe('public entry point', () => {
  it('when the engine is imported from its index, then the functions the API layer needs are there', () => {
    for (const name of [
      'parseSelectivity',
      'sigmaLnRatio',
      'forecastSelectivity',
      'temperatureList',
      'fitLine',
      'predictLine',
      'fitEyring',
      'predictEyring',
      'ddGAtTemperature',
      'checkCurvature',
      'predictSegmented',
      'chooseScreenModel',
      'predictiveLnRatio',
      'productDistribution',
      'forecastRate',
      'activationFromTwoRuns',
      'erosionForecast',
      'atropisomerClass',
      'energyToJPerMol',
      'temperatureToK',
    ]) {
      expect(typeof (science as Record<string, unknown>)[name], name).toBe('function');
    }
    expect(new science.DomainError('x', 'y', 'z')).toBeInstanceOf(Error);
    expect(science.SIGN_CONVENTION).toBe(science.EYRING_CONVENTION);
  });
});
