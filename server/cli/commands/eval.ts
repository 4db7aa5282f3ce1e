// `quarry eval`: runs a test collection (docs.jsonl, queries.jsonl, TREC qrels)
// through the engine in one mode and prints MAP, P@10, R-precision and nDCG@10.
// The index lives in memory for the run (an in-memory SQLite FTS5 table shaped
// like the server's for keyword and hybrid modes).
import { CliError } from '../cli-error';
import { parseCommandArgs, positiveInteger } from '../args';
import { EngineInputError } from '../../engine/index';
import { EvalInputError, readDocsJsonl, readQrels, readQueriesJsonl } from '../../engine/index';
import { partsFor, prepareCollection, runEvaluation } from '../../engine/index';
import { SEARCH_MODES, type SearchMode } from '../../engine/index';

const USAGE =
  'usage: quarry eval --docs d.jsonl --queries q.jsonl --qrels qrels.txt --mode concept|keyword|hybrid [--k N] [--json]';

export async function run(argv: string[]): Promise<void> {
  const { values } = parseCommandArgs(argv, {
    docs: { type: 'string' },
    queries: { type: 'string' },
    qrels: { type: 'string' },
    mode: { type: 'string' },
    k: { type: 'string' },
    json: { type: 'boolean', default: false },
    help: { type: 'boolean', default: false },
  });
  if (values.help) {
    console.log(USAGE);
    return;
  }
  for (const name of ['docs', 'queries', 'qrels', 'mode'] as const) {
    if (!values[name]) throw new CliError(`--${name} is required; ${USAGE}`);
  }
  const mode = values.mode as SearchMode;
  if (!SEARCH_MODES.includes(mode)) {
    throw new CliError(`--mode must be one of ${SEARCH_MODES.join(', ')}, got "${values.mode}"`);
  }
  const k = positiveInteger(values.k, 'k');

  try {
    const docs = readDocsJsonl(values.docs!);
    const queries = readQueriesJsonl(values.queries!);
    const qrels = readQrels(values.qrels!);
    if (docs.length === 0) throw new CliError(`${values.docs}: empty corpus, no documents`);
    if (queries.length === 0) throw new CliError(`${values.queries}: no queries`);
    const prepared = prepareCollection(docs, {
      parts: partsFor(mode),
      k,
      strictK: k !== undefined,
    });
    try {
      const result = runEvaluation(prepared, queries, qrels, mode);
      for (const notice of [...(prepared.diagnostics?.notices ?? []), ...result.notices]) {
        console.error(`quarry eval: ${notice}`);
      }
      if (result.metrics.queries === 0) {
        throw new CliError(
          'no query has a relevance judgement in the qrels file; nothing to evaluate',
        );
      }
      const summary = {
        mode,
        map: result.metrics.map,
        p10: result.metrics.p10,
        rprec: result.metrics.rprec,
        ndcg10: result.metrics.ndcg10,
        queries: result.metrics.queries,
        k: prepared.space?.k ?? null,
        build_ms: Math.round(prepared.buildMs),
        docs: docs.length,
        terms: prepared.space?.nTerms ?? null,
        weighting: prepared.space?.params.weighting ?? null,
        scaling: prepared.space?.params.scaling ?? null,
        search_ms_mean: Number(result.searchMs.mean.toFixed(2)),
      };
      if (values.json) {
        console.log(JSON.stringify(summary));
      } else {
        const f = (x: number) => x.toFixed(4);
        console.log(`mode          ${mode}${summary.k !== null ? ` (k = ${summary.k})` : ''}`);
        console.log(`queries       ${summary.queries}`);
        console.log(`MAP           ${f(summary.map)}`);
        console.log(`P@10          ${f(summary.p10)}`);
        console.log(`R-precision   ${f(summary.rprec)}`);
        console.log(`nDCG@10       ${f(summary.ndcg10)}`);
        console.log(`build         ${summary.build_ms} ms`);
      }
    } finally {
      prepared.close();
    }
  } catch (error) {
    if (error instanceof EvalInputError || error instanceof EngineInputError)
      throw new CliError(error.message);
    throw error;
  }
}
