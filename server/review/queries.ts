import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export function findReviewDocument(db: Executor, matterId: number, docId: number) {
  return db
    .selectFrom('documents as d')
    .leftJoin('custodians as c', 'c.id', 'd.custodian_id')
    .selectAll('d')
    .select(['c.name as custodian_name'])
    .where('d.matter_id', '=', matterId)
    .where('d.id', '=', docId)
    .executeTakeFirst();
}

export function findText(db: Executor, docId: number) {
  return db
    .selectFrom('document_texts')
    .select(['title', 'body'])
    .where('document_id', '=', docId)
    .executeTakeFirst();
}

const REF_COLUMNS = ['id', 'control_number', 'title', 'original_name', 'extract_status'] as const;

export function listRefs(
  db: Executor,
  matterId: number,
  where: { parentId?: number; duplicateOf?: number },
) {
  let query = db.selectFrom('documents').select(REF_COLUMNS).where('matter_id', '=', matterId);
  if (where.parentId !== undefined) query = query.where('parent_id', '=', where.parentId);
  if (where.duplicateOf !== undefined) query = query.where('duplicate_of', '=', where.duplicateOf);
  return query.orderBy('control_number').execute();
}

export function findRef(db: Executor, matterId: number, docId: number) {
  return db
    .selectFrom('documents')
    .select(REF_COLUMNS)
    .where('matter_id', '=', matterId)
    .where('id', '=', docId)
    .executeTakeFirst();
}

export function listNotes(db: Executor, docId: number) {
  return db
    .selectFrom('notes as n')
    .leftJoin('users as u', 'u.id', 'n.author_id')
    .select([
      'n.id',
      'n.body',
      'n.created_at',
      'n.author_id',
      'u.name as author_name',
      'u.email as author_email',
    ])
    .where('n.document_id', '=', docId)
    .orderBy('n.id')
    .execute();
}

export async function insertNote(db: Executor, docId: number, authorId: string, body: string) {
  const row = await db
    .insertInto('notes')
    .values({ document_id: docId, author_id: authorId, body, created_at: new Date().toISOString() })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export function findPrivilegeEntry(db: Executor, docId: number) {
  return db
    .selectFrom('privilege_entries as p')
    .leftJoin('users as u', 'u.id', 'p.updated_by')
    .select([
      'p.basis',
      'p.description',
      'p.privilege_type',
      'p.treatment',
      'p.updated_at',
      'p.updated_by',
      'u.name as updater_name',
      'u.email as updater_email',
    ])
    .where('p.document_id', '=', docId)
    .executeTakeFirst();
}

export async function upsertPrivilegeEntry(
  db: Executor,
  docId: number,
  values: {
    basis: string;
    description: string;
    type?: string;
    treatment?: 'withheld' | 'redacted';
    userId: string;
  },
) {
  const now = new Date().toISOString();
  const extra = {
    ...(values.type !== undefined ? { privilege_type: values.type } : {}),
    ...(values.treatment !== undefined ? { treatment: values.treatment } : {}),
  };
  await db
    .insertInto('privilege_entries')
    .values({
      document_id: docId,
      basis: values.basis,
      description: values.description,
      ...extra,
      updated_by: values.userId,
      updated_at: now,
    })
    .onConflict((oc) =>
      oc.column('document_id').doUpdateSet({
        basis: values.basis,
        description: values.description,
        ...extra,
        updated_by: values.userId,
        updated_at: now,
      }),
    )
    .execute();
}
