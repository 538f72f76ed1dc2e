/**
 * Shapes of the campaign endpoints' answers as the browser sees them (JSON: dates are strings).
 * Request bodies come from the shared zod schemas in api/features/campaigns/schemas; the analysis,
 * forecast and comparison answers from api/features/campaigns/analysis-schemas. The import
 * answer mirrors the import service, which the browser may not import.
 */
import type { FitResponse } from '../../../../api/features/compute/schemas';
import type { AssayMethod, CampaignStatus, SelectivityMeasure } from '../../../../api/features/campaigns/schemas';
import type { ProjectRole } from '../../../../api/features/projects/schemas';

export type { FitResponse };
import type { ComparisonResponse } from '../../../../api/features/campaigns/analysis-schemas';
export type FitPrediction = FitResponse['predictions'][number];

export interface Campaign {
  id: string;
  projectId: string;
  title: string;
  reactionDescription: string | null;
  productNameA: string;
  productNameB: string;
  measure: SelectivityMeasure;
  assayMethod: AssayMethod;
  defaultUncertainty: number | null;
  status: CampaignStatus;
  notes: string | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

/** GET /campaigns/:id adds the caller's role in the campaign's project. */
export interface CampaignWithRole extends Campaign {
  role: ProjectRole;
}

export interface CampaignListItem extends Campaign {
  measurementCount: number;
  includedCount: number;
  distinctTemperatures: number;
  temperatureRangeK: { min: number; max: number } | null;
}

export interface Measurement {
  id: string;
  campaignId: string;
  temperatureK: number;
  measure: SelectivityMeasure;
  /** The reported number; with `valueB` set, the pair value:valueB. */
  value: number;
  valueB: number | null;
  isLowerBound: boolean;
  uncertainty: number | null;
  replicateLabel: string | null;
  sampleId: string | null;
  conversionPercent: number | null;
  reactionTimeS: number | null;
  excluded: boolean;
  excludedReason: string | null;
  notes: string | null;
  sourceRow: number | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export type { AnalysisPoint, AnalysisResponse, ComparisonResponse, SavedForecastView } from '../../../../api/features/campaigns/analysis-schemas';
export type ComparisonCampaign = ComparisonResponse['campaigns'][number];

// ── File import (mirrors the import service's answer) ────────────────────────────────────────

export type ImportCell = string | number | null;

export interface ImportIssue {
  severity: 'error' | 'warning';
  /** 1-based row of the file as a spreadsheet shows it; null for the file or a column. */
  row: number | null;
  column: string | null;
  message: string;
}

export interface PreviewColumn {
  index: number;
  letter: string;
  header: string;
  sample: ImportCell[];
}

export type ImportFieldKey =
  | 'temperature'
  | 'temperatureUnit'
  | 'measure'
  | 'value'
  | 'uncertainty'
  | 'sampleId'
  | 'replicateLabel'
  | 'conversionPercent'
  | 'reactionTime'
  | 'notes';

export interface SuggestedMapping {
  columns: Partial<Record<ImportFieldKey, number>>;
  temperatureUnit?: 'K' | 'C' | 'F';
  measure?: SelectivityMeasure;
  timeUnit?: 's' | 'min' | 'h';
  unmapped: number[];
  missing: string[];
}

export interface ImportPreviewRow {
  sourceRow: number;
  temperatureK: number;
  measure: SelectivityMeasure;
  value: number;
  valueB: number | null;
  isLowerBound: boolean;
  uncertainty: number | null;
  replicateLabel: string | null;
  sampleId: string | null;
  conversionPercent: number | null;
  reactionTimeS: number | null;
  notes: string | null;
}

export interface ImportPreview {
  file: {
    fileName: string;
    format: 'csv' | 'xlsx';
    encoding: string | null;
    delimiter: ',' | ';' | '\t' | null;
    decimalSeparator: '.' | ',';
    headerRow: number | null;
    sheetName: string | null;
    sheetNames: string[];
    detected: string[];
  };
  columns: PreviewColumn[];
  suggestedMapping: SuggestedMapping;
  mapping: unknown;
  rowCount: number;
  validRowCount: number;
  errorCount: number;
  warningCount: number;
  issues: ImportIssue[];
  rows: ImportPreviewRow[];
}

export interface ImportResult {
  campaignId: string;
  inserted: number;
  temperatureRangeK: { min: number; max: number };
  distinctTemperatures: number;
  warningCount: number;
}
