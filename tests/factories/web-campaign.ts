import type { Campaign } from '../../web/features/campaigns/api/types';

/** A campaign as the web client receives it (an invented open ee screen); pass what a test cares about. */
export function webCampaign(overrides: Partial<Campaign> = {}): Campaign {
  return {
    id: 'c1',
    projectId: 'p1',
    title: 'Web test (invented)',
    reactionDescription: null,
    productNameA: 'A',
    productNameB: 'B',
    measure: 'ee',
    assayMethod: 'chiral-hplc',
    defaultUncertainty: 0.3,
    newRunUncertainty: null,
    quantitationLimit: null,
    status: 'active',
    notes: null,
    createdByUserId: null,
    signedOffAt: null,
    signedOffByUserId: null,
    signOffNote: null,
    version: 1,
    createdAt: '2026-12-01T00:00:00Z',
    updatedAt: '2026-12-01T00:00:00Z',
    ...overrides,
  };
}
