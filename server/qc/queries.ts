import type { Kysely, Transaction } from 'kysely';
import type { QcCriteria } from '../../shared/schemas/qc';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

/**
 * First-level calls open to QC: codes applied to the matter's documents, narrowed by the
 * criteria, leaving out documents already locked by QC or in an open QC batch.
 */
export function eligibleCalls(db: Executor, matterId: number, criteria: QcCriteria) {
  let q = db
    .selectFrom('document_codes as dc')
    .innerJoin('documents as d', 'd.id', 'dc.document_id')
    .select(['dc.document_id', 'dc.code_id', 'dc.coded_by', 'dc.coded_at'])
    .where('d.matter_id', '=', matterId)
    .where((eb) =>
      eb.not(
        eb.exists(
          eb
            .selectFrom('coding_locks as l')
            .select('l.document_id')
            .whereRef('l.document_id', '=', 'd.id'),
        ),
      ),
    )
    .where((eb) =>
      eb.not(
        eb.exists(
          eb
            .selectFrom('review_batch_documents as bd')
            .select('bd.document_id')
            .whereRef('bd.document_id', '=', 'd.id')
            .where('bd.open_kind', '=', 'qc'),
        ),
      ),
    );
  if (criteria.reviewerId) q = q.where('dc.coded_by', '=', criteria.reviewerId);
  if (criteria.codeId) q = q.where('dc.code_id', '=', criteria.codeId);
  if (criteria.batchId)
    q = q.where('dc.document_id', 'in', (eb) =>
      eb
        .selectFrom('review_batch_documents as b2')
        .select('b2.document_id')
        .where('b2.batch_id', '=', criteria.batchId!),
    );
  return q.orderBy('dc.document_id').orderBy('dc.code_id').execute();
}

export function sampleRows(db: Executor, matterId: number, ids?: number[]) {
  let q = db
    .selectFrom('qc_samples as s')
    .innerJoin('review_batches as b', 'b.id', 's.batch_id')
    .leftJoin('users as u', 'u.id', 's.created_by')
    .selectAll('s')
    .select(['b.name as batch_name', 'u.name as creator_name', 'u.email as creator_email'])
    .select((eb) => [
      eb
        .selectFrom('qc_items as i')
        .select(eb.fn.countAll<number>().as('n'))
        .whereRef('i.sample_id', '=', 's.id')
        .as('calls'),
      eb
        .selectFrom('qc_items as i')
        .select(eb.fn.countAll<number>().as('n'))
        .whereRef('i.sample_id', '=', 's.id')
        .where('i.verdict', 'is not', null)
        .as('decided'),
      eb
        .selectFrom('review_batch_documents as bd')
        .select(eb.fn.countAll<number>().as('n'))
        .whereRef('bd.batch_id', '=', 's.batch_id')
        .as('size'),
    ])
    .where('s.matter_id', '=', matterId);
  if (ids) q = q.where('s.id', 'in', ids.length ? ids : [-1]);
  return q.orderBy('s.id', 'desc').execute();
}

export function itemRows(
  db: Executor,
  where: { sampleId?: number; itemId?: number; matterId: number },
) {
  let q = db
    .selectFrom('qc_items as i')
    .innerJoin('qc_samples as s', 's.id', 'i.sample_id')
    .innerJoin('documents as d', 'd.id', 'i.document_id')
    .innerJoin('codes as c', 'c.id', 'i.code_id')
    .leftJoin('codes as r', 'r.id', 'i.replacement_code_id')
    .leftJoin('users as f', 'f.id', 'i.first_coder_id')
    .leftJoin('users as q', 'q.id', 'i.decided_by')
    .selectAll('i')
    .select([
      's.batch_id',
      'd.control_number',
      'd.title',
      'd.original_name',
      'c.name as code_name',
      'r.name as replacement_name',
      'f.name as first_name',
      'f.email as first_email',
      'q.name as decider_name',
      'q.email as decider_email',
    ])
    .where('s.matter_id', '=', where.matterId);
  if (where.sampleId !== undefined) q = q.where('i.sample_id', '=', where.sampleId);
  if (where.itemId !== undefined) q = q.where('i.id', '=', where.itemId);
  return q.orderBy('d.control_number').orderBy('c.sort_order').execute();
}

export function decidedCalls(db: Executor, matterId: number) {
  return db
    .selectFrom('qc_items as i')
    .innerJoin('qc_samples as s', 's.id', 'i.sample_id')
    .innerJoin('codes as c', 'c.id', 'i.code_id')
    .leftJoin('users as u', 'u.id', 'i.first_coder_id')
    .select([
      'i.first_coder_id',
      'i.code_id',
      'i.verdict',
      'c.name as code_name',
      'u.name as coder_name',
      'u.email as coder_email',
    ])
    .where('s.matter_id', '=', matterId)
    .where('i.verdict', 'is not', null)
    .execute();
}
