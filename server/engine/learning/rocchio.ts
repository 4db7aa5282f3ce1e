// Relevance feedback without training: Rocchio's formula (Rocchio 1971, "Relevance
// feedback in information retrieval", in Salton ed., The SMART Retrieval System)
//   q' = alpha q + beta mean(relevant) - gamma mean(non-relevant)
// over unit-length concept vectors. Defaults alpha 1, beta 0.75, gamma 0.15 are the
// values in common use (Manning, Raghavan & Schuetze, Introduction to Information
// Retrieval, 2008, section 9.1.1).
import type { ConceptSpace } from '../index/concept-space';
import { topCosine } from '../search/top-n';

export interface RocchioOptions {
  /** The query's concept vector (omitted: feedback alone, "more like these"). */
  query?: ArrayLike<number>;
  relevant: readonly number[];
  nonRelevant?: readonly number[];
  alpha?: number;
  beta?: number;
  gamma?: number;
}

export const ROCCHIO_DEFAULTS = { alpha: 1, beta: 0.75, gamma: 0.15 };

function addUnit(out: Float64Array, v: ArrayLike<number>, scale: number): void {
  let sq = 0;
  for (let c = 0; c < out.length; c++) sq += v[c] * v[c];
  if (sq === 0) return;
  const s = scale / Math.sqrt(sq);
  for (let c = 0; c < out.length; c++) out[c] += s * v[c];
}

export function rocchioVector(space: ConceptSpace, options: RocchioOptions): Float64Array {
  const { alpha, beta, gamma } = { ...ROCCHIO_DEFAULTS, ...options };
  const out = new Float64Array(space.k);
  if (options.query) {
    if (options.query.length !== space.k)
      throw new RangeError(`query vector must have ${space.k} values`);
    addUnit(out, options.query, alpha);
  }
  const relevant = options.relevant;
  const nonRelevant = options.nonRelevant ?? [];
  if (relevant.length === 0 && !options.query)
    throw new RangeError('Rocchio feedback needs a query or at least one relevant document');
  for (const j of relevant) addUnit(out, space.docVector(j), beta / relevant.length);
  for (const j of nonRelevant) addUnit(out, space.docVector(j), -gamma / nonRelevant.length);
  return out;
}

/** Documents nearest the Rocchio vector, leaving out the judged ones (and any `allow` 0). */
export function rocchioRanking(
  space: ConceptSpace,
  options: RocchioOptions & { limit: number; allow?: Uint8Array },
): { index: number; score: number }[] {
  const vector = rocchioVector(space, options);
  const allow = options.allow ? options.allow.slice() : new Uint8Array(space.nDocs).fill(1);
  for (const j of options.relevant) allow[j] = 0;
  for (const j of options.nonRelevant ?? []) allow[j] = 0;
  const top = topCosine(
    space.docMatrix,
    space.k,
    space.nDocs,
    space.inverseNorms(),
    vector,
    options.limit,
    {
      allow,
    },
  );
  return Array.from(top.indices, (index, r) => ({ index, score: top.scores[r] }));
}
