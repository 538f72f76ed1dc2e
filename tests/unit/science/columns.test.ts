import { describe, expect, it } from 'vitest';
import { float64Columns, int32Column } from '../../../api/science/columns';

describe('float64Columns and int32Column', () => {
  it('when many small columns are taken, then each starts zero-filled and none overlaps another', () => {
    const taken: (Float64Array | Int32Array)[] = [];
    // Enough to run through several 32 kB slabs.
    for (let k = 0; k < 400; k++) {
      const cols = k % 3 === 0 ? [int32Column(37 + k)] : float64Columns(50 + (k % 7), 3);
      for (const c of cols) {
        expect(c.every((v) => v === 0)).toBe(true);
        c.fill(taken.length + 1);
        taken.push(c);
      }
    }
    // Every column still holds what was written to it: no later piece was cut from the same bytes.
    taken.forEach((c, i) =>
      expect(
        c.every((v) => v === i + 1),
        `column ${i}`,
      ).toBe(true),
    );
  });

  it('when columns are large, then they get a buffer of their own', () => {
    const [a, b] = float64Columns(1000, 2);
    expect(a.length).toBe(1000);
    expect(a.buffer).toBe(b.buffer);
    expect(a.buffer.byteLength).toBe(16_000);
    expect(int32Column(5000).buffer.byteLength).toBe(20_000);
    expect(float64Columns(0, 2).map((c) => c.length)).toEqual([0, 0]);
  });
});
