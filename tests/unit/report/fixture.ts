/**
 * An invented dr campaign for report tests (no database): runs generated from ΔΔH‡ = 9 kJ/mol and
 * ΔΔS‡ = 4 J/(mol·K) [C] with a fixed zig-zag, one excluded run, one bound, and user text that a
 * spreadsheet would otherwise evaluate.
 */
import type { Campaign } from '../../../api/models/campaign';
import type { Measurement } from '../../../api/models/measurement';
import { computeAnalysis } from '../../../api/features/campaigns/analysis';
import type { SavedForecastView } from '../../../api/features/campaigns/analysis-schemas';
import type { ReportData, ReportMeta } from '../../../api/features/campaigns/report-model';
import type { ComparisonReportData, PlanReportData } from '../../../api/features/plan/report-data';
import { inventedDrRun } from '../../support/report-runs';

export const HOSTILE = ['=HYPERLINK("http://example.test","x")', '+1+2', '-3+4', '@SUM(A1:A2)', '\tTAB', '\rCR'];

export function demoCampaign(overrides: Partial<Campaign> = {}): Campaign {
  return {
    id: '00000000-0000-4000-8000-000000000001',
    projectId: '00000000-0000-4000-8000-000000000002',
    title: 'Aldol screen (invented demo) & co',
    reactionDescription: 'Step 3: boron aldol of the invented ketone KX-7 with isobutyraldehyde',
    productNameA: 'syn-aldol',
    productNameB: 'anti-aldol',
    measure: 'dr',
    assayMethod: 'nmr',
    defaultUncertainty: 0.05,
    status: 'active',
    notes: null,
    version: 3,
    createdByUserId: null,
    createdAt: new Date('2026-11-01T08:00:00Z'),
    updatedAt: new Date('2026-11-02T08:00:00Z'),
    ...overrides,
  } as Campaign;
}

/** `n` runs spread from −78 to +25 °C, stored as dr "a:1". */
export function demoMeasurements(n: number, campaign = demoCampaign()): Measurement[] {
  return Array.from({ length: n }, (_, i) => {
    const celsius = -78 + (103 * (i % 12)) / 11;
    const excluded = i === 3;
    return inventedDrRun(campaign.id, Math.round((celsius + 273.15) * 100) / 100, i % 2 === 0 ? 0.04 : -0.04, {
      id: `00000000-0000-4000-9000-${String(i).padStart(12, '0')}`,
      replicateLabel: i < HOSTILE.length ? HOSTILE[i]! : String.fromCharCode(97 + (i % 3)),
      sampleId: `KX-${i + 1}`,
      reactionTimeS: 7200,
      excluded,
      excludedReason: excluded ? '=1+1 (integration failed)' : null,
      notes: i === 1 ? '@notes' : null,
      sourceRow: null,
      version: 1,
      createdByUserId: null,
      createdAt: new Date('2026-11-01T09:00:00Z'),
      updatedAt: new Date('2026-11-01T09:00:00Z'),
    });
  });
}

export function demoReportData(n = 12, overrides: Partial<ReportData> = {}): ReportData {
  const campaign = demoCampaign();
  const measurements = demoMeasurements(n, campaign);
  const analysis = computeAnalysis(campaign, measurements, {
    weighting: 'none',
    uncertaintyScale: 'absolute',
    confidence: 0.95,
    atK: 243.15,
  });
  const saved: SavedForecastView = {
    id: '00000000-0000-4000-8000-000000000009',
    campaignId: campaign.id,
    temperatureK: 243.15,
    celsius: -30,
    label: '=cmd|calc',
    notes: null,
    createdAt: '2026-11-03T10:00:00.000Z',
    createdBy: { id: 'u', login: 'rvale', displayName: 'R. Vale' },
    result: analysis.at!,
    measured: [],
  };
  return {
    campaign,
    measurements,
    analysis,
    forecasts: [saved],
    project: { name: 'Invented project Heron' },
    specification: { measure: 'dr', minimum: 10 },
    ...overrides,
  };
}

export const demoMeta: ReportMeta = { appVersion: '0.0.0-test', generatedAt: new Date('2026-12-02T04:00:00Z'), exportedBy: 'R. Vale' };

/**
 * An invented saved plan for the dr campaign above: the specification (dr ≥ 10) holds below about
 * −35 °C and an invented time limit rules out everything below −70 °C; a row every 5 °C.
 */
export function demoPlan(): PlanReportData {
  const rows = Array.from({ length: 21 }, (_, i) => {
    const c = -80 + 5 * i;
    const p = 1 / (1 + Math.exp((c + 35) / 5));
    const failing = [p < 0.9 ? 'specification' : '', c < -70 ? 'time' : ''].filter(Boolean).join(', ');
    return {
      celsius: c,
      kelvin: c + 273.15,
      probabilityMeetsSpec: p,
      predicted: 30 - 0.3 * (c + 80),
      bandLow: 25 - 0.3 * (c + 80),
      bandHigh: 36 - 0.3 * (c + 80),
      timeToTargetHours: 2 * Math.exp(-(c + 20) / 15),
      eeAfterHoldPercent: null,
      feasible: !failing,
      failing,
    };
  });
  return {
    inputs: [
      { label: 'Allowed temperature range', value: '−80 °C to 20 °C' },
      { label: 'Rule chosen', value: 'warmest' },
      { label: 'Fit weighting', value: 'none (ordinary least squares)' },
      { label: 'Target conversion (%)', value: '95' },
      { label: 'Longest allowed reaction time', value: '24 h' },
    ],
    specification: { measure: 'dr', minimum: 10, probability: 0.9, runs: 1 },
    rule: 'warmest',
    recommended: { celsius: -46, kelvin: 227.15, probabilityMeetsSpec: 0.9 },
    window: { fromCelsius: -70, toCelsius: -46 },
    binding: ['specification', 'time'],
    conflict: null,
    resolutions: [],
    rows,
    nextRuns: { atCelsius: -46, celsius: [-50, -40] },
    caution: 'Invented caution for tests: check the thermal hazards before running colder or longer.',
    version: 2,
    updatedAt: '2026-12-01T10:00:00.000Z',
  };
}

/** An invented saved comparison of three campaigns (this one and two others) at −40 °C. */
export function demoComparison(): ComparisonReportData {
  const campaign = (title: string, ddH: number, value: number) => ({
    id: title,
    title,
    available: true,
    ddHKJPerMol: ddH,
    ddSJPerMolK: 4,
    valueAtTemperature: value,
    intervalLow: value - 2,
    intervalHigh: value + 2,
    problem: null,
    specification: { measure: 'dr', minimum: 10, probability: 0.9 },
    meetsAtTemperature: value > 10 ? 'yes' : 'no',
  });
  const pair = (first: string, second: string, d: number) => ({
    first,
    second,
    differenceLnR: d,
    intervalLow: d - 0.2,
    intervalHigh: d + 0.2,
    probabilityFirstBetter: d > 0 ? 0.97 : 0.03,
    verdict: d > 0 ? 'first' : 'second',
    equalSlopesP: 0.41,
    crossoverCelsius: null,
    note: '',
  });
  return {
    name: 'Boron sources (invented)',
    temperatureCelsius: -40,
    campaigns: [
      campaign('Aldol screen (invented demo) & co', 9, 14),
      campaign('Second boron source (invented)', 7.5, 9),
      campaign('Third boron source (invented)', 8.2, 11),
    ],
    pairs: [
      pair('Aldol screen (invented demo) & co', 'Second boron source (invented)', 0.44),
      pair('Aldol screen (invented demo) & co', 'Third boron source (invented)', 0.24),
      pair('Second boron source (invented)', 'Third boron source (invented)', -0.2),
    ],
    valueMeasure: 'dr',
    caution: 'Invented caution for tests: a comparison at one temperature says nothing about safety at another.',
  };
}
