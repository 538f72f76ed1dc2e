import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import fc from 'fast-check';
import { testApp } from '../support/app';
import { closeTestKnex } from '../support/db';
import { distributionResponseSchema, erosionResponseSchema, rateResponseSchema } from '../../api/features/calculators/kinetics-schemas';

afterAll(closeTestKnex);

// Exact SI constants (CODATA 2018 [S]); thermochemical calorie 4.184 J (NIST SP 811 [S]).
const KB = 1.380649e-23;
const H = 6.62607015e-34;
const R = 6.02214076e23 * KB;
const KCAL = 4184;
/** Eyring–Polanyi k = (k_B·T/h)·exp(−ΔG‡/RT), κ = 1 (api/science/README.md §6). */
const eyring = (gJPerMol: number, t: number) => ((KB * t) / H) * Math.exp(-gJPerMol / (R * t));

const K = (value: number) => ({ value, unit: 'K' as const });
const C = (value: number) => ({ value, unit: 'C' as const });
const kcal = (value: number) => ({ value, unit: 'kcal/mol' as const });
const kJ = (value: number) => ({ value, unit: 'kJ/mol' as const });
const JK = (value: number) => ({ value, unit: 'J/(mol*K)' as const });

const relClose = (actual: number, expected: number, rel = 1e-9) =>
  expect(Math.abs(actual - expected) / Math.abs(expected), `${actual} vs ${expected}`).toBeLessThan(rel);

const { app } = testApp();
const post = (path: string, body: unknown) =>
  request(app)
    .post(`/api/v1/${path}`)
    .send(body as object);

/** The problem's errors[] paths, after checking it is a problem with the given status. */
async function problemPaths(path: string, body: unknown, status: number): Promise<string[]> {
  const res = await post(path, body);
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
  return (res.body.errors ?? []).map((e: { path: string }) => e.path);
}

// ---------------------------------------------------------------- distribution
const twoPathways = {
  pathways: [
    { label: 'major', barrier: { kind: 'gibbs', dG: kcal(0), temperature: K(298.15) } },
    { label: 'minor', barrier: { kind: 'gibbs', dG: kcal(1), temperature: K(298.15) } },
  ],
  temperatures: { values: [K(298.15), C(-40)] },
};

describe('POST /api/v1/distribution', () => {
  it('when two pathways differ by 1.000 kcal/mol, then their ratio is exp(ΔΔG‡/RT) = 5.408 at 298.15 K', async () => {
    const res = await post('distribution', twoPathways).expect(200);
    const body = distributionResponseSchema.parse(res.body);
    const [at25, atMinus40] = body.points;
    const ratio25 = at25!.percents[0]! / at25!.percents[1]!;
    // [C] api/science/README.md §10: ΔΔG‡ = 1.000 kcal/mol → r = 5.408 at 298.15 K.
    expect(ratio25).toBeCloseTo(5.408, 3);
    // [C] r = exp(ΔΔG‡/RT) at 233.15 K with S‡ = 0 (ΔG‡ the same at every temperature).
    relClose(atMinus40!.percents[0]! / atMinus40!.percents[1]!, Math.exp(KCAL / (R * 233.15)));
    expect(atMinus40!.kelvin).toBeCloseTo(233.15, 12);
    expect(atMinus40!.celsius).toBeCloseTo(-40, 12);
    expect(body.pathways.map((p) => p.label)).toEqual(['major', 'minor']);
    expect(at25!.dr).toBeNull();
    expect(body.groups).toEqual([]);
    expect(body.assumptions.join(' ')).toMatch(/Curtin–Hammett/);
    expect(body.assumptions.join(' ')).toMatch(/S‡ is assumed 0/);
  });

  it('when four pathways form two enantiomer pairs, then group shares, ee per diastereomer and dr follow the Boltzmann weights', async () => {
    const barriers = [
      { h: 40_000, s: -50 },
      { h: 48_000, s: -45 },
      { h: 44_000, s: -48 },
      { h: 47_000, s: -52 },
    ];
    const labels = [
      ['syn-A', 'syn', 'A'],
      ['syn-B', 'syn', 'B'],
      ['anti-A', 'anti', 'A'],
      ['anti-B', 'anti', 'B'],
    ] as const;
    const res = await post('distribution', {
      pathways: barriers.map((b, i) => ({
        label: labels[i]![0],
        diastereomer: labels[i]![1],
        enantiomer: labels[i]![2],
        barrier: { kind: 'activation', dH: { value: b.h / 1000, unit: 'kJ/mol' }, dS: JK(b.s) },
      })),
      temperatures: { from: C(-78), to: C(25), count: 5 },
    }).expect(200);
    const body = distributionResponseSchema.parse(res.body);
    expect(body.groups).toEqual(['syn', 'anti']);
    expect(body.points).toHaveLength(5);
    for (const pt of body.points) {
      const t = pt.kelvin;
      // [C] api/science/README.md §5: pᵢ ∝ exp(−(H‡ᵢ − T·S‡ᵢ)/RT); dr = (p₁ + p₁′)/(p₂ + p₂′); ee₁ = (p₁ − p₁′)/(p₁ + p₁′).
      const w = barriers.map((b) => Math.exp(-(b.h - t * b.s) / (R * t)));
      const sum = w.reduce((a, b) => a + b, 0);
      pt.percents.forEach((percent, i) => relClose(percent, (100 * w[i]!) / sum));
      relClose(pt.groups[0]!.percent, (100 * (w[0]! + w[1]!)) / sum);
      relClose(pt.groups[0]!.eePercent, (100 * (w[0]! - w[1]!)) / (w[0]! + w[1]!));
      relClose(pt.groups[1]!.eePercent, (100 * (w[2]! - w[3]!)) / (w[2]! + w[3]!));
      relClose(pt.dr!, (w[0]! + w[1]!) / (w[2]! + w[3]!));
    }
    // [C] the range is evenly spaced in kelvin with both ends included.
    expect(body.points[0]!.celsius).toBeCloseTo(-78, 10);
    expect(body.points[4]!.celsius).toBeCloseTo(25, 10);
    expect(body.points[2]!.kelvin).toBeCloseTo((195.15 + 298.15) / 2, 10);
    expect(body.definitions.join(' ')).toMatch(/dr = syn : anti/);
  });

  it('when a diastereomer group has no B enantiomer, then 422 names that pathway', async () => {
    const paths = await problemPaths(
      'distribution',
      {
        pathways: [
          { label: 'p1', diastereomer: 'syn', enantiomer: 'A', barrier: { kind: 'gibbs', dG: kJ(0), temperature: K(298) } },
          { label: 'p2', diastereomer: 'syn', enantiomer: 'B', barrier: { kind: 'gibbs', dG: kJ(3), temperature: K(298) } },
          { label: 'p3', diastereomer: 'anti', enantiomer: 'A', barrier: { kind: 'gibbs', dG: kJ(5), temperature: K(298) } },
        ],
        temperatures: { values: [K(298)] },
      },
      422,
    );
    expect(paths).toEqual(['pathways.2.enantiomer']);
  });

  it('when the pathways are too few, too many or share a label, then 400 names the field', async () => {
    expect(await problemPaths('distribution', { ...twoPathways, pathways: twoPathways.pathways.slice(0, 1) }, 400)).toEqual(['pathways']);
    const many = Array.from({ length: 51 }, (_, i) => ({ ...twoPathways.pathways[0], label: `p${i}` }));
    expect(await problemPaths('distribution', { ...twoPathways, pathways: many }, 400)).toEqual(['pathways']);
    const twins = [twoPathways.pathways[0], { ...twoPathways.pathways[1], label: 'major' }];
    expect(await problemPaths('distribution', { ...twoPathways, pathways: twins }, 400)).toEqual(['pathways.1.label']);
  });

  it('when a pathway temperature is at 0 K or below, then 422 names its path', async () => {
    const bad = structuredClone(twoPathways) as { pathways: { barrier: { temperature: unknown } }[] };
    bad.pathways[1]!.barrier.temperature = C(-273.15);
    expect(await problemPaths('distribution', bad, 422)).toEqual(['pathways.1.barrier.temperature.value']);
  });
});

// ---------------------------------------------------------------- rate
const firstOrderBarrier = {
  setup: { order: 'first' },
  basis: { kind: 'gibbs', dG: kcal(15), temperature: K(298.15) },
  temperatures: { values: [K(298.15)] },
};

describe('POST /api/v1/rate', () => {
  it('when ΔG‡ = 15.00 kcal/mol at 298.15 K, then k = 62.83 s⁻¹ and t½ = 11.03 ms', async () => {
    const res = await post('rate', firstOrderBarrier).expect(200);
    const body = rateResponseSchema.parse(res.body);
    const [p] = body.points;
    // [C] api/science/README.md §10: Eyring k for ΔG‡ = 15.00 kcal/mol at 298.15 K is 62.83 s⁻¹ (t½ = 11.03 ms).
    expect(p!.k).toBeCloseTo(62.83, 2);
    expect(p!.halfLife.s * 1000).toBeCloseTo(11.03, 2);
    expect(p!.halfLife.unit).toBe('s');
    // [C] first order: t(X) = −ln(1 − X)/k, default target 95 %.
    relClose(p!.timeToTarget.s, -Math.log(0.05) / eyring(15 * KCAL, 298.15));
    expect(body.targetConversionPercent).toBe(95);
    expect(body.kUnit).toBe('s^-1');
    expect(p!.kObsPerS).toBe(p!.k);
    // [C] Arrhenius Ea = ΔH‡ + RT, with ΔH‡ = ΔG‡ when S‡ = 0.
    relClose(p!.ea['kJ/mol'], (15 * KCAL + R * 298.15) / 1000);
    expect(p!.dG['kcal/mol']).toBeCloseTo(15, 12);
    expect(body.activation.source).toBe('given');
    expect(body.assumptions.join(' ')).toMatch(/ΔS‡ assumed 0/);
    expect(body.caution).toMatch(/calorimetry/);
    expect(body.caution).toMatch(/local codes/);
    expect(body.sensitivity).toBeNull();
  });

  it('when one run reached 95 % in 4 h at 0 °C and ΔH‡ is assumed, then 0 °C takes 4 h and the ±10 kJ/mol times bracket the answer', async () => {
    const res = await post('rate', {
      setup: { order: 'first' },
      basis: { kind: 'one-run', run: { conversionPercent: 95, time: { value: 4, unit: 'h' }, temperature: C(0) }, assumedDH: kJ(60) },
      targetConversionPercent: 95,
      temperatures: { values: [C(0), C(20), C(-20)] },
    }).expect(200);
    const body = rateResponseSchema.parse(res.body);
    const [at0, at20, atMinus20] = body.points;
    // [C] same conversion at the run temperature takes the run's time.
    relClose(at0!.timeToTarget.s, 4 * 3600, 1e-12);
    expect(at0!.timeToTarget.unit).toBe('h');
    expect(at0!.timeToTarget.text).toBe('4 h');
    // [C] with ΔH‡ and ΔS‡ constant: k(T) = k(T₀)·(T/T₀)·exp(−ΔH‡/R·(1/T − 1/T₀)).
    const kRun = -Math.log(0.05) / (4 * 3600);
    const kAt = (t: number, h: number) => kRun * (t / 273.15) * Math.exp((-h / R) * (1 / t - 1 / 273.15));
    relClose(at20!.k, kAt(293.15, 60_000));
    relClose(atMinus20!.timeToTarget.s, -Math.log(0.05) / kAt(253.15, 60_000));
    relClose(body.runs[0]!.k, kRun);
    expect(body.activation.source).toBe('assumed');
    expect(body.activation.dH['kJ/mol']).toBeCloseTo(60, 12);
    expect(body.assumptions.join(' ')).toMatch(/assumed 60\.0 kJ\/mol/);
    const [low, high] = body.sensitivity!.variants;
    expect(low!.dH['kJ/mol']).toBeCloseTo(50, 12);
    expect(high!.dH['kJ/mol']).toBeCloseTo(70, 12);
    relClose(low!.points![1]!.timeToTarget.s, -Math.log(0.05) / kAt(293.15, 50_000));
    relClose(high!.points![1]!.timeToTarget.s, -Math.log(0.05) / kAt(293.15, 70_000));
    relClose(high!.points![0]!.timeToTarget.s, 4 * 3600, 1e-12);
    // A steeper ΔH‡ makes warming faster and cooling slower than the assumption.
    expect(high!.points![1]!.timeToTarget.s).toBeLessThan(at20!.timeToTarget.s);
    expect(high!.points![2]!.timeToTarget.s).toBeGreaterThan(atMinus20!.timeToTarget.s);
  });

  it('when two second-order runs are built from ΔH‡ = 70 kJ/mol and ΔS‡ = −40 J/(mol·K), then the endpoint recovers them', async () => {
    const c0 = 0.5;
    const x = 0.8;
    // [C] second order, equal c₀: t = X/[k·c₀·(1 − X)] with Eyring k from the chosen ΔH‡ and ΔS‡.
    const timeAt = (t: number) => x / (eyring(70_000 - t * -40, t) * c0 * (1 - x));
    const run = (t: number) => ({ conversionPercent: 80, time: { value: timeAt(t) / 60, unit: 'min' }, temperature: K(t) });
    const res = await post('rate', {
      setup: { order: 'second', initial: { value: c0, unit: 'mol/L' } },
      basis: { kind: 'two-runs', runs: [run(273.15), run(303.15)] },
      targetConversionPercent: 80,
      temperatures: { values: [K(288.15)] },
    }).expect(200);
    const body = rateResponseSchema.parse(res.body);
    relClose(body.activation.dH['kJ/mol'], 70, 1e-9);
    relClose(body.activation.dS['J/(mol*K)'], -40, 1e-8);
    // [C] thermochemical calorie: −40 J/(mol·K) = −9.560 cal/(mol·K).
    relClose(body.activation.dS['cal/(mol*K)'], -40 / 4.184, 1e-8);
    // [C] Ea = ΔH‡ + RT at the mean run temperature.
    relClose(body.activation.ea['kJ/mol'], (70_000 + R * 288.15) / 1000, 1e-9);
    expect(body.activation.ea.kelvin).toBeCloseTo(288.15, 10);
    expect(body.activation.source).toBe('derived');
    expect(body.kUnit).toBe('L/(mol*s)');
    relClose(body.points[0]!.timeToTarget.s, timeAt(288.15), 1e-8);
    // [C] second-order half-life 1/(k·c₀).
    relClose(body.points[0]!.halfLife.s, 1 / (eyring(70_000 + 288.15 * 40, 288.15) * c0), 1e-8);
    expect(body.points[0]!.kObsPerS).toBeNull();
  });

  it('when a pseudo-first-order excess is only 5-fold, then k_obs = k·[B]₀ and a warning says so', async () => {
    const res = await post('rate', {
      ...firstOrderBarrier,
      setup: { order: 'pseudo-first', limiting: { value: 0.1, unit: 'mol/L' }, excess: { value: 0.5, unit: 'mol/L' } },
      basis: { kind: 'activation', dH: kJ(55), dS: JK(-60) },
    }).expect(200);
    const body = rateResponseSchema.parse(res.body);
    // [C] Eyring with ΔG‡ = ΔH‡ − TΔS‡; pseudo-first k_obs = k₂·[B]₀.
    relClose(body.points[0]!.k, eyring(55_000 + 298.15 * 60, 298.15));
    relClose(body.points[0]!.kObsPerS!, 0.5 * body.points[0]!.k);
    expect(body.warnings.map((w) => w.code)).toContain('excess-below-tenfold');
    expect(body.kUnit).toBe('L/(mol*s)');
  });

  it('when the temperatures lie far from the one run, then a warning says the result is an extrapolation', async () => {
    const res = await post('rate', {
      setup: { order: 'first' },
      basis: { kind: 'one-run', run: { conversionPercent: 50, time: { value: 1, unit: 'h' }, temperature: C(25) }, assumedDH: kJ(70) },
      temperatures: { values: [C(-60)] },
    }).expect(200);
    expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('far-from-anchor');
  });

  it('when a field is missing, has the wrong unit or is a string, then 400 names its path', async () => {
    expect(await problemPaths('rate', { ...firstOrderBarrier, basis: undefined }, 400)).toEqual(['basis']);
    const wrongUnit = { ...firstOrderBarrier, basis: { ...firstOrderBarrier.basis, dG: { value: 15, unit: 'kcal' } } };
    expect(await problemPaths('rate', wrongUnit, 400)).toEqual(['basis.dG.unit']);
    const stringValue = { ...firstOrderBarrier, basis: { ...firstOrderBarrier.basis, dG: { value: '15', unit: 'kcal/mol' } } };
    expect(await problemPaths('rate', stringValue, 400)).toEqual(['basis.dG.value']);
    expect(await problemPaths('rate', { ...firstOrderBarrier, targetConversionPercent: 100 }, 400)).toEqual(['targetConversionPercent']);
    const badRangeUnit = { ...firstOrderBarrier, temperatures: { from: C(0), to: { value: 10, unit: 'R' }, count: 3 } };
    expect(await problemPaths('rate', badRangeUnit, 400)).toEqual(['temperatures.to.unit']);
    const noConcentration = { ...firstOrderBarrier, setup: { order: 'second' } };
    expect(await problemPaths('rate', noConcentration, 400)).toEqual(['setup.initial']);
  });

  it('when there are more than 5000 temperatures, then 400 names the list', async () => {
    const values = Array.from({ length: 5001 }, (_, i) => K(200 + i * 0.01));
    expect(await problemPaths('rate', { ...firstOrderBarrier, temperatures: { values } }, 400)).toEqual(['temperatures.values']);
    // 5000 is still accepted.
    const res = await post('rate', { ...firstOrderBarrier, temperatures: { values: values.slice(0, 5000) } }).expect(200);
    expect(res.body.points).toHaveLength(5000);
  });

  it('when a temperature is at or below 0 K, then 422 names the request path', async () => {
    const coldBasis = { ...firstOrderBarrier, basis: { ...firstOrderBarrier.basis, temperature: C(-300) } };
    expect(await problemPaths('rate', coldBasis, 422)).toEqual(['basis.temperature.value']);
    const coldList = { ...firstOrderBarrier, temperatures: { values: [K(298.15), K(0)] } };
    expect(await problemPaths('rate', coldList, 422)).toEqual(['temperatures.values.1.value']);
    const coldRun = {
      setup: { order: 'first' },
      basis: {
        kind: 'one-run',
        run: { conversionPercent: 50, time: { value: 1, unit: 'h' }, temperature: { value: -500, unit: 'F' } },
        assumedDH: kJ(70),
      },
      temperatures: { values: [K(298.15)] },
    };
    expect(await problemPaths('rate', coldRun, 422)).toEqual(['basis.run.temperature.value']);
  });

  it('when the two runs share a temperature, or the barrier is too high to give any rate, then 422 names the field', async () => {
    const run = { conversionPercent: 50, time: { value: 1, unit: 'h' }, temperature: C(20) };
    const same = { setup: { order: 'first' }, basis: { kind: 'two-runs', runs: [run, run] }, temperatures: { values: [C(20)] } };
    expect(await problemPaths('rate', same, 422)).toEqual(['basis.runs.1.temperature.value']);
    // [C] exp(−1255 kJ/mol ÷ (R·10 K)) underflows to zero in double precision.
    const frozen = {
      ...firstOrderBarrier,
      basis: { ...firstOrderBarrier.basis, dG: kcal(300) },
      temperatures: { values: [K(298.15), K(10)] },
    };
    expect(await problemPaths('rate', frozen, 422)).toEqual(['temperatures.values.1.value']);
  });

  it('when the body is over 1 MB, then 413', async () => {
    const res = await post('rate', { ...firstOrderBarrier, padding: 'x'.repeat(1_100_000) });
    expect(res.status).toBe(413);
  });
});

// ---------------------------------------------------------------- erosion
const racemization = {
  barrier: { kind: 'gibbs', dG: kcal(25), temperature: C(25) },
  initialEePercent: 99,
  hold: { value: 2, unit: 'h' },
  eeFloorPercent: 98,
  temperatures: { values: [C(25), C(60)] },
};

describe('POST /api/v1/erosion', () => {
  it('when a 25 kcal/mol barrier is held 2 h, then k_rac = 2k_e, t½(ee) = ln2/(2k_e) and ee decays as exp(−2k_e·t)', async () => {
    const res = await post('erosion', racemization).expect(200);
    const body = erosionResponseSchema.parse(res.body);
    expect(body.model).toBe('racemization');
    for (const p of body.points) {
      // [C] api/science/README.md §6–7: k_e from Eyring (S‡ = 0 so ΔG‡ is the same at every T); ee(t) = ee₀·exp(−2k_e·t).
      const ke = eyring(25 * KCAL, p.kelvin);
      relClose(p.kePerS, ke);
      relClose(p.kRacPerS!, 2 * ke);
      relClose(p.eeHalfLife.s, Math.LN2 / (2 * ke));
      relClose(p.eeAfterHoldPercent!, 99 * Math.exp(-2 * ke * 7200));
      relClose(p.longestHold!.s, Math.log(99 / 98) / (2 * ke));
      expect(p.floorStatus).toBe('above');
    }
    // Warmer is faster.
    expect(body.points[1]!.eeHalfLife.s).toBeLessThan(body.points[0]!.eeHalfLife.s);
    // [M: LaPlante et al., J. Med. Chem. 2011, 54, 7005] 20–30 kcal/mol at 37 °C is class 2.
    expect(body.atropisomerClass.class).toBe(2);
    expect(body.atropisomerClass.kelvin).toBeCloseTo(310.15, 12);
    expect(body.atropisomerClass.source).toMatch(/^LaPlante.*J\. Med\. Chem\. 2011, 54, 7005/); // [S] the published classes, cited in full
    expect(body.atropisomerClass.source).not.toMatch(/memory|verify/);
    relClose(body.atropisomerClass.eeHalfLife.s, Math.LN2 / (2 * eyring(25 * KCAL, 310.15)));
    expect(body.definitions.join(' ')).toMatch(/k_rac = 2k_e/);
    expect(body.definitions.join(' ')).toMatch(/ln 2\/\(2k_e\)/);
    expect(body.caution).toMatch(/calorimetry/);
  });

  it('when the barrier is below 20 or at least 30 kcal/mol at 37 °C, then the class is 1 or 3', async () => {
    const classOf = async (dH: number, dS: number) =>
      (
        await post('erosion', {
          ...racemization,
          barrier: { kind: 'activation', dH: kcal(dH), dS: { value: dS, unit: 'cal/(mol*K)' } },
        }).expect(200)
      ).body.atropisomerClass;
    // [M: LaPlante et al., J. Med. Chem. 2011, 54, 7005] below 20 kcal/mol → class 1; 30 or more → class 3.
    // [C] ΔG‡(310.15 K) = ΔH‡ − T·ΔS‡: 17 − 310.15·(−0.005) = 18.55 kcal/mol; 30 − 310.15·(−0.002) = 30.62 kcal/mol.
    const low = await classOf(17, -5);
    expect(low.class).toBe(1);
    expect(low.dG['kcal/mol']).toBeCloseTo(18.55075, 9);
    expect((await classOf(30, -2)).class).toBe(3);
  });

  it('when an equilibrium ratio of 1 is given, then epimerization reproduces racemization', async () => {
    const rac = erosionResponseSchema.parse((await post('erosion', racemization).expect(200)).body);
    const epi = erosionResponseSchema.parse((await post('erosion', { ...racemization, equilibriumRatio: 1 }).expect(200)).body);
    expect(epi.model).toBe('epimerization');
    expect(epi.equilibrium).toEqual({ ratio: 1, excessPercent: 0 });
    epi.points.forEach((p, i) => {
      const r = rac.points[i]!;
      // [C] with K = 1: k_f + k_r = 2k_e, so every time and ee agrees.
      relClose(p.kRelaxationPerS, r.kRacPerS!);
      relClose(p.eeHalfLife.s, r.eeHalfLife.s);
      relClose(p.eeAfterHoldPercent!, r.eeAfterHoldPercent!);
      relClose(p.longestHold!.s, r.longestHold!.s);
      expect(p.kRacPerS).toBeNull();
    });
  });

  it('when epimerization runs towards K = 3, then the excess relaxes to −50 % at rate k_f·(1 + 1/K)', async () => {
    const res = await post('erosion', {
      barrier: { kind: 'activation', dH: kJ(95), dS: JK(-10) },
      initialEePercent: 90,
      hold: { value: 30, unit: 'min' },
      eeFloorPercent: 60,
      equilibriumRatio: 3,
      temperatures: { values: [C(40)] },
    }).expect(200);
    const body = erosionResponseSchema.parse(res.body);
    const [p] = body.points;
    // [C] api/science/README.md §7: x_A,eq = 1/(1 + K); excess e(t) = e_eq + (e₀ − e_eq)·exp(−(k_f + k_r)·t), k_r = k_f/K.
    const kf = eyring(95_000 + 313.15 * 10, 313.15);
    const lambda = kf * (1 + 1 / 3);
    expect(body.equilibrium!.excessPercent).toBeCloseTo(-50, 12);
    relClose(p!.kePerS, kf);
    relClose(p!.kReversePerS, kf / 3);
    relClose(p!.eeAfterHoldPercent!, -50 + 140 * Math.exp(-lambda * 1800));
    relClose(p!.eeHalfLife.s, Math.LN2 / lambda);
    relClose(p!.longestHold!.s, Math.log(140 / 110) / lambda);
    expect(body.definitions.join(' ')).toMatch(/de/);
  });

  it('when the floor lies below the equilibrium excess, then the floor is never reached and no hold limit is given', async () => {
    const res = await post('erosion', { ...racemization, equilibriumRatio: 0.25, eeFloorPercent: 50 }).expect(200);
    // [C] K = 0.25 → e_eq = 100·(1 − K)/(1 + K) = 60 %, above the 50 % floor.
    expect(res.body.equilibrium.excessPercent).toBeCloseTo(60, 12);
    expect(res.body.points[0].floorStatus).toBe('never-reached');
    expect(res.body.points[0].longestHold).toBeNull();
    expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('floor-below-equilibrium');
  });

  it('when the floor is at or above the initial ee, then the longest hold is 0 and a warning says so', async () => {
    const res = await post('erosion', { ...racemization, eeFloorPercent: 99.5 }).expect(200);
    expect(res.body.points[0].longestHold.s).toBe(0);
    expect(res.body.points[0].floorStatus).toBe('already-below');
    expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('floor-not-below-initial');
  });

  it('when inputs are out of range, then 400 or 422 names the field', async () => {
    expect(await problemPaths('erosion', { ...racemization, initialEePercent: 120 }, 400)).toEqual(['initialEePercent']);
    expect(await problemPaths('erosion', { ...racemization, equilibriumRatio: 0 }, 400)).toEqual(['equilibriumRatio']);
    expect(await problemPaths('erosion', { ...racemization, hold: { value: 2, unit: 'weeks' } }, 400)).toEqual(['hold.unit']);
    expect(await problemPaths('erosion', { ...racemization, barrier: { kind: 'activation', dH: kJ(90) } }, 400)).toEqual(['barrier.dS']);
    const atZero = { ...racemization, barrier: { ...racemization.barrier, temperature: K(0) } };
    expect(await problemPaths('erosion', atZero, 422)).toEqual(['barrier.temperature.value']);
    expect(await problemPaths('erosion', { ...racemization, temperatures: { from: K(-5), to: K(300), count: 4 } }, 422)).toEqual([
      'temperatures.from.value',
    ]);
  });
});

// ---------------------------------------------------------------- robustness and description
describe('kinetics endpoints, any body', () => {
  /** Every leaf path of a JSON value. */
  const leaves = (v: unknown, path: (string | number)[] = []): (string | number)[][] =>
    v !== null && typeof v === 'object'
      ? Object.entries(v).flatMap(([k, x]) => leaves(x, [...path, Array.isArray(v) ? Number(k) : k]))
      : [path];
  const withLeaf = (body: unknown, path: (string | number)[], value: unknown) => {
    const copy = structuredClone(body) as Record<string | number, unknown>;
    let at = copy;
    for (const key of path.slice(0, -1)) at = at[key] as Record<string | number, unknown>;
    at[path[path.length - 1]!] = value;
    return copy;
  };
  const valid = {
    distribution: twoPathways,
    rate: {
      setup: { order: 'pseudo-first', limiting: { value: 0.1, unit: 'mol/L' }, excess: { value: 2, unit: 'mol/L' } },
      basis: { kind: 'one-run', run: { conversionPercent: 90, time: { value: 3, unit: 'h' }, temperature: C(-10) }, assumedDH: kJ(50) },
      temperatures: { from: C(-40), to: C(20), count: 4 },
    },
    erosion: { ...racemization, equilibriumRatio: 2 },
  };

  it('when any one field of a valid body is replaced by arbitrary JSON, then the answer is 200, 400 or 422, never a 500', async () => {
    for (const [endpoint, body] of Object.entries(valid)) {
      const paths = leaves(body);
      await fc.assert(
        fc.asyncProperty(
          fc.nat(paths.length - 1),
          fc.oneof(fc.jsonValue(), fc.double(), fc.constantFrom(-1e308, 1e308, -273.16, 0, 5e-324)),
          async (i, value) => {
            const res = await post(endpoint, withLeaf(body, paths[i]!, value));
            expect([200, 400, 422], `${endpoint} ${paths[i]!.join('.')} = ${JSON.stringify(value)}: ${JSON.stringify(res.body)}`).toContain(
              res.status,
            );
            if (res.status !== 200) expect(res.body.errors.length).toBeGreaterThan(0);
          },
        ),
        { numRuns: 60 },
      );
    }
  });

  it('when the API description is fetched, then it documents the three kinetics endpoints', async () => {
    const res = await request(app).get('/api/v1/openapi.json').expect(200);
    for (const path of ['/api/v1/distribution', '/api/v1/rate', '/api/v1/erosion']) {
      expect(res.body.paths[path].post.responses['422']).toBeDefined();
      expect(res.body.paths[path].post.requestBody.content['application/json'].schema).toBeDefined();
    }
    expect(res.body.components.schemas.RateRequest).toBeDefined();
  });
});

describe('distribution size guard', () => {
  it('when pathways × temperatures exceeds the cap, then 400 names temperatures and says why', async () => {
    const { app } = testApp();
    const pathways = Array.from({ length: 10 }, (_, i) => ({
      label: `p${i}`,
      barrier: { kind: 'gibbs', dG: { value: i, unit: 'kJ/mol' }, temperature: { value: 25, unit: 'C' } },
    }));
    const res = await request(app)
      .post('/api/v1/distribution')
      .send({ pathways, temperatures: { from: { value: 0, unit: 'C' }, to: { value: 50, unit: 'C' }, count: 2001 } })
      .expect(400);
    expect(res.body.errors[0]).toMatchObject({ path: 'temperatures', message: expect.stringContaining('10 × 2001') });
  });
});
