import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

/** Every document of the matter (prevalence population), ascending id. */
export function matterDocumentIds(db: Executor, matterId: number): Promise<number[]> {
  return db
    .selectFrom('documents')
    .select('id')
    .where('matter_id', '=', matterId)
    .orderBy('id')
    .execute()
    .then((rows) => rows.map((r) => r.id));
}

/** Ids of the matter's documents carrying the code. */
export function documentsWithCode(
  db: Executor,
  matterId: number,
  codeId: number,
): Promise<number[]> {
  return db
    .selectFrom('document_codes as dc')
    .innerJoin('documents as d', 'd.id', 'dc.document_id')
    .select('dc.document_id')
    .where('d.matter_id', '=', matterId)
    .where('dc.code_id', '=', codeId)
    .execute()
    .then((rows) => rows.map((r) => r.document_id));
}

export function findSample(db: Executor, matterId: number, sampleId: number) {
  return db
    .selectFrom('validation_samples')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('id', '=', sampleId)
    .executeTakeFirst();
}

export function listSamples(db: Executor, matterId: number) {
  return db
    .selectFrom('validation_samples')
    .selectAll()
    .where('matter_id', '=', matterId)
    .orderBy('id', 'desc')
    .execute();
}

/** The sample's documents in draw order, with the relevance codes each carries now. */
export async function sampleDocuments(
  db: Executor,
  sampleId: number,
  codes: { responsive: number | null; notResponsive: number | null },
) {
  const rows = await db
    .selectFrom('validation_sample_documents as s')
    .innerJoin('documents as d', 'd.id', 's.document_id')
    .select(['s.document_id', 's.position', 'd.control_number', 'd.title', 'd.original_name'])
    .where('s.sample_id', '=', sampleId)
    .orderBy('s.position')
    .execute();
  const ids = [codes.responsive, codes.notResponsive].filter((c): c is number => c !== null);
  const coded =
    ids.length === 0 || rows.length === 0
      ? []
      : await db
          .selectFrom('document_codes as dc')
          .innerJoin('validation_sample_documents as s', 's.document_id', 'dc.document_id')
          .select(['dc.document_id', 'dc.code_id'])
          .where('s.sample_id', '=', sampleId)
          .where('dc.code_id', 'in', ids)
          .execute();
  const responsive = new Set(
    coded.filter((c) => c.code_id === codes.responsive).map((c) => c.document_id),
  );
  const codedAny = new Set(coded.map((c) => c.document_id));
  return rows.map((r) => ({
    documentId: r.document_id,
    controlNumber: r.control_number,
    title: r.title || r.original_name,
    coded: codedAny.has(r.document_id),
    responsive: responsive.has(r.document_id),
  }));
}
