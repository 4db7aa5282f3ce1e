// Retrain + re-rank benchmark of the learned ranking (prioritised review) for
// docs/PERFORMANCE.md (only the section "Learned ranking: retrain and re-rank" is
// replaced): `npm run bench:ranking` (`-- --docs 20000` for a smaller run).
// Times the engine calls the train-ranking job makes (trainRanker on the coded
// documents' features, then scoreDocuments over every document), on a seeded
// synthetic matter: documents' strongest terms come from scripts/bench/synthetic.ts
// (Zipf / Heaps shaped word counts, weighted tf-idf as the index would), concept
// vectors are seeded Gaussian rows of k = 200 (the timing depends on the shapes,
// n x k and terms per document, not on the values an SVD would give).
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import { parseArgs } from 'node:util';
import {
  ConceptSpace,
  documentExample,
  mulberry32,
  scoreDocuments,
  trainRanker,
  type LabelledExample,
  type TermWeights,
} from '../../server/engine/index';
import { generateCollection } from './synthetic';

const { values } = parseArgs({
  options: { docs: { type: 'string' }, 'no-write': { type: 'boolean' } },
});
const N = values.docs ? Number(values.docs) : 100_000;
const K = 200;
const TOP_TERMS = 20;
const load = loadavg()[0];
const started = performance.now();

const collection = generateCollection(N, 42);
// Document frequencies for an idf weight, then each document's 20 heaviest terms.
const df = new Int32Array(collection.terms);
for (let d = 0; d < N; d++) for (const t of new Set(collection.docTerms(d))) df[t]++;
const terms: TermWeights[] = [];
for (let d = 0; d < N; d++) {
  const tf = new Map<number, number>();
  for (const t of collection.docTerms(d)) tf.set(t, (tf.get(t) ?? 0) + 1);
  const weighted = [...tf].map(([t, c]) => [t, Math.log2(1 + c) * Math.log(N / df[t])] as const);
  weighted.sort((a, b) => b[1] - a[1] || a[0] - b[0]);
  const top = weighted.slice(0, TOP_TERMS).sort((a, b) => a[0] - b[0]);
  const norm = Math.sqrt(top.reduce((s, [, w]) => s + w * w, 0)) || 1;
  terms.push({
    ids: Int32Array.from(top, ([t]) => t),
    weights: Float64Array.from(top, ([, w]) => w / norm),
  });
}
const docVectors = new Float32Array(N * K);
{
  const g = mulberry32(7);
  for (let i = 0; i < docVectors.length; i++)
    docVectors[i] = Math.sqrt(-2 * Math.log(1 - g())) * Math.cos(2 * Math.PI * g());
}
const space = new ConceptSpace({
  params: {
    formatVersion: 1,
    analyzer: 'bench',
    k: K,
    requestedK: K,
    weighting: 'tf-idf',
    minDf: 2,
    scaling: 'projection',
  },
  terms: Array.from({ length: collection.terms }, (_, t) => `t${t}`),
  df,
  globalWeights: new Float64Array(collection.terms).fill(1),
  sigma: new Float64Array(K).fill(1),
  termVectors: new Float32Array(collection.terms * K),
  docIds: Array.from({ length: N }, (_, d) => d + 1),
  docVectors,
  foldedIn: new Uint8Array(N),
});
space.inverseNorms(); // built once per index version by the server, not per retrain
const setupS = (performance.now() - started) / 1000;

// Labels from a hidden rule (a direction in the concept space plus one topic's words)
// with noise, so the fit is a real fit rather than a separable toy.
const rand = mulberry32(99);
const direction = Float64Array.from({ length: K }, () => rand() - 0.5);
const labelOf = (d: number) => {
  let s = 0;
  for (let c = 0; c < K; c++) s += direction[c] * docVectors[d * K + c];
  return s + 0.8 * (rand() - 0.5) > 0 ? 1 : 0;
};

interface Row {
  coded: number;
  trainMs: number[];
  rankMs: number[];
  iterations: number;
}
const rows: Row[] = [];
for (const coded of (process.env.CODED ?? '500,2000,10000').split(',').map(Number)) {
  const row: Row = { coded, trainMs: [], rankMs: [], iterations: 0 };
  for (let rep = 0; rep < 3; rep++) {
    const examples: LabelledExample[] = [];
    for (let i = 0; i < coded; i++) {
      const d = (i * 7919 + rep * 104729) % N;
      examples.push({ ...documentExample(space, d, terms[d]), label: labelOf(d) as 0 | 1 });
    }
    const t0 = performance.now();
    const model = trainRanker(space, examples);
    const t1 = performance.now();
    scoreDocuments(space, model, (j) => terms[j]);
    const t2 = performance.now();
    row.trainMs.push(t1 - t0);
    row.rankMs.push(t2 - t1);
    row.iterations = model.logistic.iterations;
  }
  rows.push(row);
  console.log(row);
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const f = (x: number) => x.toFixed(0);
const worst = Math.max(...rows.map((r) => median(r.trainMs) + median(r.rankMs)));
const section = [
  '## Learned ranking: retrain and re-rank',
  '',
  `\`npm run bench:ranking\` (scripts/bench/ranking.ts), ${N.toLocaleString('en')} documents, k = ${K}, ${TOP_TERMS} strongest terms per document over a ${collection.terms.toLocaleString('en')}-term vocabulary; the engine calls the train-ranking job makes (trainRanker, then scoreDocuments over every document). Concept vectors are seeded Gaussian rows (timing depends on the shapes, not on SVD values); labels follow a hidden linear rule with noise. Median of 3 runs; 1-minute load average ${load.toFixed(1)} at the start on the shared 2-core machine, measured ${new Date().toISOString().slice(0, 10)}.`,
  '',
  '| Coded documents (training set) | Train (ms) | Re-rank all (ms) | Total (ms) | Newton steps |',
  '| ---: | ---: | ---: | ---: | ---: |',
  ...rows.map(
    (r) =>
      `| ${r.coded.toLocaleString('en')} | ${f(median(r.trainMs))} | ${f(median(r.rankMs))} | ${f(median(r.trainMs) + median(r.rankMs))} | ${r.iterations} |`,
  ),
  '',
  `Target (issue 16): retrain and re-rank a ${N >= 100_000 ? '100,000' : N.toLocaleString('en')}-document matter in under 5 s in the background. ${N >= 100_000 ? (worst < 5000 ? 'Met' : 'Not met') + ` on this run (slowest row ${f(worst)} ms).` : 'This was a smaller run than the target.'} Not included: reading each document's text and finding its strongest terms, which the job does once per index version and keeps in memory (server/prioritised/training.ts), and writing the scores (one BLOB of 8 bytes per document). Setup (synthetic collection) took ${setupS.toFixed(0)} s.`,
  '',
].join('\n');
console.log(section);
if (!values['no-write']) {
  const file = 'docs/PERFORMANCE.md';
  const existing = existsSync(file) ? readFileSync(file, 'utf8') : '# Performance\n';
  const re = /## Learned ranking: retrain and re-rank\n[\s\S]*?(?=\n## |$)/;
  const next = re.test(existing)
    ? existing.replace(re, section)
    : `${existing.trimEnd()}\n\n${section}`;
  writeFileSync(file, next.endsWith('\n') ? next : `${next}\n`);
}
