// Training the matter's learned ranking and re-ranking every document: run by the
// train-ranking job (server/jobs/train-ranking.ts), never inside a request.
import {
  analyze,
  documentExample,
  DEFAULT_HYBRID,
  keywordQueryTerms,
  tuneFromCodes,
  scoreDocuments,
  strongestTerms,
  trainRanker,
  DEFAULT_RANKER_LAMBDA,
  type ConceptSpace,
  type LabelledExample,
  type RankerModel,
  type TermWeights,
} from '../engine/index';
import {
  MIN_CODES_EACH,
  MIN_CODES_FOR_TUNING,
  type RankingModelInfo,
  type TuningResult,
} from '../../shared/schemas/prioritised';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import { latestModel, relevanceCodes, relevanceLabels, textsOf } from './queries';
import { encodeScores } from './scores';

/**
 * Each matter's documents' strongest terms for the serving index version, kept in
 * memory between retrains: analysing every text is the slow part, and a document's
 * terms change only when the index version does (new vocabulary and weights).
 */
interface MatterCache {
  terms?: { indexId: number; terms: Map<number, TermWeights | null> };
  model?: { indexId: number; model: RankerModel };
}
/** Per context (one per process; tests make several), per matter. */
const caches = new WeakMap<AppContext, Map<number, MatterCache>>();

function cacheOf(ctx: AppContext, matterId: number): MatterCache {
  let byMatter = caches.get(ctx);
  if (!byMatter) caches.set(ctx, (byMatter = new Map()));
  let entry = byMatter.get(matterId);
  if (!entry) byMatter.set(matterId, (entry = {}));
  return entry;
}

async function termsFor(
  ctx: AppContext,
  matterId: number,
  indexId: number,
  space: ConceptSpace,
  onProgress?: (done: number, total: number) => Promise<void>,
): Promise<Map<number, TermWeights | null>> {
  const cache = cacheOf(ctx, matterId);
  let entry = cache.terms;
  if (!entry || entry.indexId !== indexId) {
    entry = { indexId, terms: new Map() };
    cache.terms = entry;
  }
  const missing: number[] = [];
  for (let j = 0; j < space.nDocs; j++) {
    const id = Number(space.docId(j));
    if (!entry.terms.has(id)) missing.push(id);
  }
  const CHUNK = 500;
  for (let start = 0; start < missing.length; start += CHUNK) {
    const ids = missing.slice(start, start + CHUNK);
    const texts = await textsOf(ctx.db, ids);
    const byId = new Map(texts.map((t) => [t.document_id, t]));
    for (const id of ids) {
      const t = byId.get(id);
      const text = t ? `${t.title ?? ''}\n${t.body ?? ''}` : '';
      entry.terms.set(id, text.trim() ? strongestTerms(space.weightTerms(analyze(text))) : null);
    }
    await onProgress?.(Math.min(start + CHUNK, missing.length), missing.length);
  }
  return entry.terms;
}

export class NotEnoughCodes extends Error {}

export interface TrainOutcome {
  info: RankingModelInfo;
}

/** Trains on the matter's relevance codes, scores every indexed document, stores the model. */
export async function trainAndRank(
  ctx: AppContext,
  matterId: number,
  reason: string,
  progress?: (message: string, fraction: number) => Promise<void>,
): Promise<RankingModelInfo> {
  const loaded = await ctx.index.getIndex(matterId);
  if (!loaded) throw new NotEnoughCodes('The matter has no concept index yet; build it first.');
  const { space, indexId, version: indexVersion } = loaded;
  const codes = await relevanceCodes(ctx.db, matterId);
  if (codes.responsive === null || codes.notResponsive === null)
    throw new NotEnoughCodes(
      'The code set needs codes named "Responsive" and "Not responsive" to train a ranking.',
    );
  const labels = await relevanceLabels(ctx.db, matterId, codes);
  const byDoc = new Map<number, Set<number>>();
  let codedThrough = '';
  for (const row of labels) {
    const set = byDoc.get(row.document_id) ?? new Set<number>();
    set.add(row.code_id);
    byDoc.set(row.document_id, set);
    if (row.coded_at > codedThrough) codedThrough = row.coded_at;
  }
  await progress?.('Reading document terms', 0.05);
  const terms = await termsFor(ctx, matterId, indexId, space, (done, total) =>
    progress
      ? progress(`Reading terms of ${done} of ${total} documents`, 0.05 + 0.6 * (done / total))
      : Promise.resolve(),
  );
  const trainStart = performance.now();
  const examples: LabelledExample[] = [];
  const labelledRows: { index: number; label: 0 | 1 }[] = [];
  for (const [documentId, set] of byDoc) {
    // A document carrying both codes is contradictory: it teaches nothing.
    if (set.size !== 1) continue;
    const index = space.indexOf(documentId);
    if (index === undefined) continue;
    const label = set.has(codes.responsive) ? 1 : 0;
    examples.push({ ...documentExample(space, index, terms.get(documentId) ?? null), label });
    labelledRows.push({ index, label });
  }
  const positives = examples.filter((e) => e.label === 1).length;
  const negatives = examples.length - positives;
  if (positives < MIN_CODES_EACH || negatives < MIN_CODES_EACH)
    throw new NotEnoughCodes(
      `Training needs at least ${MIN_CODES_EACH} indexed documents coded Responsive and ${MIN_CODES_EACH} coded Not responsive (have ${positives} and ${negatives}).`,
    );
  await progress?.(`Training on ${positives} Responsive and ${negatives} Not responsive`, 0.7);
  const previous = cacheOf(ctx, matterId).model;
  const model = trainRanker(space, examples, {
    lambda: DEFAULT_RANKER_LAMBDA,
    previous: previous?.indexId === indexId ? previous.model : undefined,
  });
  cacheOf(ctx, matterId).model = { indexId, model };
  const trainMs = performance.now() - trainStart;
  const rankStart = performance.now();
  const scores = scoreDocuments(space, model, (j) => terms.get(Number(space.docId(j))) ?? null);
  const ids = new Int32Array(space.nDocs);
  for (let j = 0; j < space.nDocs; j++) ids[j] = Number(space.docId(j));
  const encoded = encodeScores(ids, Float32Array.from(scores));
  const rankMs = performance.now() - rankStart;
  let tuning: TuningResult | null = null;
  if (positives >= MIN_CODES_FOR_TUNING && negatives >= MIN_CODES_FOR_TUNING) {
    await progress?.('Measuring k and the hybrid weight on the codes', 0.9);
    tuning = await measureTuning(ctx, matterId, space, labelledRows);
  }
  const prior = await latestModel(ctx.db, matterId);
  const version = (prior?.version ?? 0) + 1;
  const trainedAt = new Date().toISOString();
  const info: RankingModelInfo = {
    version,
    indexVersion,
    positives,
    negatives,
    trainedAt,
    trainMs: Math.round(trainMs * 10) / 10,
    rankMs: Math.round(rankMs * 10) / 10,
    reason,
    scored: space.nDocs,
    tuning,
  };
  await ctx.db.transaction().execute(async (trx) => {
    await trx
      .insertInto('ranking_models')
      .values({
        matter_id: matterId,
        version,
        index_version: indexVersion,
        positives,
        negatives,
        coded_through: codedThrough,
        lambda: model.logistic.lambda,
        train_ms: info.trainMs,
        rank_ms: info.rankMs,
        reason,
        tuning: tuning ? JSON.stringify(tuning) : null,
        trained_at: trainedAt,
        doc_ids: encoded.docIds,
        scores: encoded.scores,
      })
      .execute();
    await recordAudit(trx, {
      matterId,
      action: 'ranking.trained',
      targetType: 'ranking_model',
      targetId: version,
      detail: {
        ...info,
        tuning: tuning ? { current: tuning.current, best: tuning.best } : null,
        newtonIterations: model.logistic.iterations,
      },
    });
  });
  return info;
}

/**
 * Cross-validated measurement of the concept axes and hybrid keyword weight on the
 * codes (tuneFromCodes), keyword scores from the matter's keyword index (bm25).
 */
async function measureTuning(
  ctx: AppContext,
  matterId: number,
  space: ConceptSpace,
  rows: { index: number; label: 0 | 1 }[],
): Promise<TuningResult> {
  const entry = cacheOf(ctx, matterId).terms;
  const keywordIndex = await ctx.keyword.indexFor(matterId);
  const result = tuneFromCodes(space, rows, {
    folds: 5,
    dims: [25, 50, 100, 150, 200, 300],
    weights: [0, 0.2, 0.3, 0.5, 0.7],
    termsOf: (j) => {
      const t = entry?.terms.get(Number(space.docId(j)));
      return t ? Array.from(t.ids, (id) => space.labels[id] ?? space.terms[id]) : [];
    },
    keyword: (words, candidates) => {
      const ids = candidates.map((j) => Number(space.docId(j)));
      const rowOf = new Map(ids.map((id, i) => [id, candidates[i]]));
      const found = keywordIndex.search(keywordQueryTerms(words.join(' ')).terms, {
        limit: candidates.length,
        allow: new Set(ids),
      });
      return found.ids.map((id, i) => ({ id: rowOf.get(id)!, score: found.scores[i] }));
    },
  });
  const current =
    result.cells.find(
      (c) => c.dims === space.k && c.keywordWeight === DEFAULT_HYBRID.keywordWeight,
    ) ?? result.cells.find((c) => c.dims === space.k)!;
  return { folds: result.folds, current, best: result.best, cells: result.cells };
}
