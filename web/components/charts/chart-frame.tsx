import { useMemo, useState, type ContextType, type ReactNode, type Ref } from 'react';
import { AreaSeries, DataContext, Grid, Tooltip, XYChart } from '@visx/xychart';
import { createScale, scaleCanBeZeroed, scaleOrdinal } from '@visx/scale';
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
  /**
   * The data of the chart's series, in the order they are drawn (stable objects, built with
   * `bandSeries`, `lineSeries` and `anchorSeries`): known before the series mount, they are drawn in
   * the chart's first pass. A series left out is drawn once it has registered its data, a pass later.
   */
  series?: PlotSeries[];
  children: ReactNode;
}

/** A series' data as xychart keeps it: what its tooltip searches and its scales are read against. */
export interface PlotSeries {
  key: string;
  data: readonly object[];
  xAccessor: (d: never) => number;
  yAccessor: (d: never) => number;
}

const sameSeries = (a: PlotSeries | undefined, b: PlotSeries) =>
  !!a && a.data === b.data && a.xAccessor === b.xAccessor && a.yAccessor === b.yAccessor;

/**
 * The series data of one chart, in xychart's own shape (get, keys, entries, registerData,
 * unregisterData). Unlike xychart's, it can hold the chart's series before they mount, and a series
 * registering the data it already holds changes nothing, so nothing is drawn again.
 */
class PlotRegistry {
  private readonly byKey = new Map<string, PlotSeries>();
  private keyList: string[] = [];
  private presetKeys = new Set<string>();
  constructor(private readonly changed: () => void) {}

  /** The chart's own series, set while the chart renders (idempotent: the same series change nothing). */
  preset(series: PlotSeries[]) {
    let added = false;
    for (const entry of series) {
      if (sameSeries(this.byKey.get(entry.key), entry)) continue;
      added = added || !this.byKey.has(entry.key);
      this.byKey.set(entry.key, entry);
    }
    if (added) this.keyList = [...this.byKey.keys()];
    this.presetKeys = new Set(series.map((entry) => entry.key));
  }

  registerData = (entryOrEntries: PlotSeries | PlotSeries[]) => {
    let changed = false;
    for (const entry of Array.isArray(entryOrEntries) ? entryOrEntries : [entryOrEntries]) {
      if (sameSeries(this.byKey.get(entry.key), entry)) continue;
      this.byKey.set(entry.key, entry);
      changed = true;
    }
    if (changed) this.update();
  };

  unregisterData = (keyOrKeys: string | string[]) => {
    let changed = false;
    // A series the chart still names keeps its data: it is only being mounted again (new data, or React's checks).
    for (const key of Array.isArray(keyOrKeys) ? keyOrKeys : [keyOrKeys])
      if (!this.presetKeys.has(key) && this.byKey.delete(key)) changed = true;
    if (changed) this.update();
  };

  get = (key: string) => this.byKey.get(key);
  keys = () => this.keyList;
  entries = () => [...this.byKey.values()];

  private update() {
    this.keyList = [...this.byKey.keys()];
    this.changed();
  }
}

/** A scale as xychart builds it from a settings object that carries its own domain (a zeroable type starts from zero: true). */
function plotScale(config: AxisScale, range: [number, number]) {
  return createScale(scaleCanBeZeroed(config) ? { range, zero: true, ...config } : { range, ...config });
}

/**
 * The plot every chart draws on: our theme, the given scales and horizontal grid lines behind the
 * series. The chart's data context (scales, sizes, series data) is built here rather than by
 * xychart, which computes its scales only after every series has registered its data in an
 * effect and so draws a chart in three passes; with the scales made from the given domains at once
 * and the series named up front (`series`), a chart is drawn in one. The scales are the ones
 * xychart makes from the same settings, so the drawing is the same.
 */
export function ChartFrame({ width, height, margin, xScale, yScale, title, gridTicks, series, children }: ChartFrameProps) {
  const [, setVersion] = useState(0);
  const [registry] = useState(() => new PlotRegistry(() => setVersion((v) => v + 1)));
  if (series) registry.preset(series);
  const keys = registry.keys();
  const { top, right, bottom, left } = margin;
  const x = useMemo(() => plotScale(xScale, [left, Math.max(0, width - right)]), [xScale, left, right, width]);
  const y = useMemo(() => plotScale(yScale, [Math.max(0, height - bottom), top]), [yScale, top, bottom, height]);
  const colorScale = useMemo(() => scaleOrdinal({ domain: keys, range: chartTheme.colors }), [keys]);
  const value = useMemo(
    () => ({
      dataRegistry: registry,
      registerData: registry.registerData,
      unregisterData: registry.unregisterData,
      xScale: x,
      yScale: y,
      colorScale,
      theme: chartTheme,
      width,
      height,
      margin: { top, right, bottom, left },
      innerWidth: Math.max(0, width - left - right),
      innerHeight: Math.max(0, height - top - bottom),
      // The sizes are this component's props: the chart has nothing to report back.
      setDimensions: () => undefined,
      horizontal: false,
    }),
    // colorScale follows the list of series keys, a new list whenever a series registers or leaves.
    [registry, x, y, colorScale, width, height, top, right, bottom, left],
  );
  return (
    <DataContext.Provider value={value as unknown as ContextType<typeof DataContext>}>
      <XYChart width={width} height={height} margin={margin} theme={chartTheme} xScale={xScale} yScale={yScale} accessibilityLabel={title}>
        <Grid columns={false} numTicks={gridTicks} lineStyle={{ stroke: chartColors.grid }} />
        {children}
      </XYChart>
    </DataContext.Provider>
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

/** A band's data as `BandArea` registers it, for `ChartFrame`'s `series`. */
export const bandSeries = (key: string, data: BandDatum[]): PlotSeries => ({ key, data, xAccessor: bandX, yAccessor: bandHi });

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
