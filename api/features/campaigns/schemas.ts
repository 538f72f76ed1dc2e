/**
 * Campaign, measurement, saved-forecast and import-mapping schemas, shared by the API and the
 * web client. zod and the pure engine constants only: nothing here may reach the server runtime.
 * The database repeats the numeric limits as CHECK constraints (migrations/20261201020000_*).
 */
import { z } from 'zod';
import {
  parseRatioPair,
  SELECTIVITY_MEASURES,
  selectivityProblem,
  TEMPERATURE_UNIT_LABEL,
  TEMPERATURE_UNITS,
  toKelvin,
  toSeconds,
  type SelectivityMeasure,
  type TemperatureUnit,
} from '../../science/quantities';
import { quantitationLimitProblem } from '../calculators/schemas';
import { ASSAY_METHODS, CAMPAIGN_STATUSES, type AssayMethod, type CampaignStatus } from '../../models/enums';

export { parseRatioPair, SELECTIVITY_MEASURES, selectivityProblem, TEMPERATURE_UNITS, toKelvin, toSeconds };
export type { SelectivityMeasure, TemperatureUnit };

export { ASSAY_METHODS, CAMPAIGN_STATUSES, type AssayMethod, type CampaignStatus };

export const TIME_UNITS = ['s', 'min', 'h'] as const;
export type TimeUnit = (typeof TIME_UNITS)[number];

/** Highest temperature accepted anywhere (K); no solution-phase screen runs near it. */
export const MAX_TEMPERATURE_K = 1000;

const finite = (what: string) => z.number({ error: `${what} must be a number` }).refine(Number.isFinite, `${what} must be a finite number`);

/** `{ value, unit }` in, checked to lie above 0 K and at most 1000 K. */
export const temperatureInputSchema = z
  .object({
    value: finite('temperature'),
    unit: z.enum(TEMPERATURE_UNITS, { error: 'unit must be K, C or F' }),
  })
  .superRefine((t, ctx) => {
    const k = toKelvin(t.value, t.unit);
    if (!(k > 0))
      ctx.addIssue({
        code: 'custom',
        path: ['value'],
        message: `${t.value} ${TEMPERATURE_UNIT_LABEL[t.unit]} is at or below absolute zero`,
      });
    else if (k > MAX_TEMPERATURE_K)
      ctx.addIssue({
        code: 'custom',
        path: ['value'],
        message: `${t.value} ${TEMPERATURE_UNIT_LABEL[t.unit]} is above ${MAX_TEMPERATURE_K} K`,
      });
  });
export const reactionTimeInputSchema = z.object({
  value: finite('reaction time').refine((v) => v >= 0, 'reaction time must not be negative'),
  unit: z.enum(TIME_UNITS, { error: 'unit must be s, min or h' }),
});

/**
 * A reported selectivity, as in the stateless API: `value` is a number, or "a:b" for er, dr and ratio.
 * `atLeast` marks a bound (e.g. ≥ 99.8 % ee at the assay's quantitation limit).
 */
export const selectivityInputSchema = z
  .object({
    measure: z.enum(SELECTIVITY_MEASURES, { error: `measure must be one of ${SELECTIVITY_MEASURES.join(', ')}` }),
    value: z.union([z.number(), z.string().trim().min(1).max(40)], { error: 'value must be a number or a ratio "a:b"' }),
    atLeast: z.boolean().optional(),
  })
  .superRefine((s, ctx) => {
    const problem = selectivityProblem(s.measure, s.value);
    if (problem) ctx.addIssue({ code: 'custom', path: ['value'], message: problem });
  });
/** PostgreSQL text cannot hold U+0000; refused in every stored text field with a field error. */
const noNul = (s: string) => !s.includes('\u0000');
const NUL_MESSAGE = 'must not contain a NUL character (U+0000)';

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `at most ${max} characters`)
    .refine(noNul, NUL_MESSAGE)
    .transform((s) => (s === '' ? null : s))
    .nullable()
    .optional();

const uncertaintySchema = finite('uncertainty').refine((v) => v >= 0 && v < 100, 'uncertainty must be at least 0 and below 100');

// ── Campaigns ──────────────────────────────────────────────────────────────────────────────

const campaignFields = {
  title: z.string().trim().min(1, 'title is required').max(200, 'at most 200 characters').refine(noNul, NUL_MESSAGE),
  reactionDescription: optionalText(4000),
  productNameA: z.string().trim().min(1, 'name product A').max(100, 'at most 100 characters').refine(noNul, NUL_MESSAGE),
  productNameB: z.string().trim().min(1, 'name product B').max(100, 'at most 100 characters').refine(noNul, NUL_MESSAGE),
  measure: z.enum(SELECTIVITY_MEASURES, { error: `measure must be one of ${SELECTIVITY_MEASURES.join(', ')}` }),
  assayMethod: z.enum(ASSAY_METHODS, { error: `assayMethod must be one of ${ASSAY_METHODS.join(', ')}` }),
  defaultUncertainty: uncertaintySchema.nullable().optional(),
  /** SD of the assay that will measure the next run (the measure's units); intervals for a new run add it. */
  newRunUncertainty: finite('newRunUncertainty')
    .refine((v) => v > 0 && v < 100, 'newRunUncertainty must be above 0 and below 100')
    .nullable()
    .optional(),
  /** Runs at or beyond this are bounds: ee in %, percentA/er as the major share in %, dr/ratio as r. */
  quantitationLimit: finite('quantitationLimit').nullable().optional(),
  status: z.enum(CAMPAIGN_STATUSES, { error: `status must be one of ${CAMPAIGN_STATUSES.join(', ')}` }),
  notes: optionalText(10000),
};

export const campaignCreateSchema = z
  .strictObject({
    ...campaignFields,
    productNameA: campaignFields.productNameA.default('A'),
    productNameB: campaignFields.productNameB.default('B'),
    status: campaignFields.status.default('active'),
  })
  .superRefine((c, ctx) => {
    const problem = c.quantitationLimit == null ? null : quantitationLimitProblem(c.measure, c.quantitationLimit);
    if (problem) ctx.addIssue({ code: 'custom', path: ['quantitationLimit'], message: `quantitationLimit ${problem}` });
  });
export type CampaignCreate = z.infer<typeof campaignCreateSchema>;

/** A partial update; `version` is the version the client last read (optimistic concurrency). */
export const versionSchema = z
  .number({ error: 'version is required' })
  .int('version must be an integer')
  .min(1, 'version must be at least 1');

export const campaignUpdateSchema = z
  .strictObject({
    version: versionSchema,
    title: campaignFields.title.optional(),
    reactionDescription: campaignFields.reactionDescription,
    productNameA: campaignFields.productNameA.optional(),
    productNameB: campaignFields.productNameB.optional(),
    measure: campaignFields.measure.optional(),
    assayMethod: campaignFields.assayMethod.optional(),
    defaultUncertainty: campaignFields.defaultUncertainty,
    newRunUncertainty: campaignFields.newRunUncertainty,
    quantitationLimit: campaignFields.quantitationLimit,
    status: campaignFields.status.optional(),
    notes: campaignFields.notes,
  })
  .refine((u) => Object.keys(u).some((k) => k !== 'version' && k !== 'reason'), { message: 'nothing to change', path: [] });
export type CampaignUpdate = z.infer<typeof campaignUpdateSchema>;

// ── Measurements ───────────────────────────────────────────────────────────────────────────

const measurementFields = {
  temperature: temperatureInputSchema,
  selectivity: selectivityInputSchema,
  uncertainty: uncertaintySchema.nullable().optional(),
  replicateLabel: optionalText(40),
  sampleId: optionalText(100),
  conversionPercent: finite('conversion')
    .refine((v) => v >= 0 && v <= 100, 'conversion must lie between 0 and 100 %')
    .nullable()
    .optional(),
  reactionTime: reactionTimeInputSchema.nullable().optional(),
  notes: optionalText(2000),
};

export const measurementCreateSchema = z.strictObject(measurementFields);
export type MeasurementCreate = z.infer<typeof measurementCreateSchema>;

/** Why a stored measurement is changed, deleted or a campaign reopened; kept in the history. */
export const changeReasonSchema = z
  .string({ error: 'give a reason (kept in the history)' })
  .trim()
  .min(3, 'give a reason (at least 3 characters)')
  .max(500, 'at most 500 characters');

const measurementChangeFields = {
  version: versionSchema,
  reason: changeReasonSchema,
  temperature: measurementFields.temperature.optional(),
  selectivity: measurementFields.selectivity.optional(),
  uncertainty: measurementFields.uncertainty,
  replicateLabel: measurementFields.replicateLabel,
  sampleId: measurementFields.sampleId,
  conversionPercent: measurementFields.conversionPercent,
  reactionTime: measurementFields.reactionTime,
  notes: measurementFields.notes,
};
const changesSomething = (u: object) => Object.keys(u).some((k) => k !== 'id' && k !== 'version' && k !== 'reason');

export const measurementUpdateSchema = z
  .strictObject(measurementChangeFields)
  .refine(changesSomething, { message: 'nothing to change', path: [] });
export type MeasurementUpdate = z.infer<typeof measurementUpdateSchema>;

/** Most rows one batched change may touch (the grid sends the rows edited since the last save). */
export const MAX_BATCH_MEASUREMENT_CHANGES = 1000;

/**
 * Several stored runs of one campaign changed at once: each row names its id, the version it was
 * read at and the reason; all are saved or none.
 */
export const measurementBatchUpdateSchema = z.strictObject({
  measurements: z
    .array(
      z
        .strictObject({ id: z.uuid({ error: 'id must be a measurement id' }), ...measurementChangeFields })
        .refine(changesSomething, { message: 'nothing to change', path: [] }),
      { error: 'measurements must be a list' },
    )
    .min(1, 'give at least one measurement')
    .max(MAX_BATCH_MEASUREMENT_CHANGES, `at most ${MAX_BATCH_MEASUREMENT_CHANGES} measurements per request`)
    .superRefine((rows, ctx) => {
      const first = new Map<string, number>();
      rows.forEach((r, i) => {
        const earlier = first.get(r.id);
        if (earlier === undefined) first.set(r.id, i);
        else
          ctx.addIssue({ code: 'custom', path: [i, 'id'], message: `the same measurement as row ${earlier + 1}; send one change per run` });
      });
    }),
});
export type MeasurementBatchUpdate = z.infer<typeof measurementBatchUpdateSchema>;

/** Exclude a point from fits (with a reason, always) or bring it back. */
export const measurementExclusionSchema = z.discriminatedUnion(
  'excluded',
  [
    z.strictObject({
      version: versionSchema,
      excluded: z.literal(true),
      reason: z
        .string()
        .trim()
        .min(3, 'give a reason (at least 3 characters)')
        .max(500, 'at most 500 characters')
        .refine(noNul, NUL_MESSAGE),
    }),
    z.strictObject({ version: versionSchema, excluded: z.literal(false) }),
  ],
  { error: 'excluded must be true (with a reason) or false' },
);
export type MeasurementExclusion = z.infer<typeof measurementExclusionSchema>;

/** Deleting a measurement names the version last read and says why. */
export const measurementDeleteQuerySchema = z.object({
  version: z.coerce
    .number({ error: 'version must be a number' })
    .int('version must be an integer')
    .min(1, 'version must be at least 1')
    .optional(),
  reason: changeReasonSchema,
});

/** Signing a campaign off, with an optional note shown beside the sign-off. */
export const campaignSignOffSchema = z.strictObject({
  note: z.string().trim().max(500, 'at most 500 characters').nullish(),
});

/** Reopening a signed-off campaign always says why. */
export const campaignReopenSchema = z.strictObject({ reason: changeReasonSchema });

/** A version-checked delete. */
// ── Saved forecasts ────────────────────────────────────────────────────────────────────────

/** What a client sends to save a forecast; the route computes `result` with the engine. */
export const savedForecastCreateSchema = z.strictObject({
  temperature: temperatureInputSchema,
  label: optionalText(200),
  notes: optionalText(2000),
});
export type SavedForecastCreate = z.infer<typeof savedForecastCreateSchema>;

// ── File import ────────────────────────────────────────────────────────────────────────────

/** Fields a file column can be mapped to. */
export const IMPORT_FIELDS = [
  'temperature',
  'temperatureUnit',
  'measure',
  'value',
  'uncertainty',
  'sampleId',
  'replicateLabel',
  'conversionPercent',
  'reactionTime',
  'notes',
] as const;
export type ImportField = (typeof IMPORT_FIELDS)[number];

/** A column, by 0-based index or by its header text (matched ignoring case and surrounding spaces). */
export const columnRefSchema = z.union([z.number().int().min(0, 'column index must be 0 or more'), z.string().trim().min(1).max(200)]);
export type ColumnRef = z.infer<typeof columnRefSchema>;

export const importMappingSchema = z
  .strictObject({
    columns: z.strictObject({
      temperature: columnRefSchema,
      temperatureUnit: columnRefSchema.optional(),
      measure: columnRefSchema.optional(),
      value: columnRefSchema,
      uncertainty: columnRefSchema.optional(),
      sampleId: columnRefSchema.optional(),
      replicateLabel: columnRefSchema.optional(),
      conversionPercent: columnRefSchema.optional(),
      reactionTime: columnRefSchema.optional(),
      notes: columnRefSchema.optional(),
    }),
    /** Unit of the temperature column when no unit column is mapped. */
    temperatureUnit: z.enum(TEMPERATURE_UNITS).optional(),
    /** Measure of the value column when no measure column is mapped. */
    measure: z.enum(SELECTIVITY_MEASURES).optional(),
    timeUnit: z.enum(TIME_UNITS).default('h'),
  })
  .superRefine((m, ctx) => {
    if (m.columns.temperatureUnit === undefined && m.temperatureUnit === undefined) {
      ctx.addIssue({ code: 'custom', path: ['temperatureUnit'], message: 'map a unit column or choose the temperature unit (K, C or F)' });
    }
    if (m.columns.measure === undefined && m.measure === undefined) {
      ctx.addIssue({ code: 'custom', path: ['measure'], message: 'map a measure column or choose the measure of the value column' });
    }
  });
export type ImportMapping = z.infer<typeof importMappingSchema>;
export type ImportMappingInput = z.input<typeof importMappingSchema>;

/** Options that override what the parser detects. Sent as JSON beside the uploaded file. */
export const importParseOptionsSchema = z.strictObject({
  delimiter: z.enum([',', ';', '\t']).optional(),
  decimalSeparator: z.enum(['.', ',']).optional(),
  /** 1-based row of the header; 0 means the file has no header row. */
  headerRow: z.number().int().min(0).max(100).optional(),
  /** Worksheet name for workbooks; the first non-empty sheet otherwise. */
  sheet: z.string().trim().min(1).max(100).optional(),
});
export type ImportParseOptions = z.infer<typeof importParseOptionsSchema>;

export const importRequestSchema = z.strictObject({
  mapping: importMappingSchema,
  parse: importParseOptionsSchema.default({}),
  /** The user has read the warnings of the preview and imports anyway. */
  acknowledgeWarnings: z.boolean().default(false),
});
export type ImportRequest = z.infer<typeof importRequestSchema>;

export const importPreviewRequestSchema = z.strictObject({
  mapping: importMappingSchema.optional(),
  parse: importParseOptionsSchema.default({}),
});
export type ImportPreviewRequest = z.infer<typeof importPreviewRequestSchema>;
