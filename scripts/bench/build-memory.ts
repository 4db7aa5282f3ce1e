// Peak memory of one index build, measured in a fresh process so that nothing else
// the benchmark did is counted: `node --import tsx scripts/bench/build-memory.ts <docs> [k]`.
// Generates the seeded synthetic collection (scripts/bench/synthetic.ts) and builds the concept
// space from its counts exactly as the product does after text analysis
// (ConceptSpace.fromCounts: log-entropy weights, the default truncated SVD, Float32
// term and document vectors, diagnostics). Prints one JSON object; scripts/bench/run.ts runs it
// for every size and reports it as the build's peak memory.
import { ConceptSpace } from '../../server/engine/index';
import { generateCollection } from './synthetic';

const docs = Number(process.argv[2]);
const k = Number(process.argv[3] ?? 300);
if (!Number.isInteger(docs) || docs <= 0 || !Number.isInteger(k) || k <= 0) {
  console.error('usage: scripts/bench/build-memory.ts <docs> [k]  (whole numbers above 0)');
  process.exit(2);
}
const collection = generateCollection(docs, 42);
const generatedPeakMb = process.resourceUsage().maxRSS / 1024;
const { diagnostics } = ConceptSpace.fromCounts(
  Array.from({ length: collection.terms }, (_, i) => `t${i}`),
  collection.counts,
  Array.from({ length: docs }, (_, d) => d + 1),
  { k },
  { countsDisposable: true }, // as ConceptSpace.build does with its own counts
);
console.log(
  JSON.stringify({
    docs,
    k: diagnostics.k,
    terms: diagnostics.nTerms,
    nnz: diagnostics.nnz,
    buildMs: diagnostics.buildMs,
    svdMs: diagnostics.svdMs,
    svdMethod: diagnostics.svdMethod,
    /** Peak resident memory of the whole process (generation included), MB. */
    peakRssMb: diagnostics.peakRssMb,
    /** Peak after generating the collection, before the build, MB. */
    generatedPeakMb,
  }),
);
