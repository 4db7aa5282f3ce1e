// Runs a test collection through the engine: one build (concept space and/or the
// in-memory keyword index the server searches with, keyword-index.ts), then every judged
// query in the chosen mode, scored with server/engine/eval/metrics.ts.
import {
  ConceptSpace,
  type BuildDiagnostics,
  type ConceptSpaceOptions,
  type DocId,
} from '../index/concept-space';
import { KeywordIndex, keywordQueryTerms } from '../search/keyword-index';
import { search, type KeywordSource, type SearchMode, type SearchOptions } from '../search/search';
import {
  evaluateRanking,
  meanMetrics,
  type MeanMetrics,
  type QueryMetrics,
  type Qrels,
} from './metrics';
import type { EvalDocument, EvalQuery } from './readers';

export interface PreparedCollection {
  space: ConceptSpace | null;
  diagnostics: BuildDiagnostics | null;
  keyword: KeywordSource | null;
  buildMs: number;
  close(): void;
}

export interface PrepareOptions extends ConceptSpaceOptions {
  /** Which parts to build: 'concept' (space), 'keyword' (FTS5), or both (default). */
  parts?: ('concept' | 'keyword')[];
  /** Okapi's k3 for repeated query words (keyword-index.ts DEFAULT_K3 when unset). */
  k3?: number;
}

export function partsFor(mode: SearchMode): ('concept' | 'keyword')[] {
  return mode === 'concept'
    ? ['concept']
    : mode === 'keyword'
      ? ['keyword']
      : ['concept', 'keyword'];
}

export function prepareCollection(
  docs: readonly EvalDocument[],
  options: PrepareOptions = {},
): PreparedCollection {
  const started = performance.now();
  const parts = options.parts ?? ['concept', 'keyword'];
  let space: ConceptSpace | null = null;
  let diagnostics: BuildDiagnostics | null = null;
  if (parts.includes('concept')) {
    ({ space, diagnostics } = ConceptSpace.build(
      docs.map((d) => ({ id: d.id, title: d.title, text: d.text })),
      options,
    ));
  }
  let keyword: KeywordSource | null = null;
  if (parts.includes('keyword')) {
    if (docs.length === 0) throw new RangeError('empty corpus: there are no documents to index');
    // The index the server's keyword search uses (server/search/keyword-cache.ts), so the
    // measured keyword figures are the product's.
    const index = new KeywordIndex();
    docs.forEach((d, i) => index.add(i + 1, d.title, d.text));
    index.compact();
    const ids = docs.map((d) => d.id);
    const source: KeywordSource = (query, limit) => {
      const found = index.search(keywordQueryTerms(query).terms, { limit, k3: options.k3 });
      return found.ids.map((slot, r) => ({ id: ids[slot - 1] as DocId, score: found.scores[r] }));
    };
    source.coverage = (query) => index.coverage(keywordQueryTerms(query).terms);
    keyword = source;
  }
  return {
    space,
    diagnostics,
    keyword,
    buildMs: performance.now() - started,
    close: () => {},
  };
}

export interface EvaluationRun {
  mode: SearchMode;
  metrics: MeanMetrics;
  perQuery: { id: string; metrics: QueryMetrics; retrieved: number }[];
  notices: string[];
  searchMs: { mean: number; max: number };
}

export function runEvaluation(
  prepared: PreparedCollection,
  queries: readonly EvalQuery[],
  qrels: Qrels,
  mode: SearchMode,
  options: Pick<SearchOptions, 'hybrid'> & { depth?: number } = {},
): EvaluationRun {
  const depth = options.depth ?? 1000;
  const notices: string[] = [];
  const perQuery: EvaluationRun['perQuery'] = [];
  const times: number[] = [];
  for (const query of queries) {
    const relevant = qrels.get(query.id);
    if (!relevant || relevant.size === 0) continue;
    const t0 = performance.now();
    const result = search(prepared.space, query.text, {
      mode,
      limit: depth,
      depth,
      keyword: prepared.keyword ?? undefined,
      hybrid: options.hybrid,
    });
    times.push(performance.now() - t0);
    if (mode !== 'keyword' && result.knownTerms.length === 0) {
      notices.push(`query ${query.id}: no query term is in the index; empty result`);
    } else if (result.hits.length === 0) {
      notices.push(`query ${query.id}: no document matched; empty result`);
    }
    const ranking = result.hits.map((h) => String(h.id));
    perQuery.push({
      id: query.id,
      metrics: evaluateRanking(ranking, relevant),
      retrieved: ranking.length,
    });
  }
  const judged = new Set(queries.map((q) => q.id));
  const missing = [...qrels.keys()].filter((q) => !judged.has(q));
  if (missing.length > 0)
    notices.push(
      `${missing.length} judged query id(s) not in the queries file (e.g. ${missing[0]})`,
    );
  return {
    mode,
    metrics: meanMetrics(perQuery.map((q) => q.metrics)),
    perQuery,
    notices,
    searchMs: {
      mean: times.length ? times.reduce((a, b) => a + b, 0) / times.length : 0,
      max: times.length ? Math.max(...times) : 0,
    },
  };
}
