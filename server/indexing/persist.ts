// Saving and loading a concept space in SQLite: the server's tables (index_versions,
// with the matter and job it belongs to, index_terms, index_docs, index_blobs; from
// migrations/2026_12_01_0001_initial.ts and 2026_12_01_0100_index_blobs.ts). The byte
// format of vectors and matrices is the engine's (server/engine/index/blob-codec.ts).
// Each matrix is written as one BLOB in index_blobs, so loading reads those few BLOBs,
// then only the (document_id, folded_in) pairs of index_docs, which stay the truth for
// membership: a deleted document (rows cascade) drops out and a folded-in one's vector
// comes from its row. Per-row vectors in index_terms and index_docs are kept too (the
// fallback for spaces stored before index_blobs, and the home of folded-in vectors).
import type { Kysely } from 'kysely';
import {
  blobOf,
  ConceptSpace,
  copyVector,
  decodeDocumentBlobs,
  decodeParams,
  decodeSingularValues,
  decodeVocabulary,
  encodeDiagnostics,
  encodeParams,
  encodeSpaceBlobs,
  type BuildDiagnostics,
  type DocId,
  type FoldedDocument,
} from '../engine/index';
import type { Database, IndexStatus } from '../db/schema';

const BATCH_ROWS = 500;

function toDocumentId(id: DocId): number {
  const n = typeof id === 'number' ? id : Number(id);
  if (!Number.isSafeInteger(n) || n <= 0) {
    throw new RangeError(
      `document id ${String(id)} is not a positive integer; pass documentId to map it`,
    );
  }
  return n;
}

export type SaveTarget =
  /** Fill an index_versions row the server already created (status 'building'). */
  | { indexId: number }
  /** Create the index_versions row. */
  | { matterId: number; version: number; jobId?: number | null; requestedBy?: string | null };

export interface SaveOptions {
  /** Maps the space's document ids to documents.id (default: the id as an integer). */
  documentId?: (id: DocId) => number;
  /** Status written with the vectors (default 'ready'). */
  status?: IndexStatus;
  now?: () => Date;
}

/** Diagnostics columns of index_versions. */
export function diagnosticsColumns(d: BuildDiagnostics) {
  const e = encodeDiagnostics(d);
  return {
    k: e.k,
    n_docs: e.nDocs,
    n_terms: e.nTerms,
    nnz: e.nnz,
    singular_values: e.singularValues,
    frobenius_sq: e.frobeniusSq,
    energy: e.energy,
    orthogonality_u: e.orthogonalityU,
    orthogonality_v: e.orthogonalityV,
    build_ms: e.buildMs,
    peak_rss_mb: e.peakRssMb,
  };
}

/**
 * Writes the space (terms, document vectors, singular values, diagnostics) in one
 * transaction and returns the index_versions id. Re-saving into the same indexId
 * replaces its terms and documents.
 */
export async function saveConceptSpace(
  db: Kysely<Database>,
  space: ConceptSpace,
  diagnostics: BuildDiagnostics | null,
  target: SaveTarget,
  options: SaveOptions = {},
): Promise<number> {
  const mapId = options.documentId ?? toDocumentId;
  const data = space.toData();
  const k = space.k;
  const documentIds = data.docIds.map(mapId);
  const now = (options.now ?? (() => new Date()))().toISOString();
  const columns = {
    status: options.status ?? 'ready',
    weighting: data.params.weighting,
    params: encodeParams(data.params),
    error: null,
    completed_at: now,
    ...(diagnostics
      ? diagnosticsColumns(diagnostics)
      : { k, n_docs: space.nDocs, n_terms: space.nTerms, singular_values: blobOf(data.sigma) }),
    k,
  };
  return db.transaction().execute(async (trx) => {
    let indexId: number;
    if ('indexId' in target) {
      indexId = target.indexId;
      const updated = await trx
        .updateTable('index_versions')
        .set(columns)
        .where('id', '=', indexId)
        .executeTakeFirst();
      if (Number(updated.numUpdatedRows) !== 1)
        throw new RangeError(`index version ${indexId} does not exist`);
      await trx.deleteFrom('index_terms').where('index_id', '=', indexId).execute();
      await trx.deleteFrom('index_docs').where('index_id', '=', indexId).execute();
      await trx.deleteFrom('index_blobs').where('index_id', '=', indexId).execute();
    } else {
      const row = await trx
        .insertInto('index_versions')
        .values({
          matter_id: target.matterId,
          version: target.version,
          job_id: target.jobId ?? null,
          requested_by: target.requestedBy ?? null,
          created_at: now,
          ...columns,
        })
        .returning('id')
        .executeTakeFirstOrThrow();
      indexId = row.id;
    }
    for (let start = 0; start < space.nTerms; start += BATCH_ROWS) {
      const end = Math.min(space.nTerms, start + BATCH_ROWS);
      const rows = [];
      for (let i = start; i < end; i++) {
        rows.push({
          index_id: indexId,
          term_id: i,
          term: data.terms[i],
          df: data.df[i],
          global_weight: data.globalWeights[i],
          vector: blobOf(data.termVectors.subarray(i * k, (i + 1) * k)),
        });
      }
      await trx.insertInto('index_terms').values(rows).execute();
    }
    for (let start = 0; start < space.nDocs; start += BATCH_ROWS) {
      const end = Math.min(space.nDocs, start + BATCH_ROWS);
      const rows = [];
      for (let j = start; j < end; j++) {
        rows.push({
          index_id: indexId,
          document_id: documentIds[j],
          vector: blobOf(data.docVectors.subarray(j * k, (j + 1) * k)),
          folded_in: data.foldedIn[j],
        });
      }
      await trx.insertInto('index_docs').values(rows).execute();
    }
    for (const [name, blob] of encodeSpaceBlobs(data, documentIds, k)) {
      await trx.insertInto('index_blobs').values({ index_id: indexId, name, data: blob }).execute();
    }
    return indexId;
  });
}

/** Stores folded-in documents' vectors (insert or replace) under an index version. */
export async function saveFoldedDocuments(
  db: Kysely<Database>,
  indexId: number,
  folded: readonly Pick<FoldedDocument, 'id' | 'vector'>[],
  options: Pick<SaveOptions, 'documentId'> = {},
): Promise<void> {
  const mapId = options.documentId ?? toDocumentId;
  if (folded.length === 0) return;
  await db.transaction().execute(async (trx) => {
    for (let start = 0; start < folded.length; start += BATCH_ROWS) {
      const rows = folded.slice(start, start + BATCH_ROWS).map((f) => ({
        index_id: indexId,
        document_id: mapId(f.id),
        vector: blobOf(f.vector),
        folded_in: 1,
      }));
      await trx
        .insertInto('index_docs')
        .values(rows)
        .onConflict((oc) =>
          oc.columns(['index_id', 'document_id']).doUpdateSet((eb) => ({
            vector: eb.ref('excluded.vector'),
            folded_in: eb.ref('excluded.folded_in'),
          })),
        )
        .execute();
    }
  });
}

/** Loads an index version into memory. Document ids come back as numbers (documents.id). */
export async function loadConceptSpace(
  db: Kysely<Database>,
  indexId: number,
): Promise<ConceptSpace> {
  const version = await db
    .selectFrom('index_versions')
    .select(['id', 'status', 'k', 'weighting', 'params', 'singular_values'])
    .where('id', '=', indexId)
    .executeTakeFirst();
  if (!version) throw new RangeError(`index version ${indexId} does not exist`);
  const what = `index version ${indexId}`;
  const params = decodeParams(version.params, what);
  const k = version.k;
  const sigma = decodeSingularValues(version.singular_values).slice(0, k);
  if (sigma.length !== k) throw new Error(`${what}: ${sigma.length} singular values for k = ${k}`);

  const blobRows = await db
    .selectFrom('index_blobs')
    .select(['name', 'data'])
    .where('index_id', '=', indexId)
    .execute();
  const blobs = new Map(blobRows.map((r) => [r.name, r.data]));
  const vocabulary = blobs.has('terms')
    ? decodeVocabulary(blobs, k, what)
    : await vocabularyFromRows(db, indexId, k);
  const docs = await documentsOf(db, indexId, k, blobs);
  return new ConceptSpace({ params: { ...params, k }, sigma, ...vocabulary, ...docs });
}

async function vocabularyFromRows(db: Kysely<Database>, indexId: number, k: number) {
  const termRows = await db
    .selectFrom('index_terms')
    .select(['term_id', 'term', 'df', 'global_weight', 'vector'])
    .where('index_id', '=', indexId)
    .orderBy('term_id')
    .execute();
  const m = termRows.length;
  const terms: string[] = new Array(m);
  const df = new Int32Array(m);
  const globalWeights = new Float64Array(m);
  const termVectors = new Float32Array(m * k);
  termRows.forEach((row, i) => {
    if (row.term_id !== i)
      throw new Error(`index version ${indexId}: term ids are not 0..${m - 1}`);
    terms[i] = row.term;
    df[i] = row.df;
    globalWeights[i] = row.global_weight;
    copyVector(termVectors, i, k, row.vector, `term "${row.term}"`);
  });
  return { terms, df, globalWeights, termVectors };
}

/**
 * The documents of an index version: index_docs decides who is in (and folded in);
 * vectors of built documents come from the doc_vectors BLOB when it has them, the
 * rest (folded-in documents) from their rows.
 */
async function documentsOf(
  db: Kysely<Database>,
  indexId: number,
  k: number,
  blobs: Map<string, Uint8Array>,
) {
  const members = await db
    .selectFrom('index_docs')
    .select(['document_id', 'folded_in'])
    .where('index_id', '=', indexId)
    .orderBy('document_id')
    .execute();
  const n = members.length;
  const stored = decodeDocumentBlobs(blobs, k, `index version ${indexId}`);
  const blobIndex = new Map<number, number>();
  if (stored) stored.ids.forEach((id, j) => blobIndex.set(id, j));
  const docIds: DocId[] = new Array(n);
  const foldedIn = new Uint8Array(n);
  // Fast path: the BLOB holds exactly the member documents, in document-id order.
  if (
    stored &&
    stored.ids.length === n &&
    members.every((row, j) => !row.folded_in && stored.ids[j] === row.document_id)
  ) {
    members.forEach((row, j) => (docIds[j] = row.document_id));
    return { docIds, docVectors: stored.vectors, foldedIn };
  }
  const docVectors = new Float32Array(n * k);
  const fromRows = new Map<number, number>();
  members.forEach((row, j) => {
    docIds[j] = row.document_id;
    foldedIn[j] = row.folded_in ? 1 : 0;
    const b = row.folded_in ? undefined : blobIndex.get(row.document_id);
    if (b !== undefined && stored)
      docVectors.set(stored.vectors.subarray(b * k, (b + 1) * k), j * k);
    else fromRows.set(row.document_id, j);
  });
  if (fromRows.size > 0) {
    const onlyFolded = [...fromRows.values()].every((j) => foldedIn[j] === 1);
    let query = db
      .selectFrom('index_docs')
      .select(['document_id', 'vector'])
      .where('index_id', '=', indexId);
    if (onlyFolded) query = query.where('folded_in', '=', 1);
    for (const row of await query.execute()) {
      const j = fromRows.get(row.document_id);
      if (j !== undefined) copyVector(docVectors, j, k, row.vector, `document ${row.document_id}`);
    }
  }
  return { docIds, docVectors, foldedIn };
}
