// Documents in, over HTTP against a real app (tests/helpers): multipart/form-data uploads
// (RFC 7578), extraction jobs, de-duplication by SHA-256 (FIPS 180-4), hostile inputs,
// downloads with Content-Disposition (RFC 6266), and upload-to-searchable.
import { randomBytes } from 'node:crypto';
import { existsSync, readdirSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { search } from '../engine/index';
import { makeDocx, makeEml, makePdf, makeText, makeZip } from '../../corpus-demo/render';
import type { UploadBatchResponse } from '../../shared/schemas/documents';
import type { IndexStateResponse } from '../../shared/schemas/indexing';
import type { JobResponse } from '../../shared/schemas/jobs';
import { makeZipBomb, makeZipWithRawNames } from '../../tests/fixtures/hostile-zips';
import {
  createTestApp,
  type Agent,
  type TestApp,
  type TestMatter,
  bytesBody,
} from '../../tests/helpers';

const MAX_FILE = 2 * 1024 * 1024;

let t: TestApp;
let matter: TestMatter;
let paralegal: Agent;
let firstFiles: { name: string; content: Buffer }[] = [];
let firstBatch: UploadBatchResponse;

async function documentsOf(agent: Agent, matterId: number) {
  const res = await agent.get(`/api/matters/${matterId}/documents?pageSize=500`);
  expect(res.status).toBe(200);
  return res.body.documents as {
    id: number;
    controlNumber: string;
    status: string;
    error: string | null;
    indexState: string;
    duplicateOf: number | null;
    name: string;
  }[];
}

/** Every file under `root`, relative. */
function listTree(root: string): string[] {
  if (!existsSync(root)) return [];
  return readdirSync(root, { recursive: true, withFileTypes: true })
    .filter((e) => e.isFile())
    .map((e) => path.relative(root, path.join(e.parentPath, e.name)));
}

// Generous: the first extraction starts a worker thread and pdf.js, slow on a busy 2-core machine.
async function waitForJob(agent: Agent, jobId: number, timeoutMs = 120_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await agent.get(`/api/jobs/${jobId}`);
    expect(res.status).toBe(200);
    const job = (res.body as JobResponse).job;
    if (job.status === 'succeeded' || job.status === 'failed') return job;
    if (Date.now() > deadline) throw new Error(`job ${jobId} still ${job.status}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

function upload(
  agent: Agent,
  matterId: number,
  files: { name: string; content: Buffer }[],
  custodian?: string,
) {
  let req = agent.post(`/api/matters/${matterId}/documents`);
  if (custodian) req = req.field('custodian', custodian);
  for (const f of files) req = req.attach('files', f.content, f.name);
  return req;
}

// Text on distinct topics, so a concept query can tell them apart.
const FLOUR = [
  'The mill delivered wheat flour with high moisture content to the bakery.',
  'Moisture in the flour made the dough sticky and the bread collapsed in the ovens.',
  'Wheat flour moisture readings exceeded the agreed specification for the bakery.',
];
const LEASE = [
  'The warehouse lease renewal terms include rent review and the landlord break clause.',
  'The landlord served notice under the lease break clause on the warehouse tenancy.',
];

beforeAll(async () => {
  t = await createTestApp({
    env: {
      QUARRY_MAX_FILE_BYTES: String(MAX_FILE),
      QUARRY_MAX_ARCHIVE_UNPACKED_BYTES: String(8 * 1024 * 1024),
    },
  });
  matter = await t.buildMatter({ controlPrefix: 'TST' });
  const user = await t.buildUser();
  await t.addMember(matter, user, 'paralegal');
  paralegal = await t.agentFor(user);
}, 30_000);

afterAll(async () => {
  await t?.close();
});

describe('upload to searchable', () => {
  it('uploads files with a custodian, extracts them, builds the index and finds them by concept', async () => {
    const files = [
      {
        name: 'moisture-report.pdf',
        content: await makePdf({
          title: 'Moisture report',
          author: 'Ann Miller',
          pages: [FLOUR[0], FLOUR[1]],
        }),
      },
      {
        name: 'spec.docx',
        content: await makeDocx({
          title: 'Flour specification',
          author: 'Bo Chen',
          paragraphs: [FLOUR[2]],
        }),
      },
      { name: 'lease.txt', content: makeText(LEASE.join('\n')) },
      { name: 'lease-notice.txt', content: makeText(LEASE[1] + ' ' + LEASE[0]) },
      {
        name: 'note.eml',
        content: await makeEml({
          from: 'Ann Miller <ann@mill.example.com>',
          to: ['Bo Chen <bo@bakery.example.com>'],
          subject: 'Bread collapsed',
          date: new Date('2021-03-02T10:00:00Z'),
          text: 'The bread collapsed again because of the damp flour.',
          attachments: [
            {
              filename: 'readings.txt',
              contentType: 'text/plain',
              content: makeText('Moisture readings of the wheat flour deliveries.'),
            },
          ],
        }),
      },
    ];
    firstFiles = files;
    const res = await upload(paralegal, matter.id, files, 'Ann Miller');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const batch = res.body as UploadBatchResponse;
    expect(batch.custodian?.name).toBe('Ann Miller');
    firstBatch = batch;
    expect(batch.files.map((f) => f.controlNumber)).toEqual([
      'TST-000001',
      'TST-000002',
      'TST-000003',
      'TST-000004',
      'TST-000005',
    ]);
    expect(batch.jobId).not.toBeNull();
    const job = await waitForJob(paralegal, batch.jobId!);
    expect(job.status, job.error ?? '').toBe('succeeded');
    await t.ctx.jobs.waitForIdle();

    const list = await paralegal.get(`/api/matters/${matter.id}/documents`);
    expect(list.status).toBe(200);
    const docs = list.body.documents as {
      controlNumber: string;
      status: string;
      parentId: number | null;
      indexState: string;
      title: string;
      author: string;
    }[];
    // The attachment takes the number reserved right after its e-mail.
    expect(docs.map((d) => d.controlNumber)).toEqual([
      'TST-000001',
      'TST-000002',
      'TST-000003',
      'TST-000004',
      'TST-000005',
      'TST-000006',
    ]);
    expect(docs[5].parentId).toBe(batch.files[4].id);
    // Families (migration 2026_12_04_0100): the attachment belongs to its e-mail's family,
    // every top-level file is a family of its own.
    const families = await t.ctx.db
      .selectFrom('documents')
      .select(['id', 'family_id'])
      .where('matter_id', '=', matter.id)
      .orderBy('id')
      .execute();
    expect(families.map((f) => f.family_id)).toEqual([
      ...batch.files.map((f) => f.id),
      batch.files[4].id,
    ]);
    // Metadata (migration 2026_12_04_0200): the attachment's family date is its e-mail's
    // date, and each document lists the custodian it was loaded for.
    const email = await t.ctx.db
      .selectFrom('documents')
      .select(['sent_at', 'family_date'])
      .where('family_id', '=', batch.files[4].id)
      .orderBy('id')
      .execute();
    expect(email[0].sent_at).toBe('2021-03-02T10:00:00.000Z');
    expect(email.map((e) => e.family_date)).toEqual([email[0].sent_at, email[0].sent_at]);
    const held = await t.ctx.db
      .selectFrom('document_custodians')
      .innerJoin('documents', 'documents.id', 'document_custodians.document_id')
      .select(['document_custodians.document_id', 'document_custodians.custodian_id'])
      .where('documents.matter_id', '=', matter.id)
      .execute();
    expect(held.length).toBe(6);
    expect(new Set(held.map((h) => h.custodian_id))).toEqual(new Set([batch.custodian!.id]));
    expect(docs.every((d) => d.status === 'extracted')).toBe(true);
    expect(docs.every((d) => d.indexState === 'indexed')).toBe(true);
    expect(docs[0].author).toBe('Ann Miller');

    const space = await t.ctx.index.getSpace(matter.id);
    expect(space).not.toBeNull();
    const hits = search(space, 'damp wheat flour bakery', { mode: 'concept', limit: 3 }).hits;
    const leaseIds = new Set([batch.files[2].id, batch.files[3].id]);
    expect(hits.length).toBeGreaterThan(0);
    expect(leaseIds.has(Number(hits[0].id))).toBe(false);

    const state = (await paralegal.get(`/api/matters/${matter.id}/index`))
      .body as IndexStateResponse;
    expect(state.current?.version).toBe(1);
    expect(state.counts.indexed).toBe(6);
    expect(state.current?.diagnostics.singularValues.length).toBe(state.current?.k);
  });
});

describe('hostile and broken inputs', () => {
  it('records each broken file as failed with a reason a paralegal reads, leaving the rest alone', async () => {
    const before = await documentsOf(paralegal, matter.id);
    const stateBefore = (await paralegal.get(`/api/matters/${matter.id}/index`))
      .body as IndexStateResponse;
    const goodPdf = await makePdf({ title: 'Delivery log', author: 'Cy Dale', pages: [FLOUR[1]] });
    const encrypted = await makePdf({
      title: 'Locked',
      author: 'Cy Dale',
      pages: ['secret terms'],
      userPassword: 'pw',
    });
    const outsideRoot = path.dirname(t.ctx.config.dataDir);
    const outsideBefore = readdirSync(outsideRoot);
    const files = [
      // ISO 32000-1 §7.5.5: a reader needs the trailer and xref at the end; cut them off.
      { name: 'truncated.pdf', content: goodPdf.subarray(0, Math.floor(goodPdf.length / 3)) },
      { name: 'random.pdf', content: randomBytes(4096) },
      { name: 'locked.pdf', content: encrypted },
      // A local file header signature (APPNOTE.TXT §4.3.7) followed by junk: not a zip package.
      {
        name: 'broken.docx',
        content: Buffer.concat([Buffer.from('PK\x03\x04'), randomBytes(2000)]),
      },
      { name: 'empty.txt', content: Buffer.alloc(0) },
      {
        name: 'escape.zip',
        content: await makeZipWithRawNames([
          { name: '../../escaped-by-zip.txt', content: makeText('should never be written') },
        ]),
      },
    ];
    const res = await upload(paralegal, matter.id, files);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const batch = res.body as UploadBatchResponse;
    const zipFile = batch.files.find((f) => f.name === 'escape.zip');
    expect(zipFile).toMatchObject({ status: 'failed', error: 'unsafe path in archive' });
    await waitForJob(paralegal, batch.jobId!);
    await t.ctx.jobs.waitForIdle();

    const after = await documentsOf(paralegal, matter.id);
    const reasonOf = (name: string) => after.find((d) => d.name === name)?.error;
    expect(
      after
        .filter((d) => batch.files.some((f) => f.id === d.id))
        .every((d) => d.status === 'failed'),
    ).toBe(true);
    // The bytes carry no %PDF- header (ISO 32000-1 §7.5.2); the .pdf name only breaks ties.
    expect(reasonOf('random.pdf')).toMatch(/^(not a valid PDF|unsupported type)$/);
    expect(reasonOf('locked.pdf')).toBe('encrypted PDF');
    expect(reasonOf('broken.docx')).toBe('not a valid DOCX');
    expect(reasonOf('empty.txt')).toBe('empty file');
    expect(reasonOf('truncated.pdf')).toMatch(/^(not a valid PDF|no text layer: scanned image)$/);

    // Nothing loaded before changed, and the index still serves the same version.
    for (const doc of before) expect(after.find((d) => d.id === doc.id)).toEqual(doc);
    const stateAfter = (await paralegal.get(`/api/matters/${matter.id}/index`))
      .body as IndexStateResponse;
    expect(stateAfter.current?.id).toBe(stateBefore.current?.id);
    expect(stateAfter.counts.indexed).toBe(stateBefore.counts.indexed);
    expect(stateAfter.counts.failed).toBe(stateBefore.counts.failed + files.length);
    // Nothing written outside the data folder, nothing left in its temporary folder.
    expect(
      readdirSync(outsideRoot).filter((n) => !outsideBefore.includes(n) && n.includes('escaped')),
    ).toEqual([]);
    expect(listTree(t.ctx.config.dataDir).some((p) => p.includes('escaped-by-zip'))).toBe(false);
    expect(listTree(t.ctx.config.tmpDir)).toEqual([]);
  });

  it('answers 413 naming the limit for a file over the size limit and for a zip bomb, storing nothing', async () => {
    const before = await documentsOf(paralegal, matter.id);
    // The single-entry bomb: its entry alone exceeds the per-file limit, so it is left out.
    const single = await upload(paralegal, matter.id, [
      { name: 'one.zip', content: await makeZipBomb(MAX_FILE + 10) },
    ]);
    expect(single.status).toBe(201);
    expect(single.body.files).toEqual([]);
    expect(single.body.skipped).toEqual([
      { path: 'one.zip/zeros.txt', reason: 'file exceeds the size limit' },
    ]);
    const big = await upload(paralegal, matter.id, [
      { name: 'small.txt', content: makeText('fine') },
      { name: 'huge.txt', content: Buffer.alloc(MAX_FILE + 1, 0x61) },
    ]);
    expect(big.status).toBe(413);
    expect(big.body.error.message).toContain('QUARRY_MAX_FILE_BYTES');

    // A few KB that inflate past the 8 MB unpacked-size limit (each entry under the 2 MB file limit).
    const bomb = await makeZip(
      Array.from({ length: 5 }, (_, i) => ({
        name: `zeros-${i}.txt`,
        content: Buffer.alloc(MAX_FILE - 1024, 0x30),
      })),
    );
    expect(bomb.length).toBeLessThan(MAX_FILE);
    const res = await upload(paralegal, matter.id, [{ name: 'bomb.zip', content: bomb }]);
    expect(res.status).toBe(413);
    expect(res.body.error.message).toContain('QUARRY_MAX_ARCHIVE_UNPACKED_BYTES');
    expect(res.body.error.message).toContain('archive exceeds the unpacked-size limit');

    expect(await documentsOf(paralegal, matter.id)).toEqual(before);
    // Error answers remove the folder once the response is done.
    await expect.poll(() => listTree(t.ctx.config.tmpDir), { timeout: 3000 }).toEqual([]);
  });
});

describe('de-duplication', () => {
  it('records the same content again, alone and inside a zip, as duplicates of the first', async () => {
    const original = firstFiles[0];
    const firstId = firstBatch.files[0].id;
    const stateBefore = (await paralegal.get(`/api/matters/${matter.id}/index`))
      .body as IndexStateResponse;
    const zip = await makeZip([{ name: 'reports/copy-of-report.pdf', content: original.content }]);
    const res = await upload(paralegal, matter.id, [
      { name: 'again.pdf', content: original.content },
      { name: 'bundle.zip', content: zip },
    ]);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const batch = res.body as UploadBatchResponse;
    expect(batch.files.map((f) => [f.path, f.status, f.duplicateOf])).toEqual([
      ['again.pdf', 'duplicate', firstId],
      ['bundle.zip/reports/copy-of-report.pdf', 'duplicate', firstId],
    ]);
    expect(batch.files.every((f) => f.duplicateOfControlNumber === 'TST-000001')).toBe(true);
    expect(batch.jobId).toBeNull();

    const detail = await paralegal.get(`/api/matters/${matter.id}/documents/${firstId}`);
    expect(detail.body.duplicates.map((d: { id: number }) => d.id)).toEqual(
      batch.files.map((f) => f.id),
    );
    const stateAfter = (await paralegal.get(`/api/matters/${matter.id}/index`))
      .body as IndexStateResponse;
    expect(stateAfter.counts.indexed + stateAfter.counts.foldedIn).toBe(
      stateBefore.counts.indexed + stateBefore.counts.foldedIn,
    );
    expect(stateAfter.counts.duplicates).toBe(stateBefore.counts.duplicates + 2);
  });
});

describe('fold-in, download, retry and delete', () => {
  it('folds a new document into the serving space so it is found within seconds', async () => {
    const res = await upload(paralegal, matter.id, [
      {
        name: 'tenancy.txt',
        content: makeText('The tenant asked the landlord about the warehouse rent review.'),
      },
    ]);
    const batch = res.body as UploadBatchResponse;
    await waitForJob(paralegal, batch.jobId!);
    const doc = (await documentsOf(paralegal, matter.id)).find((d) => d.id === batch.files[0].id);
    expect(doc?.indexState).toBe('folded');
    const space = await t.ctx.index.getSpace(matter.id);
    const hits = search(space, 'landlord rent warehouse', { mode: 'concept', limit: 3 }).hits;
    expect(hits.map((h) => Number(h.id))).toContain(batch.files[0].id);
  });

  it('downloads the original with Content-Disposition (RFC 6266) and audits it', async () => {
    const id = firstBatch.files[0].id;
    const res = await paralegal
      .get(`/api/matters/${matter.id}/documents/${id}/original`)
      .buffer(true)
      .parse(bytesBody);
    expect(res.status).toBe(200);
    // RFC 6266 §4.1: filename is a token or a quoted-string.
    expect(res.headers['content-disposition']).toMatch(
      /^attachment; filename="?moisture-report\.pdf"?$/,
    );
    expect(res.headers['content-type']).toMatch(/^application\/pdf/);
    expect(Buffer.compare(res.body as Buffer, firstFiles[0].content)).toBe(0);
    const audit = await t.ctx.db
      .selectFrom('audit_events')
      .select('action')
      .where('matter_id', '=', matter.id)
      .where('action', '=', 'document.original_downloaded')
      .execute();
    expect(audit.length).toBe(1);
  });

  it('retries failed documents only, and lets paralegals delete failed ones but not others', async () => {
    const docs = await documentsOf(paralegal, matter.id);
    const empty = docs.find((d) => d.name === 'empty.txt')!;
    const extracted = docs.find((d) => d.status === 'extracted')!;
    const retry = await paralegal.post(`/api/matters/${matter.id}/documents/${empty.id}/retry`);
    expect(retry.status).toBe(202);
    const job = await waitForJob(paralegal, retry.body.jobId);
    expect(job.status).toBe('succeeded');
    const again = (await documentsOf(paralegal, matter.id)).find((d) => d.id === empty.id);
    expect(again).toMatchObject({ status: 'failed', error: 'empty file' });
    expect(
      (await paralegal.post(`/api/matters/${matter.id}/documents/${extracted.id}/retry`)).status,
    ).toBe(409);

    expect(
      (await paralegal.delete(`/api/matters/${matter.id}/documents/${extracted.id}`)).status,
    ).toBe(403);
    expect((await paralegal.delete(`/api/matters/${matter.id}/documents/${empty.id}`)).status).toBe(
      200,
    );
    const lead = await t.agentFor(matter.lead);
    expect((await lead.delete(`/api/matters/${matter.id}/documents/${extracted.id}`)).status).toBe(
      200,
    );
    const remaining = await documentsOf(paralegal, matter.id);
    expect(remaining.some((d) => d.id === empty.id || d.id === extracted.id)).toBe(false);
    const actions = (
      await t.ctx.db
        .selectFrom('audit_events')
        .select('action')
        .where('matter_id', '=', matter.id)
        .execute()
    ).map((r) => r.action);
    for (const action of [
      'document.uploaded',
      'document.failed',
      'document.retried',
      'document.deleted',
      'index.rebuilt',
    ])
      expect(actions).toContain(action);
  });

  it('keeps jobs and uploads to the matter members who may see them', async () => {
    const outsider = await t.agentFor(await t.buildUser());
    expect((await outsider.get(`/api/jobs/${firstBatch.jobId}`)).status).toBe(404);
    const reviewer = await t.buildUser();
    await t.addMember(matter, reviewer, 'reviewer');
    const reviewerAgent = await t.agentFor(reviewer);
    expect((await reviewerAgent.get(`/api/jobs/${firstBatch.jobId}`)).status).toBe(200);
    const res = await upload(reviewerAgent, matter.id, [{ name: 'x.txt', content: makeText('x') }]);
    expect(res.status).toBe(403);
  });
});
