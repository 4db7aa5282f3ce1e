// Folding-in (Deerwester et al. 1990, section 4) run inside a worker thread
// (fold-worker.mjs): the worker opens its own SQLite connection, loads the serving
// version's concept space (kept while the same version is asked for again), reads the
// matter's extracted documents that version lacks and returns their vectors. Analysing a
// document's text costs time that grows with its length, so it never runs on the thread
// that answers requests; the main thread only stores the vectors and adds them to its
// own copy of the space.
import type { ConceptSpace } from '../engine/index';
import { loadConceptSpace } from './persist';
import { openDatabase, type OpenedDatabase } from '../db/database';
import { listExtractedNotInIndex } from '../documents/queries';

export interface FoldRequest {
  dbFile: string;
  matterId: number;
  indexId: number;
}

export interface FoldedVector {
  id: number;
  vector: Float32Array;
}

let opened: { file: string; handle: OpenedDatabase } | null = null;
let cached: { indexId: number; space: ConceptSpace } | null = null;

function database(file: string): OpenedDatabase {
  if (opened?.file !== file) {
    opened?.handle.sqlite.close();
    opened = { file, handle: openDatabase(file) };
  }
  return opened.handle;
}

/** Vectors of the matter's extracted documents that index version `indexId` lacks. */
export async function foldWaiting(request: FoldRequest): Promise<FoldedVector[]> {
  const { db } = database(request.dbFile);
  const rows = await listExtractedNotInIndex(db, request.matterId, request.indexId);
  if (rows.length === 0) return [];
  if (cached?.indexId !== request.indexId) {
    cached = null; // free the previous version before loading the next
    cached = {
      indexId: request.indexId,
      space: await loadConceptSpace(db, request.indexId),
    };
  }
  return cached.space
    .foldInDocuments(rows.map((row) => ({ id: row.id, title: row.title, text: row.body })))
    .map((f) => ({ id: Number(f.id), vector: f.vector }));
}

export function closeFoldDatabase(): void {
  opened?.handle.sqlite.close();
  opened = null;
  cached = null;
}
