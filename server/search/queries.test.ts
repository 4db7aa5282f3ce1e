// The search queries that return up to a whole matter's ids: the matter's in-memory
// keyword index must match the documents SQLite FTS5 matches (its scores are checked
// against FTS5's bm25 in server/engine/search/keyword-index.test.ts) and follow every change
// to the texts; filter candidates must come from the covering index. Data: Cranfield 1400 (Cleverdon, Mills & Keen 1966, ../shared/data/cranfield)
// and its 225 queries, loaded as one matter's documents.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readCranfield } from '../engine/index';
import { requireShared } from '../../tests/helpers/shared-data';
import { keywordQueryTerms } from '../engine/index';
import { createTestApp, type TestApp } from '../../tests/helpers';
import { replaceDocumentText } from '../documents/queries';
import { documentsByIds, filteredDocumentIds } from './queries';

const present = requireShared('search queries against SQLite FTS5');
let t: TestApp;
let matterId: number;
let custodians: number[];
let queries: string[];

beforeAll(async () => {
  if (!present) return;
  t = await createTestApp();
  const matter = await t.buildMatter();
  matterId = matter.id;
  const sqlite = t.ctx.sqlite;
  const now = new Date().toISOString();
  custodians = [1, 2, 3].map((c) =>
    Number(
      sqlite
        .prepare('INSERT INTO custodians (matter_id, name, created_at) VALUES (?, ?, ?)')
        .run(matterId, `Custodian ${c}`, now).lastInsertRowid,
    ),
  );
  const insertDoc = sqlite.prepare(
    `INSERT INTO documents (matter_id, custodian_id, control_number, original_name, sha256, doc_type, size, title, sent_at, extract_status, created_at)
     VALUES (?, ?, ?, ?, ?, 'text', ?, ?, ?, ?, ?)`,
  );
  const insertText = sqlite.prepare(
    'INSERT INTO document_texts (document_id, title, body) VALUES (?, ?, ?)',
  );
  const c = readCranfield();
  queries = c.queries.map((q) => q.text);
  sqlite.transaction(() => {
    c.docs.forEach((doc, i) => {
      // Every 50th document is still pending extraction: never a match.
      const status = i % 50 === 49 ? 'pending' : 'extracted';
      const day = `20${10 + (i % 10)}-0${1 + (i % 9)}-15T00:00:00.000Z`;
      const id = Number(
        insertDoc.run(
          matterId,
          custodians[i % 3],
          `CRAN-${doc.id}`,
          `${doc.id}.txt`,
          String(i).padStart(64, '0'),
          doc.text.length,
          doc.title,
          day,
          status,
          now,
        ).lastInsertRowid,
      );
      insertText.run(id, doc.title, doc.text);
    });
  })();
});
afterAll(() => t?.close());

/** FTS5's matches in the matter (extracted documents only), as a sorted id list. */
function ftsMatches(match: string): number[] {
  return t.ctx.sqlite
    .prepare(
      `SELECT documents_fts.rowid FROM documents_fts JOIN documents d ON d.id = documents_fts.rowid
        WHERE documents_fts MATCH ? AND d.matter_id = ? AND d.extract_status = 'extracted'
        ORDER BY 1`,
    )
    .pluck()
    .all(match, matterId) as number[];
}

async function keywordIds(text: string): Promise<number[]> {
  const index = await t.ctx.keyword.indexFor(matterId);
  const found = index.search(keywordQueryTerms(text).terms, { limit: 1e9 });
  return [...found.ids].sort((a, b) => a - b);
}

describe.runIf(present)('search queries on Cranfield 1400', () => {
  it("keyword index: the same documents as FTS5 in the matter's extracted set, all 225 queries", async () => {
    for (const text of queries) {
      const { words } = keywordQueryTerms(text);
      expect(await keywordIds(text)).toEqual(ftsMatches(words.map((w) => `"${w}"`).join(' OR ')));
    }
  });

  it('keyword index follows status changes, replaced and deleted texts, and new documents', async () => {
    const sqlite = t.ctx.sqlite;
    const first = await keywordIds('boundary layer');
    const [a, b, c] = first;
    sqlite.prepare("UPDATE documents SET extract_status = 'pending' WHERE id = ?").run(a);
    await replaceDocumentText(t.ctx.db, b, 'zanzibar quokka', 'nothing about fluids');
    sqlite.prepare('DELETE FROM document_texts WHERE document_id = ?').run(c);
    sqlite.prepare('DELETE FROM documents WHERE id = ?').run(c);
    expect(await keywordIds('boundary layer')).toEqual(
      first.filter((id) => ![a, b, c].includes(id)),
    );
    expect(await keywordIds('quokka')).toEqual([b]);
    sqlite.prepare("UPDATE documents SET extract_status = 'extracted' WHERE id = ?").run(a);
    const added = Number(
      sqlite
        .prepare(
          `INSERT INTO documents (matter_id, control_number, original_name, sha256, doc_type, size, title, extract_status, created_at)
           VALUES (?, 'CRAN-NEW', 'new.txt', ?, 'text', 1, 'quokka', 'extracted', ?)`,
        )
        .run(matterId, 'f'.repeat(64), new Date().toISOString()).lastInsertRowid,
    );
    sqlite
      .prepare('INSERT INTO document_texts (document_id, title, body) VALUES (?, ?, ?)')
      .run(added, 'quokka', 'a quokka boundary');
    expect(await keywordIds('quokka')).toEqual([b, added].sort((x, y) => x - y));
    expect(await keywordIds('boundary layer')).toContain(a);
    // The applied log is pruned.
    expect(
      sqlite
        .prepare('SELECT count(*) FROM keyword_changes WHERE matter_id = ?')
        .pluck()
        .get(matterId),
    ).toBe(0);
  });

  it("a matter's keyword scores do not depend on another matter's documents", async () => {
    const before = (await t.ctx.keyword.indexFor(matterId)).search(
      keywordQueryTerms(queries[3]).terms,
      { limit: 50 },
    );
    const other = await t.buildMatter();
    const sqlite = t.ctx.sqlite;
    for (let i = 0; i < 30; i++) {
      const id = Number(
        sqlite
          .prepare(
            `INSERT INTO documents (matter_id, control_number, original_name, sha256, doc_type, size, title, extract_status, created_at)
             VALUES (?, ?, 'x.txt', ?, 'text', 1, '', 'extracted', ?)`,
          )
          .run(other.id, `OTHER-${i}`, String(i).padStart(64, 'e'), new Date().toISOString())
          .lastInsertRowid,
      );
      sqlite
        .prepare('INSERT INTO document_texts (document_id, title, body) VALUES (?, ?, ?)')
        .run(id, '', queries[3]);
    }
    const after = (await t.ctx.keyword.indexFor(matterId)).search(
      keywordQueryTerms(queries[3]).terms,
      { limit: 50 },
    );
    expect(after).toEqual(before);
    expect((await t.ctx.keyword.indexFor(other.id)).size).toBe(30);
  });

  it("listing fields by id: only the matter's documents, in any matter of the database", async () => {
    const ids = filteredDocumentIds(t.ctx.db, t.ctx.sqlite, matterId, {}).slice(0, 60);
    const rows = await documentsByIds(t.ctx.db, matterId, ids);
    expect(rows.map((r) => r.id).sort((a, b) => a - b)).toEqual([...ids].sort((a, b) => a - b));
    expect(await documentsByIds(t.ctx.db, matterId + 1000, ids)).toEqual([]);
  });

  it('filter candidates: the extracted documents passing the filters, from the covering index', () => {
    const filters = { custodianIds: [custodians[0]], dateFrom: '2012-01-01', dateTo: '2015-12-31' };
    const ids = filteredDocumentIds(t.ctx.db, t.ctx.sqlite, matterId, filters);
    const expected = t.ctx.sqlite
      .prepare(
        `SELECT id FROM documents WHERE matter_id = ? AND extract_status = 'extracted'
           AND custodian_id = ? AND sent_at >= '2012-01-01' AND sent_at < '2016-01-01'`,
      )
      .pluck()
      .all(matterId, custodians[0]) as number[];
    expect(expected.length).toBeGreaterThan(50);
    expect([...ids].sort((a, b) => a - b)).toEqual([...expected].sort((a, b) => a - b));
    const plan = t.ctx.sqlite
      .prepare(
        `EXPLAIN QUERY PLAN SELECT d.id FROM documents d WHERE d.matter_id = ? AND d.extract_status = 'extracted'
           AND d.custodian_id IN (?) AND d.sent_at >= ? AND d.sent_at < ?`,
      )
      .all(matterId, custodians[0], '2012-01-01', '2016-01-01') as { detail: string }[];
    expect(plan.map((p) => p.detail).join(' ')).toContain(
      'COVERING INDEX documents_search_filters',
    );
  });
});
