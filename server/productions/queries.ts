import type { Insertable, Kysely, Transaction } from 'kysely';
import type { Database, ProductionDocumentsTable, ProductionsTable } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export function listProductionRows(db: Executor, matterId: number) {
  return db
    .selectFrom('productions as p')
    .leftJoin('users as u', 'u.id', 'p.created_by')
    .selectAll('p')
    .select(['u.name as creator_name', 'u.email as creator_email'])
    .where('p.matter_id', '=', matterId)
    .orderBy('p.id', 'desc')
    .execute();
}

export function findProductionRow(db: Executor, matterId: number, id: number) {
  return db
    .selectFrom('productions as p')
    .leftJoin('users as u', 'u.id', 'p.created_by')
    .selectAll('p')
    .select(['u.name as creator_name', 'u.email as creator_email'])
    .where('p.matter_id', '=', matterId)
    .where('p.id', '=', id)
    .executeTakeFirst();
}

export function findProductionByName(db: Executor, matterId: number, name: string) {
  return db
    .selectFrom('productions')
    .select('id')
    .where('matter_id', '=', matterId)
    .where('name', '=', name)
    .executeTakeFirst();
}

export async function insertProduction(db: Executor, values: Insertable<ProductionsTable>) {
  const row = await db
    .insertInto('productions')
    .values(values)
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export async function insertProductionDocuments(
  db: Executor,
  rows: Insertable<ProductionDocumentsTable>[],
) {
  for (let i = 0; i < rows.length; i += 400)
    await db
      .insertInto('production_documents')
      .values(rows.slice(i, i + 400))
      .execute();
}

export function listProductionDocuments(db: Executor, productionId: number) {
  return db
    .selectFrom('production_documents')
    .selectAll()
    .where('production_id', '=', productionId)
    .execute();
}

/** The highest Bates sequence any built or building production of the matter used with the prefix. */
export async function lastUsedSeq(
  db: Executor,
  matterId: number,
  prefix: string,
  exceptId?: number,
): Promise<number> {
  let q = db
    .selectFrom('productions')
    .select((eb) => eb.fn.max('last_seq').as('last'))
    .where('matter_id', '=', matterId)
    .where('bates_prefix', '=', prefix)
    .where('state', 'in', ['built', 'building']);
  if (exceptId !== undefined) q = q.where('id', '!=', exceptId);
  const row = await q.executeTakeFirst();
  return Number(row?.last ?? 0);
}

/** Documents of the matter that carry every one of `codeIds` and none of `excludeIds`. */
export async function documentsWithCodes(
  db: Executor,
  matterId: number,
  codeIds: number[],
  excludeIds: number[],
): Promise<number[]> {
  let q = db
    .selectFrom('documents as d')
    .select('d.id')
    .where('d.matter_id', '=', matterId)
    .where('d.extract_status', '!=', 'duplicate');
  for (const codeId of codeIds)
    q = q.where((eb) =>
      eb.exists(
        eb
          .selectFrom('document_codes as dc')
          .select('dc.document_id')
          .whereRef('dc.document_id', '=', 'd.id')
          .where('dc.code_id', '=', codeId),
      ),
    );
  if (excludeIds.length > 0)
    q = q.where((eb) =>
      eb.not(
        eb.exists(
          eb
            .selectFrom('document_codes as dc')
            .select('dc.document_id')
            .whereRef('dc.document_id', '=', 'd.id')
            .where('dc.code_id', 'in', excludeIds),
        ),
      ),
    );
  return (await q.orderBy('d.id').execute()).map((r) => r.id);
}

/** Every member of the families the documents belong to. */
export function familyMembersOf(db: Executor, matterId: number, documentIds: number[]) {
  if (documentIds.length === 0) return Promise.resolve([]);
  return db
    .selectFrom('documents as d')
    .select([
      'd.id',
      'd.parent_id',
      'd.family_id',
      'd.control_number',
      'd.title',
      'd.original_name',
      'd.extract_status',
    ])
    .where('d.matter_id', '=', matterId)
    .where('d.family_id', 'in', (eb) =>
      eb
        .selectFrom('documents as s')
        .select('s.family_id')
        .where('s.matter_id', '=', matterId)
        .where('s.id', 'in', documentIds),
    )
    .execute();
}

/** What the build needs of each document: metadata, text, custodians, codes. */
export function documentsForBuild(db: Executor, matterId: number, ids: number[]) {
  if (ids.length === 0) return Promise.resolve([]);
  return db
    .selectFrom('documents as d')
    .leftJoin('document_texts as t', 't.document_id', 'd.id')
    .leftJoin('custodians as c', 'c.id', 'd.custodian_id')
    .select([
      'd.id',
      'd.parent_id',
      'd.family_id',
      'd.control_number',
      'd.original_name',
      'd.sha256',
      'd.mime',
      'd.doc_type',
      'd.title',
      'd.author',
      'd.recipients',
      'd.email_from',
      'd.email_to',
      'd.email_cc',
      'd.email_bcc',
      'd.sent_at',
      'd.extract_status',
      'd.duplicate_of',
      't.title as text_title',
      't.body',
      'c.name as custodian',
    ])
    .where('d.matter_id', '=', matterId)
    .where('d.id', 'in', ids)
    .execute();
}

export async function allCustodiansOf(db: Executor, ids: number[]) {
  if (ids.length === 0) return new Map<number, string[]>();
  const rows = await db
    .selectFrom('document_custodians as dc')
    .innerJoin('custodians as c', 'c.id', 'dc.custodian_id')
    .select(['dc.document_id', 'c.name'])
    .where('dc.document_id', 'in', ids)
    .orderBy('c.name')
    .execute();
  const out = new Map<number, string[]>();
  for (const r of rows) out.set(r.document_id, [...(out.get(r.document_id) ?? []), r.name]);
  return out;
}

/** Code ids per document, and which documents carry a privilege code. */
export async function codesOf(db: Executor, ids: number[]) {
  if (ids.length === 0)
    return { codes: new Map<number, number[]>(), privileged: new Set<number>() };
  const rows = await db
    .selectFrom('document_codes as dc')
    .innerJoin('codes as c', 'c.id', 'dc.code_id')
    .select(['dc.document_id', 'dc.code_id', 'c.marks_privileged'])
    .where('dc.document_id', 'in', ids)
    .execute();
  const codes = new Map<number, number[]>();
  const privileged = new Set<number>();
  for (const r of rows) {
    codes.set(r.document_id, [...(codes.get(r.document_id) ?? []), r.code_id]);
    if (r.marks_privileged) privileged.add(r.document_id);
  }
  return { codes, privileged };
}
