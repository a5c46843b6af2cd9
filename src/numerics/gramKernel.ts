/**
 * The Gram matrix X Xᵀ of a row-major block, as a small WebAssembly module with 128-bit SIMD (two
 * doubles per instruction). On wide data (many more columns than rows) it was the largest part of a
 * logistic fit's time (rowSpace.ts; about 40% of a whole run on 240 × 5,000 in plain JavaScript), and
 * the SVM and LDA use it too.
 *
 * Why WebAssembly. In JavaScript every array access is bounds-checked and nothing is vectorized: the
 * best plain layout found (four rows against two, eight running sums) made about 2 · 10⁹ products a
 * second; measured on a 192 × 5,000 block, this module was 3.5 to 4 times as fast (the bench prints the
 * effect on whole runs). Only deterministic instructions are used (IEEE-754 additions and
 * multiplications, no fused multiply-add, no "relaxed" SIMD), so a given block gives the same bits on
 * every machine, thread and run.
 *
 * Sums. Each product x_i · x_k is summed as two running sums, one over the even columns and one over
 * the odd ones (the two SIMD lanes), added at the end: (x_i0 x_k0 + x_i2 x_k2 + …) + (x_i1 x_k1 + …).
 *
 * Layout. The rows are copied into the module's memory with the row length rounded up to an even number
 * of columns and the row count up to a multiple of four, the padding zero (a zero adds nothing to a
 * sum). The module takes four rows against two at a time, eight pairs of running sums in registers, so
 * that each value loaded serves four or two products.
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
} from "./wasm.js";

type Kernel = (rows: number, quads: number, rowBytes: number, out: number) => void;

const slot = new KernelSlot<Kernel>(kernelBytes, "gram");

/**
 * X Xᵀ of the `n × p` row-major block `x` into `out` (`n × n`, row-major, both triangles).
 * @throws FitError when the block does not fit in a WebAssembly memory (4 GiB).
 */
export function gramSimd(x: Float64Array, n: number, p: number, out: Float64Array): Float64Array {
  const width = p + (p % 2); // columns per padded row
  const height = n + ((4 - (n % 4)) % 4); // padded rows
  const rowsBytes = height * width * 8;
  const shared = slot.reserve(rowsBytes + height * height * 8, n, p);
  const doubles = new Float64Array(shared.memory.buffer);
  for (let i = 0; i < n; i++) {
    doubles.set(x.subarray(i * p, i * p + p), i * width);
    if (width > p) doubles[i * width + p] = 0;
  }
  doubles.fill(0, n * width, height * width);
  shared.kernel(0, height / 4, width * 8, rowsBytes);
  const result = doubles.subarray(rowsBytes / 8, rowsBytes / 8 + height * height);
  for (let r = 0; r < n; r++) {
    for (let c = 0; c <= r; c++) {
      const value = result[r * height + c];
      out[r * n + c] = value;
      out[c * n + r] = value;
    }
  }
  return out;
}

/**
 * The module: imports `env.memory` and exports `gram(rows, quads, rowBytes, out)` (byte offsets and
 * counts): for the `4 · quads` rows of `rowBytes` bytes at `rows`, writes the products of every pair
 * (i, k) with k < i + 4 − i mod 4 (the lower triangle and a few entries above it) to
 * `out + 8 (i · 4 quads + k)`.
 */
function kernelBytes(): Uint8Array {
  // Parameters 0–3, then the locals: i32 4–13, v128 14–24.
  const [rows, quads, rowBytes, out] = [0, 1, 2, 3];
  const [quad, pair, pairs, j, a0, a1, a2, a3, b0, b1] = [4, 5, 6, 7, 8, 9, 10, 11, 12, 13];
  const sums = Array.from({ length: 8 }, (_, n) => 14 + n); // sums[2r + c]: row a_r against row b_c
  const [v, w, xr] = [22, 23, 24]; // the pairs of b0, b1 and the a_r at hand
  const a = [a0, a1, a2, a3];
  const add = (local: number, amount: Bytes[]): Bytes[] => [
    op.localGet(local),
    ...amount,
    op.i32Add,
    op.localSet(local),
  ];
  // One step of two columns (16 bytes): load b0's and b1's pair, then each a_r's, multiply, add.
  const step: Bytes[] = [
    op.localGet(b0),
    op.localGet(j),
    op.i32Add,
    op.v128Load(0),
    op.localSet(v),
    op.localGet(b1),
    op.localGet(j),
    op.i32Add,
    op.v128Load(0),
    op.localSet(w),
    ...a.flatMap((row, r) => [
      op.localGet(row),
      op.localGet(j),
      op.i32Add,
      op.v128Load(0),
      op.localTee(xr),
      op.localGet(v),
      op.f64x2Mul,
      op.localGet(sums[2 * r]),
      op.f64x2Add,
      op.localSet(sums[2 * r]),
      op.localGet(xr),
      op.localGet(w),
      op.f64x2Mul,
      op.localGet(sums[2 * r + 1]),
      op.f64x2Add,
      op.localSet(sums[2 * r + 1]),
    ]),
  ];
  // out + 8 ((4 quad + r) · 4 quads + 2 pair + c) for each of the eight sums: lane 0 + lane 1.
  const stores: Bytes[] = sums.flatMap((sum, n) => {
    const r = n >> 1;
    const c = n & 1;
    return [
      op.localGet(out),
      op.localGet(quad),
      op.i32Const(4),
      op.i32Mul,
      op.i32Const(r),
      op.i32Add,
      op.localGet(quads),
      op.i32Const(4),
      op.i32Mul,
      op.i32Mul,
      op.localGet(pair),
      op.i32Const(2),
      op.i32Mul,
      op.i32Add,
      op.i32Const(c),
      op.i32Add,
      op.i32Const(8),
      op.i32Mul,
      op.i32Add,
      op.localGet(sum),
      op.f64x2ExtractLane(0),
      op.localGet(sum),
      op.f64x2ExtractLane(1),
      op.f64Add,
      op.f64Store(0),
    ];
  });
  const zero: Bytes[] = [op.f64Const(0), op.f64x2Splat];
  const body: Bytes[] = [
    ...forLoop(quad, quads, [
      // a0 = rows + 4 quad · rowBytes, a_{r+1} = a_r + rowBytes
      op.localGet(rows),
      op.localGet(quad),
      op.i32Const(4),
      op.i32Mul,
      op.localGet(rowBytes),
      op.i32Mul,
      op.i32Add,
      op.localSet(a0),
      ...[a1, a2, a3].flatMap((row, r) => [op.localGet(a[r]), op.localGet(rowBytes), op.i32Add, op.localSet(row)]),
      // pairs of rows k = 0, 2, …, 4 quad + 2
      op.localGet(quad),
      op.i32Const(2),
      op.i32Mul,
      op.i32Const(2),
      op.i32Add,
      op.localSet(pairs),
      ...forLoop(pair, pairs, [
        op.localGet(rows),
        op.localGet(pair),
        op.i32Const(2),
        op.i32Mul,
        op.localGet(rowBytes),
        op.i32Mul,
        op.i32Add,
        op.localTee(b0),
        op.localGet(rowBytes),
        op.i32Add,
        op.localSet(b1),
        ...sums.flatMap((sum) => [...zero, op.localSet(sum)]),
        // for (j = 0; j < rowBytes; j += 16) step
        op.i32Const(0),
        op.localSet(j),
        op.block,
        op.loop,
        op.localGet(j),
        op.localGet(rowBytes),
        op.i32LtU,
        op.i32Eqz,
        op.brIf(1),
        ...step,
        ...add(j, [op.i32Const(16)]),
        op.br(0),
        op.end,
        op.end,
        ...stores,
      ]),
    ]),
  ];
  const gramType = [0x60, ...vector(Array.from({ length: 4 }, () => [i32])), ...vector([])];
  const locals = vector([
    [...unsignedLeb(10), i32],
    [...unsignedLeb(11), v128],
  ]);
  const code = [...locals, ...body.flat(), ...op.end];
  return moduleBytes([gramType], [memoryImport], 0, "gram", code);
}
