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

const R = 6.02214076e23 * 1.380649e-23;

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
    const temperatureK = Math.round((celsius + 273.15) * 100) / 100;
    const lnR = 9000 / (R * temperatureK) - 4 / R + (i % 2 === 0 ? 0.04 : -0.04);
    const excluded = i === 3;
    return {
      id: `00000000-0000-4000-9000-${String(i).padStart(12, '0')}`,
      campaignId: campaign.id,
      temperatureK,
      measure: 'dr',
      value: Math.round(Math.exp(lnR) * 10) / 10,
      valueB: 1,
      isLowerBound: false,
      uncertainty: null,
      replicateLabel: i < HOSTILE.length ? HOSTILE[i]! : String.fromCharCode(97 + (i % 3)),
      sampleId: `KX-${i + 1}`,
      conversionPercent: 90,
      reactionTimeS: 7200,
      excluded,
      excludedReason: excluded ? '=1+1 (integration failed)' : null,
      notes: i === 1 ? '@notes' : null,
      sourceRow: null,
      version: 1,
      createdByUserId: null,
      createdAt: new Date('2026-11-01T09:00:00Z'),
      updatedAt: new Date('2026-11-01T09:00:00Z'),
    } as unknown as Measurement;
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
