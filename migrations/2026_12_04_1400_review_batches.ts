import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// Review batches: a fixed, ordered list of documents handed to one reviewer. A document
// sits in at most one open batch of each kind: review_batch_documents.open_kind holds the
// batch's kind while the batch is open and NULL once it is checked in, and a partial
// unique index makes a second open placement impossible (not merely unlikely).

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`CREATE TABLE review_batches (
      id INTEGER PRIMARY KEY AUTOINCREMENT,
      matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
      name TEXT NOT NULL,
      kind TEXT NOT NULL CHECK (kind IN ('review', 'qc', 'validation')),
      state TEXT NOT NULL DEFAULT 'unassigned'
        CHECK (state IN ('unassigned', 'assigned', 'checked_out', 'checked_in')),
      assignee_id TEXT REFERENCES users(id),
      source TEXT NOT NULL DEFAULT '',
      source_detail TEXT NOT NULL DEFAULT '{}',
      created_by TEXT REFERENCES users(id),
      created_at TEXT NOT NULL,
      assigned_at TEXT,
      checked_out_at TEXT,
      checked_in_at TEXT
    )`.execute(db);
  await sql`CREATE INDEX review_batches_matter ON review_batches(matter_id, state)`.execute(db);
  await sql`CREATE INDEX review_batches_assignee ON review_batches(assignee_id)`.execute(db);
  await sql`CREATE TABLE review_batch_documents (
      batch_id INTEGER NOT NULL REFERENCES review_batches(id) ON DELETE CASCADE,
      document_id INTEGER NOT NULL REFERENCES documents(id) ON DELETE CASCADE,
      position INTEGER NOT NULL,
      open_kind TEXT,
      PRIMARY KEY (batch_id, document_id)
    ) WITHOUT ROWID`.execute(db);
  await sql`CREATE UNIQUE INDEX review_batch_documents_open
      ON review_batch_documents(document_id, open_kind) WHERE open_kind IS NOT NULL`.execute(db);
  await sql`CREATE INDEX review_batch_documents_order ON review_batch_documents(batch_id, position)`.execute(
    db,
  );
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`DROP TABLE IF EXISTS review_batch_documents`.execute(db);
  await sql`DROP TABLE IF EXISTS review_batches`.execute(db);
}
