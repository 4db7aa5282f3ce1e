// Simulated prioritised review on a test collection (the protocol of Cormack &
// Grossman, SIGIR 2014, "continuous active learning", on a judged collection): for
// each query, start from its top `seedSize` documents by BM25, let the relevance
// judgements play the reviewer, retrain the learned ranking every `batchSize`
// documents and review the next batch it ranks highest. Counts the documents
// reviewed to reach each recall target, against reviewing in BM25 order and in
// concept order alone. Both baselines and the seed use the same keyword index and
// concept ranking as the search API (KeywordIndex bm25; conceptRanking).
import { analyze } from '../text/analyzer';
import type { ConceptSpace } from '../index/concept-space';
import { KeywordIndex, keywordQueryTerms } from '../search/keyword-index';
import { conceptRanking } from '../search/search';
import {
  documentExample,
  strongestTerms,
  textExample,
  type TermWeights,
} from '../learning/features';
import {
  scoreDocuments,
  trainRanker,
  type LabelledExample,
  type RankerModel,
} from '../learning/ranker';
import type { Qrels } from './metrics';
import type { EvalDocument, EvalQuery } from './readers';

export interface SimulationOptions {
  seedSize?: number;
  batchSize?: number;
  /** Recall targets (default 0.75 and 0.9). */
  targets?: number[];
  minRelevant?: number;
  lambda?: number;
  topTerms?: number;
  /** At most this many queries (the tests run a few). */
  maxQueries?: number;
}

export interface QuerySimulation {
  queryId: string;
  relevant: number;
  /** Documents reviewed to reach each target, per order. */
  bm25: number[];
  concept: number[];
  prioritised: number[];
  retrains: number;
}

export interface SimulationResult {
  targets: number[];
  queries: QuerySimulation[];
  /** Mean documents reviewed per target and order. */
  mean: { bm25: number[]; concept: number[]; prioritised: number[] };
  ms: number;
}

/** Positions (1-based) at which an order first reaches each recall target. */
export function reviewedToReach(
  order: readonly number[],
  relevant: ReadonlySet<number>,
  targets: readonly number[],
  nDocs: number,
): number[] {
  const needed = targets.map((t) => Math.ceil(t * relevant.size));
  const out = targets.map(() => nDocs);
  let found = 0;
  order.forEach((j, position) => {
    if (!relevant.has(j)) return;
    found++;
    needed.forEach((n, t) => {
      if (found === n && out[t] === nDocs) out[t] = position + 1;
    });
  });
  return out;
}

/** A full order: the ranked indices, then every other document in index order. */
function completeOrder(ranked: readonly number[], nDocs: number): number[] {
  const seen = new Uint8Array(nDocs);
  const out: number[] = [];
  for (const j of ranked)
    if (!seen[j]) {
      seen[j] = 1;
      out.push(j);
    }
  for (let j = 0; j < nDocs; j++) if (!seen[j]) out.push(j);
  return out;
}

export function simulateReview(
  space: ConceptSpace,
  docs: readonly EvalDocument[],
  queries: readonly EvalQuery[],
  qrels: Qrels,
  options: SimulationOptions = {},
): SimulationResult {
  const started = performance.now();
  const seedSize = options.seedSize ?? 10;
  const batchSize = options.batchSize ?? 10;
  const targets = options.targets ?? [0.75, 0.9];
  const minRelevant = options.minRelevant ?? 10;
  const topTerms = options.topTerms ?? 20;
  const n = space.nDocs;
  // The keyword index the API keeps per matter, over the same documents (slot = index).
  const keyword = new KeywordIndex();
  const indexOfId = new Map<string, number>();
  for (const d of docs) {
    const j = space.indexOf(d.id);
    if (j === undefined) continue;
    indexOfId.set(d.id, j);
    keyword.add(j, d.title ?? '', d.text);
  }
  keyword.compact();
  const docTerms: (TermWeights | null)[] = new Array(n).fill(null);
  for (const d of docs) {
    const j = indexOfId.get(d.id);
    if (j === undefined) continue;
    const text = d.title ? `${d.title}\n${d.text}` : d.text;
    docTerms[j] = strongestTerms(space.weightTerms(analyze(text)), topTerms);
  }
  const results: QuerySimulation[] = [];
  for (const query of queries) {
    if (options.maxQueries !== undefined && results.length >= options.maxQueries) break;
    const judged = qrels.get(query.id);
    if (!judged) continue;
    const relevant = new Set<number>();
    for (const [id, grade] of judged) {
      const j = indexOfId.get(id);
      if (grade > 0 && j !== undefined) relevant.add(j);
    }
    if (relevant.size < minRelevant) continue;
    const bm25 = completeOrder(
      keyword.search(keywordQueryTerms(query.text).terms, { limit: n }).ids,
      n,
    );
    const concept = completeOrder(
      conceptRanking(space, query.text, n).ranked.map((h) => space.indexOf(h.id)!),
      n,
    );
    // Prioritised review: seed, then retrain every batch.
    const reviewed = new Uint8Array(n);
    const order: number[] = [];
    const review = (j: number) => {
      reviewed[j] = 1;
      order.push(j);
    };
    for (const j of bm25.slice(0, seedSize)) review(j);
    const synthetic: LabelledExample = { ...textExample(space, query.text, topTerms), label: 1 };
    const needed = Math.ceil(Math.max(...targets) * relevant.size);
    let retrains = 0;
    let bm25Cursor = 0;
    let model: RankerModel | undefined;
    while (order.length < n && order.filter((j) => relevant.has(j)).length < needed) {
      const examples: LabelledExample[] = [synthetic];
      for (const j of order)
        examples.push({
          ...documentExample(space, j, docTerms[j]),
          label: relevant.has(j) ? 1 : 0,
        });
      const hasNegative = examples.some((e) => e.label === 0);
      let next: number[];
      if (hasNegative) {
        model = trainRanker(space, examples, { lambda: options.lambda, previous: model });
        retrains++;
        const allow = new Uint8Array(n);
        for (let j = 0; j < n; j++) allow[j] = reviewed[j] ? 0 : 1;
        const scores = scoreDocuments(space, model, (j) => docTerms[j], allow);
        next = [];
        const candidates: number[] = [];
        for (let j = 0; j < n; j++) if (!reviewed[j]) candidates.push(j);
        candidates.sort((a, b) => scores[b] - scores[a] || a - b);
        next = candidates.slice(0, batchSize);
      } else {
        // Nothing judged non-relevant yet: keep to BM25 order until there is.
        next = [];
        while (next.length < batchSize && bm25Cursor < n) {
          const j = bm25[bm25Cursor++];
          if (!reviewed[j]) next.push(j);
        }
      }
      for (const j of next) review(j);
    }
    results.push({
      queryId: query.id,
      relevant: relevant.size,
      bm25: reviewedToReach(bm25, relevant, targets, n),
      concept: reviewedToReach(concept, relevant, targets, n),
      prioritised: reviewedToReach(order, relevant, targets, n),
      retrains,
    });
  }
  const meanOf = (pick: (q: QuerySimulation) => number[]) =>
    targets.map((_, t) =>
      results.length ? results.reduce((s, q) => s + pick(q)[t], 0) / results.length : 0,
    );
  return {
    targets,
    queries: results,
    mean: {
      bm25: meanOf((q) => q.bm25),
      concept: meanOf((q) => q.concept),
      prioritised: meanOf((q) => q.prioritised),
    },
    ms: performance.now() - started,
  };
}
