import SQLite from 'better-sqlite3';
import { Kysely, Migrator, SqliteDialect } from 'kysely';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { migrations } from '../../migrations/index';
import { ConceptSpace, decodeSingularValues, search } from '../engine/index';
import type { Database } from '../db/schema';
import { loadConceptSpace, saveConceptSpace, saveFoldedDocuments } from './persist';

// Round trip through the real schema (migrations/), as the server runs it.
const TEXTS = [
  'Supplier agreement terminated after missed delivery dates',
  'We are walking away from the supply deal with the vendor',
  'Quarterly delivery schedule for the supplier',
  'Board minutes: vendor contract termination approved',
  'Holiday party planning and catering menu',
  'Catering invoice for the holiday party',
  'Delivery dates slipped again; the vendor blames the shipping agent',
  'Shipping agent contract and party invitations',
];

let sqlite: SQLite.Database;
let db: Kysely<Database>;

beforeEach(async () => {
  sqlite = new SQLite(':memory:');
  sqlite.pragma('foreign_keys = ON');
  db = new Kysely<Database>({ dialect: new SqliteDialect({ database: sqlite }) });
  const migrator = new Migrator({ db, provider: { getMigrations: async () => migrations } });
  const { error } = await migrator.migrateToLatest();
  if (error) throw error;
  const now = new Date().toISOString();
  sqlite
    .prepare(
      `INSERT INTO matters (id, name, control_prefix, created_at) VALUES (1, 'Test', 'TST', ?)`,
    )
    .run(now);
  const doc = sqlite.prepare(
    `INSERT INTO documents (id, matter_id, control_number, original_name, sha256, size, created_at)
     VALUES (?, 1, ?, ?, ?, 1, ?)`,
  );
  for (let i = 1; i <= TEXTS.length + 1; i++)
    doc.run(i * 10, `TST-${i}`, `d${i}.txt`, `sha${i}`, now);
});

afterEach(async () => {
  await db.destroy();
});

describe('persist: save and load a concept space', () => {
  it('round-trips vectors, terms, singular values and search results', async () => {
    const docs = TEXTS.map((text, i) => ({ id: (i + 1) * 10, text }));
    const { space, diagnostics } = ConceptSpace.build(docs, { k: 4 });
    const indexId = await saveConceptSpace(db, space, diagnostics, { matterId: 1, version: 1 });
    const loaded = await loadConceptSpace(db, indexId);

    expect(loaded.k).toBe(space.k);
    expect(loaded.terms).toEqual(space.terms);
    expect(loaded.labels).toEqual(space.labels);
    expect(Array.from(loaded.sigma)).toEqual(Array.from(space.sigma));
    expect(Array.from(loaded.termVectors)).toEqual(Array.from(space.termVectors));
    expect(Array.from(loaded.globalWeights)).toEqual(Array.from(space.globalWeights));
    for (const { id } of docs) {
      expect(Array.from(loaded.docVector(loaded.indexOf(id)!))).toEqual(
        Array.from(space.docVector(space.indexOf(id)!)),
      );
    }
    for (const query of ['vendor contract termination', 'party catering', 'delivery dates']) {
      const a = search(space, query, { mode: 'concept', limit: 5 }).hits;
      const b = search(loaded, query, { mode: 'concept', limit: 5 }).hits;
      expect(b).toEqual(a);
    }
    const row = await db
      .selectFrom('index_versions')
      .selectAll()
      .where('id', '=', indexId)
      .executeTakeFirstOrThrow();
    expect(row.status).toBe('ready');
    expect(row.n_docs).toBe(TEXTS.length);
    expect(row.energy).toBeCloseTo(diagnostics.energy, 12);
    expect(Array.from(decodeSingularValues(row.singular_values))).toEqual(
      Array.from(diagnostics.singularValues),
    );
  });

  it('stores folded-in documents and reloads them flagged', async () => {
    const docs = TEXTS.map((text, i) => ({ id: (i + 1) * 10, text }));
    const { space, diagnostics } = ConceptSpace.build(docs, { k: 4 });
    const indexId = await saveConceptSpace(db, space, diagnostics, { matterId: 1, version: 1 });
    const folded = space.foldInDocuments([
      { id: 90, text: 'vendor terminated the supplier agreement' },
    ]);
    await saveFoldedDocuments(db, indexId, folded);
    const loaded = await loadConceptSpace(db, indexId);
    expect(loaded.nDocs).toBe(TEXTS.length + 1);
    expect(loaded.isFoldedIn(loaded.indexOf(90)!)).toBe(true);
    expect(Array.from(loaded.docVector(loaded.indexOf(90)!))).toEqual(Array.from(folded[0].vector));
  });

  it('keeps index_docs as the truth: a deleted document drops out, a re-folded one takes its row vector', async () => {
    const docs = TEXTS.map((text, i) => ({ id: (i + 1) * 10, text }));
    const { space, diagnostics } = ConceptSpace.build(docs, { k: 4 });
    const indexId = await saveConceptSpace(db, space, diagnostics, { matterId: 1, version: 1 });
    sqlite.prepare('DELETE FROM documents WHERE id = 30').run(); // cascades to index_docs
    const [refolded] = space.foldInDocuments([{ id: 40, text: 'holiday party catering' }]);
    await saveFoldedDocuments(db, indexId, [refolded]);
    const loaded = await loadConceptSpace(db, indexId);
    expect(loaded.nDocs).toBe(TEXTS.length - 1);
    expect(loaded.indexOf(30)).toBeUndefined();
    expect(loaded.isFoldedIn(loaded.indexOf(40)!)).toBe(true);
    expect(Array.from(loaded.docVector(loaded.indexOf(40)!))).toEqual(Array.from(refolded.vector));
    expect(Array.from(loaded.docVector(loaded.indexOf(50)!))).toEqual(
      Array.from(space.docVector(space.indexOf(50)!)),
    );
  });

  it('loads from the per-row tables alone when the BLOBs are absent', async () => {
    const docs = TEXTS.map((text, i) => ({ id: (i + 1) * 10, text }));
    const { space, diagnostics } = ConceptSpace.build(docs, { k: 4 });
    const indexId = await saveConceptSpace(db, space, diagnostics, { matterId: 1, version: 1 });
    const fast = await loadConceptSpace(db, indexId);
    await db.deleteFrom('index_blobs').where('index_id', '=', indexId).execute();
    const slow = await loadConceptSpace(db, indexId);
    // index_terms has no label column: without the BLOBs the labels fall back to the terms.
    expect({ ...slow.toData(), labels: null }).toEqual({ ...fast.toData(), labels: null });
    expect(slow.labels).toEqual(slow.terms);
  });

  it('refuses to load an index written in another format', async () => {
    const docs = TEXTS.map((text, i) => ({ id: (i + 1) * 10, text }));
    const { space, diagnostics } = ConceptSpace.build(docs, { k: 3 });
    const indexId = await saveConceptSpace(db, space, diagnostics, { matterId: 1, version: 1 });
    await db
      .updateTable('index_versions')
      .set({ params: '{"formatVersion":99}' })
      .where('id', '=', indexId)
      .execute();
    await expect(loadConceptSpace(db, indexId)).rejects.toThrow(/format 99/);
  });
});
