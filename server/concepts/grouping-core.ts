// A k-means grouping of an index version's documents (Lloyd 1982 with k-means++ seeding,
// server/engine/insights/kmeans.ts), computed and stored inside a worker thread
// (grouping-worker.mjs) with its own SQLite connection: over 100,000 documents it takes
// seconds, which must not hold up the thread that answers requests. One grouping per
// (version, groups, seed): the same settings give the same stored grouping.
import { kmeans, topTermsOfVector, type ConceptSpace } from '../engine/index';
import { loadConceptSpace } from '../indexing/persist';
import { GROUP_TOP_TERMS } from '../../shared/schemas/concepts';
import { openDatabase, type Db } from '../db/database';
import { findGroupingBySettings, insertGrouping } from './queries';

/** k-means runs on the leading dimensions only (they carry most of the energy; cost is linear in it). */
export const GROUPING_DIMS_MAX = 100;
/**
 * Above this many documents k-means runs cheaper: the leading 50 dimensions, one seeding,
 * at most 40 Lloyd iterations (the grouping says whether it converged). Measured on this
 * project's 2-core machine: one Lloyd iteration over 100,000 documents x 100 dimensions
 * x 20 groups takes about 1.2 s; the cheap settings keep 20 groups near 10 s.
 */
export const GROUPING_SMALL_MATTER = 20_000;

export interface GroupingRequest {
  indexId: number;
  groups: number;
  seed: number;
  userId: string | null;
}

/** The grouping's id (an existing one for the same settings is returned as it is). */
export async function computeGrouping(
  db: Db,
  space: ConceptSpace,
  request: GroupingRequest,
): Promise<number> {
  const { indexId, groups, seed } = request;
  const existing = await findGroupingBySettings(db, indexId, groups, seed);
  if (existing) return existing.id;
  const k = space.k;
  const n = space.nDocs;
  const small = n <= GROUPING_SMALL_MATTER;
  const dims = Math.min(k, small ? GROUPING_DIMS_MAX : 50);
  // Rows of V_k S_k (leading `dims` axes); kmeans scales each to unit length.
  const rows = new Float32Array(n * dims);
  const ids = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    ids[j] = Number(space.docId(j));
    const v = space.docVector(j);
    for (let c = 0; c < dims; c++)
      rows[j * dims + c] = space.scaling === 'classic' ? v[c] * space.sigma[c] : v[c];
  }
  const result = kmeans(rows, n, dims, {
    groups,
    seed,
    ids,
    restarts: small ? 8 : 1,
    maxIterations: small ? 100 : 40,
  });
  // Number the groups by size, largest first (ties: lower k-means index first).
  const order = Array.from({ length: groups }, (_, g) => g).sort(
    (a, b) => result.sizes[b] - result.sizes[a] || a - b,
  );
  const members = order.map((g, rank) => {
    const centre = result.centres.subarray(g * dims, (g + 1) * dims);
    const top = topTermsOfVector(space.termVectors, space.nTerms, k, centre, GROUP_TOP_TERMS);
    const documentIds: number[] = [];
    for (let j = 0; j < n; j++) if (result.assignment[j] === g) documentIds.push(ids[j]);
    return {
      number: rank + 1,
      size: result.sizes[g],
      topTerms: JSON.stringify(
        top.map((t) => ({
          term: space.terms[t.index],
          label: space.labels[t.index],
          weight: t.value,
        })),
      ),
      documentIds,
    };
  });
  const centres = Float32Array.from(result.centres);
  try {
    return await insertGrouping(db, {
      indexId,
      groups,
      seed,
      dims,
      documents: n,
      iterations: result.iterations,
      converged: result.converged,
      inertia: result.inertia,
      centres: new Uint8Array(centres.buffer, centres.byteOffset, centres.byteLength),
      createdBy: request.userId,
      members,
    });
  } catch (error) {
    // Made meanwhile with the same settings: that one stands.
    const again = await findGroupingBySettings(db, indexId, groups, seed);
    if (again) return again.id;
    throw error;
  }
}

/** The worker's entry: opens the database, loads the version, computes and stores. */
export async function groupingInWorker(
  request: GroupingRequest & { dbFile: string },
): Promise<number> {
  const { db, sqlite } = openDatabase(request.dbFile);
  try {
    const existing = await findGroupingBySettings(
      db,
      request.indexId,
      request.groups,
      request.seed,
    );
    if (existing) return existing.id;
    const space = await loadConceptSpace(db, request.indexId);
    return await computeGrouping(db, space, request);
  } finally {
    await db.destroy();
    if (sqlite.open) sqlite.close();
  }
}
