// Saving and loading a concept space in SQLite through Kysely (tables from
// migrations/2026_12_01_0001_initial.ts). Vectors are little-endian Float32 BLOBs
// (one per term in index_terms, one per document in index_docs); singular values
// are one little-endian Float64 BLOB in index_versions (kept at full precision for
// the condition number). params holds the analysis and weighting settings with a
// format version, so an index written differently is refused, not misread.
//
// Loading never parses numbers row by row: each BLOB is copied byte-wise into one
// preallocated Float32Array (a byte copy also sidesteps Buffer alignment).
import type { Generated, Kysely } from 'kysely';
import { ANALYZER_VERSION } from '../text/analyzer';
import {
  ConceptSpace,
  type BuildDiagnostics,
  type ConceptSpaceParams,
  type DocId,
  type FoldedDocument,
} from './concept-space';

/** The subset of the server's schema (server/db/schema.ts) the engine reads and writes. */
export interface IndexVersionsTable {
  id: Generated<number>;
  matter_id: number;
  version: number;
  status: string;
  k: number;
  weighting: string;
  n_docs: Generated<number>;
  n_terms: Generated<number>;
  nnz: Generated<number>;
  singular_values: Uint8Array | null;
  frobenius_sq: number | null;
  energy: number | null;
  orthogonality_u: number | null;
  orthogonality_v: number | null;
  build_ms: number | null;
  peak_rss_mb: number | null;
  params: Generated<string>;
  error: string | null;
  job_id: number | null;
  requested_by: string | null;
  created_at: string;
  completed_at: string | null;
}

export interface IndexTermsTable {
  index_id: number;
  term_id: number;
  term: string;
  df: number;
  global_weight: number;
  vector: Uint8Array;
}

export interface IndexDocsTable {
  index_id: number;
  document_id: number;
  vector: Uint8Array;
  folded_in: Generated<number>;
}

export interface IndexTables {
  index_versions: IndexVersionsTable;
  index_terms: IndexTermsTable;
  index_docs: IndexDocsTable;
}

export const INDEX_FORMAT_VERSION = 1;
const BATCH_ROWS = 500;

function blobOf(view: Float32Array | Float64Array): Buffer {
  return Buffer.from(view.buffer, view.byteOffset, view.byteLength);
}

export function decodeSingularValues(blob: Uint8Array | null): Float64Array {
  if (!blob) return new Float64Array(0);
  if (blob.byteLength % 8 !== 0)
    throw new Error('singular_values BLOB is not a whole number of Float64 values');
  const out = new Float64Array(blob.byteLength / 8);
  new Uint8Array(out.buffer).set(blob);
  return out;
}

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
  status?: string;
  now?: () => Date;
}

/** Diagnostics columns of index_versions, as the server stores them. */
export function diagnosticsColumns(d: BuildDiagnostics) {
  return {
    k: d.k,
    n_docs: d.nDocs,
    n_terms: d.nTerms,
    nnz: d.nnz,
    singular_values: blobOf(d.singularValues),
    frobenius_sq: d.frobeniusSq,
    energy: d.energy,
    orthogonality_u: d.orthogonalityU,
    orthogonality_v: d.orthogonalityV,
    build_ms: Math.round(d.buildMs),
    peak_rss_mb: d.peakRssMb,
  };
}

/**
 * Writes the space (terms, document vectors, singular values, diagnostics) in one
 * transaction and returns the index_versions id. Re-saving into the same indexId
 * replaces its terms and documents.
 */
export async function saveConceptSpace(
  db: Kysely<IndexTables>,
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
  const params = JSON.stringify({ ...data.params, formatVersion: INDEX_FORMAT_VERSION });
  const columns = {
    status: options.status ?? 'ready',
    weighting: data.params.weighting,
    params,
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
    return indexId;
  });
}

/** Stores folded-in documents' vectors (insert or replace) under an index version. */
export async function saveFoldedDocuments(
  db: Kysely<IndexTables>,
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

function copyInto(
  target: Float32Array,
  row: number,
  k: number,
  blob: Uint8Array,
  what: string,
): void {
  if (blob.byteLength !== k * 4) {
    throw new Error(
      `${what}: vector BLOB has ${blob.byteLength} bytes, expected ${k * 4} (k = ${k})`,
    );
  }
  new Uint8Array(target.buffer, target.byteOffset + row * k * 4, k * 4).set(blob);
}

/** Loads an index version into memory. Document ids come back as numbers (documents.id). */
export async function loadConceptSpace(
  db: Kysely<IndexTables>,
  indexId: number,
): Promise<ConceptSpace> {
  const version = await db
    .selectFrom('index_versions')
    .select(['id', 'status', 'k', 'weighting', 'params', 'singular_values'])
    .where('id', '=', indexId)
    .executeTakeFirst();
  if (!version) throw new RangeError(`index version ${indexId} does not exist`);
  let params: ConceptSpaceParams;
  try {
    params = JSON.parse(version.params) as ConceptSpaceParams;
  } catch {
    throw new Error(`index version ${indexId}: params is not valid JSON`);
  }
  if (params.formatVersion !== INDEX_FORMAT_VERSION) {
    throw new Error(
      `index version ${indexId}: format ${String(params.formatVersion)} is not ${INDEX_FORMAT_VERSION}; rebuild it`,
    );
  }
  if (params.analyzer !== ANALYZER_VERSION) {
    throw new Error(
      `index version ${indexId}: built with analyzer ${params.analyzer}, this engine has ${ANALYZER_VERSION}; rebuild it`,
    );
  }
  const k = version.k;
  const sigma = decodeSingularValues(version.singular_values).slice(0, k);
  if (sigma.length !== k)
    throw new Error(`index version ${indexId}: ${sigma.length} singular values for k = ${k}`);

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
    copyInto(termVectors, i, k, row.vector, `term "${row.term}"`);
  });

  const docRows = await db
    .selectFrom('index_docs')
    .select(['document_id', 'vector', 'folded_in'])
    .where('index_id', '=', indexId)
    .orderBy('document_id')
    .execute();
  const n = docRows.length;
  const docIds: DocId[] = new Array(n);
  const docVectors = new Float32Array(n * k);
  const foldedIn = new Uint8Array(n);
  docRows.forEach((row, j) => {
    docIds[j] = row.document_id;
    foldedIn[j] = row.folded_in ? 1 : 0;
    copyInto(docVectors, j, k, row.vector, `document ${row.document_id}`);
  });
  return new ConceptSpace({
    params: { ...params, k },
    terms,
    df,
    globalWeights,
    sigma,
    termVectors,
    docIds,
    docVectors,
    foldedIn,
  });
}
