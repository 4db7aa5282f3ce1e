// The concept space's byte format, for whoever stores it (the server keeps it in SQLite:
// server/indexing/persist.ts). Vectors are little-endian Float32 BLOBs (one per term or
// document row, or one per matrix); singular values are one little-endian Float64 BLOB
// (full precision, for the condition number). The matrix BLOBs are 'terms' and 'labels'
// (JSON arrays, UTF-8), 'df' (Int32), 'global_weights' (Float64), 'term_vectors'
// (Float32, terms x k), 'doc_ids' (Float64 document ids, ascending) and 'doc_vectors'
// (Float32, docs x k, in doc_ids order). params carry a format version, so a space
// written differently is refused, not misread. Nothing is parsed number by number:
// BLOBs are copied byte-wise into preallocated typed arrays (a byte copy also sidesteps
// Buffer alignment).
import { ANALYZER_VERSION, COMPATIBLE_ANALYZER_VERSIONS } from '../text/analyzer';
import type { BuildDiagnostics, ConceptSpaceData, ConceptSpaceParams } from './concept-space';

export const INDEX_FORMAT_VERSION = 1;

/** The bytes of a typed array, without copying. */
export function blobOf(view: Float32Array | Float64Array | Int32Array | Uint8Array): Buffer {
  return Buffer.from(view.buffer, view.byteOffset, view.byteLength);
}

/** A typed array holding the BLOB's values (a copy, or a view when aligned and large). */
export function typedFrom<T extends Float32Array | Float64Array | Int32Array>(
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

/** Copies one k-long Float32 vector BLOB into row `row` of `target`. */
export function copyVector(
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

/** The stored form of the build diagnostics (singular values as their BLOB). */
export function encodeDiagnostics(d: BuildDiagnostics) {
  return {
    k: d.k,
    nDocs: d.nDocs,
    nTerms: d.nTerms,
    nnz: d.nnz,
    singularValues: blobOf(d.singularValues),
    frobeniusSq: d.frobeniusSq,
    energy: d.energy,
    orthogonalityU: d.orthogonalityU,
    orthogonalityV: d.orthogonalityV,
    buildMs: Math.round(d.buildMs),
    peakRssMb: d.peakRssMb,
  };
}

/** params as stored: the space's settings with the format version. */
export function encodeParams(params: ConceptSpaceParams): string {
  return JSON.stringify({ ...params, formatVersion: INDEX_FORMAT_VERSION });
}

/** Parses stored params, refusing another format or another analyzer's terms. */
export function decodeParams(text: string, what: string): ConceptSpaceParams {
  let params: ConceptSpaceParams;
  try {
    params = JSON.parse(text) as ConceptSpaceParams;
  } catch {
    throw new Error(`${what}: params is not valid JSON`);
  }
  if (params.formatVersion !== INDEX_FORMAT_VERSION) {
    throw new Error(
      `${what}: format ${String(params.formatVersion)} is not ${INDEX_FORMAT_VERSION}; rebuild it`,
    );
  }
  if (!COMPATIBLE_ANALYZER_VERSIONS.includes(params.analyzer)) {
    throw new Error(
      `${what}: built with analyzer ${params.analyzer}, this engine has ${ANALYZER_VERSION}; rebuild it`,
    );
  }
  return params;
}

/** The matrix BLOBs of a space whose documents have the given numeric ids. */
export function encodeSpaceBlobs(
  data: ConceptSpaceData,
  documentIds: number[],
  k: number,
): [string, Uint8Array][] {
  const order = documentIds.map((_, j) => j).sort((a, b) => documentIds[a] - documentIds[b]);
  const ids = Float64Array.from(order, (j) => documentIds[j]);
  const sorted = new Float32Array(order.length * k);
  order.forEach((j, r) => sorted.set(data.docVectors.subarray(j * k, (j + 1) * k), r * k));
  return [
    ['terms', Buffer.from(JSON.stringify(data.terms), 'utf8')],
    ['labels', Buffer.from(JSON.stringify(data.labels ?? data.terms), 'utf8')],
    ['df', blobOf(data.df)],
    ['global_weights', blobOf(data.globalWeights)],
    ['term_vectors', blobOf(data.termVectors)],
    ['doc_ids', blobOf(ids)],
    ['doc_vectors', blobOf(sorted)],
  ];
}

function need(blobs: Map<string, Uint8Array>, name: string, what: string): Uint8Array {
  const blob = blobs.get(name);
  if (!blob) throw new Error(`${what}: BLOB "${name}" is missing`);
  return blob;
}

/** Terms, document frequencies, global weights, term vectors and labels from their BLOBs. */
export function decodeVocabulary(blobs: Map<string, Uint8Array>, k: number, what: string) {
  const terms = JSON.parse(Buffer.from(need(blobs, 'terms', what)).toString('utf8')) as string[];
  const df = typedFrom(Int32Array, need(blobs, 'df', what), 'df');
  const globalWeights = typedFrom(
    Float64Array,
    need(blobs, 'global_weights', what),
    'global_weights',
  );
  const termVectors = typedFrom(Float32Array, need(blobs, 'term_vectors', what), 'term_vectors');
  if (
    df.length !== terms.length ||
    globalWeights.length !== terms.length ||
    termVectors.length !== terms.length * k
  ) {
    throw new Error(`${what}: vocabulary BLOBs disagree in length`);
  }
  const labelsBlob = blobs.get('labels');
  const labels = labelsBlob
    ? (JSON.parse(Buffer.from(labelsBlob).toString('utf8')) as string[])
    : undefined;
  return { terms, df, globalWeights, termVectors, labels };
}

/** The doc_ids and doc_vectors BLOBs, or null when the space was stored without them. */
export function decodeDocumentBlobs(blobs: Map<string, Uint8Array>, k: number, what: string) {
  const idsBlob = blobs.get('doc_ids');
  if (!idsBlob) return null;
  const ids = typedFrom(Float64Array, idsBlob, 'doc_ids');
  const vectors = typedFrom(Float32Array, need(blobs, 'doc_vectors', what), 'doc_vectors');
  if (vectors.length !== ids.length * k)
    throw new Error(`${what}: doc_vectors BLOB does not match doc_ids x k`);
  return { ids, vectors };
}
