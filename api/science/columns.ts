/** A tuple of `N` Float64Arrays. */
export type Float64Columns<N extends number, Acc extends Float64Array[] = []> = Acc['length'] extends N
  ? Acc
  : Float64Columns<N, [...Acc, Float64Array]>;

/**
 * `count` zero-filled columns of `length` numbers each, as views on one buffer. A typed array over
 * 64 bytes keeps its numbers outside V8's heap, and each such allocation costs about 1 µs (a plain
 * array of 50 numbers: 0.1 µs) plus bookkeeping at every garbage collection: a fit of 50 runs made
 * about twenty of them. One buffer per group of columns pays that once; a view costs about 0.2 µs.
 * The columns share the buffer's lifetime, so group only columns that live and die together.
 */
export function float64Columns<N extends number>(length: number, count: N): Float64Columns<N> {
  const buffer = new Float64Array(length * count);
  const columns: Float64Array[] = [];
  for (let k = 0; k < count; k++) columns.push(buffer.subarray(k * length, (k + 1) * length));
  return columns as Float64Columns<N>;
}
