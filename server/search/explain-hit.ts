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
 * Every term of the document with its share of the cosine with `query` (negative shares
 * included): they add up to the cosine. `documentTerms` is the analysis of the
 * document's text (analyze, or analyzedTerms in highlight.ts); `dots` memoises
 * (u_j M) . query per term across the hits of one page, which share most of their
 * vocabulary. Empty when either vector is zero.
 */
export function termContributions(
  space: ConceptSpace,
  query: Float64Array,
  documentIndex: number,
  documentTerms: readonly string[],
  dots: Map<number, number> = new Map(),
): { term: string; contribution: number }[] {
  return contributionsOfWeighted(
    space,
    query,
    documentIndex,
    space.weightTerms(documentTerms),
    dots,
  );
}

/** termContributions for a document's terms already weighted by `space` (weightTerms). */
function contributionsOfWeighted(
  space: ConceptSpace,
  query: Float64Array,
  documentIndex: number,
  weighted: WeightedTerms,
  dots: Map<number, number>,
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
    out.push({ term: space.terms[id], contribution: scale * weighted.weights[p] * dot });
  }
  return out;
}

function largestPositive(
  all: { term: string; contribution: number }[],
  limit: number,
): { term: string; contribution: number }[] {
  return all
    .filter((c) => c.contribution > 0)
    .sort((a, b) => b.contribution - a.contribution || (a.term < b.term ? -1 : 1))
    .slice(0, limit);
}

/** The weighted document terms carrying most of its cosine with `query`, best first. */
export function topContributionsOfWeighted(
  space: ConceptSpace,
  query: Float64Array,
  documentIndex: number,
  weighted: WeightedTerms,
  limit: number,
  dots: Map<number, number> = new Map(),
): { term: string; contribution: number }[] {
  return largestPositive(
    contributionsOfWeighted(space, query, documentIndex, weighted, dots),
    limit,
  );
}
