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
import { leb128 } from '../linalg/wasm-assembler';

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

const CODE_CONTENT = [0x01, ...leb128(DOTS_BODY.length), ...DOTS_BODY];
export const DOTS_WASM = new Uint8Array([
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

/**
 * Exact dot products (the same kernel, so the same bits as simdDots) of `query` with
 * the listed rows only, or null when `rows` was not allocated by allocateRows. The
 * result (one per listed row, in order) is a view valid until the next call.
 */
export function simdDotsAt(
  rows: Float32Array,
  stride: number,
  indices: Int32Array,
  count: number,
  query: ArrayLike<number>,
  dims = stride,
): Float32Array | null {
  const b = backings.get(rows.buffer);
  if (!b || b.k !== stride || rows.byteOffset !== b.rows || count > b.capacity) return null;
  const summed = Math.max(4, Math.min(stride, Math.ceil(dims / 4) * 4));
  const q = new Float32Array(b.memory.buffer, b.query, stride);
  for (let c = 0; c < summed; c++) q[c] = c < dims ? query[c] : 0;
  const rowBytes = stride * 4;
  for (let i = 0; i < count; i++)
    b.dots(b.query, b.rows + indices[i] * rowBytes, 1, stride, b.scores + i * 4, summed);
  return new Float32Array(b.memory.buffer, b.scores, count);
}

// An int8 copy of unit-normalised rows for a cheap first pass (a quarter of the
// memory traffic of Float32; the document and term matrices of a large matter do not
// fit in cache, so the pass is bound by memory bandwidth). `dots8(q, rows, n, d, out)`:
// out[j] = sum_{c < d} q[c] * rows[j*d + c] in exact int32 arithmetic, q int16, rows
// int8, d a multiple of 8 (v128.load8x8_s widens eight int8 to int16 lanes;
// i32x4.dot_i16x8_s multiplies and adds pairs; WebAssembly 2.0 SIMD).

// prettier-ignore
const DOTS8_HEADER = new Uint8Array([
  0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
  // type section: (i32 i32 i32 i32 i32) -> ()
  0x01, 0x09, 0x01, 0x60, 0x05, 0x7f, 0x7f, 0x7f, 0x7f, 0x7f, 0x00,
  // import section: env.mem, memory, min 1 page
  0x02, 0x0c, 0x01, 0x03, 0x65, 0x6e, 0x76, 0x03, 0x6d, 0x65, 0x6d, 0x02, 0x00, 0x01,
  // function section
  0x03, 0x02, 0x01, 0x00,
  // export section: "dots8" = func 0
  0x07, 0x09, 0x01, 0x05, 0x64, 0x6f, 0x74, 0x73, 0x38, 0x00, 0x00,
]);

const [Q8, ROWS8, N8, D8, OUT8] = [0, 1, 2, 3, 4];
const [C8, ACC8] = [5, 6];
const load8x8s = [0xfd, 0x01, 0x00, 0x00]; // v128.load8x8_s, align 1, offset 0
const i32x4Dot = [0xfd, 0xba, 0x01]; // i32x4.dot_i16x8_s
const i32x4Add = [0xfd, 0xae, 0x01];
const i32Lane = (l: number) => [0xfd, 0x1b, l]; // i32x4.extract_lane
const i32Store = [0x36, 0x02, 0x00];

// prettier-ignore
const DOTS8_BODY = [
  0x02, 0x01, 0x7f, 0x01, 0x7b, // locals: c i32, acc v128
  ...block,
  ...get(N8), op.eqz, ...brIf(0),
  ...loop, // rows
  ...v128Zero, ...set(ACC8),
  ...i32(0), ...set(C8),
  ...loop, // eight axes at a time: acc += dot(widen(rows[c..c+8]), q[c..c+8])
  ...get(ACC8),
  ...get(ROWS8), ...get(C8), op.add, ...load8x8s,
  ...get(Q8), ...get(C8), ...get(C8), op.add, op.add, ...v128Load,
  ...i32x4Dot, ...i32x4Add, ...set(ACC8),
  ...get(C8), ...i32(8), op.add, ...tee(C8), ...get(D8), op.ltU, ...brIf(0),
  op.end,
  ...get(OUT8),
  ...get(ACC8), ...i32Lane(0), ...get(ACC8), ...i32Lane(1), op.add,
  ...get(ACC8), ...i32Lane(2), op.add, ...get(ACC8), ...i32Lane(3), op.add,
  ...i32Store,
  ...get(ROWS8), ...get(D8), op.add, ...set(ROWS8),
  ...get(OUT8), ...i32(4), op.add, ...set(OUT8),
  ...get(N8), ...i32(1), op.sub, ...tee(N8), ...brIf(0),
  op.end, // rows
  op.end, // block
  op.end, // function
];

const CODE8 = [0x01, ...leb128(DOTS8_BODY.length), ...DOTS8_BODY];
export const DOTS8_WASM = new Uint8Array([
  ...DOTS8_HEADER,
  0x0a,
  ...leb128(CODE8.length),
  ...CODE8,
]);
let module8: WebAssembly.Module | null | undefined;

function dots8Module(): WebAssembly.Module | null {
  if (module8 === undefined) {
    try {
      module8 = WebAssembly.validate(DOTS8_WASM) ? new WebAssembly.Module(DOTS8_WASM) : null;
    } catch {
      module8 = null;
    }
  }
  return module8;
}

/** Unit rows (row * invNorm over the first `dims` axes) rounded to int8 with a scale per row. */
export interface Int8Rows {
  count: number;
  /** The axes summed, `dims` rounded up to a multiple of 8 (the extra axes are zero). */
  dims: number;
  /** Row j is about scales[j] * its int8 values. */
  scales: Float64Array;
  /** ||unit row j - scales[j] * int8 row j||_2, exactly as rounded (Float64). */
  errors: Float64Array;
  /** The largest of `errors`. */
  maxError: number;
  dots8: (q: number, rows: number, n: number, d: number, out: number) => void;
  memory: WebAssembly.Memory;
  /** Byte offsets of the int16 query, the int8 rows and the int32 results. */
  query: number;
  rows: number;
  out: number;
}

/**
 * The int8 copy of the first `count` unit rows over their first `dims` axes, or null
 * when WebAssembly SIMD is not available. A zero row (invNorm 0) is all zeros.
 */
export function quantiseUnitRows(
  rows: Float32Array,
  stride: number,
  count: number,
  invNorms: Float32Array,
  dims: number,
): Int8Rows | null {
  const mod = dots8Module();
  if (!mod || count === 0) return null;
  const d = Math.ceil(dims / 8) * 8;
  const query = 0;
  const rowsAt = Math.ceil((d * 2) / 16) * 16;
  const out = rowsAt + Math.ceil((count * d) / 16) * 16;
  const bytes = out + count * 4;
  if (bytes > 2 ** 31) return null;
  let memory: WebAssembly.Memory;
  try {
    memory = new WebAssembly.Memory({ initial: Math.ceil(bytes / PAGE) });
  } catch {
    return null;
  }
  const instance = new WebAssembly.Instance(mod, { env: { mem: memory } });
  const q8 = new Int8Array(memory.buffer, rowsAt, count * d);
  const scales = new Float64Array(count);
  const errors = new Float64Array(count);
  let maxError = 0;
  for (let j = 0; j < count; j++) {
    const o = j * stride;
    const inv = invNorms[j];
    let max = 0;
    for (let c = 0; c < dims; c++) {
      const v = rows[o + c];
      if (v > max) max = v;
      else if (-v > max) max = -v;
    }
    const s = (max * inv) / 127;
    if (!(s > 0)) continue; // a zero row: scale 0, error 0
    // Any rounding of unit / s works: the error is measured from the values stored.
    const toSteps = inv / s;
    const od = j * d;
    let err = 0;
    for (let c = 0; c < dims; c++) {
      const v = rows[o + c];
      let n = Math.round(v * toSteps);
      if (n > 127) n = 127;
      else if (n < -127) n = -127;
      q8[od + c] = n;
      const e = v * inv - s * n;
      err += e * e;
    }
    scales[j] = s;
    errors[j] = Math.sqrt(err);
    if (errors[j] > maxError) maxError = errors[j];
  }
  return {
    count,
    dims: d,
    scales,
    errors,
    maxError,
    dots8: instance.exports.dots8 as Int8Rows['dots8'],
    memory,
    query,
    rows: rowsAt,
    out,
  };
}

/**
 * The int8 pass: dots[j] * scales[j] * step approximates (unit row j) . query, within
 * errors[j] + queryError * (1 + errors[j]), where queryError = ||query - its int16
 * rounding||_2 (Cauchy-Schwarz on the two rounding errors). `dots` is a view valid
 * until the next call.
 */
export function int8Dots(
  q: Int8Rows,
  query: ArrayLike<number>,
): { dots: Int32Array; step: number; queryError: number } {
  let max = 0;
  const n = Math.min(query.length, q.dims);
  for (let c = 0; c < n; c++) if (Math.abs(query[c]) > max) max = Math.abs(query[c]);
  const step = max > 0 ? max / 32767 : 0;
  const q16 = new Int16Array(q.memory.buffer, q.query, q.dims);
  let err = 0;
  for (let c = 0; c < q.dims; c++) {
    const v = c < n ? query[c] : 0;
    const r = step > 0 ? Math.max(-32767, Math.min(32767, Math.round(v / step))) : 0;
    q16[c] = r;
    const e = v - step * r;
    err += e * e;
  }
  q.dots8(q.query, q.rows, q.count, q.dims, q.out);
  return {
    dots: new Int32Array(q.memory.buffer, q.out, q.count),
    step,
    queryError: Math.sqrt(err),
  };
}

/** Approximate cosines of a unit query with every quantised row (int8Dots, scaled). */
export function int8Cosines(
  q: Int8Rows,
  query: ArrayLike<number>,
): { approx: Float64Array; queryError: number } {
  const { dots, step, queryError } = int8Dots(q, query);
  const approx = new Float64Array(q.count);
  for (let j = 0; j < q.count; j++) approx[j] = q.scales[j] * step * dots[j];
  return { approx, queryError };
}
