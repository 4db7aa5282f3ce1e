// "Why it matched" for one hit, after server/engine/search/explain.ts: with q_hat the query's
// vector, d_hat the document's row and d its weighted term vector, document term j
// contributes d_j (u_j M . q_hat) / (||q_hat|| ||d_hat||) to the cosine (M = I for
// 'projection' scaling, S_k^-1 for 'classic'); the contributions add up to the cosine.
// The engine's explainMatch takes a query string; this takes any vector (a query, a
// passage or a document for "more like this").
import type { ConceptSpace, WeightedTerms } from '../engine/index';

function termDot(space: ConceptSpace, termId: number, x: ArrayLike<number>): number {
  const k = space.k;
  const u = space.termVectors;
  const o = termId * k;
  let s = 0;
  if (space.scaling === 'classic')
    for (let c = 0; c < k; c++) s += (u[o + c] / space.sigma[c]) * x[c];
  else for (let c = 0; c < k; c++) s += u[o + c] * x[c];
  return s;
}

function norm(v: ArrayLike<number>): number {
  let s = 0;
  for (let c = 0; c < v.length; c++) s += v[c] * v[c];
  return Math.sqrt(s);
}

/**
 * The document terms carrying most of its cosine with `query`, best first.
 * `documentTerms` is the analysis of the document's text (analyze, or
 * analyzedTerms in highlight.ts); `dots` memoises (u_j M) . query per term across
 * the hits of one page, which share most of their vocabulary.
 */
export function topContributions(
  space: ConceptSpace,
  query: Float64Array,
  documentIndex: number,
  documentTerms: readonly string[],
  limit: number,
  dots: Map<number, number> = new Map(),
): { term: string; contribution: number }[] {
  return topContributionsOfWeighted(
    space,
    query,
    documentIndex,
    space.weightTerms(documentTerms),
    limit,
    dots,
  );
}

/** topContributions for a document's terms already weighted by `space` (weightTerms). */
export function topContributionsOfWeighted(
  space: ConceptSpace,
  query: Float64Array,
  documentIndex: number,
  weighted: WeightedTerms,
  limit: number,
  dots: Map<number, number> = new Map(),
): { term: string; contribution: number }[] {
  const d = space.docVector(documentIndex);
  const qn = norm(query);
  const dn = norm(d);
  if (!(qn > 0 && dn > 0)) return [];
  const scale = 1 / (qn * dn);
  const out: { term: string; contribution: number }[] = [];
  for (let p = 0; p < weighted.ids.length; p++) {
    const id = weighted.ids[p];
    let dot = dots.get(id);
    if (dot === undefined) dots.set(id, (dot = termDot(space, id, query)));
    const contribution = scale * weighted.weights[p] * dot;
    if (contribution > 0) out.push({ term: space.terms[id], contribution });
  }
  out.sort((a, b) => b.contribution - a.contribution || (a.term < b.term ? -1 : 1));
  return out.slice(0, limit);
}
