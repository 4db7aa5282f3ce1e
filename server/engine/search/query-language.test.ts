// The query language's grammar (query-language.ts): operators and precedence as Apache
// Lucene's classic query syntax writes them (Lucene "Query Parser Syntax" documentation:
// AND, OR, NOT, parentheses, "phrase", "phrase"~N, term*, field:value,
// field:[a TO b]), with NOT binding tighter than AND and AND tighter than OR (the usual
// precedence of Boolean algebra, common practice in search syntaxes).
import { describe, expect, test } from 'vitest';
import { ftsRawTokens } from './fts5-tokens';
import { parseQuery, QuerySyntaxError, textLeafToFts, type QueryNode } from './query-language';

/** A compact form of the tree: (and ..), (or ..), (not ..), leaves as typed. */
function show(node: QueryNode | null): string {
  if (!node) return '';
  switch (node.kind) {
    case 'and':
    case 'or':
      return `(${node.kind} ${node.children.map(show).join(' ')})`;
    case 'not':
      return `(not ${show(node.child)})`;
    case 'text': {
      let s = node.phrase ? `"${node.value}"` : node.value;
      if (node.slop !== null) s += `~${node.slop}`;
      if (node.prefix) s += '*';
      if (node.titleOnly) s = `subject:${s}`;
      else if (node.exact && !node.prefix) s = `exact:${s}`;
      return s;
    }
    case 'meta':
      return `${node.field}:${node.value}${node.prefix ? '*' : ''}`;
    case 'date':
      return `date:[${node.from ?? '*'} TO ${node.to ?? '*'}]`;
  }
}
const tree = (q: string) => show(parseQuery(q).root);

describe('operators', () => {
  test.each([
    ['loyalty AND credit', '(and loyalty credit)'],
    ['loyalty OR credit', '(or loyalty credit)'],
    ['sheaf NOT wendle', '(and sheaf (not wendle))'],
    ['sheaf AND NOT wendle', '(and sheaf (not wendle))'],
    ['NOT wendle', '(not wendle)'],
    ['NOT NOT wendle', '(not (not wendle))'],
    ['"loyalty credit"', '"loyalty credit"'],
    ['"price increase"~5', '"price increase"~5'],
    ['weev*', 'weev*'],
    ['"boundary lay*"', '"boundary lay"*'],
    ['exact:running', 'exact:running'],
    ['exact:"price increases"', 'exact:"price increases"'],
    ['subject:budget', 'subject:budget'],
    ['title:"board meeting"', 'subject:"board meeting"'],
    ['from:alice', 'from:alice'],
    ['to:bob cc:carol bcc:dan', '(or to:bob cc:carol bcc:dan)'],
    [
      'author:smith custodian:avery filename:memo',
      '(or author:smith custodian:avery filename:memo)',
    ],
    ['type:email control:BRK-000001', '(or type:email control:BRK-000001)'],
    ['control:BRK-0000*', 'control:BRK-0000*'],
    ['date:[2020-01-01 TO 2020-06-30]', 'date:[2020-01-01 TO 2020-06-30]'],
    ['date:[2020-01-01 TO *]', 'date:[2020-01-01 TO *]'],
    ['date:{2020-01-01 TO 2020-06-30}', 'date:[2020-01-02 TO 2020-06-29]'],
    ['date:2020-03-04', 'date:[2020-03-04 TO 2020-03-04]'],
    ['from:(alice OR bob)', '(or from:alice from:bob)'],
    ['a && b || c', '(or (and a b) c)'],
  ])('%s', (q, expected) => {
    expect(tree(q)).toBe(expected);
    expect(parseQuery(q).structured).toBe(true);
  });

  test('plain words are not structured: they keep the ranked any-word search', () => {
    for (const q of ['loyalty credit', 'the and or not', 'well-known (see above) - 10:30'])
      expect(parseQuery(q).structured).toBe(false);
    expect(tree('loyalty credit')).toBe('(or loyalty credit)');
    // Lower-case operators are words.
    expect(tree('cats and dogs')).toBe('(or cats and dogs)');
  });
});

describe('precedence and nesting', () => {
  test.each([
    // NOT binds tighter than AND, AND tighter than OR.
    ['a OR b AND c', '(or a (and b c))'],
    ['a AND b OR c', '(or (and a b) c)'],
    ['NOT a AND b', '(and (not a) b)'],
    ['a AND NOT b OR c', '(or (and a (not b)) c)'],
    ['NOT a OR b', '(or (not a) b)'],
    // Juxtaposition is OR (Lucene's default operator), the loosest.
    ['a b AND c', '(or a (and b c))'],
    ['(a OR b) AND c', '(and (or a b) c)'],
    ['a AND (b OR (c AND NOT d))', '(and a (or b (and c (not d))))'],
    ['NOT (a OR b)', '(not (or a b))'],
    ['((a))', 'a'],
    ['a AND b AND c', '(and a b c)'],
  ])('%s', (q, expected) => expect(tree(q)).toBe(expected));
});

describe('malformed queries name the problem and its 1-based position', () => {
  test.each([
    ['"loyalty credit', 'Unclosed quote', 1],
    ['a AND "b', 'Unclosed quote', 7],
    ['(a OR b', 'This ( has no matching )', 1],
    ['a OR b)', 'This ) has no matching (', 7],
    ['()', 'Empty parentheses', 1],
    ['colour:red', 'Unknown field "colour"', 1],
    ['a AND foo:bar', 'Unknown field "foo"', 7],
    ['date:2020-13-01', '"2020-13-01" is not a date', 6],
    ['date:2021-02-29', '"2021-02-29" is not a date', 6],
    ['date:[2020-01-01 TO 2020-02-30]', '"2020-02-30" is not a date', 21],
    ['date:[2020-06-30 TO 2020-01-01]', 'The range starts after it ends', 6],
    ['date:[2020-01-01 2020-06-30]', 'A range is written', 6],
    ['date:[2020-01-01 TO 2020-06-30', 'Unclosed range', 6],
    ['from:[2020-01-01 TO 2020-06-30]', 'Ranges work on date: only', 6],
    ['""', 'Empty phrase', 1],
    ['a OR "  "', 'Empty phrase', 6],
    ['"?!"', 'no letters or digits', 1],
    ['a AND', 'AND needs a term on its right', 3],
    ['AND a', 'AND needs a term on its left', 1],
    ['a OR OR b', 'OR needs a term on its right', 3],
    ['NOT', 'NOT needs a term on its right', 1],
    ['a NOT', 'NOT needs a term on its right', 3],
    ['from:', 'The field from: needs a value', 1],
    ['from: alice', 'The field from: needs a value', 1],
    ['from:AND', 'needs a value, not the operator AND', 6],
    ['"a b"~', 'Proximity needs a number', 6],
    ['"a b"~5000', 'Proximity can be at most', 6],
    ['from:"a b"~3', 'Proximity (~) works on text', 6],
    ['w*rd', 'Only a trailing wildcard', 2],
    ['*', 'Only a trailing wildcard', 1],
    ['a*', 'at least 2 characters', 1],
    ['colour~', 'Fuzzy matching (colour~) is not supported', 7],
    ['subject:(from:a)', 'cannot be used inside subject:', 10],
  ])('%s', (q, message, position) => {
    let caught: unknown;
    try {
      parseQuery(q);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(QuerySyntaxError);
    const error = caught as QuerySyntaxError;
    expect(error.message).toContain(message);
    expect(error.position).toBe(position);
    expect(error.message).toContain(`(at character ${position})`);
  });
});

describe('FTS5 expressions are built from tokens only', () => {
  const fts = (q: string) => {
    const root = parseQuery(q).root!;
    if (root.kind !== 'text') throw new Error('not a text leaf');
    return textLeafToFts(root, ftsRawTokens);
  };
  test.each([
    ['"price increase"', '"price" + "increase"'],
    ['"price increase"~5', 'NEAR("price" "increase", 5)'],
    ['weev*', '"weev" *'],
    ['subject:budget', 'title : ("budget")'],
    // FTS5 syntax typed inside a phrase stays words.
    ['"NEAR(a* OR b) : c"', '"near" + "a" + "or" + "b" + "c"'],
    ['e-mail', '"e" + "mail"'],
  ])('%s -> %s', (q, expected) => expect(fts(q)).toBe(expected));
});
