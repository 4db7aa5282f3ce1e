// Term spans in a document's text, for snippets (search hits) and highlight ranges
// (the viewer). A span's term is the engine's own analysis of the token
// (server/engine/text/analyzer.ts: NFKC, lower case, stop words, Porter stemming), so a
// highlighted word is exactly a word the index saw as that term.
import type { SnippetSegment } from '../../shared/schemas/search';
import { analyze } from '../engine/index';

/** Texts longer than this are only scanned this far for snippets and highlights. */
export const SCAN_MAX_CHARS = 200_000;
/**
 * A search hit's snippet and "why it matched" read this much of its text (title and
 * body each): scanning costs about 0.2 ms per 1,000 characters, so a page of 50 hits
 * stays bounded however long the documents are. For a longer text the snippet comes
 * from this window and the contributing terms are the window's.
 */
export const HIT_WINDOW_CHARS = 50_000;
const SNIPPET_TOKENS = 36;

export interface TermSpan {
  start: number;
  end: number;
  /** The index term (stem); null for a stop word. */
  term: string | null;
  surface: string;
}

const TOKEN = /[\p{L}\p{N}]+/gu;

/**
 * A bounded memo in two generations: when the newer one is full it becomes the older
 * and a fresh one starts, and a hit in the older is carried forward. Recently used
 * entries survive a turnover, unlike clearing one map when it fills (which, over a
 * matter's vocabulary of a few hundred thousand words, re-stemmed most tokens of a
 * page after every clear).
 */
export class GenerationalMemo<V> {
  private newer = new Map<string, V>();
  private older = new Map<string, V>();
  constructor(
    private readonly compute: (key: string) => V,
    private readonly generationSize: number,
  ) {}
  get(key: string): V {
    let value = this.newer.get(key);
    if (value !== undefined) return value;
    value = this.older.get(key);
    if (value === undefined) value = this.compute(key);
    if (this.newer.size >= this.generationSize) {
      this.older = this.newer;
      this.newer = new Map();
    }
    this.newer.set(key, value);
    return value;
  }
}

/** A token's index term (null for a stop word); up to 2 x 250,000 tokens remembered. */
const termOf = (() => {
  const memo = new GenerationalMemo<string | null>((token) => analyze(token)[0] ?? null, 250_000);
  return (token: string) => memo.get(token);
})();

export function termSpans(text: string, maxChars = SCAN_MAX_CHARS): TermSpan[] {
  const scanned = text.length > maxChars ? text.slice(0, maxChars) : text;
  const spans: TermSpan[] = [];
  for (const m of scanned.matchAll(TOKEN)) {
    spans.push({ start: m.index, end: m.index + m[0].length, term: termOf(m[0]), surface: m[0] });
  }
  return spans;
}

/** Any UTF-16 code unit beyond ASCII (surrogates included). */
const NON_ASCII = /[\u0080-\uffff]/;

/**
 * analyze(`${title}\n${body}`), the analysis the index gave the document, reusing the
 * body's spans when that is exact: for ASCII text, NFKC and lower-casing change no
 * character, so the analyzer's tokens are the spans' tokens in order. Any other text
 * (or a body longer than the spans cover) is analysed again. `bodySpans` is
 * termSpans(body, scanned).
 */
export function analyzedTerms(
  title: string,
  body: string,
  bodySpans: readonly TermSpan[],
  scanned = SCAN_MAX_CHARS,
) {
  const covered = body.length <= scanned;
  if (!covered || NON_ASCII.test(title) || NON_ASCII.test(body))
    return analyze(`${title}\n${body}`);
  const terms = analyze(title);
  for (const span of bodySpans) if (span.term !== null) terms.push(span.term);
  return terms;
}

export type Mark = 'query' | 'concept';

export interface MarkTerms {
  query: ReadonlySet<string>;
  concept: ReadonlySet<string>;
}

export function markOf(term: string | null, marks: MarkTerms): Mark | undefined {
  if (term === null) return undefined;
  if (marks.query.has(term)) return 'query';
  if (marks.concept.has(term)) return 'concept';
  return undefined;
}

/** Highlight ranges over the whole (scanned) text. */
export function highlightRanges(spans: readonly TermSpan[], marks: MarkTerms) {
  const out: { start: number; end: number; mark: Mark }[] = [];
  for (const span of spans) {
    const mark = markOf(span.term, marks);
    if (mark) out.push({ start: span.start, end: span.end, mark });
  }
  return out;
}

const squash = (s: string) => s.replace(/\s+/g, ' ');

/**
 * A snippet of about SNIPPET_TOKENS words around the densest run of marked terms
 * (a query term counts 3, a concept term 1), as plain-text segments.
 */
export function buildSnippet(
  text: string,
  spans: readonly TermSpan[],
  marks: MarkTerms,
  /** The whole text's length when `text` is a window of its start. */
  fullLength = text.length,
): SnippetSegment[] {
  if (spans.length === 0) return text.trim() ? [{ text: squash(text.trim().slice(0, 240)) }] : [];
  const weight = spans.map((s) => {
    const mark = markOf(s.term, marks);
    return mark === 'query' ? 3 : mark === 'concept' ? 1 : 0;
  });
  const w = Math.min(SNIPPET_TOKENS, spans.length);
  let sum = 0;
  for (let i = 0; i < w; i++) sum += weight[i];
  let best = sum;
  let bestStart = 0;
  for (let i = w; i < spans.length; i++) {
    sum += weight[i] - weight[i - w];
    if (sum > best) {
      best = sum;
      bestStart = i - w + 1;
    }
  }
  // Start a few words before the first marked term of the window, for context.
  if (best > 0) {
    let first = bestStart;
    while (first < bestStart + w && weight[first] === 0) first++;
    bestStart = Math.max(0, Math.min(first - 4, spans.length - w));
  }
  const from = spans[bestStart].start;
  const lastSpan = spans[Math.min(spans.length, bestStart + w) - 1];
  const segments: SnippetSegment[] = [];
  const push = (t: string, mark?: Mark) => {
    if (!t) return;
    const text = squash(t);
    const last = segments[segments.length - 1];
    if (last && last.mark === mark) last.text += text;
    else segments.push(mark ? { text, mark } : { text });
  };
  if (from > 0) push('… ');
  let cursor = from;
  for (let i = bestStart; i < bestStart + w && i < spans.length; i++) {
    const span = spans[i];
    const mark = markOf(span.term, marks);
    if (!mark) continue;
    push(text.slice(cursor, span.start));
    push(text.slice(span.start, span.end), mark);
    cursor = span.end;
  }
  push(text.slice(cursor, lastSpan.end));
  if (lastSpan.end < text.trimEnd().length || fullLength > text.length) push(' …');
  return segments;
}

/** The most frequent surface form of each term in the spans (for showing stems as words). */
export function collectSurfaces(
  spans: readonly TermSpan[],
  into: Map<string, Map<string, number>>,
) {
  for (const span of spans) {
    if (!span.term) continue;
    let forms = into.get(span.term);
    if (!forms) into.set(span.term, (forms = new Map()));
    const surface = span.surface.toLowerCase();
    forms.set(surface, (forms.get(surface) ?? 0) + 1);
  }
}

/**
 * A term as a word: the index's own label (its most frequent surface form in the
 * matter) when the space has the term, else the commonest form in the given texts.
 */
export function surfaceOf(
  term: string,
  surfaces: Map<string, Map<string, number>>,
  space?: { termId(term: string): number | undefined; labels?: readonly string[] } | null,
): string {
  const id = space?.termId(term);
  const label = id !== undefined ? space?.labels?.[id] : undefined;
  if (label) return label;
  const forms = surfaces.get(term);
  if (!forms) return term;
  let best = term;
  let count = -1;
  for (const [form, n] of forms) {
    if (n > count || (n === count && form.length < best.length)) {
      best = form;
      count = n;
    }
  }
  return best;
}
