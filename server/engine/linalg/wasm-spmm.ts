// Y = A X for a CSR matrix A and a dense row-major block X (cols x b, b even) in
// WebAssembly SIMD: f64x2 lanes (WebAssembly 2.0 fixed-width SIMD), eight nonzeros per
// pass over the output row as in the JavaScript loop of server/engine/sparse/csr.ts, which V8
// does not vectorise. Measured on the 10k bench matrix (docs/PERFORMANCE.md): about
// twice the JavaScript loop's rate on one core, same results to rounding.
//
// Operands live in one shared WebAssembly.Memory (an "arena") so that a worker thread
// instantiating the same module over the same memory can take half of the rows
// (server/engine/linalg/parallel.ts). Arrays handed out by the arena are ordinary typed-array
// views, so every JavaScript kernel keeps working on them.
import type { CsrMatrix } from '../sparse/csr';
import { I32, V128, op, singleFunctionModule } from './wasm-assembler';

/** Nonzeros per pass over the output row (measured: 8 beats 4 by ~20%, 2 is slower). */
const UNROLL = 8;

// Parameters (all i32; addresses are byte offsets into the memory).
const ROW_PTR = 0;
const COL_IDX = 1;
const VALUES = 2;
const X = 3;
const B = 4;
const Y = 5;
const ROW_START = 6;
const ROW_END = 7;
// Locals.
const ROW = 8;
const P = 9;
const END = 10;
const Y_ROW = 11;
const ROW_BYTES = 12;
const J = 13;
const X_ROW = 14; // UNROLL i32 locals: the gathered rows of X
const V = X_ROW + UNROLL; // UNROLL v128 locals: the nonzeros, splatted

/** Loads nonzero p + u: V[u] = splat(values[p + u]), X_ROW[u] = x + colIdx[p + u] * rowBytes. */
function loadNonzero(u: number): number[][] {
  return [
    op.get(VALUES),
    op.get(P),
    op.i32Const(3),
    op.i32Shl(),
    op.i32Add(),
    op.f64Load(u * 8),
    op.f64x2Splat(),
    op.set(V + u),
    op.get(X),
    op.get(COL_IDX),
    op.get(P),
    op.i32Const(2),
    op.i32Shl(),
    op.i32Add(),
    op.i32Load(u * 4),
    op.get(ROW_BYTES),
    op.i32Mul(),
    op.i32Add(),
    op.set(X_ROW + u),
  ];
}

/** for (j = 0; j < rowBytes; j += 16) y[j] += sum_u V[u] * xRow_u[j]  (two lanes at a time). */
function accumulate(count: number): number[][] {
  const terms: number[][] = [];
  for (let u = 0; u < count; u++) {
    terms.push(
      op.get(V + u),
      op.get(X_ROW + u),
      op.get(J),
      op.i32Add(),
      op.v128Load(),
      op.f64x2Mul(),
      op.f64x2Add(),
    );
  }
  return [
    op.i32Const(0),
    op.set(J),
    op.loop(),
    op.get(Y_ROW),
    op.get(J),
    op.i32Add(),
    op.get(Y_ROW),
    op.get(J),
    op.i32Add(),
    op.v128Load(),
    ...terms,
    op.v128Store(),
    op.get(J),
    op.i32Const(16),
    op.i32Add(),
    op.tee(J),
    op.get(ROW_BYTES),
    op.i32LtU(),
    op.brIf(0),
    op.end(),
  ];
}

const SPMM_BODY: number[][] = [
  op.get(B),
  op.i32Const(3),
  op.i32Shl(),
  op.set(ROW_BYTES),
  op.get(ROW_START),
  op.set(ROW),
  op.block(),
  op.loop(), // rows
  op.get(ROW),
  op.get(ROW_END),
  op.i32GeU(),
  op.brIf(1),
  // yRow = y + row * rowBytes, zeroed
  op.get(Y),
  op.get(ROW),
  op.get(ROW_BYTES),
  op.i32Mul(),
  op.i32Add(),
  op.set(Y_ROW),
  op.i32Const(0),
  op.set(J),
  op.loop(),
  op.get(Y_ROW),
  op.get(J),
  op.i32Add(),
  op.v128Zero(),
  op.v128Store(),
  op.get(J),
  op.i32Const(16),
  op.i32Add(),
  op.tee(J),
  op.get(ROW_BYTES),
  op.i32LtU(),
  op.brIf(0),
  op.end(),
  // p = rowPtr[row], end = rowPtr[row + 1]
  op.get(ROW_PTR),
  op.get(ROW),
  op.i32Const(2),
  op.i32Shl(),
  op.i32Add(),
  op.tee(P),
  op.i32Load(4),
  op.set(END),
  op.get(P),
  op.i32Load(0),
  op.set(P),
  // UNROLL nonzeros at a time
  op.block(),
  op.loop(),
  op.get(END),
  op.get(P),
  op.i32Sub(),
  op.i32Const(UNROLL),
  op.i32LtU(),
  op.brIf(1),
  ...Array.from({ length: UNROLL }, (_, u) => loadNonzero(u)).flat(),
  ...accumulate(UNROLL),
  op.get(P),
  op.i32Const(UNROLL),
  op.i32Add(),
  op.set(P),
  op.br(0),
  op.end(),
  op.end(),
  // the remaining nonzeros one at a time
  op.block(),
  op.loop(),
  op.get(P),
  op.get(END),
  op.i32GeU(),
  op.brIf(1),
  ...loadNonzero(0),
  ...accumulate(1),
  op.get(P),
  op.i32Const(1),
  op.i32Add(),
  op.set(P),
  op.br(0),
  op.end(),
  op.end(),
  op.get(ROW),
  op.i32Const(1),
  op.i32Add(),
  op.set(ROW),
  op.br(0),
  op.end(),
  op.end(),
];

/** spmm(rowPtr, colIdx, values, x, b, y, rowStart, rowEnd), addresses in bytes. */
export const SPMM_WASM = singleFunctionModule({
  exportName: 'spmm',
  params: 8,
  locals: [
    [6 + UNROLL, I32],
    [UNROLL, V128],
  ],
  body: SPMM_BODY,
});

export type SpmmFunction = (
  rowPtr: number,
  colIdx: number,
  values: number,
  x: number,
  b: number,
  y: number,
  rowStart: number,
  rowEnd: number,
) => void;

let compiled: WebAssembly.Module | null | undefined;

/** The compiled kernel, or null where WebAssembly SIMD or shared memory is unavailable. */
export function spmmModule(): WebAssembly.Module | null {
  if (compiled === undefined) {
    try {
      compiled = WebAssembly.validate(SPMM_WASM) ? new WebAssembly.Module(SPMM_WASM) : null;
    } catch {
      compiled = null;
    }
  }
  return compiled;
}

export function instantiateSpmm(module: WebAssembly.Module, memory: WebAssembly.Memory) {
  return new WebAssembly.Instance(module, { env: { mem: memory } }).exports.spmm as SpmmFunction;
}

const PAGE = 65536;
const MAX_PAGES = 65536;
const ALIGN = 64;

/** A CSR matrix whose arrays are views into an arena (byte offsets via byteOffset). */
export type ArenaCsr = CsrMatrix;

/**
 * A growing shared WebAssembly memory with a bump allocator. Nothing is freed until the
 * whole arena is dropped: an SVD allocates a handful of blocks, all live to the end.
 */
export class SpmmArena {
  readonly memory: WebAssembly.Memory;
  readonly module: WebAssembly.Module;
  private readonly spmm: SpmmFunction;
  private top = ALIGN;
  /** Every buffer object the memory has had (growing a shared memory gives a new one). */
  private readonly buffers = new WeakSet<ArrayBufferLike>();

  private constructor(module: WebAssembly.Module, memory: WebAssembly.Memory) {
    this.module = module;
    this.memory = memory;
    this.spmm = instantiateSpmm(module, memory);
    this.buffers.add(memory.buffer);
  }

  /** An arena with room for `bytes` to start with, or null without WebAssembly SIMD. */
  static create(bytes: number): SpmmArena | null {
    const module = spmmModule();
    if (!module) return null;
    try {
      const initial = Math.min(MAX_PAGES, Math.max(1, Math.ceil((bytes + ALIGN) / PAGE)));
      const memory = new WebAssembly.Memory({ initial, maximum: MAX_PAGES, shared: true });
      return new SpmmArena(module, memory);
    } catch {
      return null;
    }
  }

  private reserve(bytes: number): number | null {
    const start = this.top;
    const end = start + Math.ceil(bytes / ALIGN) * ALIGN;
    const have = this.memory.buffer.byteLength;
    if (end > have) {
      const pages = Math.ceil((end - have) / PAGE);
      if (have / PAGE + pages > MAX_PAGES) return null;
      try {
        this.memory.grow(pages);
      } catch {
        return null; // the host refused the memory: callers fall back to ordinary arrays
      }
      this.buffers.add(this.memory.buffer);
    }
    this.top = end;
    return start;
  }

  /** A zeroed Float64Array in the arena, or null when the arena cannot grow that far. */
  float64(length: number): Float64Array | null {
    const at = this.reserve(length * 8);
    return at === null ? null : new Float64Array(this.memory.buffer, at, length);
  }

  /** A zeroed Int32Array in the arena, or null when the arena cannot grow that far. */
  int32(length: number): Int32Array | null {
    const at = this.reserve(length * 4);
    return at === null ? null : new Int32Array(this.memory.buffer, at, length);
  }

  /** A copy of `a` in the arena, or null when it does not fit. */
  placeCsr(a: CsrMatrix): ArenaCsr | null {
    const nnz = a.rowPtr[a.rows];
    const rowPtrAt = this.reserve(a.rowPtr.length * 4);
    const colIdxAt = this.reserve(nnz * 4);
    const valuesAt = this.reserve(nnz * 8);
    if (rowPtrAt === null || colIdxAt === null || valuesAt === null) return null;
    const buffer = this.memory.buffer;
    const rowPtr = new Int32Array(buffer, rowPtrAt, a.rowPtr.length);
    const colIdx = new Int32Array(buffer, colIdxAt, nnz);
    const values = new Float64Array(buffer, valuesAt, nnz);
    rowPtr.set(a.rowPtr);
    colIdx.set(a.colIdx.subarray(0, nnz));
    values.set(a.values.subarray(0, nnz));
    return { rows: a.rows, cols: a.cols, rowPtr, colIdx, values };
  }

  /** True when the array is a view into this arena. */
  holds(array: ArrayBufferView): boolean {
    return this.buffers.has(array.buffer);
  }

  /**
   * y rows [rowStart, rowEnd) = A x, with A, x and y all in this arena and b even;
   * returns false (doing nothing) otherwise, so the caller can use the JavaScript loop.
   */
  times(
    a: ArenaCsr,
    x: Float64Array,
    b: number,
    y: Float64Array,
    rowStart = 0,
    rowEnd = a.rows,
  ): boolean {
    if (!canRun(this, a, x, b, y)) return false;
    this.spmm(
      a.rowPtr.byteOffset,
      a.colIdx.byteOffset,
      a.values.byteOffset,
      x.byteOffset,
      b,
      y.byteOffset,
      rowStart,
      rowEnd,
    );
    return true;
  }
}

/** The kernel's preconditions: operands in the arena, an even block width of at least 2. */
export function canRun(
  arena: SpmmArena,
  a: ArenaCsr,
  x: Float64Array,
  b: number,
  y: Float64Array,
): boolean {
  return (
    b >= 2 &&
    b % 2 === 0 &&
    arena.holds(a.values) &&
    arena.holds(a.colIdx) &&
    arena.holds(a.rowPtr) &&
    arena.holds(x) &&
    arena.holds(y) &&
    x.length >= a.cols * b &&
    y.length >= a.rows * b
  );
}
