/**
 * Shapes of a stored campaign's analysis, saved forecasts and the project comparison. The fit
 * itself is the stateless API's FitResponse, so a screen typed into the calculator and the same
 * screen stored in a campaign read identically. zod only: the web client imports this file.
 */
import { z } from 'zod';
import { fitPredictionSchema, fitResponseSchema } from '../calculators/schemas';
import { ABSOLUTE_ZERO } from '../../science/quantities';

export const analysisQuerySchema = z.object({
  weighting: z.enum(['none', 'uncertainty'], { error: 'weighting must be none or uncertainty' }).default('none'),
  uncertaintyScale: z.enum(['absolute', 'relative'], { error: 'uncertaintyScale must be absolute or relative' }).default('absolute'),
  confidence: z.coerce
    .number({ error: 'confidence must be a number' })
    .gt(0.5, 'confidence must be above 0.5')
    .lt(1, 'confidence must be below 1')
    .default(0.95),
  at: z.coerce
    .number({ error: 'at must be a temperature in °C' })
    .refine(Number.isFinite, 'at must be a finite number')
    .gt(ABSOLUTE_ZERO.C, 'at must lie above absolute zero (−273.15 °C)')
    .max(726.85, 'at must be at most 726.85 °C (1000 K)')
    .optional(),
  newRunUncertainty: z.coerce
    .number({ error: 'newRunUncertainty must be a number' })
    .refine(Number.isFinite, 'newRunUncertainty must be a finite number')
    .refine((v) => v > 0 && v < 100, 'newRunUncertainty must be above 0 and below 100')
    .optional()
    .meta({
      description:
        "SD of the assay for a new run, in the campaign measure's units; default the campaign's setting, else the median of the runs'",
    }),
  quantitationLimit: z.coerce
    .number({ error: 'quantitationLimit must be a number' })
    .refine(Number.isFinite, 'quantitationLimit must be a finite number')
    .optional()
    .meta({
      description:
        "Quantitation limit in the campaign measure's terms (ee %, % A/er major share %, dr/ratio r); default the campaign's, else 99.8 % ee",
    }),
});
export type AnalysisQuery = z.infer<typeof analysisQuerySchema>;

const problemSummarySchema = z.object({ code: z.string(), message: z.string() }).meta({ id: 'AnalysisProblem' });

export const analysisPointSchema = z
  .object({
    measurementId: z.string(),
    kelvin: z.number(),
    celsius: z.number(),
    lnRatio: z.number(),
    /** ln r ± one standard deviation from the run's assay uncertainty (or the campaign default); equal to lnRatio when none is known. */
    lnRatioLow: z.number(),
    lnRatioHigh: z.number(),
    eePercent: z.number(),
    percentA: z.number(),
    status: z.enum(['fitted', 'excluded', 'censored']),
    flagged: z.boolean(),
    exclusionReason: z.string().nullable(),
    label: z.string().nullable(),
  })
  .meta({ id: 'AnalysisPoint' });
export type AnalysisPoint = z.infer<typeof analysisPointSchema>;

export const analysisResponseSchema = z
  .object({
    campaignId: z.string(),
    campaignVersion: z.number().int(),
    fit: fitResponseSchema.nullable(),
    problem: problemSummarySchema.nullable(),
    curve: z.array(fitPredictionSchema),
    at: fitPredictionSchema.nullable(),
    points: z.array(analysisPointSchema),
    convention: z.string(),
    caution: z.string(),
  })
  .meta({ id: 'CampaignAnalysis' });
export type AnalysisResponse = z.infer<typeof analysisResponseSchema>;

export const measuredComparisonSchema = z.object({
  measurementId: z.string(),
  kelvin: z.number(),
  eePercent: z.number(),
  ratio: z.number(),
  /** null when the forecast has no interval, or when the run is only a bound that the interval does not contradict. */
  insidePredictionInterval: z.boolean().nullable(),
});

export const savedForecastViewSchema = z
  .object({
    id: z.string(),
    campaignId: z.string(),
    temperatureK: z.number(),
    celsius: z.number(),
    label: z.string().nullable(),
    notes: z.string().nullable(),
    createdAt: z.string(),
    createdBy: z.object({ id: z.string(), login: z.string(), displayName: z.string().nullable() }).nullable(),
    result: fitPredictionSchema,
    measured: z.array(measuredComparisonSchema),
  })
  .meta({ id: 'SavedForecast' });
export type SavedForecastView = z.infer<typeof savedForecastViewSchema>;

export const savedForecastListSchema = z.object({ forecasts: z.array(savedForecastViewSchema) }).meta({ id: 'SavedForecastList' });

export const comparisonQuerySchema = z.object({
  at: z.coerce
    .number({ error: 'at must be a temperature in °C' })
    .refine(Number.isFinite, 'at must be a finite number')
    .gt(ABSOLUTE_ZERO.C, 'at must lie above absolute zero (−273.15 °C)')
    .max(726.85, 'at must be at most 726.85 °C (1000 K)')
    .default(25),
});

const energyWithSe = z.object({
  'kJ/mol': z.number(),
  'kcal/mol': z.number(),
  se: z.object({ 'kJ/mol': z.number(), 'kcal/mol': z.number() }).nullable(),
});
const entropyWithSe = z.object({
  'J/(mol*K)': z.number(),
  'cal/(mol*K)': z.number(),
  se: z.object({ 'J/(mol*K)': z.number(), 'cal/(mol*K)': z.number() }).nullable(),
});

export const comparisonResponseSchema = z
  .object({
    at: z.object({ kelvin: z.number(), celsius: z.number() }),
    campaigns: z.array(
      z.object({
        id: z.string(),
        title: z.string(),
        status: z.string(),
        n: z.number().int(),
        /** null when the campaign cannot be fitted (see problem). */
        ddH: energyWithSe.nullable(),
        ddS: entropyWithSe.nullable(),
        prediction: fitPredictionSchema.nullable(),
        preferred: z.enum(['one-line', 'two-branch']).nullable(),
        /** The accepted break (isoinversion only when the branch slopes have opposite signs); null when none is claimed. */
        breakAt: z
          .object({
            claim: z.enum(['isoinversion', 'change-of-slope']),
            extremum: z.enum(['maximum', 'minimum']).nullable(),
            kelvin: z.number(),
            celsius: z.number(),
          })
          .nullable(),
        warnings: z.number().int(),
        problem: problemSummarySchema.nullable(),
      }),
    ),
    convention: z.string(),
  })
  .meta({ id: 'CampaignComparison' });
export type ComparisonResponse = z.infer<typeof comparisonResponseSchema>;
