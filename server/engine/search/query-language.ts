// Quarry's keyword query language: a recursive-descent parser (no regular expressions
// over the whole query) for the operators of Apache Lucene's classic query syntax
// ("Query Parser Syntax", Lucene 9 documentation) that review teams write in negotiated
// search terms:
//
//   query    := or EOF
//   or       := and ( [OR] and )*          juxtaposition is OR, Lucene's default operator
//   and      := unary ( (AND | NOT) unary )*   infix "a NOT b" reads as "a AND NOT b"
//   unary    := NOT unary | primary
//   primary  := '(' or ')' | field ':' value | "phrase" [~N] | word[*]
//   value    := '(' or ')' | "phrase" [~N] | word[*] | '[' date TO date ']'
//
// So NOT binds tighter than AND, AND tighter than OR. Operators are upper case only;
// "and", "or", "not" are words. Fields: from, to, cc, bcc, subject (alias title),
// author, custodian, filename, type, date, control, and `exact:` (no stemming: the
// exact word forms, e.g. exact:running or exact:"price increases").
// Positions in errors are 1-based characters of the query as typed.

export const QUERY_FIELDS = [
  'from',
  'to',
  'cc',
  'bcc',
  'subject',
  'title',
  'author',
  'custodian',
  'filename',
  'type',
  'date',
  'control',
  'exact',
] as const;
export type QueryField = (typeof QUERY_FIELDS)[number];
/** Fields matched against document metadata (not the text index). */
export type MetaField = Exclude<QueryField, 'subject' | 'title' | 'exact' | 'date'>;

/** Proximity above this many words is refused (a NEAR that wide is no longer "near"). */
export const MAX_SLOP = 1000;
/** A trailing wildcard needs at least this many characters before the star. */
export const MIN_PREFIX_LENGTH = 2;

export type QueryNode =
  | { kind: 'and'; children: QueryNode[] }
  | { kind: 'or'; children: QueryNode[] }
  | { kind: 'not'; child: QueryNode }
  | TextLeaf
  | MetaLeaf
  | DateLeaf;

/** Words, a phrase or a prefix searched in the text index. */
export interface TextLeaf {
  kind: 'text';
  /** The text as typed (a word, or a phrase's inside). */
  value: string;
  phrase: boolean;
  /** Trailing `*`. */
  prefix: boolean;
  /** `"a b"~N`: the words within N words of each other, any order. */
  slop: number | null;
  /** No stemming (exact: field, and every wildcard). */
  exact: boolean;
  /** subject:/title: searches the title column only. */
  titleOnly: boolean;
  position: number;
}

export interface MetaLeaf {
  kind: 'meta';
  field: MetaField;
  value: string;
  prefix: boolean;
  position: number;
}

export interface DateLeaf {
  kind: 'date';
  /** Inclusive ISO days; null is open. */
  from: string | null;
  to: string | null;
  position: number;
}

export class QuerySyntaxError extends Error {
  override name = 'QuerySyntaxError';
  constructor(
    message: string,
    /** 1-based character position. */
    readonly position: number,
  ) {
    super(`${message} (at character ${position})`);
  }
}

type Token =
  | { type: 'lparen' | 'rparen' | 'and' | 'or' | 'not'; pos: number }
  | { type: 'word'; text: string; pos: number }
  | { type: 'phrase'; text: string; slop: number | null; pos: number }
  | { type: 'field'; name: string; pos: number }
  | { type: 'range'; from: string; to: string; pos: number };

const isSpace = (c: string) => c === ' ' || c === '\t' || c === '\n' || c === '\r' || c === '\f';
const isFieldChar = (c: string) => (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');
const isDigit = (c: string) => c >= '0' && c <= '9';

function readDigits(q: string, at: number): { value: string; end: number } {
  let end = at;
  while (end < q.length && isDigit(q[end])) end++;
  return { value: q.slice(at, end), end };
}

/** Splits the query into tokens, scanning character by character. */
export function lexQuery(q: string): Token[] {
  const tokens: Token[] = [];
  let i = 0;
  while (i < q.length) {
    const c = q[i];
    if (isSpace(c)) {
      i++;
      continue;
    }
    const pos = i + 1;
    if (c === '(') {
      tokens.push({ type: 'lparen', pos });
      i++;
      continue;
    }
    if (c === ')') {
      tokens.push({ type: 'rparen', pos });
      i++;
      continue;
    }
    if (c === '"') {
      const close = q.indexOf('"', i + 1);
      if (close < 0)
        throw new QuerySyntaxError('Unclosed quote: this phrase has no closing "', pos);
      const text = q.slice(i + 1, close);
      i = close + 1;
      let slop: number | null = null;
      if (q[i] === '~') {
        const { value, end } = readDigits(q, i + 1);
        if (value === '')
          throw new QuerySyntaxError(
            'Proximity needs a number of words after ~, e.g. "price increase"~5',
            i + 1,
          );
        slop = Number(value);
        if (slop > MAX_SLOP)
          throw new QuerySyntaxError(`Proximity can be at most ~${MAX_SLOP} words`, i + 1);
        i = end;
      }
      tokens.push({ type: 'phrase', text, slop, pos });
      continue;
    }
    if (c === '[' || c === '{') {
      tokens.push(lexRange(q, i));
      i = q.indexOf(c === '[' ? ']' : '}', i) + 1;
      continue;
    }
    // A word: up to whitespace, a parenthesis or a quote.
    let end = i;
    while (end < q.length && !isSpace(q[end]) && !'()"'.includes(q[end])) end++;
    let word = q.slice(i, end);
    // field:value — a name of letters, a colon, and the value right after it.
    let n = 0;
    while (n < word.length && isFieldChar(word[n])) n++;
    if (n > 0 && word[n] === ':') {
      tokens.push({ type: 'field', name: word.slice(0, n), pos });
      i += n + 1;
      if (i >= q.length || isSpace(q[i]))
        throw new QuerySyntaxError(`The field ${word.slice(0, n)}: needs a value`, pos);
      continue;
    }
    if (word === 'AND' || word === 'OR' || word === 'NOT') {
      tokens.push({ type: word === 'AND' ? 'and' : word === 'OR' ? 'or' : 'not', pos });
    } else {
      // "&&" and "||" are Lucene's spellings of AND and OR.
      if (word === '&&') tokens.push({ type: 'and', pos });
      else if (word === '||') tokens.push({ type: 'or', pos });
      else {
        if (/* fuzzy */ word.length > 1 && word.includes('~') && /\p{L}|\p{N}/u.test(word[0])) {
          word = word.slice(0, word.indexOf('~'));
          throw new QuerySyntaxError(
            `Fuzzy matching (${word}~) is not supported; use a wildcard (${word}*) or list the spellings with OR`,
            pos + word.length,
          );
        }
        // Punctuation alone (a dash, a bullet) separates words, as the tokenizer treats it.
        if (/[\p{L}\p{N}*]/u.test(word)) tokens.push({ type: 'word', text: word, pos });
      }
    }
    i = end;
  }
  return tokens;
}

const ISO_DAY = /^\d{4}-\d{2}-\d{2}$/;

function checkDay(value: string, pos: number): string | null {
  if (value === '*') return null;
  const real =
    ISO_DAY.test(value) &&
    !Number.isNaN(Date.parse(`${value}T00:00:00Z`)) &&
    new Date(`${value}T00:00:00Z`).toISOString().slice(0, 10) === value;
  if (!real) throw new QuerySyntaxError(`"${value}" is not a date: write dates as YYYY-MM-DD`, pos);
  return value;
}

function lexRange(q: string, at: number): Token {
  const open = q[at];
  const closeChar = open === '[' ? ']' : '}';
  const close = q.indexOf(closeChar, at);
  if (close < 0)
    throw new QuerySyntaxError(`Unclosed range: this ${open} has no closing ${closeChar}`, at + 1);
  const inside = q.slice(at + 1, close);
  const parts = inside.trim().split(/\s+/);
  if (parts.length !== 3 || parts[1] !== 'TO')
    throw new QuerySyntaxError(
      'A range is written [YYYY-MM-DD TO YYYY-MM-DD] (TO in capitals; * for an open end)',
      at + 1,
    );
  const fromAt = at + 2 + inside.indexOf(parts[0]);
  const toAt = at + 2 + inside.lastIndexOf(parts[2]);
  let from = checkDay(parts[0], fromAt);
  let to = checkDay(parts[2], toAt);
  // {a TO b} excludes its ends (Lucene): the day after a, the day before b.
  if (open === '{') {
    if (from) from = shiftDay(from, 1);
    if (to) to = shiftDay(to, -1);
  }
  if (from && to && from > to) throw new QuerySyntaxError('The range starts after it ends', at + 1);
  return { type: 'range', from: from ?? '*', to: to ?? '*', pos: at + 1 };
}

export function shiftDay(day: string, by: number): string {
  const d = new Date(`${day}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + by);
  return d.toISOString().slice(0, 10);
}

interface Scope {
  field: QueryField | null;
  fieldPos: number;
}

class Parser {
  private at = 0;
  /** True once anything beyond plain words (an operator, a phrase, a field...) is seen. */
  structured = false;

  constructor(
    private readonly tokens: Token[],
    private readonly length: number,
  ) {}

  private peek(): Token | undefined {
    return this.tokens[this.at];
  }

  private endPos(): number {
    return this.length + 1;
  }

  parse(): QueryNode | null {
    if (this.tokens.length === 0) return null;
    const node = this.or({ field: null, fieldPos: 0 }, 0);
    const next = this.peek();
    if (next) {
      if (next.type === 'rparen') throw new QuerySyntaxError('This ) has no matching (', next.pos);
      throw new QuerySyntaxError('Unexpected text', next.pos);
    }
    return node;
  }

  private startsPrimary(t: Token | undefined): boolean {
    return (
      t !== undefined &&
      (t.type === 'lparen' ||
        t.type === 'word' ||
        t.type === 'phrase' ||
        t.type === 'field' ||
        t.type === 'range')
    );
  }

  private or(scope: Scope, depth: number): QueryNode {
    const children = [this.and(scope, depth)];
    for (;;) {
      const t = this.peek();
      if (t?.type === 'or') {
        this.structured = true;
        this.at++;
        if (!this.startsPrimary(this.peek()) && this.peek()?.type !== 'not')
          throw new QuerySyntaxError('OR needs a term on its right', t.pos);
        children.push(this.and(scope, depth));
      } else if (this.startsPrimary(t)) {
        children.push(this.and(scope, depth));
      } else break;
    }
    return children.length === 1 ? children[0] : { kind: 'or', children: flatten('or', children) };
  }

  private and(scope: Scope, depth: number): QueryNode {
    const first = this.peek();
    if (first?.type === 'and' || first?.type === 'or')
      throw new QuerySyntaxError(`${first.type.toUpperCase()} needs a term on its left`, first.pos);
    const children = [this.unary(scope, depth)];
    for (;;) {
      const t = this.peek();
      if (t?.type === 'and') {
        this.structured = true;
        this.at++;
        const next = this.peek();
        if (!this.startsPrimary(next) && next?.type !== 'not')
          throw new QuerySyntaxError('AND needs a term on its right', t.pos);
        children.push(this.unary(scope, depth));
      } else if (t?.type === 'not') {
        // "a NOT b": a, and not b.
        this.structured = true;
        this.at++;
        if (!this.startsPrimary(this.peek()) && this.peek()?.type !== 'not')
          throw new QuerySyntaxError('NOT needs a term on its right', t.pos);
        children.push({ kind: 'not', child: this.unary(scope, depth) });
      } else break;
    }
    return children.length === 1
      ? children[0]
      : { kind: 'and', children: flatten('and', children) };
  }

  private unary(scope: Scope, depth: number): QueryNode {
    const t = this.peek();
    if (t?.type === 'not') {
      this.structured = true;
      this.at++;
      if (!this.startsPrimary(this.peek()) && this.peek()?.type !== 'not')
        throw new QuerySyntaxError('NOT needs a term on its right', t.pos);
      return { kind: 'not', child: this.unary(scope, depth) };
    }
    return this.primary(scope, depth);
  }

  private primary(scope: Scope, depth: number): QueryNode {
    const t = this.peek();
    if (!t) throw new QuerySyntaxError('The query ends where a term was expected', this.endPos());
    if (depth > 50) throw new QuerySyntaxError('Parentheses are nested too deeply', t.pos);
    switch (t.type) {
      case 'lparen': {
        this.at++;
        const inner = this.peek();
        if (inner?.type === 'rparen')
          throw new QuerySyntaxError('Empty parentheses: put a term inside', t.pos);
        if (!inner) throw new QuerySyntaxError('This ( has no matching )', t.pos);
        const node = this.or(scope, depth + 1);
        const close = this.peek();
        if (close?.type !== 'rparen') throw new QuerySyntaxError('This ( has no matching )', t.pos);
        this.at++;
        return node;
      }
      case 'field': {
        this.structured = true;
        this.at++;
        const name = t.name.toLowerCase();
        if (!(QUERY_FIELDS as readonly string[]).includes(name))
          throw new QuerySyntaxError(
            `Unknown field "${t.name}" (fields: ${QUERY_FIELDS.join(', ')}); to search the word itself, put it in quotes`,
            t.pos,
          );
        if (scope.field !== null)
          throw new QuerySyntaxError(
            `The field ${name}: cannot be used inside ${scope.field}:( )`,
            t.pos,
          );
        const value = this.peek();
        if (!value || value.type === 'rparen' || value.type === 'field')
          throw new QuerySyntaxError(`The field ${name}: needs a value`, t.pos);
        if (value.type === 'and' || value.type === 'or' || value.type === 'not')
          throw new QuerySyntaxError(
            `The field ${name}: needs a value, not the operator ${value.type.toUpperCase()}`,
            value.pos,
          );
        const inner: Scope = { field: name as QueryField, fieldPos: t.pos };
        if (value.type === 'range' && name !== 'date')
          throw new QuerySyntaxError(`Ranges work on date: only, not on ${name}:`, value.pos);
        return this.primary(inner, depth);
      }
      case 'range': {
        this.at++;
        if (scope.field !== 'date')
          throw new QuerySyntaxError(
            'A range needs a field, as in date:[2020-01-01 TO 2020-06-30]',
            t.pos,
          );
        return {
          kind: 'date',
          from: t.from === '*' ? null : t.from,
          to: t.to === '*' ? null : t.to,
          position: scope.fieldPos,
        };
      }
      case 'phrase': {
        this.structured = true;
        this.at++;
        if (t.text.trim() === '')
          throw new QuerySyntaxError('Empty phrase: put words between the quotes', t.pos);
        // "boundary lay*": the last word of a phrase may be a prefix (FTS5 allows it).
        let text = t.text.trimEnd();
        const prefix = text.endsWith('*') && t.slop === null;
        if (prefix) text = text.slice(0, -1);
        // Any other * inside quotes is punctuation, as the tokenizer reads it.
        return this.leaf(scope, text, true, prefix, t.slop, t.pos);
      }
      case 'word': {
        this.at++;
        let text = t.text;
        let prefix = false;
        const star = text.indexOf('*');
        if (star >= 0) {
          this.structured = true;
          if (star !== text.length - 1 || text.length === 1 || text.slice(0, -1).includes('*'))
            throw new QuerySyntaxError(
              'Only a trailing wildcard is supported (e.g. contract*)',
              t.pos + star,
            );
          text = text.slice(0, -1);
          prefix = true;
          if ([...text].length < MIN_PREFIX_LENGTH)
            throw new QuerySyntaxError(
              `A wildcard needs at least ${MIN_PREFIX_LENGTH} characters before the *`,
              t.pos,
            );
        }
        return this.leaf(scope, text, false, prefix, null, t.pos);
      }
      default:
        throw new QuerySyntaxError(`${t.type.toUpperCase()} needs a term on its left`, t.pos);
    }
  }

  private leaf(
    scope: Scope,
    value: string,
    phrase: boolean,
    prefix: boolean,
    slop: number | null,
    pos: number,
  ): QueryNode {
    const field = scope.field;
    if (field === 'date') {
      if (phrase || prefix)
        throw new QuerySyntaxError('date: takes a day (YYYY-MM-DD) or a range [.. TO ..]', pos);
      const day = checkDay(value, pos);
      if (day === null) return { kind: 'date', from: null, to: null, position: scope.fieldPos };
      return { kind: 'date', from: day, to: day, position: scope.fieldPos };
    }
    if (field !== null && field !== 'subject' && field !== 'title' && field !== 'exact') {
      if (slop !== null)
        throw new QuerySyntaxError(`Proximity (~) works on text, not on ${field}:`, pos);
      return { kind: 'meta', field, value, prefix, position: scope.fieldPos || pos };
    }
    if (!/[\p{L}\p{N}]/u.test(value))
      throw new QuerySyntaxError(
        phrase
          ? 'This phrase has no letters or digits to search for'
          : `"${value}" has no letters or digits to search for`,
        pos,
      );
    return {
      kind: 'text',
      value,
      phrase,
      prefix,
      slop,
      // A wildcard expands over the words as written, so it is always unstemmed.
      exact: field === 'exact' || prefix,
      titleOnly: field === 'subject' || field === 'title',
      position: pos,
    };
  }
}

function flatten(kind: 'and' | 'or', children: QueryNode[]): QueryNode[] {
  return children.flatMap((c) => (c.kind === kind ? c.children : [c]));
}

export interface ParsedQuery {
  /** null for a query with no token at all. */
  root: QueryNode | null;
  /**
   * False for plain words (no operator, phrase, wildcard, field): those keep the ranked
   * any-word search. True makes the query a Boolean filter.
   */
  structured: boolean;
}

/** Parses a query; throws QuerySyntaxError naming the problem and its position. */
export function parseQuery(query: string): ParsedQuery {
  const tokens = lexQuery(query);
  const parser = new Parser(tokens, query.length);
  const root = parser.parse();
  return { root, structured: parser.structured };
}

/** The text leaves not under a NOT: the words that rank a Boolean query's hits. */
export function positiveLeaves(node: QueryNode | null, negated = false): TextLeaf[] {
  if (!node) return [];
  switch (node.kind) {
    case 'and':
    case 'or':
      return node.children.flatMap((c) => positiveLeaves(c, negated));
    case 'not':
      return positiveLeaves(node.child, !negated);
    case 'text':
      return negated ? [] : [node];
    default:
      return [];
  }
}

const ftsString = (token: string) => `"${token.replaceAll('"', '""')}"`;

/**
 * A text leaf as an FTS5 MATCH expression (SQLite FTS5 docs, section 3 "Full-text
 * Query Syntax"). Only tokens the caller's tokenizer function produced are written, each
 * as a quoted FTS5 string, so no user text is read as FTS5 syntax. `tokens` splits
 * text as the FTS5 tokenizer does (fts5-tokens.ts, ftsRawTokens).
 */
export function textLeafToFts(leaf: TextLeaf, tokens: (text: string) => string[]): string {
  const words = tokens(leaf.value);
  if (words.length === 0) throw new QuerySyntaxError('Nothing searchable here', leaf.position);
  let expression: string;
  if (leaf.slop !== null && words.length > 1) {
    // NEAR(a b, N): the words within N tokens of each other, in any order.
    expression = `NEAR(${words.map(ftsString).join(' ')}, ${leaf.slop})`;
  } else {
    // A phrase, or a word the tokenizer splits (e-mail): the tokens in sequence.
    expression = words.map(ftsString).join(' + ');
    if (leaf.prefix) expression += ' *';
  }
  return leaf.titleOnly ? `title : (${expression})` : expression;
}
