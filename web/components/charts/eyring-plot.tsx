import { useMemo, type ReactNode } from 'react';
import { LineSeries } from '@visx/xychart';
import { fixed, sig } from '../../lib/format';
import { ChartFigure, BandArea, ChartFrame, InverseKelvinAxis, SnapTooltip, bandSeries, type PlotSeries } from './chart-frame';
import {
  ChartAxis,
  ErrorBars,
  FittedLine,
  MeasurementAnchors,
  PointMarks,
  VerticalMark,
  anchorSeries,
  lineSeries,
  type PointMark,
} from './chart-layers';
import { chartColors, paddedExtent } from './chart-theme';
import { useElementWidth } from './use-element-width';
import { CELSIUS_OFFSET_K as CELSIUS_OFFSET } from '../../../api/science/quantities';

/** One measured point on an Eyring plot (y = ln r at temperature `kelvin`). */
export interface EyringPlotPoint {
  id: string | number;
  kelvin: number;
  lnRatio: number;
  /** Error-bar ends in ln r (asymmetric allowed); null or absent = no bar on that side. */
  lnRatioLow?: number | null;
  lnRatioHigh?: number | null;
  /** fitted: filled circle; excluded: hollow circle; censored: diamond with an upward caret (a lower bound). */
  status: 'fitted' | 'excluded' | 'censored';
  /** Residual flagged by the fit: drawn with an outer ring. */
  flagged?: boolean;
  label?: string;
}

/** The fitted line sampled over temperature, with its bands (all in ln r). */
export interface EyringCurvePoint {
  kelvin: number;
  lnRatio: number;
  /** Confidence band for the mean line. */
  confidence?: [number, number] | null;
  /** Prediction band for a new run. */
  prediction?: [number, number] | null;
}

/** A straight branch ln r = intercept + slope·(1/T), drawn only over [fromKelvin, toKelvin]. */
export interface EyringBranchLine {
  label: string;
  fromKelvin: number;
  toKelvin: number;
  slope: number;
  intercept: number;
}

export interface EyringPlotProps {
  points: EyringPlotPoint[];
  curve?: EyringCurvePoint[];
  branches?: EyringBranchLine[];
  /** A temperature to mark with a vertical rule (e.g. the proposed temperature). */
  mark?: { kelvin: number; label: string } | null;
  /** Confidence level of the bands, for the legend (e.g. 0.95). */
  confidenceLevel?: number;
  /** Accessible name of the chart. */
  title: string;
  /** Fixed width in px; by default the chart fills its parent. */
  width?: number;
  height?: number;
}

type Datum = { kind: 'point'; x: number; y: number; p: EyringPlotPoint } | { kind: 'curve'; x: number; y: number; c: EyringCurvePoint };

const invT = (kelvin: number) => 1000 / kelvin;
const MARGIN = { top: 40, right: 20, bottom: 46, left: 70 };
// Accessors defined once: a new function on each render makes xychart register the series again.
const lineX = (d: { x: number }) => d.x;
const lineY = (d: { y: number }) => d.y;

/** Round °C tick values that fall inside a 1000/T domain, for the secondary top axis. */
/** Least room between two °C labels on the top axis, in pixels (a label such as "−100" is about 28 px wide). */
const MIN_TICK_GAP = 36;

/**
 * Round °C ticks for the top axis, as 1000/T positions. Equal steps in °C bunch up towards the warm end of a
 * 1/T axis, so the step is the finest (at most 7 ticks) whose closest pair of labels still has room on this
 * plot's width; no two labels overprint. Should even the coarsest step be too close, ticks are dropped.
 */
export function celsiusTicks(xDomain: [number, number], innerWidth: number): number[] {
  const kA = 1000 / xDomain[1];
  const kB = 1000 / xDomain[0];
  const cLo = Math.min(kA, kB) - CELSIUS_OFFSET;
  const cHi = Math.max(kA, kB) - CELSIUS_OFFSET;
  const span = cHi - cLo;
  const pxPerUnit = innerWidth / Math.abs(xDomain[1] - xDomain[0] || 1);
  const ticksFor = (step: number) => {
    const positions: number[] = [];
    for (let c = Math.ceil(cLo / step) * step; c <= cHi; c += step) positions.push(invT(c + CELSIUS_OFFSET));
    return positions.sort((p, q) => p - q);
  };
  const roomy = (positions: number[]) => positions.every((x, i) => i === 0 || (x - positions[i - 1]) * pxPerUnit >= MIN_TICK_GAP);
  const steps = [5, 10, 20, 25, 50, 100, 200, 500].filter((s) => span / s <= 7);
  for (const step of steps) {
    const positions = ticksFor(step);
    if (roomy(positions)) return positions;
  }
  const kept: number[] = [];
  for (const x of ticksFor(steps[steps.length - 1] ?? 500))
    if (kept.length === 0 || (x - kept[kept.length - 1]) * pxPerUnit >= MIN_TICK_GAP) kept.push(x);
  return kept;
}

const STATUS_TEXT: Record<EyringPlotPoint['status'], string> = {
  fitted: 'in the fit',
  excluded: 'excluded from the fit',
  censored: 'lower bound (censored)',
};

/**
 * Eyring plot of a selectivity screen: ln r against 1000/T, measured points (with optional
 * error bars), the fitted line with its confidence and prediction bands as computed by the
 * API, optional straight branches, and a secondary °C axis along the top.
 */
export function EyringPlot({
  points,
  curve = [],
  branches = [],
  mark,
  confidenceLevel = 0.95,
  title,
  width,
  height = 340,
}: EyringPlotProps) {
  const [ref, measured] = useElementWidth<HTMLDivElement>();
  const chartWidth = width ?? measured;

  const pointData = useMemo<Datum[]>(() => points.map((p) => ({ kind: 'point', x: invT(p.kelvin), y: p.lnRatio, p })), [points]);
  const marks = useMemo<PointMark[]>(
    () => points.map((p) => ({ x: invT(p.kelvin), y: p.lnRatio, status: p.status, flagged: p.flagged })),
    [points],
  );
  const errorBars = useMemo(() => points.map((p) => ({ x: invT(p.kelvin), low: p.lnRatioLow, high: p.lnRatioHigh })), [points]);
  const curveData = useMemo<Datum[]>(() => curve.map((c) => ({ kind: 'curve', x: invT(c.kelvin), y: c.lnRatio, c })), [curve]);
  const confidence = useMemo(
    () => curve.filter((c) => c.confidence).map((c) => ({ x: invT(c.kelvin), lo: c.confidence![0], hi: c.confidence![1] })),
    [curve],
  );
  const prediction = useMemo(
    () => curve.filter((c) => c.prediction).map((c) => ({ x: invT(c.kelvin), lo: c.prediction![0], hi: c.prediction![1] })),
    [curve],
  );
  const branchData = useMemo(
    () =>
      branches.map((b) => ({
        label: b.label,
        data: [b.fromKelvin, b.toKelvin].map((k) => ({ x: invT(k), y: b.intercept + b.slope / k })),
      })),
    [branches],
  );

  const xDomain = useMemo(
    () =>
      paddedExtent(
        [...pointData.map((d) => d.x), ...curveData.map((d) => d.x), ...branchData.flatMap((b) => b.data.map((d) => d.x))],
        0.04,
        0.1,
      ),
    [pointData, curveData, branchData],
  );
  const yDomain = useMemo(
    () =>
      paddedExtent(
        [
          ...points.flatMap((p) => [p.lnRatio, p.lnRatioLow ?? NaN, p.lnRatioHigh ?? NaN]),
          ...curve.flatMap((c) => [c.lnRatio, ...(c.prediction ?? []), ...(c.confidence ?? [])]),
          ...branchData.flatMap((b) => b.data.map((d) => d.y)),
        ],
        0.08,
        0.5,
      ),
    [points, curve, branchData],
  );
  // Stable scale settings: xychart rebuilds its scales, and every mark drawn with them, when these change.
  const xScale = useMemo(() => ({ type: 'linear', domain: xDomain, zero: false }) as const, [xDomain]);
  const yScale = useMemo(() => ({ type: 'linear', domain: yDomain, zero: false, nice: true }) as const, [yDomain]);
  // Every series' data, in the order they are drawn below, so the chart is drawn in one pass.
  const series = useMemo(() => {
    const list: PlotSeries[] = [];
    if (prediction.length > 1) list.push(bandSeries('prediction band', prediction));
    if (confidence.length > 1) list.push(bandSeries('confidence band', confidence));
    if (curveData.length > 1) list.push(lineSeries('fitted line', curveData));
    for (const b of branchData) list.push({ key: `branch ${b.label}`, data: b.data, xAccessor: lineX, yAccessor: lineY });
    if (pointData.length > 0) list.push(anchorSeries(pointData));
    return list;
  }, [prediction, confidence, curveData, branchData, pointData]);
  // Inner width: the chart less its left (70) and right (20) margins.
  const topTicks = useMemo(() => celsiusTicks(xDomain, Math.max(1, chartWidth - 90)), [xDomain, chartWidth]);
  const levelText = `${fixed(confidenceLevel * 100, 0)} %`;

  return (
    <ChartFigure
      chartRef={ref}
      testId="eyring-plot"
      height={height}
      legend={
        <>
          <LegendItem label="measured, in the fit">
            <circle cx="8" cy="8" r="4.5" fill={chartColors.ink} />
          </LegendItem>
          <LegendItem label="excluded">
            <circle cx="8" cy="8" r="4" fill="#fff" stroke={chartColors.inkSoft} strokeWidth="1.5" />
          </LegendItem>
          <LegendItem label="censored: lower bound">
            <path d="M8 7 L12 11 L8 15 L4 11 Z M4.5 5.5 L8 2 L11.5 5.5" fill={chartColors.ink} stroke={chartColors.ink} strokeWidth="1.2" />
          </LegendItem>
          <LegendItem label="flagged residual">
            <circle cx="8" cy="8" r="6" fill="none" stroke={chartColors.flagRing} strokeWidth="1.5" />
          </LegendItem>
          {curveData.length > 1 && (
            <LegendItem label="fitted line">
              <LineSwatch color={chartColors.accent} width="2" />
            </LegendItem>
          )}
          {confidence.length > 1 && (
            <LegendItem label={`${levelText} confidence band (mean line)`}>
              <BandSwatch fill={chartColors.confidenceFill} opacity="0.35" />
            </LegendItem>
          )}
          {prediction.length > 1 && (
            <LegendItem label={`${levelText} prediction band (new run)`}>
              <BandSwatch fill={chartColors.predictionFill} opacity="0.35" />
            </LegendItem>
          )}
          {branchData.length > 0 && (
            <LegendItem label="two-branch fit">
              <LineSwatch color={chartColors.branch} width="1.75" dashed />
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
          {prediction.length > 1 && (
            <BandArea dataKey="prediction band" data={prediction} fill={chartColors.predictionFill} fillOpacity={0.22} />
          )}
          {confidence.length > 1 && (
            <BandArea dataKey="confidence band" data={confidence} fill={chartColors.confidenceFill} fillOpacity={0.25} />
          )}
          {curveData.length > 1 && <FittedLine className="eyrie-fit-line" dataKey="fitted line" data={curveData} />}
          {branchData.map((b) => (
            <LineSeries
              key={b.label}
              className="eyrie-branch-line"
              dataKey={`branch ${b.label}`}
              data={b.data}
              xAccessor={lineX}
              yAccessor={lineY}
              stroke={chartColors.branch}
              strokeWidth={1.75}
              strokeDasharray="7 4"
              enableEvents={false}
            />
          ))}
          <ErrorBars bars={errorBars} />
          <PointMarks marks={marks} />
          {pointData.length > 0 && <MeasurementAnchors data={pointData} />}
          {mark && <VerticalMark x={invT(mark.kelvin)} label={mark.label} />}
          <InverseKelvinAxis />
          <ChartAxis
            orientation="left"
            numTicks={6}
            label="ln r   (r = [A]/[B])"
            labelOffset={34}
            tickFormat={(v) => fixed(Number(v), 1)}
          />
          <ChartAxis
            orientation="top"
            tickValues={topTicks}
            label="T (°C)"
            labelOffset={10}
            tickFormat={(v) => fixed(1000 / Number(v) - CELSIUS_OFFSET, 0)}
          />
          <SnapTooltip<Datum> showDatumGlyph={false}>
            {(d) => {
              const kelvin = 1000 / d.x;
              return (
                <>
                  <div className="font-medium">
                    {fixed(kelvin - CELSIUS_OFFSET, 1)} °C · {fixed(kelvin, 2)} K
                  </div>
                  <div>1000/T = {fixed(d.x, 3)} K⁻¹</div>
                  {d.kind === 'point' ? (
                    <>
                      <div>
                        ln r = {fixed(d.y, 3)} (r = {sig(Math.exp(d.y), 3)})
                      </div>
                      <div>
                        {d.p.label ? `${d.p.label} · ` : ''}
                        {STATUS_TEXT[d.p.status]}
                        {d.p.flagged ? ' · flagged residual' : ''}
                      </div>
                    </>
                  ) : (
                    <>
                      <div>fitted ln r = {fixed(d.y, 3)}</div>
                      {d.c.prediction && (
                        <div>
                          {levelText} prediction {fixed(d.c.prediction[0], 2)} to {fixed(d.c.prediction[1], 2)}
                        </div>
                      )}
                    </>
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

export function LegendItem({ label, children }: { label: string; children: ReactNode }) {
  return (
    <li className="flex items-center gap-1.5">
      <svg aria-hidden="true" width="16" height="16" viewBox="0 0 16 16">
        {children}
      </svg>
      {label}
    </li>
  );
}

/** A legend sample of a line: solid, or dashed for a rule or a secondary fit. */
export function LineSwatch({ color, width, dashed = false }: { color: string; width: string; dashed?: boolean }) {
  return <line x1="1" x2="15" y1="8" y2="8" stroke={color} strokeWidth={width} strokeDasharray={dashed ? '4 2' : undefined} />;
}

/** A legend sample of a shaded band. */
export function BandSwatch({ fill, opacity }: { fill: string; opacity: string }) {
  return <rect x="1" y="3" width="14" height="10" fill={fill} fillOpacity={opacity} />;
}
