import { type Kysely, sql } from 'kysely';

// Frozen in time: this file must never import application code, and once
// released it is never edited; later changes go in a new migration.

export async function up(db: Kysely<unknown>): Promise<void> {
  const statements = [
    `CREATE TABLE users (
       id TEXT PRIMARY KEY,
       email TEXT NOT NULL UNIQUE COLLATE NOCASE,
       name TEXT NOT NULL,
       password_hash TEXT NOT NULL,
       is_admin INTEGER NOT NULL DEFAULT 0,
       disabled_at TEXT,
       password_changed_at TEXT NOT NULL,
       created_at TEXT NOT NULL
     )`,
    // Column names follow @lucia-auth/adapter-sqlite (id, user_id, expires_at in seconds).
    `CREATE TABLE sessions (
       id TEXT PRIMARY KEY,
       user_id TEXT NOT NULL REFERENCES users(id) ON DELETE CASCADE,
       expires_at INTEGER NOT NULL
     )`,
    `CREATE INDEX sessions_user ON sessions(user_id)`,
    `CREATE TABLE matters (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       name TEXT NOT NULL UNIQUE COLLATE NOCASE,
       description TEXT NOT NULL DEFAULT '',
       control_prefix TEXT NOT NULL UNIQUE,
       next_control_seq INTEGER NOT NULL DEFAULT 1,
       current_index_id INTEGER,
       created_by TEXT REFERENCES users(id),
       created_at TEXT NOT NULL
     )`,
    `CREATE TABLE matter_members (
       matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
       user_id TEXT NOT NULL REFERENCES users(id) ON DELETE CASCADE,
       role TEXT NOT NULL CHECK (role IN ('lead', 'attorney', 'paralegal', 'reviewer')),
       granted_by TEXT REFERENCES users(id),
       granted_at TEXT NOT NULL,
       PRIMARY KEY (matter_id, user_id)
     )`,
    `CREATE INDEX matter_members_user ON matter_members(user_id)`,
    `CREATE TABLE invitations (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
       email TEXT NOT NULL COLLATE NOCASE,
       role TEXT NOT NULL CHECK (role IN ('lead', 'attorney', 'paralegal', 'reviewer')),
       token_hash TEXT NOT NULL UNIQUE,
       invited_by TEXT NOT NULL REFERENCES users(id),
       created_at TEXT NOT NULL,
       expires_at TEXT NOT NULL,
       accepted_at TEXT,
       accepted_by TEXT REFERENCES users(id),
       revoked_at TEXT
     )`,
    `CREATE TABLE custodians (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
       name TEXT NOT NULL COLLATE NOCASE,
       created_at TEXT NOT NULL,
       UNIQUE (matter_id, name)
     )`,
    `CREATE TABLE upload_batches (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
       custodian_id INTEGER REFERENCES custodians(id),
       source TEXT NOT NULL CHECK (source IN ('upload', 'import', 'demo')),
       file_count INTEGER NOT NULL DEFAULT 0,
       created_by TEXT REFERENCES users(id),
       created_at TEXT NOT NULL
     )`,
    `CREATE TABLE documents (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
       batch_id INTEGER REFERENCES upload_batches(id),
       custodian_id INTEGER REFERENCES custodians(id),
       parent_id INTEGER REFERENCES documents(id) ON DELETE CASCADE,
       control_number TEXT NOT NULL,
       original_name TEXT NOT NULL,
       original_path TEXT NOT NULL DEFAULT '',
       sha256 TEXT NOT NULL,
       mime TEXT NOT NULL DEFAULT 'application/octet-stream',
       doc_type TEXT NOT NULL DEFAULT 'unknown',
       size INTEGER NOT NULL,
       title TEXT NOT NULL DEFAULT '',
       author TEXT NOT NULL DEFAULT '',
       recipients TEXT NOT NULL DEFAULT '',
       sent_at TEXT,
       page_count INTEGER,
       extract_status TEXT NOT NULL DEFAULT 'pending'
         CHECK (extract_status IN ('pending', 'extracting', 'extracted', 'failed', 'duplicate')),
       extract_error TEXT,
       duplicate_of INTEGER REFERENCES documents(id) ON DELETE SET NULL,
       created_at TEXT NOT NULL,
       UNIQUE (matter_id, control_number)
     )`,
    `CREATE INDEX documents_matter_sha ON documents(matter_id, sha256)`,
    `CREATE INDEX documents_parent ON documents(parent_id)`,
    `CREATE INDEX documents_matter_status ON documents(matter_id, extract_status)`,
    `CREATE TABLE document_texts (
       document_id INTEGER PRIMARY KEY REFERENCES documents(id) ON DELETE CASCADE,
       title TEXT NOT NULL DEFAULT '',
       body TEXT NOT NULL DEFAULT ''
     )`,
    // Keyword search: FTS5 over document_texts (external content), Porter stemming.
    `CREATE VIRTUAL TABLE documents_fts USING fts5(
       title, body,
       content='document_texts', content_rowid='document_id',
       tokenize='porter unicode61 remove_diacritics 2'
     )`,
    `CREATE TRIGGER document_texts_ai AFTER INSERT ON document_texts BEGIN
       INSERT INTO documents_fts(rowid, title, body) VALUES (new.document_id, new.title, new.body);
     END`,
    `CREATE TRIGGER document_texts_ad AFTER DELETE ON document_texts BEGIN
       INSERT INTO documents_fts(documents_fts, rowid, title, body)
         VALUES ('delete', old.document_id, old.title, old.body);
     END`,
    `CREATE TRIGGER document_texts_au AFTER UPDATE ON document_texts BEGIN
       INSERT INTO documents_fts(documents_fts, rowid, title, body)
         VALUES ('delete', old.document_id, old.title, old.body);
       INSERT INTO documents_fts(rowid, title, body) VALUES (new.document_id, new.title, new.body);
     END`,
    `CREATE TABLE jobs (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       matter_id INTEGER REFERENCES matters(id) ON DELETE CASCADE,
       kind TEXT NOT NULL,
       status TEXT NOT NULL DEFAULT 'queued'
         CHECK (status IN ('queued', 'running', 'succeeded', 'failed', 'cancelled')),
       progress INTEGER NOT NULL DEFAULT 0,
       total INTEGER NOT NULL DEFAULT 0,
       message TEXT NOT NULL DEFAULT '',
       error TEXT,
       payload TEXT NOT NULL DEFAULT '{}',
       created_by TEXT REFERENCES users(id),
       created_at TEXT NOT NULL,
       started_at TEXT,
       finished_at TEXT
     )`,
    `CREATE INDEX jobs_matter ON jobs(matter_id, created_at)`,
    `CREATE INDEX jobs_status ON jobs(status)`,
    `CREATE TABLE index_versions (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
       version INTEGER NOT NULL,
       status TEXT NOT NULL CHECK (status IN ('building', 'ready', 'failed', 'superseded')),
       k INTEGER NOT NULL,
       weighting TEXT NOT NULL,
       n_docs INTEGER NOT NULL DEFAULT 0,
       n_terms INTEGER NOT NULL DEFAULT 0,
       nnz INTEGER NOT NULL DEFAULT 0,
       singular_values BLOB,
       frobenius_sq REAL,
       energy REAL,
       orthogonality_u REAL,
       orthogonality_v REAL,
       build_ms INTEGER,
       peak_rss_mb REAL,
       params TEXT NOT NULL DEFAULT '{}',
       error TEXT,
       job_id INTEGER REFERENCES jobs(id),
       requested_by TEXT REFERENCES users(id),
       created_at TEXT NOT NULL,
       completed_at TEXT,
       UNIQUE (matter_id, version)
     )`,
    `CREATE TABLE index_terms (
       index_id INTEGER NOT NULL REFERENCES index_versions(id) ON DELETE CASCADE,
       term_id INTEGER NOT NULL,
       term TEXT NOT NULL,
       df INTEGER NOT NULL,
       global_weight REAL NOT NULL,
       vector BLOB NOT NULL,
       PRIMARY KEY (index_id, term_id)
     )`,
    `CREATE TABLE index_docs (
       index_id INTEGER NOT NULL REFERENCES index_versions(id) ON DELETE CASCADE,
       document_id INTEGER NOT NULL REFERENCES documents(id) ON DELETE CASCADE,
       vector BLOB NOT NULL,
       folded_in INTEGER NOT NULL DEFAULT 0,
       PRIMARY KEY (index_id, document_id)
     )`,
    `CREATE INDEX index_docs_document ON index_docs(document_id)`,
    `CREATE TABLE codes (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
       name TEXT NOT NULL COLLATE NOCASE,
       shortcut TEXT,
       sort_order INTEGER NOT NULL DEFAULT 0,
       marks_privileged INTEGER NOT NULL DEFAULT 0,
       archived_at TEXT,
       created_at TEXT NOT NULL,
       UNIQUE (matter_id, name)
     )`,
    `CREATE TABLE document_codes (
       document_id INTEGER NOT NULL REFERENCES documents(id) ON DELETE CASCADE,
       code_id INTEGER NOT NULL REFERENCES codes(id) ON DELETE CASCADE,
       coded_by TEXT NOT NULL REFERENCES users(id),
       coded_at TEXT NOT NULL,
       PRIMARY KEY (document_id, code_id)
     )`,
    `CREATE INDEX document_codes_code ON document_codes(code_id)`,
    `CREATE TABLE privilege_entries (
       document_id INTEGER PRIMARY KEY REFERENCES documents(id) ON DELETE CASCADE,
       basis TEXT NOT NULL DEFAULT '',
       description TEXT NOT NULL DEFAULT '',
       updated_by TEXT NOT NULL REFERENCES users(id),
       updated_at TEXT NOT NULL
     )`,
    `CREATE TABLE notes (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       document_id INTEGER NOT NULL REFERENCES documents(id) ON DELETE CASCADE,
       author_id TEXT NOT NULL REFERENCES users(id),
       body TEXT NOT NULL,
       created_at TEXT NOT NULL
     )`,
    `CREATE TABLE saved_searches (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
       name TEXT NOT NULL,
       query TEXT NOT NULL,
       mode TEXT NOT NULL,
       filters TEXT NOT NULL DEFAULT '{}',
       created_by TEXT NOT NULL REFERENCES users(id),
       created_at TEXT NOT NULL,
       UNIQUE (matter_id, name)
     )`,
    // Append-only: no foreign keys (the record outlives what it names), and
    // triggers refuse every UPDATE and DELETE.
    `CREATE TABLE audit_events (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       at TEXT NOT NULL,
       actor_id TEXT,
       actor_email TEXT,
       matter_id INTEGER,
       action TEXT NOT NULL,
       target_type TEXT,
       target_id TEXT,
       detail TEXT NOT NULL DEFAULT '{}',
       ip TEXT
     )`,
    `CREATE INDEX audit_events_matter ON audit_events(matter_id, id)`,
    `CREATE INDEX audit_events_actor ON audit_events(actor_id, id)`,
    `CREATE TRIGGER audit_events_no_update BEFORE UPDATE ON audit_events BEGIN
       SELECT RAISE(ABORT, 'audit_events is append-only');
     END`,
    `CREATE TRIGGER audit_events_no_delete BEFORE DELETE ON audit_events BEGIN
       SELECT RAISE(ABORT, 'audit_events is append-only');
     END`,
  ];
  for (const statement of statements) await sql.raw(statement).execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  const tables = [
    'audit_events',
    'saved_searches',
    'notes',
    'privilege_entries',
    'document_codes',
    'codes',
    'index_docs',
    'index_terms',
    'index_versions',
    'jobs',
    'documents_fts',
    'document_texts',
    'documents',
    'upload_batches',
    'custodians',
    'invitations',
    'matter_members',
    'matters',
    'sessions',
    'users',
  ];
  for (const table of tables) await sql.raw(`DROP TABLE IF EXISTS ${table}`).execute(db);
}
