// `npm run bench [-- --quick]`: the concept engine's benchmark report.
// For seeded synthetic collections (scripts/bench/synthetic.ts) of 10k, 50k and 100k documents
// (10k only with --quick): matrix build, truncated SVD at k = 100 and 300, save and load
// through the server's SQLite persistence (server/indexing/persist.ts, over the engine's BLOB codec), query latency over
// 200 fold-in + cosine queries, peak memory; and, when /usr/bin/python3 (or python3)
// has SciPy and scikit-learn, the same matrices through svds(solver='propack') and
// randomized_svd(n_iter=2, n_oversamples=20) for time and accuracy ratios.
// Writes scripts/bench/results.json and the table in docs/PERFORMANCE.md.

import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir, cpus, loadavg, totalmem } from 'node:os';
import { join } from 'node:path';
import SQLite from 'better-sqlite3';
import { Kysely, Migrator, SqliteDialect } from 'kysely';
import { generateCollection } from './synthetic';
import { truncatedSvd, type SvdOptions, type TruncatedSvd } from '../../server/engine/index';
import { energyKept, orthogonalityError } from '../../server/engine/index';
import { frobeniusNormSq, nnzOf, type CsrMatrix } from '../../server/engine/index';
import { writeMatrixMarket } from '../../server/engine/index';
import { applyWeights, globalWeights } from '../../server/engine/index';
import { ConceptSpace } from '../../server/engine/index';
import { loadConceptSpace, saveConceptSpace } from '../../server/indexing/persist';
import type { Database } from '../../server/db/schema';
import { ANALYZER_VERSION } from '../../server/engine/index';
import { migrations } from '../../migrations/index';
import { mulberry32 } from '../../server/engine/index';
import { search } from '../../server/engine/index';

const root = join(import.meta.dirname, '..', '..');
const outDir = join(root, 'scripts', 'bench', 'out');
const quick = process.argv.includes('--quick');
const sizesArg = process.argv.find((a) => a.startsWith('--sizes='));
// --sizes=10000,50000 runs only those sizes (for slow or shared machines).
const sizes = sizesArg
  ? sizesArg.slice('--sizes='.length).split(',').map(Number)
  : quick
    ? [10_000]
    : [10_000, 50_000, 100_000];
const ks = [100, 300];
// The product's default (truncatedSvd without a method: block Krylov while its dense
// work is small, else subspace iteration with q = 4) and scikit-learn's own parameters
// (randomized_svd(n_iter=2, n_oversamples=20): the same algorithm, for a like-for-like
// time), all measured at the same k on the same matrix.
const CONFIGS: { name: string; options: Partial<SvdOptions> }[] = [
  { name: 'default', options: {} },
  {
    name: 'randomized, q = 2, p = 20',
    options: { method: 'randomized', powerIterations: 2, oversample: 20 },
  },
];
const QUERIES = 200;

const peakMb = () => process.resourceUsage().maxRSS / 1024;
const rssMb = () => process.memoryUsage().rss / 2 ** 20;
const log = (...parts: unknown[]) =>
  console.log(`[bench ${new Date().toISOString().slice(11, 19)}]`, ...parts);

function findPython(): string | null {
  for (const candidate of ['/usr/bin/python3', 'python3']) {
    const r = spawnSync(candidate, ['-c', 'import scipy, sklearn'], { encoding: 'utf8' });
    if (r.status === 0) return candidate;
  }
  return null;
}

interface ReferenceRun {
  k: number;
  propack_s: number;
  propack_values: number[];
  randomized_s: number;
  randomized_values: number[];
}

function relErrors(values: ArrayLike<number>, reference: ArrayLike<number>, k: number) {
  let max = 0;
  const all: number[] = [];
  for (let i = 0; i < k; i++) {
    const e = Math.abs(values[i] - reference[i]) / reference[i];
    all.push(e);
    max = Math.max(max, e);
  }
  all.sort((x, y) => x - y);
  return { max, median: all[Math.floor(k / 2)] };
}

function conceptSpaceFrom(counts: CsrMatrix, g: Float64Array, svd: TruncatedSvd): ConceptSpace {
  const k = svd.k;
  const docVectors = new Float32Array(svd.cols * k);
  for (let d = 0; d < svd.cols; d++) {
    for (let c = 0; c < k; c++) docVectors[d * k + c] = svd.V[d * k + c] * svd.s[c];
  }
  const df = new Int32Array(counts.rows);
  for (let i = 0; i < counts.rows; i++) df[i] = counts.rowPtr[i + 1] - counts.rowPtr[i];
  return new ConceptSpace({
    params: {
      formatVersion: 1,
      analyzer: ANALYZER_VERSION,
      k,
      requestedK: k,
      weighting: 'log-entropy',
      minDf: 2,
      scaling: 'projection',
    },
    terms: Array.from({ length: counts.rows }, (_, i) => `t${i}`),
    df,
    globalWeights: g,
    sigma: Float64Array.from(svd.s),
    termVectors: Float32Array.from(svd.U),
    docIds: Array.from({ length: svd.cols }, (_, d) => d + 1),
    docVectors,
    foldedIn: new Uint8Array(svd.cols),
  });
}

async function saveAndLoad(space: ConceptSpace) {
  const dir = mkdtempSync(join(tmpdir(), 'quarry-bench-'));
  const sqlite = new SQLite(join(dir, 'bench.db'));
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('foreign_keys = ON');
  const db = new Kysely<Database>({ dialect: new SqliteDialect({ database: sqlite }) });
  try {
    const migrator = new Migrator({ db, provider: { getMigrations: async () => migrations } });
    const { error } = await migrator.migrateToLatest();
    if (error) throw error;
    const now = new Date().toISOString();
    sqlite
      .prepare(
        `INSERT INTO matters (id, name, control_prefix, created_at) VALUES (1, 'Bench', 'BEN', ?)`,
      )
      .run(now);
    const insert = sqlite.prepare(
      `INSERT INTO documents (id, matter_id, control_number, original_name, sha256, size, created_at)
       VALUES (?, 1, ?, ?, ?, 1, ?)`,
    );
    sqlite.transaction(() => {
      for (let d = 1; d <= space.nDocs; d++) insert.run(d, `BEN-${d}`, `d${d}.txt`, `sha${d}`, now);
    })();
    let t = performance.now();
    const indexId = await saveConceptSpace(db, space, null, { matterId: 1, version: 1 });
    const saveMs = performance.now() - t;
    t = performance.now();
    const loaded = await loadConceptSpace(db, indexId);
    const loadMs = performance.now() - t;
    if (loaded.nDocs !== space.nDocs || loaded.k !== space.k)
      throw new Error('round trip lost rows');
    // What the load reads: the Float32 term and document vectors (the BLOBs' bulk).
    const vectorMb = ((space.nDocs + space.terms.length) * space.k * 4) / 1e6;
    return {
      saveMs,
      loadMs,
      vectorMb,
      loadMsPer100Mb: loadMs / (vectorMb / 100),
      via: 'server/indexing/persist.ts (Kysely on better-sqlite3; Float32 BLOBs in the engine codec)',
    };
  } finally {
    await db.destroy();
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * 200 queries of 3-10 terms drawn from random documents through the engine's own
 * concept search (server/engine/search/search.ts: analysis, fold-in, cosine against every
 * document, top 50), one core, in-process.
 */
function queryLatency(space: ConceptSpace, docTerms: (d: number) => Int32Array, nDocs: number) {
  const rand = mulberry32(2024);
  const times: number[] = [];
  for (let qn = 0; qn < QUERIES; qn++) {
    const source = docTerms(Math.floor(rand() * nDocs));
    const words: string[] = [];
    const len = 3 + Math.floor(rand() * 8);
    for (let w = 0; w < len && source.length > 0; w++)
      words.push(`t${source[Math.floor(rand() * source.length)]}`);
    const t = performance.now();
    const result = search(space, words.join(' '), { mode: 'concept', limit: 50 });
    times.push(performance.now() - t);
    if (result.knownTerms.length === 0) throw new Error(`query "${words.join(' ')}" found no term`);
  }
  times.sort((x, y) => x - y);
  return { p50: times[Math.floor(QUERIES * 0.5)], p95: times[Math.floor(QUERIES * 0.95)] };
}

/** One product build (k = 300) in a fresh process, for its own peak memory: scripts/bench/build-memory.ts. */
function measureBuild(docs: number): Record<string, unknown> {
  log(`build in a fresh process (scripts/bench/build-memory.ts ${docs} 300)`);
  const r = spawnSync(
    process.execPath,
    [
      '--import',
      'tsx',
      '--max-old-space-size=8192',
      join(root, 'scripts', 'bench', 'build-memory.ts'),
      String(docs),
      '300',
    ],
    { encoding: 'utf8', cwd: root, maxBuffer: 1 << 24, timeout: 3_600_000 },
  );
  if (r.status !== 0) {
    const error = (r.stderr || '').trim().split('\n').at(-1) ?? `exit ${r.status}`;
    log(`build measurement failed: ${error}`);
    return { error };
  }
  const build = JSON.parse(r.stdout.trim().split('\n').at(-1)!) as Record<string, number>;
  log(
    `build: ${(build.buildMs / 1000).toFixed(1)} s (SVD ${(build.svdMs / 1000).toFixed(1)} s), peak RSS ${build.peakRssMb.toFixed(0)} MB (after generating the collection: ${build.generatedPeakMb.toFixed(0)} MB)`,
  );
  return build;
}

async function main() {
  mkdirSync(outDir, { recursive: true });
  const python = findPython();
  if (!python)
    log(
      'notice: python3 with scipy and sklearn not importable; skipping the PROPACK / randomized_svd comparison',
    );
  const results: Record<string, unknown>[] = [];
  for (const docs of sizes) {
    log(`--- ${docs} documents`);
    let t = performance.now();
    const collection = generateCollection(docs, 42);
    const generateMs = performance.now() - t;
    t = performance.now();
    const g = globalWeights('log-entropy', collection.counts);
    const a = applyWeights('log-entropy', collection.counts, g);
    const weightMs = performance.now() - t;
    const fro = frobeniusNormSq(a);
    log(
      `${collection.terms} terms x ${docs} docs, ${nnzOf(a)} nonzeros, ${collection.tokens} tokens; generate ${generateMs.toFixed(0)} ms, weight ${weightMs.toFixed(0)} ms`,
    );
    const mtx = join(outDir, `synthetic-${docs}.mtx`);
    await writeMatrixMarket(
      mtx,
      a,
      `Quarry bench synthetic collection, ${docs} documents, seed 42, log-entropy weights`,
    );
    const entry: Record<string, unknown> = {
      docs,
      terms: collection.terms,
      nnz: nnzOf(a),
      tokens: collection.tokens,
      generateMs,
      weightMs,
      svd: [] as unknown[],
    };
    const svds: Record<number, TruncatedSvd> = {};
    const others: { config: string; svd: TruncatedSvd }[] = [];
    const loadAtSvd: Record<string, number> = {};
    for (const k of ks)
      for (const config of CONFIGS) {
        const svd = truncatedSvd(a, { k, seed: 1, threads: 2, ...config.options });
        // Only k = 300's vectors are kept (for save, load and queries): U and V may be
        // views that keep the SVD's whole shared memory alive.
        if (config === CONFIGS[0])
          svds[k] = k === 300 ? svd : { ...svd, U: new Float64Array(0), V: new Float64Array(0) };
        else
          others.push({
            config: config.name,
            svd: { ...svd, U: new Float64Array(0), V: new Float64Array(0) },
          });
        const row = {
          k,
          config: config.name,
          ms: svd.ms,
          method: svd.method,
          sigma1: svd.s[0],
          sigmaK: svd.s[k - 1],
          energy: energyKept(svd.s, fro),
          orthogonalityU: orthogonalityError(svd.U, svd.rows, k),
          orthogonalityV: orthogonalityError(svd.V, svd.cols, k),
          peakRssMb: peakMb(),
          values: Array.from(svd.s),
          loadAverage: loadavg(),
        };
        loadAtSvd[`${k}|${config.name}`] = row.loadAverage[0];
        (entry.svd as unknown[]).push(row);
        log(
          `svd k=${k} [${config.name}]: ${svd.ms.toFixed(0)} ms (${svd.method}), sigma_1 ${svd.s[0].toFixed(4)}, sigma_k ${svd.s[k - 1].toFixed(4)}, energy ${row.energy.toFixed(4)}, peak RSS ${row.peakRssMb.toFixed(0)} MB`,
        );
      }
    if (python) {
      log(`reference: ${python} scripts/bench/reference.py ${mtx} ${ks.join(' ')}`);
      const r = spawnSync(
        python,
        [join(root, 'scripts', 'bench', 'reference.py'), mtx, ...ks.map(String)],
        {
          encoding: 'utf8',
          maxBuffer: 1 << 28,
          timeout: 3_600_000,
          env: { ...process.env, SCIPY_USE_PROPACK: '1' },
        },
      );
      if (r.status !== 0) {
        log(`reference failed (exit ${r.status}): ${(r.stderr || '').trim().split('\n').at(-1)}`);
        entry.reference = { error: (r.stderr || '').trim().split('\n').at(-1) };
      } else {
        const ref = JSON.parse(r.stdout) as {
          runs: ReferenceRun[];
          read_s: number;
          versions: Record<string, string>;
        };
        entry.reference = { readS: ref.read_s, versions: ref.versions, runs: [] as unknown[] };
        const compareRun = (run: ReferenceRun, config: string, ours: TruncatedSvd) => {
          const oursErr = relErrors(ours.s, run.propack_values, run.k);
          const sklErr = relErrors(run.randomized_values, run.propack_values, run.k);
          const cmp = {
            k: run.k,
            config,
            propackMs: run.propack_s * 1000,
            sklearnMs: run.randomized_s * 1000,
            quarryMs: ours.ms,
            method: ours.method,
            loadAverage1m: loadAtSvd[`${run.k}|${config}`],
            quarryVsSklearnTime: ours.ms / (run.randomized_s * 1000),
            quarryVsPropackTime: ours.ms / (run.propack_s * 1000),
            quarryMaxRelErr: oursErr.max,
            quarryMedianRelErr: oursErr.median,
            sklearnMaxRelErr: sklErr.max,
            sklearnMedianRelErr: sklErr.median,
            propackValues: run.propack_values,
            sklearnValues: run.randomized_values,
          };
          (entry.reference as { runs: unknown[] }).runs.push(cmp);
          log(
            `k=${run.k} [${config}]: PROPACK ${run.propack_s.toFixed(1)} s, sklearn ${run.randomized_s.toFixed(1)} s, Quarry ${(ours.ms / 1000).toFixed(1)} s (x${cmp.quarryVsSklearnTime.toFixed(2)} of sklearn, x${cmp.quarryVsPropackTime.toFixed(2)} of PROPACK); max rel. error vs PROPACK: Quarry ${oursErr.max.toExponential(2)}, sklearn ${sklErr.max.toExponential(2)}; median: Quarry ${oursErr.median.toExponential(2)}, sklearn ${sklErr.median.toExponential(2)}`,
          );
        };
        for (const run of ref.runs) {
          for (const ours of [
            { config: CONFIGS[0].name, svd: svds[run.k] },
            ...others.filter((o) => o.svd.k === run.k),
          ]) {
            compareRun(run, ours.config, ours.svd);
          }
        }
      }
    } else if (docs === sizes[0]) {
      // Without SciPy: a converged Lanczos reference of our own, smallest size, k = 100.
      const ref = truncatedSvd(a, { k: 100, method: 'lanczos', tolerance: 1e-8 });
      const err = relErrors(svds[100].s, ref.s, 100);
      entry.reference = {
        lanczos: {
          k: 100,
          ms: ref.ms,
          method: ref.method,
          quarryMaxRelErr: err.max,
          quarryMedianRelErr: err.median,
        },
      };
      log(
        `Lanczos reference k=100: ${ref.ms.toFixed(0)} ms; randomized max rel. error ${err.max.toExponential(2)}`,
      );
    }
    const space = conceptSpaceFrom(collection.counts, g, svds[300]);
    delete svds[100];
    delete svds[300];
    const persisted = await saveAndLoad(space);
    entry.persist = { k: 300, ...persisted };
    log(
      `save ${persisted.saveMs.toFixed(0)} ms, load ${persisted.loadMs.toFixed(0)} ms for ${persisted.vectorMb.toFixed(0)} MB of vectors (${persisted.loadMsPer100Mb.toFixed(0)} ms per 100 MB; ${persisted.via})`,
    );
    const latency = queryLatency(space, collection.docTerms, docs);
    entry.query = { k: 300, queries: QUERIES, ...latency };
    log(`query p50 ${latency.p50.toFixed(2)} ms, p95 ${latency.p95.toFixed(2)} ms`);
    entry.peakRssMb = peakMb();
    entry.rssMbAfter = rssMb();
    entry.build = measureBuild(docs);
    results.push(entry);
    log(`peak RSS so far ${peakMb().toFixed(0)} MB`);
    await writeReport(results, false);
  }
  await writeReport(results, true);
  log('done');
}

async function writeReport(results: Record<string, unknown>[], complete: boolean) {
  const report = {
    complete,
    generatedAt: new Date().toISOString(),
    quick,
    machine: {
      cpus: cpus().length,
      cpuModel: cpus()[0]?.model,
      memGb: totalmem() / 2 ** 30,
      node: process.version,
      loadAverage: (await import('node:os')).loadavg(),
    },
    results,
  };
  writeFileSync(
    join(root, 'scripts', 'bench', quick ? 'results-quick.json' : 'results.json'),
    `${JSON.stringify(report, null, 2)}\n`,
  );
  if (!quick) writePerformanceDoc(report);
}

function writePerformanceDoc(report: {
  complete: boolean;
  generatedAt: string;
  machine: Record<string, unknown>;
  results: Record<string, unknown>[];
}) {
  const path = join(root, 'docs', 'PERFORMANCE.md');
  let doc = '';
  try {
    doc = readFileSync(path, 'utf8');
  } catch {
    doc = '# Performance\n';
  }
  const begin = '<!-- bench:begin -->';
  const end = '<!-- bench:end -->';
  const f = (x: unknown, d = 0) => (typeof x === 'number' ? x.toFixed(d) : '-');
  const lines: string[] = [
    begin,
    '',
    `Generated by \`npm run bench\` at ${report.generatedAt} on ${String(report.machine.cpus)} cores (${String(report.machine.cpuModel)}), Node ${String(report.machine.node)}, load average at the end ${JSON.stringify(report.machine.loadAverage)}.${report.complete ? '' : ' PARTIAL: written after each size while the run was still going; only the sizes listed had finished.'}`,
    '',
  ];
  lines.push(
    '| docs | terms | nnz | generate+CSR ms | weight ms | SVD k=100 s | SVD k=300 s | save s | load s (vectors MB; s per 100 MB) | query p50 ms | query p95 ms | peak RSS MB, whole bench so far | build k=300 in a fresh process: s, peak RSS MB |',
  );
  lines.push('|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|');
  for (const r of report.results) {
    const svd = (r.svd as { k: number; ms: number; config?: string }[]).filter(
      (row) => row.config === undefined || row.config === CONFIGS[0].name,
    );
    const p = r.persist as {
      saveMs: number;
      loadMs: number;
      vectorMb?: number;
      loadMsPer100Mb?: number;
    };
    const q = r.query as { p50: number; p95: number };
    const build = r.build as { buildMs?: number; peakRssMb?: number } | undefined;
    lines.push(
      `| ${String(r.docs)} | ${String(r.terms)} | ${String(r.nnz)} | ${f(r.generateMs)} | ${f(r.weightMs)} | ${f(svd[0].ms / 1000, 1)} | ${f(svd[1].ms / 1000, 1)} | ${f(p.saveMs / 1000, 1)} | ${f(p.loadMs / 1000, 2)} (${f(p.vectorMb)}; ${f((p.loadMsPer100Mb ?? NaN) / 1000, 2)}) | ${f(q.p50, 1)} | ${f(q.p95, 1)} | ${f(r.peakRssMb)} | ${build?.buildMs === undefined ? '-' : `${f(build.buildMs / 1000, 1)} s, ${f(build.peakRssMb)} MB`} |`,
    );
  }
  const refRows: string[] = [];
  for (const r of report.results) {
    const ref = r.reference as
      | { runs?: (Record<string, number> & { config?: string; method?: string })[]; error?: string }
      | undefined;
    for (const run of ref?.runs ?? []) {
      refRows.push(
        `| ${String(r.docs)} | ${run.k} | ${run.config === CONFIGS[0].name && run.method ? `default: ${String(run.method)}` : String(run.config)} | ${f(run.propackMs / 1000, 1)} | ${f(run.sklearnMs / 1000, 1)} | ${f(run.quarryMs / 1000, 1)} | ${f(run.quarryVsSklearnTime, 2)} | ${f(run.quarryVsPropackTime, 2)} | ${run.quarryMaxRelErr.toExponential(1)} / ${run.quarryMedianRelErr.toExponential(1)} | ${run.sklearnMaxRelErr.toExponential(1)} / ${run.sklearnMedianRelErr.toExponential(1)} | ${f(run.loadAverage1m, 1)} |`,
      );
    }
  }
  if (refRows.length > 0) {
    lines.push(
      '',
      'Against SciPy `svds(solver="propack")` and scikit-learn `randomized_svd(n_iter=2, n_oversamples=20)` on the same .mtx files (relative error of sigma_1..sigma_k against PROPACK, max / median):',
      '',
    );
    lines.push(
      '| docs | k | Quarry configuration | PROPACK s | sklearn s | Quarry s | Quarry/sklearn time | Quarry/PROPACK time | Quarry rel. err max / median | sklearn rel. err max / median | load avg (1 min) after Quarry run |',
    );
    lines.push('|---:|---:|---|---:|---:|---:|---:|---:|---:|---:|---:|');
    lines.push(...refRows);
  } else {
    lines.push('', 'SciPy / scikit-learn were not importable: no PROPACK comparison in this run.');
  }
  lines.push('', end);
  const block = lines.join('\n');
  const start = doc.indexOf(begin);
  const stop = doc.indexOf(end);
  doc =
    start >= 0 && stop > start
      ? doc.slice(0, start) + block + doc.slice(stop + end.length)
      : `${doc.trimEnd()}\n\n${block}\n`;
  writeFileSync(path, doc);
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
