import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// A second full-text index over document_texts without the Porter stemmer, for searches
// on exact word forms (the query language's exact: field) and trailing wildcards, which
// expand over words as written ("runn*" must find "running", whose stem is "run").
// prefix='2 3' keeps prefix indexes for 2- and 3-character prefixes (SQLite FTS5 docs,
// section 4.2 "Prefix Indexes"), so short wildcards do not scan the whole vocabulary.
// Kept in step with document_texts by triggers, as documents_fts is.

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`CREATE VIRTUAL TABLE documents_fts_exact USING fts5(
      title, body,
      content='document_texts', content_rowid='document_id',
      tokenize='unicode61 remove_diacritics 2', prefix='2 3'
    )`.execute(db);
  await sql`CREATE TRIGGER document_texts_exact_ai AFTER INSERT ON document_texts BEGIN
      INSERT INTO documents_fts_exact(rowid, title, body)
        VALUES (new.document_id, new.title, new.body);
    END`.execute(db);
  await sql`CREATE TRIGGER document_texts_exact_ad AFTER DELETE ON document_texts BEGIN
      INSERT INTO documents_fts_exact(documents_fts_exact, rowid, title, body)
        VALUES ('delete', old.document_id, old.title, old.body);
    END`.execute(db);
  await sql`CREATE TRIGGER document_texts_exact_au AFTER UPDATE ON document_texts BEGIN
      INSERT INTO documents_fts_exact(documents_fts_exact, rowid, title, body)
        VALUES ('delete', old.document_id, old.title, old.body);
      INSERT INTO documents_fts_exact(rowid, title, body)
        VALUES (new.document_id, new.title, new.body);
    END`.execute(db);
  await sql`INSERT INTO documents_fts_exact(documents_fts_exact) VALUES ('rebuild')`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`DROP TRIGGER IF EXISTS document_texts_exact_au`.execute(db);
  await sql`DROP TRIGGER IF EXISTS document_texts_exact_ad`.execute(db);
  await sql`DROP TRIGGER IF EXISTS document_texts_exact_ai`.execute(db);
  await sql`DROP TABLE IF EXISTS documents_fts_exact`.execute(db);
}
