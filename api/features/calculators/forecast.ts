/** POST /api/v1/forecast: selectivity over temperature from ΔΔH‡/ΔΔS‡, a ΔΔG‡ or one observed selectivity. */
import { SIGN_CONVENTION, forecastSelectivity, parseSelectivity, type ForecastBasis, type SelectivityInput } from '../../science';
import { SELECTIVITY_CAUTION } from '../../lib/cautions';
import { ddGOut, finiteConversion, toJPerMol, toJPerMolK, toK, withRequestPaths, zeroSelectivity } from './request-units';
import { expandTemperatures } from './temperatures';
import type { ForecastRequest, ForecastResponse } from './schemas';

const outsideRange = (t: number, ks: readonly number[]) => ks.length === 0 || t < Math.min(...ks) - 1e-9 || t > Math.max(...ks) + 1e-9;

export function runForecast(req: ForecastRequest): ForecastResponse {
  const { basis } = req;
  let engineBasis: ForecastBasis;
  switch (basis.kind) {
    case 'activation':
      engineBasis = {
        kind: 'enthalpy-entropy',
        ddHJPerMol: toJPerMol(basis.ddH, 'basis.ddH'),
        ddSJPerMolK: toJPerMolK(basis.ddS, 'basis.ddS'),
      };
      break;
    case 'gap':
      engineBasis = {
        kind: 'gap-at-temperature',
        ddGJPerMol: toJPerMol(basis.ddG, 'basis.ddG'),
        temperatureK: toK(basis.temperature, 'basis.temperature'),
        ...(basis.ddS ? { ddSJPerMolK: toJPerMolK(basis.ddS, 'basis.ddS') } : {}),
      };
      break;
    case 'observed': {
      const selectivity: SelectivityInput = basis.selectivity;
      parseSelectivity(selectivity, 'basis.selectivity'); // fail with the request path before the engine does
      engineBasis = {
        kind: 'observed',
        selectivity,
        temperatureK: toK(basis.temperature, 'basis.temperature'),
        ...(basis.ddS ? { ddSJPerMolK: toJPerMolK(basis.ddS, 'basis.ddS') } : {}),
      };
      break;
    }
  }
  const expanded = expandTemperatures(req.temperatures, 'temperatures');
  const temperaturesK = expanded.kelvins.map((k, i) => finiteConversion(k, expanded.pathOf(i)));
  const result = withRequestPaths(
    (field) => {
      const t = /^temperaturesK\[(\d+)\]$/.exec(field);
      if (t) return expanded.pathOf(Number(t[1]));
      const basisPaths: Record<string, string> = {
        'basis.ddHJPerMol': 'basis.ddH.value',
        'basis.ddSJPerMolK': 'basis.ddS.value',
        'basis.ddGJPerMol': 'basis.ddG.value',
        'basis.temperatureK': 'basis.temperature.value',
      };
      return basisPaths[field] ?? null;
    },
    () => forecastSelectivity(engineBasis, temperaturesK),
  );
  return {
    points: result.points.map((p) => ({
      kelvin: p.kelvin,
      celsius: p.celsius,
      ratio: p.ratio,
      eePercent: p.eePercent,
      percentA: p.percentA,
      ddG: ddGOut(p.ddGJPerMol),
    })),
    zeroSelectivity: zeroSelectivity(
      result.zeroSelectivityTemperatureK,
      result.zeroSelectivityTemperatureK !== null && outsideRange(result.zeroSelectivityTemperatureK, temperaturesK),
    ),
    assumptions: result.assumptions,
    convention: SIGN_CONVENTION,
    caution: SELECTIVITY_CAUTION,
  };
}
