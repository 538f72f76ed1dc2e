import { describe, expect, it } from 'vitest';
import { buildReportModel } from '../../../api/features/campaigns/report-model';
import { renderReportCharts, windowChartSvg } from '../../../api/features/campaigns/report-charts';
import { buildCampaignReportPdf } from '../../../api/features/campaigns/report-pdf';
import type { PlanReportData } from '../../../api/features/plan/report-data';
import { demoMeta, demoReportData } from './fixture';

/** An invented plan: the specification holds below −30 °C, the time limit above −55 °C. */
function invented(recommended: boolean): PlanReportData {
  const rows = Array.from({ length: 23 }, (_, i) => {
    const c = -70 + 5 * i;
    const failing = [c > -30 ? 'specification' : '', c < -55 ? 'time' : ''].filter(Boolean).join(', ');
    return {
      celsius: c,
      kelvin: c + 273.15,
      probabilityMeetsSpec: 1 / (1 + Math.exp((c + 30) / 6)),
      predicted: 95,
      bandLow: 92,
      bandHigh: 97,
      timeToTargetHours: 10,
      eeAfterHoldPercent: null,
      feasible: !failing,
      failing,
    };
  });
  return {
    inputs: [],
    specification: { measure: 'ee', minimum: 98, probability: 0.9, runs: 1 },
    rule: 'warmest',
    recommended: recommended ? { celsius: -30.4, kelvin: 242.75, probabilityMeetsSpec: 0.9 } : null,
    window: recommended ? { fromCelsius: -55, toCelsius: -30.4 } : null,
    binding: ['specification', 'time'],
    conflict: null,
    resolutions: [],
    rows,
    nextRuns: null,
    caution: 'invented caution',
    version: 1,
    updatedAt: '2026-12-02T05:00:00.000Z',
  };
}

describe('window chart of the report', () => {
  it('when a plan is saved, then the chart hatches each excluded stretch with its constraint and marks the recommendation', () => {
    const svg = windowChartSvg(buildReportModel(demoReportData(12, { plan: invented(true) }), demoMeta))!;
    // Two stretches fail: the cold end (time) and the warm end (specification).
    expect(svg.match(/fill="url\(#hatch\)"/g)).toHaveLength(2);
    expect(svg).toContain('excluded: time');
    expect(svg).toContain('excluded: specification');
    expect(svg).toContain('recommended −30.4 °C');
    expect(svg).toContain('required 90.0 %');
  });

  it('when no temperature works, then nothing is marked as recommended', () => {
    const svg = windowChartSvg(buildReportModel(demoReportData(12, { plan: invented(false) }), demoMeta))!;
    expect(svg).not.toContain('recommended −');
  });

  it('when there is no plan, then there is no window chart, and with one it renders to a PNG', () => {
    expect(windowChartSvg(buildReportModel(demoReportData(), demoMeta))).toBeNull();
    const charts = renderReportCharts(buildReportModel(demoReportData(12, { plan: invented(true) }), demoMeta))!;
    expect(charts.window!.subarray(1, 4).toString('latin1')).toBe('PNG');
  });

  it('when the PDF summary is built with a plan, then its chart page carries the window chart as a third image', async () => {
    const images = async (withPlan: boolean) => {
      const model = buildReportModel(demoReportData(12, withPlan ? { plan: invented(true) } : {}), demoMeta);
      const pdf = await buildCampaignReportPdf(model, renderReportCharts(model));
      return (pdf.toString('latin1').match(/\/Subtype \/Image/g) ?? []).length;
    };
    // Each PNG with transparency is an image plus its soft mask, so two charts count 4 and three count 6.
    const without = await images(false);
    expect(without).toBeGreaterThan(0);
    expect(await images(true)).toBe((without * 3) / 2);
  });
});
