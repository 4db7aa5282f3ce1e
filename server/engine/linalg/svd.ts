// Truncated SVD of a sparse matrix, A ~ U_k S_k V_k^T, for the concept space.
//
// 'block-krylov': randomized block Krylov range finder (Musco & Musco 2015), the most
// accurate; the default while its dense work is small (defaultMethod).
// 'randomized': randomized range finder with subspace (power) iteration, Halko,
// Martinsson & Tropp, "Finding structure with randomness" (SIAM Review 2011), Alg. 4.3
// / 4.4 and Alg. 5.1 (direct SVD of the small projected matrix); the default for large
// matrices. Blocks are re-orthonormalised (CholeskyQR / CholeskyQR2, Householder
// fallback) so small directions survive.
// 'lanczos': Golub-Kahan-Lanczos bidiagonalisation with full reorthogonalisation
// (Golub & Kahan 1965; Golub & Van Loan, Matrix Computations, 4th ed., 10.4), grown
// until the top-k Ritz residuals converge; slower, used as the accuracy reference.
// The sparse products run in a WebAssembly SIMD kernel on up to two threads
// (parallel.ts, wasm-spmm.ts) once the matrix is big enough to repay it.
//
// Dense blocks are row-major (n x b) so the CSR gather loop reads contiguous rows.

import { EigenvalueDecomposition, SingularValueDecomposition, Matrix } from 'ml-matrix';
import { availableParallelism } from 'node:os';
import { type CsrMatrix, csrTimesBlock, csrTimesVector, nnzOf, transposeCsr } from '../sparse/csr';
import { type DenseRows, orthonormalize, serialRows, subtractProduct } from './dense';
import { fillGaussian, fillRademacher, mulberry32 } from './random';
import { parallelCsrOperator } from './parallel';

export interface SvdOptions {
  k: number;
  /**
   * 'block-krylov': randomized block Krylov / block Lanczos; 'randomized': subspace
   * iteration; 'lanczos': single-vector Golub-Kahan-Lanczos (reference). Default:
   * defaultMethod(rows, cols, k), block Krylov for small work, else 'randomized'.
   */
  method?: 'randomized' | 'lanczos' | 'block-krylov';
  /** Extra columns in the range block beyond k (Halko et al. section 4.2's p). */
  oversample?: number;
  /** Number of A A^T applications after the first A Omega (Halko et al.'s q). */
  powerIterations?: number;
  seed?: number;
  /**
   * 2 runs the randomized solvers' sparse products on two threads (the caller plus one
   * worker thread over shared memory), 1 on the caller only. Default: 2 when the
   * matrix is large enough to repay the worker's start-up and the machine has two
   * cores. Still synchronous either way.
   */
  threads?: number;
  onProgress?: (fraction: number) => void;
  /** Lanczos only: Ritz residual tolerance relative to sigma_1 (default 1e-10). */
  tolerance?: number;
}

export interface TruncatedSvd {
  k: number;
  rows: number;
  cols: number;
  /** k singular values, descending. */
  s: Float64Array;
  /** rows x k, row-major: U[i*k + j]. May be a view into shared (WebAssembly) memory. */
  U: Float64Array;
  /** cols x k, row-major. */
  V: Float64Array;
  ms: number;
  method: string;
}

export const DEFAULT_K = 200;
export const EPSILON = 2 ** -52;

/**
 * Default oversampling and power iterations. Measured on the synthetic collections in
 * scripts/bench/ (see docs/PERFORMANCE.md), these keep the top-k singular values within 1e-3
 * relative of a converged Lanczos / PROPACK reference at k = 100 and 300.
 */
export function defaultOversample(k: number): number {
  return Math.max(20, Math.ceil(k * 0.1));
}
/** Power iterations by method: block Krylov's q + 1 blocks, subspace iteration's q. */
export const DEFAULT_POWER_ITERATIONS = { 'block-krylov': 5, randomized: 4 } as const;

/**
 * Multiply-adds of block Krylov's dense work (short side x basis width^2, basis width
 * 3 (k + p)) up to which it is the default: it is the most accurate method here (median
 * error ~1e-6 on the bench matrices) and below this budget it takes a few seconds at
 * most. Above it, subspace iteration with q = 4 (Halko et al. Alg. 4.4) is the default:
 * its cost grows with the sparse products instead, and with two more power iterations
 * than scikit-learn's randomized_svd it is more accurate than that (docs/PERFORMANCE.md).
 * Cranfield (1,400 documents, k = 200) and the demo matter stay on block Krylov.
 */
export const BLOCK_KRYLOV_MAX_WORK = 1e9;

/** The method used when options.method is not given. */
export function defaultMethod(rows: number, cols: number, k: number, oversample?: number) {
  const basis = 3 * (k + (oversample ?? defaultOversample(k)));
  return Math.min(rows, cols) * basis * basis <= BLOCK_KRYLOV_MAX_WORK
    ? 'block-krylov'
    : 'randomized';
}

/**
 * Numerical rank: the count of s_i > max(rows, cols) * eps * s_1 (Golub & Van Loan,
 * Matrix Computations, 4th ed., 5.4.1; the same default tolerance as LAPACK users'
 * rank decisions).
 */
export function numericalRank(s: Float64Array, rows: number, cols: number): number {
  if (s.length === 0 || !(s[0] > 0)) return 0;
  const tol = Math.max(rows, cols) * EPSILON * s[0];
  let r = 0;
  for (let i = 0; i < s.length; i++) if (s[i] > tol) r++;
  return r;
}

export function validateK(k: number, rows: number, cols: number): void {
  if (!Number.isInteger(k)) throw new RangeError(`k must be a whole number, got ${k}`);
  if (k <= 0) throw new RangeError(`k must be at least 1, got ${k}`);
  if (rows === 0 || cols === 0) {
    throw new RangeError(`the matrix is empty (${rows} x ${cols}); nothing to decompose`);
  }
  if (k > Math.min(rows, cols)) {
    throw new RangeError(
      `k = ${k} exceeds min(rows, cols) = ${Math.min(rows, cols)} of the ${rows} x ${cols} matrix`,
    );
  }
}

export function truncatedSvd(a: CsrMatrix, options: SvdOptions): TruncatedSvd {
  validateK(options.k, a.rows, a.cols);
  const method = options.method ?? defaultMethod(a.rows, a.cols, options.k, options.oversample);
  if (method === 'lanczos') return lanczosSvd(a, options);
  if (method !== 'randomized' && method !== 'block-krylov') {
    throw new RangeError(`unknown SVD method "${String(method)}"`);
  }
  options = { ...options, method };
  const work = nnzOf(a) * (options.k + (options.oversample ?? defaultOversample(options.k)));
  const threads = options.threads ?? (work >= TWO_THREAD_MIN_WORK ? defaultThreadCount() : 1);
  if (threads < 2 && work < ARENA_MIN_WORK) return randomizedSvd(a, transposeCsr(a), options);
  const operator = parallelCsrOperator(a, threads);
  try {
    return randomizedSvdWith(operator, options);
  } finally {
    operator.close();
  }
}

/**
 * Below this many multiply-adds per block product (nonzeros x block width) the plain
 * JavaScript loop is used: setting up the WebAssembly arena would cost more than it saves.
 */
const ARENA_MIN_WORK = 1e6;
/** From here on (~30 ms per product on one core) a second thread pays for its start-up. */
const TWO_THREAD_MIN_WORK = 3e7;

function defaultThreadCount(): number {
  return Math.min(2, availableParallelism());
}

/** Operations the randomized algorithm needs; a parallel driver can supply its own. */
export interface BlockOperator {
  rows: number;
  cols: number;
  /** y (rows x b) = A x, x is cols x b. */
  times(x: Float64Array, b: number, y: Float64Array): void;
  /** y (cols x b) = A^T x, x is rows x b. */
  timesTranspose(x: Float64Array, b: number, y: Float64Array): void;
  /** Allocates a dense block the operator can read and write (e.g. shared memory). */
  allocate?(length: number): Float64Array;
  /** How the products run (kernel and threads), for the method label. */
  kernel?: string;
  /** Row-split dense kernels for the blocks this operator allocates (e.g. two threads). */
  dense?: DenseRows;
}

export function csrOperator(a: CsrMatrix, at: CsrMatrix): BlockOperator {
  return {
    rows: a.rows,
    cols: a.cols,
    times: (x, b, y) => csrTimesBlock(a, x, b, y),
    timesTranspose: (x, b, y) => csrTimesBlock(at, x, b, y),
  };
}

function transposed(op: BlockOperator): BlockOperator {
  return {
    rows: op.cols,
    cols: op.rows,
    times: op.timesTranspose,
    timesTranspose: op.times,
    allocate: op.allocate,
    kernel: op.kernel,
    dense: op.dense,
  };
}

export function randomizedSvd(a: CsrMatrix, at: CsrMatrix, options: SvdOptions): TruncatedSvd {
  return randomizedSvdWith(csrOperator(a, at), options);
}

/** Halko-Martinsson-Tropp randomized subspace iteration over any block operator. */
export function randomizedSvdWith(operator: BlockOperator, options: SvdOptions): TruncatedSvd {
  const started = performance.now();
  const { k } = options;
  validateK(k, operator.rows, operator.cols);
  // Orthonormalisation costs O(n b^2) per call and the range side is orthonormalised
  // q+1 times, the co-range side once: put the shorter dimension on the range side.
  const flip = operator.rows > operator.cols;
  const op = flip ? transposed(operator) : operator;
  const m = op.rows;
  const krylov = options.method === 'block-krylov';
  const q = Math.max(
    0,
    Math.floor(
      options.powerIterations ?? DEFAULT_POWER_ITERATIONS[krylov ? 'block-krylov' : 'randomized'],
    ),
  );
  const p = Math.max(0, Math.floor(options.oversample ?? defaultOversample(k)));
  const allocate = (length: number) => op.allocate?.(length) ?? new Float64Array(length);
  const seed = options.seed ?? 0x5eed;
  const blockWidth = Math.ceil((k + p) / 2);
  let range: { q: Float64Array; l: number; label: string };
  if (krylov && q >= 1 && blockWidth * (q + 1) < m) {
    range = blockKrylovRange(op, k + p, blockWidth, q + 1, seed, allocate, options.onProgress);
  } else if (krylov) {
    // The Krylov basis would span the whole short side: take that side exactly instead
    // (l = m, one product, no iteration needed).
    range = subspaceIterationRange(op, m, 0, seed, allocate, options.onProgress);
  } else {
    const fast = randomizedSubspaceSvd(op, k, Math.min(k + p, m), q, seed, allocate, options);
    return {
      k,
      rows: operator.rows,
      cols: operator.cols,
      s: fast.s,
      U: flip ? fast.v : fast.u,
      V: flip ? fast.u : fast.v,
      ms: performance.now() - started,
      method: `${fast.label}${operator.kernel ? `, ${operator.kernel}` : ''}`,
    };
  }
  const { u, v, s } = finishFromRange(op, range.q, range.l, k);
  options.onProgress?.(1);
  return {
    k,
    rows: operator.rows,
    cols: operator.cols,
    s,
    U: flip ? v : u,
    V: flip ? u : v,
    ms: performance.now() - started,
    method: `${range.label}${operator.kernel ? `, ${operator.kernel}` : ''}`,
  };
}

type Allocate = (length: number) => Float64Array;

/** Halko et al. Alg. 4.4: Q spanning (A A^T)^q A Omega, re-orthonormalised after each product. */
function subspaceIterationRange(
  op: BlockOperator,
  l: number,
  q: number,
  seed: number,
  allocate: Allocate,
  onProgress?: (fraction: number) => void,
): { q: Float64Array; l: number; label: string } {
  const m = op.rows;
  const dense = op.dense ?? serialRows;
  const n = op.cols;
  const totalSteps = 2 * q + 2;
  let step = 0;
  const progress = () => onProgress?.(Math.min(0.99, ++step / totalSteps));
  const omega = allocate(n * l);
  fillGaussian(omega, seed);
  const y = allocate(m * l);
  op.times(omega, l, y);
  progress();
  const z = omega;
  orthonormalize(y, m, l, q === 0 ? 2 : 1, dense);
  for (let it = 0; it < q; it++) {
    op.timesTranspose(y, l, z);
    progress();
    orthonormalize(z, n, l, 1, dense);
    op.times(z, l, y);
    progress();
    orthonormalize(y, m, l, it === q - 1 ? 2 : 1, dense);
  }
  return { q: y, l, label: `randomized subspace iteration (q=${q}, l=${l})` };
}

/**
 * Below this sigma_k / sigma_1 the Gram (Rayleigh-Ritz on Q^T A A^T Q) finish of the
 * 'randomized' method would lose more than ~eps * 1e6 relative accuracy in sigma_k, so
 * Alg. 5.1's QR-based finish is used instead.
 */
const GRAM_FINISH_MIN_RATIO = 1e-3;

/**
 * 'randomized': Halko, Martinsson & Tropp (2011) Alg. 4.3 (power iteration; random-sign
 * test matrix, see fillRademacher, instead of Gaussian: same range quality, a fraction
 * of the cost of drawing the long side's n x l deviates) with the
 * normalisation of their Sec. 4.5 applied only every second A A^T application (as
 * scikit-learn's randomized_svd skips it for n_iter <= 2; one-pass CholeskyQR on the
 * short side, Householder if it breaks down), so a power iteration costs two sparse
 * products and, at most every other time, O(m l^2) on the short side m. The range is
 * then made orthonormal (CholeskyQR2) and Alg. 5.1 is done through the Gram matrix of
 * B = Q^T A: H = B B^T = Q^T (A (A^T Q)) (two sparse products and an m x l cross
 * product, never a QR or Gram of the long side), H = E diag(sigma^2) E^T (ml-matrix
 * symmetric EVD), U = Q E, V = A^T U diag(1/sigma) (one more sparse product with k
 * columns). Accurate to ~eps (sigma_1 / sigma_i)^2 relative, hence the QR-based finish
 * when sigma_k / sigma_1 < GRAM_FINISH_MIN_RATIO.
 */
function randomizedSubspaceSvd(
  op: BlockOperator,
  k: number,
  l: number,
  q: number,
  seed: number,
  allocate: Allocate,
  options: SvdOptions,
): { u: Float64Array; v: Float64Array; s: Float64Array; label: string } {
  const m = op.rows;
  const dense = op.dense ?? serialRows;
  const n = op.cols;
  const totalSteps = 2 * q + 4;
  let step = 0;
  const progress = () => options.onProgress?.(Math.min(0.99, ++step / totalSteps));
  const z = allocate(n * l);
  fillRademacher(z, seed);
  const y = allocate(m * l);
  op.times(z, l, y);
  progress();
  let normalisations = 0;
  for (let it = 0; it < q; it++) {
    if (it > 0 && it % 2 === 0) {
      orthonormalize(y, m, l, 1, dense);
      normalisations++;
    }
    op.timesTranspose(y, l, z);
    progress();
    op.times(z, l, y);
    progress();
  }
  orthonormalize(y, m, l, 2, dense);
  op.timesTranspose(y, l, z);
  progress();
  const w = allocate(m * l);
  op.times(z, l, w);
  progress();
  const h = new Float64Array(l * l);
  // H = Q^T (A A^T Q) is symmetric: form its upper triangle only and mirror it.
  dense.crossAccumulate(y, l, l, w, l, h, m, true);
  const rows: number[][] = [];
  for (let i = 0; i < l; i++) {
    const row: number[] = new Array(l);
    for (let c = 0; c < l; c++) row[c] = c >= i ? h[i * l + c] : h[c * l + i];
    rows.push(row);
  }
  const evd = new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: true });
  const values = evd.realEigenvalues;
  const order = values.map((_, i) => i).sort((a, b) => values[b] - values[a]);
  const s = new Float64Array(k);
  for (let c = 0; c < k; c++) s[c] = Math.sqrt(Math.max(0, values[order[c]]));
  const label = `randomized subspace iteration (q=${q}, l=${l}, ${normalisations} normalisations`;
  if (!(s[k - 1] > GRAM_FINISH_MIN_RATIO * s[0])) {
    const fin = finishFromRange(op, y, l, k);
    return { ...fin, label: `${label}, QR finish)` };
  }
  const vectors = evd.eigenvectorMatrix;
  const et = new Float64Array(k * l);
  for (let c = 0; c < k; c++) for (let i = 0; i < l; i++) et[c * l + i] = vectors.get(i, order[c]);
  // w and z are spent once H is formed: U and A^T U reuse them (saves (m + n) k numbers).
  const u = w.subarray(0, m * k);
  dense.timesSmall(y, l, et, k, u, m);
  const vk = z.subarray(0, n * k);
  op.timesTranspose(u, k, vk);
  progress();
  const inv = new Float64Array(k);
  for (let c = 0; c < k; c++) inv[c] = 1 / s[c];
  // V = A^T U diag(1/sigma) in place. U and V are returned as they are, possibly views
  // into the operator's shared memory: copying them out would add (m + n) k numbers to
  // the peak (~0.8 GB at 100k documents, k = 300); callers convert them anyway.
  for (let i = 0; i < n; i++) {
    const o = i * k;
    for (let c = 0; c < k; c++) vk[o + c] *= inv[c];
  }
  return { u, v: vk, s, label: `${label}, Gram finish)` };
}

/**
 * Randomized block Krylov range finder (Musco & Musco, "Randomized block Krylov methods
 * for stronger and faster approximate singular value decomposition", NIPS 2015, Alg. 2;
 * block Lanczos with full reorthogonalisation, Golub & Underwood 1977): an orthonormal
 * basis P of [A Omega, (A A^T) A Omega, ..., (A A^T)^(blocks-1) A Omega] built by block
 * classical Gram-Schmidt applied twice, whose coefficients form the projected matrix
 * H = P^T A A^T P for free; the top-l Ritz vectors P E_l are returned.
 */
function blockKrylovRange(
  op: BlockOperator,
  l: number,
  b: number,
  blocks: number,
  seed: number,
  allocate: Allocate,
  onProgress?: (fraction: number) => void,
): { q: Float64Array; l: number; label: string } {
  const m = op.rows;
  const dense = op.dense ?? serialRows;
  const n = op.cols;
  const K = b * blocks;
  const basis = allocate(m * K); // row-major, stride K
  const h = new Float64Array(K * K);
  const zn = allocate(n * b);
  const w = allocate(m * b);
  fillGaussian(zn, seed);
  op.times(zn, b, w);
  orthonormalize(w, m, b, 2, dense);
  const place = (offset: number) => {
    for (let i = 0; i < m; i++) basis.set(w.subarray(i * b, (i + 1) * b), i * K + offset);
  };
  const block = allocate(m * b); // shared when the operator is two-threaded
  place(0);
  const totalSteps = 2 * blocks + 1;
  let step = 1;
  const progress = () => onProgress?.(Math.min(0.99, ++step / totalSteps));
  const project = (width: number, coefficients: Float64Array) => {
    const c = new Float64Array(width * b);
    dense.crossAccumulate(basis, K, width, w, b, c, m);
    const ct = new Float64Array(b * width);
    for (let i = 0; i < width; i++) for (let j = 0; j < b; j++) ct[j * width + i] = c[i * b + j];
    subtractProduct(basis, K, width, ct, w, b, m);
    for (let i = 0; i < c.length; i++) coefficients[i] += c[i];
  };
  for (let j = 0; j < blocks; j++) {
    const offset = j * b;
    for (let i = 0; i < m; i++)
      block.set(basis.subarray(i * K + offset, i * K + offset + b), i * b);
    op.timesTranspose(block, b, zn);
    progress();
    op.times(zn, b, w); // w = A A^T P_j
    progress();
    const width = offset + b;
    const coefficients = new Float64Array(width * b);
    project(width, coefficients);
    if (j < blocks - 1) project(width, coefficients);
    for (let i = 0; i < width; i++) {
      for (let c = 0; c < b; c++) h[i * K + offset + c] = coefficients[i * b + c];
    }
    if (j === blocks - 1) break;
    const { r, method } = orthonormalize(w, m, b, 2, dense);
    if (method === 'householder') {
      // Rank-deficient block (the Krylov space is exhausted): the fresh directions the
      // Householder Q supplies must still be made orthogonal to the basis.
      project(width, new Float64Array(width * b));
      orthonormalize(w, m, b, 2, dense);
    }
    for (let i = 0; i < b; i++)
      for (let c = i; c < b; c++) h[(width + i) * K + offset + c] = r[i * b + c];
    place(width);
  }
  // H is symmetric in exact arithmetic (P^T A A^T P); symmetrise its rounding.
  const rows: number[][] = [];
  for (let i = 0; i < K; i++) {
    const row: number[] = new Array(K);
    for (let c = 0; c < K; c++) row[c] = (h[i * K + c] + h[c * K + i]) / 2;
    rows.push(row);
  }
  const evd = new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: true });
  const values = evd.realEigenvalues;
  const order = values.map((_, i) => i).sort((x, y) => values[y] - values[x]);
  const vectors = evd.eigenvectorMatrix;
  const lOut = Math.min(l, K);
  const et = new Float64Array(lOut * K);
  for (let c = 0; c < lOut; c++)
    for (let i = 0; i < K; i++) et[c * K + i] = vectors.get(i, order[c]);
  const qOut = allocate(m * lOut);
  dense.timesSmall(basis, K, et, lOut, qOut, m);
  return { q: qOut, l: lOut, label: `block Krylov (${blocks} blocks of ${b}, l=${lOut})` };
}

/**
 * Halko et al. Alg. 5.1 from an orthonormal range basis Q (m x l): B^T = A^T Q = Qz Rz,
 * SVD of the small Rz^T = Ub S Vb^T, so A ~ (Q Ub) S (Qz Vb)^T; the top k are kept.
 */
function finishFromRange(
  op: BlockOperator,
  q: Float64Array,
  l: number,
  k: number,
): { u: Float64Array; v: Float64Array; s: Float64Array } {
  const m = op.rows;
  const dense = op.dense ?? serialRows;
  const n = op.cols;
  const z = op.allocate?.(n * l) ?? new Float64Array(n * l);
  op.timesTranspose(q, l, z);
  const { r } = orthonormalize(z, n, l, 2, dense);
  const small = smallSvd(transposeSquare(r, l), l);
  const s = small.s.slice(0, k);
  const ubT = firstColumnsTransposed(small.u, l, k);
  const vbT = firstColumnsTransposed(small.v, l, k);
  const u = new Float64Array(m * k);
  const v = new Float64Array(n * k);
  dense.timesSmall(q, l, ubT, k, u, m);
  dense.timesSmall(z, l, vbT, k, v, n);
  return { u, v, s };
}

function transposeSquare(r: Float64Array, b: number): Float64Array {
  const t = new Float64Array(b * b);
  for (let i = 0; i < b; i++) for (let j = 0; j < b; j++) t[j * b + i] = r[i * b + j];
  return t;
}

/** Columns 0..k-1 of a b x b row-major matrix, as a k x b row-major matrix. */
function firstColumnsTransposed(mat: Float64Array, b: number, k: number): Float64Array {
  const t = new Float64Array(k * b);
  for (let i = 0; i < b; i++) for (let j = 0; j < k; j++) t[j * b + i] = mat[i * b + j];
  return t;
}

/** Full SVD of a small square b x b row-major matrix by ml-matrix (one-sided, Golub-Reinsch). */
export function smallSvd(
  mat: Float64Array,
  b: number,
): { s: Float64Array; u: Float64Array; v: Float64Array } {
  const rows: number[][] = [];
  for (let i = 0; i < b; i++) rows.push(Array.from(mat.subarray(i * b, (i + 1) * b)));
  const svd = new SingularValueDecomposition(new Matrix(rows), { autoTranspose: false });
  const sv = svd.diagonal;
  const order = sv.map((_, i) => i).sort((x, y) => sv[y] - sv[x]);
  const u = new Float64Array(b * b);
  const v = new Float64Array(b * b);
  const s = new Float64Array(b);
  const um = svd.leftSingularVectors;
  const vm = svd.rightSingularVectors;
  order.forEach((src, dst) => {
    s[dst] = Math.max(0, sv[src]);
    for (let i = 0; i < b; i++) {
      u[i * b + dst] = um.get(i, src);
      v[i * b + dst] = vm.get(i, src);
    }
  });
  return { s, u, v };
}

// ---------------------------------------------------------------------------------
// Golub-Kahan-Lanczos bidiagonalisation with full reorthogonalisation.

function dot(x: Float64Array, y: Float64Array): number {
  let s = 0;
  for (let i = 0; i < x.length; i++) s += x[i] * y[i];
  return s;
}

/** x -= sum_j (x . basis_j) basis_j, twice (classical Gram-Schmidt with reorthogonalisation). */
function reorthogonalize(x: Float64Array, basis: Float64Array[]): void {
  for (let pass = 0; pass < 2; pass++) {
    for (const w of basis) {
      const c = dot(x, w);
      for (let i = 0; i < x.length; i++) x[i] -= c * w[i];
    }
  }
}

function normalizeInPlace(x: Float64Array): number {
  const norm = Math.sqrt(dot(x, x));
  if (norm > 0) for (let i = 0; i < x.length; i++) x[i] /= norm;
  return norm;
}

export function lanczosSvd(a: CsrMatrix, options: SvdOptions): TruncatedSvd {
  const started = performance.now();
  const { k } = options;
  validateK(k, a.rows, a.cols);
  const at = transposeCsr(a);
  const minDim = Math.min(a.rows, a.cols);
  const tol = options.tolerance ?? 1e-10;
  const rand = mulberry32(options.seed ?? 0x5eed);
  const randomUnit = (len: number, against: Float64Array[]): Float64Array => {
    for (let attempt = 0; attempt < 5; attempt++) {
      const x = new Float64Array(len);
      fillGaussian(x, Math.floor(rand() * 2 ** 31));
      reorthogonalize(x, against);
      if (normalizeInPlace(x) > 1e-8) return x;
    }
    throw new Error('Lanczos could not find a new direction orthogonal to the basis');
  };
  const vs: Float64Array[] = []; // right vectors, length cols
  const us: Float64Array[] = []; // left vectors, length rows
  const alpha: number[] = [];
  const beta: number[] = []; // beta[j] couples step j and j+1 (superdiagonal)
  let v = randomUnit(a.cols, []);
  let target = Math.min(minDim, Math.max(2 * k + 10, k + 20));
  let prevBeta = 0;
  for (;;) {
    while (vs.length < target) {
      vs.push(v);
      const u = new Float64Array(a.rows);
      csrTimesVector(a, v, u);
      if (us.length > 0) {
        const last = us[us.length - 1];
        for (let i = 0; i < u.length; i++) u[i] -= prevBeta * last[i];
      }
      reorthogonalize(u, us);
      let al = normalizeInPlace(u);
      if (al < 1e-13 * Math.max(1, alpha[0] ?? 1)) {
        // Invariant subspace found: continue from a fresh orthogonal direction.
        al = 0;
        const fresh = us.length < a.rows ? randomUnit(a.rows, us) : new Float64Array(a.rows);
        u.set(fresh);
      }
      us.push(u);
      alpha.push(al);
      if (vs.length === minDim) break;
      const next = new Float64Array(a.cols);
      csrTimesVector(at, u, next);
      for (let i = 0; i < next.length; i++) next[i] -= al * v[i];
      reorthogonalize(next, vs);
      let be = normalizeInPlace(next);
      if (be < 1e-13 * Math.max(1, alpha[0])) {
        be = 0;
        next.set(randomUnit(a.cols, vs));
      }
      beta.push(be);
      prevBeta = be;
      v = next;
      options.onProgress?.(Math.min(0.99, vs.length / target));
    }
    const m = vs.length;
    const bd = new Float64Array(m * m);
    for (let j = 0; j < m; j++) {
      bd[j * m + j] = alpha[j];
      if (j + 1 < m) bd[j * m + j + 1] = beta[j];
    }
    const small = smallSvd(bd, m);
    // Residual of Ritz triplet i: |beta_m * (last row of the left factor)| (Bjorck 1996).
    const betaM = m < minDim ? (beta[m - 1] ?? 0) : 0;
    let converged = true;
    for (let i = 0; i < k; i++) {
      if (Math.abs(betaM * small.u[(m - 1) * m + i]) > tol * small.s[0]) converged = false;
    }
    if (converged || m >= minDim) {
      const U = new Float64Array(a.rows * k);
      const V = new Float64Array(a.cols * k);
      for (let j = 0; j < m; j++) {
        const uj = us[j];
        const vj = vs[j];
        for (let c = 0; c < k; c++) {
          const pu = small.u[j * m + c];
          const pv = small.v[j * m + c];
          for (let i = 0; i < a.rows; i++) U[i * k + c] += uj[i] * pu;
          for (let i = 0; i < a.cols; i++) V[i * k + c] += vj[i] * pv;
        }
      }
      options.onProgress?.(1);
      return {
        k,
        rows: a.rows,
        cols: a.cols,
        s: small.s.slice(0, k),
        U,
        V,
        ms: performance.now() - started,
        method: `lanczos (${m} steps)`,
      };
    }
    target = Math.min(minDim, Math.ceil(m * 1.5));
  }
}
