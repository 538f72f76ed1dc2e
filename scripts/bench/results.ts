/**
 * The figures `npm run bench` reports on its last line (`BENCH {json}`). A suite records each
 * figure it measured; a figure no suite could measure stays null, with the reason printed above
 * the line.
 */
export const BENCH_KEYS = [
  'forecastRatio',
  'fitRatio',
  'analysisRatio',
  'engineNsPerPointAt1e6',
  'importRatio50k',
  'reportRatio10k',
  'initialJsGzipKB',
  'campaignPageMs',
] as const;

export type BenchKey = (typeof BENCH_KEYS)[number];

const figures = new Map<BenchKey, number>();
const reasons = new Map<BenchKey, string>();

export function recordFigure(key: BenchKey, value: number, digits = 2): void {
  if (!Number.isFinite(value)) return recordMissing(key, `the measured value was ${value}`);
  figures.set(key, Number(value.toFixed(digits)));
  reasons.delete(key);
}

export function recordMissing(key: BenchKey, reason: string): void {
  if (!figures.has(key)) reasons.set(key, reason);
}

/** Print the reasons for missing figures, then the one machine-readable line. */
export function printBenchLine(notRun: (key: BenchKey) => string | null): void {
  const out: Record<string, number | null> = {};
  for (const key of BENCH_KEYS) {
    const value = figures.get(key);
    out[key] = value ?? null;
    if (value === undefined) console.log(`${key}: not measured (${reasons.get(key) ?? notRun(key) ?? 'no suite recorded it'})`);
  }
  console.log(`BENCH ${JSON.stringify(out)}`);
}
