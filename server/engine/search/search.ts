// One search function, three modes:
//  concept  - cosine in the LSI concept space (server/engine/index/concept-space.ts);
//  keyword  - FTS5 bm25, through a caller-supplied function (the server scopes it
//             to a matter; the eval uses its own database);
//  hybrid   - per-query min-max normalised keyword and concept scores fused
//             (server/engine/search/fusion.ts); the concept part uses the first
//             `conceptDims` axes of the same SVD, a small-k LSI score as in
//             Kontostathis (2007). Weights tuned on Cranfield: docs/RETRIEVAL.md.
import type { ConceptSpace, DocId } from '../index/concept-space';
import { coverageWeight, fuseScores, type Scored } from './fusion';
import { topCosine } from './top-n';

export type SearchMode = 'concept' | 'keyword' | 'hybrid';
export const SEARCH_MODES: readonly SearchMode[] = ['concept', 'keyword', 'hybrid'];

/** Tuned on Cranfield (docs/RETRIEVAL.md). */
export const DEFAULT_HYBRID = { keywordWeight: 0.3, conceptDims: 100 };

export type KeywordSource = ((query: string, limit: number) => Scored<DocId>[]) & {
  /** Share of the query's words the keyword index holds (1 when not given). */
  coverage?: (query: string) => number;
};

export interface SearchOptions {
  mode: SearchMode;
  /** Hits to return (default 50). */
  limit?: number;
  offset?: number;
  /** Candidate filter: documents allowed (a mask over the space's rows, or a set of ids). */
  allow?: Uint8Array | ReadonlySet<DocId>;
  /** Required for keyword and hybrid modes. */
  keyword?: KeywordSource;
  hybrid?: { keywordWeight?: number; conceptDims?: number };
  /** How deep each list goes before fusion (default 1000; concept mode: the page). */
  depth?: number;
}

export interface SearchHit {
  id: DocId;
  score: number;
  /** Cosine in the concept space (concept mode) or its normalised share (hybrid). */
  concept: number | null;
  /** bm25 (keyword mode) or its normalised share (hybrid). */
  keyword: number | null;
}

export interface SearchResult {
  mode: SearchMode;
  hits: SearchHit[];
  /** Query terms after analysis that the index knows, and those it does not. */
  knownTerms: string[];
  unknownTerms: string[];
  notices: string[];
}

function allowMask(space: ConceptSpace, allow: SearchOptions['allow']): Uint8Array | undefined {
  if (allow === undefined || allow instanceof Uint8Array) return allow;
  const mask = new Uint8Array(space.nDocs);
  for (const id of allow) {
    const index = space.indexOf(id);
    if (index !== undefined) mask[index] = 1;
  }
  return mask;
}

function allowed(space: ConceptSpace | null, allow: SearchOptions['allow'], id: DocId): boolean {
  if (allow === undefined) return true;
  if (allow instanceof Uint8Array) {
    const index = space?.indexOf(id);
    return index !== undefined && allow[index] !== 0;
  }
  return allow.has(id);
}

/** Concept-space cosine ranking of a query (up to `depth`). */
export function conceptRanking(
  space: ConceptSpace,
  query: string,
  depth: number,
  options: { dims?: number; allow?: Uint8Array } = {},
): { ranked: Scored<DocId>[]; knownTerms: string[]; unknownTerms: string[] } {
  const { vector, weighted } = space.queryVector(query);
  const dims = Math.min(options.dims ?? space.k, space.k);
  const top = topCosine(
    space.docMatrix,
    space.k,
    space.nDocs,
    space.inverseNorms(dims),
    vector,
    depth,
    // The int8 first pass (top-n.ts) is exact here: ConceptSpace.inverseNorms is
    // recomputed whenever a document vector changes.
    { dims, allow: options.allow, quantised: true },
  );
  const ranked: Scored<DocId>[] = [];
  for (let r = 0; r < top.indices.length; r++)
    ranked.push({ id: space.docId(top.indices[r]), score: top.scores[r] });
  return {
    ranked,
    knownTerms: Array.from(weighted.ids, (id) => space.terms[id]),
    unknownTerms: weighted.unknown,
  };
}

export function search(
  space: ConceptSpace | null,
  query: string,
  options: SearchOptions,
): SearchResult {
  const limit = options.limit ?? 50;
  const offset = options.offset ?? 0;
  // Fusion needs each list deeper than the page; a concept-only ranking does not.
  const defaultDepth = options.mode === 'concept' ? 0 : 1000;
  const depth = Math.max(options.depth ?? defaultDepth, limit + offset);
  const notices: string[] = [];
  const mode = options.mode;
  if (!SEARCH_MODES.includes(mode))
    throw new RangeError(`mode must be one of ${SEARCH_MODES.join(', ')}`);
  if ((mode === 'concept' || mode === 'hybrid') && !space) {
    throw new Error(`${mode} search needs a concept space; none is built yet`);
  }
  if ((mode === 'keyword' || mode === 'hybrid') && !options.keyword) {
    throw new Error(`${mode} search needs a keyword source`);
  }
  let known: string[] = [];
  let unknown: string[] = [];
  let concept: Scored<DocId>[] = [];
  if (space && mode !== 'keyword') {
    const dims =
      mode === 'hybrid' ? (options.hybrid?.conceptDims ?? DEFAULT_HYBRID.conceptDims) : space.k;
    const result = conceptRanking(space, query, depth, {
      dims,
      allow: allowMask(space, options.allow),
    });
    concept = result.ranked;
    known = result.knownTerms;
    unknown = result.unknownTerms;
    if (known.length === 0)
      notices.push('no query term is in the concept index; concept score is empty');
  }
  let keyword: Scored<DocId>[] = [];
  if (options.keyword && mode !== 'concept') {
    keyword = options.keyword(query, depth).filter((h) => allowed(space, options.allow, h.id));
  }
  let hits: SearchHit[];
  if (mode === 'concept') {
    hits = concept.map((h) => ({ id: h.id, score: h.score, concept: h.score, keyword: null }));
  } else if (mode === 'keyword') {
    hits = keyword.map((h) => ({ id: h.id, score: h.score, concept: null, keyword: h.score }));
  } else {
    const base = options.hybrid?.keywordWeight ?? DEFAULT_HYBRID.keywordWeight;
    const seen = known.length + unknown.length;
    const w = coverageWeight(
      base,
      options.keyword?.coverage?.(query) ?? 1,
      seen > 0 ? known.length / seen : 0,
    );
    hits = fuseScores(keyword, concept, w, {
      conceptCoverage: seen > 0 ? known.length / seen : 0,
      outsideConcept: (id) => space?.indexOf(id) === undefined,
    }).map((h) => ({
      id: h.id,
      score: h.score,
      concept: h.concept,
      keyword: h.keyword,
    }));
  }
  if (hits.length === 0 && notices.length === 0) notices.push('no document matches the query');
  return {
    mode,
    hits: hits.slice(offset, offset + limit),
    knownTerms: known,
    unknownTerms: unknown,
    notices,
  };
}

/**
 * Builds what the first concept or hybrid search of a space would otherwise build
 * (inverse row norms and the int8 copy of the document rows, for the full k and for
 * hybrid's first axes), about 1-2 s at 100,000 documents. Callers run it after loading
 * a space or folding documents in, so that cost does not land on a user's search.
 */
export function prepareForSearch(space: ConceptSpace): void {
  if (space.nDocs === 0 || space.k === 0) return;
  const probe = new Float64Array(space.k).fill(1);
  for (const dims of new Set([space.k, Math.min(space.k, DEFAULT_HYBRID.conceptDims)])) {
    topCosine(space.docMatrix, space.k, space.nDocs, space.inverseNorms(dims), probe, 1, {
      dims,
      quantised: true,
    });
  }
}

/** "More like this": documents nearest to a stored document's vector. */
export function similarDocuments(
  space: ConceptSpace,
  id: DocId,
  options: { limit?: number; allow?: Uint8Array | ReadonlySet<DocId> } = {},
): SearchHit[] {
  const index = space.indexOf(id);
  if (index === undefined)
    throw new RangeError(`document ${String(id)} is not in the concept index`);
  const top = topCosine(
    space.docMatrix,
    space.k,
    space.nDocs,
    space.inverseNorms(),
    space.docVector(index),
    options.limit ?? 20,
    { allow: allowMask(space, options.allow), exclude: index },
  );
  return Array.from(top.indices, (j, r) => ({
    id: space.docId(j),
    score: top.scores[r],
    concept: top.scores[r],
    keyword: null,
  }));
}
