import { useCallback, useMemo } from 'react';
import { GlyphSeries } from '@visx/xychart';
import { enantiomericRatio, fixed, percent } from '../../lib/format';
import { ChartFigure, BandArea, ChartFrame, SnapTooltip, TemperatureHeading, bandSeries, type PlotSeries } from './chart-frame';
import {
  CelsiusAxis,
  ChartAxis,
  FittedLine,
  HorizontalRule,
  MeasurementAnchors,
  PointMarks,
  VerticalMark,
  anchorSeries,
  lineSeries,
  type PointMark,
} from './chart-layers';
import { chartColors, paddedExtent } from './chart-theme';
import { BandSwatch, LegendItem, LineSwatch } from './eyring-plot';
import { useElementWidth } from './use-element-width';
import {
  axisText,
  formatSelectivity,
  lnRatioOf,
  majorShare,
  majorShareRange,
  type SelectivityMeasure,
} from '../../../api/science/quantities';

export type SelectivityAxis = 'ee' | 'percentA';

/** A forecast (or fitted) selectivity at one temperature, with an optional band. */
export interface SelectivityCurvePoint {
  celsius: number;
  eePercent: number;
  percentA: number;
  band?: { eePercent: [number, number]; percentA: [number, number] } | null;
}

/** A measured selectivity. */
export interface SelectivityMeasuredPoint {
  id: string | number;
  celsius: number;
  eePercent: number;
  percentA: number;
  /** fitted: filled circle; excluded: hollow; censored: diamond with an upward caret (a lower bound). */
  status?: 'fitted' | 'excluded' | 'censored';
}

export interface SelectivityChartProps {
  curve: SelectivityCurvePoint[];
  points?: SelectivityMeasuredPoint[];
  /** Which quantity is on the y axis: the signed excess (ee, or % de for dr) or the share (% A, or % major for dr). */
  measure: SelectivityAxis;
  /** The measure the runs are reported in; sets the words (dr: % de and % major, never ee). Default ee. */
  family?: SelectivityMeasure;
  /** A specification drawn as a horizontal rule, in the units of `measure` (e.g. 99 for 99 % ee). */
  spec?: number | null;
  curveLabel?: string;
  /** Legend text of the band, e.g. "95 % prediction band". */
  bandLabel?: string;
  mark?: { celsius: number; label: string } | null;
  /** Accessible name of the chart. */
  title: string;
  width?: number;
  height?: number;
}

type Datum =
  { kind: 'curve'; x: number; y: number; c: SelectivityCurvePoint } | { kind: 'point'; x: number; y: number; p: SelectivityMeasuredPoint };

const xOf = (d: Datum) => d.x;
const MARGIN = { top: 18, right: 20, bottom: 46, left: 66 };
// Accessors defined once: a new function on each render makes xychart register the series again.
const yOf = (d: Datum) => d.y;

/**
 * Selectivity against temperature (°C): the forecast curve, an optional band, measured
 * points and an optional specification rule. The y axis shows ee % or % A.
 */
export function SelectivityChart({
  curve,
  points = [],
  measure,
  family = 'ee',
  spec,
  curveLabel = 'forecast',
  bandLabel,
  mark,
  title,
  width,
  height = 300,
}: SelectivityChartProps) {
  const [ref, measured] = useElementWidth<HTMLDivElement>();
  const chartWidth = width ?? measured;
  // For diastereomers the share axis is % major, the larger share whichever isomer it is.
  const fold = family === 'dr' && measure === 'percentA';
  const pick = useCallback(
    (v: { eePercent: number; percentA: number }) => (measure === 'ee' ? v.eePercent : fold ? majorShare(v.percentA) : v.percentA),
    [measure, fold],
  );
  const words = axisText(family, measure);
  const yLabel = words.axis;
  const unitText = words.unit;

  const curveData = useMemo<Datum[]>(() => curve.map((c) => ({ kind: 'curve', x: c.celsius, y: pick(c), c })), [curve, pick]);
  const pointData = useMemo<Datum[]>(() => points.map((p) => ({ kind: 'point', x: p.celsius, y: pick(p), p })), [points, pick]);
  const marks = useMemo<PointMark[]>(() => points.map((p) => ({ x: p.celsius, y: pick(p), status: p.status ?? 'fitted' })), [points, pick]);
  const band = useMemo(
    () =>
      curve
        .filter((c) => c.band)
        .map((c) => {
          const [lo, hi] = measure === 'ee' ? c.band!.eePercent : fold ? majorShareRange(...c.band!.percentA) : c.band!.percentA;
          return { x: c.celsius, lo, hi };
        }),
    [curve, measure, fold],
  );

  const xDomain = useMemo(() => paddedExtent([...curveData.map(xOf), ...pointData.map(xOf)], 0.02, 5), [curveData, pointData]);
  const yDomain = useMemo<[number, number]>(() => {
    const [lo, hi] = paddedExtent(
      [...curveData.map(yOf), ...pointData.map(yOf), ...band.flatMap((b) => [b.lo, b.hi]), ...(spec != null ? [spec] : [])],
      0.06,
      1,
    );
    const ceiling = 100;
    const floor = measure === 'ee' ? -100 : fold ? 50 : 0;
    return [Math.max(floor, lo), Math.min(ceiling, hi)];
  }, [curveData, pointData, band, spec, measure, fold]);

  // Every series' data, in the order they are drawn below, so the chart is drawn in one pass.
  const series = useMemo(() => {
    const list: PlotSeries[] = [];
    if (band.length > 1) list.push(bandSeries('band', band));
    if (curveData.length > 1) list.push(lineSeries('curve', curveData));
    if (curveData.length === 1) list.push({ key: 'curve', data: curveData, xAccessor: xOf, yAccessor: yOf });
    if (pointData.length > 0) list.push(anchorSeries(pointData));
    return list;
  }, [band, curveData, pointData]);

  // Stable scale settings: xychart rebuilds its scales, and every mark drawn with them, when these change.
  const xScale = useMemo(() => ({ type: 'linear', domain: xDomain, zero: false }) as const, [xDomain]);
  const yScale = useMemo(() => ({ type: 'linear', domain: yDomain, zero: false, nice: true, clamp: true }) as const, [yDomain]);

  return (
    <ChartFigure
      chartRef={ref}
      testId="selectivity-chart"
      height={height}
      legend={
        <>
          <LegendItem label={curveLabel}>
            <LineSwatch color={chartColors.accent} width="2" />
          </LegendItem>
          {band.length > 1 && (
            <LegendItem label={bandLabel ?? 'band'}>
              <BandSwatch fill={chartColors.predictionFill} opacity="0.45" />
            </LegendItem>
          )}
          {pointData.length > 0 && (
            <LegendItem label="measured">
              <circle cx="8" cy="8" r="4.5" fill={chartColors.ink} />
            </LegendItem>
          )}
          {spec != null && (
            <LegendItem label="specification">
              <LineSwatch color={chartColors.caution} width="1.5" dashed />
            </LegendItem>
          )}
        </>
      }
    >
      {chartWidth > 0 && (
        <ChartFrame
          width={chartWidth}
          height={height}
          margin={MARGIN}
          xScale={xScale}
          yScale={yScale}
          title={title}
          gridTicks={6}
          series={series}
        >
          {band.length > 1 && <BandArea dataKey="band" data={band} fill={chartColors.predictionFill} fillOpacity={0.3} />}
          {spec != null && <HorizontalRule y={spec} label={`specification ${fixed(spec, spec % 1 === 0 ? 0 : 1)} ${unitText}`} />}
          {curveData.length > 1 && <FittedLine className="eyrie-curve-line" dataKey="curve" data={curveData} />}
          {curveData.length === 1 && <GlyphSeries dataKey="curve" data={curveData} xAccessor={xOf} yAccessor={yOf} />}
          {pointData.length > 0 && <MeasurementAnchors data={pointData} />}
          <PointMarks marks={marks} />
          {mark && <VerticalMark x={mark.celsius} label={mark.label} />}
          <CelsiusAxis />
          <ChartAxis
            orientation="left"
            numTicks={6}
            label={yLabel}
            labelOffset={30}
            tickFormat={(v) => fixed(Number(v), Number.isInteger(Number(v)) ? 0 : 1)}
          />
          <SnapTooltip<Datum>>
            {(d) => {
              const v = d.kind === 'curve' ? d.c : d.p;
              return (
                <>
                  <TemperatureHeading celsius={d.x} />
                  <div>
                    {d.kind === 'curve' ? curveLabel : 'measured'}:{' '}
                    {family === 'ee'
                      ? `ee ${percent(v.eePercent)} % · er ${enantiomericRatio(v.percentA)}`
                      : formatSelectivity(family, lnRatioOf('ee', v.eePercent))}
                    {d.kind === 'point' && d.p.status === 'censored' ? ' (lower bound)' : ''}
                  </div>
                  {d.kind === 'curve' && d.c.band && (
                    <div>
                      {bandLabel ?? 'band'}:{' '}
                      {(() => {
                        const [lo, hi] =
                          measure === 'ee' ? d.c.band.eePercent : fold ? majorShareRange(...d.c.band.percentA) : d.c.band.percentA;
                        return `${percent(lo)} to ${percent(hi)} ${unitText}`;
                      })()}
                    </div>
                  )}
                </>
              );
            }}
          </SnapTooltip>
        </ChartFrame>
      )}
    </ChartFigure>
  );
}
