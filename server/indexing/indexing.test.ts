// Rebuild safety and bulk import. A rebuild's worker is terminated mid-build: the previous
// version must keep serving (one-transaction switch) and the next rebuild must succeed.
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { run as runImport } from '../cli/commands/import';
import { makeText } from '../../corpus-demo/render';
import { search } from '../engine/index';
import type { IndexStateResponse } from '../../shared/schemas/indexing';
import { createTestApp, type Agent, type TestApp, type TestMatter } from '../../tests/helpers';

let t: TestApp;
let matter: TestMatter;
let lead: Agent;

const TEXTS = [
  'The mill delivered damp wheat flour to the bakery.',
  'Flour moisture spoiled the dough and the bread at the bakery.',
  'The landlord served a break notice under the warehouse lease.',
  'Rent review of the warehouse lease with the landlord.',
];

async function indexState(): Promise<IndexStateResponse> {
  const res = await lead.get(`/api/matters/${matter.id}/index`);
  expect(res.status).toBe(200);
  return res.body as IndexStateResponse;
}

beforeAll(async () => {
  t = await createTestApp();
  matter = await t.buildMatter({ controlPrefix: 'RBS' });
  lead = await t.agentFor(matter.lead);
  let req = lead.post(`/api/matters/${matter.id}/documents`);
  TEXTS.forEach((text, i) => (req = req.attach('files', makeText(text), `doc-${i}.txt`)));
  const res = await req;
  expect(res.status).toBe(201);
  await t.ctx.jobs.waitForIdle();
}, 60_000);

afterAll(async () => {
  await t?.close();
});

describe('rebuild safety', () => {
  it('a rebuild killed in the middle leaves the previous version serving; the next one succeeds', async () => {
    const before = await indexState();
    expect(before.current?.version).toBe(1);
    const spaceBefore = await t.ctx.index.getSpace(matter.id);

    const res = await lead.post(`/api/matters/${matter.id}/index/rebuild`).send({ k: 2 });
    expect(res.status).toBe(202);
    const jobId = res.body.job.id as number;
    await expect
      .poll(() => t.ctx.index.isBuilding(matter.id), { timeout: 10_000, interval: 5 })
      .toBe(true);
    // The API stays responsive while the worker runs.
    expect((await lead.get(`/api/matters/${matter.id}/documents`)).status).toBe(200);
    expect(await t.ctx.index.terminateBuild(matter.id)).toBe(true);
    await t.ctx.jobs.waitForIdle();

    const job = (await lead.get(`/api/jobs/${jobId}`)).body.job;
    expect(job.status).toBe('failed');
    expect(job.error).toMatch(/worker stopped before finishing/);
    const after = await indexState();
    expect(after.current?.id).toBe(before.current?.id);
    expect(after.lastFailed?.status).toBe('failed');
    expect(after.lastFailed?.error).toMatch(/worker stopped/);
    expect(after.building).toBeNull();
    // Still searchable with the old version.
    const space = await t.ctx.index.getSpace(matter.id);
    expect(space).toBe(spaceBefore);
    expect(search(space, 'landlord lease', { mode: 'concept', limit: 2 }).hits.length).toBe(2);

    const again = await lead
      .post(`/api/matters/${matter.id}/index/rebuild`)
      .send({ k: 2, weighting: 'tf-idf' });
    expect(again.status).toBe(202);
    await t.ctx.jobs.waitForIdle();
    const rebuilt = await indexState();
    expect(rebuilt.current?.version).toBe(3);
    expect(rebuilt.current).toMatchObject({ k: 2, weighting: 'tf-idf', status: 'ready' });
    expect(rebuilt.counts.indexed).toBe(TEXTS.length);
    // ||A||_2 = sigma_1 >= sigma_2 (singular values are ordered).
    const sigma = rebuilt.current!.diagnostics.singularValues;
    expect(sigma[0]).toBeGreaterThanOrEqual(sigma[1]);
    expect(rebuilt.current!.diagnostics.sigma1).toBe(sigma[0]);
    const versions = await t.ctx.db
      .selectFrom('index_versions')
      .select(['version', 'status'])
      .where('matter_id', '=', matter.id)
      .orderBy('version')
      .execute();
    expect(versions).toEqual([
      { version: 1, status: 'superseded' },
      { version: 2, status: 'failed' },
      { version: 3, status: 'ready' },
    ]);
    const hits = search(await t.ctx.index.getSpace(matter.id), 'damp flour', {
      mode: 'concept',
      limit: 2,
    }).hits;
    expect(hits.length).toBe(2);
  });

  it('refuses a k above the number of documents, naming the bound, and queues nothing', async () => {
    // A rank-k truncated SVD needs k <= min(m, n) (Golub and Van Loan, Matrix Computations,
    // 4th ed., section 2.4); the n columns are the matter's extracted documents.
    const state = await indexState();
    expect(state.buildableDocuments).toBe(TEXTS.length);
    const res = await lead
      .post(`/api/matters/${matter.id}/index/rebuild`)
      .send({ k: TEXTS.length + 1 });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe(
      `k: must be at most ${TEXTS.length}, the number of documents the concept space is built from`,
    );
    expect(res.body.error.field).toBe('k');
    const after = await indexState();
    expect(after.activeJob).toBeNull();
    expect(after.current?.id).toBe(state.current?.id);
  });

  it('refuses a rebuild from a paralegal (index.rebuild is for leads)', async () => {
    const user = await t.buildUser();
    await t.addMember(matter, user, 'paralegal');
    const res = await (
      await t.agentFor(user)
    )
      .post(`/api/matters/${matter.id}/index/rebuild`)
      .send({});
    expect(res.status).toBe(403);
  });
});

describe('CLI import', () => {
  it('loads a folder tree with the same service, then extracts and indexes it', async () => {
    const folder = mkdtempSync(path.join(tmpdir(), 'quarry-import-'));
    mkdirSync(path.join(folder, 'inbox'));
    writeFileSync(path.join(folder, 'a.txt'), TEXTS[0]);
    writeFileSync(path.join(folder, 'inbox', 'b.txt'), TEXTS[1]);
    writeFileSync(path.join(folder, 'inbox', 'c.txt'), TEXTS[0]); // a duplicate of a.txt
    const other = await t.buildMatter({ controlPrefix: 'IMP', lead: matter.lead });
    // The CLI opens its own context on the same data folder (SQLite WAL allows both).
    const previous = process.env.QUARRY_DATA_DIR;
    process.env.QUARRY_DATA_DIR = t.ctx.config.dataDir;
    try {
      await runImport(['--matter', other.name, '--custodian', 'Dee Ward', folder]);
      await expect(runImport(['--matter', 'No such matter', folder])).rejects.toThrow(
        'no matter is named "No such matter"',
      );
    } finally {
      process.env.QUARRY_DATA_DIR = previous;
    }
    const docs = await t.ctx.db
      .selectFrom('documents')
      .select(['control_number', 'original_path', 'extract_status'])
      .where('matter_id', '=', other.id)
      .orderBy('control_number')
      .execute();
    expect(docs).toEqual([
      { control_number: 'IMP-000001', original_path: 'a.txt', extract_status: 'extracted' },
      { control_number: 'IMP-000002', original_path: 'inbox/b.txt', extract_status: 'extracted' },
      { control_number: 'IMP-000003', original_path: 'inbox/c.txt', extract_status: 'duplicate' },
    ]);
    const version = await t.ctx.db
      .selectFrom('index_versions')
      .select(['status', 'n_docs'])
      .where('matter_id', '=', other.id)
      .executeTakeFirst();
    expect(version).toEqual({ status: 'ready', n_docs: 2 });
  });
});
