import { type Kysely, sql } from 'kysely';

// Frozen in time: imports nothing of the app; later changes go in a new migration.
// Concept-space views (issue 6): labels a matter lead gives to concept dimensions, kept
// with the index version they describe, and k-means groupings of an index version's
// documents (the groups are usable as a search filter).

export async function up(db: Kysely<unknown>): Promise<void> {
  const statements = [
    `CREATE TABLE index_dimension_labels (
       index_id INTEGER NOT NULL REFERENCES index_versions(id) ON DELETE CASCADE,
       dim INTEGER NOT NULL,
       label TEXT NOT NULL,
       labelled_by TEXT REFERENCES users(id) ON DELETE SET NULL,
       labelled_at TEXT NOT NULL,
       PRIMARY KEY (index_id, dim)
     )`,
    `CREATE TABLE concept_groupings (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       index_id INTEGER NOT NULL REFERENCES index_versions(id) ON DELETE CASCADE,
       groups INTEGER NOT NULL,
       seed INTEGER NOT NULL,
       dims INTEGER NOT NULL,
       documents INTEGER NOT NULL,
       iterations INTEGER NOT NULL,
       converged INTEGER NOT NULL,
       inertia REAL NOT NULL,
       centres BLOB NOT NULL,
       created_by TEXT REFERENCES users(id) ON DELETE SET NULL,
       created_at TEXT NOT NULL,
       UNIQUE (index_id, groups, seed)
     )`,
    `CREATE TABLE concept_groups (
       id INTEGER PRIMARY KEY AUTOINCREMENT,
       grouping_id INTEGER NOT NULL REFERENCES concept_groupings(id) ON DELETE CASCADE,
       number INTEGER NOT NULL,
       size INTEGER NOT NULL,
       top_terms TEXT NOT NULL DEFAULT '[]',
       UNIQUE (grouping_id, number)
     )`,
    `CREATE TABLE concept_group_members (
       group_id INTEGER NOT NULL REFERENCES concept_groups(id) ON DELETE CASCADE,
       document_id INTEGER NOT NULL REFERENCES documents(id) ON DELETE CASCADE,
       PRIMARY KEY (group_id, document_id)
     ) WITHOUT ROWID`,
    `CREATE INDEX concept_group_members_document ON concept_group_members(document_id)`,
  ];
  for (const statement of statements) await sql.raw(statement).execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  for (const table of [
    'concept_group_members',
    'concept_groups',
    'concept_groupings',
    'index_dimension_labels',
  ])
    await sql.raw(`DROP TABLE IF EXISTS ${table}`).execute(db);
}
