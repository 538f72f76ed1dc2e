import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { undeclaredField } from '../../../api/lib/response-check';
import { fitResponseSchema } from '../../../api/features/calculators/schemas';
import { runFit } from '../../../api/features/calculators/fit';
import { fitRequestSchema } from '../../../api/features/calculators/schemas';

const schema = z.object({
  n: z.number(),
  band: z.object({ lo: z.number() }).nullable(),
  points: z.array(z.object({ kelvin: z.number(), pair: z.tuple([z.number(), z.object({ x: z.number() })]) })),
  branch: z.discriminatedUnion('kind', [z.object({ kind: z.literal('one') }), z.object({ kind: z.literal('two'), at: z.number() })]),
  byName: z.record(z.string(), z.object({ v: z.number() })),
  note: z.string().optional(),
});
const answer = {
  n: 1,
  band: null,
  points: [{ kelvin: 200, pair: [1, { x: 2 }] }],
  branch: { kind: 'two', at: 3 },
  byName: { a: { v: 1 } },
};

describe('undeclaredField', () => {
  it('when every field is declared, then nothing is reported (nullable, tuples, unions, records, optional left out)', () => {
    expect(undeclaredField(schema, answer)).toBeNull();
    expect(undeclaredField(schema, { ...answer, band: { lo: 1 }, note: 'x', extra: undefined })).toBeNull();
  });

  it('when a field is not in the schema, at any depth, then its path is reported', () => {
    expect(undeclaredField(schema, { ...answer, extra: 1 })).toBe('/extra');
    expect(undeclaredField(schema, { ...answer, band: { lo: 1, hi: 2 } })).toBe('/band/hi');
    expect(undeclaredField(schema, { ...answer, points: [answer.points[0], { kelvin: 1, pair: [1, { x: 1, y: 2 }] }] })).toBe(
      '/points/1/pair/1/y',
    );
    expect(undeclaredField(schema, { ...answer, branch: { kind: 'two', at: 1, other: 2 } })).toBe('/branch/other');
    expect(undeclaredField(schema, { ...answer, branch: { kind: 'one', at: 1 } })).toBe('/branch/at');
    expect(undeclaredField(schema, { ...answer, byName: { a: { v: 1, w: 2 } } })).toBe('/byName/a/w');
  });

  it("when a fit's answer is checked against the fit's response schema, then every field is declared", () => {
    const req = fitRequestSchema.parse({
      measurements: [-60, -40, -20, 0].map((c, i) => ({
        temperature: { value: c, unit: 'C' },
        selectivity: { measure: 'ee', value: 97 - 2 * i },
      })),
      predict: [{ value: -70, unit: 'C' }],
    });
    expect(undeclaredField(fitResponseSchema, runFit(req))).toBeNull();
  });
});
