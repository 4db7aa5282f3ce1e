// Load (issue 11): 200 concurrent searches on the demo matter against a Quarry server on
// the loopback address, with a signed-in user's `GET /api/auth/me` timed meanwhile, as a
// person using the app while others search would see it. Written to docs/PERFORMANCE.md
// under "Load: 200 concurrent searches" (only that section is replaced) and to
// scripts/bench/load-results.json. A script, not a test:
//   npm run bench:load [-- --seconds 30 --connections 200 --data-dir DIR]
// The server runs in a child process (`node --import tsx server/main.ts`, demo mode, the
// demo corpus seeded on first run), so the load generator (autocannon, in this process)
// does not share its event loop. --data-dir keeps the seeded data for the next run.
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import autocannon from 'autocannon';

const args = process.argv.slice(2);
const flag = (name: string, fallback: number) => {
  const i = args.indexOf(`--${name}`);
  return i >= 0 ? Number(args[i + 1]) : fallback;
};
const SECONDS = flag('seconds', 30);
const CONNECTIONS = flag('connections', 200);
const dataDirAt = args.indexOf('--data-dir');
const keepData = dataDirAt >= 0;
const DATA_DIR = keepData ? args[dataDirAt + 1] : mkdtempSync(join(tmpdir(), 'quarry-load-'));
const PASSWORD = 'quarry-demo';

// Searches a reviewer of the demo matter would type (its scenario: corpus-demo/README.md),
// in the three modes.
const QUERIES = [
  'weevils in the flour',
  'metal swarf intake magnet',
  'moisture content of the flour',
  'notice of termination',
  'master supply agreement',
  'black specks in the dough',
  'wire found in a loaf',
  'rejected loads',
  'sieve inspection insect fragments',
  'credit note invoice dispute',
  'mill cleaning schedule',
  'customer complaint',
];
const MODES = ['hybrid', 'concept', 'keyword'] as const;

const pct = (sorted: number[], p: number) =>
  sorted.length === 0
    ? NaN
    : sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];

function startServer(): Promise<{ child: ChildProcess; baseUrl: string }> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
    env: {
      ...process.env,
      QUARRY_DATA_DIR: DATA_DIR,
      PORT: '0',
      QUARRY_LOG_LEVEL: 'warn',
      QUARRY_DEMO: '1',
      QUARRY_SEED_CORPUS: '1',
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  return new Promise((resolve, reject) => {
    let out = '';
    child.stdout!.on('data', (chunk: Buffer) => {
      out += chunk.toString();
      const m = /Quarry is running on (http:\/\/localhost:\d+)/.exec(out);
      if (m) resolve({ child, baseUrl: m[1].replace('localhost', '127.0.0.1') });
    });
    child.once('exit', (code) => reject(new Error(`the server exited (${code}): ${out}`)));
  });
}

async function signIn(baseUrl: string, email: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: baseUrl },
    body: JSON.stringify({ email, password: PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${email}: ${res.status} ${await res.text()}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

async function getJson<T>(baseUrl: string, path: string, cookie: string): Promise<T> {
  const res = await fetch(`${baseUrl}${path}`, { headers: { cookie, origin: baseUrl } });
  if (res.status !== 200) throw new Error(`GET ${path}: ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

async function main() {
  const loadAtStart = loadavg();
  const started = performance.now();
  const { child, baseUrl } = await startServer();
  try {
    const attorney = await signIn(baseUrl, 'attorney@quarry.example');
    const signedIn = await signIn(baseUrl, 'reviewer@quarry.example');
    const { matters } = await getJson<{ matters: { id: number; name: string }[] }>(
      baseUrl,
      '/api/matters',
      attorney,
    );
    const matter = matters[0];
    // Wait for the seeded corpus to be extracted and indexed.
    for (;;) {
      const state = await getJson<{ current: unknown; activeJob: unknown }>(
        baseUrl,
        `/api/matters/${matter.id}/index`,
        attorney,
      );
      if (state.current && !state.activeJob) break;
      await new Promise((r) => setTimeout(r, 1000));
    }
    const searchPath = `/api/matters/${matter.id}/search`;
    let n = 0;
    const nextBody = () => {
      const i = n++;
      return JSON.stringify({
        query: QUERIES[i % QUERIES.length],
        mode: MODES[Math.floor(i / QUERIES.length) % MODES.length],
      });
    };
    const headers = { 'content-type': 'application/json', origin: baseUrl, cookie: attorney };
    for (let w = 0; w < QUERIES.length * MODES.length; w++) {
      const res = await fetch(`${baseUrl}${searchPath}`, {
        method: 'POST',
        headers,
        body: nextBody(),
      });
      if (res.status !== 200) throw new Error(`warm-up search: ${res.status} ${await res.text()}`);
      await res.arrayBuffer();
    }
    const documents = (
      await getJson<{ total: number }>(
        baseUrl,
        `/api/matters/${matter.id}/documents?pageSize=1`,
        attorney,
      )
    ).total;

    // The signed-in user's check, one request at a time every 100 ms while the load runs.
    // It runs in a worker thread of its own: autocannon's 200 connections keep this
    // process's event loop busy, and a probe sharing that loop would time the load
    // generator's own backlog instead of the server (a second user is on another machine).
    const probeWorker = new Worker(
      `const { parentPort, workerData } = require('node:worker_threads');
      const me = []; let errors = 0; let probing = true;
      parentPort.on('message', () => { probing = false; });
      (async () => {
        while (probing) {
          const s = performance.now();
          try {
            const res = await fetch(workerData.url, { headers: { cookie: workerData.cookie } });
            await res.arrayBuffer();
            if (res.status !== 200) errors++;
          } catch { errors++; }
          me.push(performance.now() - s);
          await new Promise((r) => setTimeout(r, 100));
        }
        parentPort.postMessage({ me, errors });
      })();`,
      { eval: true, workerData: { url: `${baseUrl}/api/auth/me`, cookie: signedIn } },
    );
    const probed = new Promise<{ me: number[]; errors: number }>((resolve, reject) => {
      probeWorker.once('message', resolve);
      probeWorker.once('error', reject);
    });

    const loadBefore = loadavg();
    const latencies: number[] = [];
    const statuses = new Map<number, number>();
    const instance = autocannon({
      url: baseUrl,
      connections: CONNECTIONS,
      duration: SECONDS,
      timeout: 30,
      requests: [
        {
          method: 'POST',
          path: searchPath,
          headers,
          setupRequest: (req) => ({ ...req, body: nextBody() }),
        },
      ],
    });
    instance.on('response', (_client, statusCode, _bytes, responseTime) => {
      latencies.push(responseTime);
      statuses.set(statusCode, (statuses.get(statusCode) ?? 0) + 1);
    });
    const result = await instance;
    probeWorker.postMessage('stop');
    const { me, errors: meErrors } = await probed;
    await probeWorker.terminate();
    const loadAfter = loadavg();

    latencies.sort((a, b) => a - b);
    me.sort((a, b) => a - b);
    const non2xx = [...statuses].filter(([s]) => s !== 200).reduce((a, [, c]) => a + c, 0);
    const errors = result.errors + result.timeouts + non2xx;
    const figures = {
      date: new Date().toISOString(),
      documents,
      connections: CONNECTIONS,
      seconds: SECONDS,
      searches: latencies.length,
      searchesPerSecond: latencies.length / SECONDS,
      errors: { socket: result.errors, timeouts: result.timeouts, non200: non2xx },
      searchMs: {
        p50: pct(latencies, 50),
        p95: pct(latencies, 95),
        p99: pct(latencies, 99),
        max: latencies.at(-1) ?? NaN,
      },
      meMs: { count: me.length, p50: pct(me, 50), p95: pct(me, 95), max: me.at(-1) ?? NaN },
      meErrors,
      load: { atStart: loadAtStart, before: loadBefore, after: loadAfter },
    };
    console.log(JSON.stringify(figures, null, 2));
    writeFileSync('scripts/bench/load-results.json', `${JSON.stringify(figures, null, 2)}\n`);

    const f = (x: number) => x.toFixed(0);
    const loads = (l: number[]) => l.map((x) => x.toFixed(2)).join(' / ');
    const met = errors === 0 && figures.searchMs.p95 < 600 && figures.meMs.p95 < 100;
    const section = [
      '## Load: 200 concurrent searches',
      '',
      `\`npm run bench:load\` (scripts/bench/load.ts), ${figures.date.slice(0, 10)}: the demo matter (${documents} documents, seeded by`,
      "`npm start`'s demo step) served by `node --import tsx server/main.ts` in a child process on 127.0.0.1; autocannon in the",
      `bench process keeps ${CONNECTIONS} connections busy for ${SECONDS} s with \`POST /api/matters/:matterId/search\` (${QUERIES.length} reviewer`,
      'queries in hybrid, concept and keyword mode in turn, 50 hits per page with snippets and why-it-matched, each audited),',
      'while another signed-in user calls `GET /api/auth/me` every 100 ms, one request at a time. Latency is per request,',
      "from autocannon's send to the full response (so it includes the wait behind the other connections).",
      '',
      `Machine: ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown'}); load average (1 / 5 / 15 min) ${loads(loadAtStart)} when this script`,
      `started, ${loads(loadBefore)} when the load began and ${loads(loadAfter)} at its end (other work shares this machine).`,
      '',
      '| Measure | Value |',
      '| --- | ---: |',
      `| Searches completed | ${latencies.length} (${figures.searchesPerSecond.toFixed(1)} per second) |`,
      `| Errors (socket / timeout / non-200) | ${result.errors} / ${result.timeouts} / ${non2xx} |`,
      `| Search latency p50 / p95 / p99 / max (ms) | ${f(figures.searchMs.p50)} / ${f(figures.searchMs.p95)} / ${f(figures.searchMs.p99)} / ${f(figures.searchMs.max)} |`,
      `| \`GET /api/auth/me\` during the load: p50 / p95 / max (ms), ${me.length} calls | ${figures.meMs.p50.toFixed(1)} / ${figures.meMs.p95.toFixed(1)} / ${figures.meMs.max.toFixed(1)} |`,
      '',
      `Target (issue 11): 0 errors, search p95 under 600 ms, \`GET /api/auth/me\` p95 under 100 ms while the load runs. ${met ? 'Met' : 'Not met'} on this run.`,
      `Total bench time ${((performance.now() - started) / 1000).toFixed(0)} s.`,
      '',
    ].join('\n');
    console.log(section);
    const file = 'docs/PERFORMANCE.md';
    const existing = existsSync(file) ? readFileSync(file, 'utf8') : '# Performance\n';
    const re = /## Load: 200 concurrent searches\n[\s\S]*?(?=\n## |$)/;
    const next = re.test(existing)
      ? existing.replace(re, section)
      : `${existing.trimEnd()}\n\n${section}`;
    writeFileSync(file, next.endsWith('\n') ? next : `${next}\n`);
  } finally {
    child.kill('SIGTERM');
    await new Promise((r) => child.once('exit', r));
    if (!keepData) rmSync(DATA_DIR, { recursive: true, force: true });
  }
}

await main();
