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
export const selectivitySchema = z.object(selectivityFields).superRefine(checkSelectivity).meta({
  id: 'Selectivity',
  description: 'An observed selectivity, e.g. { "measure": "ee", "value": 92.5 } or { "measure": "dr", "value": "12:1" }',
});
/** A measured selectivity, which may be a bound ("≥ 99.8 % ee", "> 200:1"). */
export const measuredSelectivitySchema = z
  .object({
    ...selectivityFields,
    atLeast: z.boolean().optional().meta({
      description:
        'The assay reported only a bound ("at least this selective"): fitted as a censored run at the quantitation limit, or at this value when it is a weaker bound',
    }),
  })
  .superRefine(checkSelectivity)
  .meta({ id: 'MeasuredSelectivity', description: 'A measured selectivity; `atLeast: true` marks a lower bound such as "≥ 99.8 % ee"' });

export const temperatureRangeSchema = z
  .object({
    from: temperatureSchema,
    to: temperatureSchema,
    count: z.number().int('must be a whole number').min(1).max(MAX_POINTS, `at most ${MAX_POINTS} temperatures`),
  })
  .meta({ id: 'TemperatureRange' });
export const temperatureListSchema = z
  .object({
    values: z.array(temperatureSchema).min(1, 'give at least one temperature').max(MAX_POINTS, `at most ${MAX_POINTS} temperatures`),
  })
  .meta({ id: 'TemperatureList' });
export const temperaturesSchema = z.union([temperatureRangeSchema, temperatureListSchema]);

// ---------- forecast ----------
export const forecastBasisSchema = z
  .discriminatedUnion('kind', [
    z.object({ kind: z.literal('activation'), ddH: energySchema, ddS: entropySchema }),
    z.object({ kind: z.literal('gap'), ddG: energySchema, temperature: temperatureSchema, ddS: entropySchema.optional() }),
    z.object({
      kind: z.literal('observed'),
      selectivity: selectivitySchema,
      temperature: temperatureSchema,
      ddS: entropySchema.optional(),
    }),
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
const zeroSelectivitySchema = z
  .object({
    kelvin: z.number(),
    celsius: z.number(),
    note: z.string(),
    /** Fieller confidence set (fits only): ranges in K, null ends meaning 0 K or no upper limit. */
    interval: z
      .object({
        ranges: z.array(z.object({ fromKelvin: z.number().nullable(), toKelvin: z.number().nullable() })),
        bounded: z.boolean(),
        note: z.string(),
      })
      .nullable()
      .optional(),
    /** Outside both the data and the temperatures asked about. */
    farExtrapolation: z.boolean().optional(),
  })
  .nullable();

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

/** Whether `value` is a valid quantitation limit for `measure` (null) or why not. */
export function quantitationLimitProblem(measure: z.infer<typeof selectivityMeasureSchema>, value: number): string | null {
  if (!Number.isFinite(value)) return 'must be a finite number';
  switch (measure) {
    case 'ee':
      return value > 0 && value < 100 ? null : 'must lie strictly between 0 and 100 % ee';
    case 'percentA':
    case 'er':
      return value > 50 && value < 100 ? null : `must lie strictly between 50 and 100 % (the major isomer's share)`;
    default:
      return value > 1 ? null : 'must be a ratio above 1 (e.g. 200 for 200:1)';
  }
}

export const quantitationLimitSchema = z
  .object({ measure: selectivityMeasureSchema, value: finite('value') })
  .superRefine((q, ctx) => {
    const problem = quantitationLimitProblem(q.measure, q.value);
    if (problem) ctx.addIssue({ code: 'custom', path: ['value'], message: problem });
  })
  .meta({
    id: 'QuantitationLimit',
    description:
      "The assay's quantitation limit: ee in %, percentA and er as the major share in %, dr and ratio as r; runs at or beyond it are bounds. Default 99.8 % ee.",
  });

export const measurementInputSchema = z
  .object({
    temperature: temperatureSchema,
    selectivity: measuredSelectivitySchema,
    uncertainty: finite('uncertainty').positive('must be greater than zero').optional().meta({
      description:
        'Standard deviation of the measured value, in its own units (ee and percentA: percentage points; er/dr/ratio: relative SD of r)',
    }),
    excluded: z.boolean().optional(),
    label: z.string().max(200).optional(),
  })
  .meta({ id: 'Measurement' });

export const fitRequestSchema = z
  .object({
    measurements: z
      .array(measurementInputSchema)
      .min(1, 'give at least two measurements')
      .max(MAX_POINTS, `at most ${MAX_POINTS} measurements`),
    weighting: z.enum(['none', 'uncertainty']).default('none'),
    uncertaintyScale: z.enum(['absolute', 'relative']).default('absolute').meta({
      description:
        'absolute: the uncertainties are true SDs; relative: only their ratios matter and the covariance is scaled by χ²/(n − 2)',
    }),
    confidence: z.number().gt(0.5, 'must be above 0.5').lt(1, 'must be below 1').default(0.95),
    predict: z.array(temperatureSchema).max(MAX_POINTS).default([]),
    newRunUncertainty: finite('newRunUncertainty').positive('must be greater than zero').optional().meta({
      description:
        "SD of the assay that will measure a new run, in the units of newRunMeasure (see Measurement.uncertainty); propagated at each predicted value. Default: the median uncertainty of the runs in that measure, else the screen's scatter",
    }),
    newRunMeasure: selectivityMeasureSchema
      .optional()
      .meta({ description: 'Measure of newRunUncertainty; default the measure most runs are reported in' }),
    quantitationLimit: quantitationLimitSchema.optional(),
  })
  .meta({ id: 'FitRequest' });
export type FitRequest = z.infer<typeof fitRequestSchema>;
export type FitRequestInput = z.input<typeof fitRequestSchema>;

const intervalSchema = z.tuple([z.number(), z.number()]);
/** Interval ends of r are null when r itself is beyond the representable range (ln r is always given). */
const ratioIntervalSchema = z.tuple([z.number().nullable(), z.number().nullable()]);
const mappedIntervalSchema = z.object({
  lnRatio: intervalSchema.optional(),
  ratio: ratioIntervalSchema,
  eePercent: intervalSchema,
  percentA: intervalSchema,
});
export const fitPredictionSchema = selectivityPointSchema
  .extend({
    /** null when r is beyond the representable range (outOfRange); ln r, ΔΔG‡ and the saturated ee still stand. */
    ratio: z.number().nullable(),
    lnRatio: z.number().optional(),
    outOfRange: z.boolean().optional(),
    /** σ(ln r) of the new run's own measurement at this prediction, when the assay precision is known. */
    newRunSigmaLnR: z.number().nullable().optional(),
    ddGSe: z.object({ 'kJ/mol': z.number(), 'kcal/mol': z.number() }).nullable(),
    extrapolated: z.boolean(),
    /** The model this forecast comes from: the segmented model when curvature is accepted. */
    model: z.enum(['one-line', 'segmented']),
    /** Under the segmented model, the branch covering this temperature ('low' = colder than the break). */
    branch: z.enum(['low', 'high']).nullable(),
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
    /** Externally studentized (deleted) residual. */
    studentized: z.number().nullable(),
    /** Internally studentized residual e/(s√(1 − h)). */
    studentizedInternal: z.number().nullable().optional(),
    /** One line on why the run is flagged (null when it is not). */
    flagReason: z.string().nullable().optional(),
    /** |residual| in SDs of the run's own assay precision, and whether that is within 2 SDs. */
    residualInAssaySigmas: z.number().nullable().optional(),
    withinAssayPrecision: z.boolean().nullable().optional(),
    /** For bounds: the censoring point in ln r (the quantitation limit, or a weaker reported bound). */
    censorLnRatio: z.number().nullable().optional(),
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
  slopeSe: z.number().nullable(),
  intercept: z.number(),
  ddH: z.object({
    'kJ/mol': z.number(),
    'kcal/mol': z.number(),
    se: z.object({ 'kJ/mol': z.number(), 'kcal/mol': z.number() }).nullable(),
  }),
  ddS: z.object({ 'J/(mol*K)': z.number(), 'cal/(mol*K)': z.number() }),
});

const lackOfFitSchema = z.object({ F: z.number(), dof1: z.number().int(), dof2: z.number().int(), p: z.number() }).meta({
  id: 'LackOfFitTest',
  description:
    'Classical lack-of-fit F test of one straight line: lack of fit (dof1 = m − 2) against pure error from replicates (dof2 = n − m).',
});

const curvatureCheckedSchema = z.object({
  checked: z.literal(true),
  preferred: z.enum(['one-line', 'two-branch']),
  /** Set only when the break is accepted: an isoinversion (branch slopes of opposite sign) or a change of slope. */
  claim: z.enum(['isoinversion', 'change-of-slope']).nullable(),
  /** Whether r has a maximum or a minimum at an isoinversion temperature; null otherwise. */
  extremum: z.enum(['maximum', 'minimum']).nullable(),
  /** The break temperature with its confidence interval (upper end null when unbounded); null unless accepted. */
  break: z
    .object({
      kelvin: z.number(),
      celsius: z.number(),
      ci: z
        .object({
          level: z.number(),
          kelvin: z.tuple([z.number(), z.number().nullable()]),
          celsius: z.tuple([z.number(), z.number().nullable()]),
        })
        .nullable(),
      label: z.string(),
    })
    .nullable(),
  /** Branches of the continuous model (they meet at the break); null unless accepted. */
  low: branchSchema.nullable(),
  high: branchSchema.nullable(),
  breakTest: z.object({
    method: z.literal('sup-F, parametric bootstrap'),
    F: z.number(),
    p: z.number(),
    resamples: z.number().int(),
    seed: z.number().int(),
    alpha: z.number(),
  }),
  lackOfFit: lackOfFitSchema.nullable(),
  note: z.string(),
});
const curvatureSkippedSchema = z.object({
  checked: z.literal(false),
  preferred: z.literal('one-line'),
  claim: z.null(),
  lackOfFit: lackOfFitSchema.nullable(),
  note: z.string(),
});
export const twoBranchSchema = z.discriminatedUnion('checked', [curvatureCheckedSchema, curvatureSkippedSchema]).meta({
  id: 'CurvatureCheck',
  description:
    'Continuous two-branch (segmented) model of ln r on 1/T with the break as a parameter, tested against one line by sup-F calibrated with a fixed-seed parametric bootstrap. checked: false when there are too few runs (note says why).',
});

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
    /** least-squares, or censored-ml (Tobit) when some runs are bounds. */
    estimator: z.enum(['least-squares', 'censored-ml']).optional(),
    /** With censored-ml: the least-squares fit of the exact runs only, for comparison (biased low). */
    leastSquaresWithoutBounds: z
      .object({ n: z.number().int(), ddH: energyStat, ddS: entropyStat, label: z.string() })
      .nullable()
      .optional(),
    censoredFit: z
      .object({
        logLikelihood: z.number(),
        iterations: z.number().int(),
        scale: z.number(),
        nLower: z.number().int(),
        nUpper: z.number().int(),
      })
      .nullable()
      .optional(),
    quantitationLimit: z.object({ measure: selectivityMeasureSchema, value: z.number(), lnRatio: z.number() }).optional(),
    /** Weighted fits: χ²/dof and whether the stated precision matches the scatter. */
    precisionCheck: z
      .object({
        chiSquare: z.number(),
        dof: z.number().int(),
        reducedChiSquare: z.number(),
        pLarger: z.number(),
        pSmaller: z.number(),
        verdict: z.enum(['consistent', 'scatter-larger', 'scatter-smaller']),
        message: z.string(),
      })
      .nullable()
      .optional(),
    /** Where a new run's own scatter in the prediction interval comes from. */
    newRun: z
      .object({
        source: z.enum(['assay', 'screen-scatter']),
        measure: selectivityMeasureSchema.nullable(),
        uncertainty: z.number().nullable(),
        note: z.string(),
      })
      .optional(),
    twoBranch: twoBranchSchema,
    warnings: z.array(warningSchema),
    convention: z.string(),
    caution: z.string(),
    predictions: z.array(fitPredictionSchema),
  })
  .meta({ id: 'FitResponse' });
export type FitResponse = z.infer<typeof fitResponseSchema>;
