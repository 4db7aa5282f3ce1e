// Deleting documents over HTTP (tests/helpers): complete deletion (the original gone
// from disk, the text from SQLite's tables, FTS5 index and files, the keyword index and
// the concept space), the trash for coded documents, and legal holds that refuse it.
// The byte checks read the database files themselves: SQLite's secure_delete pragma
// documents that deleted content is overwritten with zeros (https://www.sqlite.org/pragma.html#pragma_secure_delete).
import { existsSync, readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeEml, makeText } from '../../corpus-demo/render';
import type { UploadBatchResponse } from '../../shared/schemas/documents';
import type { JobResponse } from '../../shared/schemas/jobs';
import type { TrashResponse } from '../../shared/schemas/trash';
import {
  createTestApp,
  type Agent,
  type TestApp,
  type TestMatter,
  type TestUser,
} from '../../tests/helpers';

let t: TestApp;
let matter: TestMatter;
let other: TestMatter;
let lead: Agent;
let paralegal: Agent;
let reviewer: Agent;
let privilegedCode: number;
const docs: Record<string, { id: number; sha256: string }> = {};

// Invented words, so a hit can only come from the one document that holds them. Searches
// are audited with their query, so the byte checks look for a second word never searched.
const UNSEARCHED = { ordinary: 'brindlemoor', privileged: 'caskavelle' };
const MARK = {
  ordinary: 'plovercrest',
  privileged: 'quillabrand',
  held: 'marrowfen',
  family: 'tessarine',
  shared: 'gorsewick',
};

async function waitForJob(agent: Agent, jobId: number) {
  const deadline = Date.now() + 120_000;
  for (;;) {
    const job = ((await agent.get(`/api/jobs/${jobId}`)).body as JobResponse).job;
    if (job.status === 'succeeded' || job.status === 'failed') return job;
    if (Date.now() > deadline) throw new Error(`job ${jobId} still ${job.status}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

async function load(
  agent: Agent,
  matterId: number,
  custodian: string,
  files: { name: string; content: Buffer }[],
) {
  let req = agent.post(`/api/matters/${matterId}/documents`).field('custodian', custodian);
  for (const f of files) req = req.attach('files', f.content, f.name);
  const res = await req;
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  const batch = res.body as UploadBatchResponse;
  await waitForJob(agent, batch.jobId!);
  await t.ctx.jobs.waitForIdle();
  return batch;
}

async function keywordHits(agent: Agent, matterId: number, word: string): Promise<number[]> {
  const res = await agent
    .post(`/api/matters/${matterId}/search`)
    .send({ query: word, mode: 'keyword' });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return (res.body.hits as { documentId: number }[]).map((h) => h.documentId);
}

async function auditOf(action: string, targetId: number) {
  const rows = await t.ctx.db
    .selectFrom('audit_events')
    .select(['detail', 'actor_email'])
    .where('action', '=', action)
    .where('target_id', '=', String(targetId))
    .execute();
  return rows.map((r) => ({ ...r, detail: JSON.parse(r.detail) as Record<string, unknown> }));
}

/** The database as bytes on disk (main file and WAL). */
function databaseBytes(): string {
  const file = t.ctx.config.dbFile;
  return [file, `${file}-wal`]
    .filter((f) => existsSync(f))
    .map((f) => readFileSync(f).toString('latin1'))
    .join('');
}

const blobOnDisk = (sha256: string) => existsSync(t.ctx.blobs.pathOf(sha256));

async function shaOf(id: number) {
  return (
    await t.ctx.db
      .selectFrom('documents')
      .select('sha256')
      .where('id', '=', id)
      .executeTakeFirstOrThrow()
  ).sha256;
}

let leadUser: TestUser;
beforeAll(async () => {
  t = await createTestApp();
  leadUser = await t.buildUser();
  matter = await t.buildMatter({ lead: leadUser, controlPrefix: 'DEL' });
  other = await t.buildMatter({ lead: leadUser, controlPrefix: 'OTH' });
  const para = await t.buildUser();
  await t.addMember(matter, para, 'paralegal');
  const rev = await t.buildUser();
  await t.addMember(matter, rev, 'reviewer');
  lead = await t.agentFor(leadUser);
  paralegal = await t.agentFor(para);
  reviewer = await t.agentFor(rev);

  const text = (mark: string, topic: string, unsearched = '') =>
    makeText(
      `${topic} The memo mentions ${mark} twice: ${mark} again, about the flour contract. ${unsearched}`,
    );
  const first = await load(paralegal, matter.id, 'Dana Whitlow', [
    {
      name: 'ordinary.txt',
      content: text(MARK.ordinary, 'Delivery schedule for the mill.', UNSEARCHED.ordinary),
    },
    {
      name: 'advice.txt',
      content: text(MARK.privileged, 'Counsel advised on the settlement.', UNSEARCHED.privileged),
    },
    { name: 'shared.txt', content: text(MARK.shared, 'Shared minutes of the board.') },
    {
      name: 'thread.eml',
      content: await makeEml({
        from: 'Ann Miller <ann@mill.example.com>',
        to: ['Bo Chen <bo@bakery.example.com>'],
        subject: 'Readings',
        date: new Date('2021-03-02T10:00:00Z'),
        text: 'Readings attached for the bakery.',
        attachments: [
          {
            filename: 'readings.txt',
            contentType: 'text/plain',
            content: text(MARK.family, 'Moisture readings of the wheat.'),
          },
        ],
      }),
    },
  ]);
  const second = await load(paralegal, matter.id, 'Erin Castell', [
    { name: 'held.txt', content: text(MARK.held, 'Warehouse lease notes.') },
  ]);
  await load(lead, other.id, 'Dana Whitlow', [
    { name: 'shared-copy.txt', content: text(MARK.shared, 'Shared minutes of the board.') },
  ]);
  for (const f of [...first.files, ...second.files])
    docs[f.name] = { id: f.id, sha256: await shaOf(f.id) };
  const attachment = await t.ctx.db
    .selectFrom('documents')
    .select(['id', 'sha256'])
    .where('parent_id', '=', docs['thread.eml'].id)
    .executeTakeFirstOrThrow();
  docs['readings.txt'] = attachment;
  const codes = (await lead.get(`/api/matters/${matter.id}/codes`)).body.codes as {
    id: number;
    name: string;
  }[];
  privilegedCode = codes.find((c) => c.name === 'Privileged')!.id;
}, 180_000);

afterAll(async () => {
  await t?.close();
});

describe('complete deletion of an uncoded document', () => {
  it('removes the original from disk, the text from SQLite and its files, and the document from every index', async () => {
    const { id, sha256 } = docs['ordinary.txt'];
    expect(await keywordHits(reviewer, matter.id, MARK.ordinary)).toEqual([id]);
    expect(blobOnDisk(sha256)).toBe(true);
    expect(databaseBytes().includes(UNSEARCHED.ordinary)).toBe(true);

    const res = await lead.delete(`/api/matters/${matter.id}/documents/${id}`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toEqual({ outcome: 'deleted', trashId: null, documentCount: 1 });

    expect(blobOnDisk(sha256)).toBe(false);
    expect(await keywordHits(reviewer, matter.id, MARK.ordinary)).toEqual([]);
    expect((await lead.get(`/api/matters/${matter.id}/documents/${id}`)).status).toBe(404);
    const fts = t.ctx.sqlite
      .prepare('SELECT count(*) FROM documents_fts WHERE documents_fts MATCH ?')
      .pluck()
      .get(MARK.ordinary);
    expect(fts).toBe(0);
    expect(
      t.ctx.sqlite.prepare('SELECT count(*) FROM index_docs WHERE document_id = ?').pluck().get(id),
    ).toBe(0);
    // The concept space is rebuilt without it (its stored vectors and vocabulary held the
    // document), after which no byte of the database files holds the word.
    await t.ctx.jobs.waitForIdle();
    t.ctx.sqlite.pragma('wal_checkpoint(TRUNCATE)');
    expect(databaseBytes().includes(UNSEARCHED.ordinary)).toBe(false);

    const [audit] = await auditOf('document.deleted', id);
    expect(audit.detail).toMatchObject({ complete: true, sha256, codes: [], documentCount: 1 });
  });

  it('keeps an original another document still uses until its last reference goes', async () => {
    const { id, sha256 } = docs['shared.txt'];
    const copy = await t.ctx.db
      .selectFrom('documents')
      .select('id')
      .where('matter_id', '=', other.id)
      .where('sha256', '=', sha256)
      .executeTakeFirstOrThrow();
    expect((await lead.delete(`/api/matters/${matter.id}/documents/${id}`)).status).toBe(200);
    expect(blobOnDisk(sha256)).toBe(true);
    expect((await lead.delete(`/api/matters/${other.id}/documents/${copy.id}`)).status).toBe(200);
    expect(blobOnDisk(sha256)).toBe(false);
  });
});

describe('coded documents go to the trash first', () => {
  it('asks for a reason, trashes, and lets a lead restore the document with its codes', async () => {
    const { id, sha256 } = docs['advice.txt'];
    const coded = await reviewer.put(`/api/matters/${matter.id}/documents/${id}/codes`).send({
      codeIds: [privilegedCode],
      // A privilege code needs its type and basis (coding layouts).
      privilege: { type: 'Attorney-client privilege', basis: 'Legal advice' },
    });
    expect(coded.status, JSON.stringify(coded.body)).toBe(200);

    const noReason = await lead.delete(`/api/matters/${matter.id}/documents/${id}`);
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.field).toBe('reason');
    expect(noReason.body.error.message).toMatch(
      /reason: is required .* it is coded \(Privileged\)/,
    );

    const trashed = await lead
      .delete(`/api/matters/${matter.id}/documents/${id}`)
      .send({ reason: 'Clawback notice from opposing counsel' });
    expect(trashed.status, JSON.stringify(trashed.body)).toBe(200);
    expect(trashed.body.outcome).toBe('trashed');

    // Out of listings, searches and the index; nothing destroyed.
    expect((await lead.get(`/api/matters/${matter.id}/documents/${id}`)).status).toBe(404);
    const listed = (await lead.get(`/api/matters/${matter.id}/documents?pageSize=500`)).body
      .documents as { id: number }[];
    expect(listed.map((d) => d.id)).not.toContain(id);
    expect(await keywordHits(reviewer, matter.id, MARK.privileged)).toEqual([]);
    expect(blobOnDisk(sha256)).toBe(true);
    const [audit] = await auditOf('document.trashed', id);
    expect(audit.detail).toMatchObject({
      reason: 'Clawback notice from opposing counsel',
      codes: [{ documentId: id, code: 'Privileged' }],
    });

    expect((await paralegal.get(`/api/matters/${matter.id}/trash`)).status).toBe(403);
    const trash = (await lead.get(`/api/matters/${matter.id}/trash`)).body as TrashResponse;
    expect(trash.items).toHaveLength(1);
    expect(trash.items[0]).toMatchObject({
      documentId: id,
      reason: 'Clawback notice from opposing counsel',
      codes: [{ code: 'Privileged' }],
    });

    const trashId = trash.items[0].id;
    expect(
      (await paralegal.post(`/api/matters/${matter.id}/trash/${trashId}/restore`)).status,
    ).toBe(403);
    const restored = await lead.post(`/api/matters/${matter.id}/trash/${trashId}/restore`).send({});
    expect(restored.status, JSON.stringify(restored.body)).toBe(200);
    expect(restored.body).toMatchObject({ documentId: id, skippedRows: 0 });
    expect((await lead.get(`/api/matters/${matter.id}/documents/${id}`)).status).toBe(200);
    expect(await keywordHits(reviewer, matter.id, MARK.privileged)).toEqual([id]);
    const codes = await t.ctx.db
      .selectFrom('document_codes')
      .select('code_id')
      .where('document_id', '=', id)
      .execute();
    expect(codes.map((c) => c.code_id)).toEqual([privilegedCode]);
    expect((await lead.get(`/api/matters/${matter.id}/trash`)).body.items).toEqual([]);
    expect(await auditOf('document.restored', id)).toHaveLength(1);
  });

  it('purging from the trash deletes completely, the codes recorded in the audit row', async () => {
    const { id, sha256 } = docs['advice.txt'];
    const trashed = await lead
      .delete(`/api/matters/${matter.id}/documents/${id}`)
      .send({ reason: 'Clawback: privileged advice produced in error' });
    expect(trashed.body.outcome).toBe('trashed');
    const trashId = trashed.body.trashId as number;
    expect((await paralegal.delete(`/api/matters/${matter.id}/trash/${trashId}`)).status).toBe(403);
    const purged = await lead.delete(`/api/matters/${matter.id}/trash/${trashId}`);
    expect(purged.status, JSON.stringify(purged.body)).toBe(200);
    expect(purged.body).toMatchObject({ documentId: id, blobsRemoved: 1 });
    expect(blobOnDisk(sha256)).toBe(false);
    expect(await keywordHits(reviewer, matter.id, MARK.privileged)).toEqual([]);
    expect((await lead.post(`/api/matters/${matter.id}/trash/${trashId}/restore`)).status).toBe(
      404,
    );
    const [audit] = await auditOf('document.purged', id);
    expect(audit.detail).toMatchObject({ codes: [{ code: 'Privileged' }], sha256: [sha256] });
    await t.ctx.jobs.waitForIdle();
    t.ctx.sqlite.pragma('wal_checkpoint(TRUNCATE)');
    expect(databaseBytes().includes(UNSEARCHED.privileged)).toBe(false);
  });

  it('a coded attachment makes its parent need a reason; the family goes and comes back together', async () => {
    const parent = docs['thread.eml'];
    const child = docs['readings.txt'];
    await reviewer.put(`/api/matters/${matter.id}/documents/${child.id}/codes`).send({
      codeIds: [privilegedCode],
      // A privilege code needs its type and basis (coding layouts).
      privilege: { type: 'Attorney-client privilege', basis: 'Legal advice' },
    });
    expect((await lead.delete(`/api/matters/${matter.id}/documents/${parent.id}`)).status).toBe(
      400,
    );
    const trashed = await lead
      .delete(`/api/matters/${matter.id}/documents/${parent.id}`)
      .send({ reason: 'Withdrawn family' });
    expect(trashed.body).toMatchObject({ outcome: 'trashed', documentCount: 2 });
    expect(await keywordHits(reviewer, matter.id, MARK.family)).toEqual([]);
    const restored = await lead.post(
      `/api/matters/${matter.id}/trash/${trashed.body.trashId}/restore`,
    );
    expect(restored.status).toBe(200);
    expect(await keywordHits(reviewer, matter.id, MARK.family)).toEqual([child.id]);
  });
});

describe('legal holds', () => {
  it('a custodian hold refuses deletion with a 409 naming the hold, until a lead releases it', async () => {
    const { id, sha256 } = docs['held.txt'];
    const custodians = (await lead.get(`/api/matters/${matter.id}/custodians`)).body.custodians as {
      id: number;
      name: string;
    }[];
    const erin = custodians.find((c) => c.name === 'Erin Castell')!;
    const body = { custodianId: erin.id, reason: 'Litigation hold notice of 3 March 2021' };
    expect((await paralegal.post(`/api/matters/${matter.id}/holds`).send(body)).status).toBe(403);
    expect(
      (await lead.post(`/api/matters/${matter.id}/holds`).send({ custodianId: erin.id })).status,
    ).toBe(400);
    const set = await lead.post(`/api/matters/${matter.id}/holds`).send(body);
    expect(set.status, JSON.stringify(set.body)).toBe(201);
    const holdId = set.body.hold.id as number;
    expect(set.body.hold).toMatchObject({ active: true, custodian: { name: 'Erin Castell' } });
    expect((await lead.post(`/api/matters/${matter.id}/holds`).send(body)).status).toBe(409);

    const refused = await lead.delete(`/api/matters/${matter.id}/documents/${id}`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toContain(
      `legal hold #${holdId} on custodian Erin Castell (reason: Litigation hold notice of 3 March 2021)`,
    );
    expect(blobOnDisk(sha256)).toBe(true);
    expect(await keywordHits(reviewer, matter.id, MARK.held)).toEqual([id]);
    // Everyone on the matter sees the hold.
    const listed = await reviewer.get(`/api/matters/${matter.id}/holds`);
    expect(listed.status).toBe(200);
    expect(listed.body.holds[0]).toMatchObject({ id: holdId, active: true });

    expect(
      (await lead.post(`/api/matters/${matter.id}/holds/${holdId}/release`).send({})).status,
    ).toBe(400);
    const released = await lead
      .post(`/api/matters/${matter.id}/holds/${holdId}/release`)
      .send({ reason: 'Case settled; hold lifted by counsel' });
    expect(released.status).toBe(200);
    expect(released.body.hold).toMatchObject({
      active: false,
      releaseReason: 'Case settled; hold lifted by counsel',
    });
    expect((await auditOf('hold.set', holdId))[0].detail).toMatchObject({
      custodian: 'Erin Castell',
    });
    expect(await auditOf('hold.released', holdId)).toHaveLength(1);
    expect((await lead.delete(`/api/matters/${matter.id}/documents/${id}`)).status).toBe(200);
    expect(blobOnDisk(sha256)).toBe(false);
  });

  it('a matter-wide hold refuses a purge from the trash too', async () => {
    const parent = docs['thread.eml'];
    const trashed = await lead
      .delete(`/api/matters/${matter.id}/documents/${parent.id}`)
      .send({ reason: 'Withdrawn family' });
    expect(trashed.body.outcome).toBe('trashed');
    const set = await lead
      .post(`/api/matters/${matter.id}/holds`)
      .send({ reason: 'Preservation order, whole matter' });
    expect(set.status).toBe(201);
    const refused = await lead.delete(`/api/matters/${matter.id}/trash/${trashed.body.trashId}`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toContain(
      `legal hold #${set.body.hold.id} on the whole matter`,
    );
    expect(blobOnDisk(parent.sha256)).toBe(true);
    // Restoring is still allowed: it keeps more, not less.
    expect(
      (await lead.post(`/api/matters/${matter.id}/trash/${trashed.body.trashId}/restore`)).status,
    ).toBe(200);
    expect(
      (await lead.delete(`/api/matters/${matter.id}/documents/${parent.id}`).send({ reason: 'x' }))
        .status,
    ).toBe(409);
  });
});
