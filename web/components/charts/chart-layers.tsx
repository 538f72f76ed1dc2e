import { useContext, useMemo, type ComponentProps } from 'react';
import { Axis, DataContext, GlyphSeries, LineSeries } from '@visx/xychart';
import { fixed } from '../../lib/format';
import { axisLabelProps, chartColors, chartFont, tickLabelProps } from './chart-theme';
import type { PlotSeries } from './chart-frame';

type NumberScale = ((value: number) => number | undefined) & { domain(): unknown[]; range(): unknown[] };

/**
 * The chart's scales and plot area, for marks that xychart has no series for. Null until a series
 * has registered its data: before that xychart hands out a placeholder scale (domain and range
 * [0, 1]), and marks drawn with it would be computed for nothing and drawn in the corner.
 */
export function usePlotArea() {
  const { xScale, yScale, margin, innerWidth, innerHeight, dataRegistry } = useContext(DataContext);
  if (!xScale || !yScale || !margin || !innerWidth || !innerHeight) return null;
  if (!dataRegistry?.entries().some((entry) => entry.data.length > 0)) return null;
  return { x: xScale as unknown as NumberScale, y: yScale as unknown as NumberScale, margin, innerWidth, innerHeight };
}

export interface ErrorBar {
  x: number;
  low?: number | null;
  high?: number | null;
}

/** Pixel coordinates to one decimal: enough for a screen, and a path of a thousand marks stays short. */
const px = (v: number) => Math.round(v * 10) / 10;

/**
 * Vertical error bars with short caps; an open end (null) runs to the edge of the plot. One path for
 * all bars, so a screen of a thousand runs adds one element to the page, not four thousand.
 */
export function ErrorBars({ bars, color = chartColors.inkSoft }: { bars: ErrorBar[]; color?: string }) {
  const area = usePlotArea();
  // Drawn again only when the scales or the plot's height change, not on every chart render.
  const xOf = area?.x;
  const yOf = area?.y;
  const top0 = area?.margin.top ?? 0;
  const innerHeight = area?.innerHeight ?? 0;
  const d = useMemo(() => {
    if (!xOf || !yOf) return '';
    const parts: string[] = [];
    for (const bar of bars) {
      const cx = xOf(bar.x);
      if (cx === undefined || !Number.isFinite(cx)) continue;
      const yLow = bar.low != null ? yOf(bar.low) : undefined;
      const yHigh = bar.high != null ? yOf(bar.high) : undefined;
      if (yLow === undefined && yHigh === undefined) continue;
      const top = yHigh ?? top0;
      const bottom = yLow ?? top0 + innerHeight;
      const x = px(cx);
      parts.push(`M${x} ${px(top)}V${px(bottom)}`);
      if (yHigh !== undefined) parts.push(`M${px(cx - 3)} ${px(yHigh)}H${px(cx + 3)}`);
      if (yLow !== undefined) parts.push(`M${px(cx - 3)} ${px(yLow)}H${px(cx + 3)}`);
    }
    return parts.join('');
  }, [xOf, yOf, top0, innerHeight, bars]);
  if (!area || !d) return null;
  return <path className="eyrie-error-bars" d={d} fill="none" stroke={color} strokeWidth={1} pointerEvents="none" />;
}

/** A measured run as drawn on a chart, in data coordinates. */
export interface PointMark {
  x: number;
  y: number;
  /** fitted: filled circle; excluded: hollow circle; censored: diamond with an upward caret (a lower bound). */
  status: 'fitted' | 'excluded' | 'censored';
  /** Drawn with an outer ring. */
  flagged?: boolean;
}

const MARK_RADIUS = 4.5;
const RING_RADIUS = 8;
const circleAt = (x: number, y: number, r: number) => `M${px(x - r)} ${px(y)}a${r} ${r} 0 1 0 ${2 * r} 0a${r} ${r} 0 1 0 ${-2 * r} 0`;

/** The subpaths of each kind of mark, in pixels. */
export function pointMarkPaths(marks: PointMark[], x: (v: number) => number | undefined, y: (v: number) => number | undefined) {
  const rings: string[] = [];
  const fitted: string[] = [];
  const excluded: string[] = [];
  const diamonds: string[] = [];
  const carets: string[] = [];
  for (const m of marks) {
    const cx = x(m.x);
    const cy = y(m.y);
    if (cx === undefined || cy === undefined || !Number.isFinite(cx) || !Number.isFinite(cy)) continue;
    if (m.flagged) rings.push(circleAt(cx, cy, RING_RADIUS));
    if (m.status === 'censored') {
      diamonds.push(`M${px(cx)} ${px(cy - 5)}l5 5l-5 5l-5 -5Z`);
      carets.push(`M${px(cx - 4)} ${px(cy - 8)}l4 -5l4 5`);
    } else if (m.status === 'excluded') excluded.push(circleAt(cx, cy, MARK_RADIUS));
    else fitted.push(circleAt(cx, cy, MARK_RADIUS));
  }
  return {
    rings: rings.join(''),
    fitted: fitted.join(''),
    excluded: excluded.join(''),
    diamonds: diamonds.join(''),
    carets: carets.join(''),
  };
}

/**
 * The measured runs: one path per kind of mark (rings, filled and hollow circles, diamonds, carets)
 * rather than an element per run, which kept a chart of a thousand runs busy in layout. The marks
 * take no pointer events; the chart's tooltip finds the nearest run from its own data.
 */
export function PointMarks({ marks }: { marks: PointMark[] }) {
  const area = usePlotArea();
  const xOf = area?.x;
  const yOf = area?.y;
  const paths = useMemo(() => (xOf && yOf ? pointMarkPaths(marks, xOf, yOf) : null), [xOf, yOf, marks]);
  if (!paths) return null;
  return (
    <g className="eyrie-points" pointerEvents="none">
      {paths.rings && <path className="eyrie-points-flagged" d={paths.rings} fill="none" stroke={chartColors.flagRing} strokeWidth={1.5} />}
      {paths.excluded && (
        <path
          className="eyrie-points-excluded"
          d={paths.excluded}
          fill={chartColors.paper}
          stroke={chartColors.inkSoft}
          strokeWidth={1.5}
        />
      )}
      {paths.fitted && (
        <path className="eyrie-points-fitted" d={paths.fitted} fill={chartColors.ink} stroke={chartColors.paper} strokeWidth={1} />
      )}
      {paths.diamonds && <path className="eyrie-points-censored" d={paths.diamonds} fill={chartColors.ink} />}
      {paths.carets && (
        <path className="eyrie-points-censored-caret" d={paths.carets} fill="none" stroke={chartColors.ink} strokeWidth={1.5} />
      )}
    </g>
  );
}

interface PlotDatum {
  x: number;
  y: number;
}

// Accessors defined once: a new function on each render makes xychart register the series again.
const plotX = (d: PlotDatum) => d.x;
const plotY = (d: PlotDatum) => d.y;
const noGlyph = () => null;

/** A fitted curve's data as `FittedLine` registers it, for `ChartFrame`'s `series`. */
export const lineSeries = (key: string, data: PlotDatum[]): PlotSeries => ({ key, data, xAccessor: plotX, yAccessor: plotY });

/** The runs' data as `MeasurementAnchors` registers it, for `ChartFrame`'s `series`. */
export const anchorSeries = (data: PlotDatum[]): PlotSeries => ({ key: 'measurements', data, xAccessor: plotX, yAccessor: plotY });

/** The fitted curve: a solid accent line through `data`. */
export function FittedLine(props: { className?: string; dataKey: string; data: PlotDatum[] }) {
  return <LineSeries {...props} xAccessor={plotX} yAccessor={plotY} stroke={chartColors.accent} strokeWidth={2} />;
}

/** Registers the runs with the chart so the tooltip can snap to them, drawing nothing itself (PointMarks draws them). */
export function MeasurementAnchors({ data }: { data: PlotDatum[] }) {
  return <GlyphSeries dataKey="measurements" data={data} xAccessor={plotX} yAccessor={plotY} renderGlyph={noGlyph} />;
}

/** The text beside a rule or marker, in the chart's font with tabular figures. */
function MarkLabel({ x, y, anchor, color, children }: { x: number; y: number; anchor: 'start' | 'end'; color: string; children: string }) {
  return (
    <text x={x} y={y} textAnchor={anchor} fontFamily={chartFont} fontSize={11} fill={color} style={{ fontVariantNumeric: 'tabular-nums' }}>
      {children}
    </text>
  );
}

/** A labelled horizontal rule across the plot (e.g. a specification such as 99 % ee). */
export function HorizontalRule({ y, label, color = chartColors.caution }: { y: number; label: string; color?: string }) {
  const area = usePlotArea();
  if (!area) return null;
  const py = area.y(y);
  if (py === undefined || !Number.isFinite(py)) return null;
  const x0 = area.margin.left;
  const x1 = area.margin.left + area.innerWidth;
  return (
    <g className="eyrie-rule" pointerEvents="none">
      <line x1={x0} x2={x1} y1={py} y2={py} stroke={color} strokeWidth={1.25} strokeDasharray="6 3" />
      <MarkLabel x={x1 - 4} y={py - 4} anchor="end" color={color}>
        {label}
      </MarkLabel>
    </g>
  );
}

/** A labelled vertical marker (e.g. the proposed temperature). */
export function VerticalMark({ x, label, color = chartColors.accentDark }: { x: number; label: string; color?: string }) {
  const area = usePlotArea();
  if (!area) return null;
  const px = area.x(x);
  if (px === undefined || !Number.isFinite(px)) return null;
  const top = area.margin.top;
  const bottom = area.margin.top + area.innerHeight;
  const nearRight = px > area.margin.left + area.innerWidth * 0.75;
  return (
    <g className="eyrie-mark" pointerEvents="none">
      <line x1={px} x2={px} y1={top} y2={bottom} stroke={color} strokeWidth={1} strokeDasharray="2 3" />
      <MarkLabel x={nearRight ? px - 4 : px + 4} y={top + 12} anchor={nearRight ? 'end' : 'start'} color={color}>
        {label}
      </MarkLabel>
    </g>
  );
}

type TickProps = Parameters<NonNullable<ComponentProps<typeof Axis>['tickComponent']>>[0];

/**
 * A tick label as one plain SVG text. visx's own label measures every word of it in the page
 * (which makes the browser lay out the page as React renders) and works out its offset with a CSS
 * calc() parser, for labels that are single numbers here: same place, same type, none of that work.
 */
function TickLabel(props: TickProps) {
  // Text's own props (wrapping, anchoring of several lines, rotation) have nothing to do for a one-line number.
  const {
    formattedValue,
    verticalAnchor: _verticalAnchor,
    width: _width,
    angle: _angle,
    scaleToFit: _scaleToFit,
    lineHeight: _lineHeight,
    capHeight: _capHeight,
    innerRef: _innerRef,
    innerTextRef: _innerTextRef,
    ...svg
  } = props;
  return <text {...svg}>{formattedValue}</text>;
}

type AxisProps = Omit<ComponentProps<typeof Axis>, 'labelProps' | 'tickLabelProps'>;

/**
 * The axis title, where visx puts it (centred along the axis, beyond the tick labels: tick length,
 * the offset and the tick labels' font size, plus the title's own size below a bottom axis; turned
 * a quarter for a vertical axis) as one plain SVG text, runs of spaces written as one as visx does:
 * visx's text component measures each word of a title in the page before drawing it, which a
 * one-line title does not need.
 */
function AxisLabel({
  orientation,
  label,
  labelOffset,
  hasTicks,
}: {
  orientation: string;
  label: string;
  labelOffset: number;
  hasTicks: boolean;
}) {
  const area = usePlotArea();
  const { width, height, theme } = useContext(DataContext);
  if (!area || width == null || height == null) return null;
  const vertical = orientation === 'left' || orientation === 'right';
  const tickLength = (vertical ? theme?.axisStyles?.y?.left : theme?.axisStyles?.x?.bottom)?.tickLength ?? 8;
  // visx reserves at least 10 px for the tick labels, or their own size when there are any.
  const tickFontSize = hasTicks ? Math.max(10, tickLabelProps().fontSize) : 10;
  const sign = orientation === 'left' || orientation === 'top' ? -1 : 1;
  const [r0, r1] = (vertical ? area.y : area.x).range() as [number, number];
  const middle = (r0 + r1) / 2;
  const groupLeft = orientation === 'left' ? area.margin.left : orientation === 'right' ? width - area.margin.right : 0;
  const groupTop = orientation === 'bottom' ? height - area.margin.bottom : orientation === 'top' ? area.margin.top : 0;
  const x = vertical ? sign * middle : middle;
  const y = vertical
    ? -(tickLength + labelOffset)
    : sign * (tickLength + labelOffset + tickFontSize + (orientation === 'bottom' ? axisLabelProps.fontSize : 0));
  return (
    <g transform={`translate(${groupLeft}, ${groupTop})`}>
      <text
        className="visx-axis-label"
        x={x}
        y={y}
        transform={vertical ? `rotate(${sign * 90})` : undefined}
        textAnchor="middle"
        {...axisLabelProps}
      >
        {label.replace(/[^\S\u00a0]+/g, ' ')}
      </text>
    </g>
  );
}

/** An axis in the charts' type and colours; every chart draws its axes through this. */
export function ChartAxis({ label, labelOffset = 14, ...props }: AxisProps) {
  return (
    <>
      <Axis tickComponent={TickLabel} {...props} tickLabelProps={tickLabelProps} />
      {label && (
        <AxisLabel
          orientation={props.orientation}
          label={label}
          labelOffset={labelOffset}
          hasTicks={props.tickValues ? props.tickValues.length > 0 : true}
        />
      )}
    </>
  );
}

/** The bottom axis of every chart drawn against temperature in °C. */
export function CelsiusAxis() {
  return <ChartAxis orientation="bottom" numTicks={7} label="Temperature (°C)" tickFormat={(v) => fixed(Number(v), 0)} />;
}
