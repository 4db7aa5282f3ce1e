import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// Redactions are kept apart from the original (which is never altered) and burned into
// produced pages only. A production is a numbered set of documents; once built it is
// locked (a correction is a new production), and its Bates range is recorded so the next
// production of the matter continues after the last number used.

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`CREATE TABLE redactions (
      id INTEGER PRIMARY KEY,
      matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
      document_id INTEGER NOT NULL REFERENCES documents(id) ON DELETE CASCADE,
      kind TEXT NOT NULL CHECK (kind IN ('span', 'pattern', 'box')),
      start_offset INTEGER,
      end_offset INTEGER,
      pattern TEXT,
      pattern_kind TEXT CHECK (pattern_kind IN ('term', 'format')),
      page INTEGER,
      x REAL, y REAL, width REAL, height REAL,
      reason TEXT NOT NULL,
      created_by TEXT NOT NULL,
      created_at TEXT NOT NULL,
      removed_at TEXT,
      removed_by TEXT,
      produced_in INTEGER
    )`.execute(db);
  await sql`CREATE INDEX redactions_document ON redactions(document_id)`.execute(db);

  await sql`CREATE TABLE productions (
      id INTEGER PRIMARY KEY,
      matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
      name TEXT NOT NULL,
      source TEXT NOT NULL,
      bates_prefix TEXT NOT NULL,
      bates_start INTEGER NOT NULL,
      bates_padding INTEGER NOT NULL,
      legend TEXT NOT NULL DEFAULT '',
      legend_codes TEXT NOT NULL DEFAULT '[]',
      privileged TEXT NOT NULL CHECK (privileged IN ('withhold', 'redact')),
      natives TEXT NOT NULL DEFAULT 'unpaginated',
      state TEXT NOT NULL DEFAULT 'draft' CHECK (state IN ('draft', 'building', 'built', 'failed')),
      job_id INTEGER,
      first_seq INTEGER,
      last_seq INTEGER,
      pages INTEGER,
      zip_sha256 TEXT,
      zip_size INTEGER,
      error TEXT,
      created_by TEXT NOT NULL,
      created_at TEXT NOT NULL,
      built_at TEXT,
      UNIQUE (matter_id, name)
    )`.execute(db);

  await sql`CREATE TABLE production_documents (
      production_id INTEGER NOT NULL REFERENCES productions(id) ON DELETE CASCADE,
      document_id INTEGER NOT NULL REFERENCES documents(id),
      origin TEXT NOT NULL CHECK (origin IN ('source', 'added', 'slip-sheet')),
      position INTEGER,
      treatment TEXT,
      begin_seq INTEGER,
      end_seq INTEGER,
      pages INTEGER,
      legend TEXT,
      PRIMARY KEY (production_id, document_id)
    ) WITHOUT ROWID`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`DROP TABLE IF EXISTS production_documents`.execute(db);
  await sql`DROP TABLE IF EXISTS productions`.execute(db);
  await sql`DROP TABLE IF EXISTS redactions`.execute(db);
}
