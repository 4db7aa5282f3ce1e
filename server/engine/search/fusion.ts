// Score fusion for hybrid search: each list is min-max normalised per query, then
// combined linearly (CombSUM with min-max normalisation: Fox & Shaw 1994,
// "Combination of multiple searches"; Lee 1997, "Analyses of multiple evidence
// combination"). Mixing an LSI score into a keyword score gains on both
// (Kontostathis 2007, "Essential dimensions of latent semantic indexing").
// Pure: the server reuses it with its own lists.

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
 * fused = w * keyword + (1 - w) * concept over the union of both lists, a missing
 * score counting 0. Sorted best first; ties keep keyword order, then concept order.
 * (Parallel arrays and an index sort: hybrid searches fuse two lists of up to 10,000.)
 */
export function fuseScores<T>(
  keyword: readonly Scored<T>[],
  concept: readonly Scored<T>[],
  keywordWeight: number,
): FusedHit<T>[] {
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
  for (let i = 0; i < ids.length; i++)
    scores[i] = keywordWeight * (kw[i] ?? 0) + (1 - keywordWeight) * (cs[i] ?? 0);
  const order = Array.from({ length: ids.length }, (_, i) => i);
  order.sort((a, b) => scores[b] - scores[a] || a - b);
  return order.map((i) => ({ id: ids[i], score: scores[i], keyword: kw[i], concept: cs[i] }));
}
