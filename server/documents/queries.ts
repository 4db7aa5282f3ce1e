import { sql, type Kysely, type RawBuilder, type SqlBool, type Transaction } from 'kysely';
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
  /** Matches every document the custodian held a copy of (document_custodians). */
  custodian?: number;
  batch?: number;
  inclusiveOnly?: boolean;
  nearDuplicateGroup?: number;
  thread?: number;
}

/** The filter as one SQL condition on `d` (documents). */
function filterSql(filter: DocumentFilter): RawBuilder<SqlBool> {
  const parts: RawBuilder<unknown>[] = [sql`1`];
  if (filter.status) parts.push(sql`d.extract_status = ${filter.status}`);
  if (filter.custodian)
    parts.push(
      sql`EXISTS (SELECT 1 FROM document_custodians dc WHERE dc.document_id = d.id AND dc.custodian_id = ${filter.custodian})`,
    );
  if (filter.batch) parts.push(sql`d.batch_id = ${filter.batch}`);
  // Inclusive only: e-mails that are not inclusive drop out; other documents stay.
  if (filter.inclusiveOnly) parts.push(sql`(d.inclusive IS NULL OR d.inclusive = 1)`);
  if (filter.nearDuplicateGroup)
    parts.push(sql`d.near_dup_group_id = ${filter.nearDuplicateGroup}`);
  if (filter.thread) parts.push(sql`d.thread_id = ${filter.thread}`);
  return sql<SqlBool>`(${sql.join(parts, sql` AND `)})`;
}

/** Custodians of every copy of the given documents (document_custodians), by document. */
export async function allCustodiansOf(
  db: Executor,
  ids: number[],
): Promise<Map<number, { id: number; name: string }[]>> {
  const out = new Map<number, { id: number; name: string }[]>();
  for (let start = 0; start < ids.length; start += 900) {
    const rows = await db
      .selectFrom('document_custodians as dc')
      .innerJoin('custodians as c', 'c.id', 'dc.custodian_id')
      .select(['dc.document_id', 'c.id', 'c.name'])
      .where('dc.document_id', 'in', ids.slice(start, start + 900))
      .orderBy('c.name')
      .execute();
    for (const row of rows) {
      const list = out.get(row.document_id) ?? [];
      list.push({ id: row.id, name: row.name });
      out.set(row.document_id, list);
    }
  }
  return out;
}

/** The first top-level e-mail of the matter with this normalised-header hash (not `exceptId`). */
export function findFirstByEmailHash(
  db: Executor,
  matterId: number,
  emailHash: string,
  exceptId: number,
) {
  return db
    .selectFrom('documents')
    .select(['id', 'control_number'])
    .where('matter_id', '=', matterId)
    .where('email_hash', '=', emailHash)
    .where('parent_id', 'is', null)
    .where('extract_status', '=', 'extracted')
    .where('id', '!=', exceptId)
    .orderBy('id')
    .limit(1)
    .executeTakeFirst();
}

/**
 * A suppressed copy's custodians join the kept document's, across its whole family (the
 * kept e-mail's attachments were held by the same people).
 */
export async function addCustodiansOfCopy(
  db: Executor,
  keptId: number,
  copyId: number,
): Promise<void> {
  await sql`INSERT OR IGNORE INTO document_custodians (document_id, custodian_id)
    SELECT f.id, dc.custodian_id FROM document_custodians dc
      JOIN documents k ON k.id = ${keptId}
      JOIN documents f ON f.matter_id = k.matter_id AND f.family_id = COALESCE(k.family_id, k.id)
      WHERE dc.document_id = ${copyId}`.execute(db);
}

/** A new child holds the custodians of its parent (a family is held as a unit). */
export async function inheritCustodians(db: Executor, parentId: number, childId: number) {
  await sql`INSERT OR IGNORE INTO document_custodians (document_id, custodian_id)
    SELECT ${childId}, custodian_id FROM document_custodians WHERE document_id = ${parentId}`.execute(
    db,
  );
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
  query = query.where(filterSql(filter));
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
  query = query.where(filterSql(filter));
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
