// What the learned ranking sees of a document: its concept vector (unit length) next
// to its strongest weighted terms (unit length), one sparse row per document. The
// concept part generalises across vocabulary; the term part lets the model pick up
// exact words the concept space blurs (Cormack & Grossman, SIGIR 2014, train their
// continuous active learning on term features; the concept axes are Quarry's own).
import type { ConceptSpace, WeightedTerms } from '../index/concept-space';
import type { SparseRows } from './logistic';

export interface TermWeights {
  /** Term ids in the space's vocabulary, ascending. */
  ids: Int32Array;
  /** Unit-length weights. */
  weights: Float64Array;
}

export interface FeatureExample {
  /** k values (a document's or a query's concept vector; any length scale). */
  concept: ArrayLike<number>;
  terms: TermWeights | null;
}

/** Default count of strongest terms kept per document. */
export const DEFAULT_TOP_TERMS = 20;

/** The `count` heaviest terms of a weighted vector, scaled to unit length, ids ascending. */
export function strongestTerms(weighted: WeightedTerms, count = DEFAULT_TOP_TERMS): TermWeights {
  const order = Array.from(weighted.ids.keys())
    .sort((a, b) => weighted.weights[b] - weighted.weights[a] || weighted.ids[a] - weighted.ids[b])
    .slice(0, count)
    .sort((a, b) => weighted.ids[a] - weighted.ids[b]);
  const ids = Int32Array.from(order, (p) => weighted.ids[p]);
  const weights = Float64Array.from(order, (p) => weighted.weights[p]);
  let sq = 0;
  for (const w of weights) sq += w * w;
  const scale = sq > 0 ? 1 / Math.sqrt(sq) : 0;
  for (let p = 0; p < weights.length; p++) weights[p] *= scale;
  return { ids, weights };
}

/** A stored document as an example. */
export function documentExample(
  space: ConceptSpace,
  index: number,
  terms: TermWeights | null,
): FeatureExample {
  return { concept: space.docVector(index), terms };
}

/** A query (or any text) as an example, e.g. the seed query as a synthetic positive. */
export function textExample(space: ConceptSpace, text: string, topTerms = DEFAULT_TOP_TERMS) {
  const { vector, weighted } = space.queryVector(text);
  return { concept: vector, terms: strongestTerms(weighted, topTerms) };
}

/** One CSR row per example: columns 0..k-1 the unit concept vector, k + termId the terms. */
export function featureRows(
  k: number,
  nTerms: number,
  examples: readonly FeatureExample[],
): SparseRows {
  const indptr = new Int32Array(examples.length + 1);
  let nnz = 0;
  for (let i = 0; i < examples.length; i++) {
    nnz += k + (examples[i].terms?.ids.length ?? 0);
    indptr[i + 1] = nnz;
  }
  const indices = new Int32Array(nnz);
  const values = new Float64Array(nnz);
  examples.forEach((example, i) => {
    if (example.concept.length !== k)
      throw new RangeError(
        `example ${i} has ${example.concept.length} concept values, expected ${k}`,
      );
    let p = indptr[i];
    let sq = 0;
    for (let c = 0; c < k; c++) sq += example.concept[c] * example.concept[c];
    const scale = sq > 0 ? 1 / Math.sqrt(sq) : 0;
    for (let c = 0; c < k; c++) {
      indices[p] = c;
      values[p++] = example.concept[c] * scale;
    }
    const terms = example.terms;
    if (terms)
      for (let t = 0; t < terms.ids.length; t++) {
        if (terms.ids[t] < 0 || terms.ids[t] >= nTerms)
          throw new RangeError(`example ${i}: term id ${terms.ids[t]} outside the vocabulary`);
        indices[p] = k + terms.ids[t];
        values[p++] = terms.weights[t];
      }
  });
  return { nRows: examples.length, nCols: k + nTerms, indptr, indices, values };
}
