import { randomBytes } from 'node:crypto';
import { testKnex } from '../support/db';
import { Campaign } from '../../api/models/campaign';
import { Measurement } from '../../api/models/measurement';

/** A campaign in `projectId` (inserted directly, no audit rows), with overridable fields. */
export async function createCampaign(projectId: string, overrides: Partial<Campaign> = {}): Promise<Campaign> {
  return Campaign.query(testKnex())
    .insert({
      projectId,
      title: `Test screen ${randomBytes(3).toString('hex')}`,
      productNameA: '(S)-product',
      productNameB: '(R)-product',
      measure: 'ee',
      assayMethod: 'chiral-hplc',
      defaultUncertainty: 0.3,
      status: 'active',
      ...overrides,
    })
    .returning('*');
}

/** Measurements of `campaignId`: one per temperature (K) with an ee that rises on cooling. */
export async function createMeasurements(
  campaignId: string,
  temperaturesK: number[],
  overrides: Partial<Measurement> = {},
): Promise<Measurement[]> {
  return Measurement.query(testKnex())
    .insert(
      temperaturesK.map((temperatureK) => ({
        campaignId,
        temperatureK,
        measure: 'ee' as const,
        value: Math.min(99.5, 96 + (298.15 - temperatureK) / 20),
        ...overrides,
      })),
    )
    .returning('*');
}
