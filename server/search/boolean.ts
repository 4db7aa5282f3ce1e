// The match set of a query written in the query language (server/engine/search/
// query-language.ts): the documents that satisfy it. Each text leaf (word, phrase,
// proximity, wildcard, subject:) runs as one SQLite FTS5 MATCH over documents_fts (Porter
// stemmed) or documents_fts_exact (words as written: exact: and every wildcard); each
// metadata leaf (from:, custodian:, date:...) is one SQL condition on documents; AND, OR
// and NOT combine the leaves' sets. NOT is "every searchable document of the matter
// except", so a query may start with NOT.
import type SQLite from 'better-sqlite3';
import {
  ftsRawTokens,
  keywordQueryTerms,
  parseQuery,
  porterStem,
  positiveLeaves,
  QuerySyntaxError,
  shiftDay,
  textLeafToFts,
  type DateLeaf,
  type MetaLeaf,
  type ParsedQuery,
  type QueryNode,
  type TextLeaf,
} from '../engine/index';
import { validationError } from '../http/errors';

/** Parses a search query, turning a syntax error into a 400 naming it and its position. */
export function parseSearchQuery(query: string, field = 'query'): ParsedQuery {
  try {
    return parseQuery(query);
  } catch (error) {
    if (error instanceof QuerySyntaxError) throw validationError(field, error.message);
    throw error;
  }
}

const statements = new WeakMap<SQLite.Database, Map<string, SQLite.Statement>>();
function prepared(sqlite: SQLite.Database, text: string): SQLite.Statement {
  let cache = statements.get(sqlite);
  if (!cache) statements.set(sqlite, (cache = new Map()));
  let stmt = cache.get(text);
  if (!stmt) {
    stmt = sqlite.prepare(text).pluck(true);
    cache.set(text, stmt);
  }
  return stmt;
}

const SEARCHABLE = `d.matter_id = ? AND d.extract_status = 'extracted'`;

/** LIKE pattern for a value anywhere in the text (case-insensitive for ASCII, as LIKE is). */
const containing = (value: string) => `%${value.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
const startingWith = (value: string) => `${value.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

function metaCondition(leaf: MetaLeaf): { where: string; params: string[] } {
  const like = containing(leaf.value);
  switch (leaf.field) {
    case 'from':
    case 'to':
    case 'cc':
    case 'bcc':
      return { where: `d.email_${leaf.field} LIKE ? ESCAPE '\\'`, params: [like] };
    case 'author':
      return {
        where: `(d.author LIKE ? ESCAPE '\\' OR d.last_author LIKE ? ESCAPE '\\')`,
        params: [like, like],
      };
    case 'filename':
      return { where: `d.original_name LIKE ? ESCAPE '\\'`, params: [like] };
    case 'custodian':
      // Every custodian who held a copy (document_custodians), not only the first.
      return {
        where: `EXISTS (SELECT 1 FROM document_custodians dc JOIN custodians c ON c.id = dc.custodian_id
                 WHERE dc.document_id = d.id AND c.name LIKE ? ESCAPE '\\')`,
        params: [like],
      };
    case 'type':
      return leaf.prefix
        ? { where: `d.doc_type LIKE ? ESCAPE '\\'`, params: [startingWith(leaf.value)] }
        : { where: `d.doc_type = ? COLLATE NOCASE`, params: [leaf.value] };
    case 'control':
      return leaf.prefix
        ? { where: `d.control_number LIKE ? ESCAPE '\\'`, params: [startingWith(leaf.value)] }
        : { where: `d.control_number = ? COLLATE NOCASE`, params: [leaf.value] };
  }
}

/** A document's date: its own (sent) date, else its family's (an attachment's e-mail). */
export const DOCUMENT_DATE_SQL = 'COALESCE(d.sent_at, d.family_date)';

function dateCondition(leaf: DateLeaf): { where: string; params: string[] } {
  const parts = [`${DOCUMENT_DATE_SQL} IS NOT NULL`];
  const params: string[] = [];
  if (leaf.from) {
    parts.push(`${DOCUMENT_DATE_SQL} >= ?`);
    params.push(leaf.from);
  }
  if (leaf.to) {
    parts.push(`${DOCUMENT_DATE_SQL} < ?`);
    params.push(shiftDay(leaf.to, 1));
  }
  return { where: parts.join(' AND '), params };
}

export class MatchSetEvaluator {
  private universe: Set<number> | null = null;

  constructor(
    private readonly sqlite: SQLite.Database,
    private readonly matterId: number,
  ) {}

  /** Every searchable (extracted) document of the matter. */
  all(): Set<number> {
    this.universe ??= new Set(
      prepared(this.sqlite, `SELECT d.id FROM documents d WHERE ${SEARCHABLE}`).all(
        this.matterId,
      ) as number[],
    );
    return this.universe;
  }

  text(leaf: TextLeaf): Set<number> {
    const table = leaf.exact ? 'documents_fts_exact' : 'documents_fts';
    let match: string;
    try {
      match = textLeafToFts(leaf, ftsRawTokens);
    } catch (error) {
      if (error instanceof QuerySyntaxError) throw validationError('query', error.message);
      throw error;
    }
    return new Set(
      prepared(
        this.sqlite,
        `SELECT f.rowid FROM ${table} f JOIN documents d ON d.id = f.rowid
          WHERE ${table} MATCH ? AND ${SEARCHABLE}`,
      ).all(match, this.matterId) as number[],
    );
  }

  private condition(where: string, params: string[]): Set<number> {
    return new Set(
      prepared(this.sqlite, `SELECT d.id FROM documents d WHERE ${SEARCHABLE} AND ${where}`).all(
        this.matterId,
        ...params,
      ) as number[],
    );
  }

  evaluate(node: QueryNode): Set<number> {
    switch (node.kind) {
      case 'text':
        return this.text(node);
      case 'meta': {
        const { where, params } = metaCondition(node);
        return this.condition(where, params);
      }
      case 'date': {
        const { where, params } = dateCondition(node);
        return this.condition(where, params);
      }
      case 'not': {
        const excluded = this.evaluate(node.child);
        const out = new Set<number>();
        for (const id of this.all()) if (!excluded.has(id)) out.add(id);
        return out;
      }
      case 'or': {
        const out = new Set<number>();
        for (const child of node.children) for (const id of this.evaluate(child)) out.add(id);
        return out;
      }
      case 'and': {
        const positive = node.children.filter((c) => c.kind !== 'not');
        const negative = node.children.flatMap((c) => (c.kind === 'not' ? [c.child] : []));
        let out: Set<number>;
        if (positive.length === 0) out = new Set(this.all());
        else {
          const sets = positive.map((c) => this.evaluate(c)).sort((a, b) => a.size - b.size);
          out = sets[0];
          for (const s of sets.slice(1)) {
            const next = new Set<number>();
            for (const id of out) if (s.has(id)) next.add(id);
            out = next;
            if (out.size === 0) return out;
          }
          if (sets.length === 1) out = new Set(out);
        }
        for (const child of negative) {
          if (out.size === 0) break;
          for (const id of this.evaluate(child)) out.delete(id);
        }
        return out;
      }
    }
  }
}

/**
 * The documents a query matches. Plain words (no operator) match every document holding
 * any of them, English stop words dropped as keyword search drops them; a structured
 * query matches what its Boolean expression says.
 */
export function matchSetOf(
  sqlite: SQLite.Database,
  matterId: number,
  parsed: ParsedQuery,
  query: string,
  evaluator = new MatchSetEvaluator(sqlite, matterId),
): Set<number> {
  if (parsed.root === null) return new Set();
  if (parsed.structured) return evaluator.evaluate(parsed.root);
  const { words } = keywordQueryTerms(query);
  const out = new Set<number>();
  for (const word of words) {
    const leaf: TextLeaf = {
      kind: 'text',
      value: word,
      phrase: false,
      prefix: false,
      slop: null,
      exact: false,
      titleOnly: false,
      position: 1,
    };
    for (const id of evaluator.text(leaf)) out.add(id);
  }
  return out;
}

/** Most indexed terms one wildcard adds to the ranking (the match set is not limited). */
const WILDCARD_RANK_TERMS = 64;

export interface BooleanRanking {
  /** The documents that satisfy the query (and the filters). */
  matches: Set<number>;
  /** The positive words as text (for the concept vector). */
  text: string;
  /** Stems of the positive words (highlighting). */
  stems: string[];
  /** The keyword index terms that rank the hits (wildcards expanded over the index). */
  rankTerms(index: { termsStartingWith(prefix: string, max: number): string[] }): string[];
  /** The list followed by every match it lacks (score 0, load order), at most `cap`. */
  complete<T extends { id: number; score: number }>(list: T[], cap: number): T[];
}

/** A structured query's match set (within `allowIds` when the filters restrict). */
export function booleanRanking(
  sqlite: SQLite.Database,
  matterId: number,
  parsed: ParsedQuery,
  allowIds: number[] | null,
): BooleanRanking {
  let matches = matchSetOf(sqlite, matterId, parsed, '');
  if (allowIds) {
    const allow = new Set(allowIds);
    matches = new Set([...matches].filter((id) => allow.has(id)));
  }
  const leaves = positiveLeaves(parsed.root);
  const words = leaves.filter((l) => !l.prefix).flatMap((l) => ftsRawTokens(l.value));
  const stems = words.map(porterStem);
  return {
    matches,
    text: leaves.map((l) => l.value).join(' '),
    stems: [...new Set(stems)],
    rankTerms(index) {
      const out = [...stems];
      for (const leaf of leaves) {
        if (!leaf.prefix) continue;
        const tokens = ftsRawTokens(leaf.value);
        out.push(...tokens.slice(0, -1).map(porterStem));
        const last = tokens.at(-1);
        if (last) out.push(...index.termsStartingWith(last, WILDCARD_RANK_TERMS));
      }
      return out;
    },
    complete(list, cap) {
      const seen = new Set(list.map((h) => h.id));
      const rest = [...matches].filter((id) => !seen.has(id)).sort((a, b) => a - b);
      const out = list.slice(0, cap);
      for (const id of rest) {
        if (out.length >= cap) break;
        out.push({ id, score: 0 } as (typeof list)[number]);
      }
      return out;
    },
  };
}
