/**
 * Squared Euclidean distances from eight query rows at once to every training row, as a small
 * WebAssembly module with 128-bit SIMD, for the k-nearest-neighbor search (neighbors.ts).
 *
 * Each SIMD lane holds one query's running sum, so every distance is summed exactly as the plain
 * search sums it: d = 0, then d += (q_j − t_j)² for j = 0, 1, … in order. The module therefore finds
 * the same distances to the last bit, and the search the same neighbors, as without it. Only
 * deterministic instructions are used (IEEE-754 subtractions, multiplications and additions, no fused
 * multiply-add).
 *
 * Why WebAssembly. The distances are nearly all of a k-NN run's time; in JavaScript every array access
 * is bounds-checked and nothing is vectorized (neighbors.ts gives the measured speed-up).
 *
 * Layout. The training rows are copied as they are (row-major). A group's eight query rows are copied
 * interleaved: for each column, the eight queries' values side by side (64 bytes), a missing query of
 * the last group padded with zeros. For training row t the module writes the eight distances to
 * `out + 64 t`.
 */
import {
  KernelSlot,
  forLoop,
  i32,
  memoryImport,
  moduleBytes,
  op,
  unsignedLeb,
  v128,
  vector,
  type Bytes,
  type CompiledKernel,
} from "../numerics/wasm.js";

/** Query rows per call of the module. */
export const queriesPerGroup = 8;

type Kernel = (training: number, trainingRows: number, columns: number, queries: number, out: number) => void;

const slot = new KernelSlot<Kernel>(kernelBytes, "distances");

/**
 * The training rows, copied once into the module's memory, against which groups of eight queries are
 * measured. Valid until another DistanceTable is made on the same thread.
 */
export class DistanceTable {
  private readonly shared: CompiledKernel<Kernel>;
  private readonly queriesAt: number;
  private readonly outAt: number;

  /**
   * @param training row-major `trainingRows × columns`
   * @throws FitError when the rows do not fit in a WebAssembly memory (4 GiB).
   */
  constructor(
    training: Float64Array,
    private readonly trainingRows: number,
    private readonly columns: number,
  ) {
    this.queriesAt = trainingRows * columns * 8;
    this.outAt = this.queriesAt + queriesPerGroup * columns * 8;
    this.shared = slot.reserve(this.outAt + trainingRows * queriesPerGroup * 8, trainingRows, columns);
    new Float64Array(this.shared.memory.buffer).set(training.subarray(0, trainingRows * columns), 0);
  }

  /**
   * The squared distances from query rows `first` … `first + count − 1` (count ≤ 8) of the row-major
   * `queries` to every training row: entry `8 t + g` of the returned view is query `first + g` against
   * training row t. The view is overwritten by the next call.
   */
  distances(queries: Float64Array, first: number, count: number): Float64Array {
    const { columns, trainingRows, queriesAt, outAt } = this;
    const doubles = new Float64Array(this.shared.memory.buffer);
    const group = doubles.subarray(queriesAt / 8, queriesAt / 8 + queriesPerGroup * columns);
    if (count < queriesPerGroup) group.fill(0);
    for (let g = 0; g < count; g++) {
      const row = (first + g) * columns;
      for (let j = 0; j < columns; j++) group[j * queriesPerGroup + g] = queries[row + j];
    }
    this.shared.kernel(0, trainingRows, columns, queriesAt, outAt);
    return doubles.subarray(outAt / 8, outAt / 8 + trainingRows * queriesPerGroup);
  }
}

/**
 * The module: imports `env.memory` and exports `distances(training, trainingRows, columns, queries,
 * out)` (byte offsets and counts), as described in the file comment.
 */
function kernelBytes(): Uint8Array {
  // Parameters 0–4, then the locals: i32 5–8, v128 9–13.
  const [training, trainingRows, columns, queries, out] = [0, 1, 2, 3, 4];
  const [t, j, row, query] = [5, 6, 7, 8];
  const sums = [9, 10, 11, 12]; // queries 0–1, 2–3, 4–5, 6–7
  const value = 13; // the training value, in both lanes
  const step: Bytes[] = [
    op.localGet(row),
    op.f64Load(0),
    op.f64x2Splat,
    op.localSet(value),
    ...sums.flatMap((sum, n) => [
      op.localGet(sum),
      op.localGet(query),
      op.v128Load(16 * n),
      op.localGet(value),
      op.f64x2Sub,
      op.localTee(14),
      op.localGet(14),
      op.f64x2Mul,
      op.f64x2Add,
      op.localSet(sum),
    ]),
    // next column
    op.localGet(row),
    op.i32Const(8),
    op.i32Add,
    op.localSet(row),
    op.localGet(query),
    op.i32Const(64),
    op.i32Add,
    op.localSet(query),
  ];
  const body: Bytes[] = [
    op.localGet(training),
    op.localSet(row),
    ...forLoop(t, trainingRows, [
      ...sums.flatMap((sum) => [op.f64Const(0), op.f64x2Splat, op.localSet(sum)]),
      op.localGet(queries),
      op.localSet(query),
      ...forLoop(j, columns, step),
      // out + 64 t + 16 n ← sums[n]
      ...sums.flatMap((sum, n) => [
        op.localGet(out),
        op.localGet(t),
        op.i32Const(64),
        op.i32Mul,
        op.i32Add,
        op.localGet(sum),
        op.v128Store(16 * n),
      ]),
    ]),
  ];
  const distancesType = [0x60, ...vector(Array.from({ length: 5 }, () => [i32])), ...vector([])];
  const locals = vector([
    [...unsignedLeb(4), i32],
    [...unsignedLeb(6), v128],
  ]);
  const code = [...locals, ...body.flat(), ...op.end];
  return moduleBytes([distancesType], [memoryImport], 0, "distances", code);
}
