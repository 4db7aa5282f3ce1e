// The concept-space views of a matter (issue 6): spectrum, dimensions and their labels,
// term neighbours, the document map, k-means groupings and index health. Everything
// reads the matter's serving index version through the index service (ctx.index), which
// holds its ConceptSpace in memory; the numerics are in server/engine/insights.
//
// Concept search and these views assist attorney review; they do not decide relevance
// or privilege.
import type { ConceptSpace } from '../engine/index';
import { decodeSingularValues } from '../engine/index';
import { columnExtremes, columnLargestAbs } from '../engine/index';
import { projectionDrift, summariseDrift, type DriftSummary } from '../engine/index';
import { assessHealth, DEFAULT_HEALTH_THRESHOLDS } from '../engine/index';
import { mapCoordinates } from '../engine/index';
import { termNeighbours } from '../engine/index';
import { cumulativeEnergy, energyShare } from '../engine/index';
import { analyze } from '../engine/index';
import {
  type ConceptDimension,
  type ConceptGroup,
  type CreateGroupingReq,
  type CreateGroupingResponse,
  type DimensionLabel,
  type DimensionLabelResponse,
  type DimensionsQuery,
  type DimensionsResponse,
  type GroupingResponse,
  type GroupingsListResponse,
  type GroupingSummary,
  type GroupTerm,
  type HealthResponse,
  type HealthThresholds,
  type MapQuery,
  type MapResponse,
  type NeighboursQuery,
  type NeighboursResponse,
  type SpectrumResponse,
  type SpectrumVersion,
} from '../../shared/schemas/concepts';
import type { AppContext } from '../context';
import { jobRowToApi } from '../jobs/map';
import { findJob } from '../jobs/queries';
import type { GroupingPayload } from './grouping-job';
import type { IndexVersionRow } from '../db/schema';
import { conflict, notFound, validationError } from '../http/errors';
import type { LoadedIndex } from '../indexing/service';
import { countFoldedIn, findIndexVersion } from '../indexing/queries';
import {
  codesOf,
  codingsOf,
  custodiansOf,
  deleteLabel,
  documentsByIds,
  findGrouping,
  findActiveGroupingJob,
  findGroupingBySettings,
  foldedInTexts,
  groupingsOfIndex,
  groupsOf,
  labelsOf,
  mapDocumentsOf,
  memberIdsOf,
  previousBuiltVersion,
  upsertLabel,
  type GroupingRow,
} from './queries';

export { GROUPING_DIMS_MAX, GROUPING_SMALL_MATTER } from './grouping-core';

/**
 * Titles on the map are cut to this many characters (hover text; the viewer has the rest).
 * Measured payload at 100,000 points with 60-character titles: about 11 MB of JSON
 * (1.2 MB gzipped), of which the titles are about 6.5 MB and the coordinates 1.6 MB.
 */
export const MAP_TITLE_MAX = 60;

export const NO_INDEX_MESSAGE =
  'This matter has no concept index yet: add documents and wait for the first build.';

function parseParams(row: IndexVersionRow): Record<string, unknown> {
  try {
    return JSON.parse(row.params) as Record<string, unknown>;
  } catch {
    return {};
  }
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

/** Maps an index_versions row to its spectrum figures. */
export function spectrumOf(row: IndexVersionRow): SpectrumVersion {
  const sigma = Array.from(decodeSingularValues(row.singular_values));
  const fro = row.frobenius_sq;
  const curve = fro !== null && fro > 0 ? Array.from(cumulativeEnergy(sigma, fro)) : null;
  const kept = curve && curve.length > 0 ? curve[curve.length - 1] : (row.energy ?? null);
  const params = parseParams(row);
  return {
    indexId: row.id,
    version: row.version,
    status: row.status,
    k: row.k,
    requestedK: typeof params.requestedK === 'number' ? params.requestedK : null,
    weighting: row.weighting,
    nDocs: row.n_docs,
    nTerms: row.n_terms,
    singularValues: sigma,
    cumulativeEnergy: curve,
    frobeniusSq: fro,
    energyKept: kept,
    energyBeyondK: kept === null ? null : Math.max(0, 1 - kept),
    completedAt: row.completed_at,
  };
}

function labelToApi(row: {
  label: string;
  labelled_at: string;
  user_id: string | null;
  name: string | null;
  email: string | null;
}): DimensionLabel {
  return {
    label: row.label,
    labelledAt: row.labelled_at,
    labelledBy:
      row.user_id !== null
        ? { id: row.user_id, name: row.name ?? '', email: row.email ?? '' }
        : null,
  };
}

function groupingToApi(row: GroupingRow): GroupingSummary {
  return {
    id: row.id,
    indexId: row.index_id,
    version: row.version,
    groups: row.groups,
    seed: row.seed,
    dims: row.dims,
    documents: row.documents,
    iterations: row.iterations,
    converged: row.converged === 1,
    inertia: row.inertia,
    createdBy:
      row.user_id !== null
        ? { id: row.user_id, name: row.user_name ?? '', email: row.user_email ?? '' }
        : null,
    createdAt: row.created_at,
  };
}

function groupToApi(row: {
  id: number;
  number: number;
  size: number;
  top_terms: string;
}): ConceptGroup {
  let topTerms: GroupTerm[] = [];
  try {
    topTerms = JSON.parse(row.top_terms) as GroupTerm[];
  } catch {
    topTerms = [];
  }
  return { id: row.id, number: row.number, size: row.size, topTerms };
}

/** Rebuild thresholds: drift and fold-in share from the config (QUARRY_REBUILD_*). */
export function healthThresholds(ctx: AppContext): HealthThresholds {
  return {
    drift: ctx.config.rebuildDrift,
    foldedShare: ctx.config.rebuildFoldInShare,
    conditionNumber: DEFAULT_HEALTH_THRESHOLDS.conditionNumber,
  };
}

export class ConceptsService {
  /** Drift summaries keyed by "indexId:foldedCount" (folded-in documents only ever grow until a rebuild). */
  private readonly driftCache = new Map<string, DriftSummary>();

  constructor(private readonly ctx: AppContext) {}

  private get db() {
    return this.ctx.db;
  }

  private async requireIndex(
    matterId: number,
  ): Promise<{ loaded: LoadedIndex; row: IndexVersionRow }> {
    const loaded = await this.ctx.index.getIndex(matterId);
    if (!loaded) throw conflict(NO_INDEX_MESSAGE);
    const row = await findIndexVersion(this.db, loaded.indexId);
    if (!row) throw conflict(NO_INDEX_MESSAGE);
    return { loaded, row };
  }

  /** GET .../concepts/spectrum */
  async spectrum(matterId: number): Promise<SpectrumResponse> {
    const loaded = await this.ctx.index.getIndex(matterId);
    const row = loaded ? await findIndexVersion(this.db, loaded.indexId) : undefined;
    if (!row) return { current: null, previous: null };
    const previous = await previousBuiltVersion(this.db, matterId, row.version);
    return { current: spectrumOf(row), previous: previous ? spectrumOf(previous) : null };
  }

  /** GET .../concepts/dimensions */
  async dimensions(matterId: number, query: DimensionsQuery): Promise<DimensionsResponse> {
    const { loaded, row } = await this.requireIndex(matterId);
    const space = loaded.space;
    const k = space.k;
    const count = Math.min(query.count, k);
    const n = space.nDocs;
    const docs = space.docMatrix.subarray(0, n * k);
    const labels = new Map(
      (await labelsOf(this.db, loaded.indexId)).map((l) => [l.dim, labelToApi(l)]),
    );
    const dims: ConceptDimension[] = [];
    const wanted = new Set<number>();
    const perDim: { positions: { index: number; value: number }[] }[] = [];
    for (let c = 0; c < count; c++) {
      // Stored rows are V_k S_k ('projection') or V_k ('classic'); report the V_k entry.
      const scale = space.scaling === 'projection' ? 1 / space.sigma[c] : 1;
      const top = columnLargestAbs(docs, n, k, c, query.docs, scale);
      top.forEach((t) => wanted.add(Number(space.docId(t.index))));
      perDim.push({ positions: top });
    }
    const docRows = new Map(
      (await documentsByIds(this.db, matterId, [...wanted])).map((d) => [d.id, d]),
    );
    for (let c = 0; c < count; c++) {
      const { positive, negative } = columnExtremes(
        space.termVectors,
        space.nTerms,
        k,
        c,
        query.terms,
      );
      const term = (t: { index: number; value: number }) => ({
        term: space.terms[t.index],
        label: space.labels[t.index],
        loading: t.value,
      });
      dims.push({
        dim: c + 1,
        sigma: space.sigma[c],
        energyShare:
          row.frobenius_sq !== null ? energyShare(space.sigma[c], row.frobenius_sq) : null,
        label: labels.get(c + 1) ?? null,
        positiveTerms: positive.map(term),
        negativeTerms: negative.map(term),
        documents: perDim[c].positions.flatMap((p) => {
          const id = Number(space.docId(p.index));
          const doc = docRows.get(id);
          if (!doc) return []; // deleted since the build
          return [
            {
              documentId: id,
              controlNumber: doc.control_number,
              title: doc.title,
              loading: p.value,
              foldedIn: space.isFoldedIn(p.index),
            },
          ];
        }),
      });
    }
    return { indexId: loaded.indexId, version: loaded.version, k, dimensions: dims };
  }

  /** PUT .../concepts/dimensions/:dim/label */
  async setLabel(
    matterId: number,
    dim: number,
    label: string,
    userId: string,
  ): Promise<DimensionLabelResponse> {
    const { loaded } = await this.requireIndex(matterId);
    this.checkDim(dim, loaded.space.k, 'dim');
    await upsertLabel(this.db, { indexId: loaded.indexId, dim, label, userId });
    return this.labelResponse(loaded, dim);
  }

  /** DELETE .../concepts/dimensions/:dim/label */
  async clearLabel(matterId: number, dim: number): Promise<DimensionLabelResponse> {
    const { loaded } = await this.requireIndex(matterId);
    this.checkDim(dim, loaded.space.k, 'dim');
    await deleteLabel(this.db, loaded.indexId, dim);
    return this.labelResponse(loaded, dim);
  }

  private async labelResponse(loaded: LoadedIndex, dim: number): Promise<DimensionLabelResponse> {
    const row = (await labelsOf(this.db, loaded.indexId)).find((l) => l.dim === dim);
    return {
      indexId: loaded.indexId,
      version: loaded.version,
      dim,
      label: row ? labelToApi(row) : null,
    };
  }

  private checkDim(dim: number, k: number, field: string): void {
    if (dim > k)
      throw validationError(
        field,
        `must be at most ${k}, the number of concept dimensions of the current index`,
      );
  }

  /** GET .../concepts/terms/neighbours */
  async neighbours(matterId: number, query: NeighboursQuery): Promise<NeighboursResponse> {
    const { loaded } = await this.requireIndex(matterId);
    const result = termNeighbours(loaded.space, query.term, query.n);
    return {
      indexId: loaded.indexId,
      version: loaded.version,
      query: query.term,
      analysed: result.analysed,
      unknown: result.unknown,
      neighbours: result.neighbours.map((t) => ({
        term: t.term,
        label: t.label,
        similarity: t.similarity,
        df: t.df,
      })),
      notice: result.notice,
    };
  }

  /** GET .../concepts/map */
  async map(matterId: number, query: MapQuery): Promise<MapResponse> {
    const { loaded } = await this.requireIndex(matterId);
    const space = loaded.space;
    const k = space.k;
    this.checkDim(query.x, k, 'x');
    this.checkDim(query.y, k, 'y');
    const n = space.nDocs;
    const { x, y } = mapCoordinates(
      space.docMatrix,
      n,
      k,
      space.sigma,
      space.scaling,
      query.x - 1,
      query.y - 1,
    );
    const [docs, codings, custodians, codes] = await Promise.all([
      mapDocumentsOf(this.db, matterId),
      codingsOf(this.db, matterId),
      custodiansOf(this.db, matterId),
      codesOf(this.db, matterId),
    ]);
    const byId = new Map(docs.map((d) => [d.id, d]));
    const custodianPos = new Map(custodians.map((c, i) => [c.id, i]));
    const codesByDoc = new Map<number, number[]>();
    for (const c of codings) {
      let list = codesByDoc.get(c.document_id);
      if (!list) codesByDoc.set(c.document_id, (list = []));
      list.push(c.code_id);
    }
    const out: MapResponse = {
      indexId: loaded.indexId,
      version: loaded.version,
      k,
      dims: [query.x, query.y],
      count: 0,
      x: [],
      y: [],
      ids: [],
      controlNumbers: [],
      titles: [],
      custodian: [],
      codeIds: [],
      foldedIn: [],
      custodians: custodians.map((c) => ({ id: c.id, name: c.name })),
      codes: codes.map((c) => ({ id: c.id, name: c.name })),
    };
    for (let j = 0; j < n; j++) {
      const id = Number(space.docId(j));
      const doc = byId.get(id);
      if (!doc) continue; // deleted since the build (the index forgets it on reload)
      out.x.push(round(x[j], 4));
      out.y.push(round(y[j], 4));
      out.ids.push(id);
      out.controlNumbers.push(doc.control_number);
      const title = doc.title || doc.original_name;
      out.titles.push(
        title.length > MAP_TITLE_MAX ? `${title.slice(0, MAP_TITLE_MAX - 1)}…` : title,
      );
      out.custodian.push(
        doc.custodian_id !== null ? (custodianPos.get(doc.custodian_id) ?? -1) : -1,
      );
      out.codeIds.push(codesByDoc.get(id) ?? []);
      out.foldedIn.push(space.isFoldedIn(j) ? 1 : 0);
    }
    out.count = out.ids.length;
    return out;
  }

  /**
   * POST .../concepts/groupings: the stored grouping for (current version, groups, seed),
   * or the background job computing it (one job per settings; grouping-core.ts).
   */
  async createGrouping(
    matterId: number,
    body: CreateGroupingReq,
    userId: string,
  ): Promise<{ status: 200 | 202; response: CreateGroupingResponse }> {
    const { loaded } = await this.requireIndex(matterId);
    const settings = { indexId: loaded.indexId, groups: body.groups, seed: body.seed };
    const existing = await findGroupingBySettings(
      this.db,
      settings.indexId,
      body.groups,
      body.seed,
    );
    if (existing) return { status: 200, response: await this.groupingResponse(existing) };
    const n = loaded.space.nDocs;
    if (body.groups > n)
      throw validationError(
        'groups',
        `${body.groups} groups need at least ${body.groups} documents; there are ${n}`,
      );
    const active = await findActiveGroupingJob(this.db, matterId, settings);
    const jobId =
      active?.id ??
      (await this.ctx.jobs.enqueue(this.db, {
        matterId,
        kind: 'concept-grouping',
        payload: { ...settings, userId } satisfies GroupingPayload,
        total: 1,
        createdBy: userId,
        message: 'Waiting to group the documents',
      }));
    const job = await findJob(this.db, jobId);
    return { status: 202, response: { job: jobRowToApi(job!) } };
  }

  private async groupingResponse(row: GroupingRow): Promise<GroupingResponse> {
    return {
      grouping: groupingToApi(row),
      groups: (await groupsOf(this.db, row.id)).map(groupToApi),
    };
  }

  /** GET .../concepts/groupings */
  async listGroupings(matterId: number): Promise<GroupingsListResponse> {
    const loaded = await this.ctx.index.getIndex(matterId);
    if (!loaded) return { groupings: [] };
    return { groupings: (await groupingsOfIndex(this.db, loaded.indexId)).map(groupingToApi) };
  }

  /** GET .../concepts/groupings/:groupingId (any version of the matter). */
  async getGrouping(matterId: number, groupingId: number): Promise<GroupingResponse> {
    const row = await findGrouping(this.db, matterId, groupingId);
    if (!row) throw notFound('Grouping');
    return this.groupingResponse(row);
  }

  /**
   * For search (filters.groupId): the ids of the documents in a concept group of this
   * matter, ascending, or null when the matter has no such group (or it is not in the
   * grouping given). Documents folded in after the grouping was made are in no group.
   */
  documentIdsInGroup(
    matterId: number,
    groupingId: number | undefined,
    groupId: number,
  ): Promise<number[] | null> {
    return memberIdsOf(this.db, matterId, groupId, groupingId);
  }

  /** GET .../concepts/health */
  async health(matterId: number): Promise<HealthResponse> {
    const { loaded, row } = await this.requireIndex(matterId);
    const space = loaded.space;
    const { total, folded } = await countFoldedIn(this.db, loaded.indexId);
    const drift = await this.driftOf(space, loaded.indexId, folded);
    const thresholds = healthThresholds(this.ctx);
    const orthU = row.orthogonality_u;
    const orthV = row.orthogonality_v;
    const assessment = assessHealth(
      {
        documents: total,
        terms: row.n_terms,
        builtDocuments: row.n_docs,
        nnz: row.nnz,
        sigma: space.sigma,
        energyKept: row.energy,
        orthogonalityU: orthU,
        orthogonalityV: orthV,
        foldedIn: folded,
        driftMean: drift.mean,
        driftMax: drift.max,
      },
      thresholds,
    );
    return {
      indexId: loaded.indexId,
      version: loaded.version,
      k: space.k,
      weighting: row.weighting,
      documents: total,
      terms: row.n_terms,
      builtDocuments: row.n_docs,
      nnz: row.nnz,
      sparsity: assessment.sparsity,
      sigma1: assessment.sigma1,
      sigmaK: assessment.sigmaK,
      conditionNumber: assessment.conditionNumber,
      energyKept: row.energy,
      orthogonalityU: orthU,
      orthogonalityV: orthV,
      foldedIn: folded,
      foldedShare: assessment.foldedShare,
      drift: drift.mean,
      driftMax: drift.max,
      noiseDimensions: assessment.noiseDimensions,
      thresholds,
      rebuildRecommended: assessment.rebuildRecommended,
      messages: assessment.messages,
      summary: assessment.summary,
    };
  }

  /**
   * Mean drift of the folded-in documents: each one's text weighted with the index's
   * stored global weights (as folding-in weighted it) against U_k.
   */
  private async driftOf(
    space: ConceptSpace,
    indexId: number,
    folded: number,
  ): Promise<DriftSummary> {
    if (folded === 0) return { count: 0, mean: null, max: null };
    const key = `${indexId}:${folded}`;
    const cached = this.driftCache.get(key);
    if (cached) return cached;
    const texts = await foldedInTexts(this.db, indexId);
    const values = new Float64Array(texts.length);
    texts.forEach((t, i) => {
      const w = space.weightTerms(analyze(t.title ? `${t.title}\n${t.body}` : t.body));
      values[i] = projectionDrift(w.ids, w.weights, space.termVectors, space.k);
    });
    const summary = summariseDrift(values);
    for (const old of this.driftCache.keys())
      if (old.startsWith(`${indexId}:`)) this.driftCache.delete(old);
    this.driftCache.set(key, summary);
    return summary;
  }
}

const services = new WeakMap<AppContext, ConceptsService>();

/** The context's concepts service (one per app context, created on first use). */
export function conceptsServiceFor(ctx: AppContext): ConceptsService {
  let service = services.get(ctx);
  if (!service) services.set(ctx, (service = new ConceptsService(ctx)));
  return service;
}

/**
 * For the search feature (filters.groupId): the document ids of concept group `groupId`
 * of the matter, or null when there is no such group. `groupingId` narrows the check.
 */
export function documentIdsInGroup(
  ctx: AppContext,
  matterId: number,
  groupingId: number | undefined,
  groupId: number,
): Promise<number[] | null> {
  return conceptsServiceFor(ctx).documentIdsInGroup(matterId, groupingId, groupId);
}
