/**
 * Shapes of the campaign endpoints' answers as the browser sees them (JSON: dates are strings).
 * Request bodies come from the shared zod schemas in api/features/campaigns/schemas; the analysis,
 * forecast and comparison answers from api/features/campaigns/analysis-schemas; stored rows from the
 * models and the import's answer from the import service, all by type-only imports (nothing reaches the bundle).
 */
import type { FitResponse } from '../../../../api/features/calculators/schemas';
import type { ModelObject } from 'objection';
import type { Campaign as CampaignRow } from '../../../../api/models/campaign';
import type { Measurement as MeasurementRow } from '../../../../api/models/measurement';
import type { ProjectRole } from '../../../../api/features/projects/schemas';
import type { SignOffView } from '../../../../api/features/campaigns/service';

export type { FitResponse };
import type { ComparisonResponse } from '../../../../api/features/campaigns/analysis-schemas';
export type FitPrediction = FitResponse['predictions'][number];

/** A model's columns as JSON carries them: dates become ISO text. */
type JsonRow<T> = { [K in keyof T]: T[K] extends Date ? string : T[K] extends Date | null ? string | null : T[K] };

/** A campaign as the API returns it: the stored row, dates as ISO text. */
export type Campaign = JsonRow<ModelObject<CampaignRow>>;

/** GET /campaigns/:id adds the caller's role in the campaign's project and the sign-off (measurements locked until reopened). */
export type CampaignWithRole = Campaign & { role: ProjectRole; signOff: SignOffView | null };

export interface CampaignListItem extends Campaign {
  measurementCount: number;
  includedCount: number;
  distinctTemperatures: number;
  temperatureRangeK: { min: number; max: number } | null;
}

/** One stored run as the API returns it (`value` with `valueB` set is the pair value:valueB). */
export type Measurement = JsonRow<ModelObject<MeasurementRow>>;

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
export type { MappingGuess as SuggestedMapping } from '../../../../api/features/imports/mapping';
