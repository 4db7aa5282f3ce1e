// The learned ranking of a matter's documents from its codes: logistic regression
// (logistic.ts) over features.ts rows, trained on Responsive (1) and Not responsive
// (0) examples, then every candidate document scored by its log-odds.
import type { ConceptSpace } from '../index/concept-space';
import { featureRows, type FeatureExample, type TermWeights } from './features';
import { fitLogistic, type LogisticModel } from './logistic';

export interface LabelledExample extends FeatureExample {
  label: 0 | 1;
}

export interface RankerOptions {
  /** L2 penalty (default 1, chosen on the Cranfield simulation: docs/RETRIEVAL.md). */
  lambda?: number;
  /** Weigh each class to the same total, so a few positives are not swamped (default true). */
  balanced?: boolean;
  /** The previous model of the same space, as a warm start. */
  previous?: RankerModel;
  /** Gradient tolerance (default 1e-6: the ranking, not the weights, is what matters here). */
  tolerance?: number;
}

export interface RankerModel {
  k: number;
  nTerms: number;
  logistic: LogisticModel;
  positives: number;
  negatives: number;
}

export const DEFAULT_RANKER_LAMBDA = 1;

export function trainRanker(
  space: Pick<ConceptSpace, 'k' | 'nTerms'>,
  examples: readonly LabelledExample[],
  options: RankerOptions = {},
): RankerModel {
  const positives = examples.filter((e) => e.label === 1).length;
  const negatives = examples.length - positives;
  if (positives === 0 || negatives === 0)
    throw new RangeError(
      `training needs both kinds of example (have ${positives} positive, ${negatives} negative)`,
    );
  const k = space.k;
  const full = featureRows(k, space.nTerms, examples);
  // Only the columns the training rows use: a term no example holds has gradient
  // lambda * w there, so its weight at the optimum is exactly 0. Fitting over the used
  // columns gives the same model with vectors of thousands, not the whole vocabulary.
  const columnOf = new Int32Array(full.nCols).fill(-1);
  const used: number[] = [];
  for (let c = 0; c < k; c++) {
    columnOf[c] = c;
    used.push(c);
  }
  for (let p = 0; p < full.indptr[full.nRows]; p++) {
    const c = full.indices[p];
    if (columnOf[c] < 0) {
      columnOf[c] = used.length;
      used.push(c);
    }
  }
  const x = {
    ...full,
    nCols: used.length,
    indices: Int32Array.from(full.indices, (c) => columnOf[c]),
  };
  const y = Float64Array.from(examples, (e) => e.label);
  const balanced = options.balanced ?? true;
  const weights = balanced
    ? Float64Array.from(examples, (e) =>
        e.label === 1 ? examples.length / (2 * positives) : examples.length / (2 * negatives),
      )
    : undefined;
  const previous =
    options.previous && options.previous.k === k && options.previous.nTerms === space.nTerms
      ? options.previous.logistic
      : undefined;
  const compact = fitLogistic(x, y, {
    lambda: options.lambda ?? DEFAULT_RANKER_LAMBDA,
    sampleWeights: weights,
    tolerance: options.tolerance ?? 1e-6,
    initial: previous
      ? { weights: Float64Array.from(used, (c) => previous.weights[c]), bias: previous.bias }
      : undefined,
  });
  const expanded = new Float64Array(full.nCols);
  used.forEach((c, j) => (expanded[c] = compact.weights[j]));
  const logistic = { ...compact, weights: expanded };
  return { k: space.k, nTerms: space.nTerms, logistic, positives, negatives };
}

/**
 * Log-odds of every document in the space (index order); -Infinity where `allow` is
 * 0. `termsOf(index)` gives a document's strongest terms (null: concept part only).
 */
export function scoreDocuments(
  space: ConceptSpace,
  model: RankerModel,
  termsOf: (index: number) => TermWeights | null,
  allow?: Uint8Array,
): Float64Array {
  if (model.k !== space.k) throw new RangeError(`model has k = ${model.k}, space has ${space.k}`);
  const { weights: w, bias } = model.logistic;
  const k = space.k;
  const rows = space.docMatrix;
  const inverse = space.inverseNorms();
  const out = new Float64Array(space.nDocs);
  for (let j = 0; j < space.nDocs; j++) {
    if (allow && allow[j] === 0) {
      out[j] = -Infinity;
      continue;
    }
    let s = 0;
    const o = j * k;
    for (let c = 0; c < k; c++) s += w[c] * rows[o + c];
    s *= inverse[j];
    const terms = termsOf(j);
    if (terms && model.nTerms > 0)
      for (let t = 0; t < terms.ids.length; t++) {
        const id = terms.ids[t];
        if (id < model.nTerms) s += w[k + id] * terms.weights[t];
      }
    out[j] = s + bias;
  }
  return out;
}

/** Indices of the `limit` highest scores, best first (ties: lower index first). */
export function topIndices(scores: Float64Array, limit: number): number[] {
  const order: number[] = [];
  for (let j = 0; j < scores.length; j++) if (scores[j] !== -Infinity) order.push(j);
  order.sort((a, b) => scores[b] - scores[a] || a - b);
  return order.slice(0, limit);
}
