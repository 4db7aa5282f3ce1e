// Production sets: define (source resolved to a fixed list of documents), check families,
// resolve gaps, build in the background (build.ts) and download. A built production is
// locked: it can be downloaded again, never changed; a correction is a new production.
import { existsSync } from 'node:fs';
import path from 'node:path';
import { EXPORT_RESULTS_MAX } from '../../shared/schemas/exports';
import {
  createProductionSchema,
  resolveFamilySchema,
  type CreateProductionReq,
  type FamilyGap,
  type Production,
  type ProductionResponse,
  type ProductionSource,
  type ProductionsResponse,
  type ResolveFamilyReq,
} from '../../shared/schemas/productions';
import type { Job } from '../../shared/schemas/jobs';
import { searchFiltersSchema, type SearchMode } from '../../shared/schemas/search';
import { actorOf, recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import type { Db } from '../db/database';
import { conflict, notFound, validationError } from '../http/errors';
import { findJob } from '../jobs/queries';
import { jobRowToApi } from '../jobs/map';
import { findSavedSearch } from '../saved-searches/queries';
import { rankResultSet } from '../search/ranking';
import { batesNumber } from './render-core';
import {
  documentsWithCodes,
  familyMembersOf,
  findProductionByName,
  findProductionRow,
  insertProduction,
  insertProductionDocuments,
  lastUsedSeq,
  listProductionDocuments,
  listProductionRows,
} from './queries';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

export interface BuildProductionPayload {
  productionId: number;
}

type Row = NonNullable<Awaited<ReturnType<typeof findProductionRow>>>;

/** Where a built production's zip lives. */
export const productionZipPath = (ctx: AppContext, matterId: number, productionId: number) =>
  path.join(ctx.config.dataDir, 'productions', String(matterId), `${productionId}.zip`);

/** A code named by id or (case-insensitively) by name, resolved within the matter. */
async function resolveCodes(
  db: Db,
  matterId: number,
  refs: (number | string)[],
  field: string,
): Promise<number[]> {
  if (refs.length === 0) return [];
  const codes = await db
    .selectFrom('codes')
    .select(['id', 'name'])
    .where('matter_id', '=', matterId)
    .execute();
  return refs.map((ref) => {
    const found = codes.find((c) =>
      typeof ref === 'number' ? c.id === ref : c.name.toLowerCase() === ref.toLowerCase(),
    );
    if (!found) throw validationError(field, `no code ${JSON.stringify(ref)} in this matter`);
    return found.id;
  });
}

/** The source's documents now (exact duplicates left out: their kept copy is produced). */
async function sourceDocuments(
  ctx: AppContext,
  matterId: number,
  source: ProductionSource,
): Promise<number[]> {
  if ('savedSearchId' in source) {
    const saved = await findSavedSearch(ctx.db, matterId, source.savedSearchId);
    if (!saved)
      throw validationError('source.savedSearchId', 'no such saved search in this matter');
    const filters = searchFiltersSchema.safeParse(JSON.parse(saved.filters));
    const ranked = await rankResultSet(
      ctx,
      matterId,
      {
        query: saved.query,
        mode: saved.mode as SearchMode,
        filters: filters.success ? filters.data : {},
      },
      EXPORT_RESULTS_MAX,
    );
    if (ranked.ids.length === 0) return [];
    const rows = await ctx.db
      .selectFrom('documents')
      .select('id')
      .where('matter_id', '=', matterId)
      .where('id', 'in', ranked.ids)
      .where('extract_status', '!=', 'duplicate')
      .execute();
    return rows.map((r) => r.id).sort((a, b) => a - b);
  }
  const include = await resolveCodes(ctx.db, matterId, source.codes, 'source.codes');
  const exclude = await resolveCodes(ctx.db, matterId, source.excludeCodes, 'source.excludeCodes');
  return documentsWithCodes(ctx.db, matterId, include, exclude);
}

/**
 * What producing the set would split: every member of a touched family that is not in the
 * set, named as the parent of a produced attachment or an attachment of a produced item.
 */
export async function familyGaps(
  db: Db,
  matterId: number,
  memberIds: readonly number[],
): Promise<FamilyGap[]> {
  const members = new Set(memberIds);
  const family = await familyMembersOf(db, matterId, [...members]);
  const byId = new Map(family.map((d) => [d.id, d]));
  const ancestorsOf = (id: number) => {
    const out: number[] = [];
    for (let p = byId.get(id)?.parent_id ?? null; p !== null; p = byId.get(p)?.parent_id ?? null)
      out.push(p);
    return out;
  };
  // The produced documents each missing member is related to.
  const gaps: FamilyGap[] = [];
  for (const doc of family) {
    if (members.has(doc.id)) continue;
    const producedDescendant = family.find(
      (d) => members.has(d.id) && ancestorsOf(d.id).includes(doc.id),
    );
    const producedAncestor = ancestorsOf(doc.id).find((a) => members.has(a));
    const producedRelative =
      producedDescendant ??
      (producedAncestor !== undefined ? byId.get(producedAncestor) : undefined) ??
      family.find((d) => members.has(d.id) && d.family_id === doc.family_id)!;
    gaps.push({
      documentId: doc.id,
      controlNumber: doc.control_number,
      title: doc.title || doc.original_name,
      relation: producedDescendant ? 'parent' : 'attachment',
      ofDocumentId: producedRelative.id,
      ofControlNumber: producedRelative.control_number,
    });
  }
  return gaps.sort((a, b) => a.controlNumber.localeCompare(b.controlNumber));
}

async function toApi(ctx: AppContext, row: Row): Promise<Production> {
  const docs = await listProductionDocuments(ctx.db, row.id);
  const counted = (t: string) =>
    row.state === 'built' ? docs.filter((d) => d.treatment === t).length : null;
  const gaps =
    row.state === 'built'
      ? []
      : await familyGaps(
          ctx.db,
          row.matter_id,
          docs.map((d) => d.document_id),
        );
  const fmt = (seq: number) => batesNumber(row.bates_prefix, row.bates_padding, seq);
  return {
    id: row.id,
    name: row.name,
    state: row.state,
    source: JSON.parse(row.source) as ProductionSource,
    bates: { prefix: row.bates_prefix, start: row.bates_start, padding: row.bates_padding },
    legend: row.legend,
    legendByCode: JSON.parse(row.legend_codes) as { codeId: number; legend: string }[],
    privileged: row.privileged,
    natives: row.natives as Production['natives'],
    counts: {
      documents: docs.length,
      added: docs.filter((d) => d.origin === 'added').length,
      slipSheets: docs.filter((d) => d.origin === 'slip-sheet').length,
      produced: counted('produced'),
      redacted: counted('redacted'),
      withheld: counted('withheld'),
      natives: counted('native'),
      pages: row.pages,
    },
    batesRange:
      row.first_seq !== null && row.last_seq !== null
        ? { first: fmt(row.first_seq), last: fmt(row.last_seq) }
        : null,
    familyCheck: { gaps, resolved: gaps.length === 0 },
    jobId: row.job_id,
    error: row.error,
    zip: row.zip_sha256 ? { sha256: row.zip_sha256, size: row.zip_size ?? 0 } : null,
    createdBy: row.creator_name
      ? { id: row.created_by, name: row.creator_name, email: row.creator_email ?? '' }
      : null,
    createdAt: row.created_at,
    builtAt: row.built_at,
  };
}

async function rowOrThrow(db: Db, matterId: number, id: number) {
  const row = await findProductionRow(db, matterId, id);
  if (!row) throw notFound('Production');
  return row;
}

export async function listProductions(
  ctx: AppContext,
  matterId: number,
): Promise<ProductionsResponse> {
  const rows = await listProductionRows(ctx.db, matterId);
  return { productions: await Promise.all(rows.map((r) => toApi(ctx, r))) };
}

export async function getProduction(
  ctx: AppContext,
  matterId: number,
  id: number,
): Promise<ProductionResponse> {
  return { production: await toApi(ctx, await rowOrThrow(ctx.db, matterId, id)) };
}

function checkStart(prefix: string, start: number, padding: number, last: number) {
  if (start <= last)
    throw validationError(
      'bates.start',
      `must be after ${batesNumber(prefix, padding, last)}, the last number this matter used with ${prefix}`,
    );
}

export async function createProduction(
  ctx: AppContext,
  matterId: number,
  input: CreateProductionReq,
  actor: Actor,
): Promise<ProductionResponse> {
  const req = createProductionSchema.parse(input);
  if (await findProductionByName(ctx.db, matterId, req.name))
    throw conflict(`A production named "${req.name}" already exists in this matter.`, 'name');
  const last = await lastUsedSeq(ctx.db, matterId, req.bates.prefix);
  const start = req.bates.start ?? last + 1;
  checkStart(req.bates.prefix, start, req.bates.padding, last);
  const legendCodes = await resolveCodes(
    ctx.db,
    matterId,
    req.legendByCode.map((l) => l.code),
    'legendByCode',
  );
  const documents = await sourceDocuments(ctx, matterId, req.source);
  if (documents.length === 0)
    throw validationError('source', 'selects no documents: nothing to produce');
  const id = await ctx.db.transaction().execute(async (trx) => {
    const productionId = await insertProduction(trx, {
      matter_id: matterId,
      name: req.name,
      source: JSON.stringify(req.source),
      bates_prefix: req.bates.prefix,
      bates_start: start,
      bates_padding: req.bates.padding,
      legend: req.legend,
      legend_codes: JSON.stringify(
        req.legendByCode.map((l, i) => ({ codeId: legendCodes[i], legend: l.legend })),
      ),
      privileged: req.privileged,
      natives: req.natives,
      job_id: null,
      first_seq: null,
      last_seq: null,
      pages: null,
      zip_sha256: null,
      zip_size: null,
      error: null,
      created_by: actor.id,
      created_at: new Date().toISOString(),
      built_at: null,
    });
    await insertProductionDocuments(
      trx,
      documents.map((documentId) => ({
        production_id: productionId,
        document_id: documentId,
        origin: 'source' as const,
      })),
    );
    await recordAudit(trx, {
      ...actorOf(actor, actor.ip),
      matterId,
      action: 'production.created',
      targetType: 'production',
      targetId: productionId,
      detail: {
        name: req.name,
        source: req.source,
        documents: documents.length,
        bates: { prefix: req.bates.prefix, start, padding: req.bates.padding },
        privileged: req.privileged,
      },
    });
    return productionId;
  });
  return getProduction(ctx, matterId, id);
}

function assertDraft(row: Row) {
  if (row.state === 'built')
    throw conflict('This production is built and locked; make a new production to change it.');
  if (row.state === 'building') throw conflict('This production is being built.');
}

export async function resolveFamily(
  ctx: AppContext,
  matterId: number,
  id: number,
  input: ResolveFamilyReq,
  actor: Actor,
): Promise<ProductionResponse> {
  const req = resolveFamilySchema.parse(input);
  const row = await rowOrThrow(ctx.db, matterId, id);
  assertDraft(row);
  const docs = await listProductionDocuments(ctx.db, id);
  const gaps = new Set(
    (
      await familyGaps(
        ctx.db,
        matterId,
        docs.map((d) => d.document_id),
      )
    ).map((g) => g.documentId),
  );
  const both = req.add.filter((d) => req.slipSheet.includes(d));
  if (both.length > 0) throw validationError('slipSheet', `lists document ${both[0]} in add too`);
  for (const [field, ids] of [
    ['add', req.add],
    ['slipSheet', req.slipSheet],
  ] as const)
    for (const docId of ids)
      if (!gaps.has(docId))
        throw validationError(field, `document ${docId} is not a family gap of this production`);
  await ctx.db.transaction().execute(async (trx) => {
    await insertProductionDocuments(trx, [
      ...req.add.map((documentId) => ({
        production_id: id,
        document_id: documentId,
        origin: 'added' as const,
      })),
      ...req.slipSheet.map((documentId) => ({
        production_id: id,
        document_id: documentId,
        origin: 'slip-sheet' as const,
      })),
    ]);
    await recordAudit(trx, {
      ...actorOf(actor, actor.ip),
      matterId,
      action: 'production.family_resolved',
      targetType: 'production',
      targetId: id,
      detail: { added: req.add, slipSheet: req.slipSheet },
    });
  });
  return getProduction(ctx, matterId, id);
}

export async function requestBuild(
  ctx: AppContext,
  matterId: number,
  id: number,
  actor: Actor,
): Promise<{ job: Job }> {
  const row = await rowOrThrow(ctx.db, matterId, id);
  assertDraft(row);
  const docs = await listProductionDocuments(ctx.db, id);
  const gaps = await familyGaps(
    ctx.db,
    matterId,
    docs.map((d) => d.document_id),
  );
  if (gaps.length > 0)
    throw conflict(
      `The family check found ${gaps.length} family member${gaps.length === 1 ? '' : 's'} outside the set (first: ${gaps[0].controlNumber}); add them or slip-sheet them before building.`,
    );
  const jobId = await ctx.db.transaction().execute(async (trx) => {
    // Checked inside the transaction: two productions cannot claim the same numbers.
    const last = await lastUsedSeq(trx, matterId, row.bates_prefix, id);
    checkStart(row.bates_prefix, row.bates_start, row.bates_padding, last);
    const queued = await ctx.jobs.enqueue(trx, {
      matterId,
      kind: 'build-production',
      payload: { productionId: id } satisfies BuildProductionPayload,
      total: docs.length,
      message: 'Waiting to build',
      createdBy: actor.id,
    });
    await trx
      .updateTable('productions')
      .set({ state: 'building', job_id: queued, error: null })
      .where('id', '=', id)
      .execute();
    await recordAudit(trx, {
      ...actorOf(actor, actor.ip),
      matterId,
      action: 'production.build_requested',
      targetType: 'production',
      targetId: id,
      detail: { name: row.name, jobId: queued, documents: docs.length },
    });
    return queued;
  });
  const job = await findJob(ctx.db, jobId);
  return { job: jobRowToApi(job!) };
}

/** The built zip for download; audited. */
export async function productionDownload(
  ctx: AppContext,
  matterId: number,
  id: number,
  actor: Actor,
): Promise<{ file: string; filename: string }> {
  const row = await rowOrThrow(ctx.db, matterId, id);
  if (row.state !== 'built') throw conflict('This production has not been built yet.');
  const file = productionZipPath(ctx, matterId, id);
  if (!existsSync(file)) throw notFound('Production file');
  await recordAudit(ctx.db, {
    ...actorOf(actor, actor.ip),
    matterId,
    action: 'production.downloaded',
    targetType: 'production',
    targetId: id,
    detail: { name: row.name, sha256: row.zip_sha256 },
  });
  const safeName =
    row.name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'production';
  return { file, filename: `${safeName}.zip` };
}
