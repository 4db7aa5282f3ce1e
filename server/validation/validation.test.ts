// Recall validation over HTTP: samples drawn reproducibly from the population they
// name, of the size the formula gives, and their statistics once coded (checked
// against jStat's beta inverse, a general-purpose statistics package).
import { jStat } from 'jstat';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { createTestApp, type Agent, type TestApp, type TestMatter } from '../../tests/helpers';
import { formatControlNumber } from '../documents/control-numbers';

describe('validation samples', () => {
  let t: TestApp;
  let matter: TestMatter;
  let lead: Agent;
  let attorney: Agent;
  let reviewer: Agent;
  let base: string;
  const ids: number[] = [];
  let responsive: number;
  let notResponsive: number;
  const N = 1200;
  const produced = 150;

  beforeAll(async () => {
    t = await createTestApp();
    matter = await t.buildMatter();
    base = `/api/matters/${matter.id}`;
    lead = await t.agentFor(matter.lead);
    for (const role of ['attorney', 'reviewer'] as const) {
      const u = await t.buildUser();
      await t.addMember(matter, u, role);
      if (role === 'attorney') attorney = await t.agentFor(u);
      else reviewer = await t.agentFor(u);
    }
    const now = new Date().toISOString();
    const rows = Array.from({ length: N }, (_, i) => ({
      matter_id: matter.id,
      control_number: formatControlNumber(matter.controlPrefix, i + 1),
      original_name: `d${i}.txt`,
      original_path: `d${i}.txt`,
      sha256: String(i).padStart(64, '0'),
      mime: 'text/plain',
      doc_type: 'text',
      size: 10,
      extract_status: 'extracted' as const,
      created_at: now,
    }));
    for (let s = 0; s < rows.length; s += 300) {
      const inserted = await t.ctx.db
        .insertInto('documents')
        .values(rows.slice(s, s + 300))
        .returning('id')
        .execute();
      ids.push(...inserted.map((r) => r.id));
    }
    const codes = (await lead.get(`${base}/codes`)).body.codes as { id: number; name: string }[];
    responsive = codes.find((c) => c.name === 'Responsive')!.id;
    notResponsive = codes.find((c) => c.name === 'Not responsive')!.id;
    // The first 150 documents are coded Responsive: the set to be produced.
    const r = await lead
      .post(`${base}/codes/bulk`)
      .send({ documentIds: ids.slice(0, produced), add: [responsive], remove: [] });
    expect(r.status).toBe(200);
  });
  afterAll(() => t?.close());

  const sampleDocs = (sampleId: number) =>
    t.ctx.db
      .selectFrom('validation_sample_documents')
      .select('document_id')
      .where('sample_id', '=', sampleId)
      .orderBy('position')
      .execute()
      .then((rows) => rows.map((r) => r.document_id));

  test('elusion: drawn only from documents not coded Responsive, of the formula size, reproducible from the seed', async () => {
    const res = await lead
      .post(`${base}/validation/samples`)
      .send({ kind: 'elusion', confidence: 0.95, margin: 0.05, seed: 20141 });
    expect(res.status).toBe(201);
    const population = N - produced;
    // n0 = z^2 / (4 E^2), then n0 / (1 + (n0 - 1) / N) (Cochran 1977), z from jStat.
    const z = jStat.normal.inv(0.975, 0, 1);
    const n0 = (z * z * 0.25) / 0.0025;
    const expected = Math.ceil(n0 / (1 + (n0 - 1) / population));
    expect(res.body).toEqual({
      sampleId: expect.any(Number),
      size: expected,
      seed: 20141,
      population,
      batchId: expect.any(Number),
    });
    // The sample is a validation batch holding exactly the drawn documents, in order.
    const batchDocs = await t.ctx.db
      .selectFrom('review_batch_documents')
      .select('document_id')
      .where('batch_id', '=', res.body.batchId)
      .orderBy('position')
      .execute();
    const drawn = await sampleDocs(res.body.sampleId);
    expect(batchDocs.map((d) => d.document_id)).toEqual(drawn);
    expect(drawn).toHaveLength(expected);
    expect(new Set(drawn).size).toBe(expected);
    const producedSet = new Set(ids.slice(0, produced));
    expect(drawn.some((id) => producedSet.has(id))).toBe(false);
    expect(drawn.every((id) => ids.includes(id))).toBe(true);
    const again = await lead
      .post(`${base}/validation/samples`)
      .send({ kind: 'elusion', confidence: 0.95, margin: 0.05, seed: 20141 });
    expect(await sampleDocs(again.body.sampleId)).toEqual(drawn);
    const other = await lead
      .post(`${base}/validation/samples`)
      .send({ kind: 'elusion', confidence: 0.95, margin: 0.05, seed: 20142 });
    expect(await sampleDocs(other.body.sampleId)).not.toEqual(drawn);
    const event = await t.ctx.db
      .selectFrom('audit_events')
      .selectAll()
      .where('action', '=', 'validation.sample_created')
      .where('target_id', '=', String(res.body.sampleId))
      .executeTakeFirstOrThrow();
    expect(JSON.parse(event.detail)).toMatchObject({ seed: 20141, population, size: expected });
  });

  test('prevalence draws from every document; a random seed is recorded when none is given', async () => {
    const res = await lead
      .post(`${base}/validation/samples`)
      .send({ kind: 'prevalence', confidence: 0.9, margin: 0.1 });
    expect(res.status).toBe(201);
    expect(res.body.population).toBe(N);
    expect(Number.isInteger(res.body.seed)).toBe(true);
    const z = jStat.normal.inv(0.95, 0, 1);
    const n0 = (z * z * 0.25) / 0.01;
    expect(res.body.size).toBe(Math.ceil(n0 / (1 + (n0 - 1) / N)));
  });

  test('bad input gets a 400 naming the field; only the lead draws samples', async () => {
    const bad = await lead
      .post(`${base}/validation/samples`)
      .send({ kind: 'elusion', confidence: 95, margin: 0.05 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/confidence/);
    const kind = await lead
      .post(`${base}/validation/samples`)
      .send({ kind: 'final', confidence: 0.95, margin: 0.05 });
    expect(kind.status).toBe(400);
    expect(kind.body.error.message).toMatch(/kind/);
    const refused = await attorney
      .post(`${base}/validation/samples`)
      .send({ kind: 'elusion', confidence: 0.95, margin: 0.05 });
    expect(refused.status).toBe(403);
  });

  test('once coded: elusion rate, Clopper-Pearson and Wilson intervals, missed and recall', async () => {
    const created = await lead
      .post(`${base}/validation/samples`)
      .send({ kind: 'elusion', confidence: 0.95, margin: 0.05, seed: 7 });
    const sampleId = created.body.sampleId as number;
    const drawn = await sampleDocs(sampleId);
    const before = await attorney.get(`${base}/validation/samples/${sampleId}`);
    expect(before.body).toMatchObject({ coded: 0, rate: null, interval: null, recall: null });
    // Code 200 of the sample: 5 Responsive, 195 Not responsive.
    await lead
      .post(`${base}/codes/bulk`)
      .send({ documentIds: drawn.slice(0, 5), add: [responsive], remove: [] });
    await lead
      .post(`${base}/codes/bulk`)
      .send({ documentIds: drawn.slice(5, 200), add: [notResponsive], remove: [] });
    const res = await attorney.get(`${base}/validation/samples/${sampleId}`);
    expect(res.status).toBe(200);
    const b = res.body;
    expect(b.coded).toBe(200);
    expect(b.size).toBe(drawn.length);
    expect(b.responsive).toBe(5);
    expect(b.rate).toBeCloseTo(5 / 200, 12);
    expect(b.documents).toHaveLength(drawn.length);
    expect(b.documents[0]).toMatchObject({ documentId: drawn[0], coded: true });
    expect(b.documents[250]).toMatchObject({ documentId: drawn[250], coded: false });
    expect(b.interval.method).toBe('clopper-pearson');
    expect(b.interval.low).toBeCloseTo(jStat.beta.inv(0.025, 5, 196), 7);
    expect(b.interval.high).toBeCloseTo(jStat.beta.inv(0.975, 6, 195), 7);
    expect(b.wilson.low).toBeGreaterThan(0);
    expect(b.wilson.high).toBeLessThan(b.interval.high);
    const population = N - produced;
    expect(b.estimatedMissed).toBeCloseTo((population * 5) / 200, 9);
    expect(b.recall.point).toBeCloseTo(produced / (produced + (population * 5) / 200), 9);
    expect(b.recall.low).toBeCloseTo(produced / (produced + population * b.interval.high), 9);
    expect(b.recall.high).toBeCloseTo(produced / (produced + population * b.interval.low), 9);
  });

  test('the CSV report is audited; a reviewer cannot read validation; an unknown sample is 404', async () => {
    const list = await attorney.get(`${base}/validation/samples`);
    expect(list.status).toBe(200);
    const sampleId = list.body.samples[0].sampleId as number;
    const csv = await attorney.get(`${base}/validation/samples/${sampleId}/report.csv`);
    expect(csv.status).toBe(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    expect(csv.text).toMatch(/clopper-pearson/);
    const exported = await t.ctx.db
      .selectFrom('audit_events')
      .selectAll()
      .where('action', '=', 'validation.report_exported')
      .execute();
    expect(exported.length).toBeGreaterThan(0);
    expect((await reviewer.get(`${base}/validation/samples/${sampleId}`)).status).toBe(403);
    expect((await attorney.get(`${base}/validation/samples/999999`)).status).toBe(404);
  });
});
