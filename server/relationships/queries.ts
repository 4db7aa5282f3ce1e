import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

/** The matter's extracted e-mails with what threading reads. */
export function listThreadableMessages(db: Executor, matterId: number) {
  return db
    .selectFrom('documents as d')
    .leftJoin('document_texts as t', 't.document_id', 'd.id')
    .select([
      'd.id',
      'd.message_id',
      'd.in_reply_to',
      'd.email_references',
      'd.title',
      'd.email_from',
      'd.email_to',
      'd.email_cc',
      'd.sent_at',
      't.body',
      sql<string>`(SELECT group_concat(c.sha256, ' ') FROM documents c WHERE c.parent_id = d.id)`.as(
        'attachment_shas',
      ),
    ])
    .where('d.matter_id', '=', matterId)
    .where('d.extract_status', '=', 'extracted')
    .where('d.doc_type', 'in', ['email', 'msg'])
    .execute();
}

export function listSignatures(db: Executor, matterId: number) {
  return db
    .selectFrom('documents as d')
    .innerJoin('document_minhash as m', 'm.document_id', 'd.id')
    .leftJoin('document_texts as t', 't.document_id', 'd.id')
    .select(['d.id', 'm.signature', sql<number>`length(t.body)`.as('length')])
    .where('d.matter_id', '=', matterId)
    .where('d.extract_status', '=', 'extracted')
    .execute();
}

export async function nearDupThresholdOf(db: Executor, matterId: number): Promise<number> {
  const row = await db
    .selectFrom('matters')
    .select('near_dup_threshold')
    .where('id', '=', matterId)
    .executeTakeFirst();
  return row?.near_dup_threshold ?? 0.8;
}

export function listThread(db: Executor, matterId: number, threadId: number) {
  return db
    .selectFrom('documents')
    .select([
      'id',
      'control_number',
      'title',
      'original_name',
      'email_from',
      'sent_at',
      'thread_parent_id',
      'inclusive',
    ])
    .where('matter_id', '=', matterId)
    .where('thread_id', '=', threadId)
    .orderBy('sent_at')
    .orderBy('id')
    .execute();
}

export function listNearDupGroup(db: Executor, matterId: number, groupId: number) {
  return db
    .selectFrom('documents')
    .select(['id', 'control_number', 'title', 'original_name', 'near_dup_similarity'])
    .where('matter_id', '=', matterId)
    .where('near_dup_group_id', '=', groupId)
    .orderBy('near_dup_similarity', 'desc')
    .orderBy('id')
    .execute();
}
