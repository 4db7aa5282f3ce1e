// Seeded synthetic collections shaped like real document sets, for benchmarking only
// (invented data, never a test oracle):
// - word frequencies follow Zipf's law (Zipf 1949) over a vocabulary sized by Heaps'
//   law V = K n^beta with K = 44, beta = 0.49 (the Reuters-RCV1 fit in Manning,
//   Raghavan & Schuetze, Introduction to Information Retrieval, 2008, 5.1.1);
// - document lengths are log-normal with a mean near 400 tokens (common practice for
//   e-mail and office-document collections);
// - topic structure: each document draws a third of its tokens from one to three
//   topics, each topic a Zipf distribution over its own few thousand words, so the
//   singular values decay as in real collections.
// Raw counts, terms kept when in >= 2 documents; the bench weights them with the
// engine's log-entropy (Dumais 1991).

import { type CsrMatrix, csrFromTriplets } from '../../server/engine/index';
import { mulberry32 } from '../../server/engine/index';

export interface SyntheticCollection {
  docs: number;
  terms: number;
  tokens: number;
  /** Raw term counts, terms x docs. */
  counts: CsrMatrix;
  /** Raw term ids per document (for building queries). */
  docTerms: (docIndex: number) => Int32Array;
}

function zipfCdf(size: number, exponent: number): Float64Array {
  const cdf = new Float64Array(size);
  let sum = 0;
  for (let r = 0; r < size; r++) {
    sum += 1 / Math.pow(r + 1, exponent);
    cdf[r] = sum;
  }
  for (let r = 0; r < size; r++) cdf[r] /= sum;
  return cdf;
}

function sampleCdf(cdf: Float64Array, u: number): number {
  let lo = 0;
  let hi = cdf.length - 1;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (cdf[mid] < u) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

export function generateCollection(docs: number, seed = 42): SyntheticCollection {
  const rand = mulberry32(seed);
  const normal = () => {
    const u1 = 1 - rand();
    return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * rand());
  };
  const sigma = 0.75;
  const mu = Math.log(400) - (sigma * sigma) / 2; // mean length exp(mu + sigma^2/2) = 400
  const lengths = new Int32Array(docs);
  let tokens = 0;
  for (let d = 0; d < docs; d++) {
    lengths[d] = Math.min(20_000, Math.max(20, Math.round(Math.exp(mu + sigma * normal()))));
    tokens += lengths[d];
  }
  const vocab = Math.round(44 * Math.pow(tokens, 0.49));
  const background = zipfCdf(vocab, 1.0);
  const topicCount = Math.max(50, Math.round(docs / 200));
  const topicSize = 3000;
  const topicCdf = zipfCdf(topicSize, 1.0);
  // Each topic's words: a random draw from the vocabulary beyond the 200 commonest words.
  const topicWords: Int32Array[] = [];
  for (let t = 0; t < topicCount; t++) {
    const words = new Int32Array(topicSize);
    for (let w = 0; w < topicSize; w++) words[w] = 200 + Math.floor(rand() * (vocab - 200));
    topicWords.push(words);
  }
  const docOffsets = new Int32Array(docs + 1);
  const termStore: number[] = [];
  const countStore: number[] = [];
  const tally = new Int32Array(vocab);
  const touched: number[] = [];
  for (let d = 0; d < docs; d++) {
    const nTopics = 1 + Math.floor(rand() * 3);
    const topics = Array.from({ length: nTopics }, () => Math.floor(rand() * topicCount));
    touched.length = 0;
    for (let t = 0; t < lengths[d]; t++) {
      let term: number;
      if (rand() < 1 / 3) {
        const topic = topicWords[topics[Math.floor(rand() * nTopics)]];
        term = topic[sampleCdf(topicCdf, rand())];
      } else term = sampleCdf(background, rand());
      if (tally[term]++ === 0) touched.push(term);
    }
    for (const term of touched) {
      termStore.push(term);
      countStore.push(tally[term]);
      tally[term] = 0;
    }
    docOffsets[d + 1] = termStore.length;
  }
  const termOf = Int32Array.from(termStore);
  const tf = Int32Array.from(countStore);
  // Keep terms in >= 2 documents (renumbered); weighting is left to the engine.
  const df = new Int32Array(vocab);
  for (let p = 0; p < termOf.length; p++) df[termOf[p]]++;
  const newId = new Int32Array(vocab).fill(-1);
  let terms = 0;
  for (let w = 0; w < vocab; w++) if (df[w] >= 2) newId[w] = terms++;
  let kept = 0;
  for (let p = 0; p < termOf.length; p++) if (newId[termOf[p]] >= 0) kept++;
  const ri = new Int32Array(kept);
  const ci = new Int32Array(kept);
  const vs = new Float64Array(kept);
  let t = 0;
  for (let d = 0; d < docs; d++) {
    for (let p = docOffsets[d]; p < docOffsets[d + 1]; p++) {
      const id = newId[termOf[p]];
      if (id < 0) continue;
      ri[t] = id;
      ci[t] = d;
      vs[t] = tf[p];
      t++;
    }
  }
  const counts = csrFromTriplets(terms, docs, ri, ci, vs);
  return {
    docs,
    terms,
    tokens,
    counts,
    docTerms: (d) => {
      const out: number[] = [];
      for (let p = docOffsets[d]; p < docOffsets[d + 1]; p++) {
        const id = newId[termOf[p]];
        if (id >= 0) out.push(id);
      }
      return Int32Array.from(out);
    },
  };
}
