// Saving and loading a concept space in SQLite through Kysely (tables from
// migrations/2026_12_01_0001_initial.ts). Vectors are little-endian Float32 BLOBs
// (one per term in index_terms, one per document in index_docs); singular values
// are one little-endian Float64 BLOB in index_versions (kept at full precision for
// the condition number). params holds the analysis and weighting settings with a
// format version, so an index written differently is refused, not misread.
//
// Besides those rows, each matrix is also written as one BLOB in index_blobs
// (migrations/2026_12_01_0100_index_blobs.ts): 'terms' (JSON array, UTF-8), 'df'
// (Int32), 'global_weights' (Float64), 'term_vectors' (Float32, terms x k),
// 'doc_ids' (Float64 document ids), 'doc_vectors' (Float32, docs x k). Loading reads
// those few BLOBs, then only the (document_id, folded_in) pairs of index_docs, which
// stay the truth for membership: a deleted document (rows cascade) drops out and a
// folded-in one's vector comes from its row. Nothing is parsed number by number:
// BLOBs are copied byte-wise into preallocated typed arrays (a byte copy also
// sidesteps Buffer alignment).
import type { Generated, Kysely } from 'kysely';
import { ANALYZER_VERSION, COMPATIBLE_ANALYZER_VERSIONS } from '../text/analyzer';
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

/** migrations/2026_12_01_0100_index_blobs.ts: one BLOB per matrix, for fast loading. */
export interface IndexBlobsTable {
  index_id: number;
  name: string;
  data: Uint8Array;
}

export interface IndexTables {
  index_versions: IndexVersionsTable;
  index_terms: IndexTermsTable;
  index_docs: IndexDocsTable;
  index_blobs: IndexBlobsTable;
}

export const INDEX_FORMAT_VERSION = 1;
const BATCH_ROWS = 500;

function blobOf(view: Float32Array | Float64Array | Int32Array | Uint8Array): Buffer {
  return Buffer.from(view.buffer, view.byteOffset, view.byteLength);
}

/** A typed array holding a copy of the BLOB's bytes (alignment-safe). */
function typedFrom<T extends Float32Array | Float64Array | Int32Array>(
  Type: { new (length: number): T; BYTES_PER_ELEMENT: number },
  blob: Uint8Array,
  what: string,
): T {
  if (blob.byteLength % Type.BYTES_PER_ELEMENT !== 0) {
    throw new Error(`${what}: BLOB of ${blob.byteLength} bytes is not whole values`);
  }
  const length = blob.byteLength / Type.BYTES_PER_ELEMENT;
  // A large BLOB arrives in its own buffer: view it in place when aligned.
  if (blob.byteOffset % Type.BYTES_PER_ELEMENT === 0 && blob.byteLength >= 65536) {
    return new (Type as unknown as new (b: ArrayBufferLike, o: number, l: number) => T)(
      blob.buffer,
      blob.byteOffset,
      length,
    );
  }
  const out = new Type(length);
  new Uint8Array(out.buffer).set(blob);
  return out;
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
    const blobs: [string, Uint8Array][] = [
      ['terms', Buffer.from(JSON.stringify(data.terms), 'utf8')],
      ['labels', Buffer.from(JSON.stringify(data.labels ?? data.terms), 'utf8')],
      ['df', blobOf(data.df)],
      ['global_weights', blobOf(data.globalWeights)],
      ['term_vectors', blobOf(data.termVectors)],
      ...documentBlobs(documentIds, data.docVectors, k),
    ];
    for (const [name, blob] of blobs) {
      await trx.insertInto('index_blobs').values({ index_id: indexId, name, data: blob }).execute();
    }
    return indexId;
  });
}

/** doc_ids and doc_vectors BLOBs in ascending document id (the order loading uses). */
function documentBlobs(
  documentIds: number[],
  vectors: Float32Array,
  k: number,
): [string, Uint8Array][] {
  const order = documentIds.map((_, j) => j).sort((a, b) => documentIds[a] - documentIds[b]);
  const ids = Float64Array.from(order, (j) => documentIds[j]);
  const sorted = new Float32Array(order.length * k);
  order.forEach((j, r) => sorted.set(vectors.subarray(j * k, (j + 1) * k), r * k));
  return [
    ['doc_ids', blobOf(ids)],
    ['doc_vectors', blobOf(sorted)],
  ];
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
  if (!COMPATIBLE_ANALYZER_VERSIONS.includes(params.analyzer)) {
    throw new Error(
      `index version ${indexId}: built with analyzer ${params.analyzer}, this engine has ${ANALYZER_VERSION}; rebuild it`,
    );
  }
  const k = version.k;
  const sigma = decodeSingularValues(version.singular_values).slice(0, k);
  if (sigma.length !== k)
    throw new Error(`index version ${indexId}: ${sigma.length} singular values for k = ${k}`);

  const blobRows = await db
    .selectFrom('index_blobs')
    .select(['name', 'data'])
    .where('index_id', '=', indexId)
    .execute();
  const blobs = new Map(blobRows.map((r) => [r.name, r.data]));
  const vocabulary = blobs.has('terms')
    ? vocabularyFromBlobs(blobs, k, indexId)
    : await vocabularyFromRows(db, indexId, k);
  const docs = await documentsOf(db, indexId, k, blobs);
  return new ConceptSpace({ params: { ...params, k }, sigma, ...vocabulary, ...docs });
}

function need(blobs: Map<string, Uint8Array>, name: string, indexId: number): Uint8Array {
  const blob = blobs.get(name);
  if (!blob) throw new Error(`index version ${indexId}: BLOB "${name}" is missing`);
  return blob;
}

function vocabularyFromBlobs(blobs: Map<string, Uint8Array>, k: number, indexId: number) {
  const terms = JSON.parse(Buffer.from(need(blobs, 'terms', indexId)).toString('utf8')) as string[];
  const df = typedFrom(Int32Array, need(blobs, 'df', indexId), 'df');
  const globalWeights = typedFrom(
    Float64Array,
    need(blobs, 'global_weights', indexId),
    'global_weights',
  );
  const termVectors = typedFrom(Float32Array, need(blobs, 'term_vectors', indexId), 'term_vectors');
  if (
    df.length !== terms.length ||
    globalWeights.length !== terms.length ||
    termVectors.length !== terms.length * k
  ) {
    throw new Error(`index version ${indexId}: vocabulary BLOBs disagree in length`);
  }
  const labelsBlob = blobs.get('labels');
  const labels = labelsBlob
    ? (JSON.parse(Buffer.from(labelsBlob).toString('utf8')) as string[])
    : undefined;
  return { terms, df, globalWeights, termVectors, labels };
}

async function vocabularyFromRows(db: Kysely<IndexTables>, indexId: number, k: number) {
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
  return { terms, df, globalWeights, termVectors };
}

/**
 * The documents of an index version: index_docs decides who is in (and folded in);
 * vectors of built documents come from the doc_vectors BLOB when it has them, the
 * rest (folded-in documents) from their rows.
 */
async function documentsOf(
  db: Kysely<IndexTables>,
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
  const idsBlob = blobs.get('doc_ids');
  const blobIds = idsBlob ? typedFrom(Float64Array, idsBlob, 'doc_ids') : null;
  const blobVectors = blobIds
    ? typedFrom(Float32Array, need(blobs, 'doc_vectors', indexId), 'doc_vectors')
    : null;
  if (blobIds && blobVectors && blobVectors.length !== blobIds.length * k) {
    throw new Error(`index version ${indexId}: doc_vectors BLOB does not match doc_ids x k`);
  }
  const blobIndex = new Map<number, number>();
  if (blobIds) blobIds.forEach((id, j) => blobIndex.set(id, j));
  const docIds: DocId[] = new Array(n);
  const foldedIn = new Uint8Array(n);
  // Fast path: the BLOB holds exactly the member documents, in document-id order.
  if (
    blobIds &&
    blobVectors &&
    blobIds.length === n &&
    members.every((row, j) => !row.folded_in && blobIds[j] === row.document_id)
  ) {
    members.forEach((row, j) => (docIds[j] = row.document_id));
    return { docIds, docVectors: blobVectors, foldedIn };
  }
  const docVectors = new Float32Array(n * k);
  const fromRows = new Map<number, number>();
  members.forEach((row, j) => {
    docIds[j] = row.document_id;
    foldedIn[j] = row.folded_in ? 1 : 0;
    const b = row.folded_in ? undefined : blobIndex.get(row.document_id);
    if (b !== undefined && blobVectors)
      docVectors.set(blobVectors.subarray(b * k, (b + 1) * k), j * k);
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
      if (j !== undefined) copyInto(docVectors, j, k, row.vector, `document ${row.document_id}`);
    }
  }
  return { docIds, docVectors, foldedIn };
}
