import { describe, expect, it } from 'vitest';
import { GAS_CONSTANT_J_PER_MOL_K as R } from '../../../api/science/constants';
import { productDistribution } from '../../../api/science/distribution';
import { ratioFromDdG } from '../../../api/science/selectivity';
import { domainErrorOf, expectAllFinite } from './helpers';

describe('productDistribution', () => {
  it('when there are two pathways, then it reduces to the two-pathway formula %A = 100·r/(1 + r)', () => {
    const res = productDistribution(
      [
        { id: 'A', barrier: { kind: 'gibbs', gJPerMol: 0, temperatureK: 298.15 } },
        { id: 'B', barrier: { kind: 'gibbs', gJPerMol: 4184, temperatureK: 298.15 } },
      ],
      [298.15, 250],
    );
    const r = ratioFromDdG(4184, 298.15); // [C] api/science/README.md §1, ΔΔG‡ = G‡(B) − G‡(A)
    expect(res.points[0]!.percents[0]).toBeCloseTo((100 * r) / (1 + r), 10); // [C]
    expect(res.points[1]!.percents[0]! / res.points[1]!.percents[1]!).toBeCloseTo(ratioFromDdG(4184, 250), 8); // [C] ΔS‡ = 0 assumed
    expect(res.assumptions.join(' ')).toMatch(/Curtin–Hammett/);
  });

  it('when H‡ and S‡ are given, then G‡(T) = H‡ − T·S‡ is used', () => {
    const res = productDistribution(
      [
        { id: 'A', barrier: { kind: 'enthalpy-entropy', hJPerMol: 50_000, sJPerMolK: -20 } },
        { id: 'B', barrier: { kind: 'enthalpy-entropy', hJPerMol: 55_000, sJPerMolK: -5 } },
      ],
      [300],
    );
    const ddG = 55_000 + 300 * 5 - (50_000 + 300 * 20); // [C] 50500 − 56000 = −5500: B favoured
    expect(res.points[0]!.percents[1]! / res.points[0]!.percents[0]!).toBeCloseTo(Math.exp(-ddG / (R * 300)), 8); // [C] r = exp(−ΔΔG‡/RT) for B over A
  });

  it('when four pathways form two enantiomer pairs, then dr and each ee follow api/science/README.md §5', () => {
    const g = [0, 3000, 2000, 6000]; // invented demo barriers, J/mol
    const res = productDistribution(
      [
        { id: '1', barrier: { kind: 'gibbs', gJPerMol: g[0]!, temperatureK: 273.15 }, diastereomer: 'syn', enantiomer: 'A' },
        { id: "1'", barrier: { kind: 'gibbs', gJPerMol: g[1]!, temperatureK: 273.15 }, diastereomer: 'syn', enantiomer: 'B' },
        { id: '2', barrier: { kind: 'gibbs', gJPerMol: g[2]!, temperatureK: 273.15 }, diastereomer: 'anti', enantiomer: 'A' },
        { id: "2'", barrier: { kind: 'gibbs', gJPerMol: g[3]!, temperatureK: 273.15 }, diastereomer: 'anti', enantiomer: 'B' },
      ],
      [273.15],
    );
    const w = g.map((v) => Math.exp(-v / (R * 273.15)));
    const sum = w.reduce((a, b) => a + b, 0);
    const p = w.map((v) => v / sum); // [C] Boltzmann weights, api/science/README.md §5
    const pt = res.points[0]!;
    p.forEach((v, i) => expect(pt.percents[i]!).toBeCloseTo(100 * v, 10)); // [C] api/science/README.md §5 Boltzmann weights
    expect(pt.diastereomerRatio!).toBeCloseTo((p[0]! + p[1]!) / (p[2]! + p[3]!), 10); // [C] dr = (p1 + p1′)/(p2 + p2′)
    expect(pt.groups[0]!.group).toBe('syn');
    expect(pt.groups[0]!.eePercent).toBeCloseTo((100 * (p[0]! - p[1]!)) / (p[0]! + p[1]!), 10); // [C] ee of diastereomer 1
    expect(pt.groups[1]!.eePercent).toBeCloseTo((100 * (p[2]! - p[3]!)) / (p[2]! + p[3]!), 10); // [C]
    expect(pt.groups[0]!.percent + pt.groups[1]!.percent).toBeCloseTo(100, 10);
  });

  it('when barriers are huge and far apart, then log-sum-exp keeps every number finite', () => {
    const res = productDistribution(
      [
        { id: 'a', barrier: { kind: 'gibbs', gJPerMol: 5e6, temperatureK: 300 } },
        { id: 'b', barrier: { kind: 'gibbs', gJPerMol: 5e6 + 1000, temperatureK: 300 } },
        { id: 'c', barrier: { kind: 'gibbs', gJPerMol: 9e6, temperatureK: 300 } },
      ],
      [50, 300],
    );
    expectAllFinite(res);
    expect(res.points[1]!.percents[0]! / res.points[1]!.percents[1]!).toBeCloseTo(Math.exp(1000 / (R * 300)), 8); // [C]
    expect(res.points[1]!.percents[2]).toBe(0);
  });

  it('when fewer than two pathways or an unpaired enantiomer mapping are given, then DomainError', () => {
    expect(
      domainErrorOf(() => productDistribution([{ id: 'a', barrier: { kind: 'gibbs', gJPerMol: 0, temperatureK: 300 } }], [300])).code,
    ).toBe('too-few-pathways');
    expect(
      domainErrorOf(() =>
        productDistribution(
          [
            { id: 'a', barrier: { kind: 'gibbs', gJPerMol: 0, temperatureK: 300 }, diastereomer: 'x', enantiomer: 'A' },
            { id: 'b', barrier: { kind: 'gibbs', gJPerMol: 0, temperatureK: 300 } },
          ],
          [300],
        ),
      ).field,
    ).toBe('pathways[1].diastereomer');
  });
});
