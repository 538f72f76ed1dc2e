import { useId, useMemo } from 'react';
import { ChartFrame, valueScale } from '../../../components/charts/chart-frame';
import { CelsiusAxis, ChartAxis, FittedLine, HorizontalRule, VerticalMark, usePlotArea } from '../../../components/charts/chart-layers';
import { chartColors, chartFont, paddedExtent } from '../../../components/charts/chart-theme';
import { useElementWidth } from '../../../components/charts/use-element-width';
import { fixed, sig } from '../../../lib/format';
import type { PlanResult } from '../api/plan';

type Point = PlanResult['curve'][number];

export const CONSTRAINT_WORDS: Record<string, string> = {
  specification: 'specification',
  time: 'reaction time',
  hold: 'hold',
  jacket: 'jacket range',
};

/** Stretches of the curve where some constraint fails, with the constraints that exclude them. */
export function excludedRegions(curve: Point[]): { from: number; to: number; label: string }[] {
  const out: { from: number; to: number; label: string; failing: Set<string> }[] = [];
  curve.forEach((p, i) => {
    if (p.feasible) return;
    const prev = out[out.length - 1];
    const left = i > 0 ? (curve[i - 1]!.celsius + p.celsius) / 2 : p.celsius;
    const right = i < curve.length - 1 ? (curve[i + 1]!.celsius + p.celsius) / 2 : p.celsius;
    if (prev && i > 0 && !curve[i - 1]!.feasible) {
      prev.to = right;
      p.failing.forEach((f) => prev.failing.add(f));
    } else out.push({ from: left, to: right, label: '', failing: new Set(p.failing) });
  });
  return out.map((r) => ({ from: r.from, to: r.to, label: `excluded: ${[...r.failing].map((f) => CONSTRAINT_WORDS[f] ?? f).join(', ')}` }));
}

/** Hatched, labelled shading of excluded temperatures (the hatch and the words carry it, not only the colour). */
function Excluded({ regions, labelled }: { regions: { from: number; to: number; label: string }[]; labelled: boolean }) {
  const area = usePlotArea();
  const id = useId().replace(/:/g, '');
  if (!area) return null;
  return (
    <g className="eyrie-excluded" pointerEvents="none">
      <defs>
        <pattern id={`hatch-${id}`} width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <line x1="0" y1="0" x2="0" y2="6" stroke="#94a3b8" strokeWidth="1.5" />
        </pattern>
      </defs>
      {regions.map((r, i) => {
        const x0 = area.x(r.from) ?? area.margin.left;
        const x1 = area.x(r.to) ?? area.margin.left + area.innerWidth;
        const w = Math.abs(x1 - x0);
        return (
          <g key={i}>
            <rect
              x={Math.min(x0, x1)}
              y={area.margin.top}
              width={w}
              height={area.innerHeight}
              fill={`url(#hatch-${id})`}
              fillOpacity={0.55}
            />
            {labelled && w > 70 && (
              <text
                x={Math.min(x0, x1) + 4}
                y={area.margin.top + area.innerHeight - 6}
                fontFamily={chartFont}
                fontSize={11}
                fill={chartColors.inkSoft}
              >
                {r.label}
              </text>
            )}
          </g>
        );
      })}
    </g>
  );
}

/** A band between two lines (the interval), drawn as one filled path. */
function Band({ points }: { points: { x: number; lo: number; hi: number }[] }) {
  const area = usePlotArea();
  if (!area || points.length < 2) return null;
  const ok = points.filter((p) => [p.x, p.lo, p.hi].every(Number.isFinite));
  const top = ok.map((p) => `${area.x(p.x)},${area.y(p.hi)}`);
  const bottom = ok.map((p) => `${area.x(p.x)},${area.y(p.lo)}`).reverse();
  return (
    <path
      d={`M${top.join('L')}L${bottom.join('L')}Z`}
      fill={chartColors.predictionFill}
      fillOpacity={0.35}
      stroke="none"
      pointerEvents="none"
    />
  );
}

interface PanelProps {
  title: string;
  yLabel: string;
  line: { x: number; y: number }[];
  band?: { x: number; lo: number; hi: number }[];
  rule?: { y: number; label: string };
  regions: { from: number; to: number; label: string }[];
  recommended: number | null;
  yScale?: 'linear' | 'log';
  yDomain?: [number, number];
  formatY: (y: number) => string;
  labelled?: boolean;
  testId: string;
}

function WindowPanel({
  title,
  yLabel,
  line,
  band,
  rule,
  regions,
  recommended,
  yScale = 'linear',
  yDomain: fixedDomain,
  formatY,
  labelled = false,
  testId,
}: PanelProps) {
  const [ref, width] = useElementWidth<HTMLDivElement>();
  const data = line.filter((p) => Number.isFinite(p.y) && (yScale === 'linear' || p.y > 0));
  const xDomain = useMemo(
    () =>
      paddedExtent(
        data.map((p) => p.x),
        0,
        5,
      ),
    [data],
  );
  const yDomain = useMemo<[number, number]>(() => {
    if (fixedDomain) return fixedDomain;
    const ys = [...data.map((p) => p.y), ...(band ?? []).flatMap((b) => [b.lo, b.hi]), ...(rule ? [rule.y] : [])].filter(
      (v) => Number.isFinite(v) && (yScale === 'linear' || v > 0),
    );
    if (yScale === 'log') {
      const lo = 10 ** Math.floor(Math.log10(Math.min(...ys)));
      const hi = 10 ** Math.ceil(Math.log10(Math.max(...ys)));
      return [lo, hi > lo ? hi : lo * 10];
    }
    return paddedExtent(ys, 0.06, 0.5);
  }, [data, band, rule, yScale, fixedDomain]);
  return (
    <figure className="m-0">
      <figcaption className="text-xs font-medium text-ink-700">{title}</figcaption>
      <div ref={ref} className="w-full" data-testid={testId}>
        {width > 0 && data.length > 1 && (
          <ChartFrame
            width={width}
            height={180}
            margin={{ top: 14, right: 16, bottom: 46, left: 70 }}
            xScale={{ type: 'linear', domain: xDomain, zero: false }}
            yScale={valueScale(yScale, yDomain)}
            title={title}
            gridTicks={4}
          >
            <Excluded regions={regions} labelled={labelled} />
            {band && <Band points={band} />}
            <FittedLine dataKey={testId} data={data} />
            {rule && <HorizontalRule y={rule.y} label={rule.label} />}
            {recommended !== null && <VerticalMark x={recommended} label={`▼ recommended ${fixed(recommended, 1)} °C`} />}
            <CelsiusAxis />
            <ChartAxis orientation="left" numTicks={4} label={yLabel} labelOffset={40} tickFormat={(v) => formatY(Number(v))} />
          </ChartFrame>
        )}
      </div>
    </figure>
  );
}

const MEASURE_UNIT: Record<string, string> = { ee: '% ee', er: '% major', percentA: '% major', dr: ':1 dr' };

/**
 * The operating window: predicted selectivity with its band and the specification line, the
 * probability of meeting it, time to the target conversion and ee after the hold, all against
 * temperature; excluded temperatures hatched and named; the recommendation marked.
 */
export function OperatingWindowChart({ result, maxTimeHours }: { result: PlanResult; maxTimeHours?: number | null }) {
  const curve = result.curve;
  const regions = excludedRegions(curve);
  const rec = result.recommended?.celsius ?? null;
  const spec = result.specification;
  const unit = MEASURE_UNIT[spec.measure] ?? '';
  const hasTime = curve.some((p) => p.timeToTarget);
  const hasHold = curve.some((p) => p.eeAfterHold !== null);
  return (
    <div className="grid gap-3 md:grid-cols-2" data-testid="operating-window">
      <WindowPanel
        title={`Predicted selectivity, one new run (band: 95 % interval)`}
        yLabel={unit}
        line={curve.map((p) => ({ x: p.celsius, y: p.predicted.value }))}
        band={curve.map((p) => ({ x: p.celsius, lo: p.predicted.band[0], hi: p.predicted.band[1] }))}
        rule={{ y: spec.minimum, label: `specification ≥ ${spec.minimum} ${unit}` }}
        regions={regions}
        recommended={rec}
        formatY={(y) => sig(y, 4)}
        labelled
        testId="window-selectivity"
      />
      <WindowPanel
        title="Probability that the next run meets the specification"
        yLabel="probability (%)"
        line={curve.map((p) => ({ x: p.celsius, y: 100 * p.probabilityMeetsSpec }))}
        rule={{ y: 100 * spec.probability, label: `required ${fixed(100 * spec.probability, 1)} %` }}
        regions={regions}
        recommended={rec}
        yDomain={[0, 100]}
        formatY={(y) => fixed(y, 0)}
        testId="window-probability"
      />
      {hasTime && (
        <WindowPanel
          title="Time to the target conversion (band: 95 % interval of the rate line)"
          yLabel="hours"
          yScale="log"
          line={curve.filter((p) => p.timeToTarget).map((p) => ({ x: p.celsius, y: p.timeToTarget!.s / 3600 }))}
          band={curve
            .filter((p) => p.timeBandSeconds)
            .map((p) => ({ x: p.celsius, lo: p.timeBandSeconds![0] / 3600, hi: p.timeBandSeconds![1] / 3600 }))}
          {...(maxTimeHours ? { rule: { y: maxTimeHours, label: `longest allowed ${sig(maxTimeHours, 3)} h` } } : {})}
          regions={regions}
          recommended={rec}
          formatY={(y) => sig(y, 2)}
          testId="window-time"
        />
      )}
      {hasHold && (
        <WindowPanel
          title="ee left after the planned hold"
          yLabel="% ee"
          line={curve.map((p) => ({ x: p.celsius, y: p.eeAfterHold ?? Number.NaN }))}
          regions={regions}
          recommended={rec}
          formatY={(y) => sig(y, 4)}
          testId="window-hold"
        />
      )}
    </div>
  );
}
