// The keyword tokens of a text as SQLite FTS5 makes them with the documents_fts
// tokenizer `porter unicode61 remove_diacritics 2` (SQLite FTS5 docs, section 4.3
// "Tokenizers"), so Quarry's in-memory keyword index (keyword-index.ts) matches the
// words FTS5 matches:
//  - unicode61: a token is a run of characters in the Unicode categories L*, N* and
//    Co, which may carry combining marks; everything else separates tokens. Tokens are
//    lower-cased and, with remove_diacritics 2, stripped of diacritics.
//  - porter: tokens of 3 to 64 bytes are Porter-stemmed (Porter 1980); shorter or
//    longer ones pass through unchanged.
//  - a token is stored (and queried) as its first 32,768 bytes (FTS5_MAX_TOKEN_SIZE;
//    ../text/token-limits.ts).
// Checked against FTS5 itself (fts5vocab) on Cranfield in keyword-index.test.ts.
// JavaScript's Unicode tables are newer than FTS5's (Unicode 6.1), so a character
// added to Unicode since then may split tokens differently.
import PorterStemmer from 'natural/lib/natural/stemmers/porter_stemmer';
import { capToken, PORTER_MAX_BYTES, TOKEN_MAX_BYTES } from '../text/token-limits';

const ASCII_TOKEN = /^[\x21-\x7e]*$/;
const LATIN_MARKS = /(\p{Script=Latin})\p{M}+/gu;
const PORTER_MIN_BYTES = 3;

/** A token folded as unicode61 with remove_diacritics 2 folds it, cut at 32,768 bytes. */
function fold(token: string): string {
  // Folding never needs more than the first FOLD_WINDOW code units of a giant token to
  // fill the 32,768 bytes kept (unless nearly every character carries several marks).
  if (token.length > FOLD_WINDOW) {
    let end = FOLD_WINDOW;
    const c = token.charCodeAt(end);
    if (c >= 0xdc00 && c <= 0xdfff) end--;
    token = token.slice(0, end);
  }
  return capToken(foldWhole(token));
}

const FOLD_WINDOW = 8 * TOKEN_MAX_BYTES;

function foldWhole(token: string): string {
  if (ASCII_TOKEN.test(token)) return token.toLowerCase();
  // Character by character: unicode61 folds without context (Σ is σ, never final ς),
  // and removes diacritics from Latin letters only.
  let lower = '';
  for (const ch of token) lower += ch.toLowerCase();
  return lower.normalize('NFD').replace(LATIN_MARKS, '$1').normalize('NFC');
}

const utf8Length = (s: string) => Buffer.byteLength(s, 'utf8');

// FTS5's Porter steps work on UTF-8 bytes, where every byte of a non-ASCII character
// counts as a consonant. Each such character is stood in for by as many ASCII
// consonants that no Porter rule names ("jqjq"...), stemmed, then put back.
const STAND_IN = 'jqjq';

function stemWithStandIns(token: string): string {
  const originals: string[] = [];
  const owner: number[] = [];
  let spelled = '';
  for (const ch of token) {
    const code = ch.codePointAt(0)!;
    const bytes = code < 0x80 ? 1 : code < 0x800 ? 2 : code < 0x10000 ? 3 : 4;
    originals.push(ch);
    spelled += bytes === 1 ? ch : STAND_IN.slice(0, bytes);
    for (let b = 0; b < bytes; b++) owner.push(originals.length - 1);
  }
  const stemmed = PorterStemmer.stem(spelled);
  let common = 0;
  while (common < stemmed.length && stemmed[common] === spelled[common]) common++;
  // Porter only rewrites an ASCII suffix, so the kept prefix ends on a character edge.
  if (common < spelled.length && common > 0 && owner[common] === owner[common - 1]) return token;
  let out = '';
  for (let i = 0; i < common;) {
    const c = owner[i];
    out += originals[c];
    while (i < common && owner[i] === c) i++;
  }
  return out + stemmed.slice(common);
}

/** The Porter stem of one folded token, or the token itself outside 3-64 bytes. */
export function porterStem(token: string): string {
  if (token.length > PORTER_MAX_BYTES) return token;
  const bytes = token.length < PORTER_MIN_BYTES ? token.length : utf8Length(token);
  if (bytes < PORTER_MIN_BYTES || bytes > PORTER_MAX_BYTES) return token;
  return ASCII_TOKEN.test(token) ? PorterStemmer.stem(token) : stemWithStandIns(token);
}

// Character classes: ASCII from a table; other code points tested once with the
// Unicode property regexps and remembered (1 token character, 2 combining mark, 3 separator).
const ASCII_ALNUM = new Uint8Array(128);
for (let c = 0; c < 128; c++) ASCII_ALNUM[c] = /[0-9A-Za-z]/.test(String.fromCharCode(c)) ? 1 : 0;
const TOKEN_CHAR = /^[\p{L}\p{N}\p{Co}]$/u;
const MARK_CHAR = /^\p{M}$/u;
const bmpClass = new Uint8Array(0x10000);
const astralClass = new Map<number, number>();

function classOf(cp: number): number {
  let k = cp < 0x10000 ? bmpClass[cp] : (astralClass.get(cp) ?? 0);
  if (k === 0) {
    const ch = String.fromCodePoint(cp);
    k = TOKEN_CHAR.test(ch) ? 1 : MARK_CHAR.test(ch) ? 2 : 3;
    if (cp < 0x10000) bmpClass[cp] = k;
    else astralClass.set(cp, k);
  }
  return k;
}

/**
 * Calls `visit` with each token's surface form (the text as written) in order: a run
 * that starts with a letter, digit or private-use character and goes on through those
 * and combining marks.
 */
export function forEachFtsSurface(text: string, visit: (surface: string) => void): void {
  const n = text.length;
  let i = 0;
  while (i < n) {
    let c = text.charCodeAt(i);
    if (c < 128) {
      if (ASCII_ALNUM[c] === 0) {
        i++;
        continue;
      }
    } else {
      const cp = text.codePointAt(i)!;
      if (classOf(cp) !== 1) {
        i += cp > 0xffff ? 2 : 1;
        continue;
      }
    }
    const start = i;
    for (;;) {
      if (i >= n) break;
      c = text.charCodeAt(i);
      if (c < 128) {
        if (ASCII_ALNUM[c] === 0) break;
        i++;
      } else {
        const cp = text.codePointAt(i)!;
        if (classOf(cp) === 3) break;
        i += cp > 0xffff ? 2 : 1;
      }
    }
    visit(text.slice(start, i));
  }
}

/** The indexed term of one surface form (folded, stemmed); '' when folding leaves nothing. */
export function ftsTerm(surface: string): string {
  const folded = fold(surface);
  return folded.length > 0 ? porterStem(folded) : '';
}

/** Folded tokens before stemming, in text order (the words a query is made of). */
export function ftsRawTokens(text: string): string[] {
  const out: string[] = [];
  forEachFtsSurface(text, (surface) => {
    const folded = fold(surface);
    if (folded.length > 0) out.push(folded);
  });
  return out;
}

/** Indexed tokens of a text (folded and stemmed), in order. */
export function ftsTokens(text: string): string[] {
  const out: string[] = [];
  forEachFtsSurface(text, (surface) => {
    const term = ftsTerm(surface);
    if (term.length > 0) out.push(term);
  });
  return out;
}
