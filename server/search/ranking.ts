// The result set of a search: which documents match, in score order. Shared by the
// search API (which pages and explains it) and the results export (which writes all of it).
//
//  concept  - cosine in the matter's concept space (server/engine/search/top-n.ts over the
//             space's rows, candidates masked by the filters); documents at or above
//             CONCEPT_MIN_COSINE are hits.
//  keyword  - bm25 as SQLite FTS5 computes it, over the matter's in-memory keyword
//             index (server/engine/search/keyword-index.ts, server/search/keyword-cache.ts);
//             every document holding a query term is a hit.
//  hybrid   - both lists fused (server/engine/search/fusion.ts: per-query min-max, then
//             0.3 keyword + 0.7 concept on the first 100 concept axes, the defaults
//             tuned on Cranfield, docs/RETRIEVAL.md).
//  similar  - "more like this": a stored document's vector, or a passage folded in as
//             a query (Deerwester et al. 1990, section 4), ranked like concept mode.
import type { ConceptSpace } from '../engine/index';
import { nearestTerms } from '../engine/index';
import { coverageWeight, fuseScores, type Scored } from '../engine/index';
import { keywordQueryTerms } from '../engine/index';
import { DEFAULT_HYBRID } from '../engine/index';
import { topCosine } from '../engine/index';
import { analyze } from '../engine/index';
import type { SearchFilters, SearchMode, SimilarTo } from '../../shared/schemas/search';
import type { AppContext } from '../context';
import { conflict, notFound } from '../http/errors';
import { duplicatesOf, filteredDocumentIds, findSearchableDocument, restricts } from './queries';
import { booleanRanking, parseSearchQuery, type BooleanRanking } from './boolean';

/**
 * Concept hits need at least this cosine. Below it a document shares little with the
 * query beyond noise; common practice in LSI retrieval is a cosine cut-off in the
 * 0.1-0.4 range (Deerwester et al. 1990 report results at several thresholds); 0.2
 * kept every planted related document of the demo matter on the first page.
 */
export const CONCEPT_MIN_COSINE = 0.2;
/** Concept-related terms offered per query. */
export const NEAREST_TERMS = 8;

export const NO_INDEX_MESSAGE =
  'This matter has no concept index yet, so concept search and "more like this" are not available; keyword search works now, and the index is built once documents are extracted.';

export interface RankInput {
  query?: string;
  mode: SearchMode;
  similarTo?: SimilarTo;
  filters: SearchFilters;
}

export interface RankedSet {
  mode: SearchMode;
  ids: number[];
  /** Mode's own score: cosine, -bm25 or fused. */
  raw: number[];
  /** 0..1 for the score bar. */
  bar: number[];
  duplicateOf: (number | null)[];
  capped: boolean;
  notices: string[];
  knownTerms: string[];
  unknownTerms: string[];
  space: ConceptSpace | null;
  indexVersion: number | null;
  /** The query's vector in document coordinates (null for keyword). */
  queryVector: Float64Array | null;
  /** Terms (stems) highlighted as the query's own. */
  queryTerms: Set<string>;
  /** The query's nearest terms in the concept space (stems), best first. */
  nearest: { term: string; similarity: number }[];
  /** The cosine the list was cut at (concept lists of plain queries), else undefined. */
  conceptCutoff?: number;
}

function candidateMask(space: ConceptSpace, ids: number[]): Uint8Array {
  const mask = new Uint8Array(space.nDocs);
  for (const id of ids) {
    const index = space.indexOf(id);
    if (index !== undefined) mask[index] = 1;
  }
  return mask;
}

function conceptList(
  space: ConceptSpace,
  vector: ArrayLike<number>,
  cap: number,
  options: { dims?: number; allow?: Uint8Array; exclude?: number; minCosine: number },
): Scored<number>[] {
  const dims = Math.min(options.dims ?? space.k, space.k);
  const top = topCosine(
    space.docMatrix,
    space.k,
    space.nDocs,
    space.inverseNorms(dims),
    vector,
    cap,
    {
      dims,
      allow: options.allow,
      exclude: options.exclude,
      minScore: options.minCosine,
      quantised: true,
    },
  );
  const out: Scored<number>[] = [];
  for (let r = 0; r < top.indices.length; r++) {
    if (top.scores[r] < options.minCosine) break;
    out.push({ id: Number(space.docId(top.indices[r])), score: top.scores[r] });
  }
  return out;
}

const isZero = (v: ArrayLike<number>) => {
  for (let c = 0; c < v.length; c++) if (v[c] !== 0) return false;
  return true;
};

/** The document's own strongest terms (for marking a "more like this" document's words). */
function strongestTerms(space: ConceptSpace, text: string, n: number): Set<string> {
  const w = space.weightTerms(analyze(text));
  const order = Array.from(w.ids.keys()).sort((a, b) => w.weights[b] - w.weights[a]);
  return new Set(order.slice(0, n).map((p) => space.terms[w.ids[p]]));
}

export async function rankResultSet(
  ctx: AppContext,
  matterId: number,
  input: RankInput,
  cap: number,
): Promise<RankedSet> {
  const loaded = await ctx.index.getIndex(matterId);
  const space = loaded?.space ?? null;
  const notices: string[] = [];
  let mode: SearchMode = input.similarTo ? 'concept' : input.mode;
  if (mode === 'concept' && !space) throw conflict(NO_INDEX_MESSAGE);
  if (mode === 'hybrid' && !space) {
    mode = 'keyword';
    notices.push('No concept index yet: this hybrid search ran as a keyword search.');
  }
  const filters = input.filters;
  let allowIds = restricts(filters)
    ? filteredDocumentIds(ctx.db, ctx.sqlite, matterId, filters)
    : null;
  // A query with any operator, phrase, wildcard or field is a Boolean filter: its match
  // set (boolean.ts) bounds every mode's list, and its positive words rank the hits.
  const parsed = input.similarTo ? null : parseSearchQuery(input.query ?? '');
  let booleanQuery: BooleanRanking | null = null;
  if (parsed?.structured) {
    booleanQuery = booleanRanking(ctx.sqlite, matterId, parsed, allowIds);
    allowIds = [...booleanQuery.matches];
  }
  const mask = space && allowIds ? candidateMask(space, allowIds) : undefined;
  const rankingText = booleanQuery ? booleanQuery.text : (input.query ?? '');

  let queryVector: Float64Array | null = null;
  let queryTerms = new Set<string>();
  let knownTerms: string[] = [];
  let unknownTerms: string[] = [];
  let exclude: number | undefined;
  let excludeId: number | null = null;

  if (space && input.similarTo) {
    if ('documentId' in input.similarTo) {
      const doc = await findSearchableDocument(ctx.db, matterId, input.similarTo.documentId);
      if (!doc) throw notFound('Document');
      // A duplicate is "like" its first copy: use that copy's vector.
      const sourceId = doc.duplicate_of ?? doc.id;
      const source =
        sourceId === doc.id ? doc : await findSearchableDocument(ctx.db, matterId, sourceId);
      const text = `${source?.title ?? ''}\n${source?.body ?? ''}`;
      excludeId = sourceId;
      const index = space.indexOf(sourceId);
      if (index !== undefined) {
        queryVector = Float64Array.from(space.docVector(index));
        exclude = index;
      } else if (source?.body != null) {
        // Not in the space yet (waiting for fold-in): fold its text in as a query.
        queryVector = space.queryVector(text).vector;
        notices.push(
          'This document is not in the concept index yet; its text was folded in for this search.',
        );
      } else {
        throw conflict(
          'This document has no extracted text, so there is nothing to compare it with.',
        );
      }
      queryTerms = strongestTerms(space, text, 10);
    } else {
      const q = space.queryVector(input.similarTo.passage);
      queryVector = q.vector;
      knownTerms = Array.from(q.weighted.ids, (id) => space.terms[id]);
      unknownTerms = q.weighted.unknown;
      queryTerms = new Set(knownTerms);
    }
  } else if (space) {
    // Keyword mode uses the vector only for the query's nearest terms (refinements).
    const q = space.queryVector(rankingText);
    queryVector = q.vector;
    knownTerms = Array.from(q.weighted.ids, (id) => space.terms[id]);
    unknownTerms = q.weighted.unknown;
  }
  if (!input.similarTo) {
    queryTerms = booleanQuery ? new Set(booleanQuery.stems) : new Set(analyze(input.query ?? ''));
  }

  let concept: Scored<number>[] = [];
  const conceptUsable = queryVector !== null && !isZero(queryVector);
  if (space && mode !== 'keyword') {
    if (!conceptUsable) {
      if (!booleanQuery || booleanQuery.text.trim() !== '')
        notices.push(
          input.similarTo
            ? 'Nothing in this text is in the concept index, so there is nothing to compare.'
            : 'No word of the query is in the concept index, so concept scores are empty.',
        );
    } else {
      concept = conceptList(space, queryVector!, cap, {
        dims: mode === 'hybrid' ? DEFAULT_HYBRID.conceptDims : undefined,
        allow: mask,
        exclude,
        // A Boolean query's hits are its match set, whatever their cosine.
        minCosine: booleanQuery ? -Infinity : CONCEPT_MIN_COSINE,
      });
      if (excludeId !== null) concept = concept.filter((h) => h.id !== excludeId);
    }
  }

  let keyword: Scored<number>[] = [];
  let keywordCoverage = 1;
  if (mode !== 'concept') {
    let { terms } = keywordQueryTerms(input.query ?? '');
    const index = await ctx.keyword.indexFor(matterId);
    if (booleanQuery) terms = booleanQuery.rankTerms(index);
    keywordCoverage = index.coverage(terms);
    if (terms.length === 0) {
      if (!booleanQuery) notices.push('The query has no searchable word.');
    } else {
      const found = index.search(terms, {
        limit: cap,
        allow: allowIds ? new Set(allowIds) : undefined,
      });
      keyword = found.ids.map((id, i) => ({ id, score: found.scores[i] }));
    }
  }

  if (booleanQuery) {
    // Every satisfying document is a hit: those no list scored follow, in load order.
    if (mode !== 'keyword') concept = booleanQuery.complete(concept, cap);
    if (mode !== 'concept') keyword = booleanQuery.complete(keyword, cap);
  }
  let ids: number[];
  let raw: number[];
  let bar: number[];
  if (mode === 'concept') {
    ids = concept.map((h) => h.id);
    raw = concept.map((h) => h.score);
    bar = raw.map((s) => Math.max(0, Math.min(1, s)));
  } else if (mode === 'keyword') {
    ids = keyword.map((h) => h.id);
    raw = keyword.map((h) => h.score);
    const top = raw.length > 0 ? raw[0] : 1;
    bar = raw.map((s) => (top > 0 ? Math.max(0, Math.min(1, s / top)) : 1));
  } else {
    // Each list weighed by the share of the query's words it can see (fusion.ts).
    const seen = knownTerms.length + unknownTerms.length;
    const weight = coverageWeight(
      DEFAULT_HYBRID.keywordWeight,
      keywordCoverage,
      seen > 0 ? knownTerms.length / seen : 0,
    );
    const fused = fuseScores(keyword, concept, weight, {
      conceptCoverage: seen > 0 ? knownTerms.length / seen : 0,
      outsideConcept: (id) => space?.indexOf(id) === undefined,
    }).slice(0, cap);
    ids = fused.map((h) => h.id);
    raw = fused.map((h) => h.score);
    bar = raw.map((s) => Math.max(0, Math.min(1, s)));
  }
  const capped = ids.length >= cap;
  let duplicateOf: (number | null)[] = ids.map(() => null);

  if (filters.includeDuplicates && ids.length > 0) {
    const dups = await duplicatesOf(ctx.db, matterId, ids, filters);
    if (dups.length > 0) {
      const byFirst = new Map<number, number[]>();
      for (const d of dups) {
        if (d.id === excludeId) continue;
        const list = byFirst.get(d.duplicate_of) ?? [];
        list.push(d.id);
        byFirst.set(d.duplicate_of, list);
      }
      const nIds: number[] = [];
      const nRaw: number[] = [];
      const nBar: number[] = [];
      const nDup: (number | null)[] = [];
      ids.forEach((id, i) => {
        nIds.push(id);
        nRaw.push(raw[i]);
        nBar.push(bar[i]);
        nDup.push(null);
        for (const dup of byFirst.get(id) ?? []) {
          nIds.push(dup);
          nRaw.push(raw[i]);
          nBar.push(bar[i]);
          nDup.push(id);
        }
      });
      ids = nIds.slice(0, cap);
      raw = nRaw.slice(0, cap);
      bar = nBar.slice(0, cap);
      duplicateOf = nDup.slice(0, cap);
    }
  }

  const nearest =
    space && conceptUsable
      ? nearestTerms(space, queryVector!, NEAREST_TERMS + queryTerms.size)
          .filter((t) => !queryTerms.has(t.term))
          .slice(0, NEAREST_TERMS)
      : [];
  if (ids.length === 0 && notices.length === 0) notices.push('No document matches this search.');
  if (capped)
    notices.push(
      `Only the best ${cap.toLocaleString('en')} matches are listed; narrow the search with filters.`,
    );
  return {
    mode,
    ids,
    raw,
    bar,
    duplicateOf,
    capped,
    notices,
    knownTerms,
    unknownTerms,
    space,
    indexVersion: mode === 'keyword' ? null : (loaded?.version ?? null),
    queryVector: conceptUsable ? queryVector : null,
    queryTerms,
    nearest,
    ...(mode === 'concept' && !booleanQuery ? { conceptCutoff: CONCEPT_MIN_COSINE } : {}),
  };
}
