// Score fusion for hybrid search: each list is min-max normalised per query, then
// combined linearly (CombSUM with min-max normalisation: Fox & Shaw 1994,
// "Combination of multiple searches"; Lee 1997, "Analyses of multiple evidence
// combination"). Mixing an LSI score into a keyword score gains on both
// (Kontostathis 2007, "Essential dimensions of latent semantic indexing").
// Pure: the server reuses it with its own lists.
//
// Two departures from plain CombSUM, both about what a missing or partial list says:
//  - A list that cannot judge a document gives no evidence against it. A document the
//    keyword list lacks shares no query word, which is no evidence against it (finding
//    such documents is what concept search is for: Deerwester et al. 1990, synonymy), so
//    its keyword part is the concept score, scaled by the share of the query the
//    concept space sees; counting it as 0 buried the demo matter's concept-only
//    documents (corpus-demo/README.md) below every document that merely shared a word.
//    A document outside the concept space (added since the build) takes its keyword
//    score as its concept part. One in the space but below the concept list's cosine
//    cut-off counts 0 there: that absence is evidence.
//  - Each list is weighed by how much of the query it can see (coverageWeight): words
//    the concept space does not know (terms of one document, documents folded in since
//    the build) leave the concept vector blind to them, and keyword search should lead.

export interface Scored<T> {
  id: T;
  score: number;
}

export interface FusedHit<T> {
  id: T;
  score: number;
  /** Normalised keyword and concept scores (null when the list did not hold the id). */
  keyword: number | null;
  concept: number | null;
}

/** Min-max to [0, 1]; a list whose scores are all equal maps to 1. */
export function minMaxNormalise<T>(list: readonly Scored<T>[]): Map<T, number> {
  const out = new Map<T, number>();
  if (list.length === 0) return out;
  let lo = Infinity;
  let hi = -Infinity;
  for (const { score } of list) {
    if (score < lo) lo = score;
    if (score > hi) hi = score;
  }
  const span = hi - lo;
  for (const { id, score } of list) out.set(id, span > 0 ? (score - lo) / span : 1);
  return out;
}

/**
 * The keyword weight once each list's weight is scaled by the share of the query's words
 * it can see: w' = w ck / (w ck + (1 - w) cc). Both shares 1 leave w as it is; a list
 * that sees nothing gets no weight.
 */
export function coverageWeight(
  keywordWeight: number,
  keywordCoverage: number,
  conceptCoverage: number,
): number {
  const k = keywordWeight * keywordCoverage;
  const c = (1 - keywordWeight) * conceptCoverage;
  return k + c > 0 ? k / (k + c) : keywordWeight;
}

export interface FuseOptions<T> {
  /** Share of the query's words the concept space knows (default 1). */
  conceptCoverage?: number;
  /** True for a document the concept space does not hold (default: none). */
  outsideConcept?: (id: T) => boolean;
}

/**
 * fused = w * keyword + (1 - w) * concept over the union of both lists, a part a list
 * cannot judge filled in as the header says. Sorted best first; ties keep keyword order, then concept order.
 * (Parallel arrays and an index sort: hybrid searches fuse two lists of up to 10,000.)
 */
export function fuseScores<T>(
  keyword: readonly Scored<T>[],
  concept: readonly Scored<T>[],
  keywordWeight: number,
  options: FuseOptions<T> = {},
): FusedHit<T>[] {
  const coverage = options.conceptCoverage ?? 1;
  const outside = options.outsideConcept;
  if (!(keywordWeight >= 0 && keywordWeight <= 1))
    throw new RangeError('keywordWeight must be in [0, 1]');
  // The union in first-seen order; a list that names an id twice keeps its last score
  // (as minMaxNormalise's map does).
  const position = new Map<T, number>();
  const ids: T[] = [];
  const kw: (number | null)[] = [];
  const cs: (number | null)[] = [];
  const add = (list: readonly Scored<T>[], into: (number | null)[]) => {
    const normalised = minMaxNormalise(list);
    for (const { id } of list) {
      let at = position.get(id);
      if (at === undefined) {
        position.set(id, (at = ids.length));
        ids.push(id);
        kw.push(null);
        cs.push(null);
      }
      into[at] = normalised.get(id)!;
    }
  };
  add(keyword, kw);
  add(concept, cs);
  const scores = new Float64Array(ids.length);
  for (let i = 0; i < ids.length; i++) {
    const kv = kw[i];
    const c: number = cs[i] ?? (kv !== null && outside?.(ids[i]) ? kv : 0);
    const k: number = kv ?? coverage * c;
    scores[i] = keywordWeight * k + (1 - keywordWeight) * c;
  }
  const order = Array.from({ length: ids.length }, (_, i) => i);
  order.sort((a, b) => scores[b] - scores[a] || a - b);
  return order.map((i) => ({ id: ids[i], score: scores[i], keyword: kw[i], concept: cs[i] }));
}
