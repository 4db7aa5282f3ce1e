// Per-document work a result page repeats on every search that lists the document: the
// term spans of its text window (snippets) and its analysed terms ("why it matched"),
// and the terms weighted by the serving space. Profiling 200 concurrent searches on the
// demo matter put most of a search's main-thread time here, for the same few hundred
// documents again and again, so it is remembered: keyed by document id and checked
// against the text itself (a re-extracted or edited text is never served stale), bounded
// by the characters held.
import type { ConceptSpace, WeightedTerms } from '../engine/index';
import { analyzedTerms, termSpans, type TermSpan } from './highlight';

export interface HitText {
  title: string;
  body: string;
  spans: TermSpan[];
  /** analyzedTerms of the title and window, computed on first use. */
  terms(): string[];
  /** The terms weighted by `space`, computed once per serving space. */
  weighted(space: ConceptSpace): WeightedTerms;
}

/** About 40 MB of text windows (UTF-16) plus their spans. */
const MAX_CHARS = 20_000_000;

class Entry implements HitText {
  private analysed: string[] | null = null;
  private weighting: { space: ConceptSpace; terms: WeightedTerms } | null = null;
  readonly spans: TermSpan[];
  constructor(
    readonly title: string,
    readonly body: string,
    private readonly window: number,
  ) {
    this.spans = termSpans(body, window);
  }
  terms(): string[] {
    this.analysed ??= analyzedTerms(this.title, this.body, this.spans, this.window);
    return this.analysed;
  }
  weighted(space: ConceptSpace): WeightedTerms {
    if (this.weighting?.space !== space)
      this.weighting = { space, terms: space.weightTerms(this.terms()) };
    return this.weighting.terms;
  }
}

export class HitTextCache {
  private readonly entries = new Map<number, Entry>();
  private chars = 0;

  constructor(private readonly window: number) {}

  get(documentId: number, title: string, body: string): HitText {
    const cached = this.entries.get(documentId);
    if (cached && cached.body === body && cached.title === title) {
      // Most recently used last (Map keeps insertion order).
      this.entries.delete(documentId);
      this.entries.set(documentId, cached);
      return cached;
    }
    if (cached) this.drop(documentId, cached);
    const entry = new Entry(title, body, this.window);
    this.entries.set(documentId, entry);
    this.chars += title.length + body.length;
    for (const [id, oldest] of this.entries) {
      if (this.chars <= MAX_CHARS) break;
      this.drop(id, oldest);
    }
    return entry;
  }

  private drop(id: number, entry: Entry) {
    this.entries.delete(id);
    this.chars -= entry.title.length + entry.body.length;
  }
}
