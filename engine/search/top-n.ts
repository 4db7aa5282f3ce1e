// Cosine top-N over row-major Float32 rows: one pass, a size-N min-heap (partial
// selection, O(n log N)), rows pre-normalised through a cached 1/||row|| array.
// Rows allocated by simd-dot.ts (the concept space's document matrix) get their dot
// products from a WebAssembly SIMD kernel (Float32 accumulation); others use the
// scalar loop (Float64 accumulation).
import { simdDots } from './simd-dot';

export interface TopN {
  /** Row indices, best first (ties: lower index first). */
  indices: Int32Array;
  scores: Float64Array;
}

export interface TopNOptions {
  /** Compare over the first `dims` axes only (a smaller-k space from the same SVD). */
  dims?: number;
  /** Only rows with allow[j] !== 0 are candidates. */
  allow?: Uint8Array;
  /** Skip this row (e.g. the document itself in "more like this"). */
  exclude?: number;
  /** Keep only scores at or above this (a cut-off the caller applies anyway; saves heap work). */
  minScore?: number;
}

/** Min-heap on (score, -index): the root is the weakest kept hit. */
class MinHeap {
  readonly scores: Float64Array;
  readonly indices: Int32Array;
  size = 0;
  constructor(readonly capacity: number) {
    this.scores = new Float64Array(capacity);
    this.indices = new Int32Array(capacity);
  }
  private weaker(a: number, b: number): boolean {
    const sa = this.scores[a];
    const sb = this.scores[b];
    return sa < sb || (sa === sb && this.indices[a] > this.indices[b]);
  }
  private swap(a: number, b: number): void {
    const s = this.scores[a];
    this.scores[a] = this.scores[b];
    this.scores[b] = s;
    const i = this.indices[a];
    this.indices[a] = this.indices[b];
    this.indices[b] = i;
  }
  offer(score: number, index: number): void {
    if (this.size < this.capacity) {
      let c = this.size++;
      this.scores[c] = score;
      this.indices[c] = index;
      while (c > 0) {
        const parent = (c - 1) >> 1;
        if (!this.weaker(c, parent)) break;
        this.swap(c, parent);
        c = parent;
      }
      return;
    }
    if (score < this.scores[0] || (score === this.scores[0] && index > this.indices[0])) return;
    this.scores[0] = score;
    this.indices[0] = index;
    this.siftDown(0);
  }
  private siftDown(from: number): void {
    let c = from;
    for (;;) {
      const l = 2 * c + 1;
      const r = l + 1;
      let m = c;
      if (l < this.size && this.weaker(l, m)) m = l;
      if (r < this.size && this.weaker(r, m)) m = r;
      if (m === c) break;
      this.swap(c, m);
      c = m;
    }
  }
  get minScore(): number {
    return this.size < this.capacity ? -Infinity : this.scores[0];
  }
  /**
   * The kept hits best first (ties: lower index first), by heapsort: popping the
   * weakest to the back leaves the strongest at the front. Empties the heap.
   */
  sorted(): TopN {
    const n = this.size;
    while (this.size > 1) {
      const last = --this.size;
      this.swap(0, last);
      this.siftDown(0);
    }
    this.size = 0;
    return { indices: this.indices.slice(0, n), scores: this.scores.slice(0, n) };
  }
}

/**
 * The `limit` rows of `rows` (count x stride) with the highest cosine to `query`.
 * `invNorms[j]` = 1/||row j|| over the same dims (0 for a zero row, which scores 0).
 */
export function topCosine(
  rows: Float32Array,
  stride: number,
  count: number,
  invNorms: Float32Array,
  query: ArrayLike<number>,
  limit: number,
  options: TopNOptions = {},
): TopN {
  const dims = options.dims ?? stride;
  const q = new Float64Array(dims);
  let qn = 0;
  for (let c = 0; c < dims; c++) qn += query[c] * query[c];
  if (!(qn > 0) || limit <= 0 || count === 0)
    return { indices: new Int32Array(0), scores: new Float64Array(0) };
  const qInv = 1 / Math.sqrt(qn);
  for (let c = 0; c < dims; c++) q[c] = query[c] * qInv;
  const heap = new MinHeap(Math.min(limit, count));
  const allow = options.allow;
  const exclude = options.exclude ?? -1;
  const floor = options.minScore ?? -Infinity;
  const fast = simdDots(rows, stride, count, q, dims);
  if (fast) {
    for (let j = 0; j < count; j++) {
      if (allow !== undefined && allow[j] === 0) continue;
      if (j === exclude) continue;
      const score = fast[j] * invNorms[j];
      if (score < floor) continue;
      if (score > heap.minScore || heap.size < heap.capacity) heap.offer(score, j);
    }
    return heap.sorted();
  }
  const tail = dims & 3;
  const body = dims - tail;
  for (let j = 0; j < count; j++) {
    if (allow !== undefined && allow[j] === 0) continue;
    if (j === exclude) continue;
    const o = j * stride;
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    for (let c = 0; c < body; c += 4) {
      s0 += q[c] * rows[o + c];
      s1 += q[c + 1] * rows[o + c + 1];
      s2 += q[c + 2] * rows[o + c + 2];
      s3 += q[c + 3] * rows[o + c + 3];
    }
    for (let c = body; c < dims; c++) s0 += q[c] * rows[o + c];
    const score = (s0 + s1 + s2 + s3) * invNorms[j];
    if (score < floor) continue;
    if (score > heap.minScore || heap.size < heap.capacity) heap.offer(score, j);
  }
  return heap.sorted();
}
