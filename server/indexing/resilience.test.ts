// Documents that used to freeze the server (a token of 100,000 digits, an e-mail whose
// Subject is 8 MiB of one letter), and restarts after a crash: over HTTP against a real
// app (tests/helpers). The event loop's delay is measured with
// perf_hooks.monitorEventLoopDelay while the work runs; the bound is generous for a
// loaded 2-core machine and still far below the seconds (100,000 digits: 14.6 s) and
// minutes (8 MiB Subject) the same documents blocked it before analysis was linear and
// folding-in ran in a worker thread.
import { mkdtempSync, rmSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeText } from '../../corpus-demo/render';
import { QUERY_MAX_LENGTH } from '../../shared/limits';
import type { UploadBatchResponse } from '../../shared/schemas/documents';
import type { JobResponse } from '../../shared/schemas/jobs';
import type { SearchResponse } from '../../shared/schemas/search';
import { keywordQueryTerms, TOKEN_MAX_BYTES } from '../engine/index';
import { createTestApp, type Agent, type TestApp, type TestMatter } from '../../tests/helpers';

/**
 * Largest event-loop delay allowed while heavy documents are handled (ms); relaxed when
 * the machine's load average exceeds twice its cores (the operating system alone then
 * delays the loop by hundreds of milliseconds).
 */
const LOOP_DELAY_BOUND_MS = loadavg()[0] > 2 * cpus().length ? 3000 : 1000;

// Our own data folder, opened again by each restart (createTestApp leaves it in place).
const dataDir = mkdtempSync(join(tmpdir(), 'quarry-resilience-'));
let t: TestApp;
let matter: TestMatter;
let paralegal: Agent;
let paralegalId: string;
const ids: { digits: number; subject: number } = { digits: 0, subject: 0 };

async function waitForJob(agent: Agent, jobId: number, timeoutMs = 120_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await agent.get(`/api/jobs/${jobId}`);
    expect(res.status).toBe(200);
    const job = (res.body as JobResponse).job;
    if (job.status === 'succeeded' || job.status === 'failed') return job;
    if (Date.now() > deadline) throw new Error(`job ${jobId} still ${job.status}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

async function upload(files: { name: string; content: Buffer }[]) {
  let req = paralegal.post(`/api/matters/${matter.id}/documents`);
  for (const f of files) req = req.attach('files', f.content, f.name);
  const res = await req;
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  const batch = res.body as UploadBatchResponse;
  const job = await waitForJob(paralegal, batch.jobId!);
  expect(job.status, job.error ?? '').toBe('succeeded');
  return batch;
}

/** Runs `work` and returns the largest event-loop delay seen meanwhile (ms). */
async function maxLoopDelay(work: () => Promise<void>): Promise<number> {
  const histogram = monitorEventLoopDelay({ resolution: 10 });
  histogram.enable();
  try {
    await work();
  } finally {
    histogram.disable();
  }
  return histogram.max / 1e6;
}

/** An RFC 5322 message written out by hand, so nothing folds or encodes the Subject. */
function rawEmail(subject: string, body: string): Buffer {
  return Buffer.from(
    [
      'From: Ann Miller <ann@mill.example.com>',
      'To: Bo Chen <bo@bakery.example.com>',
      `Subject: ${subject}`,
      'Date: Tue, 2 Mar 2021 10:00:00 +0000',
      'Message-ID: <long-subject@quarry.example>',
      'MIME-Version: 1.0',
      'Content-Type: text/plain; charset=utf-8',
      '',
      body,
      '',
    ].join('\r\n'),
  );
}

async function indexedIds(app: TestApp): Promise<Set<number>> {
  const current = await app.ctx.db
    .selectFrom('matters')
    .select('current_index_id')
    .where('id', '=', matter.id)
    .executeTakeFirstOrThrow();
  const rows = await app.ctx.db
    .selectFrom('index_docs')
    .select('document_id')
    .where('index_id', '=', current.current_index_id!)
    .execute();
  return new Set(rows.map((r) => r.document_id));
}

beforeAll(async () => {
  t = await createTestApp({ dataDir });
  matter = await t.buildMatter({ controlPrefix: 'HVY' });
  const user = await t.buildUser();
  paralegalId = user.id;
  await t.addMember(matter, user, 'paralegal');
  paralegal = await t.agentFor(user);
  // A matter with a built index, so the heavy documents are folded in.
  await upload([
    { name: 'flour.txt', content: makeText('The mill delivered damp wheat flour to the bakery.') },
    { name: 'bread.txt', content: makeText('The bread collapsed because the flour was damp.') },
    { name: 'lease.txt', content: makeText('The warehouse lease has a landlord break clause.') },
  ]);
  await t.ctx.jobs.waitForIdle();
}, 120_000);

afterAll(async () => {
  await t?.close();
  rmSync(dataDir, { recursive: true, force: true });
});

describe('documents with giant tokens', () => {
  it('extracts, folds in and finds them without blocking the event loop', async () => {
    // Made before measuring: this test's own thread is the server's.
    const files = [
      { name: 'digits.txt', content: makeText('1'.repeat(100_000)) },
      {
        name: 'long-subject.eml',
        content: rawEmail('S'.repeat(8 * 1024 * 1024), 'Sourdough starter invoice attached.'),
      },
    ];
    const delay = await maxLoopDelay(async () => {
      const batch = await upload(files);
      ids.digits = batch.files[0].id;
      ids.subject = batch.files[1].id;
      await t.ctx.jobs.waitForIdle();
      // The keyword index takes the new texts in on the next search.
      const res = await paralegal
        .post(`/api/matters/${matter.id}/search`)
        .send({ query: 'sourdough', mode: 'hybrid' });
      expect(res.status).toBe(200);
      expect((res.body as SearchResponse).hits.map((h) => h.documentId)).toContain(ids.subject);
    });
    console.log(
      `giant tokens: event loop max delay ${delay.toFixed(0)} ms (load average ${loadavg()[0].toFixed(1)})`,
    );
    expect(delay).toBeLessThan(LOOP_DELAY_BOUND_MS);

    const indexed = await indexedIds(t);
    expect(indexed.has(ids.digits)).toBe(true);
    expect(indexed.has(ids.subject)).toBe(true);
    // The digits are one token, kept as its first 32,768 bytes (as SQLite FTS5 keeps it).
    const keyword = await t.ctx.keyword.indexFor(matter.id);
    const { terms } = keywordQueryTerms('1'.repeat(TOKEN_MAX_BYTES + 10));
    expect(keyword.search(terms, { limit: 5 }).ids).toEqual([ids.digits]);
  }, 120_000);

  it('answers a query of 19,990 digits quickly and refuses one over the cap with a 400', async () => {
    const delay = await maxLoopDelay(async () => {
      const res = await paralegal
        .post(`/api/matters/${matter.id}/search`)
        .send({ query: '7'.repeat(19_990), mode: 'hybrid' });
      expect(res.status).toBe(200);
    });
    expect(delay).toBeLessThan(LOOP_DELAY_BOUND_MS);
    const tooLong = await paralegal
      .post(`/api/matters/${matter.id}/search`)
      .send({ query: 'a'.repeat(QUERY_MAX_LENGTH + 1), mode: 'keyword' });
    expect(tooLong.status).toBe(400);
    expect(JSON.stringify(tooLong.body)).toContain(`at most ${QUERY_MAX_LENGTH} characters`);
  });
});

describe('start-up recovery', () => {
  it('folds in a document extracted just before a crash, without freezing the server', async () => {
    // As a crash leaves it: both heavy documents extracted, neither in the serving version.
    const before = await indexedIds(t);
    expect(before.has(ids.subject)).toBe(true);
    const current = [...before];
    await t.ctx.db
      .deleteFrom('index_docs')
      .where('document_id', 'in', [ids.digits, ids.subject])
      .execute();
    expect(current.length).toBeGreaterThan(2);
    await t.close();
    let recovered: { folded: number } = { folded: 0 };
    const delay = await maxLoopDelay(async () => {
      t = await createTestApp({ dataDir });
      recovered = await t.ctx.index.recovery;
      await t.ctx.jobs.waitForIdle();
    });
    expect(delay).toBeLessThan(LOOP_DELAY_BOUND_MS);
    expect(recovered.folded).toBe(2);
    const after = await indexedIds(t);
    expect(after.has(ids.digits) && after.has(ids.subject)).toBe(true);
    // The same server then takes a small upload in its stride.
    paralegal = await t.agentFor({ id: paralegalId });
    const small = await maxLoopDelay(async () => {
      await upload([{ name: 'note.txt', content: makeText('Damp flour again this week.') }]);
    });
    expect(small).toBeLessThan(LOOP_DELAY_BOUND_MS);
  }, 120_000);

  it('queues an interrupted rebuild again, which then replaces the serving version', async () => {
    await t.ctx.jobs.waitForIdle();
    const matterRow = await t.ctx.db
      .selectFrom('matters')
      .select('current_index_id')
      .where('id', '=', matter.id)
      .executeTakeFirstOrThrow();
    const latest = await t.ctx.db
      .selectFrom('index_versions')
      .select((eb) => eb.fn.max<number>('version').as('version'))
      .where('matter_id', '=', matter.id)
      .executeTakeFirstOrThrow();
    expect(matterRow.current_index_id).not.toBeNull();
    // As a crash during a requested rebuild leaves it: the job running, its version building.
    const now = new Date().toISOString();
    const job = await t.ctx.db
      .insertInto('jobs')
      .values({
        matter_id: matter.id,
        kind: 'build-index',
        status: 'running',
        payload: JSON.stringify({ reason: 'requested', k: 2 }),
        progress: 40,
        total: 100,
        message: 'Computing the concept space',
        created_by: null,
        created_at: now,
        started_at: now,
        finished_at: null,
        error: null,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    await t.ctx.db
      .insertInto('index_versions')
      .values({
        matter_id: matter.id,
        version: latest.version + 1,
        status: 'building',
        k: 2,
        weighting: 'log-entropy',
        params: JSON.stringify({ requestedK: 2, weighting: 'log-entropy' }),
        job_id: job.id,
        requested_by: null,
        created_at: now,
      })
      .execute();
    await t.close();
    t = await createTestApp({ dataDir });
    await t.ctx.index.recovery;
    await t.ctx.jobs.waitForIdle();

    const interrupted = await t.ctx.db
      .selectFrom('jobs')
      .selectAll()
      .where('id', '=', job.id)
      .executeTakeFirstOrThrow();
    expect(interrupted.status).toBe('failed');
    const again = await t.ctx.db
      .selectFrom('jobs')
      .selectAll()
      .where('matter_id', '=', matter.id)
      .where('kind', '=', 'build-index')
      .where('id', '>', job.id)
      .execute();
    expect(again).toHaveLength(1);
    expect(again[0].status, again[0].error ?? '').toBe('succeeded');
    expect(JSON.parse(again[0].payload)).toMatchObject({ reason: 'requested', k: 2, restarts: 1 });
    const state = await t.ctx.index.getIndex(matter.id);
    expect(state!.version).toBe(latest.version + 2);
    expect(state!.space.k).toBe(2);
  }, 120_000);
});
