// Review batches over HTTP, checked against the database: sizes within the cap, families
// whole, no document in two open batches, check-in refused while required codes are missing.
// Batches and families are terms of the trade (common practice); the documents are the
// Deerwester et al. (1990) memo titles of the search fixture.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { createTestApp, type Agent, type TestApp, type TestUser } from '../../tests/helpers';
import { buildMemoMatter, type MemoMatter } from '../search/test-fixture';
import { createBatchFromDocuments } from './service';

let t: TestApp;
let m: MemoMatter;
let base: string;
let lead: Agent;
let reviewer: TestUser;
let reviewerAgent: Agent;
let codes: { id: number; name: string }[];
const codeId = (name: string) => codes.find((c) => c.name === name)!.id;

beforeAll(async () => {
  t = await createTestApp();
  m = await buildMemoMatter(t, { withoutIndex: true });
  base = `/api/matters/${m.matter.id}`;
  lead = await t.agentFor(m.matter.lead);
  reviewer = await t.buildUser();
  await t.addMember(m.matter, reviewer, 'reviewer');
  reviewerAgent = await t.agentFor(reviewer);
  // c1 is an e-mail with two attachments (c2, c3); m1 has one (m2).
  const attach = (child: number, parent: number) =>
    t.ctx.db
      .updateTable('documents')
      .set({ parent_id: parent, family_id: parent })
      .where('id', '=', child)
      .execute();
  await attach(m.ids.c2, m.ids.c1);
  await attach(m.ids.c3, m.ids.c1);
  await attach(m.ids.m2, m.ids.m1);
  codes = (await lead.get(`${base}/codes`)).body.codes;
});
afterAll(() => t?.close());

const placements = () =>
  t.ctx.db
    .selectFrom('review_batch_documents as bd')
    .innerJoin('review_batches as b', 'b.id', 'bd.batch_id')
    .select(['bd.batch_id', 'bd.document_id', 'bd.position', 'bd.open_kind'])
    .where('b.matter_id', '=', m.matter.id)
    .orderBy('bd.batch_id')
    .orderBy('bd.position')
    .execute();

describe('cutting batches', () => {
  test('sizes within the cap, families whole and together, each document once', async () => {
    const refused = await reviewerAgent.post(`${base}/batches`).send({ search: {} });
    expect(refused.status).toBe(403);
    const both = await lead.post(`${base}/batches`).send({ savedSearchId: 1, search: {} });
    expect(both.status).toBe(400);
    expect(both.body.error.message).toBe(
      'savedSearchId: give either savedSearchId or search, not both',
    );
    const tooBig = await lead.post(`${base}/batches`).send({ search: {}, size: 5000 });
    expect(tooBig.body.error.message).toBe('size: must be at most 1000');

    const res = await lead.post(`${base}/batches`).send({
      search: { query: '', filters: {} },
      size: 4,
      keepFamilies: true,
      name: 'First pass',
    });
    expect(res.status).toBe(201);
    const rows = await placements();
    const byBatch = new Map<number, number[]>();
    for (const r of rows)
      byBatch.set(r.batch_id, [...(byBatch.get(r.batch_id) ?? []), r.document_id]);
    expect(res.body.batches.map((b: { id: number }) => b.id)).toEqual([...byBatch.keys()]);
    for (const docs of byBatch.values()) expect(docs.length).toBeLessThanOrEqual(4);
    // Every extracted document is batched once; the families pull in nothing else here.
    const all = rows.map((r) => r.document_id);
    expect(new Set(all).size).toBe(all.length);
    expect(all.sort((a, b) => a - b)).toEqual(Object.values(m.ids).sort((a, b) => a - b));
    const docs = await t.ctx.db
      .selectFrom('documents')
      .select(['id', 'family_id'])
      .where('matter_id', '=', m.matter.id)
      .execute();
    const familyOf = new Map(docs.map((d) => [d.id, d.family_id]));
    const batchOf = new Map(rows.map((r) => [r.document_id, r.batch_id]));
    for (const d of docs) {
      if (!batchOf.has(d.id)) continue;
      expect(batchOf.get(d.id), `family of ${d.id}`).toBe(batchOf.get(familyOf.get(d.id)!));
    }
    // The parent leads its attachments.
    const c1Batch = rows.filter((r) => r.batch_id === batchOf.get(m.ids.c1));
    const c1At = c1Batch.findIndex((r) => r.document_id === m.ids.c1);
    expect(c1Batch.slice(c1At, c1At + 3).map((r) => r.document_id)).toEqual([
      m.ids.c1,
      m.ids.c2,
      m.ids.c3,
    ]);
    expect(res.body.batches[0]).toMatchObject({
      name: 'First pass 1',
      kind: 'review',
      state: 'unassigned',
    });

    // Nothing is left to batch: every document is in an open batch.
    const again = await lead.post(`${base}/batches`).send({ search: {} });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toBe(
      'Every document of this search is already in an open batch.',
    );
    // The database itself refuses a second open placement of a document.
    await expect(
      t.ctx.db
        .insertInto('review_batch_documents')
        .values({
          batch_id: rows[0].batch_id + 1000,
          document_id: rows[0].document_id,
          position: 1,
          open_kind: 'review',
        })
        .execute(),
    ).rejects.toThrow(/UNIQUE|FOREIGN/);
  });

  test('createBatchFromDocuments keeps families whole and skips documents already batched', async () => {
    const { batch, skipped } = await createBatchFromDocuments(
      t.ctx,
      m.matter.id,
      { id: m.matter.lead.id, email: m.matter.lead.email, ip: null },
      { name: 'QC sample', kind: 'qc', documentIds: [m.ids.c2, m.ids.m4] },
    );
    expect(skipped).toBe(0);
    const rows = (await placements()).filter((r) => r.batch_id === batch.id);
    expect(rows.map((r) => r.document_id)).toEqual([m.ids.c1, m.ids.c2, m.ids.c3, m.ids.m4]);
    await expect(
      createBatchFromDocuments(
        t.ctx,
        m.matter.id,
        { id: m.matter.lead.id, email: m.matter.lead.email, ip: null },
        { name: 'Again', kind: 'qc', documentIds: [m.ids.c3] },
      ),
    ).rejects.toThrow('Every one of these documents is already in an open batch.');
    // Validation samples are statistical draws: two may share a document.
    for (const name of ['Prevalence sample', 'Elusion sample']) {
      const sample = await createBatchFromDocuments(
        t.ctx,
        m.matter.id,
        { id: m.matter.lead.id, email: m.matter.lead.email, ip: null },
        { name, kind: 'validation', documentIds: [m.ids.c3], keepFamilies: false },
      );
      expect(sample.skipped).toBe(0);
    }
  });
});

describe('working a batch', () => {
  test('assign, check out, check-in refused while Responsiveness is missing, then checked in', async () => {
    const list = (await lead.get(`${base}/batches`).query({ kind: 'review' })).body.batches;
    const batch = list[0];
    expect((await reviewerAgent.get(`${base}/batches/${batch.id}`)).status).toBe(403);
    const outsider = await t.buildUser();
    const badAssign = await lead
      .post(`${base}/batches/${batch.id}/assign`)
      .send({ userId: outsider.id });
    expect(badAssign.status).toBe(400);
    expect(badAssign.body.error.message).toBe('userId: is not a member of this matter');
    const assigned = await lead
      .post(`${base}/batches/${batch.id}/assign`)
      .send({ userId: reviewer.id });
    expect(assigned.body.batch).toMatchObject({ state: 'assigned', assignee: { id: reviewer.id } });
    const mine = (await reviewerAgent.get(`${base}/batches`)).body.batches;
    expect(mine.map((b: { id: number }) => b.id)).toEqual([batch.id]);

    const early = await reviewerAgent.post(`${base}/batches/${batch.id}/checkin`);
    expect(early.status).toBe(409);
    expect(early.body.error.message).toBe('Check the batch out before checking it in.');
    const out = await reviewerAgent.post(`${base}/batches/${batch.id}/checkout`);
    expect(out.body.batch.state).toBe('checked_out');

    const { documents } = (await reviewerAgent.get(`${base}/batches/${batch.id}`)).body;
    const refused = await reviewerAgent.post(`${base}/batches/${batch.id}/checkin`);
    expect(refused.status).toBe(400);
    expect(refused.body.error.message).toMatch(
      new RegExp(
        `^codes: "Responsiveness" is required and is missing on ${documents.length} documents`,
      ),
    );
    for (const d of documents)
      await reviewerAgent
        .put(`${base}/documents/${d.id}/codes`)
        .send({ codeIds: [codeId('Not responsive')] });
    const done = await reviewerAgent.post(`${base}/batches/${batch.id}/checkin`);
    expect(done.status).toBe(200);
    expect(done.body.batch).toMatchObject({
      state: 'checked_in',
      progress: {
        documents: documents.length,
        coded: documents.length,
        complete: documents.length,
      },
    });
    const open = (await placements()).filter(
      (r) => r.batch_id === batch.id && r.open_kind !== null,
    );
    expect(open).toHaveLength(0);

    const progress = (await lead.get(`${base}/batches/progress`)).body;
    const mineRow = progress.reviewers.find(
      (r: { reviewer: { id: string } }) => r.reviewer.id === reviewer.id,
    );
    expect(mineRow).toMatchObject({
      batches: 1,
      documentsCoded: documents.length,
      codesGiven: documents.length,
    });
    expect(mineRow.codesByName).toEqual({ 'Not responsive': documents.length });
    const audit = await t.ctx.db
      .selectFrom('audit_events')
      .select('action')
      .where('target_type', '=', 'batch')
      .where('target_id', '=', String(batch.id))
      .orderBy('id')
      .execute();
    expect(audit.map((a) => a.action)).toEqual([
      'batch.created',
      'batch.assigned',
      'batch.checked_out',
      'batch.checked_in',
    ]);
  });
});
