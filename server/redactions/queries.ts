import type { Kysely, Transaction } from 'kysely';
import type { Database, RedactionsTable } from '../db/schema';
import type { Insertable } from 'kysely';

type Executor = Kysely<Database> | Transaction<Database>;

/** A document's redactions still in force, oldest first, with who marked them. */
export function listActiveRedactions(db: Executor, documentIds: number[]) {
  if (documentIds.length === 0) return Promise.resolve([]);
  return db
    .selectFrom('redactions as r')
    .leftJoin('users as u', 'u.id', 'r.created_by')
    .selectAll('r')
    .select(['u.name as creator_name', 'u.email as creator_email'])
    .where('r.document_id', 'in', documentIds)
    .where('r.removed_at', 'is', null)
    .orderBy('r.id')
    .execute();
}

export function findRedaction(db: Executor, matterId: number, docId: number, id: number) {
  return db
    .selectFrom('redactions')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('document_id', '=', docId)
    .where('id', '=', id)
    .where('removed_at', 'is', null)
    .executeTakeFirst();
}

export async function insertRedaction(db: Executor, values: Insertable<RedactionsTable>) {
  const row = await db
    .insertInto('redactions')
    .values(values)
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export function markRedactionRemoved(db: Executor, id: number, by: string) {
  return db
    .updateTable('redactions')
    .set({ removed_at: new Date().toISOString(), removed_by: by })
    .where('id', '=', id)
    .execute();
}

/** The document and its text, for checking offsets and counting pattern hits. */
export function findRedactableDocument(db: Executor, matterId: number, docId: number) {
  return db
    .selectFrom('documents as d')
    .leftJoin('document_texts as t', 't.document_id', 'd.id')
    .select(['d.id', 'd.mime', 'd.control_number', 'd.page_count', 't.body'])
    .where('d.matter_id', '=', matterId)
    .where('d.id', '=', docId)
    .executeTakeFirst();
}
