/**
 * Shapes of the campaign endpoints' answers as the browser sees them (JSON: dates are strings).
 * Request bodies come from the shared zod schemas in api/features/campaigns/schemas; the analysis,
 * forecast and comparison answers from api/features/campaigns/analysis-schemas. The import
 * answer mirrors the import service, which the browser may not import.
 */
import type { FitResponse } from '../../../../api/features/calculators/schemas';
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
  /** SD of the assay for the next run (the measure's units); null → median of the runs'. */
  newRunUncertainty?: number | null;
  /** Runs at or beyond it are bounds (ee %, % A/er major share %, dr/ratio r); null → 99.8 % ee. */
  quantitationLimit?: number | null;
  status: CampaignStatus;
  notes: string | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

/** Who signed a campaign off (its measurements are locked until reopened). */
export interface SignOff {
  at: string;
  by: string;
  byUserId: string | null;
  note: string | null;
}

/** GET /campaigns/:id adds the caller's role in the campaign's project and the sign-off. */
export interface CampaignWithRole extends Campaign {
  role: ProjectRole;
  signOff: SignOff | null;
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

export type {
  AnalysisPoint,
  AnalysisResponse,
  ComparisonResponse,
  SavedForecastView,
} from '../../../../api/features/campaigns/analysis-schemas';
export type ComparisonCampaign = ComparisonResponse['campaigns'][number];

// ── File import (mirrors the import service's answer) ────────────────────────────────────────

export type ImportCell = string | number | null;

// The import service's JSON shapes, named from the server (type-only: nothing server-side reaches the bundle).
export type { ImportIssue } from '../../../../api/features/imports/errors';
export type { ImportPreview, ImportResult, PreviewColumn } from '../../../../api/features/imports/service';
export type { MappingGuess as SuggestedMapping, ImportRow as ImportPreviewRow } from '../../../../api/features/imports/mapping';
export type { ImportField as ImportFieldKey } from '../../../../api/features/campaigns/schemas';
