import type { Response } from 'express';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { jsonBytes, memberWriters, sendComputed } from '../../../api/lib/json-body';

const same = (body: unknown) => expect(jsonBytes(body).equals(Buffer.from(JSON.stringify(body) ?? 'null', 'utf8'))).toBe(true);

describe('jsonBytes', () => {
  it('when an answer mixes numbers and text outside Latin-1, then its bytes are those of JSON.stringify', () => {
    same({
      caution: 'Verify experimentally — ΔΔG‡ ≥ 0; T − 20 °C',
      predictions: Array.from({ length: 50 }, (_, i) => ({
        kelvin: 200 + i / 3,
        ratio: i === 3 ? null : Math.exp(i / 7),
        flags: ['outlier'],
      })),
      note: 'χ²/dof = 1.2 ± 0.1',
    });
  });

  it('when members are undefined, functions or nested toJSON, then they are left out or converted as JSON does', () => {
    same({ a: undefined, b: () => 1, c: new Date(0), d: { toJSON: () => 'x' }, e: [undefined, 1], 'quote"key': 'π' });
    same({ only: undefined });
    same({});
  });

  it('when the body is not a plain object, then it is serialised whole', () => {
    same([1, 'Δ', null]);
    same(null);
    same('text −');
    same(3.5);
    same(new Date(0));
  });
});

describe('memberWriters and sendComputed', () => {
  const schema = z.object({
    n: z.number().int(),
    caution: z.string(),
    points: z.array(z.object({ kelvin: z.number(), ratio: z.number().nullable(), pair: z.tuple([z.number(), z.number().nullable()]) })),
    note: z.string().optional(),
  });
  const answer = {
    n: 2,
    caution: 'Verify — ΔΔG‡ ≥ 0',
    points: [
      { kelvin: 253.15, ratio: 0.1 + 0.2, pair: [1e-300, null] },
      { kelvin: 300, ratio: null, pair: [-0, 5e21] },
    ],
  };
  const sent = (body: unknown, writers = memberWriters(schema)) => {
    let out: Buffer | null = null;
    const res = { setHeader: () => undefined, end: (bytes: Buffer) => void (out = bytes) } as unknown as Response;
    sendComputed(res, body, writers);
    return out!;
  };

  it('when a compiled writer serialises an answer, then it parses to what JSON.stringify says, members one-byte where they can be', () => {
    const writers = memberWriters(schema)();
    expect([...writers.keys()]).toEqual(['n', 'caution', 'points', 'note']);
    expect(JSON.parse(writers.get('points')!(answer.points))).toEqual(JSON.parse(JSON.stringify(answer.points)));
    expect(JSON.parse(sent(answer).toString('utf8'))).toEqual(JSON.parse(JSON.stringify(answer)));
  });

  it('when the answer carries a member or a null the schema does not declare, then the check under test fails loudly', () => {
    // The compiled code would drop the property and write 0 for the null; the check says where.
    expect(() => sent({ ...answer, points: [{ ...answer.points[0], extra: 1 }] })).toThrow(/points\/0\/extra/);
    expect(() => sent({ ...answer, n: null })).toThrow(/at \/n/);
  });
});
