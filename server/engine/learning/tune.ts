// Tuning the concept space from the team's codes: with Responsive / Not responsive
// codes as relevance judgements, k-fold cross-validation measures which number of
// concept axes (the first d axes of the same SVD, as hybrid search uses them) and
// which keyword weight in the hybrid fusion would rank held-out Responsive documents
// above held-out Not responsive ones best. The query of each fold is the training
// fold's Responsive documents (their concept centroid, and their strongest terms for
// the keyword part); the measure is average precision over the held-out documents.
import type { ConceptSpace } from '../index/concept-space';
import { mulberry32 } from '../linalg/random';
import { fuseScores, type Scored } from '../search/fusion';

export interface TuneExample {
  /** Row of the document in the space. */
  index: number;
  label: 0 | 1;
}

export interface TuneOptions {
  folds?: number;
  seed?: number;
  /** Concept axes to try (those above k are dropped). */
  dims?: number[];
  /** Keyword weights to try (0 = concept only). */
  weights?: number[];
  /** Keyword scores of candidate rows for a fold's query terms (higher is better). */
  keyword?: (terms: readonly string[], candidates: readonly number[]) => Scored<number>[];
  /** A row's strongest terms, for the keyword query of a fold. */
  termsOf?: (index: number) => readonly string[];
}

export interface TuneCell {
  dims: number;
  keywordWeight: number;
  /** Mean average precision over the folds. */
  map: number;
}

export interface TuneResult {
  folds: number;
  cells: TuneCell[];
  best: TuneCell;
}

/** Average precision of a ranking (positives among the ranked ids). */
function averagePrecision(ranked: readonly number[], positives: ReadonlySet<number>): number {
  let found = 0;
  let sum = 0;
  ranked.forEach((id, i) => {
    if (positives.has(id)) {
      found++;
      sum += found / (i + 1);
    }
  });
  return positives.size > 0 ? sum / positives.size : 0;
}

export function tuneFromCodes(
  space: ConceptSpace,
  examples: readonly TuneExample[],
  options: TuneOptions = {},
): TuneResult {
  const folds = options.folds ?? 5;
  const dims = (options.dims ?? [25, 50, 100, 150, 200, 300]).filter((d) => d <= space.k);
  if (!dims.includes(space.k)) dims.push(space.k);
  const weights = options.keyword ? (options.weights ?? [0, 0.2, 0.3, 0.5, 0.7]) : [0];
  // Stratified folds from a seeded shuffle, so each fold holds both kinds.
  const random = mulberry32(options.seed ?? 1);
  const shuffled = [...examples];
  for (let i = shuffled.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [shuffled[i], shuffled[j]] = [shuffled[j], shuffled[i]];
  }
  const foldOf = new Map<number, number>();
  let p = 0;
  let n = 0;
  for (const e of shuffled) foldOf.set(e.index, e.label === 1 ? p++ % folds : n++ % folds);
  const totals = new Map<string, number>();
  const k = space.k;
  for (let f = 0; f < folds; f++) {
    const train = examples.filter((e) => foldOf.get(e.index) !== f);
    const test = examples.filter((e) => foldOf.get(e.index) === f);
    const positives = new Set(test.filter((e) => e.label === 1).map((e) => e.index));
    const trainPositives = train.filter((e) => e.label === 1).map((e) => e.index);
    // The fold's query: the centroid of its training Responsive rows (unit length each).
    const centroid = new Float64Array(k);
    for (const j of trainPositives) {
      const v = space.docVector(j);
      let sq = 0;
      for (let c = 0; c < k; c++) sq += v[c] * v[c];
      const s = sq > 0 ? 1 / Math.sqrt(sq) : 0;
      for (let c = 0; c < k; c++) centroid[c] += v[c] * s;
    }
    let keyword: Scored<number>[] = [];
    if (options.keyword && options.termsOf) {
      const counts = new Map<string, number>();
      for (const j of trainPositives)
        for (const t of options.termsOf(j)) counts.set(t, (counts.get(t) ?? 0) + 1);
      const terms = [...counts]
        .sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1))
        .slice(0, 30)
        .map(([t]) => t);
      keyword = options.keyword(
        terms,
        test.map((e) => e.index),
      );
    }
    for (const d of dims) {
      let qq = 0;
      for (let c = 0; c < d; c++) qq += centroid[c] * centroid[c];
      const concept: Scored<number>[] = test.map((e) => {
        const v = space.docVector(e.index);
        let dot = 0;
        let vv = 0;
        for (let c = 0; c < d; c++) {
          dot += v[c] * centroid[c];
          vv += v[c] * v[c];
        }
        return { id: e.index, score: vv > 0 && qq > 0 ? dot / Math.sqrt(vv * qq) : 0 };
      });
      concept.sort((a, b) => b.score - a.score || a.id - b.id);
      for (const w of weights) {
        const ranked =
          w === 0 ? concept.map((h) => h.id) : fuseScores(keyword, concept, w).map((h) => h.id);
        // Documents neither list holds go last, in row order.
        const seen = new Set(ranked);
        for (const e of test) if (!seen.has(e.index)) ranked.push(e.index);
        const key = `${d}|${w}`;
        totals.set(key, (totals.get(key) ?? 0) + averagePrecision(ranked, positives));
      }
    }
  }
  const cells: TuneCell[] = [];
  for (const d of dims)
    for (const w of weights)
      cells.push({ dims: d, keywordWeight: w, map: totals.get(`${d}|${w}`)! / folds });
  const best = cells.reduce((a, b) => (b.map > a.map + 1e-12 ? b : a));
  return { folds, cells, best };
}
