// L2-regularised logistic regression, fitted by a truncated Newton method (Newton
// steps solved by conjugate gradients over Hessian-vector products, with a
// backtracking line search; Nocedal & Wright, Numerical Optimization, 2nd ed.,
// algorithm 7.1; the same scheme as Lin, Weng & Keerthi, "Trust region Newton
// method for large-scale logistic regression", JMLR 2008). The design matrix is
// sparse (CSR) so a document's dense concept vector and its few strongest terms
// share one row. On small problems CG solves each Newton system exactly, so it is
// plain Newton's method (IRLS).
//
// Objective, labels y in {0, 1}, bias b unpenalised:
//   f(w, b) = sum_i c_i [log(1 + e^{z_i}) - y_i z_i] + (lambda / 2) ||w||^2,  z_i = x_i.w + b

export interface SparseRows {
  nRows: number;
  nCols: number;
  indptr: Int32Array;
  indices: Int32Array;
  values: Float64Array;
}

export interface LogisticOptions {
  /** L2 penalty lambda (default 1). */
  lambda?: number;
  /** Stop when the gradient's largest entry is below this (default 1e-10). */
  tolerance?: number;
  maxIterations?: number;
  /** Per-example weights c_i (default 1). */
  sampleWeights?: ArrayLike<number>;
  /** Fit an intercept (default true). */
  intercept?: boolean;
  /** Conjugate-gradient steps per Newton step at most (default 100; truncated Newton). */
  maxCgIterations?: number;
  /** Start from these weights and bias (a warm start from the previous model). */
  initial?: { weights: ArrayLike<number>; bias: number };
}

export interface LogisticModel {
  weights: Float64Array;
  bias: number;
  lambda: number;
  iterations: number;
  /** max |gradient| at the returned point. */
  gradientNorm: number;
  objective: number;
}

/** log(1 + e^z) without overflow. */
function softplus(z: number): number {
  return z > 0 ? z + Math.log1p(Math.exp(-z)) : Math.log1p(Math.exp(z));
}

function sigmoid(z: number): number {
  if (z >= 0) return 1 / (1 + Math.exp(-z));
  const e = Math.exp(z);
  return e / (1 + e);
}

export function checkRows(x: SparseRows): void {
  if (x.indptr.length !== x.nRows + 1) throw new RangeError('indptr must have nRows + 1 entries');
  const nnz = x.indptr[x.nRows];
  if (x.indices.length < nnz || x.values.length < nnz)
    throw new RangeError('indices and values must hold indptr[nRows] entries');
  for (let p = 0; p < nnz; p++)
    if (x.indices[p] < 0 || x.indices[p] >= x.nCols)
      throw new RangeError(`column ${x.indices[p]} outside 0..${x.nCols - 1}`);
}

/** z = X w + b. */
export function linearScores(x: SparseRows, w: ArrayLike<number>, b: number, out?: Float64Array) {
  const z = out ?? new Float64Array(x.nRows);
  for (let i = 0; i < x.nRows; i++) {
    let s = b;
    for (let p = x.indptr[i]; p < x.indptr[i + 1]; p++) s += x.values[p] * w[x.indices[p]];
    z[i] = s;
  }
  return z;
}

/** out += X^T r. */
function addTransposeProduct(x: SparseRows, r: Float64Array, out: Float64Array): void {
  for (let i = 0; i < x.nRows; i++) {
    const ri = r[i];
    if (ri === 0) continue;
    for (let p = x.indptr[i]; p < x.indptr[i + 1]; p++) out[x.indices[p]] += x.values[p] * ri;
  }
}

export interface LogisticProblem {
  x: SparseRows;
  y: ArrayLike<number>;
  lambda: number;
  c: ArrayLike<number> | null;
  intercept: boolean;
}

/** The objective and its gradient ([w; b], length nCols + 1) at (w, b). */
export function logisticObjective(
  problem: LogisticProblem,
  w: Float64Array,
  b: number,
): { value: number; gradient: Float64Array; probabilities: Float64Array } {
  const { x, y, lambda, c } = problem;
  const z = linearScores(x, w, b);
  const residual = new Float64Array(x.nRows);
  let value = 0;
  for (let i = 0; i < x.nRows; i++) {
    const ci = c ? c[i] : 1;
    value += ci * (softplus(z[i]) - y[i] * z[i]);
    const p = sigmoid(z[i]);
    z[i] = p;
    residual[i] = ci * (p - y[i]);
  }
  const gradient = new Float64Array(x.nCols + 1);
  addTransposeProduct(x, residual, gradient);
  let wSq = 0;
  for (let j = 0; j < x.nCols; j++) {
    gradient[j] += lambda * w[j];
    wSq += w[j] * w[j];
  }
  value += 0.5 * lambda * wSq;
  if (problem.intercept) for (let i = 0; i < x.nRows; i++) gradient[x.nCols] += residual[i];
  return { value, gradient, probabilities: z };
}

function maxAbs(v: Float64Array): number {
  let m = 0;
  for (const a of v) m = Math.max(m, Math.abs(a));
  return m;
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

export function fitLogistic(
  x: SparseRows,
  y: ArrayLike<number>,
  options: LogisticOptions = {},
): LogisticModel {
  checkRows(x);
  if (y.length !== x.nRows) throw new RangeError(`${y.length} labels for ${x.nRows} rows`);
  for (let i = 0; i < y.length; i++)
    if (y[i] !== 0 && y[i] !== 1) throw new RangeError(`label ${i} must be 0 or 1, got ${y[i]}`);
  const lambda = options.lambda ?? 1;
  if (!(lambda > 0)) throw new RangeError(`lambda must be positive, got ${lambda}`);
  const intercept = options.intercept ?? true;
  if (intercept) {
    let positives = 0;
    for (let i = 0; i < y.length; i++) positives += y[i];
    if (positives === 0 || positives === y.length)
      throw new RangeError('training needs examples of both labels');
  }
  const c = options.sampleWeights ?? null;
  if (c && c.length !== x.nRows) throw new RangeError('one sample weight per row');
  const problem: LogisticProblem = { x, y, lambda, c, intercept };
  const tolerance = options.tolerance ?? 1e-10;
  const maxIterations = options.maxIterations ?? 100;
  const d = x.nCols;
  let w = new Float64Array(d);
  let b = 0;
  if (options.initial) {
    if (options.initial.weights.length !== d)
      throw new RangeError(`initial weights must have ${d} values`);
    w = Float64Array.from(options.initial.weights);
    b = intercept ? options.initial.bias : 0;
  }
  let state = logisticObjective(problem, w, b);
  let iterations = 0;
  const curvature = new Float64Array(x.nRows);
  const xv = new Float64Array(x.nRows);
  const diagonal = new Float64Array(d + 1);
  const cgLimit = Math.min(2 * (d + 1), options.maxCgIterations ?? 100);
  // Hessian-vector product: H v = X~^T D X~ v + lambda [v_w; 0], X~ = [X 1].
  const hessianTimes = (v: Float64Array, out: Float64Array) => {
    linearScores(x, v, intercept ? v[d] : 0, xv);
    for (let i = 0; i < x.nRows; i++) xv[i] *= curvature[i];
    out.fill(0);
    addTransposeProduct(x, xv, out);
    for (let j = 0; j < d; j++) out[j] += lambda * v[j];
    if (intercept) {
      let s = 0;
      for (let i = 0; i < x.nRows; i++) s += xv[i];
      out[d] = s;
    } else out[d] = 0;
  };
  while (maxAbs(state.gradient) > tolerance && iterations < maxIterations) {
    iterations++;
    for (let i = 0; i < x.nRows; i++) {
      const p = state.probabilities[i];
      curvature[i] = (c ? c[i] : 1) * p * (1 - p);
    }
    // Jacobi preconditioner: the Hessian's diagonal, sum_i D_i x_ij^2 + lambda.
    diagonal.fill(0);
    for (let i = 0; i < x.nRows; i++)
      for (let p = x.indptr[i]; p < x.indptr[i + 1]; p++)
        diagonal[x.indices[p]] += curvature[i] * x.values[p] * x.values[p];
    for (let j = 0; j < d; j++) diagonal[j] += lambda;
    let dSum = 0;
    for (let i = 0; i < x.nRows; i++) dSum += curvature[i];
    diagonal[d] = intercept && dSum > 0 ? dSum : 1;
    // Preconditioned conjugate gradients on H s = -g, to a residual of
    // min(0.5, sqrt(|g|)) * |g| (the forcing term of Nocedal & Wright 7.1).
    const g = state.gradient;
    const gNorm = Math.sqrt(dot(g, g));
    const target = Math.min(0.5, Math.sqrt(gNorm)) * gNorm;
    const s = new Float64Array(d + 1);
    const r = Float64Array.from(g, (v) => -v);
    if (!intercept) r[d] = 0;
    const zr = Float64Array.from(r, (v, j) => v / diagonal[j]);
    const direction = zr.slice();
    const hp = new Float64Array(d + 1);
    let rz = dot(r, zr);
    let rr = dot(r, r);
    for (let it = 0; it < cgLimit && Math.sqrt(rr) > target; it++) {
      hessianTimes(direction, hp);
      const curv = dot(direction, hp);
      if (!(curv > 0)) break;
      const alpha = rz / curv;
      for (let j = 0; j <= d; j++) {
        s[j] += alpha * direction[j];
        r[j] -= alpha * hp[j];
        zr[j] = r[j] / diagonal[j];
      }
      const rzNext = dot(r, zr);
      const beta = rzNext / rz;
      rz = rzNext;
      rr = dot(r, r);
      for (let j = 0; j <= d; j++) direction[j] = zr[j] + beta * direction[j];
    }
    if (dot(s, s) === 0) for (let j = 0; j <= d; j++) s[j] = -g[j];
    // Backtracking (Armijo) line search from the full Newton step.
    const slope = dot(g, s);
    let step = 1;
    let next = state;
    let nextW = w;
    let nextB = b;
    // Near the optimum the decrease falls below float64 resolution of f; a step that
    // leaves f unchanged to that resolution and shrinks the gradient is taken too.
    const noise = 1e-13 * Math.max(1, Math.abs(state.value));
    let accepted = false;
    for (let tries = 0; tries < 40; tries++) {
      nextW = Float64Array.from(w, (v, j) => v + step * s[j]);
      nextB = intercept ? b + step * s[d] : 0;
      next = logisticObjective(problem, nextW, nextB);
      if (
        next.value <= state.value + 1e-4 * step * slope ||
        (next.value <= state.value + noise && maxAbs(next.gradient) < maxAbs(state.gradient))
      ) {
        accepted = true;
        break;
      }
      step /= 2;
    }
    if (!accepted) break; // no further progress in float64
    w = nextW;
    b = nextB;
    state = next;
  }
  return {
    weights: w,
    bias: b,
    lambda,
    iterations,
    gradientNorm: maxAbs(state.gradient),
    objective: state.value,
  };
}

/** P(y = 1 | x) for each row. */
export function predictProbabilities(model: LogisticModel, x: SparseRows): Float64Array {
  const z = linearScores(x, model.weights, model.bias);
  for (let i = 0; i < z.length; i++) z[i] = sigmoid(z[i]);
  return z;
}
