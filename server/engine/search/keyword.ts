// Keyword search over SQLite FTS5 with its bm25 ranking (Robertson & Zaragoza 2009,
// "The probabilistic relevance framework: BM25 and beyond"; SQLite FTS5 docs,
// section "The bm25() function"). User text never reaches FTS5 as syntax: each
// token becomes a quoted string (FTS5 "strings"), joined with OR.
import type BetterSqlite3 from 'better-sqlite3';
import { isStopWord, tokenize } from '../text/analyzer';

/** The DDL the server uses (migrations/2026_12_01_0001_initial.ts); the eval builds the same. */
export const KEYWORD_TABLES_DDL = [
  `CREATE TABLE document_texts (
     document_id INTEGER PRIMARY KEY,
     title TEXT NOT NULL DEFAULT '',
     body TEXT NOT NULL DEFAULT ''
   )`,
  `CREATE VIRTUAL TABLE documents_fts USING fts5(
     title, body,
     content='document_texts', content_rowid='document_id',
     tokenize='porter unicode61 remove_diacritics 2'
   )`,
  `CREATE TRIGGER document_texts_ai AFTER INSERT ON document_texts BEGIN
     INSERT INTO documents_fts(rowid, title, body) VALUES (new.document_id, new.title, new.body);
   END`,
  // Words as written (migrations/2026_12_04_1200_exact_words_index.ts).
  `CREATE VIRTUAL TABLE documents_fts_exact USING fts5(
     title, body,
     content='document_texts', content_rowid='document_id',
     tokenize='unicode61 remove_diacritics 2', prefix='2 3'
   )`,
  `CREATE TRIGGER document_texts_exact_ai AFTER INSERT ON document_texts BEGIN
     INSERT INTO documents_fts_exact(rowid, title, body) VALUES (new.document_id, new.title, new.body);
   END`,
];

/** At most this many distinct tokens go into one MATCH expression (bounds query cost). */
export const MAX_MATCH_TOKENS = 64;

/**
 * A safe FTS5 MATCH expression for any user text: the distinct letter/digit tokens,
 * each double-quoted (an embedded quote doubled, per FTS5 string syntax), joined by
 * OR. English stop words are dropped unless nothing else is left. Returns null when
 * the text has no token at all.
 */
export function toFtsMatchExpression(text: string): string | null {
  const tokens = [...new Set(tokenize(text))];
  if (tokens.length === 0) return null;
  const content = tokens.filter((t) => !isStopWord(t));
  const chosen = (content.length > 0 ? content : tokens).slice(0, MAX_MATCH_TOKENS);
  return chosen.map((t) => `"${t.replaceAll('"', '""')}"`).join(' OR ');
}

export interface KeywordHit {
  documentId: number;
  /** -bm25: higher is better. */
  score: number;
}

export interface KeywordSearchOptions {
  limit?: number;
  /** Restrict to one matter (joins the server's documents table). */
  matterId?: number;
  /** bm25 column weights (title, body); default 1, 1. */
  titleWeight?: number;
  bodyWeight?: number;
}

const statements = new WeakMap<BetterSqlite3.Database, Map<string, BetterSqlite3.Statement>>();

function prepared(db: BetterSqlite3.Database, sql: string): BetterSqlite3.Statement {
  let cache = statements.get(db);
  if (!cache) {
    cache = new Map();
    statements.set(db, cache);
  }
  let stmt = cache.get(sql);
  if (!stmt) {
    stmt = db.prepare(sql);
    cache.set(sql, stmt);
  }
  return stmt;
}

/** Runs a keyword query; best first. Empty when the text has no token. */
export function keywordSearch(
  db: BetterSqlite3.Database,
  text: string,
  options: KeywordSearchOptions = {},
): KeywordHit[] {
  const match = toFtsMatchExpression(text);
  if (match === null) return [];
  const limit = options.limit ?? 1000;
  const tw = options.titleWeight ?? 1;
  const bw = options.bodyWeight ?? 1;
  if (!(tw >= 0 && bw >= 0)) throw new RangeError('bm25 column weights must be 0 or more');
  // bm25() takes its column weights as SQL literals here: numbers we checked, never user text.
  const bm25 = `bm25(documents_fts, ${Number(tw)}, ${Number(bw)})`;
  if (options.matterId !== undefined) {
    return prepared(
      db,
      `SELECT documents_fts.rowid AS documentId, -${bm25} AS score
         FROM documents_fts JOIN documents d ON d.id = documents_fts.rowid
        WHERE documents_fts MATCH ? AND d.matter_id = ?
        ORDER BY ${bm25} LIMIT ?`,
    ).all(match, options.matterId, limit) as KeywordHit[];
  }
  return prepared(
    db,
    `SELECT rowid AS documentId, -${bm25} AS score FROM documents_fts
      WHERE documents_fts MATCH ? ORDER BY ${bm25} LIMIT ?`,
  ).all(match, limit) as KeywordHit[];
}
