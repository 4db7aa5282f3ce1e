import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// Second-level review. A QC sample records how it was drawn (random share or count with
// its seed, or targeted criteria) and the first-level calls it checks: one qc_items row
// per (document, code, first-level coder). A verdict confirms or overturns the call; a
// document with a verdict gets a coding lock that only the lead lifts.

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`CREATE TABLE qc_samples (
      id INTEGER PRIMARY KEY AUTOINCREMENT,
      matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
      batch_id INTEGER NOT NULL REFERENCES review_batches(id) ON DELETE CASCADE,
      method TEXT NOT NULL CHECK (method IN ('share', 'count', 'targeted')),
      seed INTEGER,
      share REAL,
      requested INTEGER,
      population INTEGER NOT NULL,
      criteria TEXT NOT NULL DEFAULT '{}',
      created_by TEXT REFERENCES users(id),
      created_at TEXT NOT NULL
    )`.execute(db);
  await sql`CREATE TABLE qc_items (
      id INTEGER PRIMARY KEY AUTOINCREMENT,
      sample_id INTEGER NOT NULL REFERENCES qc_samples(id) ON DELETE CASCADE,
      document_id INTEGER NOT NULL REFERENCES documents(id) ON DELETE CASCADE,
      code_id INTEGER NOT NULL REFERENCES codes(id) ON DELETE CASCADE,
      first_coder_id TEXT REFERENCES users(id),
      first_coded_at TEXT,
      verdict TEXT CHECK (verdict IN ('confirmed', 'overturned')),
      replacement_code_id INTEGER REFERENCES codes(id),
      decided_by TEXT REFERENCES users(id),
      decided_at TEXT,
      note TEXT NOT NULL DEFAULT '',
      UNIQUE (sample_id, document_id, code_id)
    )`.execute(db);
  await sql`CREATE INDEX qc_items_document ON qc_items(document_id)`.execute(db);
  await sql`CREATE TABLE coding_locks (
      document_id INTEGER PRIMARY KEY REFERENCES documents(id) ON DELETE CASCADE,
      matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
      sample_id INTEGER REFERENCES qc_samples(id) ON DELETE SET NULL,
      locked_by TEXT REFERENCES users(id),
      locked_at TEXT NOT NULL
    )`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`DROP TABLE IF EXISTS coding_locks`.execute(db);
  await sql`DROP TABLE IF EXISTS qc_items`.execute(db);
  await sql`DROP TABLE IF EXISTS qc_samples`.execute(db);
}
