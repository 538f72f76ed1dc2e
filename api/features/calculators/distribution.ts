/** POST /api/v1/distribution: product shares, ee per diastereomer and dr over temperature from competing pathways. */
import { productDistribution } from '../../science';
import type { DistributionRequest, DistributionResponse } from './kinetics-schemas';
import { expandTemperatures } from './temperatures';
import { toBarrierSpec, relabel, temperatureRule, barrierRule } from './kinetics-fields';

/** Percent of each product, per diastereomer group and its ee, and dr, over temperature (api/science/README.md §5). */
export function computeDistribution(req: DistributionRequest): DistributionResponse {
  const temps = expandTemperatures(req.temperatures);
  const pathways = req.pathways.map((p, i) => ({
    id: p.label,
    barrier: toBarrierSpec(p.barrier, `pathways.${i}.barrier`),
    diastereomer: p.diastereomer,
    enantiomer: p.enantiomer,
  }));
  const result = relabel(
    () => productDistribution(pathways, temps.kelvins),
    [
      temperatureRule(temps),
      barrierRule('pathways\\[(\\d+)\\]\\.barrier', (m) => `pathways.${m[1]}.barrier`),
      [/^pathways\[(\d+)\]\.(diastereomer|enantiomer)$/, (m) => `pathways.${m[1]}.${m[2]}`],
    ],
    'pathways',
  );
  const groups = result.points[0]?.groups.map((g) => g.group) ?? [];
  const definitions = ['Each pathway’s share is the percentage of all product formed through it under kinetic control.'];
  if (groups.length > 0) {
    definitions.push('ee of a diastereomer = (A − B)/(A + B) × 100 within its group: positive when the pathway marked A wins.');
  }
  if (groups.length === 2) definitions.push(`dr = ${groups[0]} : ${groups[1]}, given as the number r of r:1.`);
  return {
    pathways: req.pathways.map((p) => ({ label: p.label, diastereomer: p.diastereomer ?? null, enantiomer: p.enantiomer ?? null })),
    groups,
    points: result.points.map((pt) => ({
      kelvin: pt.temperatureK,
      celsius: pt.celsius,
      percents: pt.percents,
      groups: pt.groups.map((g) => ({ diastereomer: g.group, percent: g.percent, eePercent: g.eePercent })),
      dr: pt.diastereomerRatio,
    })),
    definitions,
    assumptions: result.assumptions,
  };
}
