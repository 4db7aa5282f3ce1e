// Documents in, over HTTP against a real app (tests/helpers): multipart/form-data uploads
// (RFC 7578), extraction jobs, de-duplication by SHA-256 (FIPS 180-4), hostile inputs,
// downloads with Content-Disposition (RFC 6266), and upload-to-searchable.
import { existsSync, readdirSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { search } from '../../engine/search/search';
import { makeDocx, makeEml, makePdf, makeText, makeZip } from '../../corpus-demo/render';
import type { UploadBatchResponse } from '../../shared/schemas/documents';
import type { IndexStateResponse } from '../../shared/schemas/indexing';
import type { JobResponse } from '../../shared/schemas/jobs';
import { makeZipBomb, makeZipWithRawNames } from '../../tests/fixtures/hostile-zips';
import { createTestApp, type Agent, type TestApp, type TestMatter } from '../../tests/helpers';

const MAX_FILE = 2 * 1024 * 1024;

let t: TestApp;
let matter: TestMatter;
let paralegal: Agent;

async function waitForJob(agent: Agent, jobId: number, timeoutMs = 30_000) {
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
    const res = await upload(paralegal, matter.id, files, 'Ann Miller');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const batch = res.body as UploadBatchResponse;
    expect(batch.custodian?.name).toBe('Ann Miller');
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
