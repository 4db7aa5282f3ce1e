// Second-level review: samples reproducible from their recorded seed and of the size asked,
// overturn rates from a hand-made example (worked out by hand below), locks and audit.
import { describe, expect, test, beforeAll, afterAll } from 'vitest';
import { createTestApp, type Agent, type TestApp, type TestUser } from '../../tests/helpers';
import { buildMemoMatter, type MemoMatter } from '../search/test-fixture';
import { drawSample, overturnRates, sizeOfShare } from './sample';

describe('drawSample', () => {
  const population = Array.from({ length: 200 }, (_, i) => 1000 - i * 3);
  test('the same seed gives the same sample, whatever order the population comes in', () => {
    const a = drawSample(population, 25, 12345);
    expect(drawSample([...population].reverse(), 25, 12345)).toEqual(a);
    expect(a).toHaveLength(25);
    expect(new Set(a).size).toBe(25);
    expect(a.every((id) => population.includes(id))).toBe(true);
    expect(drawSample(population, 25, 54321)).not.toEqual(a);
  });
  test('a share rounds up and never exceeds the population', () => {
    expect(sizeOfShare(10, 0.25)).toBe(3); // 2.5 -> 3
    expect(sizeOfShare(10, 0.3)).toBe(3); // 3.0000000000000004 in floating point -> 3
    expect(sizeOfShare(7, 1)).toBe(7);
    expect(drawSample([1, 2, 3], 10, 1)).toHaveLength(3);
  });
  test('overturn rates count decided calls only', () => {
    const rates = overturnRates(
      [
        { reviewerId: 'a', codeId: 1, verdict: 'overturned' },
        { reviewerId: 'a', codeId: 1, verdict: 'confirmed' },
        { reviewerId: 'a', codeId: 2, verdict: null },
        { reviewerId: 'b', codeId: 2, verdict: 'confirmed' },
      ],
      (c) => c.reviewerId,
    );
    expect(rates.get('a')).toEqual({ checked: 2, overturned: 1, rate: 0.5 });
    expect(rates.get('b')).toEqual({ checked: 1, overturned: 0, rate: 0 });
  });
});

let t: TestApp;
let m: MemoMatter;
let base: string;
let lead: Agent;
let first: TestUser;
let second: TestUser;
let qcReviewer: TestUser;
let codes: { id: number; name: string }[];
const codeId = (name: string) => codes.find((c) => c.name === name)!.id;

beforeAll(async () => {
  t = await createTestApp();
  m = await buildMemoMatter(t, { withoutIndex: true });
  base = `/api/matters/${m.matter.id}`;
  lead = await t.agentFor(m.matter.lead);
  first = await t.buildUser({ email: 'ada@example.com' });
  second = await t.buildUser({ email: 'ben@example.com' });
  qcReviewer = await t.buildUser();
  for (const u of [first, second, qcReviewer]) await t.addMember(m.matter, u, 'reviewer');
  codes = (await lead.get(`${base}/codes`)).body.codes;
  const a = await t.agentFor(first);
  // c1 is left out: its exact duplicate would take the code too (Responsiveness follows duplicates).
  for (const key of ['c2', 'c3', 'c4', 'c5', 'm1'] as const)
    await a.put(`${base}/documents/${m.ids[key]}/codes`).send({ codeIds: [codeId('Responsive')] });
  const b = await t.agentFor(second);
  for (const key of ['m2', 'm3', 'm4'] as const)
    await b.put(`${base}/documents/${m.ids[key]}/codes`).send({
      codeIds: [codeId('Privileged')],
      privilege: { type: 'Attorney-client privilege', basis: 'Advice from counsel' },
    });
});
afterAll(() => t?.close());

describe('QC samples over HTTP', () => {
  let shareSample: { id: number; batchId: number };
  let targeted: { id: number; batchId: number };

  test('refusals name the missing field', async () => {
    const noShare = await lead.post(`${base}/qc/samples`).send({ method: 'share' });
    expect(noShare.body.error.message).toBe('share: is required for a share sample');
    const noCriteria = await lead.post(`${base}/qc/samples`).send({ method: 'targeted' });
    expect(noCriteria.body.error.message).toBe(
      'criteria: a targeted sample needs a reviewer, a code or a batch',
    );
    const reviewer = await t.agentFor(first);
    expect(
      (await reviewer.post(`${base}/qc/samples`).send({ method: 'count', count: 1 })).status,
    ).toBe(403);
  });

  test('a random share: its recorded seed reproduces the documents, and the size is the share asked', async () => {
    const population = [m.ids.c2, m.ids.c3, m.ids.c4, m.ids.c5, m.ids.m1];
    const res = await lead
      .post(`${base}/qc/samples`)
      .send({ method: 'share', share: 0.6, seed: 42, criteria: { reviewerId: first.id } });
    expect(res.status).toBe(201);
    expect(res.body.sample).toMatchObject({
      method: 'share',
      seed: 42,
      population: 5,
      size: 3,
      calls: 3,
    });
    shareSample = res.body.sample;
    const batchDocs = (
      await t.ctx.db
        .selectFrom('review_batch_documents')
        .select('document_id')
        .where('batch_id', '=', shareSample.batchId)
        .orderBy('position')
        .execute()
    ).map((r) => r.document_id);
    expect(batchDocs).toEqual(drawSample(population, 3, 42));
    const stored = await t.ctx.db
      .selectFrom('qc_samples')
      .selectAll()
      .where('id', '=', shareSample.id)
      .executeTakeFirstOrThrow();
    expect(
      drawSample(population, sizeOfShare(stored.population, stored.share!), stored.seed!),
    ).toEqual(batchDocs);
  });

  test('targeted: every Privileged call by one reviewer', async () => {
    const res = await lead.post(`${base}/qc/samples`).send({
      method: 'targeted',
      criteria: { reviewerId: second.id, codeId: codeId('Privileged') },
    });
    expect(res.body.sample).toMatchObject({ method: 'targeted', seed: null, size: 3, calls: 3 });
    expect(
      res.body.items.every((i: { code: { name: string } }) => i.code.name === 'Privileged'),
    ).toBe(true);
    targeted = res.body.sample;
  });

  test('confirm / overturn; rates per reviewer and per code match the hand count; locks', async () => {
    const q = await t.agentFor(qcReviewer);
    for (const s of [shareSample, targeted]) {
      await lead.post(`${base}/batches/${s.batchId}/assign`).send({ userId: qcReviewer.id });
      await q.post(`${base}/batches/${s.batchId}/checkout`);
    }
    const refused = await q.post(`${base}/batches/${shareSample.batchId}/checkin`);
    expect(refused.status).toBe(400);
    expect(refused.body.error.message).toBe(
      'verdicts: 3 quality-control calls are not yet confirmed or overturned',
    );
    const shareItems = (await q.get(`${base}/qc/samples/${shareSample.id}`)).body.items;
    const privItems = (await q.get(`${base}/qc/samples/${targeted.id}`)).body.items;
    // Hand-made example: Ada's 3 Responsive calls: 2 overturned, 1 confirmed; Ben's 3
    // Privileged calls: 1 overturned, 2 confirmed. By hand: Ada 2/3, Ben 1/3; Responsive
    // 2/3, Privileged 1/3; overall 3/6 = 0.5.
    const decide = (id: number, verdict: string, replacementCodeId?: number) =>
      q.post(`${base}/qc/items/${id}/decision`).send({ verdict, replacementCodeId });
    const badReplacement = await decide(shareItems[0].id, 'overturned', codeId('Hot'));
    expect(badReplacement.status).toBe(400);
    expect(badReplacement.body.error.field).toBe('replacementCodeId');
    expect((await decide(shareItems[0].id, 'overturned', codeId('Not responsive'))).status).toBe(
      200,
    );
    await decide(shareItems[1].id, 'overturned', codeId('Not responsive'));
    await decide(shareItems[2].id, 'confirmed');
    expect((await decide(shareItems[2].id, 'overturned')).status).toBe(409);
    await decide(privItems[0].id, 'overturned', codeId('Not privileged'));
    await decide(privItems[1].id, 'confirmed');
    await decide(privItems[2].id, 'confirmed');

    const rates = (await lead.get(`${base}/qc/overturn-rates`)).body;
    const byName = Object.fromEntries(
      rates.byReviewer.map((r: { reviewer: { email: string }; rate: number }) => [
        r.reviewer.email,
        r,
      ]),
    );
    expect(byName['ada@example.com']).toMatchObject({ checked: 3, overturned: 2 });
    expect(byName['ada@example.com'].rate).toBeCloseTo(2 / 3, 12);
    expect(byName['ben@example.com'].rate).toBeCloseTo(1 / 3, 12);
    const byCode = Object.fromEntries(
      rates.byCode.map((r: { code: { name: string }; rate: number }) => [r.code.name, r.rate]),
    );
    expect(byCode.Responsive).toBeCloseTo(2 / 3, 12);
    expect(byCode.Privileged).toBeCloseTo(1 / 3, 12);
    expect(rates.overall).toEqual({ checked: 6, overturned: 3, rate: 0.5 });

    // The overturned document now carries the replacement, and its coding is locked.
    const doc = shareItems[0].documentId;
    const now = await t.ctx.db
      .selectFrom('document_codes')
      .select('code_id')
      .where('document_id', '=', doc)
      .execute();
    expect(now.map((r) => r.code_id)).toEqual([codeId('Not responsive')]);
    const locked = await (
      await t.agentFor(first)
    )
      .put(`${base}/documents/${doc}/codes`)
      .send({ codeIds: [codeId('Responsive')] });
    expect(locked.status).toBe(409);
    expect(locked.body.error.message).toMatch(/locked until the matter lead unlocks it/);
    expect((await q.delete(`${base}/documents/${doc}/lock`)).status).toBe(403);
    expect((await lead.delete(`${base}/documents/${doc}/lock`)).status).toBe(204);
    expect(
      (
        await (
          await t.agentFor(first)
        )
          .put(`${base}/documents/${doc}/codes`)
          .send({ codeIds: [codeId('Responsive')] })
      ).status,
    ).toBe(200);
    expect((await q.post(`${base}/batches/${shareSample.batchId}/checkin`)).status).toBe(200);
    const audit = await t.ctx.db
      .selectFrom('audit_events')
      .select('action')
      .where('matter_id', '=', m.matter.id)
      .where('action', 'in', ['qc.sample_drawn', 'qc.decided', 'coding.unlocked'])
      .execute();
    expect(audit.filter((a) => a.action === 'qc.decided')).toHaveLength(6);
    expect(audit.filter((a) => a.action === 'qc.sample_drawn')).toHaveLength(2);
    expect(audit.filter((a) => a.action === 'coding.unlocked')).toHaveLength(1);
  });
});
