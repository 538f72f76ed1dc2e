/**
 * Import benchmark: the full import path (parse, detect, map, check every row, chunked insert,
 * audit) beside a raw path (csv-parse + ONE multi-row INSERT of the same rows via unnest), for
 * 5 000 and 50 000 rows. Reports wall time and peak memory above the starting point.
 * Targets: import ≤ 2 × raw, and time per row roughly constant (linear in rows).
 *
 * Needs DATABASE_URL (npm run bench provides a throwaway cluster). Standalone:
 *   DATABASE_URL=… npx tsx scripts/bench/imports.ts [rows…]
 */
import '../../api/db/pg-types';
import { parse as parseCsv } from 'csv-parse/sync';
import { kelvinFromCelsius } from '../../api/science/quantities';
import type { Knex } from 'knex';
import { performance } from 'node:perf_hooks';
import { randomUUID } from 'node:crypto';
import { pathToFileURL } from 'node:url';
import { createKnex, migrateLatest } from '../../api/db/knex';
import { importMappingSchema } from '../../api/features/campaigns/schemas';
import { importMeasurements } from '../../api/features/imports/service';
import { IMPORT_LIMITS, IN_THREAD_MAX_BYTES } from '../../api/features/imports/parse';
import type { BenchSuite } from './suites';
import { recordFigure } from './results';

/** A synthetic screen of `rows` rows (not demo data): ee rising on cooling with a little scatter. */
export function syntheticScreenCsv(rows: number): Buffer {
  const lines = ['sample_id,replicate,T (°C),ee (%),sd (% ee),conversion (%),time (h),notes'];
  for (let i = 0; i < rows; i++) {
    const tC = 40 - (i % 120);
    const ee = Math.min(99.7, 90 + (40 - tC) * 0.08 + 0.2 * Math.sin(i * 0.37));
    lines.push(
      `BENCH-${i},${String.fromCharCode(97 + (i % 3))},${tC},${ee.toFixed(2)},0.3,${(90 + (i % 10)).toFixed(1)},${(1 + (i % 24)).toString()},`,
    );
  }
  return Buffer.from(lines.join('\n') + '\n');
}

const mapping = importMappingSchema.parse({
  columns: { sampleId: 0, replicateLabel: 1, temperature: 2, value: 3, uncertainty: 4, conversionPercent: 5, reactionTime: 6, notes: 7 },
  temperatureUnit: 'C',
  measure: 'ee',
});

interface Sample {
  ms: number;
  peakRssMb: number;
  peakHeapMb: number;
}

/** Run `fn` while sampling memory every 5 ms; peaks are reported above the level at the start. */
async function measure(fn: () => Promise<unknown>): Promise<Sample> {
  (globalThis as { gc?: () => void }).gc?.();
  const start = process.memoryUsage();
  let rss = start.rss;
  let heap = start.heapUsed;
  const timer = setInterval(() => {
    const m = process.memoryUsage();
    rss = Math.max(rss, m.rss);
    heap = Math.max(heap, m.heapUsed);
  }, 5);
  const t0 = performance.now();
  await fn();
  const ms = performance.now() - t0;
  clearInterval(timer);
  const end = process.memoryUsage();
  rss = Math.max(rss, end.rss);
  heap = Math.max(heap, end.heapUsed);
  return { ms, peakRssMb: (rss - start.rss) / 2 ** 20, peakHeapMb: (heap - start.heapUsed) / 2 ** 20 };
}

/** The baseline: parse with csv-parse, convert the columns, and insert all rows in one statement. */
async function rawImport(knex: Knex, campaignId: string, buffer: Buffer): Promise<number> {
  const records: string[][] = parseCsv(buffer, { from_line: 2, relax_column_count: true });
  const cols = {
    campaignId: [] as string[],
    t: [] as number[],
    v: [] as number[],
    u: [] as number[],
    s: [] as string[],
    r: [] as string[],
    c: [] as number[],
    h: [] as number[],
  };
  for (const rec of records) {
    cols.campaignId.push(campaignId);
    cols.t.push(kelvinFromCelsius(Number(rec[2])));
    cols.v.push(Number(rec[3]));
    cols.u.push(Number(rec[4]));
    cols.s.push(rec[0]);
    cols.r.push(rec[1]);
    cols.c.push(Number(rec[5]));
    cols.h.push(Number(rec[6]) * 3600);
  }
  await knex.transaction((trx) =>
    trx.raw(
      `insert into measurements (campaign_id, temperature_k, measure, value, uncertainty, sample_id, replicate_label, conversion_percent, reaction_time_s)
       select c, t, 'ee', v, u, s, r, cv, h from unnest(?::uuid[], ?::float8[], ?::float8[], ?::float8[], ?::text[], ?::text[], ?::float8[], ?::float8[]) as x(c, t, v, u, s, r, cv, h)`,
      [cols.campaignId, cols.t, cols.v, cols.u, cols.s, cols.r, cols.c, cols.h],
    ),
  );
  return records.length;
}

export interface ImportBenchRow {
  rows: number;
  import: Sample;
  raw: Sample;
}

export async function runImportBenchmark(knex: Knex, sizes = [5_000, 50_000]): Promise<ImportBenchRow[]> {
  await migrateLatest(knex);
  const [user] = await knex('users')
    .insert({ provider: 'bench', providerUserId: randomUUID(), login: `bench-${Date.now()}` })
    .returning('id');
  const [project] = await knex('projects').insert({ name: 'Import benchmark (temporary)' }).returning('id');
  const newCampaign = async (label: string) =>
    (
      await knex('campaigns')
        .insert({
          projectId: project.id,
          title: `bench ${label} ${randomUUID()}`,
          productNameA: 'A',
          productNameB: 'B',
          measure: 'ee',
          assayMethod: 'chiral-hplc',
        })
        .returning('id')
    )[0].id as string;
  const results: ImportBenchRow[] = [];
  try {
    // Warm up both paths (JIT, connection pool, exceljs/csv-parse module load, and the reading
    // worker thread, which a file over IN_THREAD_MAX_BYTES starts as a busy server has it running).
    const warm = syntheticScreenCsv(8_000);
    if (warm.length <= IN_THREAD_MAX_BYTES) throw new Error('the warm-up file must be large enough to be read in a worker');
    await importMeasurements(
      knex,
      { projectId: project.id, actorUserId: user.id },
      await newCampaign('warm'),
      { name: 'warm.csv', buffer: warm },
      { mapping },
    );
    await rawImport(knex, await newCampaign('warm-raw'), warm);

    for (const rows of sizes) {
      const buffer = syntheticScreenCsv(rows);
      const limits = { ...IMPORT_LIMITS, maxBytes: Math.max(IMPORT_LIMITS.maxBytes, buffer.length + 1) };
      const a = await newCampaign('import');
      const imp = await measure(() =>
        importMeasurements(knex, { projectId: project.id, actorUserId: user.id }, a, { name: 'bench.csv', buffer }, { mapping }, limits),
      );
      const b = await newCampaign('raw');
      const raw = await measure(() => rawImport(knex, b, buffer));
      const [ca, cb] = await Promise.all(
        [a, b].map(async (id) => Number((await knex('measurements').where({ campaignId: id }).count({ n: '*' }).first())!.n)),
      );
      if (ca !== rows || cb !== rows) throw new Error(`row counts differ: import ${ca}, raw ${cb}, expected ${rows}`);
      results.push({ rows, import: imp, raw });
    }
  } finally {
    await knex('projects').where({ id: project.id }).delete();
    await knex('audit_events').where({ projectId: project.id }).delete();
    await knex('users').where({ id: user.id }).delete();
  }
  return results;
}

export function printImportBenchmark(results: ImportBenchRow[]): void {
  console.log('\nImport: full path (parse, detect, map, check, chunked insert, audit) vs raw csv-parse + one INSERT');
  console.log('rows      import ms  raw ms  ratio  import µs/row  raw µs/row  import peak RSS/heap MB  raw peak RSS/heap MB');
  for (const r of results) {
    const f = (n: number, w: number, d = 0) => n.toFixed(d).padStart(w);
    console.log(
      `${String(r.rows).padEnd(8)}${f(r.import.ms, 11)}${f(r.raw.ms, 8)}${f(r.import.ms / r.raw.ms, 7, 2)}${f((r.import.ms * 1000) / r.rows, 14, 1)}${f((r.raw.ms * 1000) / r.rows, 12, 1)}${`${r.import.peakRssMb.toFixed(0)} / ${r.import.peakHeapMb.toFixed(0)}`.padStart(25)}${`${r.raw.peakRssMb.toFixed(0)} / ${r.raw.peakHeapMb.toFixed(0)}`.padStart(22)}`,
    );
  }
  const at50k = results.find((r) => r.rows === 50_000);
  if (at50k) recordFigure('importRatio50k', at50k.import.ms / at50k.raw.ms);
  if (results.length >= 2) {
    const [a, b] = [results[0], results[results.length - 1]];
    const perRowGrowth = b.import.ms / b.rows / (a.import.ms / a.rows);
    console.log(`time per row, ${b.rows} vs ${a.rows} rows: × ${perRowGrowth.toFixed(2)} (1.00 = linear); targets: ratio ≤ 2.00`);
  }
}

export const importBenchSuite: BenchSuite = {
  name: 'imports',
  async run() {
    const knex = createKnex(process.env.DATABASE_URL!, { min: 0, max: 4 });
    try {
      printImportBenchmark(await runImportBenchmark(knex));
    } finally {
      await knex.destroy();
    }
  },
};

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const sizes = process.argv
    .slice(2)
    .map(Number)
    .filter((n) => n > 0);
  const knex = createKnex(process.env.DATABASE_URL ?? '', { min: 0, max: 4 });
  try {
    printImportBenchmark(await runImportBenchmark(knex, sizes.length ? sizes : undefined));
  } finally {
    await knex.destroy();
  }
}
