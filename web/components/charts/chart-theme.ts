import { buildChartTheme } from '@visx/xychart';
import { chartColors } from '../../../api/lib/chart-colors';

export { chartColors };

export const chartFont = 'Inter, ui-sans-serif, system-ui, sans-serif';

export const chartTheme = buildChartTheme({
  backgroundColor: chartColors.paper,
  colors: [chartColors.accent, chartColors.ink, chartColors.branch],
  tickLength: 4,
  gridColor: chartColors.grid,
  gridColorDark: '#cbd5e1',
  svgLabelSmall: { fill: chartColors.inkSoft, fontFamily: chartFont, fontSize: 11 },
  svgLabelBig: { fill: chartColors.ink, fontFamily: chartFont, fontSize: 12, fontWeight: 500 },
  xAxisLineStyles: { stroke: '#94a3b8' },
  yAxisLineStyles: { stroke: '#94a3b8' },
  xTickLineStyles: { stroke: '#94a3b8' },
  yTickLineStyles: { stroke: '#94a3b8' },
});

export const tickLabelProps = () =>
  ({ fill: chartColors.inkSoft, fontFamily: chartFont, fontSize: 11, style: { fontVariantNumeric: 'tabular-nums' } }) as const;

export const axisLabelProps = { fill: chartColors.ink, fontFamily: chartFont, fontSize: 12, fontWeight: 500 } as const;

/** [min, max] of finite numbers, padded by `pad` of the span (or ±`minHalfSpan` when flat). */
export function paddedExtent(values: number[], pad = 0.05, minHalfSpan = 0.5): [number, number] {
  const finite = values.filter(Number.isFinite);
  if (finite.length === 0) return [0, 1];
  let lo = Math.min(...finite);
  let hi = Math.max(...finite);
  if (hi - lo < 1e-12) return [lo - minHalfSpan, hi + minHalfSpan];
  const span = hi - lo;
  lo -= span * pad;
  hi += span * pad;
  return [lo, hi];
}
