import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// ranking_models: each learned ranking of a matter (prioritised review), with what it
// was trained on and when, and the scores it gave (document ids and float32 scores as
// BLOBs, read whole by the prioritised search). validation_samples: prevalence and
// elusion samples with their seed and population, and the documents drawn.

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`CREATE TABLE ranking_models (
    id INTEGER PRIMARY KEY,
    matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
    version INTEGER NOT NULL,
    index_version INTEGER NOT NULL,
    positives INTEGER NOT NULL,
    negatives INTEGER NOT NULL,
    coded_through TEXT NOT NULL,
    lambda REAL NOT NULL,
    train_ms REAL NOT NULL,
    rank_ms REAL NOT NULL,
    reason TEXT NOT NULL DEFAULT '',
    tuning TEXT,
    trained_at TEXT NOT NULL,
    doc_ids BLOB NOT NULL,
    scores BLOB NOT NULL,
    UNIQUE (matter_id, version)
  )`.execute(db);
  await sql`CREATE TABLE validation_samples (
    id INTEGER PRIMARY KEY,
    matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
    kind TEXT NOT NULL CHECK (kind IN ('prevalence', 'elusion')),
    confidence REAL NOT NULL,
    margin REAL NOT NULL,
    seed INTEGER NOT NULL,
    population INTEGER NOT NULL,
    population_rule TEXT NOT NULL,
    size INTEGER NOT NULL,
    produced INTEGER NOT NULL,
    batch_id INTEGER,
    created_by TEXT,
    created_at TEXT NOT NULL
  )`.execute(db);
  await sql`CREATE INDEX validation_samples_matter ON validation_samples(matter_id, id)`.execute(
    db,
  );
  await sql`CREATE TABLE validation_sample_documents (
    sample_id INTEGER NOT NULL REFERENCES validation_samples(id) ON DELETE CASCADE,
    document_id INTEGER NOT NULL REFERENCES documents(id) ON DELETE CASCADE,
    position INTEGER NOT NULL,
    PRIMARY KEY (sample_id, document_id)
  )`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`DROP TABLE IF EXISTS validation_sample_documents`.execute(db);
  await sql`DROP TABLE IF EXISTS validation_samples`.execute(db);
  await sql`DROP TABLE IF EXISTS ranking_models`.execute(db);
}
