// Cosine top-N over row-major Float32 rows: one pass, a size-N min-heap (partial
// selection, O(n log N)), rows pre-normalised through a cached 1/||row|| array.
// Rows allocated by simd-dot.ts (the concept space's document matrix) get their dot
// products from a WebAssembly SIMD kernel (Float32 accumulation); others use the
// scalar loop (Float64 accumulation).
import { int8Dots, quantiseUnitRows, simdDots, simdDotsAt, type Int8Rows } from './simd-dot';

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
  /**
   * Allow an int8 first pass (see topCosine). Only for rows that do not change while
   * `invNorms` is the same array, which identifies them in a cache: true of
   * ConceptSpace.inverseNorms (recomputed whenever a vector changes) and of the
   * scaled term rows.
   */
  quantised?: boolean;
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

/** Matrices smaller than this stay in cache; the int8 pass would not pay for itself. */
export const QUANTISED_MIN_ROWS = 2048;
/** Covers the Float32 rounding of the exact scores (about 1e-5 at k = 200) with room to spare. */
const EXACT_ROUNDING_MARGIN = 1e-4;

const int8Cache = new WeakMap<Float32Array, Map<number, Int8Rows | null>>();

function int8RowsFor(
  rows: Float32Array,
  stride: number,
  count: number,
  invNorms: Float32Array,
  dims: number,
): Int8Rows | null {
  let perDims = int8Cache.get(invNorms);
  if (!perDims) int8Cache.set(invNorms, (perDims = new Map()));
  let q8 = perDims.get(dims);
  if (q8 === undefined || (q8 !== null && q8.count !== count)) {
    q8 = quantiseUnitRows(rows, stride, count, invNorms, dims);
    perDims.set(dims, q8);
  }
  return q8;
}

/**
 * The exact top-N through an int8 first pass, or null when it would not save work
 * (or the rows are not in WebAssembly memory). `q` is the unit query over `dims`.
 * Every row's approximate cosine a_j is within b_j of its exact one (int8Cosines,
 * plus EXACT_ROUNDING_MARGIN). With T = (the limit-th best a_j) - max b_j, at least
 * `limit` rows score T or more exactly, so every row of the true top-N has an exact
 * score of at least max(T, minScore) and passes a_j + b_j >= max(T, minScore). Only
 * those candidates get exact scores, from the same Float32 kernel as the full pass,
 * so the result (ids, order, score bits) is the full pass's.
 */
export function quantisedTop(
  rows: Float32Array,
  stride: number,
  count: number,
  invNorms: Float32Array,
  q: Float64Array,
  limit: number,
  dims: number,
  allow: Uint8Array | undefined,
  exclude: number,
  floor: number,
): TopN | null {
  if (simdDotsAt(rows, stride, new Int32Array(0), 0, q, dims) === null) return null;
  const q8 = int8RowsFor(rows, stride, count, invNorms, dims);
  if (!q8) return null;
  const { dots, step, queryError } = int8Dots(q8, q);
  const { scales, errors } = q8;
  // Row j's bound: errors[j] + queryError * (1 + errors[j]) + margin.
  const grow = 1 + queryError;
  const base = queryError + EXACT_ROUNDING_MARGIN;
  // Candidates: the rows whose upper bound reaches the cut-off ...
  const candidates = new Int32Array(count);
  let m = 0;
  for (let j = 0; j < count; j++) {
    if ((allow !== undefined && allow[j] === 0) || j === exclude) continue;
    if (scales[j] * step * dots[j] + errors[j] * grow + base >= floor) candidates[m++] = j;
  }
  if (m > limit) {
    // ... and, when more than `limit` do, the threshold T = (limit-th best
    // approximation among them) - the largest bound.
    const rough = new MinHeap(limit);
    for (let i = 0; i < m; i++) {
      const j = candidates[i];
      const a = scales[j] * step * dots[j];
      if (rough.size < limit || a > rough.scores[0]) rough.offer(a, j);
    }
    const threshold = Math.max(floor, rough.scores[0] - (q8.maxError * grow + base));
    let kept = 0;
    for (let i = 0; i < m; i++) {
      const j = candidates[i];
      if (scales[j] * step * dots[j] + errors[j] * grow + base >= threshold) candidates[kept++] = j;
    }
    m = kept;
  }
  // Gathering scattered rows costs more than streaming them once past about a quarter.
  if (m > count / 4) return null;
  const exact = simdDotsAt(rows, stride, candidates, m, q, dims);
  if (!exact) return null;
  const heap = new MinHeap(Math.max(1, Math.min(limit, m)));
  for (let i = 0; i < m; i++) {
    const j = candidates[i];
    const score = exact[i] * invNorms[j];
    if (score < floor) continue;
    if (score > heap.minScore || heap.size < heap.capacity) heap.offer(score, j);
  }
  return heap.sorted();
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
  if (options.quantised && count >= QUANTISED_MIN_ROWS) {
    const top = quantisedTop(rows, stride, count, invNorms, q, limit, dims, allow, exclude, floor);
    if (top) return top;
  }
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
