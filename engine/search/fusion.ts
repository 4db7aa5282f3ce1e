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
 */
export function fuseScores<T>(
  keyword: readonly Scored<T>[],
  concept: readonly Scored<T>[],
  keywordWeight: number,
): FusedHit<T>[] {
  if (!(keywordWeight >= 0 && keywordWeight <= 1))
    throw new RangeError('keywordWeight must be in [0, 1]');
  const kw = minMaxNormalise(keyword);
  const cs = minMaxNormalise(concept);
  const order = new Map<T, number>();
  for (const { id } of keyword) if (!order.has(id)) order.set(id, order.size);
  for (const { id } of concept) if (!order.has(id)) order.set(id, order.size);
  const hits: FusedHit<T>[] = [];
  for (const id of order.keys()) {
    const k = kw.get(id) ?? null;
    const c = cs.get(id) ?? null;
    hits.push({
      id,
      score: keywordWeight * (k ?? 0) + (1 - keywordWeight) * (c ?? 0),
      keyword: k,
      concept: c,
    });
  }
  hits.sort((a, b) => b.score - a.score || order.get(a.id)! - order.get(b.id)!);
  return hits;
}
