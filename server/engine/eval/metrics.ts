// Retrieval effectiveness measures, per query, then averaged over the queries that
// have at least one relevant judgement (common practice, as trec_eval does).
//  - average precision (AP): mean of precision at the rank of each relevant
//    document, unretrieved relevant documents counting 0 (Manning, Raghavan &
//    Schuetze 2008, "Introduction to Information Retrieval", 8.4); MAP = mean AP.
//  - P@10: relevant documents among the first 10, over 10.
//  - R-precision: precision at rank R, R = the number of relevant documents.
//  - nDCG@10 (Jarvelin & Kekalainen 2002, "Cumulated gain-based evaluation of IR
//    techniques", ACM TOIS 20(4)): DCG = sum_i gain_i / log2(i + 1) over ranks
//    1..10 with graded gains taken from the qrels grade, divided by the DCG of the
//    ideal ordering of the judged documents. The log2(i + 1) discount on every rank
//    is the common modern form (Manning et al. 2008, 8.4); the paper's original
//    discounts from rank b = 2 on.

/** qid -> (docid -> grade > 0). Only relevant judgements are kept. */
export type Qrels = Map<string, Map<string, number>>;

export interface QueryMetrics {
  ap: number;
  p10: number;
  rprec: number;
  ndcg10: number;
  relevant: number;
  retrievedRelevant: number;
}

export interface MeanMetrics {
  map: number;
  p10: number;
  rprec: number;
  ndcg10: number;
  queries: number;
}

export function evaluateRanking(
  ranking: readonly string[],
  relevant: ReadonlyMap<string, number>,
): QueryMetrics {
  const R = relevant.size;
  let hits = 0;
  let apSum = 0;
  let at10 = 0;
  let atR = 0;
  let dcg = 0;
  const seen = new Set<string>();
  for (let r = 0; r < ranking.length; r++) {
    const id = ranking[r];
    if (seen.has(id)) continue; // a repeated id must not count twice
    seen.add(id);
    const grade = relevant.get(id) ?? 0;
    if (grade > 0) {
      hits++;
      apSum += hits / (r + 1);
      if (r < 10) at10++;
      if (r < R) atR++;
      if (r < 10) dcg += grade / Math.log2(r + 2);
    }
  }
  const ideal = [...relevant.values()].sort((a, b) => b - a).slice(0, 10);
  let idcg = 0;
  ideal.forEach((g, r) => (idcg += g / Math.log2(r + 2)));
  return {
    ap: R > 0 ? apSum / R : 0,
    p10: at10 / 10,
    rprec: R > 0 ? atR / R : 0,
    ndcg10: idcg > 0 ? dcg / idcg : 0,
    relevant: R,
    retrievedRelevant: hits,
  };
}

export function meanMetrics(perQuery: readonly QueryMetrics[]): MeanMetrics {
  const n = perQuery.length;
  const mean = (f: (m: QueryMetrics) => number) =>
    n > 0 ? perQuery.reduce((s, m) => s + f(m), 0) / n : 0;
  return {
    map: mean((m) => m.ap),
    p10: mean((m) => m.p10),
    rprec: mean((m) => m.rprec),
    ndcg10: mean((m) => m.ndcg10),
    queries: n,
  };
}
