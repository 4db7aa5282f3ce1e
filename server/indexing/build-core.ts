// A full build of a matter's concept space, run inside a worker thread (build-worker.mjs)
// with its own SQLite connection (WAL lets the API keep reading and writing meanwhile).
// It writes the new version's vectors with status 'building'; the main thread switches
// the matter over to it in one transaction, so a build that dies never replaces anything.
import { ConceptSpace } from '../engine/index';
import type { Weighting } from '../engine/index';
import { openDatabase } from '../db/database';
import { listIndexableTexts } from '../documents/queries';
import { saveConceptSpace } from './persist';

export interface BuildRequest {
  dbFile: string;
  matterId: number;
  indexId: number;
  k: number;
  weighting: Weighting;
}

export interface BuildSummary {
  nDocs: number;
  nTerms: number;
  k: number;
  notices: string[];
  buildMs: number;
}

/**
 * Terms seen in a single document cannot co-occur with anything, so the usual minimum
 * document frequency is 2; a very small matter keeps every term so each document still
 * gets a vector (common practice).
 */
export const minDfFor = (nDocs: number) => (nDocs < 10 ? 1 : 2);

export async function buildIndexVersion(
  request: BuildRequest,
  onProgress: (fraction: number) => void,
): Promise<BuildSummary> {
  const { db, sqlite } = openDatabase(request.dbFile);
  try {
    const rows = await listIndexableTexts(db, request.matterId);
    onProgress(0.02);
    const { space, diagnostics } = ConceptSpace.build(
      rows.map((row) => ({ id: row.id, title: row.title, text: row.body })),
      {
        k: request.k,
        weighting: request.weighting,
        minDf: minDfFor(rows.length),
        onProgress: (f) => onProgress(0.02 + 0.88 * f),
      },
    );
    onProgress(0.9);
    await saveConceptSpace(
      db,
      space,
      diagnostics,
      { indexId: request.indexId },
      { status: 'building' },
    );
    onProgress(1);
    return {
      nDocs: diagnostics.nDocs,
      nTerms: diagnostics.nTerms,
      k: diagnostics.k,
      notices: diagnostics.notices,
      buildMs: diagnostics.buildMs,
    };
  } finally {
    await db.destroy();
    if (sqlite.open) sqlite.close();
  }
}
