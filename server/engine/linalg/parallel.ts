// Sparse x dense block products for the randomized SVD, behind the synchronous
// truncatedSvd API. A and A^T are copied once into a shared WebAssembly memory (see
// wasm-spmm.ts) and every block the SVD allocates is placed there too, so the products
// run in the WebAssembly SIMD kernel. With two threads, the calling thread takes the
// first half of the rows (split by nonzeros) and a worker thread the second half over
// the same memory; the caller then blocks in Atomics.wait until the worker is done
// (Node allows blocking the main thread; the worker's own event loop delivers the
// request). Without WebAssembly SIMD, or for blocks the kernel cannot take (odd width,
// arena full), the JavaScript gather loop of server/engine/sparse/csr.ts runs instead, on the
// same threads over SharedArrayBuffers.
import { Worker } from 'node:worker_threads';
import { type CsrMatrix, csrTimesBlock, nnzOf, transposeCsr } from '../sparse/csr';
import type { BlockOperator } from './svd';
import {
  type DenseRows,
  GRAM_CHUNK,
  crossAccumulate,
  gramAccumulate,
  serialRows,
  symmetrizeFromUpper,
  timesSmall,
} from './dense';
import { SpmmArena, canRun } from './wasm-spmm';

// The worker runs plain JavaScript (eval) so it needs no TypeScript loader. Its
// JavaScript kernels are the engine's own functions' source, so the two cannot drift.
const WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads');
const csrTimesBlock = ${csrTimesBlock.toString()};
const GRAM_CHUNK = ${GRAM_CHUNK};
const gramAccumulate = ${gramAccumulate.toString()};
const timesSmall = ${timesSmall.toString()};
const crossAccumulate = ${crossAccumulate.toString()};
const view = (Kind, d) => new Kind(d.buffer, d.byteOffset, d.length);
const mats = workerData.mats.map((m) => ({
  rows: m.rows, rowPtr: view(Int32Array, m.rowPtr), colIdx: view(Int32Array, m.colIdx),
  values: view(Float64Array, m.values),
}));
const spmm = workerData.module
  ? new WebAssembly.Instance(workerData.module, { env: { mem: workerData.memory } }).exports.spmm
  : null;
const control = new Int32Array(workerData.control);
parentPort.on('message', (m) => {
  try {
    const f64 = (d) => view(Float64Array, d);
    const a = mats[m.matrix];
    if (m.dense === 'gram') {
      gramAccumulate(f64(m.y), m.b, f64(m.g), m.rowStart, m.rowEnd);
    } else if (m.dense === 'timesSmall') {
      timesSmall(f64(m.y), m.b, f64(m.mt), m.m, f64(m.out), m.rowStart, m.rowEnd, m.upper);
    } else if (m.dense === 'cross') {
      crossAccumulate(f64(m.x), m.strideX, m.w, f64(m.z), m.b, f64(m.c), m.rowStart, m.rowEnd, m.upperOnly);
    } else if (m.wasm) {
      spmm(a.rowPtr.byteOffset, a.colIdx.byteOffset, a.values.byteOffset, m.x, m.b, m.y, m.rowStart, m.rowEnd);
    } else {
      csrTimesBlock(a, view(Float64Array, m.x), m.b, view(Float64Array, m.y), m.rowStart, m.rowEnd);
    }
    Atomics.store(control, 0, 1);
  } catch (e) {
    Atomics.store(control, 0, 2);
  }
  Atomics.notify(control, 0);
});
`;

/** Below this many multiply-adds a dense kernel stays on the calling thread. */
const DENSE_SPLIT_MIN_WORK = 2e6;

const isShared = (a: Float64Array) => a.buffer instanceof SharedArrayBuffer;
const sharedZeros = (length: number) => new Float64Array(new SharedArrayBuffer(length * 8));

interface ViewDescriptor {
  buffer: ArrayBufferLike;
  byteOffset: number;
  length: number;
}
const describe = (a: Int32Array | Float64Array): ViewDescriptor => ({
  buffer: a.buffer,
  byteOffset: a.byteOffset,
  length: a.length,
});

function toShared(a: CsrMatrix): CsrMatrix {
  const share = <T extends Int32Array | Float64Array>(
    src: T,
    make: (b: SharedArrayBuffer) => T,
  ): T => {
    const out = make(new SharedArrayBuffer(src.byteLength));
    out.set(src);
    return out;
  };
  return {
    rows: a.rows,
    cols: a.cols,
    rowPtr: share(a.rowPtr, (b) => new Int32Array(b)),
    colIdx: share(a.colIdx, (b) => new Int32Array(b)),
    values: share(a.values, (b) => new Float64Array(b)),
  };
}

/** A^T with its arrays in the arena, or null when they do not fit. */
function transposeInto(a: CsrMatrix, arena: SpmmArena): CsrMatrix | null {
  const full = new Error('arena full');
  const orFail = <T>(array: T | null): T => {
    if (array === null) throw full;
    return array;
  };
  try {
    return transposeCsr(a, {
      int32: (length) => orFail(arena.int32(length)),
      float64: (length) => orFail(arena.float64(length)),
    });
  } catch (error) {
    if (error === full) return null;
    throw error;
  }
}

/** Row where the cumulative nonzero count reaches half (balanced split). */
function splitRow(a: CsrMatrix): number {
  const half = a.rowPtr[a.rows] / 2;
  let lo = 0;
  let hi = a.rows;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a.rowPtr[mid] < half) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

export interface ParallelOperator extends BlockOperator {
  /** A zeroed Float64Array the kernels (and the worker) can use. */
  allocate(length: number): Float64Array;
  close(): void;
  /** How the products run, for the SVD's method label. */
  kernel: string;
}

/** A and A^T products on `threads` (1 or 2) threads, in WebAssembly SIMD where possible. */
export function parallelCsrOperator(a: CsrMatrix, threads = 2): ParallelOperator {
  const candidate = SpmmArena.create(2 * 12 * nnzOf(a) + 4 * (a.rows + a.cols + 2) + 256);
  let mats: [CsrMatrix, CsrMatrix] | null = null;
  if (candidate) {
    const pa = candidate.placeCsr(a);
    // A^T is built straight into the arena: no second, temporary copy (~0.35 GB at 100k).
    const pat = pa && transposeInto(a, candidate);
    if (pa && pat) mats = [pa, pat];
  }
  // An arena that could not hold both matrices is dropped, not kept alive by the closures.
  const arena = mats ? candidate : null;
  const useArena = arena !== null;
  const [sa, sat] = mats ?? [toShared(a), toShared(transposeCsr(a))];
  const control = new Int32Array(new SharedArrayBuffer(4));
  const worker =
    threads >= 2
      ? new Worker(WORKER_SOURCE, {
          eval: true,
          workerData: {
            control: control.buffer,
            module: useArena ? arena!.module : null,
            memory: useArena ? arena!.memory : null,
            mats: [sa, sat].map((m) => ({
              rows: m.rows,
              rowPtr: describe(m.rowPtr),
              colIdx: describe(m.colIdx),
              values: describe(m.values),
            })),
          },
        })
      : null;
  worker?.unref();
  const splits = [splitRow(sa), splitRow(sat)];
  const start = (message: object) => {
    Atomics.store(control, 0, 0);
    worker!.postMessage(message);
  };
  const finish = () => {
    while (Atomics.load(control, 0) === 0) Atomics.wait(control, 0, 0, 60_000);
    if (Atomics.load(control, 0) !== 1) throw new Error('SVD worker thread failed');
  };
  const local = (
    m: CsrMatrix,
    x: Float64Array,
    b: number,
    y: Float64Array,
    r0: number,
    r1: number,
  ) => {
    if (!(useArena && arena!.times(m, x, b, y, r0, r1))) csrTimesBlock(m, x, b, y, r0, r1);
  };
  const run = (matrix: 0 | 1, x: Float64Array, b: number, y: Float64Array) => {
    const m = matrix === 0 ? sa : sat;
    const shared = x.buffer instanceof SharedArrayBuffer && y.buffer instanceof SharedArrayBuffer;
    if (!worker || !shared) {
      local(m, x, b, y, 0, m.rows);
      return;
    }
    const rowSplit = splits[matrix];
    const wasm = useArena && canRun(arena!, m, x, b, y);
    start(
      wasm
        ? { matrix, wasm, x: x.byteOffset, y: y.byteOffset, b, rowStart: rowSplit, rowEnd: m.rows }
        : { matrix, wasm, x: describe(x), y: describe(y), b, rowStart: rowSplit, rowEnd: m.rows },
    );
    local(m, x, b, y, 0, rowSplit);
    finish();
  };
  // Dense kernels split by rows: the worker's half writes its own partial sums (Gram
  // and cross products) into a small shared buffer that is added in afterwards.
  const split = (...arrays: Float64Array[]) => worker !== null && arrays.every(isShared);
  const half = (n: number) => (n >> 3) << 2; // a multiple of 4: timesSmall's row blocks
  const dense: DenseRows = {
    gram(y, n, b) {
      if (!split(y) || n * b * b < DENSE_SPLIT_MIN_WORK) return serialRows.gram(y, n, b);
      const theirs = sharedZeros(b * b);
      start({
        dense: 'gram',
        y: describe(y),
        b,
        g: describe(theirs),
        rowStart: half(n),
        rowEnd: n,
      });
      const g = new Float64Array(b * b);
      gramAccumulate(y, b, g, 0, half(n));
      finish();
      for (let i = 0; i < g.length; i++) g[i] += theirs[i];
      symmetrizeFromUpper(g, b);
      return g;
    },
    timesSmall(y, b, mt, m, out, n, upper = false) {
      if (!split(y, out) || n * b * m < DENSE_SPLIT_MIN_WORK) {
        serialRows.timesSmall(y, b, mt, m, out, n, upper);
        return;
      }
      const mtShared = sharedZeros(mt.length);
      mtShared.set(mt);
      start({
        dense: 'timesSmall',
        y: describe(y),
        b,
        mt: describe(mtShared),
        m,
        out: describe(out),
        rowStart: half(n),
        rowEnd: n,
        upper,
      });
      timesSmall(y, b, mt, m, out, 0, half(n), upper);
      finish();
    },
    crossAccumulate(x, strideX, w, z, b, c, n, upperOnly = false) {
      if (!split(x, z) || n * w * b < DENSE_SPLIT_MIN_WORK) {
        serialRows.crossAccumulate(x, strideX, w, z, b, c, n, upperOnly);
        return;
      }
      const theirs = sharedZeros(c.length);
      start({
        dense: 'cross',
        x: describe(x),
        strideX,
        w,
        z: describe(z),
        b,
        c: describe(theirs),
        rowStart: half(n),
        rowEnd: n,
        upperOnly,
      });
      crossAccumulate(x, strideX, w, z, b, c, 0, half(n), upperOnly);
      finish();
      for (let i = 0; i < c.length; i++) c[i] += theirs[i];
    },
  };
  const kernel = `${useArena ? 'wasm-simd' : 'javascript'} kernel, ${worker ? 2 : 1} thread${worker ? 's' : ''}`;
  return {
    rows: a.rows,
    cols: a.cols,
    times: (x, b, y) => run(0, x, b, y),
    timesTranspose: (x, b, y) => run(1, x, b, y),
    allocate: (length) =>
      (useArena ? arena!.float64(length) : null) ??
      new Float64Array(new SharedArrayBuffer(length * 8)),
    close: () => void worker?.terminate(),
    kernel,
    dense,
  };
}
