/**
 * Request and response shapes of the temperature planner (POST /api/v1/plan) and of the stored
 * specification. Plain zod only: the web client imports this file, and the OpenAPI document is
 * generated from it.
 */
import { z } from 'zod';
import { MAX_POINTS, durationSchema, measurementInputSchema, temperatureSchema } from '../calculators/schemas';
import { temperatureToK } from '../../science/units';
import { barrierSchema, concentrationSchema, readableDurationSchema } from '../calculators/kinetics-schemas';

/** Kelvin of a temperature for ordering checks only (NaN when it cannot be converted; the engine then names the field). */
function kelvinOf(t: { value: number; unit: 'K' | 'C' | 'F' }): number {
  try {
    return temperatureToK(t.value, t.unit);
  } catch {
    return Number.NaN;
  }
}

const finite = (what: string) =>
  z.number({ error: (issue) => (issue.input === undefined ? `${what} is required` : `${what} must be a finite number`) });
const percentOpen = (what: string) => finite(what).gt(0, 'must be above 0 %').lt(100, 'must be below 100 %');

export const specificationMeasureSchema = z.enum(['ee', 'er', 'dr', 'percentA']).meta({
  id: 'SpecificationMeasure',
  description: 'ee: % ee; er and percentA: % of the major isomer (98 for 98:2); dr: r of r:1 (20 for 20:1)',
});

/** Range of each measure's minimum, with the sentence shown when it is outside. */
export const SPEC_MINIMUM_RULES: Record<z.infer<typeof specificationMeasureSchema>, { ok: (v: number) => boolean; message: string }> = {
  ee: { ok: (v) => v > 0 && v < 100, message: 'an ee specification must lie above 0 and below 100 % ee' },
  er: { ok: (v) => v > 50 && v < 100, message: 'an er specification is the major share and must lie above 50 and below 100 %' },
  percentA: { ok: (v) => v > 50 && v < 100, message: 'a % major specification must lie above 50 and below 100 %' },
  dr: { ok: (v) => v > 1, message: 'a dr specification must be above 1 (1:1 is no selectivity)' },
};

const specificationShape = z.object({
  measure: specificationMeasureSchema,
  minimum: finite('minimum'),
  probability: finite('probability').gt(0.5, 'must be above 0.5 (a coin toss is not a specification)').lte(0.999, 'must be at most 0.999'),
  runs: z.number().int('must be a whole number').min(1).max(100).optional().meta({
    description: 'Judge the mean of this many runs instead of a single run (default 1)',
  }),
});

export const specificationSchema = specificationShape
  .superRefine((s, ctx) => {
    const rule = SPEC_MINIMUM_RULES[s.measure];
    if (rule && !rule.ok(s.minimum)) ctx.addIssue({ code: 'custom', path: ['minimum'], message: rule.message });
  })
  .meta({
    id: 'Specification',
    description: 'What a run must reach and how sure we must be, e.g. { "measure": "ee", "minimum": 99, "probability": 0.95 }',
  });
export type SpecificationInput = z.infer<typeof specificationSchema>;

const runSchema = z
  .object({ temperature: temperatureSchema, conversionPercent: percentOpen('conversionPercent'), time: durationSchema })
  .meta({ id: 'PlanRateRun' });

const rateFields = {
  runs: z.array(runSchema).min(2, 'give at least two runs').max(MAX_POINTS, `at most ${MAX_POINTS} runs`),
  order: z.enum(['first', 'pseudo-first', 'second']).default('first'),
  limiting: concentrationSchema.optional().meta({ description: 'pseudo-first order: the limiting reagent' }),
  excess: concentrationSchema.optional().meta({ description: 'pseudo-first order: the reagent in excess' }),
  initial: concentrationSchema.optional().meta({ description: 'second order: the equal starting concentrations' }),
  targetConversionPercent: percentOpen('targetConversionPercent'),
  maxTime: durationSchema.optional().meta({ description: 'Longest allowed reaction time; a constraint on the plan' }),
  lowConversionPercent: finite('lowConversionPercent').gt(0).lt(100).default(10).meta({
    description: 'Runs below this conversion are flagged (default 10 %)',
  }),
};

function requireConcentrations(r: { order: string; limiting?: unknown; excess?: unknown; initial?: unknown }, ctx: z.RefinementCtx) {
  if (r.order === 'pseudo-first') {
    if (!r.limiting) ctx.addIssue({ code: 'custom', path: ['limiting'], message: 'pseudo-first order needs the limiting concentration' });
    if (!r.excess) ctx.addIssue({ code: 'custom', path: ['excess'], message: 'pseudo-first order needs the excess concentration' });
  }
  if (r.order === 'second' && !r.initial)
    ctx.addIssue({ code: 'custom', path: ['initial'], message: 'second order needs the starting concentration' });
}

export const planRateSchema = z
  .object(rateFields)
  .superRefine(requireConcentrations)
  .meta({ id: 'PlanRate', description: "The main reaction's rate from runs: conversion reached after a time at a temperature." });

/** A stored campaign's rate: the runs default to the campaign's own runs that carry conversion and time. */
export const campaignPlanRateSchema = z
  .object({ ...rateFields, runs: rateFields.runs.optional() })
  .superRefine(requireConcentrations)
  .meta({ id: 'CampaignPlanRate' });

export const planHoldSchema = z
  .object({
    barrier: barrierSchema.meta({ description: 'Racemization or epimerization barrier of the product' }),
    time: durationSchema,
    floorEePercent: percentOpen('floorEePercent').meta({ description: 'ee (de for a dr measure) that must remain after the hold' }),
  })
  .meta({ id: 'PlanHold', description: 'A planned hold before isolation and the ee floor after it.' });

export const planRuleSchema = z.enum(['warmest', 'coldest', 'middle']).meta({
  id: 'PlanRule',
  description: 'warmest (default): the warmest temperature where every constraint holds; coldest; middle of the window',
});

const planFields = {
  weighting: z.enum(['none', 'uncertainty']).default('none'),
  uncertaintyScale: z.enum(['absolute', 'relative']).default('absolute'),
  newRunUncertainty: finite('newRunUncertainty').positive('must be greater than zero').optional().meta({
    description:
      "The assay's precision for one new run, in the specification measure's units (ee: % points; er/percentA: points of the major share; dr: relative SD of r)",
  }),
  temperatures: z
    .object({ from: temperatureSchema, to: temperatureSchema })
    .superRefine((r, ctx) => {
      const from = kelvinOf(r.from);
      const to = kelvinOf(r.to);
      if (Number.isFinite(from) && Number.isFinite(to) && !(to > from)) {
        ctx.addIssue({ code: 'custom', path: ['to'], message: 'must be warmer than temperatures.from (the range runs cold to warm)' });
      }
    })
    .meta({ description: 'The allowed (jacket) range, coldest to warmest' }),
  at: z.array(temperatureSchema).max(MAX_POINTS, `at most ${MAX_POINTS} temperatures`).default([]),
  hold: planHoldSchema.optional(),
  applyAtProbability: z.boolean().default(false).meta({
    description: 'Apply the time and hold constraints at the required probability instead of at the central estimate',
  }),
  rule: planRuleSchema.default('warmest'),
  nextRuns: z
    .object({
      count: z.number().int('must be a whole number').min(1, 'at least 1').max(24, 'at most 24'),
      at: temperatureSchema.optional().meta({ description: 'Default: the recommended temperature' }),
    })
    .optional(),
  curvePoints: z.number().int().min(2).max(2001).default(121),
};

export const planRequestSchema = z
  .object({
    ...planFields,
    measurements: z
      .array(measurementInputSchema)
      .min(1, 'give at least three measurements')
      .max(MAX_POINTS, `at most ${MAX_POINTS} measurements`),
    specification: specificationSchema,
    rate: planRateSchema.optional(),
  })
  .meta({ id: 'PlanRequest' });
export type PlanRequest = z.infer<typeof planRequestSchema>;
export type PlanRequestInput = z.input<typeof planRequestSchema>;

const kc = z.object({ kelvin: z.number(), celsius: z.number() });
const constraintSchema = z.enum(['specification', 'time', 'jacket', 'hold']);
const interval = z.tuple([z.number(), z.number()]);

export const planPointSchema = z
  .object({
    kelvin: z.number(),
    celsius: z.number(),
    probabilityMeetsSpec: z.number(),
    predicted: z.object({
      lnRatio: z.number(),
      value: z.number().meta({ description: "In the specification's measure" }),
      band: interval.meta({ description: '95 % interval for one new run, in the measure' }),
    }),
    timeToTarget: readableDurationSchema.nullable(),
    timeBandSeconds: interval.nullable(),
    eeAfterHold: z.number().nullable(),
    feasible: z.boolean(),
    failing: z.array(constraintSchema),
  })
  .meta({ id: 'PlanPoint' });

export const planResponseSchema = z
  .object({
    recommended: kc.extend({ probabilityMeetsSpec: z.number(), rule: planRuleSchema }).nullable(),
    rule: z.object({ name: planRuleSchema, text: z.string() }),
    window: z.object({ from: kc, to: kc }).nullable(),
    feasibleRanges: z.array(z.object({ from: kc, to: kc })),
    binding: z.array(constraintSchema),
    needs: z.array(
      z.object({
        constraint: constraintSchema,
        kind: z.enum(['everywhere', 'at-most', 'at-least', 'between', 'nowhere']),
        from: kc.nullable(),
        to: kc.nullable(),
        message: z.string(),
      }),
    ),
    conflict: z.object({ message: z.string(), gapKelvin: z.number().nullable() }).nullable(),
    resolutions: z.array(z.string()),
    specification: specificationShape.extend({ lnRatio: z.number() }),
    model: z.object({
      kind: z.enum(['straight-line', 'segmented']),
      n: z.number().int(),
      dof: z.number().int(),
      fromKelvin: z.number(),
      toKelvin: z.number(),
    }),
    evaluations: z.array(planPointSchema),
    curve: z.array(planPointSchema),
    rate: z
      .object({
        order: z.enum(['first', 'pseudo-first', 'second']),
        dH: z.object({
          'kJ/mol': z.number(),
          'kcal/mol': z.number(),
          se: z.object({ 'kJ/mol': z.number(), 'kcal/mol': z.number() }).nullable(),
        }),
        dS: z.object({
          'J/(mol*K)': z.number(),
          'cal/(mol*K)': z.number(),
          se: z.object({ 'J/(mol*K)': z.number(), 'cal/(mol*K)': z.number() }).nullable(),
        }),
        runs: z.array(z.object({ index: z.number().int(), kelvin: z.number(), k: z.number(), lowConversion: z.boolean() })),
        kUnit: z.enum(['s^-1', 'M^-1 s^-1']),
      })
      .nullable(),
    nextRuns: z
      .object({
        at: kc,
        temperatures: z.array(kc),
        halfWidthBefore: z.number().meta({ description: 'Half-width in ln r of the interval for one new run at `at`, now' }),
        halfWidthAfter: z.number().meta({ description: 'The same, expected after the suggested runs' }),
        meanHalfWidthBefore: z.number(),
        meanHalfWidthAfter: z.number(),
        note: z.string(),
      })
      .nullable(),
    warnings: z.array(z.object({ code: z.string(), message: z.string() })),
    convention: z.string(),
    caution: z.string(),
  })
  .meta({ id: 'PlanResponse' });
export type PlanResponse = z.infer<typeof planResponseSchema>;

// ---------- stored: specifications, campaign plans, comparisons ----------

export const specificationPutSchema = specificationShape
  .extend({
    version: z.number().int().min(1).optional().meta({ description: 'The version last read; required once a specification exists' }),
  })
  .superRefine((s, ctx) => {
    const rule = SPEC_MINIMUM_RULES[s.measure];
    if (rule && !rule.ok(s.minimum)) ctx.addIssue({ code: 'custom', path: ['minimum'], message: rule.message });
  })
  .meta({ id: 'SpecificationPut' });
export type SpecificationPut = z.infer<typeof specificationPutSchema>;

export const storedSpecificationSchema = specificationShape
  .extend({ runs: z.number().int(), version: z.number().int(), updatedAt: z.string() })
  .meta({ id: 'StoredSpecification' });

export const campaignSpecificationResponseSchema = z
  .object({
    campaign: storedSpecificationSchema.nullable(),
    project: storedSpecificationSchema.nullable(),
    effective: storedSpecificationSchema.nullable(),
    source: z.enum(['campaign', 'project']).nullable(),
  })
  .meta({ id: 'CampaignSpecification' });

export const campaignPlanInputsSchema = z
  .object({
    ...planFields,
    specification: specificationSchema.optional().meta({ description: "Default: the campaign's specification, else the project's" }),
    rate: campaignPlanRateSchema.optional(),
  })
  .meta({ id: 'CampaignPlanInputs' });
export type CampaignPlanInputs = z.infer<typeof campaignPlanInputsSchema>;

export const campaignPlanPutSchema = z
  .object({
    inputs: campaignPlanInputsSchema,
    version: z.number().int().min(1).optional().meta({ description: 'The version last read; required once a plan exists' }),
  })
  .meta({ id: 'CampaignPlanPut' });

export const campaignPlanSchema = z
  .object({
    campaignId: z.string(),
    inputs: campaignPlanInputsSchema,
    result: planResponseSchema,
    version: z.number().int(),
    updatedAt: z.string(),
  })
  .meta({ id: 'CampaignPlan' });

export const comparisonCreateSchema = z
  .object({
    projectId: z.uuid({ error: 'must be a project id' }),
    name: z.string({ error: 'give the comparison a name' }).trim().min(1, 'give the comparison a name').max(200, 'at most 200 characters'),
    campaignIds: z
      .array(z.uuid({ error: 'must be a campaign id' }))
      .min(2, 'choose at least two campaigns to compare')
      .max(6, 'choose at most six campaigns')
      .superRefine((ids, ctx) => {
        ids.forEach((id, i) => {
          if (ids.indexOf(id) !== i) ctx.addIssue({ code: 'custom', path: [i], message: 'this campaign is already in the comparison' });
        });
      }),
    temperature: temperatureSchema,
  })
  .meta({ id: 'ComparisonCreate' });
export type ComparisonCreate = z.infer<typeof comparisonCreateSchema>;

const energyWithSe = z.object({ 'kJ/mol': z.number(), 'kcal/mol': z.number(), se: z.number().nullable().meta({ description: 'kJ/mol' }) });
export const comparisonResultSchema = z
  .object({
    temperature: kc,
    campaigns: z.array(
      z.object({
        id: z.string(),
        title: z.string().nullable(),
        measure: z.string().nullable(),
        projectId: z.string().nullable(),
        available: z.boolean(),
        problem: z.string().nullable(),
        specification: z
          .object({
            measure: specificationMeasureSchema,
            minimum: z.number(),
            probability: z.number(),
            runs: z.number().int(),
            lnRatio: z.number(),
          })
          .nullable()
          .optional()
          .meta({ description: "The campaign's stored specification (its own, else its project's default); null when none is set" }),
        meetsAtTemperature: z.enum(['meets', 'falls short']).nullable().optional().meta({
          description:
            "Whether the fitted selectivity at the comparison's temperature reaches the campaign's specification; null without one",
        }),
        fit: z
          .object({
            n: z.number().int(),
            ddH: energyWithSe,
            ddS: z.object({ 'J/(mol*K)': z.number(), 'cal/(mol*K)': z.number(), se: z.number().nullable() }),
            at: z.object({ lnRatio: z.number(), value: z.number(), interval: interval }),
            curve: z.array(
              z.object({
                kelvin: z.number(),
                celsius: z.number(),
                lnRatio: z.number(),
                lnInterval: interval,
                value: z.number(),
                interval: interval,
              }),
            ),
            eyring: z.array(z.object({ kelvin: z.number(), inverseKelvin: z.number(), lnRatio: z.number(), status: z.string() })),
          })
          .nullable(),
      }),
    ),
    pairs: z.array(
      z.object({
        first: z.string(),
        second: z.string(),
        differenceLnR: z.number(),
        interval: interval,
        dof: z.number(),
        differenceDdG: z.object({ 'kJ/mol': z.number(), interval: interval }),
        probabilityFirstBetter: z.number(),
        verdict: z.enum(['first', 'second', 'cannot-tell']),
        equalSlopes: z.object({ F: z.number().nullable(), dof1: z.number(), dof2: z.number(), p: z.number().nullable() }),
        crossover: z
          .object({
            kelvin: z.number(),
            celsius: z.number(),
            interval: z.tuple([kc.nullable(), kc.nullable()]),
            bounded: z.boolean(),
            note: z.string(),
          })
          .nullable(),
        runsToTellApart: z.number().int().nullable().meta({
          description:
            'Runs to add at the temperature to each campaign before the difference would be told apart (80 % power); null when more than 50',
        }),
        note: z.string(),
      }),
    ),
    valueMeasure: z.enum(['ee', 'dr', 'percentA']),
    convention: z.string(),
    caution: z.string(),
  })
  .meta({ id: 'ComparisonResult' });

export const comparisonSchema = z
  .object({
    id: z.string(),
    projectId: z.string(),
    name: z.string(),
    campaignIds: z.array(z.string()),
    temperature: kc,
    createdAt: z.string(),
    result: comparisonResultSchema,
  })
  .meta({ id: 'Comparison' });
