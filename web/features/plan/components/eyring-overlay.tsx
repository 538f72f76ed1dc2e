import { useMemo } from 'react';
import { GlyphSeries, LineSeries } from '@visx/xychart';
import { ChartFigure, BandArea, ChartFrame, InverseKelvinAxis } from '../../../components/charts/chart-frame';
import { chartColors, paddedExtent } from '../../../components/charts/chart-theme';
import { ChartAxis } from '../../../components/charts/chart-layers';
import { useElementWidth } from '../../../components/charts/use-element-width';
import { fixed } from '../../../lib/format';
import type { ComparisonView } from '../api/plan';

const COLORS = [chartColors.accent, chartColors.ink, chartColors.branch, chartColors.caution, '#0369a1', '#be185d'];
const DASHES = ['', '6 3', '2 3', '9 3 2 3', '4 4', '1 2'];
const SHAPES = ['circle', 'square', 'triangle', 'diamond', 'circle', 'square'] as const;

function Marker({ shape, x, y, color }: { shape: (typeof SHAPES)[number]; x: number; y: number; color: string }) {
  const r = 3.5;
  if (shape === 'square') return <rect x={x - r} y={y - r} width={2 * r} height={2 * r} fill={color} />;
  if (shape === 'triangle') return <path d={`M${x} ${y - r - 1}L${x + r + 0.5} ${y + r}L${x - r - 0.5} ${y + r}Z`} fill={color} />;
  if (shape === 'diamond') return <path d={`M${x} ${y - r - 1}L${x + r + 1} ${y}L${x} ${y + r + 1}L${x - r - 1} ${y}Z`} fill={color} />;
  return <circle cx={x} cy={y} r={r} fill={color} />;
}

interface Datum {
  x: number;
  y: number;
}

/** Eyring plots of several campaigns on one frame: ln r against 1000/T, runs as markers, fitted lines; shape and dash tell them apart. */
export function EyringOverlay({ result }: { result: ComparisonView['result'] }) {
  const [ref, width] = useElementWidth<HTMLDivElement>();
  const shown = result.campaigns.filter((c) => c.fit);
  const all = useMemo(
    () =>
      result.campaigns.flatMap((c) =>
        c.fit
          ? [
              ...c.fit.eyring.map((p) => ({ x: 1000 * p.inverseKelvin, y: p.lnRatio })),
              ...c.fit.curve.map((p) => ({ x: 1000 / p.kelvin, y: p.lnRatio })),
            ]
          : [],
      ),
    [result],
  );
  const xDomain = useMemo(
    () =>
      paddedExtent(
        all.map((p) => p.x),
        0.04,
        0.1,
      ),
    [all],
  );
  const yDomain = useMemo(
    () =>
      paddedExtent(
        all.map((p) => p.y),
        0.06,
        0.5,
      ),
    [all],
  );
  return (
    <ChartFigure
      chartRef={ref}
      testId="comparison-eyring"
      legend={
        <>
          {shown.map((c, i) => (
            <li key={c.id} className="flex items-center gap-1.5">
              <svg width="18" height="12" aria-hidden="true">
                <line
                  x1="1"
                  x2="17"
                  y1="6"
                  y2="6"
                  stroke={COLORS[i % COLORS.length]}
                  strokeWidth={2}
                  strokeDasharray={DASHES[i] || undefined}
                />
                <Marker shape={SHAPES[i]!} x={9} y={6} color={COLORS[i % COLORS.length]!} />
              </svg>
              {c.title}
            </li>
          ))}
        </>
      }
      notes={
        <>
          <p className="mt-1 text-xs text-ink-600">Shaded: the 95 % confidence band of each campaign's fitted line.</p>
        </>
      }
    >
      {width > 0 && all.length > 0 && (
        <ChartFrame
          width={width}
          height={280}
          margin={{ top: 14, right: 16, bottom: 46, left: 64 }}
          xScale={{ type: 'linear', domain: xDomain, zero: false }}
          yScale={{ type: 'linear', domain: yDomain, zero: false, nice: true }}
          title="Eyring plots of the compared campaigns"
          gridTicks={5}
        >
          {shown.map((c, i) => {
            const color = COLORS[i % COLORS.length]!;
            const line: Datum[] = c.fit!.curve.map((p) => ({ x: 1000 / p.kelvin, y: p.lnRatio }));
            const runs: Datum[] = c
              .fit!.eyring.filter((p) => p.status === 'fitted')
              .map((p) => ({ x: 1000 * p.inverseKelvin, y: p.lnRatio }));
            const band = c.fit!.curve.map((p) => ({ x: 1000 / p.kelvin, lo: p.lnInterval[0], hi: p.lnInterval[1] }));
            return (
              <g key={c.id}>
                <BandArea dataKey={`${c.id}-band`} data={band} fill={color} fillOpacity={0.14} />
                <LineSeries
                  dataKey={`${c.id}-line`}
                  data={line}
                  xAccessor={(d) => d.x}
                  yAccessor={(d) => d.y}
                  stroke={color}
                  strokeWidth={2}
                  strokeDasharray={DASHES[i] || undefined}
                />
                <GlyphSeries
                  dataKey={`${c.id}-runs`}
                  data={runs}
                  xAccessor={(d) => d.x}
                  yAccessor={(d) => d.y}
                  renderGlyph={({ x, y }) => <Marker shape={SHAPES[i]!} x={x} y={y} color={color} />}
                />
              </g>
            );
          })}
          <InverseKelvinAxis />
          <ChartAxis orientation="left" numTicks={5} label="ln r" labelOffset={36} tickFormat={(v) => fixed(Number(v), 1)} />
        </ChartFrame>
      )}
    </ChartFigure>
  );
}
