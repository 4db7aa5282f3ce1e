import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export function findMatterPrefix(db: Executor, matterId: number) {
  return db
    .selectFrom('matters')
    .select(['control_prefix'])
    .where('id', '=', matterId)
    .executeTakeFirst();
}

/** Collection metadata of the given documents for the results CSV, with every custodian. */
export async function collectionFieldsOf(db: Executor, ids: number[]) {
  const out = new Map<number, CollectionFields>();
  for (let start = 0; start < ids.length; start += 900) {
    const rows = await db
      .selectFrom('documents as d')
      .select([
        'd.id',
        // Related documents by control number, as a reader of the CSV knows them.
        sql<string | null>`(SELECT r.control_number FROM documents r WHERE r.id = d.family_id)`.as(
          'family_control',
        ),
        sql<string | null>`(SELECT r.control_number FROM documents r WHERE r.id = d.thread_id)`.as(
          'thread_control',
        ),
        sql<
          string | null
        >`(SELECT r.control_number FROM documents r WHERE r.id = d.near_dup_group_id)`.as(
          'near_dup_control',
        ),
        'd.family_date',
        'd.email_from',
        'd.email_to',
        'd.email_cc',
        'd.email_bcc',
        'd.sent_at',
        'd.received_at',
        'd.message_id',
        'd.in_reply_to',
        'd.file_created_at',
        'd.file_modified_at',
        'd.author',
        'd.last_author',
        'd.original_path',
        'd.inclusive',
        'd.near_dup_similarity',
        'd.ocr',
        sql<
          string | null
        >`(SELECT group_concat(name, '; ') FROM (SELECT c.name AS name FROM document_custodians dc JOIN custodians c ON c.id = dc.custodian_id WHERE dc.document_id = d.id ORDER BY c.name))`.as(
          'all_custodians',
        ),
      ])
      .where('d.id', 'in', ids.slice(start, start + 900))
      .execute();
    for (const row of rows) out.set(row.id, row);
  }
  return out;
}

export type CollectionFields = {
  id: number;
  family_control: string | null;
  thread_control: string | null;
  near_dup_control: string | null;
  family_date: string | null;
  email_from: string;
  email_to: string;
  email_cc: string;
  email_bcc: string;
  sent_at: string | null;
  received_at: string | null;
  message_id: string | null;
  in_reply_to: string | null;
  file_created_at: string | null;
  file_modified_at: string | null;
  author: string;
  last_author: string;
  original_path: string;
  inclusive: number | null;
  near_dup_similarity: number | null;
  ocr: number;
  all_custodians: string | null;
};

/** The collection columns of one results row, in RESULTS_CSV_COLUMNS order. */
export function collectionCells(fields: CollectionFields | undefined): string[] {
  if (!fields) return Array.from({ length: 21 }, () => '');
  const f = fields;
  return [
    f.family_control ?? '',
    f.family_date ?? '',
    f.email_from,
    f.email_to,
    f.email_cc,
    f.email_bcc,
    f.email_from ? (f.sent_at ?? '') : '',
    f.received_at ?? '',
    f.message_id ?? '',
    f.in_reply_to ?? '',
    f.file_created_at ?? '',
    f.file_modified_at ?? '',
    f.email_from ? '' : f.author,
    f.last_author,
    f.original_path,
    f.all_custodians ?? '',
    f.thread_control ?? '',
    f.inclusive === null ? '' : f.inclusive ? 'yes' : 'no',
    f.near_dup_control ?? '',
    f.near_dup_similarity === null ? '' : f.near_dup_similarity.toFixed(3),
    f.ocr ? 'yes' : 'no',
  ];
}
