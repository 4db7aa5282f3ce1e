// What each concept dimension is about: for the SVD A ~ U_k S_k V_k^T, column c of U_k
// gives every term's loading on dimension c and column c of V_k every document's
// (Deerwester et al. 1990, section 3: terms and documents share the k-dimensional
// space). The sign of a singular-vector pair is arbitrary (u_c, v_c and -u_c, -v_c are
// both valid), so a dimension reads as a contrast between its two ends.

export interface Loading {
  /** Row index (term id or document position). */
  index: number;
  value: number;
}

/**
 * The `n` largest and `n` most negative entries of column `col` of a row-major
 * matrix with `rows` rows and `stride` columns, scaled by `scale`.
 */
export function columnExtremes(
  matrix: ArrayLike<number>,
  rows: number,
  stride: number,
  col: number,
  n: number,
  scale = 1,
): { positive: Loading[]; negative: Loading[] } {
  const positive: Loading[] = [];
  const negative: Loading[] = [];
  // Small n: a sorted insertion list beats sorting every row.
  const insert = (list: Loading[], item: Loading, better: (a: number, b: number) => boolean) => {
    if (list.length === n && !better(item.value, list[n - 1].value)) return;
    let p = list.length < n ? list.length : n - 1;
    if (list.length < n) list.push(item);
    while (p > 0 && better(item.value, list[p - 1].value)) {
      list[p] = list[p - 1];
      p--;
    }
    list[p] = item;
  };
  for (let r = 0; r < rows; r++) {
    const value = matrix[r * stride + col] * scale;
    if (value > 0) insert(positive, { index: r, value }, (a, b) => a > b);
    else if (value < 0) insert(negative, { index: r, value }, (a, b) => a < b);
  }
  return { positive, negative };
}

/** The `n` entries of column `col` with the largest |value| (with their sign). */
export function columnLargestAbs(
  matrix: ArrayLike<number>,
  rows: number,
  stride: number,
  col: number,
  n: number,
  scale = 1,
): Loading[] {
  const { positive, negative } = columnExtremes(matrix, rows, stride, col, n, scale);
  return [...positive, ...negative]
    .sort((a, b) => Math.abs(b.value) - Math.abs(a.value) || a.index - b.index)
    .slice(0, n);
}

/**
 * A pseudo-document in concept coordinates c (d leading dimensions of a row of V_k S_k)
 * seen in the term space: t = U_d c (A's column for a document a_j is approximated by
 * U_k (V_k S_k)_j^T). Returns the `n` terms with the largest weight.
 */
export function topTermsOfVector(
  termVectors: ArrayLike<number>,
  nTerms: number,
  k: number,
  vector: ArrayLike<number>,
  n: number,
): Loading[] {
  const d = Math.min(k, vector.length);
  const weights = new Float64Array(nTerms);
  for (let i = 0; i < nTerms; i++) {
    let s = 0;
    const o = i * k;
    for (let c = 0; c < d; c++) s += termVectors[o + c] * vector[c];
    weights[i] = s;
  }
  return columnExtremes(weights, nTerms, 1, 0, n).positive;
}
