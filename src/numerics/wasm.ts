/**
 * A minimal WebAssembly binary writer: LEB128 numbers, sections, and the instructions the hand-written
 * kernels use (src/learners/softmaxKernel.ts, src/numerics/gramKernel.ts). The binary format follows the
 * WebAssembly Core Specification 2.0, chapter 5 ("Binary Format"); the SIMD opcodes its section 5.4.8.
 *
 * Written by hand because the kernels are a few hundred instructions, assembled once per thread at
 * run time: a WebAssembly toolchain (an assembler package or a compiler) would be a build step and a
 * dependency for that, and the modules would then ship as opaque binaries.
 */

/** Bytes of one WebAssembly memory page. */
export const pageBytes = 65536;

/** The parts of the WebAssembly JavaScript interface used here (the TypeScript library in use lacks them). */
export interface WebAssemblyApi {
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => { exports: Record<string, unknown> };
  Memory: new (descriptor: { initial: number }) => { buffer: ArrayBuffer; grow(pages: number): number };
}
/** The global WebAssembly object, typed by {@link WebAssemblyApi}. */
export const WebAssembly: WebAssemblyApi = (globalThis as unknown as { WebAssembly: WebAssemblyApi }).WebAssembly;

export type Bytes = number[];

export function unsignedLeb(value: number): Bytes {
  const out: Bytes = [];
  do {
    let byte = value & 0x7f;
    value >>>= 7;
    if (value !== 0) byte |= 0x80;
    out.push(byte);
  } while (value !== 0);
  return out;
}

export function signedLeb(value: number): Bytes {
  const out: Bytes = [];
  for (;;) {
    const byte = value & 0x7f;
    value >>= 7;
    if ((value === 0 && (byte & 0x40) === 0) || (value === -1 && (byte & 0x40) !== 0)) {
      out.push(byte);
      return out;
    }
    out.push(byte | 0x80);
  }
}

/** The eight bytes of a double, least significant first, as WebAssembly stores constants. */
function littleEndianDouble(value: number): Bytes {
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, value, true);
  return Array.from(new Uint8Array(view.buffer));
}

export const name = (text: string): Bytes => [...unsignedLeb(text.length), ...Array.from(text, (c) => c.charCodeAt(0))];
export const vector = (items: Bytes[]): Bytes => [...unsignedLeb(items.length), ...items.flat()];
export const section = (id: number, body: Bytes): Bytes => [id, ...unsignedLeb(body.length), ...body];
export const simd = (code: number): Bytes => [0xfd, ...unsignedLeb(code)];

export const i32 = 0x7f;
export const f64 = 0x7c;
export const v128 = 0x7b;

/** The instructions used, by their names in the specification's text format. */
export const op = {
  localGet: (index: number): Bytes => [0x20, ...unsignedLeb(index)],
  localSet: (index: number): Bytes => [0x21, ...unsignedLeb(index)],
  localTee: (index: number): Bytes => [0x22, ...unsignedLeb(index)],
  i32Const: (value: number): Bytes => [0x41, ...signedLeb(value)],
  i64Const: (value: number): Bytes => [0x42, ...signedLeb(value)],
  f64Const: (value: number): Bytes => [0x44, ...littleEndianDouble(value)],
  i32Add: [0x6a],
  i32Mul: [0x6c],
  i32Sub: [0x6b],
  i32LtU: [0x49],
  i32Eqz: [0x45],
  f64Add: [0xa0],
  f64Sub: [0xa1],
  i32Load: (offset: number): Bytes => [0x28, 2, ...unsignedLeb(offset)],
  f64Load: (offset: number): Bytes => [0x2b, 3, ...unsignedLeb(offset)],
  f64Store: (offset: number): Bytes => [0x39, 3, ...unsignedLeb(offset)],
  v128Load: (offset: number): Bytes => [...simd(0x00), 4, ...unsignedLeb(offset)],
  v128Store: (offset: number): Bytes => [...simd(0x0b), 4, ...unsignedLeb(offset)],
  i64x2Splat: simd(0x12),
  f64x2Splat: simd(0x14),
  f64x2ExtractLane: (lane: number): Bytes => [...simd(0x21), lane],
  f64x2Nearest: simd(0x94),
  i64x2ExtendLowI32x4S: simd(0xc7),
  i64x2Shl: simd(0xcb),
  i64x2Add: simd(0xce),
  f64x2Add: simd(0xf0),
  f64x2Sub: simd(0xf1),
  f64x2Mul: simd(0xf2),
  f64x2Div: simd(0xf3),
  f64x2Max: simd(0xf5),
  f64x2Pmax: simd(0xf7),
  i32x4TruncSatF64x2SZero: simd(0xfc),
  block: [0x02, 0x40],
  loop: [0x03, 0x40],
  if: [0x04, 0x40],
  else: [0x05],
  end: [0x0b],
  br: (depth: number): Bytes => [0x0c, ...unsignedLeb(depth)],
  brIf: (depth: number): Bytes => [0x0d, ...unsignedLeb(depth)],
  call: (index: number): Bytes => [0x10, ...unsignedLeb(index)],
};

/** `for (counter = 0; counter < limit; counter++) body`, both locals (i32, compared unsigned). */
export function forLoop(counter: number, limit: number, body: Bytes[]): Bytes[] {
  return [
    op.i32Const(0),
    op.localSet(counter),
    op.block,
    op.loop,
    op.localGet(counter),
    op.localGet(limit),
    op.i32LtU,
    op.i32Eqz,
    op.brIf(1),
    ...body,
    op.localGet(counter),
    op.i32Const(1),
    op.i32Add,
    op.localSet(counter),
    op.br(0),
    op.end,
    op.end,
  ];
}

/** `f64x2.splat(value)`. */
export const splat = (value: number): Bytes[] => [op.f64Const(value), op.f64x2Splat];
