import { describe, expect, it } from 'vitest';
import { ZodError } from 'zod';
import { analysisOptions, computeAnalysis } from '../../../api/features/campaigns/analysis';
import { analysisResponseSchema } from '../../../api/features/campaigns/analysis-schemas';
import { checkAnalysis } from '../../../web/features/campaigns/api/analysis-check';

/** A stored screen of 24 ee runs at 8 temperatures, analysed as the server does (invented numbers). */
function analysis() {
  const runs = Array.from({ length: 24 }, (_, i) => {
    const temperatureK = 233.15 + (i % 8) * 10;
    const lnR = 1100 / temperatureK - 1.5 + 0.03 * Math.sin(i);
    return {
      id: `00000000-0000-4000-8000-${String(i).padStart(12, '0')}`,
      temperatureK,
      measure: 'ee' as const,
      value: Math.round(10000 * Math.tanh(lnR / 2)) / 100,
      valueB: null,
      isLowerBound: false,
      uncertainty: 0.3,
      replicateLabel: null,
      sampleId: `S-${i + 1}`,
      excluded: false,
      excludedReason: null,
    };
  });
  const campaign = { id: 'c0000000-0000-4000-8000-000000000001', version: 3, measure: 'ee' as const, defaultUncertainty: 0.3 };
  const answer = computeAnalysis(
    campaign,
    runs,
    analysisOptions({ weighting: 'none', uncertaintyScale: 'absolute', confidence: 0.95, at: 0 }),
  );
  // What the browser receives: JSON.
  return JSON.parse(JSON.stringify(answer)) as ReturnType<typeof computeAnalysis>;
}

describe("the browser's check of a campaign analysis", () => {
  it('when the answer is a whole analysis, then it passes and comes back as it came, every row kept', () => {
    const answer = analysis();
    expect(answer.fit?.residuals).toHaveLength(24);
    expect(() => analysisResponseSchema.parse(answer)).not.toThrow();
    const checked = checkAnalysis(answer);
    expect(checked).toBe(answer);
    expect(checked.points).toHaveLength(24);
    expect(checked.fit?.residuals).toHaveLength(24);
  });

  it('when the first or the last row of a per-run list has another shape, then the check refuses the answer', () => {
    const first = analysis();
    delete (first.points[0] as Partial<(typeof first.points)[0]>).lnRatio;
    expect(() => checkAnalysis(first)).toThrow(ZodError);

    const last = analysis();
    (last.fit!.residuals[23] as unknown as Record<string, unknown>).status = 'dropped';
    expect(() => checkAnalysis(last)).toThrow(ZodError);

    const curve = analysis();
    (curve.curve[curve.curve.length - 1] as unknown as Record<string, unknown>).kelvin = '250';
    expect(() => checkAnalysis(curve)).toThrow(ZodError);
  });

  it('when a field outside the per-run lists is wrong or a list is not a list, then the check refuses the answer', () => {
    const slope = analysis();
    (slope.fit as unknown as Record<string, unknown>).slope = null;
    expect(() => checkAnalysis(slope)).toThrow(ZodError);

    const points = analysis();
    (points as unknown as Record<string, unknown>).points = { 0: points.points[0] };
    expect(() => checkAnalysis(points)).toThrow(ZodError);

    expect(() => checkAnalysis({ type: '/problems/not-found', status: 404 })).toThrow(ZodError);
    expect(() => checkAnalysis(null)).toThrow(ZodError);
  });
});
