import { describe, expect, it } from 'vitest';
import { campaignCreateSchema } from '../../../api/features/campaigns/schemas';
import { blankCampaign, createBody, updateBody, valuesFromCampaign } from '../../../web/features/campaigns/lib/campaign-form';
import { chartData } from '../../../web/features/campaigns/components/campaign-analysis';
import type { AnalysisResponse, Campaign } from '../../../web/features/campaigns/api/types';
import { webCampaign } from '../../factories/web-campaign';

const campaign: Campaign = webCampaign({
  title: 'Form test (invented)',
  productNameA: '(S)-amide',
  productNameB: '(R)-amide',
  version: 7,
});

describe('campaign form → API bodies', () => {
  it('when products are left blank, then they are A and B; a decimal comma uncertainty is read; the body passes the create schema', () => {
    const { body, errors } = createBody({ ...blankCampaign, title: ' Screen 1 ', defaultUncertainty: '0,5' });
    expect(errors).toEqual({});
    expect(body).toMatchObject({ title: 'Screen 1', productNameA: 'A', productNameB: 'B', defaultUncertainty: 0.5, status: 'active' });
    expect(campaignCreateSchema.safeParse(body).success).toBe(true);
  });

  it('when the title is empty or the uncertainty is a word or too large, then the field carries the reason', () => {
    expect(createBody(blankCampaign).errors.title).toBe('title is required');
    expect(createBody({ ...blankCampaign, title: 'x', defaultUncertainty: 'small' }).errors.defaultUncertainty).toBe(
      '“small” is not a number',
    );
    expect(createBody({ ...blankCampaign, title: 'x', defaultUncertainty: '150' }).errors.defaultUncertainty).toMatch(/below 100/);
  });

  it('when one field changes, then the update holds that field and the version read; clearing the uncertainty sends null', () => {
    const values = valuesFromCampaign(campaign);
    expect(updateBody(campaign, { ...values, status: 'completed' }).body).toEqual({ version: 7, status: 'completed' });
    expect(updateBody(campaign, { ...values, defaultUncertainty: '' }).body).toEqual({ version: 7, defaultUncertainty: null });
    expect(updateBody(campaign, values).errors['(form)']).toBe('nothing to change');
  });
});

describe('analysis → chart data', () => {
  it('when a point is a lower bound, then it has no error bar; a bar equal to the value is no bar; excluded points keep their reason', () => {
    const analysis = {
      points: [
        {
          measurementId: 'm1',
          kelvin: 213.15,
          celsius: -60,
          lnRatio: 6.9,
          lnRatioLow: 6.0,
          lnRatioHigh: 9.0,
          eePercent: 99.8,
          percentA: 99.9,
          status: 'censored',
          flagged: false,
          exclusionReason: null,
          label: 'T-009 a',
        },
        {
          measurementId: 'm2',
          kelvin: 253.15,
          celsius: -20,
          lnRatio: 5.0,
          lnRatioLow: 4.9,
          lnRatioHigh: 5.1,
          eePercent: 98.7,
          percentA: 99.35,
          status: 'excluded',
          flagged: true,
          exclusionReason: 'bath drifted',
          label: null,
        },
        {
          measurementId: 'm3',
          kelvin: 273.15,
          celsius: 0,
          lnRatio: 4.5,
          lnRatioLow: 4.5,
          lnRatioHigh: 4.5,
          eePercent: 97.9,
          percentA: 98.95,
          status: 'fitted',
          flagged: false,
          exclusionReason: null,
          label: null,
        },
      ],
      curve: [
        {
          kelvin: 253.15,
          celsius: -20,
          ratio: Math.exp(5),
          eePercent: 98.66,
          percentA: 99.33,
          confidenceInterval: { ratio: [Math.exp(4.9), Math.exp(5.1)], eePercent: [98.5, 98.8], percentA: [99.2, 99.4] },
          predictionInterval: null,
        },
      ],
    } as unknown as AnalysisResponse;
    const view = chartData(analysis);
    expect(view.points[0]).toMatchObject({ status: 'censored', lnRatioLow: null, lnRatioHigh: null, label: 'T-009 a' });
    expect(view.points[1]).toMatchObject({
      status: 'excluded',
      lnRatioLow: 4.9,
      lnRatioHigh: 5.1,
      flagged: true,
      label: 'excluded: bath drifted',
    });
    expect(view.points[2]).toMatchObject({ lnRatioLow: null, lnRatioHigh: null });
    expect(view.curve[0].lnRatio).toBeCloseTo(5, 12);
    expect(view.curve[0].confidence![0]).toBeCloseTo(4.9, 12);
    expect(view.curve[0].prediction).toBeNull();
    expect(view.selectivityCurve[0].band).toBeNull();
    expect(view.selectivityPoints.map((p) => p.status)).toEqual(['censored', 'excluded', 'fitted']);
  });
});

describe('the assay settings for a new run and the quantitation limit', () => {
  it('when they are typed with a decimal comma, then the body carries them as numbers', () => {
    const { body, errors } = createBody({ ...blankCampaign, title: 'Screen 2', newRunUncertainty: '0,25', quantitationLimit: '99,5' });
    expect(errors).toEqual({});
    expect(body).toMatchObject({ newRunUncertainty: 0.25, quantitationLimit: 99.5 });
  });

  it('when the limit does not suit the measure, then the field says why', () => {
    expect(createBody({ ...blankCampaign, title: 'x', quantitationLimit: '100' }).errors.quantitationLimit).toMatch(/between 0 and 100/);
    expect(createBody({ ...blankCampaign, title: 'x', measure: 'dr', quantitationLimit: '200' }).errors).toEqual({});
    expect(createBody({ ...blankCampaign, title: 'x', newRunUncertainty: 'tiny' }).errors.newRunUncertainty).toBe('“tiny” is not a number');
  });
});
