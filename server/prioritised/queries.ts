import type { Kysely, Transaction } from 'kysely';
import { NOT_RESPONSIVE_CODE, RESPONSIVE_CODE } from '../../shared/schemas/prioritised';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export interface RelevanceCodes {
  responsive: number | null;
  notResponsive: number | null;
}

/** The matter's Responsive and Not responsive codes, found by name in its code set. */
export async function relevanceCodes(db: Executor, matterId: number): Promise<RelevanceCodes> {
  const rows = await db
    .selectFrom('codes')
    .select(['id', 'name'])
    .where('matter_id', '=', matterId)
    .where('name', 'in', [RESPONSIVE_CODE, NOT_RESPONSIVE_CODE])
    .orderBy('id')
    .execute();
  return {
    responsive: rows.find((r) => r.name === RESPONSIVE_CODE)?.id ?? null,
    notResponsive: rows.find((r) => r.name === NOT_RESPONSIVE_CODE)?.id ?? null,
  };
}

/** Every document carrying either relevance code, with which ones and the latest coded_at. */
export async function relevanceLabels(db: Executor, matterId: number, codes: RelevanceCodes) {
  const ids = [codes.responsive, codes.notResponsive].filter((c): c is number => c !== null);
  if (ids.length === 0) return [];
  return db
    .selectFrom('document_codes as dc')
    .innerJoin('documents as d', 'd.id', 'dc.document_id')
    .select(['dc.document_id', 'dc.code_id', 'dc.coded_at'])
    .where('d.matter_id', '=', matterId)
    .where('dc.code_id', 'in', ids)
    .execute();
}

export function latestModel(db: Executor, matterId: number) {
  return db
    .selectFrom('ranking_models')
    .selectAll()
    .where('matter_id', '=', matterId)
    .orderBy('version', 'desc')
    .limit(1)
    .executeTakeFirst();
}

export function latestModelInfo(db: Executor, matterId: number) {
  return db
    .selectFrom('ranking_models')
    .select([
      'id',
      'version',
      'index_version',
      'positives',
      'negatives',
      'coded_through',
      'trained_at',
      'train_ms',
      'rank_ms',
      'reason',
      'tuning',
      (eb) => eb.fn<number>('length', ['doc_ids']).as('id_bytes'),
    ])
    .where('matter_id', '=', matterId)
    .orderBy('version', 'desc')
    .limit(1)
    .executeTakeFirst();
}

export function textsOf(db: Executor, ids: number[]) {
  return db
    .selectFrom('document_texts')
    .select(['document_id', 'title', 'body'])
    .where('document_id', 'in', ids)
    .execute();
}
