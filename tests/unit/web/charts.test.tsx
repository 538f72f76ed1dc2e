// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render } from '@testing-library/react';
import { celsiusTicks, EyringPlot, type EyringCurvePoint, type EyringPlotPoint } from '../../../web/components/charts/eyring-plot';
import { SelectivityChart } from '../../../web/components/charts/selectivity-chart';

afterEach(cleanup);

// A straight line ln r = −1 + 1200/T with bands of fixed half-widths, just to have shapes to draw.
const curve: EyringCurvePoint[] = Array.from({ length: 20 }, (_, i) => {
  const kelvin = 190 + i * 6;
  const y = -1 + 1200 / kelvin;
  return { kelvin, lnRatio: y, confidence: [y - 0.1, y + 0.1], prediction: [y - 0.3, y + 0.3] };
});
const points: EyringPlotPoint[] = [
  { id: 0, kelvin: 195, lnRatio: 5.2, lnRatioLow: 5.0, lnRatioHigh: 5.4, status: 'fitted' },
  { id: 1, kelvin: 233, lnRatio: 4.1, status: 'fitted', flagged: true },
  { id: 2, kelvin: 273, lnRatio: 3.3, status: 'excluded' },
  { id: 3, kelvin: 298, lnRatio: 3.0, status: 'censored' },
];

describe('EyringPlot', () => {
  it('when given points, a fitted line and bands, then it draws both bands, the line, each marker shape and a °C top axis', () => {
    const { container } = render(
      <EyringPlot
        title="test plot"
        points={points}
        curve={curve}
        width={640}
        height={320}
        mark={{ kelvin: 223.15, label: 'proposed −50 °C' }}
      />,
    );
    const svg = container.querySelector('svg[aria-label="test plot"]');
    expect(svg).not.toBeNull();
    expect(svg!.querySelectorAll('path.visx-area')).toHaveLength(2);
    expect(svg!.querySelectorAll('path.eyrie-fit-line')).toHaveLength(1);
    expect(svg!.querySelector('path.eyrie-fit-line')!.getAttribute('d')!.length).toBeGreaterThan(20);
    expect(svg!.querySelector('path.visx-area')!.getAttribute('d')!.length).toBeGreaterThan(20);
    // two filled and one hollow circle, a flag ring, and the censored diamond + caret: one path per kind, one subpath per run
    const subpaths = (kind: string) => (svg!.querySelector(`path.eyrie-points-${kind}`)?.getAttribute('d')?.match(/M/g) ?? []).length;
    expect(subpaths('fitted')).toBe(2);
    expect(subpaths('excluded')).toBe(1);
    expect(svg!.querySelector('path.eyrie-points-excluded')!.getAttribute('fill')).toBe('#ffffff');
    expect(subpaths('flagged')).toBe(1);
    expect(subpaths('censored')).toBe(1);
    expect(subpaths('censored-caret')).toBe(1);
    // one bar with both caps: the bar and two caps
    expect((svg!.querySelector('path.eyrie-error-bars')!.getAttribute('d')!.match(/M/g) ?? []).length).toBe(3);
    const text = svg!.textContent ?? '';
    expect(text).toContain('1000/T (K⁻¹)');
    expect(text).toContain('ln r');
    expect(text).toContain('°C');
    expect(text).toContain('proposed −50 °C');
    expect(container.querySelector('[aria-label="Legend"]')!.textContent).toContain('95 % prediction band (new run)');
  });

  it('when branches are given, then each is drawn as its own dashed line', () => {
    const { container } = render(
      <EyringPlot
        title="branches"
        points={points}
        branches={[
          { label: 'low', fromKelvin: 195, toKelvin: 240, slope: 1500, intercept: -2.5 },
          { label: 'high', fromKelvin: 240, toKelvin: 300, slope: 900, intercept: 0 },
        ]}
        width={500}
      />,
    );
    expect(container.querySelectorAll('path.eyrie-branch-line[stroke-dasharray="7 4"]')).toHaveLength(2);
  });

  it('when a screen has a thousand runs, then the chart draws them with a handful of elements, each run a subpath', () => {
    const many: EyringPlotPoint[] = Array.from({ length: 1000 }, (_, i) => ({
      id: i,
      kelvin: 193.15 + (i % 40) * 3,
      lnRatio: 1200 / (193.15 + (i % 40) * 3) - 1.2,
      lnRatioLow: 1200 / (193.15 + (i % 40) * 3) - 1.25,
      lnRatioHigh: 1200 / (193.15 + (i % 40) * 3) - 1.15,
      status: i % 100 === 0 ? 'excluded' : 'fitted',
    }));
    const { container } = render(<EyringPlot title="many" points={many} curve={curve} width={640} />);
    const svg = container.querySelector('svg[aria-label="many"]')!;
    const count = (selector: string) => (svg.querySelector(selector)!.getAttribute('d')!.match(/M/g) ?? []).length;
    expect(count('path.eyrie-points-fitted')).toBe(990);
    expect(count('path.eyrie-points-excluded')).toBe(10);
    expect(count('path.eyrie-error-bars')).toBe(3000);
    expect(svg.querySelectorAll('*').length).toBeLessThan(200);
  });
});

describe('SelectivityChart', () => {
  it('when a curve with a band and a specification is drawn, then the band, curve, measured points and the spec rule appear', () => {
    const data = Array.from({ length: 13 }, (_, i) => {
      const celsius = -80 + i * 10;
      const ee = 99 - i * 0.7;
      return {
        celsius,
        eePercent: ee,
        percentA: 50 + ee / 2,
        band: { eePercent: [ee - 1, Math.min(99.9, ee + 1)] as [number, number], percentA: [49 + ee / 2, 51 + ee / 2] as [number, number] },
      };
    });
    const { container } = render(
      <SelectivityChart
        title="sel"
        curve={data}
        points={[{ id: 1, celsius: -40, eePercent: 96.5, percentA: 98.25 }]}
        measure="ee"
        spec={99}
        bandLabel="95 % prediction band"
        width={600}
      />,
    );
    const svg = container.querySelector('svg[aria-label="sel"]')!;
    expect(svg.querySelectorAll('path.visx-area')).toHaveLength(1);
    expect(svg.querySelector('path.eyrie-curve-line')).not.toBeNull();
    expect((svg.querySelector('path.eyrie-points-fitted')!.getAttribute('d')!.match(/M/g) ?? []).length).toBe(1);
    expect(svg.textContent).toContain('specification 99 % ee');
    expect(svg.textContent).toContain('Temperature (°C)');
    expect(svg.textContent).toContain('ee (%)');
  });
});

describe('°C ticks on the top axis of the Eyring plot', () => {
  // 1000/T from 3.0 to 5.0 K⁻¹ spans 60.2 °C down to −73.2 °C; 20 °C steps bunch up at the warm end.
  const domain: [number, number] = [3.0, 5.0];
  const gaps = (ticks: number[], width: number) => ticks.slice(1).map((x, i) => ((x - ticks[i]) * width) / (domain[1] - domain[0]));

  it('when the plot is wide, then every round step is labelled', () => {
    const ticks = celsiusTicks(domain, 900);
    // 60, 40, 20, 0, −20, −40, −60 °C [C]
    expect(ticks.map((x) => Math.round(1000 / x - 273.15))).toEqual([60, 40, 20, 0, -20, -40, -60]);
  });

  it('when the plot is phone-narrow, then ticks closer than a label width are dropped, so no two labels overprint', () => {
    const wide = celsiusTicks(domain, 900);
    const narrow = celsiusTicks(domain, 230);
    expect(narrow.length).toBeLessThan(wide.length);
    expect(narrow.length).toBeGreaterThanOrEqual(3);
    expect(Math.min(...gaps(narrow, 230))).toBeGreaterThanOrEqual(36);
    // without thinning, the same ticks at 230 px would sit closer than that
    expect(Math.min(...gaps(wide, 230))).toBeLessThan(36);
    // a coarser round step rather than gaps: 50, 0, −50 °C [C]
    expect(narrow.map((x) => Math.round(1000 / x - 273.15))).toEqual([50, 0, -50]);
  });
});
