import { useContext } from 'react';
import { Axis, DataContext } from '@visx/xychart';
import { fixed } from '../../lib/format';
import { axisLabelProps, chartColors, chartFont, tickLabelProps } from './chart-theme';

type NumberScale = ((value: number) => number | undefined) & { domain(): unknown[] };

/** The chart's scales and plot area, for marks that xychart has no series for. */
export function usePlotArea() {
  const { xScale, yScale, margin, innerWidth, innerHeight } = useContext(DataContext);
  if (!xScale || !yScale || !margin || !innerWidth || !innerHeight) return null;
  return { x: xScale as unknown as NumberScale, y: yScale as unknown as NumberScale, margin, innerWidth, innerHeight };
}

export interface ErrorBar {
  x: number;
  low?: number | null;
  high?: number | null;
}

/** Vertical error bars with short caps; an open end (null) is drawn as an arrowhead-free open line. */
export function ErrorBars({ bars, color = chartColors.inkSoft }: { bars: ErrorBar[]; color?: string }) {
  const area = usePlotArea();
  if (!area) return null;
  return (
    <g className="eyrie-error-bars" pointerEvents="none">
      {bars.map((bar, i) => {
        const cx = area.x(bar.x);
        if (cx === undefined || !Number.isFinite(cx)) return null;
        const yLow = bar.low != null ? area.y(bar.low) : undefined;
        const yHigh = bar.high != null ? area.y(bar.high) : undefined;
        if (yLow === undefined && yHigh === undefined) return null;
        const top = yHigh ?? area.margin.top;
        const bottom = yLow ?? area.margin.top + area.innerHeight;
        return (
          <g key={i} stroke={color} strokeWidth={1}>
            <line x1={cx} x2={cx} y1={top} y2={bottom} />
            {yHigh !== undefined && <line x1={cx - 3} x2={cx + 3} y1={yHigh} y2={yHigh} />}
            {yLow !== undefined && <line x1={cx - 3} x2={cx + 3} y1={yLow} y2={yLow} />}
          </g>
        );
      })}
    </g>
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
      <text
        x={x1 - 4}
        y={py - 4}
        textAnchor="end"
        fontFamily={chartFont}
        fontSize={11}
        fill={color}
        style={{ fontVariantNumeric: 'tabular-nums' }}
      >
        {label}
      </text>
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
      <text
        x={nearRight ? px - 4 : px + 4}
        y={top + 12}
        textAnchor={nearRight ? 'end' : 'start'}
        fontFamily={chartFont}
        fontSize={11}
        fill={color}
        style={{ fontVariantNumeric: 'tabular-nums' }}
      >
        {label}
      </text>
    </g>
  );
}

/** The bottom axis of every chart drawn against temperature in °C. */
export function CelsiusAxis() {
  return (
    <Axis
      orientation="bottom"
      numTicks={7}
      label="Temperature (°C)"
      labelProps={axisLabelProps}
      tickLabelProps={tickLabelProps}
      tickFormat={(v) => fixed(Number(v), 0)}
    />
  );
}
