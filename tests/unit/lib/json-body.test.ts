import { describe, expect, it } from 'vitest';
import { jsonBytes } from '../../../api/lib/json-body';

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
