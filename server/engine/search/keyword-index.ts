// An in-memory inverted index for keyword search, scored with the bm25 formula of
// SQLite FTS5's bm25() (SQLite FTS5 docs, "The bm25() function"; Robertson & Zaragoza
// 2009, "The probabilistic relevance framework: BM25 and beyond"):
//
//   score(D) = sum over query phrases p of  IDF(p) * f(p,D) * (k1 + 1)
//                                           / (f(p,D) + k1 * (1 - b + b * |D| / avgdl))
//   IDF(p)   = ln((N - n(p) + 0.5) / (n(p) + 0.5)), or 1e-6 where that is not positive
//
// with k1 = 1.2, b = 0.75, f the count of p in the document's title and body, |D| the
// document's token count and n(p) the number of documents holding p. A word the query
// says qtf times weighs (k3 + 1) qtf / (k3 + qtf), Okapi BM25's query-term weight
// (Robertson, Walker, Jones, Hancock-Beaulieu & Gatford 1994, "Okapi at TREC-3"); FTS5
// itself sums a repeated phrase once per repetition, which is the limit k3 -> infinity
// (checked in keyword-index.test.ts). FTS5 computes
// bm25 by walking every matching row's position lists, which at 100,000 documents and
// a pasted paragraph takes 150-300 ms; summing postings here takes a few.
//
// The statistics (N, avgdl, n(p)) are the index's own documents: one index per
// matter, so a matter's ranking does not depend on what other matters hold. Over one
// collection the scores equal FTS5's (keyword-index.test.ts, Cranfield).
import { isStopWord } from '../text/analyzer';
import { forEachFtsSurface, ftsRawTokens, ftsTerm, porterStem } from './fts5-tokens';
import { MAX_MATCH_TOKENS } from './keyword';

const K1 = 1.2;
const B = 0.75;
const MIN_IDF = 1e-6;
const TF_MAX = 0xffff;
const SURFACE_CACHE_LIMIT = 1_000_000;
/**
 * Okapi's k3. Robertson et al. (1994) used k3 from 0 (repeats ignored) up to 1000 (close
 * to counting each repeat in full; values from memory of the paper). 2 weighs a word said
 * four times at twice a word said once: a pasted paragraph's repeats count, yet one
 * repeated word does not take over the query. Measured through this index on Cranfield
 * (docs/RETRIEVAL.md): keyword MAP 0.3121 at k3 = 0, 0.3132 at 2, 0.3110 at 7.
 */
export const DEFAULT_K3 = 2;
const SURFACE_KEY_MAX = 256;

/**
 * The query phrases of a user's text, as toFtsMatchExpression (keyword.ts) builds its
 * OR of quoted strings: the distinct tokens, English stop words dropped unless nothing
 * else is left, at most MAX_MATCH_TOKENS. `words` are the folded tokens (what a
 * reference FTS5 MATCH quotes), `terms` their stems (what the index holds).
 */
export function keywordQueryTerms(text: string): { words: string[]; terms: string[] } {
  const all = ftsRawTokens(text);
  const tokens = [...new Set(all)];
  const content = tokens.filter((t) => !isStopWord(t));
  const words = (content.length > 0 ? content : tokens).slice(0, MAX_MATCH_TOKENS);
  // Each kept word once per time the query says it (its qtf, for the query-term weight).
  const kept = new Set(words);
  const repeated = all.filter((t) => kept.has(t));
  return { words, terms: repeated.map(porterStem) };
}

// A term's postings: a compact typed part, plus a tail of plain arrays that new
// documents are appended to (allocating typed arrays one growth at a time costs more
// than the indexing itself); compact() moves tails into the typed part.
interface Postings {
  slots: Int32Array;
  tfs: Uint16Array;
  tailSlots: number[];
  tailTfs: number[];
}

const EMPTY_SLOTS = new Int32Array(0);
const EMPTY_TFS = new Uint16Array(0);

export interface KeywordResult {
  /** Document ids, best first (ties by id). */
  ids: number[];
  /** bm25 scores, higher is better (FTS5's -bm25()). */
  scores: number[];
  /** Matching documents before the limit (after `allow`). */
  total: number;
}

export class KeywordIndex {
  private readonly termIds = new Map<string, number>();
  private readonly postings: Postings[] = [];
  /** tf above 65,535 (a word repeated that often in one document), by term*2^32+slot. */
  private readonly bigTf = new Map<number, number>();
  private docIds = new Float64Array(1024);
  private lengths = new Int32Array(1024);
  private alive = new Uint8Array(1024);
  private slotOf = new Map<number, number>();
  private nSlots = 0;
  private nAlive = 0;
  private totalTokens = 0;
  /** Surface form -> term id (-1: no term), so each spelling is folded and stemmed once. */
  private readonly surfaceIds = new Map<string, number>();
  private counts = new Int32Array(1024);
  private readonly touched: number[] = [];
  private readonly scratch: number[] = [];
  private tailLength = 0;

  /** Postings appended since the last compact(). */
  get uncompacted(): number {
    return this.tailLength;
  }

  /** Moves every term's appended postings into its typed arrays (after a bulk load). */
  compact(): void {
    for (const p of this.postings) {
      if (p.tailSlots.length === 0) continue;
      const n = p.slots.length;
      const slots = new Int32Array(n + p.tailSlots.length);
      slots.set(p.slots);
      slots.set(p.tailSlots, n);
      const tfs = new Uint16Array(n + p.tailTfs.length);
      tfs.set(p.tfs);
      tfs.set(p.tailTfs, n);
      p.slots = slots;
      p.tfs = tfs;
      p.tailSlots = [];
      p.tailTfs = [];
    }
    this.tailLength = 0;
  }

  private termIdOf(term: string): number {
    let id = this.termIds.get(term);
    if (id === undefined) {
      id = this.postings.length;
      this.termIds.set(term, id);
      this.postings.push({ slots: EMPTY_SLOTS, tfs: EMPTY_TFS, tailSlots: [], tailTfs: [] });
      if (id >= this.counts.length) {
        const counts = new Int32Array(this.counts.length * 2);
        counts.set(this.counts);
        this.counts = counts;
      }
    }
    return id;
  }

  /** Share of the distinct terms that some live document holds (what the query can find). */
  coverage(terms: readonly string[]): number {
    const distinct = [...new Set(terms)];
    if (distinct.length === 0) return 0;
    let held = 0;
    for (const term of distinct) {
      const id = this.termIds.get(term);
      if (id === undefined) continue;
      const p = this.postings[id];
      if (
        p.slots.some((slot) => this.alive[slot] === 1) ||
        p.tailSlots.some((slot) => this.alive[slot] === 1)
      )
        held++;
    }
    return held / distinct.length;
  }

  /** Indexed terms (stems) that start with `prefix`, at most `max` (for wildcard ranking). */
  termsStartingWith(prefix: string, max: number): string[] {
    const out: string[] = [];
    if (prefix.length === 0) return out;
    for (const term of this.termIds.keys()) {
      if (term.startsWith(prefix)) {
        out.push(term);
        if (out.length >= max) break;
      }
    }
    return out;
  }

  get size(): number {
    return this.nAlive;
  }

  /** Slots held by removed documents (the index is rebuilt when many are). */
  get deadSlots(): number {
    return this.nSlots - this.nAlive;
  }

  /** Adds (or replaces) a document's title and body. */
  add(docId: number, title: string, body: string): void {
    if (this.slotOf.has(docId)) this.remove(docId);
    const slot = this.nSlots++;
    if (slot >= this.docIds.length) this.growSlots();
    this.docIds[slot] = docId;
    this.alive[slot] = 1;
    this.slotOf.set(docId, slot);
    // Term counts of this document in a scratch array by term id, touched ids in order.
    const touched = this.touched;
    touched.length = 0;
    let length = 0;
    const surfaces = this.surfaceIds;
    const visit = (surface: string) => {
      let id = surfaces.get(surface);
      if (id === undefined) {
        const term = ftsTerm(surface);
        id = term.length === 0 ? -1 : this.termIdOf(term);
        if (surfaces.size >= SURFACE_CACHE_LIMIT) surfaces.clear();
        // A giant token (a run of one character) is not worth keeping as a key.
        if (surface.length <= SURFACE_KEY_MAX) surfaces.set(surface, id);
      }
      if (id < 0) return;
      length++;
      if (this.counts[id]++ === 0) touched.push(id);
    };
    forEachFtsSurface(title, visit);
    forEachFtsSurface(body, visit);
    for (const id of touched) {
      const tf = this.counts[id];
      this.counts[id] = 0;
      const p = this.postings[id];
      p.tailSlots.push(slot);
      p.tailTfs.push(Math.min(tf, TF_MAX));
      if (tf >= TF_MAX) this.bigTf.set(id * 2 ** 32 + slot, tf);
      this.tailLength++;
    }
    this.lengths[slot] = length;
    this.nAlive++;
    this.totalTokens += length;
  }

  /** Removes a document; its postings stay until a rebuild but no longer count. */
  remove(docId: number): void {
    const slot = this.slotOf.get(docId);
    if (slot === undefined) return;
    this.slotOf.delete(docId);
    this.alive[slot] = 0;
    this.nAlive--;
    this.totalTokens -= this.lengths[slot];
  }

  private growSlots() {
    const n = this.docIds.length * 2;
    const docIds = new Float64Array(n);
    docIds.set(this.docIds);
    const lengths = new Int32Array(n);
    lengths.set(this.lengths);
    const alive = new Uint8Array(n);
    alive.set(this.alive);
    this.docIds = docIds;
    this.lengths = lengths;
    this.alive = alive;
  }

  /**
   * bm25 over the documents holding any of `terms` (stems; a stem listed qtf times is
   * weighed (k3 + 1) qtf / (k3 + qtf); k3 = Infinity counts each repetition in full, as
   * FTS5 counts each repeated phrase). `allow`
   * restricts the documents (by id) without changing the statistics; `limit` caps the
   * list returned, `total` counts every match.
   */
  search(
    terms: readonly string[],
    options: { limit: number; allow?: Set<number>; k3?: number },
  ): KeywordResult {
    const nRow = this.nAlive;
    if (nRow === 0 || terms.length === 0) return { ids: [], scores: [], total: 0 };
    const k3 = options.k3 ?? DEFAULT_K3;
    if (!(k3 >= 0)) throw new RangeError('k3 must be 0 or more');
    const qtf = new Map<string, number>();
    for (const term of terms) qtf.set(term, (qtf.get(term) ?? 0) + 1);
    const avgdl = this.totalTokens / nRow;
    const scores = new Float64Array(this.nSlots);
    const touched = new Uint8Array(this.nSlots);
    const matched = this.scratch;
    matched.length = 0;
    for (const [term, count] of qtf) {
      const id = this.termIds.get(term);
      if (id === undefined) continue;
      const queryWeight = k3 === Infinity ? count : ((k3 + 1) * count) / (k3 + count);
      const p = this.postings[id];
      let hits = 0;
      for (let i = 0; i < p.slots.length; i++) hits += this.alive[p.slots[i]];
      for (let i = 0; i < p.tailSlots.length; i++) hits += this.alive[p.tailSlots[i]];
      if (hits === 0) continue;
      let idf = Math.log((nRow - hits + 0.5) / (hits + 0.5));
      if (idf <= 0) idf = MIN_IDF;
      idf *= queryWeight;
      const score = (slot: number, stored: number) => {
        if (this.alive[slot] === 0) return;
        const f = stored === TF_MAX ? (this.bigTf.get(id * 2 ** 32 + slot) ?? stored) : stored;
        scores[slot] +=
          (idf * (f * (K1 + 1))) / (f + K1 * (1 - B + (B * this.lengths[slot]) / avgdl));
        if (touched[slot] === 0) {
          touched[slot] = 1;
          matched.push(slot);
        }
      };
      for (let i = 0; i < p.slots.length; i++) score(p.slots[i], p.tfs[i]);
      for (let i = 0; i < p.tailSlots.length; i++) score(p.tailSlots[i], p.tailTfs[i]);
    }
    const allow = options.allow;
    let candidates = matched;
    if (allow) candidates = matched.filter((slot) => allow.has(this.docIds[slot]));
    const total = candidates.length;
    const docIds = this.docIds;
    const top = Math.min(options.limit, total);
    // Only the best `top` are sorted: a threshold from quickselect keeps the sort small
    // when a common word matches most of the matter.
    if (top < total) candidates = bestSlots(candidates, scores, docIds, top);
    candidates.sort((a, b) => scores[b] - scores[a] || docIds[a] - docIds[b]);
    const ids = new Array<number>(top);
    const out = new Array<number>(top);
    for (let r = 0; r < top; r++) {
      ids[r] = docIds[candidates[r]];
      out[r] = scores[candidates[r]];
    }
    return { ids, scores: out, total };
  }
}

/** The k-th largest value of `values` (1-based k), rearranging `values` (Hoare's FIND). */
function kthLargest(values: Float64Array, k: number): number {
  let lo = 0;
  let hi = values.length - 1;
  const target = k - 1;
  while (lo < hi) {
    const pivot = values[(lo + hi) >>> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (values[i] > pivot) i++;
      while (values[j] < pivot) j--;
      if (i <= j) {
        const t = values[i];
        values[i] = values[j];
        values[j] = t;
        i++;
        j--;
      }
    }
    if (target <= j) hi = j;
    else if (target >= i) lo = i;
    else break;
  }
  return values[target];
}

/** The `top` best slots by score (ties at the threshold by lower document id), unsorted. */
function bestSlots(
  slots: number[],
  scores: Float64Array,
  docIds: Float64Array,
  top: number,
): number[] {
  const values = new Float64Array(slots.length);
  for (let i = 0; i < slots.length; i++) values[i] = scores[slots[i]];
  const threshold = kthLargest(values, top);
  const out: number[] = [];
  const ties: number[] = [];
  for (const slot of slots) {
    if (scores[slot] > threshold) out.push(slot);
    else if (scores[slot] === threshold) ties.push(slot);
  }
  ties.sort((a, b) => docIds[a] - docIds[b]);
  for (let i = 0; out.length < top; i++) out.push(ties[i]);
  return out;
}
