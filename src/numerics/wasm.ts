/**
 * A minimal WebAssembly binary writer: LEB128 numbers, sections, and the instructions the hand-written
 * kernels use (src/learners/softmaxKernel.ts, src/numerics/gramKernel.ts). The binary format follows the
 * WebAssembly Core Specification 2.0, chapter 5 ("Binary Format"); the SIMD opcodes its section 5.4.8.
 *
 * Written by hand because the kernels are a few hundred instructions, assembled once per thread at
 * run time: a WebAssembly toolchain (an assembler package or a compiler) would be a build step and a
 * dependency for that, and the modules would then ship as opaque binaries.
 */

import { FitError } from "../errors.js";
import { message } from "../messages.js";

/** Bytes of one WebAssembly memory page. */
export const pageBytes = 65536;

/** The parts of the WebAssembly JavaScript interface used here (the TypeScript library in use lacks them). */
interface WebAssemblyApi {
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => { exports: Record<string, unknown> };
  Memory: new (descriptor: { initial: number }) => { buffer: ArrayBuffer; grow(pages: number): number };
}
/** The global WebAssembly object, typed by {@link WebAssemblyApi}. */
const WebAssembly: WebAssemblyApi = (globalThis as unknown as { WebAssembly: WebAssemblyApi }).WebAssembly;

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

/** A kernel's linear memory, as the WebAssembly interface gives it. */
export type KernelMemory = { buffer: ArrayBuffer; grow(pages: number): number };

/** A compiled kernel: its exported function, the memory it reads and writes, and whose data that holds. */
export interface CompiledKernel<F> {
  kernel: F;
  memory: KernelMemory;
  /** The object whose data the memory holds, for a kernel whose callers take turns (softmaxKernel.ts). */
  owner?: unknown;
}

/** Every kernel slot of this thread, for {@link releaseKernelMemory}. */
const slots: { release(): void }[] = [];

/**
 * One kernel of this thread: compiled on first use with a new memory of one page, which grows as
 * callers reserve room and is kept between calls until {@link releaseKernelMemory}. The module must
 * import `env.memory`, and any other `env` entries given.
 */
export class KernelSlot<F> {
  private compiled: CompiledKernel<F> | undefined;

  constructor(
    private readonly bytes: () => Uint8Array,
    private readonly exportName: string,
    private readonly env: object = {},
  ) {
    slots.push(this);
  }

  /** The kernel, compiled if need be. */
  get(): CompiledKernel<F> {
    if (this.compiled === undefined) {
      const memory = new WebAssembly.Memory({ initial: 1 });
      const module = new WebAssembly.Module(this.bytes());
      const exports = new WebAssembly.Instance(module, { env: { ...this.env, memory } }).exports;
      this.compiled = { kernel: exports[this.exportName] as F, memory };
    }
    return this.compiled;
  }

  /**
   * The kernel, its memory grown to hold at least `bytes` bytes (views of the old buffer are then stale).
   * @throws FitError when that is past a WebAssembly memory's 4 GiB, naming the `rows × columns` it was for.
   */
  reserve(bytes: number, rows: number, columns: number): CompiledKernel<F> {
    const compiled = this.get();
    if (bytes > 65536 * pageBytes) throw new FitError(message.tooLargeForKernel(rows, columns));
    const needed = Math.ceil(bytes / pageBytes) - compiled.memory.buffer.byteLength / pageBytes;
    if (needed > 0) compiled.memory.grow(needed);
    return compiled;
  }

  /** Drops the kernel and its memory; the next use compiles it again. */
  release(): void {
    this.compiled = undefined;
  }
}

/** Lets every kernel memory of this thread (each as large as the largest data since) be collected. */
export function releaseKernelMemory(): void {
  for (const slot of slots) slot.release();
}

/**
 * A module's bytes: its function types, its imports (`env.memory` first), one function of type
 * `typeIndex` exported as `exportName`, and that function's code (locals, then instructions).
 */
export function moduleBytes(
  types: Bytes[],
  imports: Bytes[],
  typeIndex: number,
  exportName: string,
  code: Bytes,
): Uint8Array {
  const functionIndex = imports.length - 1; // imported functions come first; the memory is not one
  return new Uint8Array([
    ...[0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00],
    ...section(1, vector(types)),
    ...section(2, vector(imports)),
    ...section(3, vector([[typeIndex]])),
    ...section(7, vector([[...name(exportName), 0x00, functionIndex]])),
    ...section(10, vector([[...unsignedLeb(code.length), ...code]])),
  ]);
}

/** The import of `env.memory`, of at least one page. */
export const memoryImport: Bytes = [...name("env"), ...name("memory"), 0x02, 0x00, 0x01];
