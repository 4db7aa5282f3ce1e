// Taking a document family out of the live tables and putting it back. The rows to keep
// are found from the schema itself (PRAGMA foreign_key_list): every table whose foreign
// key to documents(id) would delete or block its rows is captured, so tables added by
// later features (review batches, TAR rounds, ...) come along without changes here.
// Derived rows are not kept: the concept index's vectors (index_docs) are recomputed by
// folding the restored documents in, and the FTS row and keyword index follow the text
// through triggers.
import type SQLite from 'better-sqlite3';

type Value = string | number | null | { $blob: string };
type Row = Record<string, Value>;

export interface FamilySnapshot {
  version: 1;
  /** The family's documents rows, parents before attachments. */
  documents: Row[];
  /** Rows of other tables that referenced those documents. */
  related: { table: string; rows: Row[] }[];
}

/** Tables whose rows are recomputed from the documents rather than kept. */
const DERIVED = new Set(['index_docs']);

interface Reference {
  table: string;
  columns: string[];
  /** True when the foreign key neither cascades nor nulls (the delete would be refused). */
  blocking: boolean;
}

const quote = (name: string) => `"${name.replaceAll('"', '""')}"`;

/** Tables with a foreign key to documents(id) whose rows go when a document goes. */
export function referencesToDocuments(sqlite: SQLite.Database): Reference[] {
  const tables = sqlite
    .prepare(
      `SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%'
         AND sql NOT LIKE 'CREATE VIRTUAL TABLE%' AND name <> 'documents' ORDER BY name`,
    )
    .pluck()
    .all() as string[];
  const found: Reference[] = [];
  for (const table of tables) {
    const keys = sqlite.pragma(`foreign_key_list(${quote(table)})`) as {
      table: string;
      from: string;
      on_delete: string;
    }[];
    const toDocuments = keys.filter(
      (key) =>
        key.table === 'documents' &&
        key.on_delete !== 'SET NULL' &&
        key.on_delete !== 'SET DEFAULT',
    );
    if (toDocuments.length === 0 || DERIVED.has(table)) continue;
    found.push({
      table,
      columns: [...new Set(toDocuments.map((key) => key.from))],
      blocking: toDocuments.some((key) => key.on_delete !== 'CASCADE'),
    });
  }
  return found;
}

const encode = (row: Record<string, unknown>): Row =>
  Object.fromEntries(
    Object.entries(row).map(([key, value]) => [
      key,
      Buffer.isBuffer(value) ? { $blob: value.toString('base64') } : (value as Value),
    ]),
  );

const decode = (value: Value) =>
  value !== null && typeof value === 'object' ? Buffer.from(value.$blob, 'base64') : value;

/** A document and every attachment below it, by id (parents first). */
export function familyIds(sqlite: SQLite.Database, docId: number): number[] {
  return sqlite
    .prepare(
      `WITH RECURSIVE family(id, depth) AS (
         SELECT ?, 0
         UNION ALL
         SELECT d.id, family.depth + 1 FROM documents d JOIN family ON d.parent_id = family.id
       ) SELECT id FROM family ORDER BY depth, id`,
    )
    .pluck()
    .all(docId) as number[];
}

/** Reads the family's rows (call inside the transaction that then deletes them). */
export function captureFamily(sqlite: SQLite.Database, ids: number[]): FamilySnapshot {
  const json = JSON.stringify(ids);
  const byId = new Map(
    (
      sqlite
        .prepare('SELECT * FROM documents WHERE id IN (SELECT value FROM json_each(?))')
        .all(json) as Record<string, unknown>[]
    ).map((row) => [row.id as number, encode(row)]),
  );
  const related: FamilySnapshot['related'] = [];
  for (const ref of referencesToDocuments(sqlite)) {
    const where = ref.columns
      .map((column) => `${quote(column)} IN (SELECT value FROM json_each(?))`)
      .join(' OR ');
    const rows = sqlite
      .prepare(`SELECT * FROM ${quote(ref.table)} WHERE ${where}`)
      .all(...ref.columns.map(() => json)) as Record<string, unknown>[];
    if (rows.length > 0) related.push({ table: ref.table, rows: rows.map(encode) });
  }
  return { version: 1, documents: ids.map((id) => byId.get(id)!).filter(Boolean), related };
}

/**
 * Deletes the family's rows. Rows of tables whose key would refuse the delete are removed
 * first; the rest go by ON DELETE CASCADE (and the FTS and keyword triggers fire).
 */
export function deleteFamily(sqlite: SQLite.Database, ids: number[]): void {
  const json = JSON.stringify(ids);
  for (const ref of referencesToDocuments(sqlite)) {
    if (!ref.blocking) continue;
    const where = ref.columns
      .map((column) => `${quote(column)} IN (SELECT value FROM json_each(?))`)
      .join(' OR ');
    sqlite
      .prepare(`DELETE FROM ${quote(ref.table)} WHERE ${where}`)
      .run(...ref.columns.map(() => json));
  }
  // Attachments first, so no row's parent disappears before it does.
  const del = sqlite.prepare('DELETE FROM documents WHERE id = ?');
  for (const id of [...ids].reverse()) del.run(id);
}

function insertRow(sqlite: SQLite.Database, table: string, row: Row, orIgnore = false): void {
  const columns = Object.keys(row);
  sqlite
    .prepare(
      `INSERT ${orIgnore ? 'OR IGNORE ' : ''}INTO ${quote(table)} (${columns.map(quote).join(', ')}) VALUES (${columns.map(() => '?').join(', ')})`,
    )
    .run(...columns.map((column) => decode(row[column])));
}

/**
 * Puts a family back under the same ids (documents.id is AUTOINCREMENT, so no one else
 * took them). A documents row that cannot come back (its parent, batch or custodian is
 * gone) fails the restore; a related row that cannot (its code or grouping deleted since)
 * is skipped and counted. Call inside a transaction.
 */
export function restoreFamily(
  sqlite: SQLite.Database,
  snapshot: FamilySnapshot,
): { skipped: number } {
  for (const row of snapshot.documents) insertRow(sqlite, 'documents', row);
  let skipped = 0;
  const tables = new Set(
    sqlite.prepare("SELECT name FROM sqlite_master WHERE type = 'table'").pluck().all() as string[],
  );
  for (const { table, rows } of snapshot.related) {
    if (!tables.has(table)) {
      skipped += rows.length;
      continue;
    }
    for (const row of rows) {
      // A savepoint per row: one refused row is undone alone, the rest of the restore stands.
      sqlite.exec('SAVEPOINT restore_row');
      try {
        // OR IGNORE: a row a trigger already put back (document_custodians) is not a loss;
        // a foreign key that fails still throws.
        insertRow(sqlite, table, row, true);
        sqlite.exec('RELEASE restore_row');
      } catch {
        sqlite.exec('ROLLBACK TO restore_row');
        sqlite.exec('RELEASE restore_row');
        skipped += 1;
      }
    }
  }
  return { skipped };
}
