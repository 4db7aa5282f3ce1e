// Measures retrieval on Cranfield for docs/RETRIEVAL.md:
//   node --import tsx server/engine/eval/tune-cranfield.ts [--quick]
// Prints one line per configuration (mode, weighting, scaling, k, minDf, fusion).
import { cranfieldAvailable, readCranfield } from './cranfield';
import { prepareCollection, runEvaluation } from './evaluate';

if (!cranfieldAvailable()) {
  console.error('Cranfield not found at ../shared/data/cranfield');
  process.exit(1);
}
const { docs, queries, qrels } = readCranfield();
const fmt = (x: number) => x.toFixed(4);
const line = (label: string, m: { map: number; p10: number; rprec: number; ndcg10: number }) =>
  console.log(
    `${label.padEnd(58)} MAP ${fmt(m.map)}  P@10 ${fmt(m.p10)}  R-prec ${fmt(m.rprec)}  nDCG@10 ${fmt(m.ndcg10)}`,
  );

const args = process.argv.slice(2);
const ks = args.includes('--quick') ? [200] : [100, 150, 200, 300];
const only = args.includes('--hybrid-only');
const kw = prepareCollection(docs, { parts: ['keyword'] });
line('keyword bm25 (FTS5, title 1 body 1)', runEvaluation(kw, queries, qrels, 'keyword').metrics);
for (const weighting of only ? [] : (['log-entropy', 'tf-idf'] as const)) {
  for (const scaling of ['projection', 'classic'] as const) {
    for (const k of ks) {
      const p = prepareCollection(docs, { parts: ['concept'], k, weighting, scaling, minDf: 2 });
      line(
        `concept ${weighting} ${scaling} k=${k} (build ${p.diagnostics!.buildMs.toFixed(0)} ms)`,
        runEvaluation(p, queries, qrels, 'concept').metrics,
      );
    }
  }
}
const both = prepareCollection(docs, { k: 200, weighting: 'log-entropy', scaling: 'projection' });
for (const conceptDims of [25, 50, 75, 100, 150, 200]) {
  for (const keywordWeight of [0.2, 0.3, 0.4, 0.5, 0.6, 0.7]) {
    line(
      `hybrid dims=${conceptDims} w=${keywordWeight}`,
      runEvaluation(both, queries, qrels, 'hybrid', { hybrid: { conceptDims, keywordWeight } })
        .metrics,
    );
  }
}
