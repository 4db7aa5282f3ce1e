import type { Kysely, Transaction } from 'kysely';
import type { BatchKind, Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

const CHUNK = 900;

/** Matter documents of the given ids with their family, in control-number order. */
export async function documentsWithFamilies(db: Executor, matterId: number, ids: number[]) {
  const out: { id: number; family_id: number | null; control_number: string }[] = [];
  for (let i = 0; i < ids.length; i += CHUNK) {
    out.push(
      ...(await db
        .selectFrom('documents')
        .select(['id', 'family_id', 'control_number'])
        .where('matter_id', '=', matterId)
        .where('id', 'in', ids.slice(i, i + CHUNK))
        .execute()),
    );
  }
  return out;
}

/** Every member of the given families, top-level item first then by control number. */
export async function familyMembers(db: Executor, matterId: number, familyIds: number[]) {
  const out: { id: number; family_id: number | null; control_number: string }[] = [];
  for (let i = 0; i < familyIds.length; i += CHUNK) {
    out.push(
      ...(await db
        .selectFrom('documents')
        .select(['id', 'family_id', 'control_number'])
        .where('matter_id', '=', matterId)
        .where('family_id', 'in', familyIds.slice(i, i + CHUNK))
        .orderBy('control_number')
        .execute()),
    );
  }
  return out;
}

/** Which of the documents already sit in an open batch of this kind. */
export async function openPlacements(db: Executor, ids: number[], kind: BatchKind) {
  const found = new Set<number>();
  for (let i = 0; i < ids.length; i += CHUNK) {
    const rows = await db
      .selectFrom('review_batch_documents')
      .select('document_id')
      .where('open_kind', '=', kind)
      .where('document_id', 'in', ids.slice(i, i + CHUNK))
      .execute();
    for (const r of rows) found.add(r.document_id);
  }
  return found;
}

export async function insertBatch(
  db: Executor,
  values: {
    matterId: number;
    name: string;
    kind: BatchKind;
    source: string;
    sourceDetail: unknown;
    createdBy: string;
    at: string;
  },
  documentIds: number[],
) {
  const row = await db
    .insertInto('review_batches')
    .values({
      matter_id: values.matterId,
      name: values.name,
      kind: values.kind,
      source: values.source,
      source_detail: JSON.stringify(values.sourceDetail ?? {}),
      created_by: values.createdBy,
      created_at: values.at,
      assignee_id: null,
      assigned_at: null,
      checked_out_at: null,
      checked_in_at: null,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  for (let i = 0; i < documentIds.length; i += 300) {
    await db
      .insertInto('review_batch_documents')
      .values(
        documentIds.slice(i, i + 300).map((documentId, j) => ({
          batch_id: row.id,
          document_id: documentId,
          position: i + j + 1,
          open_kind: values.kind === 'validation' ? null : values.kind,
        })),
      )
      .execute();
  }
  return row.id;
}

export function batchRows(
  db: Executor,
  matterId: number,
  where: { ids?: number[]; assigneeId?: string; kind?: BatchKind } = {},
) {
  let q = db
    .selectFrom('review_batches as b')
    .leftJoin('users as a', 'a.id', 'b.assignee_id')
    .leftJoin('users as c', 'c.id', 'b.created_by')
    .selectAll('b')
    .select([
      'a.name as assignee_name',
      'a.email as assignee_email',
      'c.name as creator_name',
      'c.email as creator_email',
    ])
    .select((eb) => [
      eb
        .selectFrom('review_batch_documents as bd')
        .select(eb.fn.countAll<number>().as('n'))
        .whereRef('bd.batch_id', '=', 'b.id')
        .as('documents'),
      eb
        .selectFrom('review_batch_documents as bd')
        .select(eb.fn.countAll<number>().as('n'))
        .whereRef('bd.batch_id', '=', 'b.id')
        .where((w) =>
          w.exists(
            w
              .selectFrom('document_codes as dc')
              .select('dc.code_id')
              .whereRef('dc.document_id', '=', 'bd.document_id'),
          ),
        )
        .as('coded'),
      eb
        .selectFrom('qc_samples as s')
        .select('s.id')
        .whereRef('s.batch_id', '=', 'b.id')
        .limit(1)
        .as('qc_sample_id'),
    ])
    .where('b.matter_id', '=', matterId);
  if (where.ids) q = q.where('b.id', 'in', where.ids.length ? where.ids : [-1]);
  if (where.assigneeId) q = q.where('b.assignee_id', '=', where.assigneeId);
  if (where.kind) q = q.where('b.kind', '=', where.kind);
  return q.orderBy('b.id').execute();
}
export type BatchRow = Awaited<ReturnType<typeof batchRows>>[number];

export function findBatch(db: Executor, matterId: number, batchId: number) {
  return db
    .selectFrom('review_batches')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('id', '=', batchId)
    .executeTakeFirst();
}

/** The batch's documents in order, with their current codes. */
export async function batchDocuments(db: Executor, batchId: number) {
  const docs = await db
    .selectFrom('review_batch_documents as bd')
    .innerJoin('documents as d', 'd.id', 'bd.document_id')
    .select([
      'd.id',
      'bd.position',
      'd.control_number',
      'd.title',
      'd.original_name',
      'd.doc_type',
      'd.family_id',
      'd.parent_id',
    ])
    .where('bd.batch_id', '=', batchId)
    .orderBy('bd.position')
    .execute();
  const codes = await db
    .selectFrom('review_batch_documents as bd')
    .innerJoin('document_codes as dc', 'dc.document_id', 'bd.document_id')
    .select(['dc.document_id', 'dc.code_id', 'dc.coded_by'])
    .where('bd.batch_id', '=', batchId)
    .execute();
  return { docs, codes };
}

export async function updateBatch(
  db: Executor,
  batchId: number,
  set: Partial<{
    state: 'unassigned' | 'assigned' | 'checked_out' | 'checked_in';
    assignee_id: string | null;
    assigned_at: string | null;
    checked_out_at: string | null;
    checked_in_at: string | null;
  }>,
) {
  await db.updateTable('review_batches').set(set).where('id', '=', batchId).execute();
}

/** Checked in: its documents are free for another batch of the kind. */
export async function closePlacements(db: Executor, batchId: number) {
  await db
    .updateTable('review_batch_documents')
    .set({ open_kind: null })
    .where('batch_id', '=', batchId)
    .execute();
}

export function memberRole(db: Executor, matterId: number, userId: string) {
  return db
    .selectFrom('matter_members as m')
    .innerJoin('users as u', 'u.id', 'm.user_id')
    .select(['m.role', 'u.id', 'u.name', 'u.email', 'u.disabled_at'])
    .where('m.matter_id', '=', matterId)
    .where('m.user_id', '=', userId)
    .executeTakeFirst();
}

/** document_codes rows on the documents of the matter's batches: who gave which code where. */
export function batchCodings(db: Executor, matterId: number) {
  return db
    .selectFrom('review_batch_documents as bd')
    .innerJoin('review_batches as b', 'b.id', 'bd.batch_id')
    .innerJoin('document_codes as dc', 'dc.document_id', 'bd.document_id')
    .innerJoin('codes as c', 'c.id', 'dc.code_id')
    .select(['bd.batch_id', 'bd.document_id', 'dc.code_id', 'dc.coded_by', 'c.name as code_name'])
    .where('b.matter_id', '=', matterId)
    .execute();
}
