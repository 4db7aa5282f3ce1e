import type { RecentSearch, RecentSearchesResponse } from '../../shared/schemas/saved-searches';
import {
  SEARCH_RESULT_SET_MAX,
  type SearchFilters,
  type SearchHit,
  type SearchMode,
  type SearchParsedReq,
  type SearchResponse,
  type SearchSort,
} from '../../shared/schemas/search';
import { recordAudit } from '../audit/record';
import { appliedCodesOf } from '../codes/service';
import type { AppContext } from '../context';
import { analyzeWithSurface, isStopWord } from '../engine/index';
import { topContributionsOfWeighted } from './explain-hit';
import { HitTextCache } from './hit-texts';
import { Gate, SEARCHES_IN_FLIGHT } from './search-gate';
import {
  buildSnippet,
  HIT_WINDOW_CHARS,
  collectSurfaces,
  surfaceOf,
  type MarkTerms,
} from './highlight';
import { documentsByIds, recentSearchEvents, sortedPage, textsByIds } from './queries';
import { rankResultSet, type RankedSet } from './ranking';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

const DEFAULT_SORT: SearchSort = { field: 'score', direction: 'desc' };

/**
 * Whether a term is worth showing as a reason or a refinement: not a number, not an
 * English stop word, not a one- or two-letter token (common practice for term lists
 * shown to people: such tokens carry little meaning on their own).
 */
export function isShownTerm(word: string): boolean {
  const w = word.toLowerCase();
  return [...w].length > 2 && !/^[\p{N}.,'’-]+$/u.test(w) && !isStopWord(w);
}

/** Stems of the query mapped back to the words as the person typed them. */
function typedForms(query: string, stems: string[]): string[] {
  const surfaceOf = new Map<string, string>();
  for (const { term, surface } of analyzeWithSurface(query))
    if (!surfaceOf.has(term)) surfaceOf.set(term, surface);
  return stems.map((s) => surfaceOf.get(s) ?? s);
}

const gates = new WeakMap<AppContext, Gate>();
function gateOf(ctx: AppContext): Gate {
  let gate = gates.get(ctx);
  if (!gate) gates.set(ctx, (gate = new Gate(SEARCHES_IN_FLIGHT)));
  return gate;
}

const hitTextCaches = new WeakMap<AppContext, HitTextCache>();
function hitTextsOf(ctx: AppContext): HitTextCache {
  let cache = hitTextCaches.get(ctx);
  if (!cache) hitTextCaches.set(ctx, (cache = new HitTextCache(HIT_WINDOW_CHARS)));
  return cache;
}
const TOP_TERMS = 6;

/** The page's document ids in the requested order. */
export async function pageIds(
  ctx: AppContext,
  ranked: RankedSet,
  sort: SearchSort,
  limit: number,
  offset: number,
): Promise<number[]> {
  if (sort.field === 'score') {
    if (sort.direction === 'desc') return ranked.ids.slice(offset, offset + limit);
    const n = ranked.ids.length;
    const out: number[] = [];
    for (let i = n - 1 - offset; i >= 0 && out.length < limit; i--) out.push(ranked.ids[i]);
    return out;
  }
  if (ranked.ids.length === 0) return [];
  return sortedPage(ctx.db, ranked.ids, { ...sort, field: sort.field }, limit, offset);
}

/** Snippets, why-it-matched and listing fields for the page's hits. */
async function explainPage(
  ctx: AppContext,
  matterId: number,
  ranked: RankedSet,
  ids: number[],
): Promise<SearchHit[]> {
  if (ids.length === 0) return [];
  // Rank positions of the page's documents only (the result set may hold 10,000).
  const position = new Map<number, number>(ids.map((id) => [id, -1]));
  for (let i = 0; i < ranked.ids.length; i++)
    if (position.get(ranked.ids[i]) === -1) position.set(ranked.ids[i], i);
  const [docs, texts, codes] = await Promise.all([
    documentsByIds(ctx.db, matterId, ids),
    textsByIds(
      ctx.db,
      ids.map((id) => ranked.duplicateOf[position.get(id)!] ?? id),
      HIT_WINDOW_CHARS,
    ),
    appliedCodesOf(ctx.db, ids),
  ]);
  const docById = new Map(docs.map((d) => [d.id, d]));
  const textById = new Map(texts.map((t) => [t.document_id, t]));
  const space = ranked.space;
  const nearestSet = new Set(ranked.nearest.map((t) => t.term));
  const termDots = new Map<number, number>();
  const hitTexts = hitTextsOf(ctx);
  const prepared = ids
    .filter((id) => docById.has(id))
    .map((id) => {
      const i = position.get(id)!;
      const sourceId = ranked.duplicateOf[i] ?? id;
      const t = textById.get(sourceId);
      const hitText = hitTexts.get(sourceId, t?.title ?? '', t?.body ?? '');
      const body = hitText.body;
      const spans = hitText.spans;
      let contributions: { term: string; weight: number }[] = [];
      const index = space?.indexOf(sourceId);
      if (space && ranked.mode !== 'keyword' && ranked.queryVector && index !== undefined) {
        contributions = topContributionsOfWeighted(
          space,
          ranked.queryVector,
          index,
          hitText.weighted(space),
          TOP_TERMS,
          termDots,
        ).map((c) => ({ term: c.term, weight: c.contribution }));
      } else {
        // Keyword: the query's terms the document holds, by how often it uses them.
        const counts = new Map<string, number>();
        for (const s of spans)
          if (s.term && ranked.queryTerms.has(s.term))
            counts.set(s.term, (counts.get(s.term) ?? 0) + 1);
        const total = [...counts.values()].reduce((a, b) => a + b, 0);
        contributions = [...counts.entries()]
          .sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1))
          .slice(0, TOP_TERMS)
          .map(([term, n]) => ({ term, weight: n / total }));
      }
      contributions = contributions.filter((c) => isShownTerm(c.term));
      return { id, i, body, bodyLength: t?.body_length ?? 0, spans, contributions };
    });
  // Surface forms from the page's texts are only consulted for terms the index has no
  // label for (surfaceOf), so they are collected only when such a term is shown.
  const surfaces = new Map<string, Map<string, number>>();
  const labelled = (term: string) => {
    const termId = space?.termId(term);
    return termId !== undefined && Boolean(space?.labels?.[termId]);
  };
  if (
    ranked.nearest.some((t) => !labelled(t.term)) ||
    prepared.some((p) => p.contributions.some((c) => !labelled(c.term)))
  )
    for (const p of prepared) collectSurfaces(p.spans, surfaces);
  const nearestQueryTerms = ranked.nearest
    .map((t) => ({ term: surfaceOf(t.term, surfaces, space), similarity: t.similarity }))
    .filter((t) => isShownTerm(t.term));
  return prepared.map(({ id, i, body, bodyLength, spans, contributions }) => {
    const doc = docById.get(id)!;
    // Concept marks: the query's nearest terms and the document's own contributing terms.
    const concept = new Set(nearestSet);
    for (const c of contributions) if (!ranked.queryTerms.has(c.term)) concept.add(c.term);
    const marks: MarkTerms = { query: ranked.queryTerms, concept };
    return {
      documentId: id,
      controlNumber: doc.control_number,
      title: doc.title || doc.original_name,
      custodian: doc.custodian_name,
      sentAt: doc.sent_at,
      docType: doc.doc_type,
      score: ranked.bar[i],
      rawScore: ranked.raw[i],
      rank: i + 1,
      codes: (codes.get(id) ?? []).map((c) => ({ id: c.id, name: c.name })),
      snippet: buildSnippet(body, spans, marks, bodyLength),
      why: {
        topTerms: contributions
          .map((c) => ({ term: surfaceOf(c.term, surfaces, space), weight: c.weight }))
          .filter((c) => isShownTerm(c.term)),
        nearestQueryTerms,
      },
      duplicateOf: ranked.duplicateOf[i],
      parentId: doc.parent_id,
    };
  });
}

/** POST .../search (and GET .../documents/:docId/similar): one page, audited as search.run. */
export function runSearch(
  ctx: AppContext,
  matterId: number,
  req: SearchParsedReq,
  actor: Actor,
): Promise<SearchResponse> {
  return gateOf(ctx).run(() => searchNow(ctx, matterId, req, actor));
}

async function searchNow(
  ctx: AppContext,
  matterId: number,
  req: SearchParsedReq,
  actor: Actor,
): Promise<SearchResponse> {
  const started = performance.now();
  const sort = req.sort ?? DEFAULT_SORT;
  const ranked = await rankResultSet(
    ctx,
    matterId,
    { query: req.query, mode: req.mode, similarTo: req.similarTo, filters: req.filters },
    SEARCH_RESULT_SET_MAX,
  );
  const ids = await pageIds(ctx, ranked, sort, req.limit, req.offset);
  const hits = await explainPage(ctx, matterId, ranked, ids);
  const tookMs = Math.round((performance.now() - started) * 10) / 10;
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'search.run',
    targetType: 'search',
    detail: {
      mode: ranked.mode,
      requestedMode: req.mode,
      query: req.query ?? '',
      similarTo: req.similarTo ?? null,
      filters: req.filters,
      sort,
      limit: req.limit,
      offset: req.offset,
      hits: ranked.ids.length,
      capped: ranked.capped,
      indexVersion: ranked.indexVersion,
      savedSearchId: req.savedSearchId ?? null,
      tookMs,
    },
  });
  return {
    total: ranked.ids.length,
    capped: ranked.capped,
    tookMs,
    mode: ranked.mode,
    limit: req.limit,
    offset: req.offset,
    sort,
    hits,
    knownTerms: ranked.knownTerms,
    // As typed ("interaction"), not as the index's stems ("interact").
    unknownTerms: typedForms(
      req.query ?? (req.similarTo && 'passage' in req.similarTo ? req.similarTo.passage : ''),
      ranked.unknownTerms,
    ),
    ...(ranked.notices.length > 0 ? { notice: ranked.notices.join(' ') } : {}),
    indexVersion: ranked.indexVersion,
    ...(ranked.conceptCutoff !== undefined ? { conceptCutoff: ranked.conceptCutoff } : {}),
  };
}

const RECENT_SCAN = 500;

/** The caller's last 20 distinct searches in the matter, from the audit log. */
export async function recentSearches(
  ctx: AppContext,
  matterId: number,
  userId: string,
  max: number,
): Promise<RecentSearchesResponse> {
  const events = await recentSearchEvents(ctx.db, matterId, userId, RECENT_SCAN);
  const seen = new Set<string>();
  const searches: RecentSearch[] = [];
  for (const event of events) {
    let detail: Record<string, unknown>;
    try {
      detail = JSON.parse(event.detail) as Record<string, unknown>;
    } catch {
      continue;
    }
    const similarTo = detail.similarTo as { documentId?: number; passage?: string } | null;
    // A passage search is not offered again (the passage may be long and is in the log).
    if (similarTo && similarTo.documentId === undefined) continue;
    const query = typeof detail.query === 'string' ? detail.query : '';
    const mode = (detail.requestedMode ?? detail.mode) as SearchMode;
    const filters = (detail.filters ?? {}) as SearchFilters;
    const key = JSON.stringify([query, mode, filters, similarTo?.documentId ?? null]);
    if (seen.has(key)) continue;
    seen.add(key);
    searches.push({
      query,
      mode,
      filters,
      similarToDocumentId: similarTo?.documentId ?? null,
      hits: typeof detail.hits === 'number' ? detail.hits : 0,
      at: event.at,
    });
    if (searches.length >= max) break;
  }
  return { searches };
}
