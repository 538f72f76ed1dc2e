import { useMemo } from 'react';
import { GlyphSeries, LineSeries, type GlyphProps } from '@visx/xychart';
import { ChartFigure, BandArea, ChartFrame, SnapTooltip, TemperatureHeading, valueScale } from './chart-frame';
import { CelsiusAxis, ChartAxis } from './chart-layers';
import { chartColors, paddedExtent } from './chart-theme';
import { LegendItem } from './eyring-plot';
import { useElementWidth } from './use-element-width';

/** One line of a {@link LineChart}: points against temperature (°C). */
export interface LineChartSeries {
  key: string;
  label: string;
  points: { x: number; y: number }[];
  /** Draw thinner and lighter (e.g. a sensitivity variant beside the main answer). */
  secondary?: boolean;
  /** A band around the line (e.g. its confidence interval), shaded in the series' colour. */
  band?: { x: number; lo: number; hi: number }[];
}

/** Colours, dash patterns and marker shapes in step, so no series is told apart by colour alone. */
const PALETTE = [chartColors.accent, chartColors.ink, chartColors.branch, chartColors.caution, '#0369a1', '#be185d', '#4d7c0f', '#64748b'];
const DASHES = ['', '6 3', '2 3', '9 3 2 3', '4 4', '1 2', '12 4', '3 2 1 2'];
type Shape = 'circle' | 'square' | 'triangle' | 'diamond';
const SHAPES: Shape[] = ['circle', 'square', 'triangle', 'diamond'];

export const MAX_LINE_SERIES = PALETTE.length;

function Marker({ shape, x, y, color, r = 3.5 }: { shape: Shape; x: number; y: number; color: string; r?: number }) {
  if (shape === 'square') return <rect x={x - r} y={y - r} width={2 * r} height={2 * r} fill={color} />;
  if (shape === 'triangle') return <path d={`M${x} ${y - r - 1} L${x + r + 0.5} ${y + r} L${x - r - 0.5} ${y + r} Z`} fill={color} />;
  if (shape === 'diamond') return <path d={`M${x} ${y - r - 1} L${x + r + 1} ${y} L${x} ${y + r + 1} L${x - r - 1} ${y} Z`} fill={color} />;
  return <circle cx={x} cy={y} r={r} fill={color} />;
}

interface Datum {
  x: number;
  y: number;
  series: string;
}

/** Powers of ten (and 2, 5 between them when the span is short) inside a log domain. */
function logTicks([lo, hi]: [number, number]): number[] {
  const first = Math.floor(Math.log10(lo));
  const last = Math.ceil(Math.log10(hi));
  const mantissas = last - first <= 2 ? [1, 2, 5] : [1];
  const ticks: number[] = [];
  for (let e = first; e <= last; e++) for (const m of mantissas) ticks.push(m * 10 ** e);
  return ticks.filter((t) => t >= lo * (1 - 1e-9) && t <= hi * (1 + 1e-9));
}

/**
 * A small chart of one or more lines against temperature (°C), linear or log y. Each series has
 * its own colour, dash pattern and marker shape, named in the legend under the chart.
 */
export function LineChart({
  title,
  series,
  yLabel,
  yScale = 'linear',
  formatY,
  yTicks,
  yDomain: fixedYDomain,
  height = 260,
  testId,
  bandLabel,
}: {
  title: string;
  series: LineChartSeries[];
  yLabel: string;
  yScale?: 'linear' | 'log';
  /** Text of a y value (ticks and tooltip). */
  formatY: (y: number) => string;
  /** Tick values for a y domain (default: powers of ten on a log axis, automatic on a linear one). */
  yTicks?: (domain: [number, number]) => number[];
  yDomain?: [number, number];
  height?: number;
  testId?: string;
  /** Legend text for the series' bands, e.g. "shaded: 95 % confidence band of each line". */
  bandLabel?: string;
}) {
  const [ref, width] = useElementWidth<HTMLDivElement>();
  const shown = useMemo(
    () =>
      series.slice(0, MAX_LINE_SERIES).map((s) => ({
        ...s,
        points: s.points.filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y) && (yScale === 'linear' || p.y > 0)),
        band: (s.band ?? []).filter(
          (b) => Number.isFinite(b.x) && Number.isFinite(b.lo) && Number.isFinite(b.hi) && (yScale === 'linear' || b.lo > 0),
        ),
      })),
    [series, yScale],
  );
  const all = useMemo(
    () => [
      ...shown.flatMap((s) => s.points),
      ...shown.flatMap((s) =>
        s.band.flatMap((b) => [
          { x: b.x, y: b.lo },
          { x: b.x, y: b.hi },
        ]),
      ),
    ],
    [shown],
  );
  const hasBand = shown.some((s) => s.band.length > 1);
  const xDomain = useMemo(
    () =>
      paddedExtent(
        all.map((p) => p.x),
        0.03,
        5,
      ),
    [all],
  );
  const yDomain = useMemo<[number, number]>(() => {
    if (fixedYDomain) return fixedYDomain;
    const ys = all.map((p) => p.y);
    if (yScale === 'log') {
      if (!ys.length) return [1, 10];
      const lo = 10 ** Math.floor(Math.log10(Math.min(...ys)));
      const hi = 10 ** Math.ceil(Math.log10(Math.max(...ys)));
      return [lo, hi > lo ? hi : lo * 10];
    }
    return paddedExtent(ys, 0.06, 1);
  }, [all, yScale, fixedYDomain]);
  const style = (i: number) => ({ color: PALETTE[i % PALETTE.length], dash: DASHES[i % DASHES.length], shape: SHAPES[i % SHAPES.length] });

  return (
    <ChartFigure
      chartRef={ref}
      testId={testId}
      legend={
        <>
          {shown.map((s, i) => {
            const { color, dash, shape } = style(i);
            return (
              <LegendItem key={s.key} label={s.label}>
                <line
                  x1="1"
                  x2="15"
                  y1="8"
                  y2="8"
                  stroke={color}
                  strokeWidth={s.secondary ? 1.25 : 2}
                  strokeDasharray={dash || undefined}
                />
                <Marker shape={shape} x={8} y={8} color={color} r={2.5} />
              </LegendItem>
            );
          })}
        </>
      }
      notes={
        <>
          {hasBand && bandLabel && <p className="mt-1 text-xs text-ink-600">{bandLabel}</p>}
          {series.length > shown.length && (
            <p className="mt-1 text-xs text-ink-600">
              The chart shows the first {shown.length} of {series.length} series; the table lists all.
            </p>
          )}
        </>
      }
    >
      {width > 0 && all.length > 0 && (
        <ChartFrame
          width={width}
          height={height}
          margin={{ top: 18, right: 20, bottom: 46, left: 78 }}
          xScale={{ type: 'linear', domain: xDomain, zero: false }}
          yScale={valueScale(yScale, yDomain)}
          title={title}
          gridTicks={5}
        >
          {shown.map((s, i) => {
            const { color, dash, shape } = style(i);
            const data: Datum[] = s.points.map((p) => ({ ...p, series: s.label }));
            return (
              <g key={s.key}>
                {s.band.length > 1 && <BandArea dataKey={`${s.key}-band`} data={s.band} fill={color} fillOpacity={0.14} />}
                {data.length > 1 && (
                  <LineSeries
                    className="eyrie-line"
                    dataKey={s.key}
                    data={data}
                    xAccessor={(d) => d.x}
                    yAccessor={(d) => d.y}
                    stroke={color}
                    strokeWidth={s.secondary ? 1.25 : 2}
                    strokeDasharray={dash || undefined}
                    strokeOpacity={s.secondary ? 0.8 : 1}
                  />
                )}
                <GlyphSeries
                  dataKey={`${s.key}-markers`}
                  data={data}
                  xAccessor={(d) => d.x}
                  yAccessor={(d) => d.y}
                  renderGlyph={({ x, y }: GlyphProps<Datum>) => (
                    <Marker shape={shape} x={x} y={y} color={color} r={s.secondary ? 2.5 : 3.5} />
                  )}
                />
              </g>
            );
          })}
          <CelsiusAxis />
          <ChartAxis
            orientation="left"
            numTicks={5}
            tickValues={yTicks ? yTicks(yDomain) : yScale === 'log' ? logTicks(yDomain) : undefined}
            label={yLabel}
            labelOffset={42}
            tickFormat={(v) => formatY(Number(v))}
          />
          <SnapTooltip<Datum>>
            {(d) => (
              <>
                <TemperatureHeading celsius={d.x} />
                <div>
                  {d.series}: {formatY(d.y)}
                </div>
              </>
            )}
          </SnapTooltip>
        </ChartFrame>
      )}
    </ChartFigure>
  );
}
