/**
 * The report's charts, drawn on the server as SVG from the report model and rendered to PNG by
 * resvg with fonts shipped with the app (never the machine's), so every server draws the same
 * picture. Colours are the web app's chart palette (api/lib/chart-colors.ts).
 */
import { createHash } from 'node:crypto';
import { createRequire } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { Resvg, renderAsync, type ResvgRenderOptions } from '@resvg/resvg-js';
import { LRUCache } from 'lru-cache';
import { chartColors } from '../../lib/chart-colors';
import { encodePng } from './png';
import { fixed, lnOf, lnRange } from './report-format';
import type { ReportModel } from './report-model';

const require = createRequire(import.meta.url);
const fontDir = path.join(path.dirname(require.resolve('dejavu-fonts-ttf/package.json')), 'ttf');
/** The whole fonts, for text a user wrote (the PDF summary). */
export const REPORT_FONT_FILES = [path.join(fontDir, 'DejaVuSans.ttf'), path.join(fontDir, 'DejaVuSans-Bold.ttf')];
/**
 * The same faces cut down to the characters the charts print (all of it the app's own words:
 * Latin, Greek, punctuation, arithmetic and arrows; scripts/subset-chart-fonts.sh). resvg reads a
 * font's tables again for every text element, and the whole face made the chart's 20-odd labels
 * cost more than its points and bands; the glyphs are the same outlines, so the pixels are too.
 */
const chartFontDir = path.join(path.dirname(fileURLToPath(import.meta.url)), 'fonts');
export const CHART_FONT_FILES = [path.join(chartFontDir, 'DejaVuSans-charts.ttf'), path.join(chartFontDir, 'DejaVuSans-Bold-charts.ttf')];
const FONT_FAMILY = 'DejaVu Sans';

const colors = chartColors;

export const CHART_WIDTH = 720;
export const CHART_HEIGHT = 420;
const M = { left: 64, right: 20, top: 40, bottom: 96 };

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** About `count` round tick values covering [lo, hi]. */
export function niceTicks(lo: number, hi: number, count = 6): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((f) => f * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step) out.push(Math.round(v / step) * step);
  return out;
}

const tickDecimals = (ticks: number[]) =>
  ticks.length < 2 ? 1 : Math.max(0, Math.ceil(-Math.log10(Math.abs(ticks[1]! - ticks[0]!)) - 1e-9));

interface Frame {
  x: (v: number) => number;
  y: (v: number) => number;
  parts: string[];
}

function frame(title: string, xLabel: string, yLabel: string, xr: [number, number], yr: [number, number]): Frame {
  const w = CHART_WIDTH - M.left - M.right;
  const h = CHART_HEIGHT - M.top - M.bottom;
  const x = (v: number) => M.left + ((v - xr[0]) / (xr[1] - xr[0])) * w;
  const y = (v: number) => M.top + h - ((v - yr[0]) / (yr[1] - yr[0])) * h;
  const parts: string[] = [`<rect width="${CHART_WIDTH}" height="${CHART_HEIGHT}" fill="${colors.paper}"/>`];
  parts.push(`<text x="${M.left}" y="22" font-size="15" font-weight="bold" fill="${colors.ink}">${esc(title)}</text>`);
  const xt = niceTicks(xr[0], xr[1]);
  const yt = niceTicks(yr[0], yr[1], 5);
  const xd = tickDecimals(xt);
  const yd = tickDecimals(yt);
  for (const t of xt) {
    const px = x(t).toFixed(1);
    parts.push(`<line x1="${px}" x2="${px}" y1="${M.top}" y2="${M.top + h}" stroke="${colors.grid}"/>`);
    parts.push(
      `<text x="${px}" y="${M.top + h + 16}" font-size="11" fill="${colors.inkSoft}" text-anchor="middle">${esc(fixed(t, xd))}</text>`,
    );
  }
  for (const t of yt) {
    const py = y(t).toFixed(1);
    parts.push(`<line x1="${M.left}" x2="${M.left + w}" y1="${py}" y2="${py}" stroke="${colors.grid}"/>`);
    parts.push(
      `<text x="${M.left - 6}" y="${(y(t) + 4).toFixed(1)}" font-size="11" fill="${colors.inkSoft}" text-anchor="end">${esc(fixed(t, yd))}</text>`,
    );
  }
  parts.push(`<rect x="${M.left}" y="${M.top}" width="${w}" height="${h}" fill="none" stroke="${colors.inkSoft}"/>`);
  parts.push(
    `<text x="${M.left + w / 2}" y="${M.top + h + 36}" font-size="12" fill="${colors.ink}" text-anchor="middle">${esc(xLabel)}</text>`,
  );
  parts.push(
    `<text transform="translate(16 ${M.top + h / 2}) rotate(-90)" font-size="12" fill="${colors.ink}" text-anchor="middle">${esc(yLabel)}</text>`,
  );
  return { x, y, parts };
}

/**
 * Drop the points of a drawn line that lie within `tolerance` drawing pixels of the line through
 * their kept neighbours (Ramer–Douglas–Peucker): a smooth curve of 1 000 points draws the same
 * with a few dozen, and the rasteriser's work follows the points kept.
 */
export function simplifyLine(points: [number, number][], tolerance = 0.1): [number, number][] {
  if (points.length <= 2) return points;
  const keep = new Uint8Array(points.length);
  keep[0] = 1;
  keep[points.length - 1] = 1;
  const stack: [number, number][] = [[0, points.length - 1]];
  while (stack.length) {
    const [i, j] = stack.pop()!;
    const [ax, ay] = points[i]!;
    const [bx, by] = points[j]!;
    const dx = bx - ax;
    const dy = by - ay;
    const len = Math.hypot(dx, dy);
    let worst = -1;
    let at = -1;
    for (let k = i + 1; k < j; k++) {
      const [px, py] = points[k]!;
      const d = len > 0 ? Math.abs(dy * (px - ax) - dx * (py - ay)) / len : Math.hypot(px - ax, py - ay);
      if (d > worst) {
        worst = d;
        at = k;
      }
    }
    if (worst > tolerance) {
      keep[at] = 1;
      stack.push([i, at], [at, j]);
    }
  }
  return points.filter((_, k) => keep[k]);
}

function polyline(points: [number, number][]): string {
  return simplifyLine(points)
    .map(([a, b], i) => `${i ? 'L' : 'M'}${a.toFixed(1)} ${b.toFixed(1)}`)
    .join(' ');
}

function band(f: Frame, xs: number[], lo: number[], hi: number[]): string {
  // Each edge simplified on its own, so the corners where they meet are kept.
  const upper = simplifyLine(xs.map((v, i): [number, number] => [f.x(v), f.y(hi[i]!)]));
  const lower = simplifyLine(xs.map((v, i): [number, number] => [f.x(v), f.y(lo[i]!)]).reverse());
  return `${polyline([...upper, ...lower])} Z`;
}

interface LegendItem {
  swatch: string;
  label: string;
}

/** Legend rows under the plot, wrapping before an item would run off the right edge. */
function legend(items: LegendItem[]): string {
  let y = CHART_HEIGHT - 40;
  let x = M.left;
  const out: string[] = [];
  for (const it of items) {
    const w = 32 + it.label.length * 7;
    if (x + w > CHART_WIDTH - M.right && x > M.left) {
      x = M.left;
      y += 20;
    }
    out.push(
      `<g transform="translate(${x} ${y})">${it.swatch}<text x="22" y="4" font-size="11" fill="${colors.ink}">${esc(it.label)}</text></g>`,
    );
    x += w;
  }
  return out.join('');
}

const SW = {
  point: `<circle cx="8" cy="0" r="4.5" fill="${colors.ink}"/>`,
  excluded: `<circle cx="8" cy="0" r="4" fill="#fff" stroke="${colors.inkSoft}" stroke-width="1.5"/>`,
  bound: `<path d="M8 -5 L13 0 L8 5 L3 0 Z" fill="${colors.ink}"/>`,
  line: `<line x1="0" x2="16" y1="0" y2="0" stroke="${colors.accent}" stroke-width="2"/>`,
  ci: `<rect x="0" y="-5" width="16" height="10" fill="${colors.confidenceFill}" fill-opacity="0.25"/>`,
  pi: `<rect x="0" y="-5" width="16" height="10" fill="${colors.predictionFill}" fill-opacity="0.22" stroke="${colors.predictionFill}"/>`,
  branch: `<line x1="0" x2="16" y1="0" y2="0" stroke="${colors.branch}" stroke-width="1.75" stroke-dasharray="5 3"/>`,
  spec: `<line x1="0" x2="16" y1="0" y2="0" stroke="${colors.caution}" stroke-width="1.5" stroke-dasharray="6 3"/>`,
  flag: `<circle cx="8" cy="0" r="6" fill="none" stroke="${colors.flagRing}" stroke-width="1.5"/>`,
};

function pointMark(px: number, py: number, status: string, flagged: boolean): string {
  const ring = flagged
    ? `<circle cx="${px.toFixed(1)}" cy="${py.toFixed(1)}" r="8" fill="none" stroke="${colors.flagRing}" stroke-width="1.5"/>`
    : '';
  if (status === 'censored') return `${ring}<path d="M${px.toFixed(1)} ${(py - 5).toFixed(1)} l5 5 l-5 5 l-5 -5 Z" fill="${colors.ink}"/>`;
  if (status === 'excluded')
    return `${ring}<circle cx="${px.toFixed(1)}" cy="${py.toFixed(1)}" r="4" fill="#fff" stroke="${colors.inkSoft}" stroke-width="1.5"/>`;
  return `${ring}<circle cx="${px.toFixed(1)}" cy="${py.toFixed(1)}" r="4" fill="${colors.ink}" stroke="#fff" stroke-width="0.75"/>`;
}

/**
 * Point marks, one per visible position: marks 8 drawing pixels wide whose centres fall in the same
 * pixel would be drawn on top of each other, so a campaign of 10 000 runs draws as fast as the
 * distinct positions.
 */
function marks(points: [number, number, string, boolean][]): string {
  const seen = new Set<string>();
  const out: string[] = [];
  for (const [px, py, status, flagged] of points) {
    const key = `${Math.round(px)}|${Math.round(py)}|${status}|${flagged}`;
    if (seen.has(key)) continue;
    seen.add(key);
    out.push(pointMark(px, py, status, flagged));
  }
  return out.join('');
}

function range(values: number[], pad = 0.06): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  if (!Number.isFinite(lo)) return [0, 1];
  if (hi - lo < 1e-9) return [lo - 1, hi + 1];
  const p = (hi - lo) * pad;
  return [lo - p, hi + p];
}

function legendFor(model: ReportModel, withSpec: boolean): LegendItem[] {
  const pts = model.data.analysis.points;
  const items: LegendItem[] = [{ swatch: SW.point, label: 'fitted run' }];
  if (pts.some((p) => p.status === 'excluded')) items.push({ swatch: SW.excluded, label: 'excluded' });
  if (pts.some((p) => p.status === 'censored')) items.push({ swatch: SW.bound, label: 'at least (bound)' });
  if (pts.some((p) => p.flagged)) items.push({ swatch: SW.flag, label: 'flagged' });
  items.push({ swatch: SW.line, label: 'fitted line' });
  items.push({ swatch: SW.ci, label: `${model.level} % confidence band` });
  items.push({ swatch: SW.pi, label: `${model.level} % prediction band` });
  if (model.fit?.twoBranch?.preferred === 'two-branch') items.push({ swatch: SW.branch, label: 'two branches' });
  if (withSpec) items.push({ swatch: SW.spec, label: 'specification' });
  return items;
}

/** Eyring plot: ln r against 1000/T with the fitted line, its confidence and prediction bands. */
export function eyringChartSvg(model: ReportModel): string {
  const { analysis } = model.data;
  const curve = analysis.curve;
  const pts = analysis.points;
  const xs = curve.map((p) => 1000 / p.kelvin);
  const xr = range([...xs, ...pts.map((p) => 1000 / p.kelvin)], 0.03);
  const yVals = [...pts.map((p) => p.lnRatio), ...curve.flatMap((p) => (p.predictionInterval ? lnRange(p.predictionInterval) : [lnOf(p)]))];
  if (model.specificationLnRatio !== null) yVals.push(model.specificationLnRatio);
  const f = frame('Eyring plot: ln r against 1/T', '1000 / T (1/K)', 'ln r = ln([A]/[B])', xr, range(yVals));
  const body: string[] = [];
  const withPi = curve.filter((p) => p.predictionInterval);
  if (withPi.length > 1) {
    body.push(
      `<path d="${band(
        f,
        withPi.map((p) => 1000 / p.kelvin),
        withPi.map((p) => lnRange(p.predictionInterval!)[0]),
        withPi.map((p) => lnRange(p.predictionInterval!)[1]),
      )}" fill="${colors.predictionFill}" fill-opacity="0.22"/>`,
    );
  }
  const withCi = curve.filter((p) => p.confidenceInterval);
  if (withCi.length > 1) {
    body.push(
      `<path d="${band(
        f,
        withCi.map((p) => 1000 / p.kelvin),
        withCi.map((p) => lnRange(p.confidenceInterval!)[0]),
        withCi.map((p) => lnRange(p.confidenceInterval!)[1]),
      )}" fill="${colors.confidenceFill}" fill-opacity="0.25"/>`,
    );
  }
  if (curve.length > 1)
    body.push(
      `<path d="${polyline(curve.map((p) => [f.x(1000 / p.kelvin), f.y(lnOf(p))]))}" fill="none" stroke="${colors.accent}" stroke-width="2"/>`,
    );
  const tb = model.fit?.twoBranch;
  if (tb?.checked && tb.preferred === 'two-branch' && tb.low && tb.high) {
    for (const b of [tb.low, tb.high]) {
      const ends = [b.fromKelvin, b.toKelvin].map((k): [number, number] => [f.x(1000 / k), f.y(b.intercept + b.slope / k)]);
      body.push(`<path d="${polyline(ends)}" stroke="${colors.branch}" stroke-width="1.75" stroke-dasharray="7 4" fill="none"/>`);
    }
  }
  if (model.specificationLnRatio !== null) {
    const py = f.y(model.specificationLnRatio).toFixed(1);
    body.push(
      `<line x1="${M.left}" x2="${CHART_WIDTH - M.right}" y1="${py}" y2="${py}" stroke="${colors.caution}" stroke-width="1.5" stroke-dasharray="6 3"/>`,
    );
  }
  body.push(marks(pts.map((p) => [f.x(1000 / p.kelvin), f.y(p.lnRatio), p.status, p.flagged])));
  return svg([...f.parts, `<g>${body.join('')}</g>`, legend(legendFor(model, model.specificationLnRatio !== null))]);
}

/**
 * Selectivity against temperature in the campaign's own measure: ee (enantiomers), de
 * (diastereomers) or % A (plain ratios), with the prediction band and the specification line.
 */
export function selectivityChartSvg(model: ReportModel): string {
  const { analysis } = model.data;
  const family = model.labels.family;
  const toY = (lnR: number) => (family === 'ratio' ? 100 / (1 + Math.exp(-lnR)) : 100 * Math.tanh(lnR / 2));
  const yLabel = family === 'enantiomers' ? 'ee (%)' : family === 'diastereomers' ? 'de (%)  [dr = (100 + de) : (100 − de)]' : 'A (%)';
  const curve = analysis.curve;
  const pts = analysis.points;
  const xr = range([...curve.map((p) => p.celsius), ...pts.map((p) => p.celsius)], 0.03);
  const yVals = [
    ...pts.map((p) => toY(p.lnRatio)),
    ...curve.flatMap((p) => (p.predictionInterval ? lnRange(p.predictionInterval).map(toY) : [toY(lnOf(p))])),
  ];
  if (model.specificationLnRatio !== null) yVals.push(toY(model.specificationLnRatio));
  const yr = range(yVals);
  const f = frame(`Selectivity against temperature (${model.labels.word})`, 'T (°C)', yLabel, xr, [
    Math.max(yr[0], family === 'ratio' ? 0 : -100),
    Math.min(yr[1], 100),
  ]);
  const body: string[] = [];
  const withPi = curve.filter((p) => p.predictionInterval);
  if (withPi.length > 1) {
    body.push(
      `<path d="${band(
        f,
        withPi.map((p) => p.celsius),
        withPi.map((p) => toY(lnRange(p.predictionInterval!)[0])),
        withPi.map((p) => toY(lnRange(p.predictionInterval!)[1])),
      )}" fill="${colors.predictionFill}" fill-opacity="0.22"/>`,
    );
  }
  const withCi = curve.filter((p) => p.confidenceInterval);
  if (withCi.length > 1) {
    body.push(
      `<path d="${band(
        f,
        withCi.map((p) => p.celsius),
        withCi.map((p) => toY(lnRange(p.confidenceInterval!)[0])),
        withCi.map((p) => toY(lnRange(p.confidenceInterval!)[1])),
      )}" fill="${colors.confidenceFill}" fill-opacity="0.25"/>`,
    );
  }
  if (curve.length > 1)
    body.push(
      `<path d="${polyline(curve.map((p) => [f.x(p.celsius), f.y(toY(lnOf(p)))]))}" fill="none" stroke="${colors.accent}" stroke-width="2"/>`,
    );
  if (model.specificationLnRatio !== null) {
    const py = f.y(toY(model.specificationLnRatio));
    body.push(
      `<line x1="${M.left}" x2="${CHART_WIDTH - M.right}" y1="${py.toFixed(1)}" y2="${py.toFixed(1)}" stroke="${colors.caution}" stroke-width="1.5" stroke-dasharray="6 3"/>`,
    );
    body.push(
      `<text x="${CHART_WIDTH - M.right - 4}" y="${(py - 5).toFixed(1)}" font-size="11" fill="${colors.caution}" text-anchor="end">${esc(`specification: ${model.specificationText}`)}</text>`,
    );
  }
  if (model.proposed) {
    const px = f.x(model.proposed.prediction.celsius).toFixed(1);
    body.push(
      `<line x1="${px}" x2="${px}" y1="${M.top}" y2="${CHART_HEIGHT - M.bottom}" stroke="${colors.inkSoft}" stroke-dasharray="2 3"/>`,
    );
    body.push(
      `<text x="${(Number(px) + 4).toFixed(1)}" y="${M.top + 12}" font-size="11" fill="${colors.inkSoft}">${esc(`proposed ${fixed(model.proposed.prediction.celsius, 1)} °C`)}</text>`,
    );
  }
  body.push(marks(pts.map((p) => [f.x(p.celsius), f.y(toY(p.lnRatio)), p.status, p.flagged])));
  return svg([...f.parts, `<g>${body.join('')}</g>`, legend(legendFor(model, model.specificationLnRatio !== null))]);
}

/**
 * The saved plan's window: the probability that a new run meets the specification across the
 * allowed range, the required probability as a dashed line, temperatures that break a constraint
 * hatched and labelled with it, and the recommendation marked. Null without a plan.
 */
export function windowChartSvg(model: ReportModel): string | null {
  const plan = model.data.plan;
  if (!plan || plan.rows.length < 2) return null;
  const rows = plan.rows;
  const xr: [number, number] = [rows[0]!.celsius, rows[rows.length - 1]!.celsius];
  const f = frame('Operating window: probability a new run meets the specification', 'T (°C)', 'probability (%)', xr, [0, 100]);
  const body: string[] = [];
  body.push(
    `<defs><pattern id="hatch" width="8" height="8" patternUnits="userSpaceOnUse" patternTransform="rotate(45)"><line x1="0" y1="0" x2="0" y2="8" stroke="${colors.inkSoft}" stroke-width="1.5" stroke-opacity="0.45"/></pattern></defs>`,
  );
  // Contiguous stretches where some constraint fails, each drawn from midpoint to midpoint of the grid.
  const edge = (i: number) =>
    i <= 0 ? rows[0]!.celsius : i >= rows.length ? rows[rows.length - 1]!.celsius : (rows[i - 1]!.celsius + rows[i]!.celsius) / 2;
  const top = M.top;
  const bottom = CHART_HEIGHT - M.bottom;
  for (let i = 0; i < rows.length;) {
    if (rows[i]!.feasible) {
      i++;
      continue;
    }
    let j = i;
    while (j < rows.length && !rows[j]!.feasible) j++;
    const x0 = f.x(edge(i));
    const x1 = f.x(edge(j));
    body.push(
      `<rect x="${x0.toFixed(1)}" y="${top}" width="${Math.max(0, x1 - x0).toFixed(1)}" height="${bottom - top}" fill="url(#hatch)"/>`,
    );
    const failing = [...new Set(rows.slice(i, j).flatMap((r) => r.failing.split(', ').filter(Boolean)))].join(', ');
    if (x1 - x0 > 60 && failing) {
      const label = `excluded: ${failing}`;
      const mid = (x0 + x1) / 2;
      const w = label.length * 6.4 + 8;
      body.push(
        `<rect x="${(mid - w / 2).toFixed(1)}" y="${bottom - 52}" width="${w.toFixed(1)}" height="16" fill="${colors.paper}" fill-opacity="0.9"/>`,
      );
      body.push(
        `<text x="${mid.toFixed(1)}" y="${bottom - 40}" font-size="11" fill="${colors.ink}" text-anchor="middle">${esc(label)}</text>`,
      );
    }
    i = j;
  }
  const required = 100 * plan.specification.probability;
  const py = f.y(required).toFixed(1);
  body.push(
    `<line x1="${M.left}" x2="${CHART_WIDTH - M.right}" y1="${py}" y2="${py}" stroke="${colors.caution}" stroke-width="1.5" stroke-dasharray="6 3"/>`,
  );
  const reqLabel = `required ${fixed(required, 1)} %`;
  body.push(
    `<rect x="${CHART_WIDTH - M.right - 8 - reqLabel.length * 6.4}" y="${(Number(py) + 4).toFixed(1)}" width="${(reqLabel.length * 6.4 + 6).toFixed(1)}" height="15" fill="${colors.paper}" fill-opacity="0.9"/>`,
  );
  body.push(
    `<text x="${CHART_WIDTH - M.right - 4}" y="${(Number(py) + 15).toFixed(1)}" font-size="11" fill="${colors.caution}" text-anchor="end">${esc(reqLabel)}</text>`,
  );
  body.push(
    `<path d="${polyline(rows.map((r) => [f.x(r.celsius), f.y(100 * r.probabilityMeetsSpec)]))}" fill="none" stroke="${colors.accent}" stroke-width="2"/>`,
  );
  if (plan.recommended) {
    const px = f.x(plan.recommended.celsius);
    body.push(`<line x1="${px.toFixed(1)}" x2="${px.toFixed(1)}" y1="${top}" y2="${bottom}" stroke="${colors.ink}" stroke-width="1.5"/>`);
    body.push(
      `<circle cx="${px.toFixed(1)}" cy="${f.y(100 * plan.recommended.probabilityMeetsSpec).toFixed(1)}" r="5" fill="${colors.ink}"/>`,
    );
    const anchor = px > CHART_WIDTH / 2 ? 'end' : 'start';
    const tx = px + (anchor === 'end' ? -6 : 6);
    body.push(
      `<text x="${tx.toFixed(1)}" y="${bottom - 8}" font-size="11" font-weight="bold" fill="${colors.ink}" text-anchor="${anchor}">${esc(`recommended ${fixed(plan.recommended.celsius, 1)} °C`)}</text>`,
    );
  }
  const items: LegendItem[] = [
    { swatch: SW.line, label: 'probability a new run meets the specification' },
    { swatch: SW.spec, label: 'required probability' },
    {
      swatch: `<rect x="0" y="-5" width="16" height="10" fill="none" stroke="${colors.inkSoft}"/><path d="M0 5 L10 -5 M6 5 L16 -5" stroke="${colors.inkSoft}"/>`,
      label: 'a constraint fails (hatched)',
    },
  ];
  if (plan.recommended)
    items.push({ swatch: `<line x1="8" x2="8" y1="-6" y2="6" stroke="${colors.ink}" stroke-width="1.5"/>`, label: 'recommended' });
  return svg([...f.parts, `<g>${body.join('')}</g>`, legend(items)]);
}

function svg(parts: string[]): string {
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${CHART_WIDTH}" height="${CHART_HEIGHT}" viewBox="0 0 ${CHART_WIDTH} ${CHART_HEIGHT}" font-family="${FONT_FAMILY}">${parts.join('')}</svg>`;
}

const renderOptions = (scale: number): ResvgRenderOptions => ({
  fitTo: { mode: 'width', value: CHART_WIDTH * scale },
  font: { fontFiles: CHART_FONT_FILES, loadSystemFonts: false, defaultFontFamily: FONT_FAMILY },
});

/**
 * Pixels rendered per drawing pixel. 1.25× gives 900 px for a chart the workbook and the PDF show
 * 540 points wide: 1.67 pixels per point, about 120 dpi on paper, where lines and 11 px labels
 * stay sharp; a larger canvas costs time in proportion to its area and prints no better.
 */
export const CHART_SCALE = 1.25;

/**
 * Rendered PNGs by a digest of their SVG text and scale. The SVG is drawn from every number the
 * chart shows, so an entry can never be stale: a changed run, fit, plan or title draws another
 * SVG. The workbook, the PDF and the e-mail of one campaign version render once. Bounded by size.
 */
const pngCache = new LRUCache<string, Buffer>({ maxSize: 16 * 1024 * 1024, sizeCalculation: (b) => b.length + 64, max: 200 });

const cacheKey = (svgText: string, scale: number) => `${scale}|${createHash('sha256').update(svgText).digest('base64url')}`;

/** For tests and benchmarks: forget every rendered chart. */
export function clearChartCache(): void {
  pngCache.clear();
}

/**
 * SVG → PNG at `scale` times the drawing size, with the shipped fonts only. Every series lies
 * inside the axes by construction (the ranges are taken from the data, bands included), so
 * nothing needs clipping, which halves resvg's work.
 */
export function renderPng(svgText: string, scale = CHART_SCALE): Buffer {
  const key = cacheKey(svgText, scale);
  const hit = pngCache.get(key);
  if (hit) return hit;
  const png = Buffer.from(new Resvg(svgText, renderOptions(scale)).render().asPng());
  pngCache.set(key, png);
  return png;
}

/** As `renderPng`, rasterised and compressed on libuv's thread pool. */
async function renderPngAsync(svgText: string, scale: number): Promise<Buffer> {
  const key = cacheKey(svgText, scale);
  const hit = pngCache.get(key);
  if (hit) return hit;
  const image = await renderAsync(svgText, renderOptions(scale));
  const png = await encodePng(image.width, image.height, image.pixels, true);
  pngCache.set(key, png);
  return png;
}

export interface ReportCharts {
  eyring: Buffer;
  selectivity: Buffer;
  /** The saved plan's window, when the campaign has one. */
  window?: Buffer | null;
}

const hasCharts = (model: ReportModel) => Boolean(model.fit) && model.data.analysis.curve.length >= 2;

/** Both charts as PNG, or null when there is no fit to draw. */
export function renderReportCharts(model: ReportModel): ReportCharts | null {
  if (!hasCharts(model)) return null;
  const w = windowChartSvg(model);
  return { eyring: renderPng(eyringChartSvg(model)), selectivity: renderPng(selectivityChartSvg(model)), window: w ? renderPng(w) : null };
}

/** As `renderReportCharts`, rasterised on libuv's thread pool so the caller can build sheets meanwhile. */
export async function renderReportChartsAsync(model: ReportModel, scale = CHART_SCALE): Promise<ReportCharts | null> {
  if (!hasCharts(model)) return null;
  const w = windowChartSvg(model);
  const [eyring, selectivity, window] = await Promise.all([
    renderPngAsync(eyringChartSvg(model), scale),
    renderPngAsync(selectivityChartSvg(model), scale),
    w ? renderPngAsync(w, scale) : Promise.resolve(null),
  ]);
  return { eyring, selectivity, window };
}
