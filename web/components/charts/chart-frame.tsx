import type { ReactNode, Ref } from 'react';
import { AreaSeries, Grid, Tooltip, XYChart } from '@visx/xychart';
import { fixed } from '../../lib/format';
import { chartColors, chartTheme } from './chart-theme';
import { ChartAxis } from './chart-layers';
import { kelvinFromCelsius } from '../../../api/science/quantities';

type AxisScale =
  | { type: 'linear'; domain: number[]; zero?: boolean; nice?: boolean; clamp?: boolean }
  | { type: 'log'; domain: number[]; clamp?: boolean };

export interface ChartFrameProps {
  width: number;
  height: number;
  margin: { top: number; right: number; bottom: number; left: number };
  /** Pass a stable (memoised or module-level) object: xychart rebuilds its scales when it changes. */
  xScale: AxisScale;
  yScale: AxisScale;
  /** The chart's accessible name. */
  title: string;
  /** Horizontal grid lines at about this many y ticks. */
  gridTicks: number;
  children: ReactNode;
}

/** The plot every chart draws on: our theme, the given scales and horizontal grid lines behind the series. */
export function ChartFrame({ width, height, margin, xScale, yScale, title, gridTicks, children }: ChartFrameProps) {
  return (
    <XYChart width={width} height={height} margin={margin} theme={chartTheme} xScale={xScale} yScale={yScale} accessibilityLabel={title}>
      <Grid columns={false} numTicks={gridTicks} lineStyle={{ stroke: chartColors.grid }} />
      {children}
    </XYChart>
  );
}

/** A y scale of either kind over the given domain; a log scale clamps what falls outside it. */
export function valueScale(kind: 'linear' | 'log', domain: [number, number]): AxisScale {
  return kind === 'log' ? { type: 'log', domain, clamp: true } : { type: 'linear', domain, zero: false, nice: true };
}

export interface BandDatum {
  x: number;
  lo: number;
  hi: number;
}

const bandX = (d: BandDatum) => d.x;
const bandHi = (d: BandDatum) => d.hi;
const bandLo = (d: BandDatum) => d.lo;

/** A shaded interval (confidence or prediction band) that takes no pointer events and draws no edge. */
export function BandArea({ dataKey, data, fill, fillOpacity }: { dataKey: string; data: BandDatum[]; fill: string; fillOpacity: number }) {
  return (
    <AreaSeries
      dataKey={dataKey}
      data={data}
      xAccessor={bandX}
      yAccessor={bandHi}
      y0Accessor={bandLo}
      renderLine={false}
      fill={fill}
      fillOpacity={fillOpacity}
      enableEvents={false}
    />
  );
}

/** The bottom axis of an Eyring plot: reciprocal temperature, 1000/T. */
export function InverseKelvinAxis() {
  return <ChartAxis orientation="bottom" numTicks={6} label="1000/T (K⁻¹)" tickFormat={(v) => fixed(Number(v), 2)} />;
}

/** A tooltip that snaps to the nearest datum with a dashed vertical crosshair; `children` renders its lines. */
export function SnapTooltip<Datum extends object>({
  children,
  showDatumGlyph,
}: {
  children: (datum: Datum) => ReactNode;
  showDatumGlyph?: boolean;
}) {
  return (
    <Tooltip<Datum>
      snapTooltipToDatumX
      snapTooltipToDatumY
      showDatumGlyph={showDatumGlyph}
      showVerticalCrosshair
      verticalCrosshairStyle={{ stroke: '#94a3b8', strokeDasharray: '2 2' }}
      renderTooltip={({ tooltipData }) => {
        const d = tooltipData?.nearestDatum?.datum;
        if (!d) return null;
        return <div className="tnum text-xs leading-5 text-ink-800">{children(d)}</div>;
      }}
    />
  );
}

/** The heading line of a tooltip on a temperature axis: the temperature in °C and in K. */
export function TemperatureHeading({ celsius }: { celsius: number }) {
  return (
    <div className="font-medium">
      {fixed(celsius, 1)} °C · {fixed(kelvinFromCelsius(celsius), 2)} K
    </div>
  );
}

/**
 * A chart and its caption: the box the chart measures its width from (`chartRef`), then the legend
 * as a list and any `notes` below it. With `height`, the box keeps the chart's height while its
 * width is still being measured, so drawing the chart then does not move the rest of the page
 * (which would have the browser lay out all of it again).
 */
export function ChartFigure({
  chartRef,
  testId,
  height,
  legend,
  notes,
  children,
}: {
  chartRef: Ref<HTMLDivElement>;
  testId?: string;
  height?: number;
  legend: ReactNode;
  notes?: ReactNode;
  children: ReactNode;
}) {
  return (
    <figure className="m-0">
      <div ref={chartRef} className="w-full" data-testid={testId} style={height ? { minHeight: height } : undefined}>
        {children}
      </div>
      <figcaption>
        <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-600" aria-label="Legend">
          {legend}
        </ul>
        {notes}
      </figcaption>
    </figure>
  );
}
