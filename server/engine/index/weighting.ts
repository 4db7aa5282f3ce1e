// Term weighting: a_ij = L(tf_ij) * G(i).
//
// log-entropy (Dumais 1991, "Improving the retrieval of information from external
// sources", Behav. Res. Methods 23(2)): L = log2(1 + tf_ij),
//   G(i) = 1 + sum_j p_ij log p_ij / log n,  p_ij = tf_ij / gf_i,
// gf_i the total count of term i in the collection, n the number of documents.
// G is 1 for a term concentrated in one document and 0 for one spread evenly over all.
//
// tf-idf (Salton & Buckley 1988, "Term-weighting approaches in automatic text
// retrieval"): L = tf_ij, G(i) = log(n / df_i).
//
// raw: L = tf_ij, G = 1 (the unweighted counts of Deerwester et al. 1990, Table 2;
// for reproducing published examples, not for retrieval).
import type { CsrMatrix } from '../sparse/csr';

export type Weighting = 'log-entropy' | 'tf-idf' | 'raw';

export const WEIGHTINGS: readonly Weighting[] = ['log-entropy', 'tf-idf', 'raw'];

export function localWeight(weighting: Weighting, tf: number): number {
  return weighting === 'log-entropy' ? Math.log2(1 + tf) : tf;
}

/** Global weight of every term (row) of a raw-count terms x documents matrix. */
export function globalWeights(weighting: Weighting, counts: CsrMatrix): Float64Array {
  const n = counts.cols;
  const g = new Float64Array(counts.rows);
  const { rowPtr, values } = counts;
  if (weighting === 'raw') return g.fill(1);
  if (weighting === 'tf-idf') {
    for (let i = 0; i < counts.rows; i++) {
      const df = rowPtr[i + 1] - rowPtr[i];
      g[i] = df > 0 ? Math.log(n / df) : 0;
    }
    return g;
  }
  const logN = Math.log(n);
  for (let i = 0; i < counts.rows; i++) {
    let gf = 0;
    for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) gf += values[p];
    if (gf === 0 || logN === 0) {
      g[i] = 1; // a one-document collection: entropy is undefined, weight left neutral
      continue;
    }
    let sum = 0;
    for (let p = rowPtr[i]; p < rowPtr[i + 1]; p++) {
      const pij = values[p] / gf;
      sum += pij * Math.log(pij);
    }
    g[i] = 1 + sum / logN;
  }
  return g;
}

/** The weighted matrix: same sparsity as `counts`, entries L(tf) * G(i). */
/**
 * The weighted matrix: local weight of each count times its term's global weight. It
 * shares rowPtr and colIdx with `counts`; with `inPlace` it also reuses (overwrites)
 * counts.values, for callers that are done with the raw counts (0.23 GB at 100k docs).
 */
export function applyWeights(
  weighting: Weighting,
  counts: CsrMatrix,
  g: Float64Array,
  inPlace = false,
): CsrMatrix {
  const values = inPlace ? counts.values : new Float64Array(counts.values.length);
  for (let i = 0; i < counts.rows; i++) {
    for (let p = counts.rowPtr[i]; p < counts.rowPtr[i + 1]; p++) {
      values[p] = localWeight(weighting, counts.values[p]) * g[i];
    }
  }
  return {
    rows: counts.rows,
    cols: counts.cols,
    rowPtr: counts.rowPtr,
    colIdx: counts.colIdx,
    values,
  };
}
