/**
 * Report benchmark: the whole campaign workbook (model, two charts rendered to PNG, five styled
 * sheets with print setup) for 1 000 and 10 000 stored runs, against a raw exceljs write of the
 * same cells (values only, no styles, images or setup). Best of several runs after a warm-up;
 * prints the ratio and how the time grows from 1k to 10k. No database.
 */
import ExcelJS from 'exceljs';
import { performance } from 'node:perf_hooks';
import type { Campaign } from '../../api/models/campaign';
import { computeAnalysis } from '../../api/features/campaigns/analysis';
import { buildCampaignReport } from '../../api/features/campaigns/report';
import { clearChartCache } from '../../api/features/campaigns/report-charts';
import type { ReportData } from '../../api/features/campaigns/report-model';
import type { BenchSuite } from './suites';
import { recordFigure } from './results';
import { inventedDrRun } from '../../tests/support/report-runs';

/** Synthetic runs (not demo data): 40 temperatures from −80 to +37 °C, ln r = 9 kJ/mol / RT − 4 J/(mol·K) / R ± 0.04. */
export function syntheticReportData(n: number): ReportData {
  const campaign = {
    id: '00000000-0000-4000-8000-0000000000b1',
    projectId: '00000000-0000-4000-8000-0000000000b2',
    title: `Bench screen ${n}`,
    reactionDescription: 'Synthetic load, not demo data',
    productNameA: 'A',
    productNameB: 'B',
    measure: 'dr',
    assayMethod: 'nmr',
    defaultUncertainty: 0.05,
    status: 'active',
    notes: null,
    version: 1,
    createdByUserId: null,
    createdAt: new Date(0),
    updatedAt: new Date(0),
  } as Campaign;
  const measurements = Array.from({ length: n }, (_, i) =>
    inventedDrRun(campaign.id, 193.15 + (i % 40) * 3, 0.04 * Math.sin(i * 0.91), {
      id: `m${i}`,
      replicateLabel: String(i % 3),
      sampleId: `B-${i}`,
      reactionTimeS: 3600,
      excluded: i % 97 === 5,
      excludedReason: i % 97 === 5 ? 'bench exclusion' : null,
    }),
  ).sort((a, b) => a.temperatureK - b.temperatureK);
  const analysis = computeAnalysis(campaign, measurements, { weighting: 'none', uncertaintyScale: 'absolute', confidence: 0.95 });
  return {
    campaign,
    measurements,
    analysis,
    forecasts: [],
    project: { name: 'Bench project' },
    specification: { measure: 'dr', minimum: 10 },
    proposedK: 243.15,
  };
}

interface Sheet {
  name: string;
  rows: ExcelJS.CellValue[][];
  /** Number format of each column, from the row below the header. */
  formats: (string | undefined)[];
}

/** Every cell value of a workbook, sheet by sheet, to write again without any styling. */
async function cellsOf(buffer: Buffer): Promise<Sheet[]> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(buffer as unknown as ArrayBuffer);
  return wb.worksheets.map((ws) => {
    const rows: ExcelJS.CellValue[][] = [];
    ws.eachRow((row) => rows.push((row.values as ExcelJS.CellValue[]).slice(1)));
    const second = ws.getRow(2);
    const formats = Array.from({ length: ws.columnCount }, (_, i) => second.getCell(i + 1).numFmt || undefined);
    return { name: ws.name, rows, formats };
  });
}

/** The same cells written plainly; with `formats`, each column also gets its number format. */
async function rawWrite(sheets: Sheet[], formats = false, deflateLevel?: number): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  for (const s of sheets) {
    const ws = wb.addWorksheet(s.name);
    if (formats) ws.columns = s.formats.map((numFmt) => ({ style: numFmt ? { numFmt } : {} }));
    for (const r of s.rows) ws.addRow(r);
  }
  const options =
    deflateLevel === undefined ? undefined : { zip: { compression: 'DEFLATE' as const, compressionOptions: { level: deflateLevel } } };
  return Buffer.from((await wb.xlsx.writeBuffer(options)) as ArrayBuffer);
}

/**
 * Best time of each job over `rounds`, the jobs taking turns within a round so that load from
 * other processes on a shared machine falls on all of them alike. One warm-up round first.
 */
async function bestInterleaved(rounds: number, jobs: (() => Promise<unknown>)[]): Promise<number[]> {
  for (const job of jobs) await job();
  const min = jobs.map(() => Infinity);
  for (let r = 0; r < rounds; r++) {
    for (let j = 0; j < jobs.length; j++) {
      const t0 = performance.now();
      await jobs[j]!();
      min[j] = Math.min(min[j]!, performance.now() - t0);
    }
  }
  return min;
}

async function run() {
  const meta = { appVersion: 'bench', generatedAt: new Date(0), exportedBy: 'bench' };
  console.log(
    '\nCampaign report: full workbook (charts drawn afresh each time) vs raw exceljs write of the same cells (best of 9 / 5 interleaved rounds after a warm-up)',
  );
  const results: { n: number; report: number; raw: number }[] = [];
  for (const n of [1000, 10000]) {
    const data = syntheticReportData(n);
    const sheets = await cellsOf(await buildCampaignReport(data, meta));
    const cells = sheets.reduce((s, x) => s + x.rows.reduce((t, r) => t + r.length, 0), 0);
    const [report, cached, noCharts, raw, formatted, rawFast] = (await bestInterleaved(n > 5000 ? 5 : 9, [
      // Cold: the rendered charts are forgotten first, so every round draws them again.
      () => (clearChartCache(), buildCampaignReport(data, meta)),
      // Warm: the same campaign version exported again (workbook after PDF, or a second download).
      () => buildCampaignReport(data, meta),
      () => buildCampaignReport(data, meta, { charts: null }),
      () => rawWrite(sheets),
      () => rawWrite(sheets, true),
      // The report writes its ZIP at deflate level 1; the same setting for the raw write, for comparison.
      () => rawWrite(sheets, false, 1),
    ])) as [number, number, number, number, number, number];
    results.push({ n, report, raw });
    if (n === 10000) recordFigure('reportRatio10k', report / raw);
    console.log(
      `${String(n).padStart(6)} runs (${cells} cells): report ${report.toFixed(0)} ms, raw ${raw.toFixed(0)} ms, ratio ${(report / raw).toFixed(2)}× (target ≤ 1.5×); ` +
        `charts already rendered ${cached.toFixed(0)} ms (${(cached / raw).toFixed(2)}×); without the charts ${noCharts.toFixed(0)} ms (${(noCharts / raw).toFixed(2)}×); raw with the same number formats ${formatted.toFixed(0)} ms (${(formatted / raw).toFixed(2)}×); ` +
        `raw at deflate level 1 ${rawFast.toFixed(0)} ms (report ${(report / rawFast).toFixed(2)}× that)`,
    );
  }
  const [a, b] = results as [(typeof results)[0], (typeof results)[0]];
  console.log(`growth 1k → 10k: report ${(b.report / a.report).toFixed(1)}×, raw ${(b.raw / a.raw).toFixed(1)}× (linear = 10×)`);
}

export const reportBenchSuite: BenchSuite = { name: 'report', run };
