// Dense kernels for tall-skinny blocks stored row-major (n x b: element (i, j) at
// i*b + j), the layout the CSR gather loop reads. Orthonormalisation is CholeskyQR2
// (Fukaya, Nakatsukasa, Yanagisawa & Yamamoto 2014; Yamamoto et al. 2015) with a
// Householder QR fallback (Golub & Van Loan, Matrix Computations, 4th ed., 5.2.1)
// when the Gram matrix is too ill-conditioned for Cholesky.

export const GRAM_CHUNK = 64;

/**
 * Upper triangle (and, after the call, the full symmetric matrix) of G += Y^T Y over
 * rows [rowStart, rowEnd). Rows are transposed a chunk at a time so each Gram entry
 * is a contiguous dot product; a 4 x 2 block of entries is formed per pass (six loads,
 * eight multiply-adds: ~1.6x the 4 x 1 block's rate in V8, measured).
 */
export function gramAccumulate(
  y: Float64Array,
  b: number,
  g: Float64Array,
  rowStart: number,
  rowEnd: number,
  scratch?: Float64Array,
): void {
  const t =
    scratch && scratch.length >= b * GRAM_CHUNK ? scratch : new Float64Array(b * GRAM_CHUNK);
  for (let r0 = rowStart; r0 < rowEnd; r0 += GRAM_CHUNK) {
    const len = Math.min(GRAM_CHUNK, rowEnd - r0);
    for (let r = 0; r < len; r++) {
      const yo = (r0 + r) * b;
      for (let a = 0; a < b; a++) t[a * GRAM_CHUNK + r] = y[yo + a];
    }
    let a = 0;
    for (; a + 3 < b; a += 4) {
      const a0 = a * GRAM_CHUNK;
      const a1 = a0 + GRAM_CHUNK;
      const a2 = a1 + GRAM_CHUNK;
      const a3 = a2 + GRAM_CHUNK;
      let c = a;
      for (; c + 1 < b; c += 2) {
        const co = c * GRAM_CHUNK;
        const co1 = co + GRAM_CHUNK;
        let s0 = 0;
        let s1 = 0;
        let s2 = 0;
        let s3 = 0;
        let u0 = 0;
        let u1 = 0;
        let u2 = 0;
        let u3 = 0;
        for (let r = 0; r < len; r++) {
          const v = t[co + r];
          const w = t[co1 + r];
          const x0 = t[a0 + r];
          const x1 = t[a1 + r];
          const x2 = t[a2 + r];
          const x3 = t[a3 + r];
          s0 += x0 * v;
          s1 += x1 * v;
          s2 += x2 * v;
          s3 += x3 * v;
          u0 += x0 * w;
          u1 += x1 * w;
          u2 += x2 * w;
          u3 += x3 * w;
        }
        g[a * b + c] += s0;
        g[(a + 1) * b + c] += s1;
        g[(a + 2) * b + c] += s2;
        g[(a + 3) * b + c] += s3;
        g[a * b + c + 1] += u0;
        g[(a + 1) * b + c + 1] += u1;
        g[(a + 2) * b + c + 1] += u2;
        g[(a + 3) * b + c + 1] += u3;
      }
      for (; c < b; c++) {
        const co = c * GRAM_CHUNK;
        let s0 = 0;
        let s1 = 0;
        let s2 = 0;
        let s3 = 0;
        for (let r = 0; r < len; r++) {
          const v = t[co + r];
          s0 += t[a0 + r] * v;
          s1 += t[a1 + r] * v;
          s2 += t[a2 + r] * v;
          s3 += t[a3 + r] * v;
        }
        g[a * b + c] += s0;
        g[(a + 1) * b + c] += s1;
        g[(a + 2) * b + c] += s2;
        g[(a + 3) * b + c] += s3;
      }
    }
    for (; a < b; a++) {
      const ao = a * GRAM_CHUNK;
      for (let c = a; c < b; c++) {
        const co = c * GRAM_CHUNK;
        let s = 0;
        for (let r = 0; r < len; r++) s += t[ao + r] * t[co + r];
        g[a * b + c] += s;
      }
    }
  }
}

/** Copies the upper triangle of a b x b row-major matrix onto its lower triangle. */
export function symmetrizeFromUpper(g: Float64Array, b: number): void {
  for (let a = 0; a < b; a++) for (let c = a + 1; c < b; c++) g[c * b + a] = g[a * b + c];
}

export function gram(y: Float64Array, n: number, b: number): Float64Array {
  const g = new Float64Array(b * b);
  gramAccumulate(y, b, g, 0, n);
  symmetrizeFromUpper(g, b);
  return g;
}

/**
 * out[rowStart..rowEnd) = Y M for Y (n x b) and a small M given TRANSPOSED as mt
 * (m x b, row j = column j of M). With `upper`, M is upper triangular and column j
 * only sums i <= j. A 4 x 2 block of outputs is formed at a time (~1.6x the 4 x 1
 * block's rate in V8, measured); out may be y itself (m === b).
 */
export function timesSmall(
  y: Float64Array,
  b: number,
  mt: Float64Array,
  m: number,
  out: Float64Array,
  rowStart: number,
  rowEnd: number,
  upper = false,
): void {
  const tmp = new Float64Array(4 * m);
  let r = rowStart;
  for (; r + 3 < rowEnd; r += 4) {
    const y0 = r * b;
    const y1 = y0 + b;
    const y2 = y1 + b;
    const y3 = y2 + b;
    let j = 0;
    for (; j + 1 < m; j += 2) {
      const mo = j * b;
      const mo1 = mo + b;
      // With `upper`, column j + 1 sums one more term than column j: the pair sums
      // j + 2 terms and column j's extra one is mt[mo + j + 1], an exact zero.
      const lim = upper ? Math.min(b, j + 2) : b;
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      let u0 = 0;
      let u1 = 0;
      let u2 = 0;
      let u3 = 0;
      for (let i = 0; i < lim; i++) {
        const v = mt[mo + i];
        const w = mt[mo1 + i];
        const x0 = y[y0 + i];
        const x1 = y[y1 + i];
        const x2 = y[y2 + i];
        const x3 = y[y3 + i];
        s0 += x0 * v;
        s1 += x1 * v;
        s2 += x2 * v;
        s3 += x3 * v;
        u0 += x0 * w;
        u1 += x1 * w;
        u2 += x2 * w;
        u3 += x3 * w;
      }
      tmp[j] = s0;
      tmp[m + j] = s1;
      tmp[2 * m + j] = s2;
      tmp[3 * m + j] = s3;
      tmp[j + 1] = u0;
      tmp[m + j + 1] = u1;
      tmp[2 * m + j + 1] = u2;
      tmp[3 * m + j + 1] = u3;
    }
    for (; j < m; j++) {
      const mo = j * b;
      const lim = upper ? j + 1 : b;
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      for (let i = 0; i < lim; i++) {
        const v = mt[mo + i];
        s0 += y[y0 + i] * v;
        s1 += y[y1 + i] * v;
        s2 += y[y2 + i] * v;
        s3 += y[y3 + i] * v;
      }
      tmp[j] = s0;
      tmp[m + j] = s1;
      tmp[2 * m + j] = s2;
      tmp[3 * m + j] = s3;
    }
    out.set(tmp, r * m);
  }
  for (; r < rowEnd; r++) {
    const yo = r * b;
    for (let j = 0; j < m; j++) {
      const mo = j * b;
      const lim = upper ? j + 1 : b;
      let s = 0;
      for (let i = 0; i < lim; i++) s += y[yo + i] * mt[mo + i];
      tmp[j] = s;
    }
    out.set(tmp.subarray(0, m), r * m);
  }
}

/**
 * The tall-block kernels over all n rows, as an object so that a caller with a second
 * thread (server/engine/linalg/parallel.ts) can supply row-split versions.
 */
export interface DenseRows {
  gram(y: Float64Array, n: number, b: number): Float64Array;
  /** timesSmall over rows [0, n). */
  timesSmall(
    y: Float64Array,
    b: number,
    mt: Float64Array,
    m: number,
    out: Float64Array,
    n: number,
    upper?: boolean,
  ): void;
  /** crossAccumulate over rows [0, n). */
  crossAccumulate(
    x: Float64Array,
    strideX: number,
    w: number,
    z: Float64Array,
    b: number,
    c: Float64Array,
    n: number,
    upperOnly?: boolean,
  ): void;
}

export const serialRows: DenseRows = {
  gram,
  timesSmall: (y, b, mt, m, out, n, upper) => timesSmall(y, b, mt, m, out, 0, n, upper),
  crossAccumulate: (x, strideX, w, z, b, c, n, upperOnly) =>
    crossAccumulate(x, strideX, w, z, b, c, 0, n, upperOnly),
};

/**
 * Cholesky factor R (upper, row-major) with G = R^T R, or null when a pivot is not
 * safely positive (G numerically singular for this purpose).
 */
export function choleskyUpper(g: Float64Array, b: number, relTol = 1e-14): Float64Array | null {
  const r = new Float64Array(b * b);
  let maxDiag = 0;
  for (let i = 0; i < b; i++) maxDiag = Math.max(maxDiag, g[i * b + i]);
  if (!(maxDiag > 0)) return null;
  for (let j = 0; j < b; j++) {
    let d = g[j * b + j];
    for (let k = 0; k < j; k++) d -= r[k * b + j] * r[k * b + j];
    if (!(d > relTol * maxDiag)) return null;
    const rjj = Math.sqrt(d);
    r[j * b + j] = rjj;
    for (let c = j + 1; c < b; c++) {
      let s = g[j * b + c];
      for (let k = 0; k < j; k++) s -= r[k * b + j] * r[k * b + c];
      r[j * b + c] = s / rjj;
    }
  }
  return r;
}

/** Inverse of an upper-triangular R, returned transposed (row j = column j of R^-1). */
export function upperInverseTransposed(r: Float64Array, b: number): Float64Array {
  const inv = new Float64Array(b * b); // row-major R^-1 (upper)
  for (let j = b - 1; j >= 0; j--) {
    inv[j * b + j] = 1 / r[j * b + j];
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let k = i + 1; k <= j; k++) s += r[i * b + k] * inv[k * b + j];
      inv[i * b + j] = -s / r[i * b + i];
    }
  }
  const t = new Float64Array(b * b);
  for (let i = 0; i < b; i++) for (let j = i; j < b; j++) t[j * b + i] = inv[i * b + j];
  return t;
}

export interface OrthonormalizeResult {
  /** Upper-triangular R with Y = Q R, row-major b x b. */
  r: Float64Array;
  method: 'cholesky-qr' | 'cholesky-qr2' | 'householder';
}

/**
 * Overwrites Y (n x b) with an orthonormal Q spanning its columns and returns R.
 * passes = 2 is CholeskyQR2 (orthogonality near machine precision while
 * cond(Y) < ~1e7); passes = 1 is enough between power iterations, where the block only
 * needs to stay well-conditioned. Falls back to Householder when Cholesky breaks down.
 */
export function orthonormalize(
  y: Float64Array,
  n: number,
  b: number,
  passes: 1 | 2 = 2,
  rows: DenseRows = serialRows,
): OrthonormalizeResult {
  const g1 = rows.gram(y, n, b);
  const r1 = choleskyUpper(g1, b);
  if (!r1 || n < b) return { r: householderQr(y, n, b), method: 'householder' };
  // A first Cholesky pass amplifies errors by cond(R)^2; if the diagonal already shows a
  // condition above ~1e7 the second pass cannot repair it, so go straight to Householder.
  if (passes === 2 && diagConditionEstimate(r1, b) > 1e7) {
    return { r: householderQr(y, n, b), method: 'householder' };
  }
  rows.timesSmall(y, b, upperInverseTransposed(r1, b), b, y, n, true);
  if (passes === 1) return { r: r1, method: 'cholesky-qr' };
  const g2 = rows.gram(y, n, b);
  let offIdentity = 0;
  for (let i = 0; i < b; i++) {
    for (let j = 0; j < b; j++)
      offIdentity = Math.max(offIdentity, Math.abs(g2[i * b + j] - (i === j ? 1 : 0)));
  }
  const r2 = offIdentity < 0.5 ? choleskyUpper(g2, b) : null;
  if (!r2) {
    // Q1 = Y R1^-1 is too far from orthonormal: restore Y = Q1 R1 and use Householder.
    const r1t = new Float64Array(b * b);
    for (let i = 0; i < b; i++) for (let j = i; j < b; j++) r1t[j * b + i] = r1[i * b + j];
    rows.timesSmall(y, b, r1t, b, y, n, true);
    return { r: householderQr(y, n, b), method: 'householder' };
  }
  rows.timesSmall(y, b, upperInverseTransposed(r2, b), b, y, n, true);
  return { r: multiplyUpper(r2, r1, b), method: 'cholesky-qr2' };
}

function diagConditionEstimate(r: Float64Array, b: number): number {
  let max = 0;
  let min = Infinity;
  for (let i = 0; i < b; i++) {
    const d = Math.abs(r[i * b + i]);
    max = Math.max(max, d);
    min = Math.min(min, d);
  }
  return max / min;
}

/** Product of two upper-triangular row-major matrices. */
function multiplyUpper(a: Float64Array, c: Float64Array, b: number): Float64Array {
  const out = new Float64Array(b * b);
  for (let i = 0; i < b; i++) {
    for (let j = i; j < b; j++) {
      let s = 0;
      for (let k = i; k <= j; k++) s += a[i * b + k] * c[k * b + j];
      out[i * b + j] = s;
    }
  }
  return out;
}

/**
 * Householder QR (Golub & Van Loan, Alg. 5.2.1) of Y (n x b, row-major), overwriting Y
 * with the thin Q (n x b) and returning R (b x b). Works column-major internally so
 * reflector updates run over contiguous memory. Q is orthonormal even when Y is rank
 * deficient.
 */
export function householderQr(y: Float64Array, n: number, b: number): Float64Array {
  if (n < b) throw new RangeError(`Householder QR needs rows >= columns, got ${n} x ${b}`);
  const a = new Float64Array(n * b); // column-major copy: column j at j*n
  for (let i = 0; i < n; i++) for (let j = 0; j < b; j++) a[j * n + i] = y[i * b + j];
  const tau = new Float64Array(b);
  const r = new Float64Array(b * b);
  for (let j = 0; j < b; j++) {
    const cj = j * n;
    let norm = 0;
    for (let i = j; i < n; i++) norm += a[cj + i] * a[cj + i];
    norm = Math.sqrt(norm);
    const alpha = a[cj + j] >= 0 ? -norm : norm;
    if (norm === 0) {
      tau[j] = 0;
    } else {
      // v = x - alpha e1, stored in place with v_j = x_j - alpha; tau = 2 / (v^T v).
      a[cj + j] -= alpha;
      let vv = 0;
      for (let i = j; i < n; i++) vv += a[cj + i] * a[cj + i];
      tau[j] = vv > 0 ? 2 / vv : 0;
      for (let c = j + 1; c < b; c++) {
        const cc = c * n;
        let s = 0;
        for (let i = j; i < n; i++) s += a[cj + i] * a[cc + i];
        s *= tau[j];
        for (let i = j; i < n; i++) a[cc + i] -= s * a[cj + i];
      }
    }
    r[j * b + j] = alpha;
    for (let c = j + 1; c < b; c++) r[j * b + c] = a[c * n + j];
  }
  // Form Q = H_0 H_1 ... H_{b-1} [I_b; 0], column by column, into column-major q.
  const q = new Float64Array(n * b);
  for (let c = 0; c < b; c++) q[c * n + c] = 1;
  for (let j = b - 1; j >= 0; j--) {
    if (tau[j] === 0) continue;
    const cj = j * n;
    for (let c = j; c < b; c++) {
      const cc = c * n;
      let s = 0;
      for (let i = j; i < n; i++) s += a[cj + i] * q[cc + i];
      s *= tau[j];
      for (let i = j; i < n; i++) q[cc + i] -= s * a[cj + i];
    }
  }
  for (let i = 0; i < n; i++) for (let j = 0; j < b; j++) y[i * b + j] = q[j * n + i];
  return r;
}

/**
 * C (w x b, row-major) += X[:, 0:w]^T Z over rows [rowStart, rowEnd), where X is n x
 * strideX (its first w columns used) and Z is n x b. Chunked transposition as in
 * gramAccumulate, so each entry is a contiguous dot product. With upperOnly, only
 * entries j >= a - 3 (rounded to the blocks of four) are formed: enough for the upper
 * triangle of a product known to be symmetric.
 */
export function crossAccumulate(
  x: Float64Array,
  strideX: number,
  w: number,
  z: Float64Array,
  b: number,
  c: Float64Array,
  rowStart: number,
  rowEnd: number,
  upperOnly = false,
): void {
  const R = GRAM_CHUNK;
  const xt = new Float64Array(w * R);
  const zt = new Float64Array(b * R);
  for (let r0 = rowStart; r0 < rowEnd; r0 += R) {
    const len = Math.min(R, rowEnd - r0);
    for (let r = 0; r < len; r++) {
      const xo = (r0 + r) * strideX;
      const zo = (r0 + r) * b;
      for (let a = 0; a < w; a++) xt[a * R + r] = x[xo + a];
      for (let j = 0; j < b; j++) zt[j * R + r] = z[zo + j];
    }
    let a = 0;
    for (; a + 3 < w; a += 4) {
      const a0 = a * R;
      const a1 = a0 + R;
      const a2 = a1 + R;
      const a3 = a2 + R;
      let j = upperOnly ? a : 0;
      for (; j + 1 < b; j += 2) {
        const jo = j * R;
        const jo1 = jo + R;
        let s0 = 0;
        let s1 = 0;
        let s2 = 0;
        let s3 = 0;
        let u0 = 0;
        let u1 = 0;
        let u2 = 0;
        let u3 = 0;
        for (let r = 0; r < len; r++) {
          const v = zt[jo + r];
          const w = zt[jo1 + r];
          const x0 = xt[a0 + r];
          const x1 = xt[a1 + r];
          const x2 = xt[a2 + r];
          const x3 = xt[a3 + r];
          s0 += x0 * v;
          s1 += x1 * v;
          s2 += x2 * v;
          s3 += x3 * v;
          u0 += x0 * w;
          u1 += x1 * w;
          u2 += x2 * w;
          u3 += x3 * w;
        }
        c[a * b + j] += s0;
        c[(a + 1) * b + j] += s1;
        c[(a + 2) * b + j] += s2;
        c[(a + 3) * b + j] += s3;
        c[a * b + j + 1] += u0;
        c[(a + 1) * b + j + 1] += u1;
        c[(a + 2) * b + j + 1] += u2;
        c[(a + 3) * b + j + 1] += u3;
      }
      for (; j < b; j++) {
        const jo = j * R;
        let s0 = 0;
        let s1 = 0;
        let s2 = 0;
        let s3 = 0;
        for (let r = 0; r < len; r++) {
          const v = zt[jo + r];
          s0 += xt[a0 + r] * v;
          s1 += xt[a1 + r] * v;
          s2 += xt[a2 + r] * v;
          s3 += xt[a3 + r] * v;
        }
        c[a * b + j] += s0;
        c[(a + 1) * b + j] += s1;
        c[(a + 2) * b + j] += s2;
        c[(a + 3) * b + j] += s3;
      }
    }
    for (; a < w; a++) {
      const ao = a * R;
      for (let j = upperOnly ? a : 0; j < b; j++) {
        const jo = j * R;
        let s = 0;
        for (let r = 0; r < len; r++) s += xt[ao + r] * zt[jo + r];
        c[a * b + j] += s;
      }
    }
  }
}

/**
 * Z (n x b) -= X[:, 0:w] C for X n x strideX and C given TRANSPOSED as ct (b x w):
 * one block classical Gram-Schmidt update. Four rows at a time, dot-product form.
 */
export function subtractProduct(
  x: Float64Array,
  strideX: number,
  w: number,
  ct: Float64Array,
  z: Float64Array,
  b: number,
  n: number,
): void {
  let r = 0;
  for (; r + 3 < n; r += 4) {
    const x0 = r * strideX;
    const x1 = x0 + strideX;
    const x2 = x1 + strideX;
    const x3 = x2 + strideX;
    for (let j = 0; j < b; j++) {
      const co = j * w;
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      for (let i = 0; i < w; i++) {
        const v = ct[co + i];
        s0 += x[x0 + i] * v;
        s1 += x[x1 + i] * v;
        s2 += x[x2 + i] * v;
        s3 += x[x3 + i] * v;
      }
      z[r * b + j] -= s0;
      z[(r + 1) * b + j] -= s1;
      z[(r + 2) * b + j] -= s2;
      z[(r + 3) * b + j] -= s3;
    }
  }
  for (; r < n; r++) {
    const xo = r * strideX;
    for (let j = 0; j < b; j++) {
      const co = j * w;
      let s = 0;
      for (let i = 0; i < w; i++) s += x[xo + i] * ct[co + i];
      z[r * b + j] -= s;
    }
  }
}
