// Bounds on one token, shared by the concept analyzer (analyzer.ts) and the keyword
// tokens (../search/fts5-tokens.ts) so documents, queries and both indexes treat a long
// token alike. They are SQLite FTS5's own (checked in keyword-index.test.ts):
//  - its porter tokenizer stems tokens of at most 64 bytes and passes longer ones
//    through unchanged (fts5_tokenize.c, FTS5_PORTER_MAX_TOKEN);
//  - it stores and queries at most the first 32,768 bytes of a token
//    (fts5Int.h, FTS5_MAX_TOKEN_SIZE).
// The first also keeps analysis linear in its input: natural's Porter stemmer takes time
// that grows with the square of a token's length on a run of one letter or digit.

/** Longest token (UTF-8 bytes) that is Porter-stemmed; longer ones are kept as they are. */
export const PORTER_MAX_BYTES = 64;
/** Longest token (UTF-8 bytes) kept; the rest of a longer token is cut off. */
export const TOKEN_MAX_BYTES = 32_768;

/** Any UTF-16 code unit beyond ASCII (surrogates included). */
const NON_ASCII = /[\u0080-\uffff]/;
const isAscii = (s: string) => !NON_ASCII.test(s);

/** UTF-8 length of `s`, counting at most up to `limit + 1` (enough to compare with limit). */
export function utf8LengthOver(s: string, limit: number): boolean {
  if (s.length > limit) return true;
  if (s.length * 3 <= limit) return false;
  return Buffer.byteLength(s, 'utf8') > limit;
}

/**
 * The longest prefix of `token` of at most TOKEN_MAX_BYTES UTF-8 bytes, cut on a
 * character edge (FTS5 cuts the bytes, so a cut through a multi-byte character differs
 * in that last character only).
 */
export function capToken(token: string): string {
  if (token.length * 3 <= TOKEN_MAX_BYTES) return token;
  if (token.length <= TOKEN_MAX_BYTES && isAscii(token)) return token;
  if (isAscii(token.slice(0, TOKEN_MAX_BYTES))) return token.slice(0, TOKEN_MAX_BYTES);
  let bytes = 0;
  let i = 0;
  while (i < token.length) {
    const cp = token.codePointAt(i)!;
    const size = cp < 0x80 ? 1 : cp < 0x800 ? 2 : cp < 0x10000 ? 3 : 4;
    if (bytes + size > TOKEN_MAX_BYTES) break;
    bytes += size;
    i += cp > 0xffff ? 2 : 1;
  }
  return token.slice(0, i);
}
