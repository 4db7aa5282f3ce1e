// Two-thread sparse x dense block products for the randomized SVD, still behind the
// synchronous truncatedSvd API: the calling thread takes the first half of the rows
// (split by nonzeros), a worker thread the second half, over SharedArrayBuffers; the
// caller then blocks in Atomics.wait until the worker is done (Node allows blocking the
// main thread; the worker's own event loop delivers the request).
import { Worker } from 'node:worker_threads';
import { type CsrMatrix, csrTimesBlock, transposeCsr } from '../sparse/csr';
import type { BlockOperator } from './svd';

// The worker runs plain JavaScript (eval) so it needs no TypeScript loader; the kernel
// is the same unrolled gather loop as csrTimesBlock in engine/sparse/csr.ts.
const WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads');
const mats = workerData.mats.map((m) => ({
  rowPtr: new Int32Array(m.rowPtr), colIdx: new Int32Array(m.colIdx), values: new Float64Array(m.values),
}));
const control = new Int32Array(workerData.control);
function gather(a, x, b, y, rowStart, rowEnd) {
  const rowPtr = a.rowPtr, colIdx = a.colIdx, values = a.values;
  for (let i = rowStart; i < rowEnd; i++) {
    const yo = i * b;
    for (let j = 0; j < b; j++) y[yo + j] = 0;
    let p = rowPtr[i];
    const end = rowPtr[i + 1];
    for (; p + 7 < end; p += 8) {
      const v0 = values[p], v1 = values[p + 1], v2 = values[p + 2], v3 = values[p + 3];
      const v4 = values[p + 4], v5 = values[p + 5], v6 = values[p + 6], v7 = values[p + 7];
      const o0 = colIdx[p] * b, o1 = colIdx[p + 1] * b, o2 = colIdx[p + 2] * b, o3 = colIdx[p + 3] * b;
      const o4 = colIdx[p + 4] * b, o5 = colIdx[p + 5] * b, o6 = colIdx[p + 6] * b, o7 = colIdx[p + 7] * b;
      for (let j = 0; j < b; j++) y[yo + j] += v0 * x[o0 + j] + v1 * x[o1 + j] + v2 * x[o2 + j] + v3 * x[o3 + j] + v4 * x[o4 + j] + v5 * x[o5 + j] + v6 * x[o6 + j] + v7 * x[o7 + j];
    }
    for (; p + 3 < end; p += 4) {
      const v0 = values[p], v1 = values[p + 1], v2 = values[p + 2], v3 = values[p + 3];
      const o0 = colIdx[p] * b, o1 = colIdx[p + 1] * b, o2 = colIdx[p + 2] * b, o3 = colIdx[p + 3] * b;
      for (let j = 0; j < b; j++) y[yo + j] += v0 * x[o0 + j] + v1 * x[o1 + j] + v2 * x[o2 + j] + v3 * x[o3 + j];
    }
    for (; p < end; p++) {
      const v = values[p], o = colIdx[p] * b;
      for (let j = 0; j < b; j++) y[yo + j] += v * x[o + j];
    }
  }
}
parentPort.on('message', (m) => {
  try {
    gather(mats[m.matrix], new Float64Array(m.x), m.b, new Float64Array(m.y), m.rowStart, m.rowEnd);
    Atomics.store(control, 0, 1);
  } catch (e) {
    Atomics.store(control, 0, 2);
  }
  Atomics.notify(control, 0);
});
`;

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
  /** A Float64Array on shared memory (blocks must be shared for the worker to see them). */
  allocate(length: number): Float64Array;
  close(): void;
}

export function parallelCsrOperator(a: CsrMatrix): ParallelOperator {
  const sa = toShared(a);
  const sat = toShared(transposeCsr(a));
  const control = new Int32Array(new SharedArrayBuffer(4));
  const worker = new Worker(WORKER_SOURCE, {
    eval: true,
    workerData: {
      control: control.buffer,
      mats: [sa, sat].map((m) => ({
        rowPtr: m.rowPtr.buffer,
        colIdx: m.colIdx.buffer,
        values: m.values.buffer,
      })),
    },
  });
  worker.unref();
  const splits = [splitRow(sa), splitRow(sat)];
  const run = (matrix: 0 | 1, x: Float64Array, b: number, y: Float64Array) => {
    const m = matrix === 0 ? sa : sat;
    const split = splits[matrix];
    if (!(x.buffer instanceof SharedArrayBuffer) || !(y.buffer instanceof SharedArrayBuffer)) {
      csrTimesBlock(m, x, b, y);
      return;
    }
    Atomics.store(control, 0, 0);
    worker.postMessage({ matrix, x: x.buffer, y: y.buffer, b, rowStart: split, rowEnd: m.rows });
    csrTimesBlock(m, x, b, y, 0, split);
    while (Atomics.load(control, 0) === 0) Atomics.wait(control, 0, 0, 60_000);
    if (Atomics.load(control, 0) !== 1) throw new Error('SVD worker thread failed');
  };
  return {
    rows: a.rows,
    cols: a.cols,
    times: (x, b, y) => run(0, x, b, y),
    timesTranspose: (x, b, y) => run(1, x, b, y),
    allocate: (length) => new Float64Array(new SharedArrayBuffer(length * 8)),
    close: () => void worker.terminate(),
  };
}
