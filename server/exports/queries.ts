import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

/**
 * Documents of the matter carrying a code that marks privilege (archived codes included:
 * coding already applied stays on the log), with their privilege entry, by control number.
 */
export function listPrivilegeLogRows(db: Executor, matterId: number) {
  return db
    .selectFrom('documents as d')
    .leftJoin('privilege_entries as p', 'p.document_id', 'd.id')
    .select([
      'd.id',
      'd.control_number',
      'd.sent_at',
      'd.author',
      'd.recipients',
      'd.doc_type',
      'p.basis',
      'p.description',
    ])
    .where('d.matter_id', '=', matterId)
    .where((eb) =>
      eb.exists(
        eb
          .selectFrom('document_codes as dc')
          .innerJoin('codes as c', 'c.id', 'dc.code_id')
          .select('dc.document_id')
          .whereRef('dc.document_id', '=', 'd.id')
          .where('c.marks_privileged', '=', 1),
      ),
    )
    .orderBy('d.control_number')
    .execute();
}

export function findMatterPrefix(db: Executor, matterId: number) {
  return db
    .selectFrom('matters')
    .select(['control_prefix'])
    .where('id', '=', matterId)
    .executeTakeFirst();
}
