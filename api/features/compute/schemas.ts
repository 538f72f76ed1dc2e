/**
 * Request and response shapes of the stateless computation API (/api/v1/forecast,
 * /fit, /distribution, /rate, /erosion). Plain zod only: the web client imports
 * this file to validate forms with the very same rules, and the OpenAPI document
 * is generated from it.
 */
import { z } from 'zod';
import { parseRatioPair, selectivityProblem } from '../../science/quantities';

export const MAX_POINTS = 5000;

const finite = (what: string) =>
  z.number({ error: (issue) => (issue.input === undefined ? `${what} is required` : `${what} must be a finite number`) });

export const energyUnitSchema = z.enum(['J/mol', 'kJ/mol', 'cal/mol', 'kcal/mol']).meta({ id: 'EnergyUnit' });
export const entropyUnitSchema = z.enum(['J/(mol*K)', 'cal/(mol*K)']).meta({ id: 'EntropyUnit' });
export const temperatureUnitSchema = z.enum(['K', 'C', 'F']).meta({ id: 'TemperatureUnit', description: 'K, °C (C) or °F (F)' });

export const energySchema = z
  .object({ value: finite('value'), unit: energyUnitSchema })
  .meta({ id: 'Energy', description: 'An energy per mole, e.g. { "value": 1.5, "unit": "kcal/mol" }' });
export const entropySchema = z
  .object({ value: finite('value'), unit: entropyUnitSchema })
  .meta({ id: 'Entropy', description: 'An entropy per mole, e.g. { "value": -4, "unit": "J/(mol*K)" }' });
export const temperatureSchema = z
  .object({ value: finite('value'), unit: temperatureUnitSchema })
  .meta({ id: 'Temperature', description: 'A temperature; must be above absolute zero, e.g. { "value": -20, "unit": "C" }' });
/** Durations for rate and erosion work. */
export const durationUnitSchema = z.enum(['s', 'min', 'h', 'd']).meta({ id: 'DurationUnit' });
export const durationSchema = z
  .object({ value: finite('value').positive('must be greater than zero'), unit: durationUnitSchema })
  .meta({ id: 'Duration' });

export const selectivityMeasureSchema = z.enum(['ee', 'er', 'dr', 'percentA', 'ratio']).meta({
  id: 'SelectivityMeasure',
  description: 'ee: signed percent, A positive; percentA: percent of A; er, dr, ratio: a number r = A/B or an "a:b" string',
});
const selectivityFields = {
  measure: selectivityMeasureSchema,
  value: z.union([finite('value'), z.string().refine((t) => parseRatioPair(t) !== null, 'must look like "95:5"')]),
};
// One check for every entry point (campaign runs use it too): ee = ±100 or a zero part is a 400 here as there.
const checkSelectivity = (s: { measure: z.infer<typeof selectivityMeasureSchema>; value: number | string }, ctx: z.RefinementCtx) => {
  const problem = selectivityProblem(s.measure, s.value);
  if (problem) ctx.addIssue({ code: 'custom', path: ['value'], message: problem });
};
export const selectivitySchema = z
  .object(selectivityFields)
  .superRefine(checkSelectivity)
  .meta({ id: 'Selectivity', description: 'An observed selectivity, e.g. { "measure": "ee", "value": 92.5 } or { "measure": "dr", "value": "12:1" }' });
/** A measured selectivity, which may be a bound ("≥ 99.8 % ee", "> 200:1"). */
export const measuredSelectivitySchema = z
  .object({
    ...selectivityFields,
    atLeast: z.boolean().optional().meta({ description: 'true when the assay gave only a lower bound; the run is fitted as censored' }),
  })
  .superRefine(checkSelectivity)
  .meta({ id: 'MeasuredSelectivity', description: 'A measured selectivity; `atLeast: true` marks a lower bound such as "≥ 99.8 % ee"' });

export const temperatureRangeSchema = z
  .object({ from: temperatureSchema, to: temperatureSchema, count: z.number().int('must be a whole number').min(1).max(MAX_POINTS, `at most ${MAX_POINTS} temperatures`) })
  .meta({ id: 'TemperatureRange' });
export const temperatureListSchema = z
  .object({ values: z.array(temperatureSchema).min(1, 'give at least one temperature').max(MAX_POINTS, `at most ${MAX_POINTS} temperatures`) })
  .meta({ id: 'TemperatureList' });
export const temperaturesSchema = z.union([temperatureRangeSchema, temperatureListSchema]);

// ---------- forecast ----------
export const forecastBasisSchema = z
  .discriminatedUnion('kind', [
    z.object({ kind: z.literal('activation'), ddH: energySchema, ddS: entropySchema }),
    z.object({ kind: z.literal('gap'), ddG: energySchema, temperature: temperatureSchema, ddS: entropySchema.optional() }),
    z.object({ kind: z.literal('observed'), selectivity: selectivitySchema, temperature: temperatureSchema, ddS: entropySchema.optional() }),
  ])
  .meta({ id: 'ForecastBasis', description: 'What the forecast starts from. Signed: ΔΔX‡ = X‡(TS→B) − X‡(TS→A).' });

export const forecastRequestSchema = z
  .object({ basis: forecastBasisSchema, temperatures: temperaturesSchema })
  .meta({ id: 'ForecastRequest' });
export type ForecastRequest = z.infer<typeof forecastRequestSchema>;

const ddGOut = z.object({ 'kJ/mol': z.number(), 'kcal/mol': z.number() });
export const selectivityPointSchema = z
  .object({ kelvin: z.number(), celsius: z.number(), ratio: z.number(), eePercent: z.number(), percentA: z.number(), ddG: ddGOut })
  .meta({ id: 'SelectivityPoint' });
const zeroSelectivitySchema = z.object({ kelvin: z.number(), celsius: z.number(), note: z.string() }).nullable();

export const forecastResponseSchema = z
  .object({
    points: z.array(selectivityPointSchema),
    zeroSelectivity: zeroSelectivitySchema,
    assumptions: z.array(z.string()),
    convention: z.string(),
    caution: z.string(),
  })
  .meta({ id: 'ForecastResponse' });
export type ForecastResponse = z.infer<typeof forecastResponseSchema>;

// ---------- fit ----------
export const measurementInputSchema = z
  .object({
    temperature: temperatureSchema,
    selectivity: measuredSelectivitySchema,
    uncertainty: finite('uncertainty').positive('must be greater than zero').optional().meta({
      description: 'Standard deviation of the measured value, in its own units (ee and percentA: percentage points; er/dr/ratio: relative SD of r)',
    }),
    excluded: z.boolean().optional(),
    label: z.string().max(200).optional(),
  })
  .meta({ id: 'Measurement' });

export const fitRequestSchema = z
  .object({
    measurements: z.array(measurementInputSchema).min(1, 'give at least two measurements').max(MAX_POINTS, `at most ${MAX_POINTS} measurements`),
    weighting: z.enum(['none', 'uncertainty']).default('none'),
    uncertaintyScale: z.enum(['absolute', 'relative']).default('absolute').meta({
      description: 'absolute: the uncertainties are true SDs; relative: only their ratios matter and the covariance is scaled by χ²/(n − 2)',
    }),
    confidence: z.number().gt(0.5, 'must be above 0.5').lt(1, 'must be below 1').default(0.95),
    predict: z.array(temperatureSchema).max(MAX_POINTS).default([]),
  })
  .meta({ id: 'FitRequest' });
export type FitRequest = z.infer<typeof fitRequestSchema>;
export type FitRequestInput = z.input<typeof fitRequestSchema>;

const intervalSchema = z.tuple([z.number(), z.number()]);
const mappedIntervalSchema = z.object({ ratio: intervalSchema, eePercent: intervalSchema, percentA: intervalSchema });
export const fitPredictionSchema = selectivityPointSchema
  .extend({
    ddGSe: z.object({ 'kJ/mol': z.number(), 'kcal/mol': z.number() }).nullable(),
    extrapolated: z.boolean(),
    confidenceInterval: mappedIntervalSchema.nullable(),
    predictionInterval: mappedIntervalSchema.nullable(),
  })
  .meta({ id: 'FitPrediction' });

const energyStat = z.object({
  'kJ/mol': z.number(),
  'kcal/mol': z.number(),
  se: z.object({ 'kJ/mol': z.number(), 'kcal/mol': z.number() }).nullable(),
  ci: z.object({ 'kJ/mol': intervalSchema, 'kcal/mol': intervalSchema }).nullable(),
});
const entropyStat = z.object({
  'J/(mol*K)': z.number(),
  'cal/(mol*K)': z.number(),
  se: z.object({ 'J/(mol*K)': z.number(), 'cal/(mol*K)': z.number() }).nullable(),
  ci: z.object({ 'J/(mol*K)': intervalSchema, 'cal/(mol*K)': intervalSchema }).nullable(),
});
const warningSchema = z.object({ code: z.string(), message: z.string() }).meta({ id: 'Warning' });

export const residualSchema = z
  .object({
    index: z.number().int(),
    kelvin: z.number(),
    lnRatio: z.number(),
    fitted: z.number().nullable(),
    residual: z.number().nullable(),
    studentized: z.number().nullable(),
    leverage: z.number().nullable(),
    cooksDistance: z.number().nullable(),
    status: z.enum(['fitted', 'excluded', 'censored']),
    flags: z.array(z.string()),
  })
  .meta({ id: 'Residual' });

export const branchSchema = z.object({
  fromKelvin: z.number(),
  toKelvin: z.number(),
  n: z.number().int(),
  slope: z.number(),
  intercept: z.number(),
  ddH: z.object({ 'kJ/mol': z.number(), 'kcal/mol': z.number() }),
  ddS: z.object({ 'J/(mol*K)': z.number(), 'cal/(mol*K)': z.number() }),
});

export const twoBranchSchema = z
  .object({
    preferred: z.enum(['one-line', 'two-branch']),
    breakBetweenKelvin: intervalSchema,
    low: branchSchema,
    high: branchSchema,
    fTest: z.object({ F: z.number(), dof1: z.number(), dof2: z.number(), p: z.number() }),
    informationCriterion: z.object({ name: z.enum(['AICc', 'BIC']), oneLine: z.number(), twoBranch: z.number() }),
    isoinversion: z.object({ kelvin: z.number(), celsius: z.number() }).nullable(),
    note: z.string(),
  })
  .meta({ id: 'TwoBranchFit' });

export const fitResponseSchema = z
  .object({
    n: z.number().int(),
    dof: z.number().int(),
    weighting: z.enum(['none', 'uncertainty']),
    confidence: z.number(),
    slope: z.number(),
    intercept: z.number(),
    covariance: z.object({ slopeSlope: z.number(), slopeIntercept: z.number(), interceptIntercept: z.number() }).nullable(),
    correlation: z.number().nullable(),
    rSquared: z.number().nullable(),
    residualSD: z.number().nullable(),
    ddH: energyStat,
    ddS: entropyStat,
    ddGAt25C: energyStat.omit({ ci: true }).extend({ ci: z.object({ 'kJ/mol': intervalSchema, 'kcal/mol': intervalSchema }).nullable() }),
    temperatureRange: z.object({ minKelvin: z.number(), maxKelvin: z.number() }),
    residuals: z.array(residualSchema),
    zeroSelectivity: zeroSelectivitySchema,
    twoBranch: twoBranchSchema.nullable(),
    warnings: z.array(warningSchema),
    convention: z.string(),
    caution: z.string(),
    predictions: z.array(fitPredictionSchema),
  })
  .meta({ id: 'FitResponse' });
export type FitResponse = z.infer<typeof fitResponseSchema>;
