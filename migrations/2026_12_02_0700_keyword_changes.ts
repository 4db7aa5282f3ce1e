import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// Keyword search scores from an in-memory index per matter (server/search/keyword-cache.ts).
// These triggers log every change that can alter a matter's searchable text (a text
// written, replaced or deleted; a document's extraction status changed; a document
// deleted), so the index applies just those documents before the next search.
// AUTOINCREMENT: applied rows are deleted, and an id must never be handed out twice.

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`CREATE TABLE keyword_changes (
    id INTEGER PRIMARY KEY AUTOINCREMENT,
    matter_id INTEGER NOT NULL,
    document_id INTEGER NOT NULL
  )`.execute(db);
  await sql`CREATE INDEX keyword_changes_matter ON keyword_changes(matter_id, id)`.execute(db);
  for (const [name, event, ref] of [
    ['document_texts_keyword_ai', 'AFTER INSERT ON document_texts', 'new'],
    ['document_texts_keyword_au', 'AFTER UPDATE ON document_texts', 'new'],
    ['document_texts_keyword_ad', 'AFTER DELETE ON document_texts', 'old'],
  ] as const) {
    await sql
      .raw(
        `CREATE TRIGGER ${name} ${event} BEGIN
           INSERT INTO keyword_changes (matter_id, document_id)
           SELECT d.matter_id, d.id FROM documents d WHERE d.id = ${ref}.document_id;
         END`,
      )
      .execute(db);
  }
  await sql`CREATE TRIGGER documents_keyword_status AFTER UPDATE OF extract_status ON documents
    WHEN old.extract_status IS NOT new.extract_status BEGIN
      INSERT INTO keyword_changes (matter_id, document_id) VALUES (new.matter_id, new.id);
    END`.execute(db);
  await sql`CREATE TRIGGER documents_keyword_ad AFTER DELETE ON documents BEGIN
      INSERT INTO keyword_changes (matter_id, document_id) VALUES (old.matter_id, old.id);
    END`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  for (const name of [
    'document_texts_keyword_ai',
    'document_texts_keyword_au',
    'document_texts_keyword_ad',
    'documents_keyword_status',
    'documents_keyword_ad',
  ])
    await sql.raw(`DROP TRIGGER IF EXISTS ${name}`).execute(db);
  await sql`DROP TABLE IF EXISTS keyword_changes`.execute(db);
}
