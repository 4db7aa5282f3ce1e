// Prioritised review over HTTP on a small matter made of Cranfield documents
// (Cleverdon 1966; ../shared/data/cranfield), with Cranfield's relevance judgements
// for one query playing the reviewers' Responsive / Not responsive codes.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { cranfieldAvailable, readCranfield } from '../engine/index';
import { createTestApp, type Agent, type TestApp, type TestMatter } from '../../tests/helpers';
import { formatControlNumber } from '../documents/control-numbers';
import { indexMatter } from '../search/test-fixture';
import { prioritisedSelection } from './service';

const matterIdOf = (base: string) => Number(/matters\/(\d+)/.exec(base)![1]);

const present = cranfieldAvailable();

/** A job queued in a transaction wakes its loop on the next turn (runner.ts): wait for that, then idle. */
async function settle(t: TestApp): Promise<void> {
  await new Promise((resolve) => setImmediate(resolve));
  await t.ctx.jobs.waitForIdle();
}

describe.runIf(present)('prioritised review (learned ranking from codes)', () => {
  let t: TestApp;
  let matter: TestMatter;
  let lead: Agent;
  let reviewer: Agent;
  let base: string;
  const relevantIds: number[] = [];
  const otherIds: number[] = [];
  let responsive: number;
  let notResponsive: number;

  beforeAll(async () => {
    t = await createTestApp();
    matter = await t.buildMatter();
    base = `/api/matters/${matter.id}`;
    lead = await t.agentFor(matter.lead);
    const rev = await t.buildUser();
    await t.addMember(matter, rev, 'reviewer');
    reviewer = await t.agentFor(rev);
    const { docs, qrels } = readCranfield();
    // Query 2's judged documents (relevant) and the first 120 unjudged ones.
    const judged = qrels.get('2')!;
    const relevant = docs.filter((d) => judged.has(d.id));
    const others = docs.filter((d) => !judged.has(d.id)).slice(0, 120);
    const now = new Date().toISOString();
    let seq = 0;
    const indexed: { id: number; text: string }[] = [];
    for (const [list, out] of [
      [relevant, relevantIds],
      [others, otherIds],
    ] as const) {
      for (const d of list) {
        const row = await t.ctx.db
          .insertInto('documents')
          .values({
            matter_id: matter.id,
            control_number: formatControlNumber(matter.controlPrefix, ++seq),
            original_name: `cran-${d.id}.txt`,
            original_path: `cran-${d.id}.txt`,
            sha256: d.id.padStart(64, '0'),
            mime: 'text/plain',
            doc_type: 'text',
            size: d.text.length,
            title: d.title,
            extract_status: 'extracted',
            created_at: now,
          })
          .returning('id')
          .executeTakeFirstOrThrow();
        await t.ctx.db
          .insertInto('document_texts')
          .values({ document_id: row.id, title: d.title, body: d.text })
          .execute();
        out.push(row.id);
        indexed.push({ id: row.id, text: `${d.title}\n${d.text}` });
      }
    }
    await indexMatter(t, matter.id, indexed, { k: 40, weighting: 'log-entropy' });
    const codes = (await lead.get(`${base}/codes`)).body.codes as { id: number; name: string }[];
    responsive = codes.find((c) => c.name === 'Responsive')!.id;
    notResponsive = codes.find((c) => c.name === 'Not responsive')!.id;
  });
  afterAll(() => t?.close());

  const code = (ids: number[], codeId: number) =>
    lead.post(`${base}/codes/bulk`).send({ documentIds: ids, add: [codeId], remove: [] });

  test('until 10 of each kind exist, the status and the search say how many more are needed', async () => {
    expect(relevantIds.length).toBeGreaterThanOrEqual(20);
    await code(relevantIds.slice(0, 4), responsive);
    const status = await reviewer.get(`${base}/prioritised`);
    expect(status.status).toBe(200);
    expect(status.body).toMatchObject({
      responsive: 4,
      notResponsive: 0,
      moreResponsiveNeeded: 6,
      moreNotResponsiveNeeded: 10,
      model: null,
    });
    const search = await reviewer.post(`${base}/search`).send({ mode: 'prioritised' });
    expect(search.status).toBe(409);
    expect(search.body.error.message).toMatch(
      /6 more coded Responsive and 10 more coded Not responsive/,
    );
    const train = await lead.post(`${base}/prioritised/train`);
    expect(train.status).toBe(409);
  });

  test('10 of each queue the first training in the background; the model and its counts are audited', async () => {
    await code(relevantIds.slice(4, 10), responsive);
    await code(otherIds.slice(0, 10), notResponsive);
    await settle(t);
    const status = (await reviewer.get(`${base}/prioritised`)).body;
    expect(status.model).toMatchObject({
      version: 1,
      positives: 10,
      negatives: 10,
      reason: 'first model',
    });
    expect(status.model.scored).toBe(relevantIds.length + otherIds.length);
    const audit = await t.ctx.db
      .selectFrom('audit_events')
      .selectAll()
      .where('matter_id', '=', matter.id)
      .where('action', '=', 'ranking.trained')
      .execute();
    expect(audit).toHaveLength(1);
    expect(JSON.parse(audit[0].detail)).toMatchObject({ version: 1, positives: 10, negatives: 10 });
  });

  test('mode prioritised lists uncoded documents, likely responsive first, and audits the model', async () => {
    const res = await reviewer.post(`${base}/search`).send({ mode: 'prioritised', limit: 200 });
    expect(res.status).toBe(200);
    expect(res.body.mode).toBe('prioritised');
    const ids = (res.body.hits as { documentId: number }[]).map((h) => h.documentId);
    const coded = new Set([...relevantIds.slice(0, 10), ...otherIds.slice(0, 10)]);
    expect(ids.some((id) => coded.has(id))).toBe(false);
    expect(ids).toHaveLength(relevantIds.length + otherIds.length - 20);
    // Held-out judged documents rank above unjudged ones: the area under the ROC
    // curve (the chance a random relevant one is above a random other) well above 0.5.
    const rank = new Map(ids.map((id, i) => [id, i]));
    const heldOut = relevantIds.slice(10);
    const rest = otherIds.slice(10);
    let above = 0;
    for (const r of heldOut) for (const o of rest) if (rank.get(r)! < rank.get(o)!) above++;
    expect(above / (heldOut.length * rest.length)).toBeGreaterThan(0.75);
    expect(res.body.notice).toMatch(/learned model 1/);
    const event = await t.ctx.db
      .selectFrom('audit_events')
      .selectAll()
      .where('matter_id', '=', matter.id)
      .where('action', '=', 'search.run')
      .orderBy('id', 'desc')
      .executeTakeFirstOrThrow();
    expect(JSON.parse(event.detail).model).toMatchObject({
      version: 1,
      positives: 10,
      negatives: 10,
    });
    // Filters apply as in every mode.
    const narrowed = await reviewer
      .post(`${base}/search`)
      .send({ mode: 'prioritised', query: 'boundary layer', limit: 200 });
    expect(narrowed.status).toBe(200);
    expect(narrowed.body.hits.length).toBeLessThanOrEqual(ids.length);
  });

  test('25 new codes queue a retrain; on demand the lead may retrain, a reviewer may not', async () => {
    await code(otherIds.slice(10, 35), notResponsive);
    await settle(t);
    const status = (await reviewer.get(`${base}/prioritised`)).body;
    expect(status.model).toMatchObject({ version: 2, negatives: 35 });
    expect(status.newCodesSinceModel).toBe(0);
    expect((await reviewer.post(`${base}/prioritised/train`)).status).toBe(403);
    const asked = await lead.post(`${base}/prioritised/train`);
    expect(asked.status).toBe(202);
    await settle(t);
    expect((await reviewer.get(`${base}/prioritised`)).body.model.version).toBe(3);
  });

  test('"more like the documents coded Responsive" (Rocchio) leaves coded documents out; audited', async () => {
    const res = await reviewer.post(`${base}/prioritised/more-like-responsive`).send({ limit: 20 });
    expect(res.status).toBe(200);
    expect(res.body.relevant).toBe(10);
    const ids = (res.body.documents as { documentId: number }[]).map((d) => d.documentId);
    expect(ids).toHaveLength(20);
    const coded = new Set([...relevantIds.slice(0, 10), ...otherIds.slice(0, 35)]);
    expect(ids.some((id) => coded.has(id))).toBe(false);
    // Most of its top 20 are judged relevant to the same query.
    const relevant = new Set(relevantIds);
    expect(ids.filter((id) => relevant.has(id)).length).toBeGreaterThanOrEqual(8);
  });

  test('a prioritised batch: top of the ranking plus 1 in 10 at random, reproducible from the seed', async () => {
    const first = await lead.post(`${base}/prioritised/batches`).send({ size: 20, seed: 11 });
    expect(first.status).toBe(201);
    expect(first.body.documents).toHaveLength(20);
    expect(first.body.documents.filter((d: { random: boolean }) => d.random)).toHaveLength(2);
    // The selection is a review batch holding those documents (families kept whole).
    expect(first.body.batchId).toEqual(expect.any(Number));
    const inBatch = await t.ctx.db
      .selectFrom('review_batch_documents')
      .select('document_id')
      .where('batch_id', '=', first.body.batchId)
      .execute();
    const batchIds = new Set(inBatch.map((r) => r.document_id));
    for (const d of first.body.documents as { documentId: number }[])
      expect(batchIds.has(d.documentId)).toBe(true);
    // The same seed draws the same selection; handing it out twice is refused, since a
    // document sits in at most one open review batch.
    const redrawn = await prioritisedSelection(t.ctx, matterIdOf(base), {
      size: 20,
      randomShare: 0.1,
      seed: 11,
    });
    expect(redrawn.documents).toEqual(first.body.documents);
    const again = await lead.post(`${base}/prioritised/batches`).send({ size: 20, seed: 11 });
    expect(again.status).toBe(409);
    const bad = await lead.post(`${base}/prioritised/batches`).send({ size: 0 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/size/);
  });
});

describe.runIf(present)('tuning the space from the codes (50 of each kind)', () => {
  test('the train-ranking job measures k and the hybrid weight by cross-validation', async () => {
    const t = await createTestApp();
    try {
      const matter = await t.buildMatter();
      const base = `/api/matters/${matter.id}`;
      const lead = await t.agentFor(matter.lead);
      const { docs, qrels } = readCranfield();
      // Responsive: documents judged relevant to Cranfield queries 157 or 23.
      const judged = new Set([...qrels.get('157')!.keys(), ...qrels.get('23')!.keys()]);
      const chosen = [
        ...docs.filter((d) => judged.has(d.id)).slice(0, 55),
        ...docs.filter((d) => !judged.has(d.id)).slice(0, 80),
      ];
      const now = new Date().toISOString();
      const ids: number[] = [];
      for (const [i, d] of chosen.entries()) {
        const row = await t.ctx.db
          .insertInto('documents')
          .values({
            matter_id: matter.id,
            control_number: formatControlNumber(matter.controlPrefix, i + 1),
            original_name: `cran-${d.id}.txt`,
            original_path: `cran-${d.id}.txt`,
            sha256: d.id.padStart(64, '0'),
            mime: 'text/plain',
            doc_type: 'text',
            size: d.text.length,
            title: d.title,
            extract_status: 'extracted',
            created_at: now,
          })
          .returning('id')
          .executeTakeFirstOrThrow();
        await t.ctx.db
          .insertInto('document_texts')
          .values({ document_id: row.id, title: d.title, body: d.text })
          .execute();
        ids.push(row.id);
      }
      await indexMatter(
        t,
        matter.id,
        chosen.map((d, i) => ({ id: ids[i], text: `${d.title}\n${d.text}` })),
        { k: 40, weighting: 'log-entropy' },
      );
      const codes = (await lead.get(`${base}/codes`)).body.codes as { id: number; name: string }[];
      const id = (name: string) => codes.find((c) => c.name === name)!.id;
      const nR = chosen.filter((d) => judged.has(d.id)).length;
      await lead
        .post(`${base}/codes/bulk`)
        .send({ documentIds: ids.slice(0, 50), add: [id('Responsive')], remove: [] });
      await lead
        .post(`${base}/codes/bulk`)
        .send({ documentIds: ids.slice(nR, nR + 50), add: [id('Not responsive')], remove: [] });
      await settle(t);
      const status = (await lead.get(`${base}/prioritised`)).body;
      const tuning = status.model.tuning;
      expect(tuning).not.toBeNull();
      expect(tuning.folds).toBe(5);
      expect(tuning.current).toMatchObject({ dims: 40, keywordWeight: 0.3 });
      // Every measured cell is a mean average precision; the best is the largest.
      for (const cell of tuning.cells) expect(cell.map).toBeGreaterThan(0);
      for (const cell of tuning.cells) expect(cell.map).toBeLessThanOrEqual(1);
      expect(tuning.best.map).toBe(Math.max(...tuning.cells.map((c: { map: number }) => c.map)));
      // The two kinds come from different queries' judgements: the space separates them.
      expect(tuning.best.map).toBeGreaterThan(0.7);
    } finally {
      await t.close();
    }
  });
});
