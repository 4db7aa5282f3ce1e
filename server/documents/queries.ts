import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database, DocumentRow, ExtractStatus, NewDocumentRow } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export function findMatterForLoad(db: Executor, matterId: number) {
  return db
    .selectFrom('matters')
    .select(['id', 'name', 'control_prefix', 'next_control_seq', 'current_index_id'])
    .where('id', '=', matterId)
    .executeTakeFirst();
}

export function findMatterByName(db: Executor, name: string) {
  return db
    .selectFrom('matters')
    .select(['id', 'name', 'control_prefix'])
    .where('name', '=', name)
    .executeTakeFirst();
}

/**
 * Takes `count` control-number sequence values from the matter and returns the first.
 * Run inside the transaction that inserts the documents, so numbers are never reused.
 */
export async function takeControlSequence(
  trx: Transaction<Database>,
  matterId: number,
  count: number,
): Promise<number> {
  const row = await trx
    .updateTable('matters')
    .set((eb) => ({ next_control_seq: eb('next_control_seq', '+', count) }))
    .where('id', '=', matterId)
    .returning(['next_control_seq', 'control_prefix'])
    .executeTakeFirstOrThrow();
  return row.next_control_seq - count;
}

export function findCustodianByName(db: Executor, matterId: number, name: string) {
  return db
    .selectFrom('custodians')
    .select(['id', 'name', 'created_at'])
    .where('matter_id', '=', matterId)
    .where('name', '=', name)
    .executeTakeFirst();
}

export function findCustodianById(db: Executor, matterId: number, id: number) {
  return db
    .selectFrom('custodians')
    .select(['id', 'name', 'created_at'])
    .where('matter_id', '=', matterId)
    .where('id', '=', id)
    .executeTakeFirst();
}

export async function insertCustodian(db: Executor, matterId: number, name: string) {
  return db
    .insertInto('custodians')
    .values({ matter_id: matterId, name, created_at: new Date().toISOString() })
    .returning(['id', 'name', 'created_at'])
    .executeTakeFirstOrThrow();
}

export function listCustodians(db: Executor, matterId: number) {
  return db
    .selectFrom('custodians as c')
    .leftJoin('documents as d', 'd.custodian_id', 'c.id')
    .select(['c.id', 'c.name', 'c.created_at'])
    .select((eb) => eb.fn.count<number>('d.id').as('document_count'))
    .where('c.matter_id', '=', matterId)
    .groupBy('c.id')
    .orderBy('c.name')
    .execute();
}

export async function insertBatch(
  db: Executor,
  values: {
    matterId: number;
    custodianId: number | null;
    source: 'upload' | 'import' | 'demo';
    fileCount: number;
    createdBy: string | null;
  },
): Promise<number> {
  const row = await db
    .insertInto('upload_batches')
    .values({
      matter_id: values.matterId,
      custodian_id: values.custodianId,
      source: values.source,
      file_count: values.fileCount,
      created_by: values.createdBy,
      created_at: new Date().toISOString(),
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** The first document of the matter with this content (the one duplicates point at). */
export function findFirstBySha(db: Executor, matterId: number, sha256: string) {
  return db
    .selectFrom('documents')
    .select(['id', 'control_number'])
    .where('matter_id', '=', matterId)
    .where('sha256', '=', sha256)
    .where('extract_status', '!=', 'duplicate')
    .orderBy('id')
    .limit(1)
    .executeTakeFirst();
}

export async function insertDocument(db: Executor, values: NewDocumentRow): Promise<number> {
  const row = await db
    .insertInto('documents')
    .values(values)
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export function findDocument(db: Executor, matterId: number, docId: number) {
  return db
    .selectFrom('documents')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('id', '=', docId)
    .executeTakeFirst();
}

export function findDocumentsByIds(db: Executor, ids: number[]): Promise<DocumentRow[]> {
  if (ids.length === 0) return Promise.resolve([]);
  return db.selectFrom('documents').selectAll().where('id', 'in', ids).orderBy('id').execute();
}

export async function setExtractStatus(
  db: Executor,
  docId: number,
  status: ExtractStatus,
  error: string | null = null,
): Promise<void> {
  await db
    .updateTable('documents')
    .set({ extract_status: status, extract_error: error })
    .where('id', '=', docId)
    .execute();
}

export async function replaceDocumentText(
  db: Executor,
  docId: number,
  title: string,
  body: string,
): Promise<void> {
  await db.deleteFrom('document_texts').where('document_id', '=', docId).execute();
  await db.insertInto('document_texts').values({ document_id: docId, title, body }).execute();
}

export function findDocumentText(db: Executor, docId: number) {
  return db
    .selectFrom('document_texts')
    .select(['title', 'body'])
    .where('document_id', '=', docId)
    .executeTakeFirst();
}

/** Extracted, indexable documents' texts (not duplicates, not failed). */
export function listIndexableTexts(db: Executor, matterId: number, onlyIds?: number[]) {
  let query = db
    .selectFrom('documents as d')
    .innerJoin('document_texts as t', 't.document_id', 'd.id')
    .select(['d.id', 't.title', 't.body'])
    .where('d.matter_id', '=', matterId)
    .where('d.extract_status', '=', 'extracted');
  if (onlyIds) query = query.where('d.id', 'in', onlyIds.length ? onlyIds : [-1]);
  return query.orderBy('d.id').execute();
}

export interface DocumentFilter {
  status?: ExtractStatus;
  custodian?: number;
  batch?: number;
}

/** The list page joined with custodian, duplicate's control number and index state. */
export function listDocumentsPage(
  db: Executor,
  matterId: number,
  currentIndexId: number | null,
  filter: DocumentFilter,
  page: { limit: number; offset: number },
) {
  let query = db
    .selectFrom('documents as d')
    .leftJoin('custodians as c', 'c.id', 'd.custodian_id')
    .leftJoin('index_docs as x', (join) =>
      join.onRef('x.document_id', '=', 'd.id').on('x.index_id', '=', currentIndexId ?? -1),
    )
    .selectAll('d')
    .select(['c.name as custodian_name', 'x.folded_in as index_folded_in'])
    .where('d.matter_id', '=', matterId);
  if (filter.status) query = query.where('d.extract_status', '=', filter.status);
  if (filter.custodian) query = query.where('d.custodian_id', '=', filter.custodian);
  if (filter.batch) query = query.where('d.batch_id', '=', filter.batch);
  return query.orderBy('d.control_number').limit(page.limit).offset(page.offset).execute();
}

export async function countDocumentsFiltered(
  db: Executor,
  matterId: number,
  filter: DocumentFilter,
) {
  let query = db
    .selectFrom('documents as d')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .where('d.matter_id', '=', matterId);
  if (filter.status) query = query.where('d.extract_status', '=', filter.status);
  if (filter.custodian) query = query.where('d.custodian_id', '=', filter.custodian);
  if (filter.batch) query = query.where('d.batch_id', '=', filter.batch);
  return Number((await query.executeTakeFirstOrThrow()).n);
}

export function findDocumentWithJoins(
  db: Executor,
  matterId: number,
  docId: number,
  currentIndexId: number | null,
) {
  return db
    .selectFrom('documents as d')
    .leftJoin('custodians as c', 'c.id', 'd.custodian_id')
    .leftJoin('index_docs as x', (join) =>
      join.onRef('x.document_id', '=', 'd.id').on('x.index_id', '=', currentIndexId ?? -1),
    )
    .selectAll('d')
    .select(['c.name as custodian_name', 'x.folded_in as index_folded_in'])
    .where('d.matter_id', '=', matterId)
    .where('d.id', '=', docId)
    .executeTakeFirst();
}

export function listDocumentRefs(db: Executor, where: { parentId?: number; duplicateOf?: number }) {
  let query = db
    .selectFrom('documents')
    .select(['id', 'control_number', 'title', 'original_name', 'extract_status']);
  if (where.parentId !== undefined) query = query.where('parent_id', '=', where.parentId);
  if (where.duplicateOf !== undefined) query = query.where('duplicate_of', '=', where.duplicateOf);
  return query.orderBy('control_number').execute();
}

export function findDocumentRef(db: Executor, docId: number) {
  return db
    .selectFrom('documents')
    .select(['id', 'control_number', 'title', 'original_name', 'extract_status'])
    .where('id', '=', docId)
    .executeTakeFirst();
}

/** Per-status counts and how many extracted documents the current index holds / folded in. */
export async function countIndexStates(
  db: Executor,
  matterId: number,
  currentIndexId: number | null,
) {
  const rows = await db
    .selectFrom('documents as d')
    .leftJoin('index_docs as x', (join) =>
      join.onRef('x.document_id', '=', 'd.id').on('x.index_id', '=', currentIndexId ?? -1),
    )
    .select([
      'd.extract_status as status',
      sql<number>`count(*)`.as('n'),
      sql<number>`sum(case when x.document_id is not null and x.folded_in = 0 then 1 else 0 end)`.as(
        'indexed',
      ),
      sql<number>`sum(case when x.folded_in = 1 then 1 else 0 end)`.as('folded'),
    ])
    .where('d.matter_id', '=', matterId)
    .groupBy('d.extract_status')
    .execute();
  const counts = { indexed: 0, foldedIn: 0, waiting: 0, failed: 0, duplicates: 0 };
  for (const row of rows) {
    const n = Number(row.n);
    if (row.status === 'failed') counts.failed += n;
    else if (row.status === 'duplicate') counts.duplicates += n;
    else {
      const indexed = Number(row.indexed ?? 0);
      const folded = Number(row.folded ?? 0);
      counts.indexed += indexed;
      counts.foldedIn += folded;
      counts.waiting += n - indexed - folded;
    }
  }
  return counts;
}

/** Extracted documents not in the given index version (to fold in). */
export function listExtractedNotInIndex(db: Executor, matterId: number, indexId: number) {
  return db
    .selectFrom('documents as d')
    .innerJoin('document_texts as t', 't.document_id', 'd.id')
    .select(['d.id', 't.title', 't.body'])
    .where('d.matter_id', '=', matterId)
    .where('d.extract_status', '=', 'extracted')
    .where((eb) =>
      eb.not(
        eb.exists(
          eb
            .selectFrom('index_docs as x')
            .select('x.document_id')
            .whereRef('x.document_id', '=', 'd.id')
            .where('x.index_id', '=', indexId),
        ),
      ),
    )
    .orderBy('d.id')
    .execute();
}

export async function countExtracted(db: Executor, matterId: number): Promise<number> {
  const row = await db
    .selectFrom('documents')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .where('matter_id', '=', matterId)
    .where('extract_status', '=', 'extracted')
    .executeTakeFirstOrThrow();
  return Number(row.n);
}
