/** Feature benchmark suites run by scripts/bench/run.ts after the HTTP and engine suites. */
import { importBenchSuite } from './imports';
import { campaignAnalysisBenchSuite } from './campaign-analysis';
import { uploadBombsBenchSuite } from './upload-bombs';
import { reportBenchSuite } from './report';
import { bundleBenchSuite } from './bundle';
import { campaignPageBenchSuite } from './campaign-page';

export interface BenchSuite {
  name: string;
  run(): Promise<void>;
}

export const extraSuites: BenchSuite[] = [
  importBenchSuite,
  campaignAnalysisBenchSuite,
  uploadBombsBenchSuite,
  reportBenchSuite,
  bundleBenchSuite,
  campaignPageBenchSuite,
];
