import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// Legal holds: a matter-wide hold (custodian_id NULL) or a custodian's hold stops any of
// the documents it covers from being deleted. A released hold stays as history; at most one
// active hold per scope.
// Trash: deleting a coded document moves the document (with its attachments) out of the
// live tables into document_trash, as a JSON snapshot of every row that referenced it, so
// it leaves searches, listings and the index yet can be restored. document_trash_blobs
// names the originals a trashed document still needs, so they are kept until it is purged.

export async function up(db: Kysely<unknown>): Promise<void> {
  const statements = [
    `CREATE TABLE legal_holds (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
       custodian_id INTEGER REFERENCES custodians(id),
       reason TEXT NOT NULL,
       set_by TEXT REFERENCES users(id),
       set_at TEXT NOT NULL,
       released_by TEXT REFERENCES users(id),
       released_at TEXT,
       release_reason TEXT
     )`,
    `CREATE UNIQUE INDEX legal_holds_active_scope
       ON legal_holds(matter_id, ifnull(custodian_id, 0)) WHERE released_at IS NULL`,
    `CREATE INDEX legal_holds_matter ON legal_holds(matter_id, released_at)`,
    `CREATE TABLE document_trash (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
       document_id INTEGER NOT NULL UNIQUE,
       control_number TEXT NOT NULL,
       title TEXT NOT NULL DEFAULT '',
       original_name TEXT NOT NULL,
       document_count INTEGER NOT NULL,
       custodian_ids TEXT NOT NULL DEFAULT '[]',
       codes TEXT NOT NULL DEFAULT '[]',
       reason TEXT NOT NULL,
       trashed_by TEXT REFERENCES users(id),
       trashed_at TEXT NOT NULL,
       snapshot TEXT NOT NULL
     )`,
    `CREATE INDEX document_trash_matter ON document_trash(matter_id, id)`,
    `CREATE TABLE document_trash_blobs (
       trash_id INTEGER NOT NULL REFERENCES document_trash(id) ON DELETE CASCADE,
       sha256 TEXT NOT NULL,
       PRIMARY KEY (trash_id, sha256)
     ) WITHOUT ROWID`,
    `CREATE INDEX document_trash_blobs_sha ON document_trash_blobs(sha256)`,
  ];
  for (const statement of statements) await sql.raw(statement).execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  for (const table of ['document_trash_blobs', 'document_trash', 'legal_holds'])
    await sql.raw(`DROP TABLE IF EXISTS ${table}`).execute(db);
}
