import { type Kysely, type Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

/** The matter's codes with how many documents carry each, in display order. */
export function listCodesWithCounts(db: Executor, matterId: number) {
  return db
    .selectFrom('codes as c')
    .select([
      'c.id',
      'c.name',
      'c.shortcut',
      'c.sort_order',
      'c.marks_privileged',
      'c.archived_at',
      'c.group_id',
      'c.colour',
    ])
    .select((eb) =>
      eb
        .selectFrom('document_codes as dc')
        .select(eb.fn.countAll<number>().as('n'))
        .whereRef('dc.code_id', '=', 'c.id')
        .as('document_count'),
    )
    .where('c.matter_id', '=', matterId)
    .orderBy('c.sort_order')
    .orderBy('c.id')
    .execute();
}

export function findCode(db: Executor, matterId: number, codeId: number) {
  return db
    .selectFrom('codes')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('id', '=', codeId)
    .executeTakeFirst();
}

export function findCodesByIds(db: Executor, matterId: number, codeIds: number[]) {
  if (codeIds.length === 0) return Promise.resolve([]);
  return db
    .selectFrom('codes')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('id', 'in', codeIds)
    .execute();
}

export function findCodeByName(db: Executor, matterId: number, name: string) {
  return db
    .selectFrom('codes')
    .select(['id', 'name'])
    .where('matter_id', '=', matterId)
    .where('name', '=', name)
    .executeTakeFirst();
}

export function findCodeByShortcut(db: Executor, matterId: number, shortcut: string) {
  return db
    .selectFrom('codes')
    .select(['id', 'name'])
    .where('matter_id', '=', matterId)
    .where('shortcut', '=', shortcut)
    .where('archived_at', 'is', null)
    .executeTakeFirst();
}

export async function nextSortOrder(db: Executor, matterId: number): Promise<number> {
  const row = await db
    .selectFrom('codes')
    .select((eb) => eb.fn.max<number>('sort_order').as('m'))
    .where('matter_id', '=', matterId)
    .executeTakeFirst();
  return Number(row?.m ?? 0) + 10;
}

export async function insertCode(
  db: Executor,
  values: {
    matterId: number;
    name: string;
    shortcut: string | null;
    marksPrivileged: boolean;
    sortOrder: number;
    groupId: number | null;
    colour: string;
  },
): Promise<number> {
  const row = await db
    .insertInto('codes')
    .values({
      matter_id: values.matterId,
      name: values.name,
      shortcut: values.shortcut,
      sort_order: values.sortOrder,
      marks_privileged: values.marksPrivileged ? 1 : 0,
      archived_at: null,
      created_at: new Date().toISOString(),
      group_id: values.groupId,
      colour: values.colour,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export async function updateCode(
  db: Executor,
  codeId: number,
  set: {
    name?: string;
    shortcut?: string | null;
    marks_privileged?: number;
    sort_order?: number;
    archived_at?: string | null;
    group_id?: number;
    colour?: string;
  },
): Promise<void> {
  await db.updateTable('codes').set(set).where('id', '=', codeId).execute();
}

/** Which of the ids are documents of the matter. */
export async function existingDocumentIds(db: Executor, matterId: number, ids: number[]) {
  const found = new Set<number>();
  for (let start = 0; start < ids.length; start += 900) {
    const rows = await db
      .selectFrom('documents')
      .select('id')
      .where('matter_id', '=', matterId)
      .where('id', 'in', ids.slice(start, start + 900))
      .execute();
    for (const row of rows) found.add(row.id);
  }
  return found;
}

/** document_codes rows of the given documents, with code names and coder. */
export async function listAppliedCodes(db: Executor, documentIds: number[]) {
  const out = [];
  for (let start = 0; start < documentIds.length; start += 900) {
    const rows = await db
      .selectFrom('document_codes as dc')
      .innerJoin('codes as c', 'c.id', 'dc.code_id')
      .leftJoin('users as u', 'u.id', 'dc.coded_by')
      .select([
        'dc.document_id',
        'dc.code_id',
        'c.name',
        'c.sort_order',
        'dc.coded_at',
        'dc.coded_by',
        'u.name as coder_name',
        'u.email as coder_email',
      ])
      .where('dc.document_id', 'in', documentIds.slice(start, start + 900))
      .orderBy('c.sort_order')
      .orderBy('c.id')
      .execute();
    out.push(...rows);
  }
  return out;
}

export async function addDocumentCodes(
  db: Executor,
  rows: { documentId: number; codeId: number }[],
  userId: string,
  at: string,
): Promise<void> {
  for (let start = 0; start < rows.length; start += 300) {
    await db
      .insertInto('document_codes')
      .values(
        rows.slice(start, start + 300).map((r) => ({
          document_id: r.documentId,
          code_id: r.codeId,
          coded_by: userId,
          coded_at: at,
        })),
      )
      .onConflict((oc) => oc.doNothing())
      .execute();
  }
}

export async function removeDocumentCodes(
  db: Executor,
  rows: { documentId: number; codeId: number }[],
): Promise<void> {
  for (const row of rows) {
    await db
      .deleteFrom('document_codes')
      .where('document_id', '=', row.documentId)
      .where('code_id', '=', row.codeId)
      .execute();
  }
}

export function listGroups(db: Executor, matterId: number) {
  return db
    .selectFrom('code_groups')
    .selectAll()
    .where('matter_id', '=', matterId)
    .orderBy('sort_order')
    .orderBy('id')
    .execute();
}

export function findGroup(db: Executor, matterId: number, groupId: number) {
  return db
    .selectFrom('code_groups')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('id', '=', groupId)
    .executeTakeFirst();
}

export async function insertGroup(
  db: Executor,
  v: {
    matterId: number;
    name: string;
    kind: 'single' | 'multi' | 'privilege';
    required: boolean;
    followFamily: boolean;
    followDuplicates: boolean;
    sortOrder: number;
  },
) {
  const row = await db
    .insertInto('code_groups')
    .values({
      matter_id: v.matterId,
      name: v.name,
      kind: v.kind,
      required: v.required ? 1 : 0,
      follow_family: v.followFamily ? 1 : 0,
      follow_duplicates: v.followDuplicates ? 1 : 0,
      sort_order: v.sortOrder,
      created_at: new Date().toISOString(),
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** Family, duplicate and lock facts of documents, for the coding rules. */
export async function documentFacts(db: Executor, matterId: number, ids: number[]) {
  const out = [];
  for (let start = 0; start < ids.length; start += 900) {
    out.push(
      ...(await db
        .selectFrom('documents as d')
        .leftJoin('coding_locks as l', 'l.document_id', 'd.id')
        .select(['d.id', 'd.family_id', 'd.duplicate_of', 'd.control_number', 'l.locked_at'])
        .where('d.matter_id', '=', matterId)
        .where('d.id', 'in', ids.slice(start, start + 900))
        .execute()),
    );
  }
  return out;
}

export function familyOf(db: Executor, matterId: number, familyIds: number[]) {
  return db
    .selectFrom('documents')
    .select(['id', 'family_id'])
    .where('matter_id', '=', matterId)
    .where('family_id', 'in', familyIds.length ? familyIds : [-1])
    .execute();
}

/** Exact duplicates: every document that is, or shares, the same first copy. */
export function duplicatesOfRoots(db: Executor, matterId: number, roots: number[]) {
  const list = roots.length ? roots : [-1];
  return db
    .selectFrom('documents')
    .select(['id', 'duplicate_of'])
    .where('matter_id', '=', matterId)
    .where((eb) => eb.or([eb('duplicate_of', 'in', list), eb('id', 'in', list)]))
    .execute();
}

export function privilegeEntriesOf(db: Executor, ids: number[]) {
  return db
    .selectFrom('privilege_entries')
    .selectAll()
    .where('document_id', 'in', ids.length ? ids : [-1])
    .execute();
}

export async function upsertPrivilegeFields(
  db: Executor,
  documentId: number,
  v: {
    privilege_type: string;
    basis: string;
    description: string;
    treatment: 'withheld' | 'redacted';
  },
  userId: string,
  at: string,
) {
  await db
    .insertInto('privilege_entries')
    .values({ document_id: documentId, ...v, updated_by: userId, updated_at: at })
    .onConflict((oc) =>
      oc.column('document_id').doUpdateSet({ ...v, updated_by: userId, updated_at: at }),
    )
    .execute();
}
