/**
 * Request and response shapes of the stateless kinetics endpoints: product distribution over
 * competing pathways (/api/v1/distribution), rates and times (/api/v1/rate) and loss of ee after
 * the reaction (/api/v1/erosion). Plain zod only, so the web client can import it; the shared
 * quantity shapes come from the compute feature.
 */
import { z } from 'zod';
import { durationSchema, energySchema, entropySchema, temperatureSchema, temperaturesSchema } from '../calculators/schemas';

export const MAX_PATHWAYS = 50;

const finite = (what: string) =>
  z.number({ error: (issue) => (issue.input === undefined ? `${what} is required` : `${what} must be a finite number`) });

const percentOpen = (what: string) => finite(what).gt(0, 'must be above 0 %').lt(100, 'must be below 100 %');

// ---------- barriers ----------
export const gibbsBarrierSchema = z
  .object({
    kind: z.literal('gibbs'),
    dG: energySchema,
    temperature: temperatureSchema,
    dS: entropySchema.optional().meta({ description: 'ΔS‡; when left out it is taken as 0 and the answer says so' }),
  })
  .meta({ id: 'GibbsBarrier', description: 'A barrier given as ΔG‡ at one temperature (optionally with ΔS‡).' });
export const activationBarrierSchema = z
  .object({ kind: z.literal('activation'), dH: energySchema, dS: entropySchema })
  .meta({ id: 'ActivationBarrier', description: 'A barrier given as ΔH‡ and ΔS‡ (both taken as constant over temperature).' });
export const barrierSchema = z
  .discriminatedUnion('kind', [gibbsBarrierSchema, activationBarrierSchema])
  .meta({ id: 'Barrier', description: 'ΔG‡ at a temperature (kind "gibbs") or ΔH‡ and ΔS‡ (kind "activation").' });
export type BarrierInput = z.infer<typeof barrierSchema>;

// ---------- shared outputs ----------
const energyOut = z.object({ 'kJ/mol': z.number(), 'kcal/mol': z.number() });
const entropyOut = z.object({ 'J/(mol*K)': z.number(), 'cal/(mol*K)': z.number() });
export const readableDurationSchema = z
  .object({
    s: z.number(),
    value: z.number(),
    unit: z.enum(['s', 'min', 'h', 'd', 'y']),
    text: z.string(),
  })
  .meta({ id: 'ReadableDuration', description: 'A duration in seconds and in the most readable unit (y = 365.25 d).' });
const warningSchema = z.object({ code: z.string(), message: z.string() });

// ---------- distribution ----------
export const pathwaySchema = z
  .object({
    label: z.string().trim().min(1, 'give the pathway a label').max(100),
    // G‡ relative to any common reference (the same for every pathway), or H‡ and S‡.
    barrier: barrierSchema,
    diastereomer: z.string().trim().min(1).max(100).optional().meta({ description: 'Diastereomer group this product belongs to' }),
    enantiomer: z.enum(['A', 'B']).optional().meta({ description: 'Which enantiomer of its group; A counts positive in the group ee' }),
  })
  .meta({ id: 'Pathway' });

/** Largest pathways × temperatures product one distribution request may ask for. */
export const MAX_DISTRIBUTION_CELLS = 20_000;

export const distributionRequestSchema = z
  .object({
    pathways: z
      .array(pathwaySchema)
      .min(2, 'give at least two competing pathways')
      .max(MAX_PATHWAYS, `at most ${MAX_PATHWAYS} pathways`)
      .superRefine((pathways, ctx) => {
        const seen = new Set<string>();
        pathways.forEach((p, i) => {
          if (seen.has(p.label)) ctx.addIssue({ code: 'custom', path: [i, 'label'], message: `the label "${p.label}" is used twice` });
          seen.add(p.label);
        });
      }),
    temperatures: temperaturesSchema,
  })
  .superRefine((body, ctx) => {
    // Bound the response size: 50 pathways × 5000 temperatures would be ~15 MB of JSON.
    const temps = 'values' in body.temperatures ? body.temperatures.values.length : body.temperatures.count;
    if (temps * body.pathways.length > MAX_DISTRIBUTION_CELLS) {
      ctx.addIssue({
        code: 'custom',
        path: ['temperatures'],
        message: `pathways × temperatures must be at most ${MAX_DISTRIBUTION_CELLS} (got ${body.pathways.length} × ${temps})`,
      });
    }
  })
  .meta({ id: 'DistributionRequest' });
export type DistributionRequest = z.infer<typeof distributionRequestSchema>;

export const distributionResponseSchema = z
  .object({
    pathways: z.array(z.object({ label: z.string(), diastereomer: z.string().nullable(), enantiomer: z.enum(['A', 'B']).nullable() })),
    groups: z.array(z.string()),
    points: z.array(
      z.object({
        kelvin: z.number(),
        celsius: z.number(),
        /** Percent of each pathway's product, in the order of the top-level `pathways` list. */
        percents: z.array(z.number()),
        groups: z.array(z.object({ diastereomer: z.string(), percent: z.number(), eePercent: z.number() })),
        dr: z.number().nullable(),
      }),
    ),
    definitions: z.array(z.string()),
    assumptions: z.array(z.string()),
  })
  .meta({ id: 'DistributionResponse' });
export type DistributionResponse = z.infer<typeof distributionResponseSchema>;

// ---------- rate ----------
export const concentrationSchema = z
  .object({ value: finite('value').positive('must be greater than zero'), unit: z.enum(['mol/L']) })
  .meta({ id: 'Concentration', description: 'A concentration, e.g. { "value": 0.5, "unit": "mol/L" }' });

export const kineticSetupSchema = z
  .discriminatedUnion('order', [
    z.object({ order: z.literal('first') }),
    z.object({ order: z.literal('pseudo-first'), limiting: concentrationSchema, excess: concentrationSchema }),
    z.object({ order: z.literal('second'), initial: concentrationSchema }),
  ])
  .meta({
    id: 'KineticSetup',
    description:
      'first: k in s^-1. pseudo-first: A + B with B in excess, k = k2 in L/(mol*s) and k_obs = k2*[B]0. second: A + B at equal starting concentrations.',
  });

export const measuredRunSchema = z
  .object({ conversionPercent: percentOpen('conversionPercent'), time: durationSchema, temperature: temperatureSchema })
  .meta({ id: 'MeasuredRun', description: 'One run: X % conversion reached after a time at a temperature.' });

export const rateBasisSchema = z
  .discriminatedUnion('kind', [
    gibbsBarrierSchema,
    activationBarrierSchema,
    z.object({
      kind: z.literal('one-run'),
      run: measuredRunSchema,
      // The ΔH‡ the user assumes; the answer also shows times for −10 and +10 kJ/mol around it.
      assumedDH: energySchema,
    }),
    z.object({ kind: z.literal('two-runs'), runs: z.tuple([measuredRunSchema, measuredRunSchema]) }),
  ])
  .meta({
    id: 'RateBasis',
    description: 'A barrier (gibbs, activation), one measured run plus an assumed ΔH‡, or two runs at two temperatures.',
  });

export const rateRequestSchema = z
  .object({
    setup: kineticSetupSchema,
    basis: rateBasisSchema,
    targetConversionPercent: percentOpen('targetConversionPercent').default(95),
    temperatures: temperaturesSchema,
  })
  .meta({ id: 'RateRequest' });
export type RateRequest = z.infer<typeof rateRequestSchema>;
export type RateRequestInput = z.input<typeof rateRequestSchema>;

export const rateResponseSchema = z
  .object({
    order: z.enum(['first', 'pseudo-first', 'second']),
    kUnit: z.enum(['s^-1', 'L/(mol*s)']),
    targetConversionPercent: z.number(),
    activation: z.object({
      source: z.enum(['given', 'assumed', 'derived']),
      dH: energyOut,
      dS: entropyOut,
      ea: energyOut.extend({ kelvin: z.number() }),
    }),
    runs: z.array(z.object({ kelvin: z.number(), celsius: z.number(), k: z.number(), kObsPerS: z.number().nullable() })),
    points: z.array(
      z.object({
        kelvin: z.number(),
        celsius: z.number(),
        k: z.number(),
        kObsPerS: z.number().nullable(),
        halfLife: readableDurationSchema,
        timeToTarget: readableDurationSchema,
        dG: energyOut,
        ea: energyOut,
      }),
    ),
    sensitivity: z
      .object({
        note: z.string(),
        variants: z.array(
          z.object({
            dH: energyOut,
            points: z.array(z.object({ kelvin: z.number(), celsius: z.number(), timeToTarget: readableDurationSchema })).nullable(),
          }),
        ),
      })
      .nullable(),
    assumptions: z.array(z.string()),
    warnings: z.array(warningSchema),
    caution: z.string(),
  })
  .meta({ id: 'RateResponse' });
export type RateResponse = z.infer<typeof rateResponseSchema>;

// ---------- erosion ----------
export const erosionRequestSchema = z
  .object({
    // Barrier to racemization, or to epimerization A → B when equilibriumRatio is given.
    barrier: barrierSchema,
    initialEePercent: finite('initialEePercent').gt(0, 'must be above 0 %').max(100, 'must be at most 100 %'),
    hold: durationSchema.optional().meta({ description: 'How long the material is held (work-up, storage)' }),
    eeFloorPercent: finite('eeFloorPercent').gt(0, 'must be above 0 %').max(100, 'must be at most 100 %').optional(),
    equilibriumRatio: finite('equilibriumRatio')
      .positive('must be greater than zero')
      .optional()
      .meta({ description: 'Epimerization: K = [B]/[A] at equilibrium; leave out for racemization (K = 1)' }),
    temperatures: temperaturesSchema,
  })
  .meta({ id: 'ErosionRequest' });
export type ErosionRequest = z.infer<typeof erosionRequestSchema>;

export const erosionResponseSchema = z
  .object({
    model: z.enum(['racemization', 'epimerization']),
    equilibrium: z.object({ ratio: z.number(), excessPercent: z.number() }).nullable(),
    points: z.array(
      z.object({
        kelvin: z.number(),
        celsius: z.number(),
        dG: energyOut,
        kePerS: z.number(),
        kReversePerS: z.number(),
        kRacPerS: z.number().nullable(),
        kRelaxationPerS: z.number(),
        eeHalfLife: readableDurationSchema,
        eeAfterHoldPercent: z.number().nullable(),
        longestHold: readableDurationSchema.nullable(),
        floorStatus: z.enum(['above', 'already-below', 'never-reached']).nullable(),
      }),
    ),
    atropisomerClass: z.object({
      class: z.union([z.literal(1), z.literal(2), z.literal(3)]),
      kelvin: z.number(),
      dG: energyOut,
      eeHalfLife: readableDurationSchema,
      description: z.string(),
      definition: z.string(),
      source: z.string(),
    }),
    definitions: z.array(z.string()),
    assumptions: z.array(z.string()),
    warnings: z.array(warningSchema),
    caution: z.string(),
  })
  .meta({ id: 'ErosionResponse' });
export type ErosionResponse = z.infer<typeof erosionResponseSchema>;
