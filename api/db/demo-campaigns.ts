/**
 * Invented temperature screens for the demo project KL-7702 (see demo.ts). Everything here is
 * made up: ligands, solvents, sample ids and numbers. The "measured" ee values come from chosen
 * differentials plus seeded noise, so the seed and the files in samples/ agree and are
 * reproducible.
 *
 * Sign convention (api/science/README.md §1): ΔΔX‡ = X‡(TS→B) − X‡(TS→A), positive favours A, so a positive
 * ΔΔH‡ makes ee rise on cooling (the literature's A-minus-B convention writes it negative).
 */
import { BOLTZMANN_OVER_PLANCK_PER_K_S as KB_OVER_H, GAS_CONSTANT_J_PER_MOL_K as R } from '../science/constants';
import { eeFromLnRatio, kelvinFromCelsius, toSeconds } from '../science/quantities';
import { DEMO_PROJECTS } from './demo';

export const DEMO_CAMPAIGN_PROJECT_ID = DEMO_PROJECTS[0].id;

export interface DemoPoint {
  sampleId: string;
  replicateLabel: string;
  temperatureC: number;
  /** Reported ee (%, one decimal), or % de for a dr campaign; with isLowerBound the assay only says "at least". */
  eePercent: number;
  /** For a dr campaign: the reported dr r (written r:1), one decimal. */
  dr?: number;
  isLowerBound: boolean;
  uncertainty: number;
  conversionPercent: number;
  reactionTimeH: number;
  notes: string | null;
}

export interface DemoCampaign {
  id: string;
  title: string;
  reactionDescription: string;
  productNameA: string;
  productNameB: string;
  /** ee unless given: a dr campaign reports diastereomer ratios. */
  measure?: 'ee' | 'dr';
  assayMethod: 'chiral-hplc' | 'chiral-sfc' | 'nmr';
  defaultUncertainty: number;
  status: 'active' | 'completed';
  notes: string;
  points: DemoPoint[];
}

/** A straight Eyring line (one branch) as the invented truth behind a screen. */
interface Branch {
  ddHJPerMol: number;
  ddSJPerMolK: number;
}

function lnRatio(branch: Branch, temperatureK: number): number {
  return branch.ddHJPerMol / (R * temperatureK) - branch.ddSJPerMolK / R;
}

/** mulberry32: a tiny seeded generator, so the invented noise is the same on every run. */
function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Gaussian noise (Box–Muller), SD `sd`, clipped to ±`clip`. */
function noiseSource(seed: number, sd: number, clip: number): () => number {
  const next = seededRandom(seed);
  return () => {
    const u = Math.max(next(), 1e-12);
    const z = Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * next());
    return Math.max(-clip, Math.min(clip, z * sd));
  };
}

/** First-order conversion after `hours` for an invented main-reaction barrier (Eyring–Polanyi, κ = 1). */
function conversionPercent(temperatureK: number, hours: number): number {
  const dHJPerMol = 52_000;
  const dSJPerMolK = -125;
  const k = KB_OVER_H * temperatureK * Math.exp(dSJPerMolK / R) * Math.exp(-dHJPerMol / (R * temperatureK));
  return 100 * (1 - Math.exp(-k * toSeconds(hours, 'h')));
}

/** Hours a bench chemist might have run: about four half-lives, rounded, at most 48 h. */
function runHours(temperatureK: number): number {
  for (const h of [1, 2, 4, 8, 16, 24, 48]) if (conversionPercent(temperatureK, h) >= 93) return h;
  return 48;
}

/** The assay's quantitation limit for ee: above it only a lower bound is reported (api/science/README.md §3). */
export const EE_REPORTING_LIMIT = 99.8;

function screen(opts: {
  prefix: string;
  temperaturesC: number[];
  replicates: string[];
  truth: (temperatureK: number) => number;
  seed: number;
  noiseSd: number;
  uncertainty: number;
}): DemoPoint[] {
  const noise = noiseSource(opts.seed, opts.noiseSd, 0.3);
  const points: DemoPoint[] = [];
  let n = 0;
  for (const tC of opts.temperaturesC) {
    const tK = kelvinFromCelsius(tC);
    const trueEe = 100 * Math.tanh(opts.truth(tK) / 2);
    const hours = runHours(tK);
    for (const rep of opts.replicates) {
      n += 1;
      // Chromatographic noise sits on the minor peak, so it shrinks as ee approaches 100 %.
      const scale = Math.min(1, (100 - trueEe) / 2);
      let ee = Math.round((trueEe + noise() * scale) * 10) / 10;
      const censored = ee >= EE_REPORTING_LIMIT;
      if (censored) ee = EE_REPORTING_LIMIT;
      points.push({
        sampleId: `${opts.prefix}-${String(n).padStart(3, '0')}`,
        replicateLabel: rep,
        temperatureC: tC,
        eePercent: ee,
        isLowerBound: censored,
        uncertainty: opts.uncertainty,
        conversionPercent: Math.round(conversionPercent(tK, hours) * 10) / 10,
        reactionTimeH: hours,
        notes: censored ? `minor enantiomer below the quantitation limit; reported as ≥ ${EE_REPORTING_LIMIT} % ee` : null,
      });
    }
  }
  return points;
}

/**
 * A dr screen by ¹H NMR: the ratio is read from integrals to about ±3 % relative, so the noise is
 * relative (in ln r); dr is reported to one decimal, and % de kept beside it.
 */
function drScreen(opts: {
  prefix: string;
  temperaturesC: number[];
  truth: Branch;
  seed: number;
  noiseSd: number;
  uncertainty: number;
}): DemoPoint[] {
  const noise = noiseSource(opts.seed, opts.noiseSd, 3 * opts.noiseSd);
  return opts.temperaturesC.map((tC, i) => {
    const tK = kelvinFromCelsius(tC);
    const dr = Math.round(Math.exp(lnRatio(opts.truth, tK) + noise()) * 10) / 10;
    return {
      sampleId: `${opts.prefix}-${String(i + 1).padStart(3, '0')}`,
      replicateLabel: 'a',
      temperatureC: tC,
      eePercent: Math.round(eeFromLnRatio(Math.log(dr)) * 10) / 10,
      dr,
      isLowerBound: false,
      uncertainty: opts.uncertainty,
      // Boron aldols are fast even when cold: full conversion within the invented 2 h everywhere.
      conversionPercent: 98,
      reactionTimeH: 2,
      notes: null,
    };
  });
}

/** The invented truth behind the dr screen: ΔΔH‡ = 5 kJ/mol, ΔΔS‡ = −2 J/(mol·K) (dr about 17:1 at −40 °C). */
const kitePyrDr: Branch = { ddHJPerMol: 5_000, ddSJPerMolK: -2 };

const skylarkMeOH: Branch = { ddHJPerMol: 14_000, ddSJPerMolK: 13 };
const skylarkMeTHF: Branch = { ddHJPerMol: 15_000, ddSJPerMolK: 10 };

/**
 * The Merlin ligand in toluene: two branches meeting at an invented isoinversion temperature of
 * −15 °C (api/science/README.md §4). Above it ΔΔH‡ = +16 kJ/mol, below it −5 kJ/mol: slopes of opposite sign, so the
 * segmented fit claims a real isoinversion, where r (and ee) has a maximum.
 */
const MERLIN_T_INV_K = 258.15;
const MERLIN_LN_R_AT_T_INV = 3.8;
function merlinLnRatio(temperatureK: number): number {
  const ddH = temperatureK >= MERLIN_T_INV_K ? 16_000 : -5_000;
  return MERLIN_LN_R_AT_T_INV + (ddH / R) * (1 / temperatureK - 1 / MERLIN_T_INV_K);
}

/** The two enantiomers every hydrogenation campaign of the demo project names. */
const HYDROGENATION_PRODUCTS = { productNameA: '(S)-KL-7702-A', productNameB: '(R)-KL-7702-A' };

const REACTION =
  'Invented: asymmetric hydrogenation of the enamide KL-7702-E (0.5 M, 5 bar H₂, 0.5 mol % rhodium precatalyst) to the (S)-amide KL-7702-A.';

export const DEMO_CAMPAIGNS: DemoCampaign[] = [
  {
    id: '6d1f0c4e-2a51-4c0e-9d7b-00000c7702a1',
    title: 'Skylark ligand in methanol: temperature screen',
    reactionDescription: `${REACTION} Ligand: the Skylark ligand (invented); solvent methanol.`,
    ...HYDROGENATION_PRODUCTS,
    assayMethod: 'chiral-hplc',
    defaultUncertainty: 0.3,
    status: 'completed',
    notes: 'Invented demo data. Six temperatures from 40 to −20 °C in duplicate; internal temperature logged.',
    points: screen({
      prefix: 'KL7702-S',
      temperaturesC: [40, 25, 10, 0, -10, -20],
      replicates: ['a', 'b'],
      truth: (t) => lnRatio(skylarkMeOH, t),
      seed: 7702,
      noiseSd: 0.12,
      uncertainty: 0.3,
    }),
  },
  {
    id: '6d1f0c4e-2a51-4c0e-9d7b-00000c7702b2',
    title: 'Merlin ligand in toluene: temperature screen',
    reactionDescription: `${REACTION} Ligand: the Merlin ligand (invented); solvent toluene.`,
    ...HYDROGENATION_PRODUCTS,
    assayMethod: 'chiral-sfc',
    defaultUncertainty: 0.2,
    status: 'active',
    notes: 'Invented demo data from the (invented) partner site. The ee peaks near −15 °C and falls on either side: a broken Eyring plot.',
    points: screen({
      prefix: 'KL7702-M',
      temperaturesC: [40, 25, 10, 0, -10, -20, -30, -40, -50],
      replicates: ['a'],
      truth: merlinLnRatio,
      seed: 5120,
      noiseSd: 0.1,
      uncertainty: 0.2,
    }),
  },
  {
    id: '6d1f0c4e-2a51-4c0e-9d7b-00000c7702c3',
    title: 'Skylark ligand in 2-MeTHF: low-temperature screen',
    reactionDescription: `${REACTION} Ligand: the Skylark ligand (invented); solvent 2-methyltetrahydrofuran.`,
    ...HYDROGENATION_PRODUCTS,
    assayMethod: 'chiral-hplc',
    defaultUncertainty: 0.3,
    status: 'active',
    notes: `Invented demo data. At −60 °C the minor enantiomer is below the quantitation limit: reported as ≥ ${EE_REPORTING_LIMIT} % ee (a lower bound).`,
    points: screen({
      prefix: 'KL7702-T',
      temperaturesC: [25, 0, -20, -40, -60],
      replicates: ['a', 'b'],
      truth: (t) => lnRatio(skylarkMeTHF, t),
      seed: 2026,
      noiseSd: 0.1,
      uncertainty: 0.3,
    }),
  },
  {
    id: '6d1f0c4e-2a51-4c0e-9d7b-00000c7702d4',
    title: 'Kite auxiliary: dr of the KL-7702 aldol step',
    reactionDescription:
      'Invented: boron-mediated aldol addition of the propionyl Kite imide (invented auxiliary) to the aldehyde KL-7702-D in dichloromethane, giving the syn (A) and anti (B) diastereomers.',
    productNameA: 'syn-aldol',
    productNameB: 'anti-aldol',
    measure: 'dr',
    assayMethod: 'nmr',
    defaultUncertainty: 0.03,
    status: 'active',
    notes:
      'Invented demo data. dr from ¹H NMR integrals of the crude mixture at five temperatures; a diastereomer pair, so dr, % de and % major, not ee.',
    points: drScreen({
      prefix: 'KL7702-K',
      temperaturesC: [20, 0, -20, -40, -78],
      truth: kitePyrDr,
      seed: 4711,
      noiseSd: 0.03,
      uncertainty: 0.03,
    }),
  },
];
