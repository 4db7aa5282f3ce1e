// Prioritised review: status of the learned ranking, queuing its training, the
// ranking as a search mode, Rocchio "more like the Responsive documents", and
// prioritised batches.
import { keywordQueryTerms, mulberry32, rocchioRanking, simpleRandomSample } from '../engine/index';
import {
  MIN_CODES_EACH,
  RETRAIN_EVERY,
  type MoreLikeResponsiveResponse,
  type PrioritisedStatusResponse,
  type RankingModelInfo,
} from '../../shared/schemas/prioritised';
import type { SearchFilters } from '../../shared/schemas/search';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import { conflict } from '../http/errors';
import { findActiveJob } from '../jobs/queries';
import { documentsByIds, filteredDocumentIds, restricts } from '../search/queries';
import { latestModel, latestModelInfo, relevanceCodes, relevanceLabels } from './queries';
import { decodeScores } from './scores';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

export const TRAIN_JOB = 'train-ranking';

export interface TrainPayload {
  matterId: number;
  reason: string;
}

interface LabelState {
  responsiveCode: number | null;
  notResponsiveCode: number | null;
  responsive: Set<number>;
  notResponsive: Set<number>;
  /** Relevance code rows with coded_at after `since`. */
  newSince: (since: string) => number;
}

async function labelState(ctx: AppContext, matterId: number): Promise<LabelState> {
  const codes = await relevanceCodes(ctx.db, matterId);
  const rows = await relevanceLabels(ctx.db, matterId, codes);
  const responsive = new Set<number>();
  const notResponsive = new Set<number>();
  for (const r of rows)
    (r.code_id === codes.responsive ? responsive : notResponsive).add(r.document_id);
  // A document carrying both is left out of training (and of these counts).
  for (const id of [...responsive]) if (notResponsive.delete(id)) responsive.delete(id);
  return {
    responsiveCode: codes.responsive,
    notResponsiveCode: codes.notResponsive,
    responsive,
    notResponsive,
    newSince: (since) => rows.filter((r) => r.coded_at > since).length,
  };
}

function modelInfo(
  row: NonNullable<Awaited<ReturnType<typeof latestModelInfo>>>,
): RankingModelInfo {
  return {
    version: row.version,
    indexVersion: row.index_version,
    positives: row.positives,
    negatives: row.negatives,
    trainedAt: row.trained_at,
    trainMs: row.train_ms,
    rankMs: row.rank_ms,
    reason: row.reason,
    scored: Number(row.id_bytes) / 4,
    tuning: row.tuning ? (JSON.parse(row.tuning) as RankingModelInfo['tuning']) : null,
  };
}

export async function prioritisedStatus(
  ctx: AppContext,
  matterId: number,
): Promise<PrioritisedStatusResponse> {
  const [labels, model, job] = await Promise.all([
    labelState(ctx, matterId),
    latestModelInfo(ctx.db, matterId),
    findActiveJob(ctx.db, matterId, TRAIN_JOB),
  ]);
  return {
    responsive: labels.responsive.size,
    notResponsive: labels.notResponsive.size,
    moreResponsiveNeeded: Math.max(0, MIN_CODES_EACH - labels.responsive.size),
    moreNotResponsiveNeeded: Math.max(0, MIN_CODES_EACH - labels.notResponsive.size),
    newCodesSinceModel: model ? labels.newSince(model.coded_through) : 0,
    model: model ? modelInfo(model) : null,
    training: job ? { jobId: job.id, status: job.status as 'queued' | 'running' } : null,
    codesPresent: labels.responsiveCode !== null && labels.notResponsiveCode !== null,
  };
}

function neededMessage(status: PrioritisedStatusResponse): string {
  if (!status.codesPresent)
    return 'Prioritised review learns from codes named "Responsive" and "Not responsive"; add them to the code set first.';
  const parts: string[] = [];
  if (status.moreResponsiveNeeded > 0)
    parts.push(`${status.moreResponsiveNeeded} more coded Responsive`);
  if (status.moreNotResponsiveNeeded > 0)
    parts.push(`${status.moreNotResponsiveNeeded} more coded Not responsive`);
  return `Prioritised review needs ${MIN_CODES_EACH} documents of each kind before it can learn: ${parts.join(' and ')}.`;
}

/** Queues a training job unless one is already queued or running; returns its id. */
export async function queueTraining(
  ctx: AppContext,
  matterId: number,
  reason: string,
  createdBy: string | null,
): Promise<number> {
  return ctx.db.transaction().execute(async (trx) => {
    const active = await findActiveJob(trx, matterId, TRAIN_JOB);
    if (active) return active.id;
    return ctx.jobs.enqueue(trx, {
      matterId,
      kind: TRAIN_JOB,
      payload: { matterId, reason } satisfies TrainPayload,
      message: 'Waiting to train',
      createdBy,
    });
  });
}

/** POST .../prioritised/train: on demand (409 with what is missing when it cannot train). */
export async function requestTraining(ctx: AppContext, matterId: number, actor: Actor) {
  const status = await prioritisedStatus(ctx, matterId);
  if (!status.codesPresent || status.moreResponsiveNeeded > 0 || status.moreNotResponsiveNeeded > 0)
    throw conflict(neededMessage(status));
  if (!(await ctx.index.getIndex(matterId)))
    throw conflict('The matter has no concept index yet; the ranking is trained once it is built.');
  const jobId = await queueTraining(ctx, matterId, 'requested', actor.id);
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'ranking.train_requested',
    targetType: 'job',
    targetId: jobId,
    detail: { responsive: status.responsive, notResponsive: status.notResponsive },
  });
  return { jobId };
}

/**
 * After coding: queue the first training once 10 of each kind exist, and a retrain
 * every RETRAIN_EVERY new relevance codes. Only queues; the job does the work.
 */
export async function afterCoding(ctx: AppContext, matterId: number): Promise<void> {
  const status = await prioritisedStatus(ctx, matterId);
  if (status.training || !status.codesPresent) return;
  if (status.moreResponsiveNeeded > 0 || status.moreNotResponsiveNeeded > 0) return;
  if (!(await ctx.index.getIndex(matterId))) return;
  if (status.model === null) await queueTraining(ctx, matterId, 'first model', null);
  else if (status.newCodesSinceModel >= RETRAIN_EVERY)
    await queueTraining(ctx, matterId, `${status.newCodesSinceModel} new codes`, null);
}

export interface PrioritisedRanking {
  ids: number[];
  scores: number[];
  model: RankingModelInfo;
  /** Documents the filters allowed that the model has not scored yet (added since). */
  unscored: number;
}

/**
 * The latest model's ranking of the matter's documents that carry no relevance code,
 * narrowed by the search filters and, when given, to documents holding a query word.
 */
export async function prioritisedRanking(
  ctx: AppContext,
  matterId: number,
  input: { query?: string; filters: SearchFilters },
  cap: number,
): Promise<PrioritisedRanking> {
  const row = await latestModel(ctx.db, matterId);
  if (!row) {
    const status = await prioritisedStatus(ctx, matterId);
    throw conflict(
      status.moreResponsiveNeeded > 0 || status.moreNotResponsiveNeeded > 0 || !status.codesPresent
        ? neededMessage(status)
        : 'The first learned ranking is being trained; try again in a moment.',
    );
  }
  const labels = await labelState(ctx, matterId);
  const coded = new Set([...labels.responsive, ...labels.notResponsive]);
  const allow = restricts(input.filters)
    ? new Set(filteredDocumentIds(ctx.db, ctx.sqlite, matterId, input.filters))
    : null;
  let queryHits: Set<number> | null = null;
  const terms = keywordQueryTerms(input.query ?? '').terms;
  if ((input.query ?? '').trim() !== '' && terms.length > 0) {
    const index = await ctx.keyword.indexFor(matterId);
    queryHits = new Set(index.search(terms, { limit: 1_000_000 }).ids);
  }
  const { ids, scores } = decodeScores(row.doc_ids, row.scores);
  const order: number[] = [];
  for (let p = 0; p < ids.length; p++) {
    const id = ids[p];
    if (coded.has(id) || (allow && !allow.has(id)) || (queryHits && !queryHits.has(id))) continue;
    order.push(p);
  }
  order.sort((a, b) => scores[b] - scores[a] || ids[a] - ids[b]);
  const scored = new Set(ids);
  let unscored = 0;
  if (allow) for (const id of allow) if (!scored.has(id) && !coded.has(id)) unscored++;
  const info = await latestModelInfo(ctx.db, matterId);
  return {
    ids: order.slice(0, cap).map((p) => ids[p]),
    scores: order.slice(0, cap).map((p) => scores[p]),
    model: modelInfo(info!),
    unscored,
  };
}

/** POST .../prioritised/more-like-responsive: Rocchio feedback in the concept space. */
export async function moreLikeResponsive(
  ctx: AppContext,
  matterId: number,
  input: { filters: SearchFilters; limit: number },
  actor: Actor,
): Promise<MoreLikeResponsiveResponse> {
  const loaded = await ctx.index.getIndex(matterId);
  if (!loaded) throw conflict('The matter has no concept index yet.');
  const { space } = loaded;
  const labels = await labelState(ctx, matterId);
  const toIndices = (ids: Set<number>) =>
    [...ids].map((id) => space.indexOf(id)).filter((j): j is number => j !== undefined);
  const relevant = toIndices(labels.responsive);
  const nonRelevant = toIndices(labels.notResponsive);
  if (relevant.length === 0)
    throw conflict('No indexed document is coded Responsive yet, so there is nothing to be like.');
  let allow: Uint8Array | undefined;
  if (restricts(input.filters)) {
    allow = new Uint8Array(space.nDocs);
    for (const id of filteredDocumentIds(ctx.db, ctx.sqlite, matterId, input.filters)) {
      const j = space.indexOf(id);
      if (j !== undefined) allow[j] = 1;
    }
  }
  const hits = rocchioRanking(space, {
    relevant,
    nonRelevant,
    alpha: 0,
    limit: input.limit,
    allow,
  });
  const ids = hits.map((h) => Number(space.docId(h.index)));
  const docs = new Map((await documentsByIds(ctx.db, matterId, ids)).map((d) => [d.id, d]));
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'ranking.feedback_search',
    targetType: 'search',
    detail: {
      method: 'rocchio',
      relevant: relevant.length,
      nonRelevant: nonRelevant.length,
      filters: input.filters,
      hits: ids.length,
      indexVersion: loaded.version,
    },
  });
  return {
    relevant: relevant.length,
    nonRelevant: nonRelevant.length,
    indexVersion: loaded.version,
    documents: hits
      .map((h, r) => {
        const d = docs.get(ids[r]);
        return d
          ? {
              documentId: d.id,
              controlNumber: d.control_number,
              title: d.title || d.original_name,
              score: h.score,
              rank: r + 1,
            }
          : null;
      })
      .filter((d): d is NonNullable<typeof d> => d !== null),
  };
}

/**
 * The next `size` documents to review: the model's top uncoded documents, with
 * round(size x randomShare) of them swapped for uncoded documents drawn at random
 * (seeded), so the model also sees documents unlike those it already knows
 * (Cormack & Grossman 2014 discuss such uncertainty and random additions).
 */
export async function prioritisedSelection(
  ctx: AppContext,
  matterId: number,
  input: { size: number; randomShare: number; seed: number },
): Promise<{ documents: { documentId: number; random: boolean }[]; model: RankingModelInfo }> {
  const ranking = await prioritisedRanking(ctx, matterId, { filters: {} }, 1_000_000);
  const nRandom = Math.round(input.size * input.randomShare);
  const top = ranking.ids.slice(0, input.size - nRandom);
  const rest = ranking.ids.slice(input.size - nRandom);
  const randomPicks = simpleRandomSample(rest, Math.min(nRandom, rest.length), input.seed);
  // Random picks are spread through the batch (seeded positions), not left at the end.
  const random = mulberry32(input.seed ^ 0x5bd1e995);
  const documents = top.map((documentId) => ({ documentId, random: false }));
  for (const documentId of randomPicks)
    documents.splice(Math.floor(random() * (documents.length + 1)), 0, {
      documentId,
      random: true,
    });
  return { documents, model: ranking.model };
}
