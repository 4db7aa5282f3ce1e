// All Kysely for the concept-space views. Every function takes `db` first.
import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

/** Bound parameters per IN (...) list, well under SQLite's limit. */
const CHUNK = 5000;

/** The newest ready or superseded version older than `version` (the one before a rebuild). */
export function previousBuiltVersion(db: Executor, matterId: number, version: number) {
  return db
    .selectFrom('index_versions')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('version', '<', version)
    .where('status', 'in', ['ready', 'superseded'])
    .orderBy('version', 'desc')
    .executeTakeFirst();
}

export async function documentsByIds(db: Executor, matterId: number, ids: readonly number[]) {
  const rows: { id: number; control_number: string; title: string }[] = [];
  for (let i = 0; i < ids.length; i += CHUNK) {
    const chunk = ids.slice(i, i + CHUNK);
    if (chunk.length === 0) continue;
    rows.push(
      ...(await db
        .selectFrom('documents')
        .select(['id', 'control_number', 'title'])
        .where('matter_id', '=', matterId)
        .where('id', 'in', chunk)
        .execute()),
    );
  }
  return rows;
}

/** Every document of the matter with what the map shows (one pass). */
export function mapDocumentsOf(db: Executor, matterId: number) {
  return db
    .selectFrom('documents')
    .select(['id', 'control_number', 'title', 'original_name', 'custodian_id'])
    .where('matter_id', '=', matterId)
    .execute();
}

export function codingsOf(db: Executor, matterId: number) {
  return db
    .selectFrom('document_codes as dc')
    .innerJoin('documents as d', 'd.id', 'dc.document_id')
    .select(['dc.document_id', 'dc.code_id'])
    .where('d.matter_id', '=', matterId)
    .orderBy('dc.document_id')
    .orderBy('dc.code_id')
    .execute();
}

export function custodiansOf(db: Executor, matterId: number) {
  return db
    .selectFrom('custodians')
    .select(['id', 'name'])
    .where('matter_id', '=', matterId)
    .orderBy('name')
    .execute();
}

export function codesOf(db: Executor, matterId: number) {
  return db
    .selectFrom('codes')
    .select(['id', 'name'])
    .where('matter_id', '=', matterId)
    .orderBy('sort_order')
    .orderBy('id')
    .execute();
}

/** Texts of the folded-in documents of an index version (for their drift). */
export function foldedInTexts(db: Executor, indexId: number) {
  return db
    .selectFrom('index_docs as x')
    .innerJoin('document_texts as t', 't.document_id', 'x.document_id')
    .select(['x.document_id', 't.title', 't.body'])
    .where('x.index_id', '=', indexId)
    .where('x.folded_in', '=', 1)
    .orderBy('x.document_id')
    .execute();
}

// ------------------------------------------------------------------ labels

export function labelsOf(db: Executor, indexId: number) {
  return db
    .selectFrom('index_dimension_labels as l')
    .leftJoin('users as u', 'u.id', 'l.labelled_by')
    .select(['l.dim', 'l.label', 'l.labelled_at', 'u.id as user_id', 'u.name', 'u.email'])
    .where('l.index_id', '=', indexId)
    .execute();
}

export async function upsertLabel(
  db: Executor,
  values: { indexId: number; dim: number; label: string; userId: string },
) {
  const labelledAt = new Date().toISOString();
  await db
    .insertInto('index_dimension_labels')
    .values({
      index_id: values.indexId,
      dim: values.dim,
      label: values.label,
      labelled_by: values.userId,
      labelled_at: labelledAt,
    })
    .onConflict((oc) =>
      oc.columns(['index_id', 'dim']).doUpdateSet({
        label: values.label,
        labelled_by: values.userId,
        labelled_at: labelledAt,
      }),
    )
    .execute();
}

export async function deleteLabel(db: Executor, indexId: number, dim: number): Promise<number> {
  const result = await db
    .deleteFrom('index_dimension_labels')
    .where('index_id', '=', indexId)
    .where('dim', '=', dim)
    .executeTakeFirst();
  return Number(result.numDeletedRows);
}

// ------------------------------------------------------------------ groupings

const groupingColumns = [
  'g.id',
  'g.index_id',
  'g.groups',
  'g.seed',
  'g.dims',
  'g.documents',
  'g.iterations',
  'g.converged',
  'g.inertia',
  'g.created_at',
  'v.version',
  'v.matter_id',
  'u.id as user_id',
  'u.name as user_name',
  'u.email as user_email',
] as const;

function groupingsQuery(db: Executor) {
  return db
    .selectFrom('concept_groupings as g')
    .innerJoin('index_versions as v', 'v.id', 'g.index_id')
    .leftJoin('users as u', 'u.id', 'g.created_by')
    .select(groupingColumns);
}

export type GroupingRow = Awaited<ReturnType<typeof findGrouping>> & object;

export function findGrouping(db: Executor, matterId: number, groupingId: number) {
  return groupingsQuery(db)
    .where('g.id', '=', groupingId)
    .where('v.matter_id', '=', matterId)
    .executeTakeFirst();
}

export function findGroupingBySettings(
  db: Executor,
  indexId: number,
  groups: number,
  seed: number,
) {
  return groupingsQuery(db)
    .where('g.index_id', '=', indexId)
    .where('g.groups', '=', groups)
    .where('g.seed', '=', seed)
    .executeTakeFirst();
}

export function groupingsOfIndex(db: Executor, indexId: number) {
  return groupingsQuery(db)
    .where('g.index_id', '=', indexId)
    .orderBy('g.created_at', 'desc')
    .orderBy('g.id', 'desc')
    .execute();
}

export function groupsOf(db: Executor, groupingId: number) {
  return db
    .selectFrom('concept_groups')
    .select(['id', 'number', 'size', 'top_terms'])
    .where('grouping_id', '=', groupingId)
    .orderBy('number')
    .execute();
}

export interface NewGrouping {
  indexId: number;
  groups: number;
  seed: number;
  dims: number;
  documents: number;
  iterations: number;
  converged: boolean;
  inertia: number;
  centres: Uint8Array;
  createdBy: string | null;
  members: { number: number; size: number; topTerms: string; documentIds: number[] }[];
}

/** Writes a grouping, its groups and their members in one transaction; returns its id. */
export function insertGrouping(db: Kysely<Database>, g: NewGrouping): Promise<number> {
  return db.transaction().execute(async (trx) => {
    const { id } = await trx
      .insertInto('concept_groupings')
      .values({
        index_id: g.indexId,
        groups: g.groups,
        seed: g.seed,
        dims: g.dims,
        documents: g.documents,
        iterations: g.iterations,
        converged: g.converged ? 1 : 0,
        inertia: g.inertia,
        centres: g.centres,
        created_by: g.createdBy,
        created_at: new Date().toISOString(),
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    for (const group of g.members) {
      const row = await trx
        .insertInto('concept_groups')
        .values({
          grouping_id: id,
          number: group.number,
          size: group.size,
          top_terms: group.topTerms,
        })
        .returning('id')
        .executeTakeFirstOrThrow();
      for (let i = 0; i < group.documentIds.length; i += 500) {
        const chunk = group.documentIds.slice(i, i + 500);
        if (chunk.length === 0) continue;
        await trx
          .insertInto('concept_group_members')
          .values(chunk.map((documentId) => ({ group_id: row.id, document_id: documentId })))
          .execute();
      }
    }
    return id;
  });
}

/** The document ids of a group, scoped to the matter (and to the grouping when given). */
export async function memberIdsOf(
  db: Executor,
  matterId: number,
  groupId: number,
  groupingId?: number,
): Promise<number[] | null> {
  let group = db
    .selectFrom('concept_groups as cg')
    .innerJoin('concept_groupings as g', 'g.id', 'cg.grouping_id')
    .innerJoin('index_versions as v', 'v.id', 'g.index_id')
    .select('cg.id')
    .where('cg.id', '=', groupId)
    .where('v.matter_id', '=', matterId);
  if (groupingId !== undefined) group = group.where('g.id', '=', groupingId);
  if (!(await group.executeTakeFirst())) return null;
  const rows = await db
    .selectFrom('concept_group_members')
    .select('document_id')
    .where('group_id', '=', groupId)
    .orderBy('document_id')
    .execute();
  return rows.map((r) => r.document_id);
}

/**
 * For search filters: the members of a concept group as a subquery, e.g.
 * `.where('d.id', 'in', groupMemberIdsSubquery(db, filters.groupId))`. Scope the outer
 * query to the matter (d.matter_id) as usual; a group of another matter then matches nothing.
 */
export function groupMemberIdsSubquery(db: Executor, groupId: number) {
  return db
    .selectFrom('concept_group_members')
    .select('document_id')
    .where('group_id', '=', groupId);
}

/** A queued or running concept-grouping job of the matter for these settings. */
export function findActiveGroupingJob(
  db: Executor,
  matterId: number,
  settings: { indexId: number; groups: number; seed: number },
) {
  return db
    .selectFrom('jobs')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('kind', '=', 'concept-grouping')
    .where('status', 'in', ['queued', 'running'])
    .where(sql<number>`json_extract(payload, '$.indexId')`, '=', settings.indexId)
    .where(sql<number>`json_extract(payload, '$.groups')`, '=', settings.groups)
    .where(sql<number>`json_extract(payload, '$.seed')`, '=', settings.seed)
    .orderBy('id')
    .executeTakeFirst();
}
