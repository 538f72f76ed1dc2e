/**
 * Initial JavaScript of the first page: the entry script of dist/web/index.html plus every chunk
 * it preloads, gzip-compressed (level 9, as a static server would send them). Needs the web build
 * (npm run bench builds it when stale).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import { recordFigure } from './results';
import type { BenchSuite } from './suites';

const dist = path.resolve(import.meta.dirname, '../../dist/web');

async function run() {
  const html = readFileSync(path.join(dist, 'index.html'), 'utf8');
  const files = new Set<string>();
  for (const m of html.matchAll(/<script[^>]*type="module"[^>]*src="([^"]+)"/g)) files.add(m[1]!);
  for (const m of html.matchAll(/<link[^>]*rel="modulepreload"[^>]*href="([^"]+)"/g)) files.add(m[1]!);
  if (files.size === 0) throw new Error('dist/web/index.html names no module script');
  console.log('\nInitial JavaScript (entry + preloaded chunks of dist/web/index.html, gzip -9)');
  let total = 0;
  for (const file of files) {
    const bytes = gzipSync(readFileSync(path.join(dist, file.replace(/^\//, ''))), { level: 9 }).length;
    total += bytes;
    console.log(`${file.padEnd(48)} ${(bytes / 1024).toFixed(1).padStart(7)} KB`);
  }
  console.log(`${'total'.padEnd(48)} ${(total / 1024).toFixed(1).padStart(7)} KB (target ≤ 160 KB)`);
  recordFigure('initialJsGzipKB', total / 1024, 1);
}

export const bundleBenchSuite: BenchSuite = { name: 'bundle', run };
