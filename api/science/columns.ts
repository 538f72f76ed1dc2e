/** A tuple of `N` Float64Arrays. */
export type Float64Columns<N extends number, Acc extends Float64Array[] = []> = Acc['length'] extends N
  ? Acc
  : Float64Columns<N, [...Acc, Float64Array]>;

/**
 * Small typed arrays are cut from shared slabs. A typed array over 64 bytes keeps its numbers
 * outside V8's heap, and each such buffer costs about 0.7 µs to allocate (a view on an existing
 * buffer: about 0.1 µs) plus bookkeeping at every garbage collection; a fit of 50 runs with its
 * curvature check needed about ten. A slab is handed out front to back and never reused, so every
 * piece starts zero-filled, as a new typed array does; it is freed when no piece of it is
 * referenced any more. A piece kept for long keeps its whole slab (32 kB at most) alive, so large
 * arrays get buffers of their own.
 */
const SLAB_BYTES = 32 * 1024;
const LARGEST_PIECE_BYTES = 4 * 1024;
let slab = new ArrayBuffer(SLAB_BYTES);
let slabUsed = 0;

/** Offset of `bytes` zero-filled bytes in the current slab (8-byte aligned), or −1 when they go in a buffer of their own. */
function slabPiece(bytes: number): number {
  if (bytes > LARGEST_PIECE_BYTES) return -1;
  const rounded = (bytes + 7) & ~7;
  if (slabUsed + rounded > SLAB_BYTES) {
    slab = new ArrayBuffer(SLAB_BYTES);
    slabUsed = 0;
  }
  const offset = slabUsed;
  slabUsed += rounded;
  return offset;
}

/**
 * `count` zero-filled columns of `length` numbers each, on one buffer. The columns share the
 * buffer's lifetime, so group only columns that live and die together.
 */
export function float64Columns<N extends number>(length: number, count: N): Float64Columns<N> {
  const offset = slabPiece(8 * length * count);
  const buffer = offset < 0 ? new ArrayBuffer(8 * length * count) : slab;
  const start = offset < 0 ? 0 : offset;
  const columns: Float64Array[] = [];
  for (let k = 0; k < count; k++) columns.push(new Float64Array(buffer, start + 8 * k * length, length));
  return columns as Float64Columns<N>;
}

/** A zero-filled Int32Array of `length`, from a slab when small. */
export function int32Column(length: number): Int32Array {
  const offset = slabPiece(4 * length);
  return offset < 0 ? new Int32Array(length) : new Int32Array(slab, offset, length);
}
