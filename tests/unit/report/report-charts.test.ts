import { describe, expect, it } from 'vitest';
import { Resvg } from '@resvg/resvg-js';
import { buildReportModel } from '../../../api/features/campaigns/report-model';
import {
  CHART_FONT_FILES,
  CHART_SCALE,
  REPORT_FONT_FILES,
  clearChartCache,
  eyringChartSvg,
  renderPng,
  renderReportChartsAsync,
  selectivityChartSvg,
  simplifyLine,
  windowChartSvg,
} from '../../../api/features/campaigns/report-charts';
import { demoMeta, demoPlan, demoReportData } from './fixture';

/** Distance from (px, py) to the polyline through `line`. */
function distanceToLine(px: number, py: number, line: [number, number][]): number {
  let best = Infinity;
  for (let i = 1; i < line.length; i++) {
    const [ax, ay] = line[i - 1]!;
    const [bx, by] = line[i]!;
    const dx = bx - ax;
    const dy = by - ay;
    const t = Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / (dx * dx + dy * dy || 1)));
    best = Math.min(best, Math.hypot(px - (ax + t * dx), py - (ay + t * dy)));
  }
  return best;
}

/** A band as the charts draw one: 1 000 points across 600 px, a curved centre widening at both ends. */
function bandPoints(): { upper: [number, number][]; lower: [number, number][] } {
  const xs = Array.from({ length: 1000 }, (_, i) => 60 + (600 * i) / 999);
  const centre = (x: number) => 300 - 0.0004 * (x - 360) ** 2 - 0.2 * x;
  const half = (x: number) => 8 + 0.00015 * (x - 360) ** 2;
  return { upper: xs.map((x) => [x, centre(x) - half(x)]), lower: xs.map((x) => [x, centre(x) + half(x)]) };
}

const pathOf = (points: [number, number][]) => points.map(([x, y], i) => `${i ? 'L' : 'M'}${x.toFixed(2)} ${y.toFixed(2)}`).join(' ');
const bandSvg = (upper: [number, number][], lower: [number, number][]) =>
  `<svg xmlns="http://www.w3.org/2000/svg" width="720" height="420"><rect width="720" height="420" fill="#fff"/><path d="${pathOf([...upper, ...[...lower].reverse()])} Z" fill="#0f766e" fill-opacity="0.25"/><path d="${pathOf(upper)}" fill="none" stroke="#0f766e" stroke-width="2"/></svg>`;
const pixels = (svg: string) => new Resvg(svg, { fitTo: { mode: 'zoom', value: CHART_SCALE } }).render().pixels;

describe('report charts: cheaper to draw, drawn the same', () => {
  it('when a 1 000-point line is simplified, then a few dozen points remain and every dropped point lies within 0.1 px of the kept line', () => {
    const { upper } = bandPoints();
    const kept = simplifyLine(upper);
    expect(kept.length).toBeLessThan(100);
    expect(kept[0]).toEqual(upper[0]);
    expect(kept[kept.length - 1]).toEqual(upper[upper.length - 1]);
    // [C] the tolerance is the Ramer–Douglas–Peucker bound, checked point by point.
    for (const [x, y] of upper) expect(distanceToLine(x, y, kept)).toBeLessThanOrEqual(0.1 + 1e-9);
  });

  it('when the simplified band is rendered, then its pixels match the 1 000-point band except for a few edge pixels', () => {
    const { upper, lower } = bandPoints();
    const full = pixels(bandSvg(upper, lower));
    const simple = pixels(bandSvg(simplifyLine(upper), simplifyLine(lower)));
    expect(simple.length).toBe(full.length);
    let slight = 0;
    let visible = 0;
    for (let i = 0; i < full.length; i++) {
      const d = Math.abs(full[i]! - simple[i]!);
      if (d > 8) slight += 1;
      if (d > 32) visible += 1;
    }
    // Only anti-aliased edge pixels move, and only a little: the joins of 1 000 short segments
    // shade an edge slightly differently from a few long ones [C: measured with resvg 2.6.2].
    expect(slight / full.length).toBeLessThan(0.002);
    expect(visible / full.length).toBeLessThan(0.0001);
  });

  it('when a campaign of many replicates is drawn, then each visible position gets one mark', () => {
    const svg = eyringChartSvg(buildReportModel(demoReportData(600), demoMeta));
    // 600 runs at 12 temperatures with two readings each: at most 24 positions, one mark each (plus legend swatches).
    const marks = svg.match(/<circle /g) ?? [];
    expect(marks.length).toBeGreaterThan(12);
    expect(marks.length).toBeLessThan(40);
  });

  it('when the same chart is rendered twice, then the second is the first image; a changed run draws a new one', async () => {
    clearChartCache();
    const model = buildReportModel(demoReportData(12), demoMeta);
    const first = await renderReportChartsAsync(model);
    const again = await renderReportChartsAsync(model);
    expect(again!.eyring).toBe(first!.eyring);
    expect(renderPng(eyringChartSvg(model))).toBe(first!.eyring);
    const changed = demoReportData(13);
    const other = await renderReportChartsAsync(buildReportModel(changed, demoMeta));
    expect(other!.eyring).not.toBe(first!.eyring);
    expect(other!.eyring.equals(first!.eyring)).toBe(false);
    // The canvas: CHART_SCALE times the 720 × 420 drawing.
    expect(first!.eyring.readUInt32BE(16)).toBe(720 * CHART_SCALE);
    expect(first!.eyring.readUInt32BE(20)).toBe(420 * CHART_SCALE);
  });

  it('when the charts are drawn with the cut-down chart fonts, then every pixel is what the whole fonts draw', () => {
    const drawn = (svg: string, fontFiles: string[]) =>
      Buffer.from(
        new Resvg(svg, {
          fitTo: { mode: 'zoom', value: CHART_SCALE },
          font: { fontFiles, loadSystemFonts: false, defaultFontFamily: 'DejaVu Sans' },
        }).render().pixels,
      );
    const model = buildReportModel(demoReportData(12, { plan: demoPlan() }), demoMeta);
    const charts = [eyringChartSvg(model), selectivityChartSvg(model), windowChartSvg(model)!];
    // Titles, axis labels (1/T, ln r, °C), legends and the hatched constraint's name: Latin, Greek, symbols.
    expect(charts.join('')).toMatch(/°C/);
    expect(charts[2]).toMatch(/<text[^>]*>[^<]*excluded/);
    for (const svg of charts) expect(drawn(svg, CHART_FONT_FILES).equals(drawn(svg, REPORT_FONT_FILES))).toBe(true);
    // The comparison can see a missing glyph: Cyrillic is not in the chart fonts.
    const foreign = '<svg xmlns="http://www.w3.org/2000/svg" width="200" height="40"><text x="4" y="24" font-size="14">Жук</text></svg>';
    expect(drawn(foreign, CHART_FONT_FILES).equals(drawn(foreign, REPORT_FONT_FILES))).toBe(false);
  });
});
