import type { Kysely, Transaction } from 'kysely';
import type { Database, IndexStatus, IndexVersionRow } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export async function currentIndexIdOf(db: Executor, matterId: number): Promise<number | null> {
  const row = await db
    .selectFrom('matters')
    .select('current_index_id')
    .where('id', '=', matterId)
    .executeTakeFirst();
  return row?.current_index_id ?? null;
}

export function findIndexVersion(
  db: Executor,
  indexId: number,
): Promise<IndexVersionRow | undefined> {
  return db.selectFrom('index_versions').selectAll().where('id', '=', indexId).executeTakeFirst();
}

export function latestVersionWithStatus(db: Executor, matterId: number, status: IndexStatus) {
  return db
    .selectFrom('index_versions')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('status', '=', status)
    .orderBy('version', 'desc')
    .executeTakeFirst();
}

export async function insertBuildingVersion(
  db: Executor,
  values: {
    matterId: number;
    k: number;
    /** null when k was chosen automatically from the matter's size. */
    requestedK: number | null;
    weighting: string;
    jobId: number;
    requestedBy: string | null;
  },
): Promise<{ id: number; version: number }> {
  const max = await db
    .selectFrom('index_versions')
    .select((eb) => eb.fn.max<number>('version').as('v'))
    .where('matter_id', '=', values.matterId)
    .executeTakeFirst();
  const version = Number(max?.v ?? 0) + 1;
  const row = await db
    .insertInto('index_versions')
    .values({
      matter_id: values.matterId,
      version,
      status: 'building',
      k: values.k,
      weighting: values.weighting,
      params: JSON.stringify({ requestedK: values.requestedK, weighting: values.weighting }),
      job_id: values.jobId,
      requested_by: values.requestedBy,
      created_at: new Date().toISOString(),
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return { id: row.id, version };
}

export async function markVersionFailed(
  db: Executor,
  indexId: number,
  error: string,
): Promise<void> {
  await db
    .updateTable('index_versions')
    .set({ status: 'failed', error, completed_at: new Date().toISOString() })
    .where('id', '=', indexId)
    .execute();
  // Its partial vectors are of no use to anyone.
  await db.deleteFrom('index_terms').where('index_id', '=', indexId).execute();
  await db.deleteFrom('index_docs').where('index_id', '=', indexId).execute();
}

/** The one-transaction switch: new version ready and current, the old one superseded. */
export async function switchToVersion(
  trx: Transaction<Database>,
  matterId: number,
  indexId: number,
): Promise<number | null> {
  const previous = await currentIndexIdOf(trx, matterId);
  if (previous !== null) {
    await trx
      .updateTable('index_versions')
      .set({ status: 'superseded' })
      .where('id', '=', previous)
      .execute();
  }
  await trx
    .updateTable('index_versions')
    .set({ status: 'ready', completed_at: new Date().toISOString() })
    .where('id', '=', indexId)
    .execute();
  await trx
    .updateTable('matters')
    .set({ current_index_id: indexId })
    .where('id', '=', matterId)
    .execute();
  return previous;
}

/** Drops the vectors of superseded versions (their rows stay as history). */
export async function pruneSuperseded(db: Executor, matterId: number): Promise<void> {
  const old = db
    .selectFrom('index_versions')
    .select('id')
    .where('matter_id', '=', matterId)
    .where('status', '=', 'superseded');
  await db.deleteFrom('index_terms').where('index_id', 'in', old).execute();
  await db.deleteFrom('index_docs').where('index_id', 'in', old).execute();
  // The BLOBs hold the same vectors (and the vocabulary): a purged document must not live on there.
  await db.deleteFrom('index_blobs').where('index_id', 'in', old).execute();
}

/** Builds a crash left 'building' are failed: their worker is gone. */
export async function failStaleBuilds(db: Executor, error: string): Promise<number> {
  const stale = await db
    .selectFrom('index_versions')
    .select('id')
    .where('status', '=', 'building')
    .execute();
  for (const row of stale) await markVersionFailed(db, row.id, error);
  return stale.length;
}

export async function countFoldedIn(db: Executor, indexId: number) {
  const row = await db
    .selectFrom('index_docs')
    .select((eb) => [eb.fn.countAll<number>().as('n'), eb.fn.sum<number>('folded_in').as('folded')])
    .where('index_id', '=', indexId)
    .executeTakeFirstOrThrow();
  return { total: Number(row.n), folded: Number(row.folded ?? 0) };
}

/** Which of `ids` are still extracted documents of the matter. */
export async function stillExtracted(db: Executor, matterId: number, ids: number[]) {
  const out: number[] = [];
  for (let start = 0; start < ids.length; start += 500) {
    const rows = await db
      .selectFrom('documents')
      .select('id')
      .where('matter_id', '=', matterId)
      .where('extract_status', '=', 'extracted')
      .where('id', 'in', ids.slice(start, start + 500))
      .execute();
    for (const r of rows) out.push(r.id);
  }
  return out;
}

/**
 * Matters holding extracted documents that their serving index version lacks (every
 * extracted document, for a matter with no index yet).
 */
export async function extractedNotIndexedMatters(
  db: Executor,
): Promise<{ matterId: number; hasIndex: boolean }[]> {
  const rows = await db
    .selectFrom('matters as m')
    .select(['m.id', 'm.current_index_id'])
    .where((eb) =>
      eb.exists(
        eb
          .selectFrom('documents as d')
          .select('d.id')
          .whereRef('d.matter_id', '=', 'm.id')
          .where('d.extract_status', '=', 'extracted')
          .where((inner) =>
            inner.not(
              inner.exists(
                inner
                  .selectFrom('index_docs as x')
                  .select('x.document_id')
                  .whereRef('x.document_id', '=', 'd.id')
                  .whereRef('x.index_id', '=', 'm.current_index_id'),
              ),
            ),
          ),
      ),
    )
    .orderBy('m.id')
    .execute();
  return rows.map((r) => ({ matterId: r.id, hasIndex: r.current_index_id !== null }));
}
