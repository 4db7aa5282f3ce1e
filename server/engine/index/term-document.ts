// The term-document matrix A (terms x documents) of raw term frequencies, built in
// one pass over the documents into typed arrays (no object per entry).
//
// Rows are terms, so the CSR arrays of A are also the CSC arrays of A^T: row i
// lists the documents containing term i, in document order.
import type { CsrMatrix } from '../sparse/csr';
import { isStopWord, stem, tokenize } from '../text/analyzer';

export interface TermDocumentOptions {
  /** Keep a term only when it occurs in at least this many documents (default 2). */
  minDf?: number;
}

export interface TermDocumentMatrix {
  /** Index terms, sorted by code unit (a stable id: the same corpus gives the same ids). */
  terms: string[];
  /** Document frequency of each term. */
  df: Int32Array;
  /** Raw term counts, terms x documents. */
  counts: CsrMatrix;
  nDocs: number;
  /** Tokens seen in each document after analysis, before the minDf cut (for empty-document checks). */
  tokensPerDoc: Int32Array;
  /** For display: each term's most frequent surface word ("computer" for "comput"). */
  labels: string[];
}

/** A growable Int32Array (amortised doubling). */
class IntBuffer {
  data: Int32Array;
  length = 0;
  constructor(capacity = 1024) {
    this.data = new Int32Array(capacity);
  }
  push(value: number): void {
    if (this.length === this.data.length) {
      const grown = new Int32Array(this.data.length * 2);
      grown.set(this.data);
      this.data = grown;
    }
    this.data[this.length++] = value;
  }
}

export function buildTermDocumentMatrix(
  texts: Iterable<string>,
  options: TermDocumentOptions = {},
): TermDocumentMatrix {
  const minDf = options.minDf ?? 2;
  if (!Number.isInteger(minDf) || minDf < 1) {
    throw new RangeError(`minDf must be a whole number of at least 1, got ${minDf}`);
  }
  // First-seen ids during the pass; remapped to sorted ids afterwards.
  const seenId = new Map<string, number>();
  const seenTerms: string[] = [];
  const seenDf = new IntBuffer();
  const entryTerm = new IntBuffer(1 << 16);
  const entryCount = new IntBuffer(1 << 16);
  const docStart = new IntBuffer();
  const tokensPerDoc = new IntBuffer();
  const local = new Map<number, number>();
  const surfaces = new Map<string, { term: string; count: number }>();

  for (const text of texts) {
    docStart.push(entryTerm.length);
    local.clear();
    let tokens = 0;
    // The analyzer's steps inline (tokenize, stop words, stem) so each surface word
    // can be counted for the term's display label.
    for (const surface of tokenize(text)) {
      if (isStopWord(surface)) continue;
      tokens++;
      let seenSurface = surfaces.get(surface);
      if (seenSurface === undefined) {
        seenSurface = { term: stem(surface), count: 0 };
        surfaces.set(surface, seenSurface);
      }
      seenSurface.count++;
      const term = seenSurface.term;
      let id = seenId.get(term);
      if (id === undefined) {
        id = seenTerms.length;
        seenId.set(term, id);
        seenTerms.push(term);
        seenDf.push(0);
      }
      local.set(id, (local.get(id) ?? 0) + 1);
    }
    tokensPerDoc.push(tokens);
    for (const [id, count] of local) {
      entryTerm.push(id);
      entryCount.push(count);
      seenDf.data[id]++;
    }
  }
  const nDocs = docStart.length;
  docStart.push(entryTerm.length);

  // Keep terms with df >= minDf; final ids follow code-unit order of the term.
  const kept: number[] = [];
  for (let id = 0; id < seenTerms.length; id++) if (seenDf.data[id] >= minDf) kept.push(id);
  kept.sort((a, b) => (seenTerms[a] < seenTerms[b] ? -1 : seenTerms[a] > seenTerms[b] ? 1 : 0));
  const finalId = new Int32Array(seenTerms.length).fill(-1);
  const terms: string[] = new Array(kept.length);
  const df = new Int32Array(kept.length);
  kept.forEach((seen, id) => {
    finalId[seen] = id;
    terms[id] = seenTerms[seen];
    df[id] = seenDf.data[seen];
  });

  // Display labels: the most frequent surface word of each term (ties: the shorter,
  // then the first in code-unit order).
  const labels = terms.slice();
  const labelCount = new Int32Array(terms.length);
  for (const [surface, { term, count }] of surfaces) {
    const seen = seenId.get(term)!;
    const id = finalId[seen];
    if (id < 0) continue;
    const current = labels[id];
    const better =
      count > labelCount[id] ||
      (count === labelCount[id] &&
        (surface.length < current.length ||
          (surface.length === current.length && surface < current)));
    if (better) {
      labels[id] = surface;
      labelCount[id] = count;
    }
  }

  // CSR by term: row lengths are the document frequencies.
  const rowPtr = new Int32Array(terms.length + 1);
  for (let i = 0; i < terms.length; i++) rowPtr[i + 1] = rowPtr[i] + df[i];
  const nnz = rowPtr[terms.length];
  const colIdx = new Int32Array(nnz);
  const values = new Float64Array(nnz);
  const next = rowPtr.slice(0, terms.length);
  for (let j = 0; j < nDocs; j++) {
    for (let p = docStart.data[j]; p < docStart.data[j + 1]; p++) {
      const id = finalId[entryTerm.data[p]];
      if (id < 0) continue;
      const dest = next[id]++;
      colIdx[dest] = j;
      values[dest] = entryCount.data[p];
    }
  }
  return {
    terms,
    df,
    counts: { rows: terms.length, cols: nDocs, rowPtr, colIdx, values },
    nDocs,
    tokensPerDoc: tokensPerDoc.data.slice(0, nDocs),
    labels,
  };
}
