import { type Kysely, sql } from 'kysely';

// Frozen in time: imports nothing of the app; later changes go in a new migration.
// One BLOB per matrix of an index version (document ids, document vectors, term
// vectors, vocabulary), so loading a large concept space is a few sequential reads
// instead of one row per document. index_terms / index_docs keep their rows.

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql
    .raw(
      `CREATE TABLE index_blobs (
         index_id INTEGER NOT NULL REFERENCES index_versions(id) ON DELETE CASCADE,
         name TEXT NOT NULL,
         data BLOB NOT NULL,
         PRIMARY KEY (index_id, name)
       )`,
    )
    .execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql.raw('DROP TABLE IF EXISTS index_blobs').execute(db);
}
