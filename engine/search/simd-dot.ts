// Row dot products with WebAssembly SIMD (f32x4; the WebAssembly SIMD proposal,
// merged into the WebAssembly 2.0 specification). One small hand-assembled
// function, `dots(q, rows, n, k, out, dims)`: out[j] = sum_{c < dims} q[c] * rows[j*k + c]
// in Float32 with a 4-lane accumulator, k and dims multiples of 4. Rows must live in
// the module's memory, so matrices that want the fast path are allocated here
// (allocateRows); anything else uses the scalar loop in top-n.ts.
//
// Each row's sum is one dependency chain (lane c mod 4 accumulates in axis order, the
// lanes are added 0+1+2+3), so the kernel takes four rows per pass: four independent
// chains keep the adder busy while every row gets exactly the arithmetic of a
// one-row loop (the scores are bit-identical to it). A prefix of the axes (`dims`,
// hybrid search's first 100) reads only that part of each row.

// prettier-ignore
const DOTS_HEADER = new Uint8Array([
  0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
  // type section: (i32 i32 i32 i32 i32 i32) -> ()
  0x01, 0x0a, 0x01, 0x60, 0x06, 0x7f, 0x7f, 0x7f, 0x7f, 0x7f, 0x7f, 0x00,
  // import section: env.mem, memory, min 1 page
  0x02, 0x0c, 0x01, 0x03, 0x65, 0x6e, 0x76, 0x03, 0x6d, 0x65, 0x6d, 0x02, 0x00, 0x01,
  // function section
  0x03, 0x02, 0x01, 0x00,
  // export section: "dots" = func 0
  0x07, 0x08, 0x01, 0x04, 0x64, 0x6f, 0x74, 0x73, 0x00, 0x00,
]);

// Parameters and locals of `dots` (WebAssembly local indices): six i32 parameters,
// six i32 locals (axis byte offset, row and summed bytes, rows 1-3 of a pass), then
// the query lanes and four accumulators (v128).
const [Q, ROWS, N, K, OUT, DIMS] = [0, 1, 2, 3, 4, 5];
const [C, KB, DB, P1, P2, P3] = [6, 7, 8, 9, 10, 11];
const [QV, ACC0, ACC1, ACC2, ACC3] = [12, 13, 14, 15, 16];

// The few instructions the kernel uses (WebAssembly 2.0 binary opcodes).
const op = { add: 0x6a, sub: 0x6b, shl: 0x74, ltU: 0x49, eqz: 0x45, f32Add: 0x92, end: 0x0b };
const get = (i: number) => [0x20, i];
const set = (i: number) => [0x21, i];
const tee = (i: number) => [0x22, i];
const i32 = (v: number) => [0x41, v]; // small non-negative constants only (< 64)
const block = [0x02, 0x40];
const loop = [0x03, 0x40];
const br = (depth: number) => [0x0c, depth];
const brIf = (depth: number) => [0x0d, depth];
const v128Load = [0xfd, 0x00, 0x02, 0x00]; // align 4, offset 0
const v128Zero = [0xfd, 0x0c, ...new Array<number>(16).fill(0)];
const f32x4Mul = [0xfd, 0xe6, 0x01];
const f32x4Add = [0xfd, 0xe4, 0x01];
const lane = (l: number) => [0xfd, 0x1f, l]; // f32x4.extract_lane
const f32Store = (offset: number) => [0x38, 0x02, offset];

/** acc += qv * load(base + c) */
// prettier-ignore
const accumulate = (acc: number, base: number) => [
  ...get(acc), ...get(QV), ...get(base), ...get(C), op.add, ...v128Load, ...f32x4Mul, ...f32x4Add,
  ...set(acc),
];
/** f32.store at out + offset of ((lane 0 + lane 1) + lane 2) + lane 3 of acc. */
// prettier-ignore
const storeSum = (acc: number, offset: number) => [
  ...get(OUT),
  ...get(acc), ...lane(0), ...get(acc), ...lane(1), op.f32Add,
  ...get(acc), ...lane(2), op.f32Add, ...get(acc), ...lane(3), op.f32Add,
  ...f32Store(offset),
];
/** qv = load(q + c) */
const loadQuery = [...get(Q), ...get(C), op.add, ...v128Load, ...set(QV)];
/** c += 16, leaving c < db on the stack */
const nextAxes = [...get(C), ...i32(16), op.add, ...tee(C), ...get(DB), op.ltU];
const zero = (acc: number) => [...v128Zero, ...set(acc)];

// prettier-ignore
const DOTS_BODY = [
  0x02, 0x06, 0x7f, 0x05, 0x7b, // locals: 6 i32, 5 v128
  ...get(K), ...i32(2), op.shl, ...set(KB), // kb = k * 4 (bytes per row)
  ...get(DIMS), ...i32(2), op.shl, ...set(DB), // db = dims * 4 (bytes summed per row)
  ...block, // exit
  ...block, // to the single-row loop
  ...loop, // four rows per pass while n >= 4
  ...get(N), ...i32(4), op.ltU, ...brIf(1),
  ...zero(ACC0), ...zero(ACC1), ...zero(ACC2), ...zero(ACC3),
  ...get(ROWS), ...get(KB), op.add, ...set(P1),
  ...get(P1), ...get(KB), op.add, ...set(P2),
  ...get(P2), ...get(KB), op.add, ...set(P3),
  ...i32(0), ...set(C),
  ...loop, // axes, four at a time
  ...loadQuery,
  ...accumulate(ACC0, ROWS), ...accumulate(ACC1, P1), ...accumulate(ACC2, P2), ...accumulate(ACC3, P3),
  ...nextAxes, ...brIf(0),
  op.end,
  ...storeSum(ACC0, 0), ...storeSum(ACC1, 4), ...storeSum(ACC2, 8), ...storeSum(ACC3, 12),
  ...get(P3), ...get(KB), op.add, ...set(ROWS), // rows += 4 rows
  ...get(OUT), ...i32(16), op.add, ...set(OUT),
  ...get(N), ...i32(4), op.sub, ...set(N),
  ...br(0),
  op.end, // four-row loop
  op.end, // the last n < 4 rows, one at a time
  ...get(N), op.eqz, ...brIf(0),
  ...loop,
  ...zero(ACC0),
  ...i32(0), ...set(C),
  ...loop,
  ...loadQuery, ...accumulate(ACC0, ROWS),
  ...nextAxes, ...brIf(0),
  op.end,
  ...storeSum(ACC0, 0),
  ...get(ROWS), ...get(KB), op.add, ...set(ROWS),
  ...get(OUT), ...i32(4), op.add, ...set(OUT),
  ...get(N), ...i32(1), op.sub, ...tee(N),
  ...brIf(0),
  op.end, // single-row loop
  op.end, // exit
  op.end, // function
];

/** Unsigned LEB128, as WebAssembly encodes sizes. */
function leb128(value: number): number[] {
  const out: number[] = [];
  do {
    let byte = value & 0x7f;
    value >>>= 7;
    if (value !== 0) byte |= 0x80;
    out.push(byte);
  } while (value !== 0);
  return out;
}

const CODE_CONTENT = [0x01, ...leb128(DOTS_BODY.length), ...DOTS_BODY];
const DOTS_WASM = new Uint8Array([
  ...DOTS_HEADER,
  0x0a,
  ...leb128(CODE_CONTENT.length),
  ...CODE_CONTENT,
]);

const PAGE = 65536;
let module: WebAssembly.Module | null | undefined;

function dotsModule(): WebAssembly.Module | null {
  if (module === undefined) {
    try {
      module = WebAssembly.validate(DOTS_WASM) ? new WebAssembly.Module(DOTS_WASM) : null;
    } catch {
      module = null;
    }
  }
  return module;
}

interface Backing {
  dots: (q: number, rows: number, n: number, k: number, out: number, dims: number) => void;
  memory: WebAssembly.Memory;
  /** Byte offsets: query (k floats), rows, scores (capacity floats). */
  query: number;
  rows: number;
  scores: number;
  capacity: number;
  k: number;
}

const backings = new WeakMap<ArrayBufferLike, Backing>();

/**
 * A zeroed Float32Array of capacityRows x k, placed in WebAssembly memory when SIMD
 * is available and k is a multiple of 4 (else an ordinary Float32Array).
 */
export function allocateRows(capacityRows: number, k: number): Float32Array {
  const mod = dotsModule();
  if (!mod || k % 4 !== 0 || capacityRows === 0) return new Float32Array(capacityRows * k);
  const query = 0;
  const rows = Math.ceil((k * 4) / 16) * 16;
  const scores = rows + capacityRows * k * 4;
  const bytes = scores + capacityRows * 4;
  // wasm32 memory tops out at 4 GiB (V8 may allow less): very large matrices stay scalar.
  if (bytes > 2 ** 31) return new Float32Array(capacityRows * k);
  let memory: WebAssembly.Memory;
  try {
    memory = new WebAssembly.Memory({ initial: Math.ceil(bytes / PAGE) });
  } catch {
    return new Float32Array(capacityRows * k);
  }
  const instance = new WebAssembly.Instance(mod, { env: { mem: memory } });
  const view = new Float32Array(memory.buffer, rows, capacityRows * k);
  backings.set(memory.buffer, {
    dots: instance.exports.dots as Backing['dots'],
    memory,
    query,
    rows,
    scores,
    capacity: capacityRows,
    k,
  });
  return view;
}

/**
 * Dot products of `query` with the first `count` rows over their first `dims` axes
 * (default all), or null when `rows` was not allocated by allocateRows for this
 * stride. The result is a view valid until the next call.
 */
export function simdDots(
  rows: Float32Array,
  stride: number,
  count: number,
  query: ArrayLike<number>,
  dims = stride,
): Float32Array | null {
  const b = backings.get(rows.buffer);
  if (!b || b.k !== stride || rows.byteOffset !== b.rows || count > b.capacity) return null;
  // The kernel sums whole f32x4 lanes: round dims up, the query's extra axes zero.
  const summed = Math.max(4, Math.min(stride, Math.ceil(dims / 4) * 4));
  const q = new Float32Array(b.memory.buffer, b.query, stride);
  for (let c = 0; c < summed; c++) q[c] = c < dims ? query[c] : 0;
  b.dots(b.query, b.rows, count, stride, b.scores, summed);
  return new Float32Array(b.memory.buffer, b.scores, count);
}
