/**
 * Hostile uploads through the real upload middleware and preview (as the preview route: in the worker pool): for each file, the answer, the
 * time to it, the longest stall of this process's event loop meanwhile (the upload path must never
 * hold it for more than about 100 ms), and the most memory the reading worker's heap held.
 * No database needed:  npx tsx scripts/bench/upload-bombs.ts   (also `npm run bench upload-bombs`).
 */
import express from 'express';
import type { AddressInfo } from 'node:net';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import pino from 'pino';
import { problemHandler } from '../../api/lib/problem';
import { importUpload, jsonField, uploadedFile } from '../../api/features/imports/upload';
import { IMPORT_LIMITS } from '../../api/features/imports/parse';
import { closeReadPool, previewInPool, runInPool } from '../../api/features/imports/parse-pool';
import { importPreviewRequestSchema } from '../../api/features/campaigns/schemas';
import { lyingBombWorkbook, manyRowsWorkbook, nulWorkbook, ratioBombWorkbook } from '../../tests/support/xlsx-bombs';
import type { BenchSuite } from './suites';

function csvRows(rows: number): Buffer {
  const lines = ['T (°C),ee (%)'];
  for (let i = 0; i < rows; i++) lines.push(`${(i % 80) - 40},9${i % 10}.5`);
  return Buffer.from(lines.join('\n'));
}

async function run(): Promise<void> {
  const app = express();
  app.post('/preview', importUpload(), async (req, res) => {
    res.json(await previewInPool(uploadedFile(req), jsonField(req, 'request', importPreviewRequestSchema)));
  });
  app.use(problemHandler(pino({ level: 'silent' })));
  const server = app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

  const files: [string, string, Buffer][] = [
    ['small workbook (300 rows)', 'screen.xlsx', manyRowsWorkbook(300)],
    ['ratio bomb: 100 MB sheet packed in 0.5 MB', 'bomb.xlsx', ratioBombWorkbook(100)],
    ['lying bomb: 300 MB sheet declared as 4 KB', 'liar.xlsx', lyingBombWorkbook(300)],
    ['row bomb: 900 000 rows (9.4 MB)', 'rows.xlsx', manyRowsWorkbook(900_000)],
    ['CSV of 100 000 rows (1.4 MB)', 'rows.csv', csvRows(100_000)],
    ['CSV of 400 000 rows (5.6 MB)', 'many.csv', csvRows(400_000)],
    ['workbook with a NUL in a cell', 'nul.xlsx', nulWorkbook()],
  ];
  // Warm the worker pool once, as a running server would be.
  await runInPool({ name: 'warm.xlsx', buffer: manyRowsWorkbook(5) }, {}, IMPORT_LIMITS);

  console.log('\nHostile uploads (POST preview through the upload middleware; reading in the worker pool)');
  console.log('file'.padEnd(46), 'status'.padStart(6), 'ms'.padStart(7), 'max loop stall ms'.padStart(18), 'worker peak MB'.padStart(15));
  for (const [label, name, bytes] of files) {
    const loop = monitorEventLoopDelay({ resolution: 5 });
    loop.enable();
    const form = new FormData();
    form.append('file', new Blob([new Uint8Array(bytes)]), name);
    const t0 = performance.now();
    const res = await fetch(`${base}/preview`, { method: 'POST', body: form });
    await res.arrayBuffer();
    const ms = performance.now() - t0;
    loop.disable();
    const worker = await runInPool({ name, buffer: bytes }, {}, IMPORT_LIMITS).catch(() => null);
    const peak = worker ? (worker.peakMemoryBytes / 1024 / 1024).toFixed(0) : '—';
    console.log(
      label.padEnd(46),
      String(res.status).padStart(6),
      ms.toFixed(0).padStart(7),
      (loop.max / 1e6).toFixed(0).padStart(18),
      peak.padStart(15),
    );
  }
  server.close();
  await closeReadPool();
}

export const uploadBombsBenchSuite: BenchSuite = { name: 'upload-bombs', run };

if (import.meta.url === `file://${process.argv[1]}`) await run();
