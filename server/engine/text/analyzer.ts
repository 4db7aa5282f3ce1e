// Text analysis shared by documents and queries: the same function must serve
// both, or folded-in queries land on the wrong terms.
//
// Steps (common practice in LSI work, e.g. Deerwester et al. 1990; Dumais 1991):
// Unicode NFKC, lower-case, split on anything that is not a Unicode letter or
// digit, drop English stop words (natural's list), Porter (1980) stemming. A token is
// cut at 32,768 bytes and one over 64 bytes is not stemmed, as SQLite FTS5 does
// (token-limits.ts), which also keeps analysis linear in the text's length.
import PorterStemmer from 'natural/lib/natural/stemmers/porter_stemmer';
import { RegexpTokenizer } from 'natural/lib/natural/tokenizers/regexp_tokenizer';
import { words as englishStopWords } from 'natural/lib/natural/util/stopwords';
import { capToken, PORTER_MAX_BYTES, utf8LengthOver } from './token-limits';

/** Bumped whenever analysis changes, so a stored index built differently can be detected. */
export const ANALYZER_VERSION = 'en-porter-2';
/**
 * Versions whose stored indexes this analyzer still serves: en-porter-1 differs only
 * in stemming tokens over 64 bytes (a term no query reached in practice), which the next
 * rebuild corrects.
 */
export const COMPATIBLE_ANALYZER_VERSIONS: readonly string[] = ['en-porter-1', ANALYZER_VERSION];

const tokenizer = new RegexpTokenizer({ pattern: /[^\p{L}\p{N}]+/u });
const stopWords: ReadonlySet<string> = new Set(englishStopWords);

// Porter stemming in natural is regular-expression heavy; a corpus repeats the
// same surface forms, so a bounded cache cuts analysis time several-fold.
const STEM_CACHE_LIMIT = 200_000;
const stemCache = new Map<string, string>();

/** Porter stem of one lower-cased token (cached); a token over 64 bytes is its own stem. */
export function stem(token: string): string {
  if (utf8LengthOver(token, PORTER_MAX_BYTES)) return token;
  let stemmed = stemCache.get(token);
  if (stemmed === undefined) {
    stemmed = PorterStemmer.stem(token);
    if (stemCache.size >= STEM_CACHE_LIMIT) stemCache.clear();
    stemCache.set(token, stemmed);
  }
  return stemmed;
}

/** Lower-cased raw tokens (letters and digits, each at most 32,768 bytes), before stop words and stemming. */
export function tokenize(text: string): string[] {
  if (!text) return [];
  const out: string[] = [];
  for (const t of tokenizer.tokenize(text.normalize('NFKC').toLowerCase()))
    if (t.length > 0) out.push(capToken(t));
  return out;
}

export function isStopWord(token: string): boolean {
  return stopWords.has(token);
}

/** The index terms of a text, in order, repeats kept (term frequency matters). */
export function analyze(text: string): string[] {
  const terms: string[] = [];
  for (const token of tokenize(text)) {
    if (stopWords.has(token)) continue;
    terms.push(stem(token));
  }
  return terms;
}

/** Like analyze, but also returns the surface token each term came from (for display). */
export function analyzeWithSurface(text: string): { term: string; surface: string }[] {
  const out: { term: string; surface: string }[] = [];
  for (const token of tokenize(text)) {
    if (stopWords.has(token)) continue;
    out.push({ term: stem(token), surface: token });
  }
  return out;
}
