// Raw reads used inside the deletion transaction (better-sqlite3, same connection as
// Kysely's transaction, so they see and take part in it).
import type SQLite from 'better-sqlite3';
import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export interface FamilyMember {
  id: number;
  control_number: string;
  sha256: string;
}

export function familyMembers(sqlite: SQLite.Database, ids: number[]): FamilyMember[] {
  return sqlite
    .prepare(
      `SELECT id, control_number, sha256 FROM documents
        WHERE id IN (SELECT value FROM json_each(?)) ORDER BY id`,
    )
    .all(JSON.stringify(ids)) as FamilyMember[];
}

/** Every custodian who held any of these documents (its own and those of de-duplicated copies). */
export function custodiansOf(sqlite: SQLite.Database, ids: number[]): number[] {
  const json = JSON.stringify(ids);
  return sqlite
    .prepare(
      `SELECT custodian_id FROM documents
        WHERE id IN (SELECT value FROM json_each(?)) AND custodian_id IS NOT NULL
       UNION
       SELECT custodian_id FROM document_custodians WHERE document_id IN (SELECT value FROM json_each(?))`,
    )
    .pluck()
    .all(json, json) as number[];
}

export interface CodeOnDocument {
  documentId: number;
  controlNumber: string;
  code: string;
}

export function codesOf(sqlite: SQLite.Database, ids: number[]): CodeOnDocument[] {
  return sqlite
    .prepare(
      `SELECT d.id AS documentId, d.control_number AS controlNumber, c.name AS code
         FROM document_codes dc JOIN codes c ON c.id = dc.code_id JOIN documents d ON d.id = dc.document_id
        WHERE dc.document_id IN (SELECT value FROM json_each(?))
        ORDER BY d.id, c.sort_order, c.name`,
    )
    .all(JSON.stringify(ids)) as CodeOnDocument[];
}

/** Duplicates (outside the family) recorded against a family member. */
export function duplicatesOf(
  sqlite: SQLite.Database,
  memberId: number,
  family: number[],
): number[] {
  return sqlite
    .prepare(
      `SELECT id FROM documents WHERE duplicate_of = ?
         AND id NOT IN (SELECT value FROM json_each(?)) ORDER BY id`,
    )
    .pluck()
    .all(memberId, JSON.stringify(family)) as number[];
}

/** Whether any live or trashed document still needs the original with this hash. */
export function blobInUse(sqlite: SQLite.Database, sha256: string): boolean {
  return Boolean(
    sqlite
      .prepare(
        `SELECT 1 FROM documents WHERE sha256 = ?
         UNION ALL SELECT 1 FROM document_trash_blobs WHERE sha256 = ? LIMIT 1`,
      )
      .get(sha256, sha256),
  );
}

export function listTrash(db: Executor, matterId: number) {
  return db
    .selectFrom('document_trash as t')
    .leftJoin('users as u', 'u.id', 't.trashed_by')
    .select([
      't.id',
      't.document_id',
      't.control_number',
      't.title',
      't.original_name',
      't.document_count',
      't.codes',
      't.reason',
      't.trashed_at',
      'u.email as trashed_by_email',
    ])
    .where('t.matter_id', '=', matterId)
    .orderBy('t.id', 'desc')
    .execute();
}

export function findTrashItem(db: Executor, matterId: number, trashId: number) {
  return db
    .selectFrom('document_trash')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('id', '=', trashId)
    .executeTakeFirst();
}

export function trashBlobs(db: Executor, trashId: number) {
  return db
    .selectFrom('document_trash_blobs')
    .select('sha256')
    .where('trash_id', '=', trashId)
    .execute();
}
