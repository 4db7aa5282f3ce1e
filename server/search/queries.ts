import type SQLite from 'better-sqlite3';
import {
  sql,
  type Compilable,
  type Kysely,
  type RawBuilder,
  type SqlBool,
  type Transaction,
} from 'kysely';
import type { SearchFilters, SearchSort } from '../../shared/schemas/search';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

// Queries are written in Kysely; the one that returns up to a whole matter's ids
// (filter candidates) is compiled by Kysely and run on the raw better-sqlite3 handle,
// plucked, without building a JavaScript row per document (measured on 100,000
// documents: about 0.85 us per row as arrays, 0.23 us plucked). Keyword matches come
// from the in-memory index (keyword-cache.ts).

const statementCache = new WeakMap<SQLite.Database, Map<string, SQLite.Statement>>();

function prepared(sqlite: SQLite.Database, text: string): SQLite.Statement {
  let cache = statementCache.get(sqlite);
  if (!cache) statementCache.set(sqlite, (cache = new Map()));
  let stmt = cache.get(text);
  if (!stmt) {
    stmt = sqlite.prepare(text);
    if (cache.size > 200) cache.clear();
    cache.set(text, stmt);
  }
  return stmt;
}

function pluckedIds(sqlite: SQLite.Database, query: Compilable): number[] {
  const compiled = query.compile();
  return prepared(sqlite, compiled.sql)
    .pluck(true)
    .all(...(compiled.parameters as unknown[])) as number[];
}

/** True when the filters restrict which documents may match (includeDuplicates does not). */
export function restricts(filters: SearchFilters): boolean {
  return Boolean(
    filters.custodianIds?.length ||
    filters.dateFrom ||
    filters.dateTo ||
    filters.docTypes?.length ||
    filters.codeIds?.length ||
    filters.uncodedOnly ||
    filters.groupId !== undefined,
  );
}

/** The day after an ISO date (YYYY-MM-DD), for an inclusive dateTo. */
function nextDay(date: string): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return d.toISOString().slice(0, 10);
}

/**
 * The filters as one SQL condition on `d` (documents). Dates compare the ISO-8601
 * sent_at strings (lexical order is time order); a document without a date never
 * passes a date filter.
 */
export function filterCondition(filters: SearchFilters): RawBuilder<SqlBool> {
  const parts: RawBuilder<unknown>[] = [sql`1`];
  const list = (values: readonly (string | number)[]) => sql.join(values.map((v) => sql`${v}`));
  // Every custodian who held a copy (document_custodians), so a copy suppressed as a
  // duplicate still counts for its custodian.
  if (filters.custodianIds?.length)
    parts.push(
      sql`d.id IN (SELECT dc.document_id FROM document_custodians dc WHERE dc.custodian_id IN (${list(filters.custodianIds)}))`,
    );
  const dateColumn = filters.dateBasis === 'family' ? sql`d.family_date` : sql`d.sent_at`;
  if (filters.dateFrom) parts.push(sql`${dateColumn} >= ${filters.dateFrom}`);
  if (filters.dateTo) parts.push(sql`${dateColumn} < ${nextDay(filters.dateTo)}`);
  if (filters.docTypes?.length) parts.push(sql`d.doc_type IN (${list(filters.docTypes)})`);
  if (filters.codeIds?.length) {
    parts.push(
      sql`EXISTS (SELECT 1 FROM document_codes dc WHERE dc.document_id = d.id AND dc.code_id IN (${list(filters.codeIds)}))`,
    );
  }
  if (filters.uncodedOnly)
    parts.push(sql`NOT EXISTS (SELECT 1 FROM document_codes dc WHERE dc.document_id = d.id)`);
  // A concept group (server/concepts k-means); one of another matter matches nothing,
  // since every search is already limited to the matter's documents.
  if (filters.groupId !== undefined) {
    parts.push(
      sql`d.id IN (SELECT gm.document_id FROM concept_group_members gm WHERE gm.group_id = ${filters.groupId})`,
    );
  }
  return sql<SqlBool>`(${sql.join(parts, sql` AND `)})`;
}

/** Ids of the matter's searchable (extracted) documents that pass the filters. */
export function filteredDocumentIds(
  db: Executor,
  sqlite: SQLite.Database,
  matterId: number,
  filters: SearchFilters,
): number[] {
  const query = db
    .selectFrom('documents as d')
    .select('d.id')
    .where('d.matter_id', '=', matterId)
    .where('d.extract_status', '=', 'extracted')
    .where(filterCondition(filters));
  return pluckedIds(sqlite, query);
}

/** Duplicates (same SHA-256, status 'duplicate') of the given first copies, passing the filters. */
export async function duplicatesOf(
  db: Executor,
  matterId: number,
  ids: number[],
  filters: SearchFilters,
) {
  const out: { id: number; duplicate_of: number }[] = [];
  for (let start = 0; start < ids.length; start += 900) {
    const rows = await db
      .selectFrom('documents as d')
      .select(['d.id', 'd.duplicate_of'])
      .where('d.matter_id', '=', matterId)
      .where('d.extract_status', '=', 'duplicate')
      .where('d.duplicate_of', 'in', ids.slice(start, start + 900))
      .where(filterCondition(filters))
      .orderBy('d.control_number')
      .execute();
    for (const row of rows) out.push({ id: row.id, duplicate_of: row.duplicate_of! });
  }
  return out;
}

const SORT_COLUMNS: Record<Exclude<SearchSort['field'], 'score'>, RawBuilder<unknown>> = {
  controlNumber: sql`d.control_number`,
  date: sql`d.sent_at`,
  familyDate: sql`d.family_date`,
  title: sql`d.title COLLATE NOCASE`,
  custodian: sql`c.name COLLATE NOCASE`,
  docType: sql`d.doc_type`,
};

/**
 * One page of the result set ordered by a document field (missing values last, then
 * control number). The ids travel as one JSON array through json_each.
 */
export async function sortedPage(
  db: Executor,
  ids: number[],
  sort: SearchSort & { field: Exclude<SearchSort['field'], 'score'> },
  limit: number,
  offset: number,
): Promise<number[]> {
  const column = SORT_COLUMNS[sort.field];
  const direction = sort.direction === 'asc' ? sql`ASC` : sql`DESC`;
  const nullable =
    sort.field === 'date' || sort.field === 'custodian' || sort.field === 'familyDate';
  // The custodians join only when sorting by custodian (10,000 ids, 10,000 lookups).
  const custodians =
    sort.field === 'custodian' ? sql`LEFT JOIN custodians c ON c.id = d.custodian_id` : sql``;
  const rows = await sql<{ id: number }>`
    SELECT d.id AS id
      FROM json_each(${JSON.stringify(ids)}) AS j
      JOIN documents d ON d.id = j.value
      ${custodians}
     ORDER BY ${nullable ? sql`${column} IS NULL, ` : sql``}${column} ${direction}, d.control_number ASC
     LIMIT ${limit} OFFSET ${offset}`.execute(db);
  return rows.rows.map((r) => r.id);
}

/** Listing fields of the given documents, with the custodian's name. */
export async function documentsByIds(db: Executor, matterId: number, ids: number[]) {
  const out = [];
  for (let start = 0; start < ids.length; start += 900) {
    out.push(
      ...(await db
        .selectFrom('documents as d')
        .leftJoin('custodians as c', 'c.id', 'd.custodian_id')
        .select([
          'd.id',
          'd.control_number',
          'd.title',
          'd.original_name',
          'd.doc_type',
          'd.sent_at',
          'd.parent_id',
          'd.duplicate_of',
          'c.name as custodian_name',
          // Family, thread, near-duplicate and OCR fields for result columns (issue 13).
          'd.family_id',
          'd.thread_id',
          'd.inclusive',
          'd.near_dup_group_id',
          'd.near_dup_similarity',
          'd.ocr',
        ])
        // Unary + keeps SQLite from reading the matter through a matter_id index (every
        // document of a 100,000-document matter, 11 ms) instead of the page's rowids.
        .where(sql<SqlBool>`+d.matter_id = ${matterId}`)
        .where('d.id', 'in', ids.slice(start, start + 900))
        .execute()),
    );
  }
  return out;
}

/**
 * The first `windowChars` characters of each text's title and body (SQLite substr counts
 * characters), and the body's full length: a hit's snippet and "why it matched" read a
 * bounded window, so a page of multi-megabyte e-mails costs no more than short ones.
 */
export function textsByIds(db: Executor, ids: number[], windowChars: number) {
  if (ids.length === 0) return Promise.resolve([]);
  return db
    .selectFrom('document_texts')
    .select((eb) => [
      'document_id',
      eb.fn<string>('substr', ['title', sql.lit(1), sql.lit(windowChars)]).as('title'),
      eb.fn<string>('substr', ['body', sql.lit(1), sql.lit(windowChars)]).as('body'),
      eb.fn<number>('length', ['body']).as('body_length'),
    ])
    .where('document_id', 'in', ids)
    .execute();
}

export function findSearchableDocument(db: Executor, matterId: number, docId: number) {
  return db
    .selectFrom('documents as d')
    .leftJoin('document_texts as t', 't.document_id', 'd.id')
    .select(['d.id', 'd.extract_status', 'd.duplicate_of', 't.title', 't.body'])
    .where('d.matter_id', '=', matterId)
    .where('d.id', '=', docId)
    .executeTakeFirst();
}

/** The caller's recent search.run events in the matter, newest first. */
export function recentSearchEvents(db: Executor, matterId: number, userId: string, limit: number) {
  return db
    .selectFrom('audit_events')
    .select(['at', 'detail'])
    .where('actor_id', '=', userId)
    .where('matter_id', '=', matterId)
    .where('action', '=', 'search.run')
    .orderBy('id', 'desc')
    .limit(limit)
    .execute();
}
