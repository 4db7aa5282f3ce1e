// A few WebAssembly binary-format helpers (WebAssembly Core Specification 2.0, chapter
// 5 "Binary format") for the engine's hand-written SIMD kernels: integer encodings,
// the instructions the kernels use, and a one-function module that imports its memory.
// Enough to keep the kernels readable as instruction lists instead of raw bytes.

/** Unsigned LEB128 (spec 5.2.2), as WebAssembly encodes sizes and indices. */
export function leb128(value: number): number[] {
  const out: number[] = [];
  do {
    let byte = value & 0x7f;
    value >>>= 7;
    if (value !== 0) byte |= 0x80;
    out.push(byte);
  } while (value !== 0);
  return out;
}

/** Signed LEB128, for i32.const immediates. */
export function sleb128(value: number): number[] {
  const out: number[] = [];
  for (;;) {
    const byte = value & 0x7f;
    value >>= 7;
    const done = (value === 0 && (byte & 0x40) === 0) || (value === -1 && (byte & 0x40) !== 0);
    out.push(done ? byte : byte | 0x80);
    if (done) return out;
  }
}

/** Memory argument: alignment as a power of two, then the static offset. */
const memarg = (alignLog2: number, offset: number) => [alignLog2, ...leb128(offset)];
const simd = (opcode: number) => [0xfd, ...leb128(opcode)];

/** The instructions the kernels use (spec 5.4), each returning its bytes. */
export const op = {
  block: () => [0x02, 0x40],
  loop: () => [0x03, 0x40],
  end: () => [0x0b],
  br: (depth: number) => [0x0c, ...leb128(depth)],
  brIf: (depth: number) => [0x0d, ...leb128(depth)],
  get: (local: number) => [0x20, ...leb128(local)],
  set: (local: number) => [0x21, ...leb128(local)],
  tee: (local: number) => [0x22, ...leb128(local)],
  i32Load: (offset = 0) => [0x28, ...memarg(2, offset)],
  f64Load: (offset = 0) => [0x2b, ...memarg(3, offset)],
  i32Const: (value: number) => [0x41, ...sleb128(value)],
  i32LtU: () => [0x49],
  i32GeU: () => [0x4f],
  i32Add: () => [0x6a],
  i32Sub: () => [0x6b],
  i32Mul: () => [0x6c],
  i32Shl: () => [0x74],
  v128Load: (offset = 0) => [...simd(0x00), ...memarg(4, offset)],
  v128Store: (offset = 0) => [...simd(0x0b), ...memarg(4, offset)],
  v128Zero: () => [...simd(0x0c), ...new Array<number>(16).fill(0)],
  f64x2Splat: () => simd(0x14),
  f64x2Add: () => simd(0xf0),
  f64x2Mul: () => simd(0xf2),
};

export const I32 = 0x7f;
export const V128 = 0x7b;

function name(text: string): number[] {
  return [text.length, ...Array.from(text, (c) => c.charCodeAt(0))];
}

function section(id: number, content: number[]): number[] {
  return [id, ...leb128(content.length), ...content];
}

/**
 * A module of one exported function `(i32 x params) -> ()` that imports `env.mem`, a
 * shared memory of up to 65,536 pages (4 GiB, the wasm32 limit) so that worker threads
 * can instantiate the same module over the same memory.
 */
export function singleFunctionModule(spec: {
  exportName: string;
  params: number;
  /** Extra locals as [count, type] runs, after the parameters. */
  locals: [number, number][];
  body: number[][];
}): Uint8Array<ArrayBuffer> {
  const type = [1, 0x60, ...leb128(spec.params), ...new Array<number>(spec.params).fill(I32), 0];
  const memoryImport = [1, ...name('env'), ...name('mem'), 0x02, 0x03, 1, ...leb128(65536)];
  const locals = [
    ...leb128(spec.locals.length),
    ...spec.locals.flatMap(([n, t]) => [...leb128(n), t]),
  ];
  const code = [...locals, ...spec.body.flat(), 0x0b];
  return new Uint8Array([
    ...[0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00],
    ...section(1, type),
    ...section(2, memoryImport),
    ...section(3, [1, 0]),
    ...section(7, [1, ...name(spec.exportName), 0x00, 0]),
    ...section(10, [1, ...leb128(code.length), ...code]),
  ]);
}
