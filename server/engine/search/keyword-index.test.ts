import SQLite from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { requireShared } from '../../../tests/helpers/shared-data';
import { readCranfield, type CranfieldCollection } from '../eval/cranfield';
import { mulberry32 } from '../linalg/random';
import { ftsRawTokens, ftsTokens } from './fts5-tokens';
import { KEYWORD_TABLES_DDL } from './keyword';
import { KeywordIndex, keywordQueryTerms } from './keyword-index';

// Reference implementation: SQLite FTS5 itself (the bm25() auxiliary function and the
// fts5vocab table, sqlite.org/fts5.html sections 5.1.1 and 7), over the Cranfield
// collection (Cleverdon 1967; ../shared/data/cranfield) loaded as one FTS5 table, so
// FTS5's collection statistics are the index's.
const available = requireShared('KeywordIndex against SQLite FTS5');

function ftsDatabase(docs: { rowid: number; title: string; body: string }[]) {
  const db = new SQLite(':memory:');
  for (const ddl of KEYWORD_TABLES_DDL) db.exec(ddl);
  const insert = db.prepare(
    'INSERT INTO document_texts (document_id, title, body) VALUES (?, ?, ?)',
  );
  db.transaction(() => docs.forEach((d) => insert.run(d.rowid, d.title, d.body)))();
  db.exec(
    "CREATE VIRTUAL TABLE temp.fts_instances USING fts5vocab(main, documents_fts, 'instance')",
  );
  return db;
}

describe.runIf(available)('KeywordIndex against SQLite FTS5 on Cranfield', () => {
  let cranfield: CranfieldCollection;
  let db: SQLite.Database;
  let index: KeywordIndex;
  const rows: { rowid: number; title: string; body: string }[] = [];

  beforeAll(() => {
    cranfield = readCranfield();
    cranfield.docs.forEach((d, i) => rows.push({ rowid: i + 1, title: d.title, body: d.text }));
    db = ftsDatabase(rows);
    index = new KeywordIndex();
    for (const r of rows) index.add(r.rowid, r.title, r.body);
  });
  afterAll(() => db?.close());

  it('tokenises every document into the terms FTS5 indexes, with the same counts', () => {
    const fts = new Map<number, Map<string, number>>();
    for (const [term, doc] of db
      .prepare('SELECT term, doc FROM temp.fts_instances')
      .raw(true)
      .iterate() as Iterable<[string, number]>) {
      let counts = fts.get(doc);
      if (!counts) fts.set(doc, (counts = new Map()));
      counts.set(term, (counts.get(term) ?? 0) + 1);
    }
    let compared = 0;
    for (const r of rows) {
      const ours = new Map<string, number>();
      for (const t of [...ftsTokens(r.title), ...ftsTokens(r.body)])
        ours.set(t, (ours.get(t) ?? 0) + 1);
      expect(Object.fromEntries(ours), `document ${r.rowid}`).toEqual(
        Object.fromEntries(fts.get(r.rowid) ?? new Map()),
      );
      compared++;
    }
    expect(compared).toBe(1400);
  });

  it("scores all 225 queries' matches as FTS5's -bm25() does, and matches the same documents", () => {
    const statement = db.prepare(
      `SELECT rowid, -bm25(documents_fts) AS score FROM documents_fts
        WHERE documents_fts MATCH ? ORDER BY bm25(documents_fts), rowid`,
    );
    let worst = 0;
    for (const q of cranfield.queries) {
      const { terms } = keywordQueryTerms(q.text);
      const repeated = keywordQueryTerms(q.text).terms.length;
      const words = ftsRawTokens(q.text).filter((w) => keywordQueryTerms(q.text).words.includes(w));
      expect(words.length).toBe(repeated);
      const match = words.map((w) => `"${w}"`).join(' OR ');
      const reference = statement.all(match) as { rowid: number; score: number }[];
      // Every repetition as its own phrase in FTS5: the oracle for k3 -> infinity.
      const ours = index.search(terms, { limit: 5000, k3: Infinity });
      expect(ours.total, `query ${q.id}`).toBe(reference.length);
      const refScore = new Map(reference.map((r) => [r.rowid, r.score]));
      ours.ids.forEach((id, r) => {
        const expected = refScore.get(id);
        expect(expected, `query ${q.id}: document ${id} matched by FTS5`).toBeDefined();
        worst = Math.max(worst, Math.abs(ours.scores[r] - expected!) / Math.abs(expected!));
      });
      // Same order wherever scores are not tied.
      for (let r = 1; r < ours.ids.length; r++)
        expect(ours.scores[r]).toBeLessThanOrEqual(ours.scores[r - 1]);
      expect(ours.ids.slice(0, 10)).toEqual(reference.slice(0, 10).map((r) => r.rowid));
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it('a repeated query word weighs (k3 + 1) qtf / (k3 + qtf) (Okapi at TREC-3); FTS5 is the k3 -> infinity oracle', () => {
    const fts = db.prepare(
      `SELECT rowid, -bm25(documents_fts) AS score FROM documents_fts
        WHERE documents_fts MATCH ? ORDER BY rowid`,
    );
    // A pasted paragraph saying "pressure" four times and "flow" once.
    const text = 'pressure flow pressure pressure pressure';
    const { terms } = keywordQueryTerms(text);
    expect(terms).toEqual(['pressur', 'flow', 'pressur', 'pressur', 'pressur']);
    const reference = fts.all('"pressure" OR "flow" OR "pressure" OR "pressure" OR "pressure"') as {
      rowid: number;
      score: number;
    }[];
    const infinite = index.search(terms, { limit: 5000, k3: Infinity });
    const byId = new Map(infinite.ids.map((id, i) => [id, infinite.scores[i]]));
    expect(infinite.total).toBe(reference.length);
    for (const r of reference) expect(byId.get(r.rowid)! / r.score).toBeCloseTo(1, 12);
    // Finite k3: the per-word parts, re-weighted by hand.
    const once = (term: string) => {
      const hit = index.search([term], { limit: 5000 });
      return new Map(hit.ids.map((id, i) => [id, hit.scores[i]]));
    };
    const pressure = once('pressur');
    const flow = once('flow');
    for (const k3 of [0, 1.5, 7, 1000]) {
      const w = ((k3 + 1) * 4) / (k3 + 4);
      const found = index.search(terms, { limit: 5000, k3 });
      found.ids.forEach((id, i) =>
        expect(found.scores[i]).toBeCloseTo(w * (pressure.get(id) ?? 0) + (flow.get(id) ?? 0), 10),
      );
    }
    // k3 = 0 ignores repetition: the same as saying each word once.
    const plain = index.search(['pressur', 'flow'], { limit: 5000 });
    expect(index.search(terms, { limit: 5000, k3: 0 }).scores).toEqual(plain.scores);
  });

  it('keeps the statistics right when documents are removed and added back', () => {
    const copy = new KeywordIndex();
    for (const r of rows) copy.add(r.rowid, r.title, r.body);
    for (const r of rows.slice(0, 300)) copy.remove(r.rowid);
    for (const r of rows.slice(0, 300)) copy.add(r.rowid, r.title, r.body);
    expect(copy.size).toBe(1400);
    const terms = keywordQueryTerms(cranfield.queries[0].text).terms;
    const a = index.search(terms, { limit: 50 });
    const b = copy.search(terms, { limit: 50 });
    expect(b.total).toBe(a.total);
    b.scores.forEach((s, i) => expect(s).toBeCloseTo(a.scores[i], 12));
  });

  it('a removed document no longer matches or counts, as if it was never loaded', () => {
    const without = new KeywordIndex();
    const trimmed = new KeywordIndex();
    for (const r of rows) trimmed.add(r.rowid, r.title, r.body);
    for (const r of rows.slice(0, 700)) trimmed.remove(r.rowid);
    for (const r of rows.slice(700)) without.add(r.rowid, r.title, r.body);
    const terms = keywordQueryTerms(cranfield.queries[5].text).terms;
    expect(trimmed.search(terms, { limit: 100 })).toEqual(without.search(terms, { limit: 100 }));
  });
});

describe('KeywordIndex', () => {
  it('the limited list is the head of the full ranking, ties by document id', () => {
    const rand = mulberry32(5);
    const index = new KeywordIndex();
    const vocabulary = ['alpha', 'beta', 'gamma', 'delta', 'epsilon', 'zeta'];
    for (let d = 1; d <= 3000; d++) {
      const words = Array.from(
        { length: 1 + Math.floor(rand() * 6) },
        () => vocabulary[Math.floor(rand() * vocabulary.length)],
      );
      index.add(d * 7, '', words.join(' '));
    }
    const full = index.search(['alpha', 'beta'], { limit: 1e9 });
    for (const limit of [1, 10, 137, 1000, full.total - 1]) {
      const head = index.search(['alpha', 'beta'], { limit });
      expect(head.ids).toEqual(full.ids.slice(0, limit));
      expect(head.total).toBe(full.total);
    }
    // Many equal scores here (short documents of the same words): ties go by id.
    for (let r = 1; r < full.ids.length; r++)
      if (full.scores[r] === full.scores[r - 1])
        expect(full.ids[r]).toBeGreaterThan(full.ids[r - 1]);
  });

  it('compacting the postings changes no result, with documents added after it', () => {
    const rand = mulberry32(9);
    const vocabulary = ['wheat', 'barley', 'mill', 'invoice', 'contract', 'shipment', 'delay'];
    const docs = Array.from({ length: 700 }, () =>
      Array.from(
        { length: 1 + Math.floor(rand() * 9) },
        () => vocabulary[Math.floor(rand() * vocabulary.length)],
      ).join(' '),
    );
    const plain = new KeywordIndex();
    const packed = new KeywordIndex();
    docs.forEach((body, i) => plain.add(i + 1, '', body));
    docs.slice(0, 500).forEach((body, i) => packed.add(i + 1, '', body));
    packed.compact();
    expect(packed.uncompacted).toBe(0);
    docs.slice(500).forEach((body, i) => packed.add(i + 501, '', body));
    expect(packed.uncompacted).toBeGreaterThan(0);
    const query = ['wheat', 'mill', 'delay'];
    expect(packed.search(query, { limit: 1e9 })).toEqual(plain.search(query, { limit: 1e9 }));
    packed.compact();
    expect(packed.search(query, { limit: 1e9 })).toEqual(plain.search(query, { limit: 1e9 }));
  });

  it('allow restricts the list without changing scores', () => {
    const index = new KeywordIndex();
    index.add(1, 'wheat contract', 'the mill shipped wheat');
    index.add(2, '', 'wheat and barley');
    index.add(3, '', 'barley only');
    const all = index.search(['wheat'], { limit: 10 });
    const some = index.search(['wheat'], { limit: 10, allow: new Set([2, 3]) });
    expect(some.ids).toEqual([2]);
    expect(some.total).toBe(1);
    expect(some.scores[0]).toBe(all.scores[all.ids.indexOf(2)]);
  });

  it('replacing a document replaces its words', () => {
    const index = new KeywordIndex();
    index.add(1, '', 'invoice overdue');
    index.add(1, '', 'shipment delayed');
    expect(index.size).toBe(1);
    expect(index.search(['invoic'], { limit: 10 }).total).toBe(0);
    expect(index.search(['shipment'], { limit: 10 }).ids).toEqual([1]);
  });
});

describe('fts5 tokens', () => {
  // Folding and diacritics against FTS5's unicode61 (remove_diacritics 2) on words
  // chosen for it: accents, ligature-free Latin, Greek, digits, CJK, punctuation.
  const SAMPLES = [
    'Café Müller naïve résumé Ærøskøbing straße',
    'ΣΊΣΥΦΟΣ Ελλάδα ÅNGSTRÖM Ørsted',
    '東京 2024-11-30 v2.1 e-mail O’Brien',
    'UPPER lower MiXeD dept_42 £100 €5 x²',
  ];
  it('folds as unicode61 remove_diacritics 2 and stems as porter', () => {
    const db = ftsDatabase(SAMPLES.map((body, i) => ({ rowid: i + 1, title: '', body })));
    const fts = db
      .prepare('SELECT doc, term, offset FROM temp.fts_instances ORDER BY doc, offset')
      .all() as { doc: number; term: string }[];
    SAMPLES.forEach((text, i) =>
      expect(ftsTokens(text), text).toEqual(fts.filter((r) => r.doc === i + 1).map((r) => r.term)),
    );
    db.close();
  });

  it('raw tokens are folded but not stemmed', () => {
    expect(ftsRawTokens('Running CAFÉS')).toEqual(['running', 'cafes']);
  });
});

describe('long tokens, as FTS5 treats them', () => {
  // SQLite FTS5 itself is the reference: its porter tokenizer leaves tokens over 64 bytes
  // unstemmed, and it keeps the first 32,768 bytes of a token (FTS5_MAX_TOKEN_SIZE).
  const long = [
    { title: '', body: `${'a'.repeat(53)}connections and ${'a'.repeat(54)}connections` },
    { title: 'S'.repeat(8 * 1024 * 1024), body: 'subject line only' },
    { title: '', body: `${'1'.repeat(100_000)} digits` },
    { title: '', body: `${'é'.repeat(20_000)} ${'Ω'.repeat(17_000)}` },
  ];

  // A term shown by its head and length, so a failure prints a readable difference.
  const brief = (terms: string[]) =>
    terms.map((t) => (t.length > 70 ? `${t.slice(0, 12)}…(${t.length} chars)` : t)).sort();

  it('stems, cuts and counts them into the terms FTS5 indexes', () => {
    const db = ftsDatabase(long.map((d, i) => ({ rowid: i + 1, ...d })));
    const fts = db.prepare('SELECT doc, term FROM temp.fts_instances').all() as {
      doc: number;
      term: string;
    }[];
    long.forEach((d, i) =>
      expect(brief([...ftsTokens(d.title), ...ftsTokens(d.body)]), `document ${i + 1}`).toEqual(
        brief(fts.filter((r) => r.doc === i + 1).map((r) => r.term)),
      ),
    );
    db.close();
  });

  it('matches and scores a giant query token as FTS5 does', () => {
    const docs = long.map((d, i) => ({ rowid: i + 1, ...d }));
    const db = ftsDatabase(docs);
    const index = new KeywordIndex();
    for (const d of docs) index.add(d.rowid, d.title, d.body);
    const statement = db.prepare(
      `SELECT rowid, -bm25(documents_fts) AS score FROM documents_fts
        WHERE documents_fts MATCH ? ORDER BY bm25(documents_fts), rowid`,
    );
    for (const query of ['S'.repeat(40_000), '1'.repeat(33_000), `${'a'.repeat(54)}connections`]) {
      const { words, terms } = keywordQueryTerms(query);
      const reference = statement.all(words.map((w) => `"${w}"`).join(' OR ')) as {
        rowid: number;
        score: number;
      }[];
      expect(reference.length).toBe(1);
      const ours = index.search(terms, { limit: 10 });
      expect(ours.ids, brief(words).join(' ')).toEqual(reference.map((r) => r.rowid));
      expect(ours.scores[0]).toBeCloseTo(reference[0].score, 12);
    }
    db.close();
  });
});
