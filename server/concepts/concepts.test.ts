// The concept-space API over HTTP: shapes, access, labels kept with the index
// version, one map point per indexed document, k-means groupings usable as a filter,
// health figures. Independent checks: Eckart-Young (a rank-3 rebuild of the same matrix
// has the leading three singular values of the rank-k build, so the same cumulative
// energy), and drift recomputed here from U_k with its definition 1 - ||U_k^T d||^2/||d||^2.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeText } from '../../corpus-demo/render';
import { analyze } from '../engine/index';
import type {
  DimensionsResponse,
  GroupingResponse,
  HealthResponse,
  MapResponse,
  NeighboursResponse,
  SpectrumResponse,
} from '../../shared/schemas/concepts';
import type { IndexStateResponse } from '../../shared/schemas/indexing';
import type { Job } from '../../shared/schemas/jobs';
import { createTestApp, type Agent, type TestApp, type TestMatter } from '../../tests/helpers';
import { groupMemberIdsSubquery } from './queries';
import { conceptsServiceFor, documentIdsInGroup } from './service';

// Invented texts (demo-style): five about a flour mill and a bakery, five about a lease.
const BAKERY = [
  'The mill delivered damp wheat flour to the bakery and the bread failed.',
  'Bakery complaint: the flour from the mill was damp, the dough and bread spoiled.',
  'Wheat flour moisture tests at the mill before delivery to the bakery.',
  'The bakery rejected a delivery of damp flour; the mill offered new wheat.',
  'Dough made from the mill flour would not rise; the bakery lost its bread orders.',
];
const LEASE = [
  'The landlord served a break notice under the warehouse lease.',
  'Rent review of the warehouse lease; the landlord proposed new rent.',
  'The tenant disputes the break notice and the rent under the lease.',
  'Warehouse lease: landlord and tenant agree the rent review timetable.',
  'The landlord wrote to the tenant about the lease break clause and rent.',
];

let t: TestApp;
let matter: TestMatter;
let lead: Agent;
let attorney: Agent;
let paralegal: Agent;
const base = () => `/api/matters/${matter.id}/concepts`;

async function upload(texts: string[], prefix: string) {
  let req = lead.post(`/api/matters/${matter.id}/documents`);
  texts.forEach((text, i) => (req = req.attach('files', makeText(text), `${prefix}-${i}.txt`)));
  const res = await req;
  expect(res.status).toBe(201);
  await t.ctx.jobs.waitForIdle();
}

async function indexState(): Promise<IndexStateResponse> {
  return (await lead.get(`/api/matters/${matter.id}/index`)).body as IndexStateResponse;
}

beforeAll(async () => {
  // Keep the two late documents folded in (the default 10% share would queue a rebuild).
  t = await createTestApp({ config: { rebuildFoldInShare: 0.5 } });
  matter = await t.buildMatter({ controlPrefix: 'CSV' });
  lead = await t.agentFor(matter.lead);
  const att = await t.buildUser();
  const para = await t.buildUser();
  await t.addMember(matter, att, 'attorney');
  await t.addMember(matter, para, 'paralegal');
  attorney = await t.agentFor(att);
  paralegal = await t.agentFor(para);
  // Before any build: the spectrum is empty, the rest say there is no index.
  const empty = await lead.get(`${base()}/spectrum`);
  expect(empty.status).toBe(200);
  expect(empty.body).toEqual({ current: null, previous: null });
  const none = await lead.get(`${base()}/health`);
  expect(none.status).toBe(409);
  expect(none.body.error.message).toMatch(/no concept index yet/);
  await upload([...BAKERY, ...LEASE], 'doc');
  expect((await indexState()).current?.version).toBe(1);
}, 60_000);

afterAll(async () => {
  await t?.close();
});

describe('concept space over HTTP', () => {
  it('access: attorneys see the views, paralegals and reviewers do not; only the lead labels', async () => {
    expect((await attorney.get(`${base()}/spectrum`)).status).toBe(200);
    expect((await attorney.get(`${base()}/map`)).status).toBe(200);
    expect((await paralegal.get(`${base()}/spectrum`)).status).toBe(403);
    expect((await paralegal.get(`${base()}/terms/neighbours?term=flour`)).status).toBe(403);
    const label = await attorney.put(`${base()}/dimensions/1/label`).send({ label: 'Topic' });
    expect(label.status).toBe(403);
  });

  it('dimensions: both ends of each U_k column, typical documents with control numbers; labels persist with the version', async () => {
    const res = await lead.get(`${base()}/dimensions?count=3&terms=4&docs=3`);
    expect(res.status).toBe(200);
    const body = res.body as DimensionsResponse;
    expect(body.dimensions.map((d) => d.dim)).toEqual([1, 2, 3]);
    for (const d of body.dimensions) {
      expect(d.positiveTerms.length + d.negativeTerms.length).toBeGreaterThan(0);
      d.positiveTerms.forEach((p) => expect(p.loading).toBeGreaterThan(0));
      d.negativeTerms.forEach((p) => expect(p.loading).toBeLessThan(0));
      expect(d.documents).toHaveLength(3);
      const abs = d.documents.map((x) => Math.abs(x.loading));
      expect(abs).toEqual([...abs].sort((a, b) => b - a));
      d.documents.forEach((x) => expect(x.controlNumber).toMatch(/^CSV/));
    }
    // The second dimension contrasts the two topics (Deerwester et al. 1990: the first
    // axis is overall weight, the next separates topics): flour and lease at opposite ends.
    const d2 = body.dimensions[1];
    const ends = [d2.positiveTerms, d2.negativeTerms].map((list) => list.map((x) => x.label));
    const flourEnd = ends.findIndex((e) =>
      e.some((w) => /flour|bakery|mill|dough|bread|wheat/.test(w)),
    );
    const leaseEnd = ends.findIndex((e) =>
      e.some((w) => /lease|landlord|rent|tenant|break/.test(w)),
    );
    expect(flourEnd).toBeGreaterThanOrEqual(0);
    expect(leaseEnd).toBe(1 - flourEnd);

    const put = await lead
      .put(`${base()}/dimensions/2/label`)
      .send({ label: '  Flour v. lease  ' });
    expect(put.status).toBe(200);
    expect(put.body.label.label).toBe('Flour v. lease');
    expect(put.body.label.labelledBy.id).toBe(matter.lead.id);
    const again = (await lead.get(`${base()}/dimensions?count=2`)).body as DimensionsResponse;
    expect(again.dimensions[1].label?.label).toBe('Flour v. lease');
    expect(again.dimensions[0].label).toBeNull();
    // Bad input names the problem; nothing stored changes.
    const tooFar = await lead.put(`${base()}/dimensions/999/label`).send({ label: 'x' });
    expect(tooFar.status).toBe(400);
    expect(JSON.stringify(tooFar.body)).toMatch(/at most/);
    const blank = await lead.put(`${base()}/dimensions/2/label`).send({ label: '   ' });
    expect(blank.status).toBe(400);
    const stored = await t.ctx.db.selectFrom('index_dimension_labels').selectAll().execute();
    expect(stored).toHaveLength(1);
    expect(stored[0]).toMatchObject({ dim: 2, label: 'Flour v. lease', index_id: body.indexId });
  });

  it('term neighbours: analysed like a query, cosine similarities, unknown word -> empty with a notice', async () => {
    const res = await attorney.get(`${base()}/terms/neighbours?term=Flour&n=5`);
    expect(res.status).toBe(200);
    const body = res.body as NeighboursResponse;
    expect(body.analysed).toEqual(analyze('Flour'));
    expect(body.neighbours.length).toBeGreaterThan(0);
    expect(body.neighbours.length).toBeLessThanOrEqual(5);
    const sims = body.neighbours.map((n) => n.similarity);
    expect(sims).toEqual([...sims].sort((a, b) => b - a));
    sims.forEach((s) => expect(Math.abs(s)).toBeLessThanOrEqual(1 + 1e-6));
    expect(body.neighbours.map((n) => n.term)).not.toContain(body.analysed[0]);
    // Same-topic words are nearer than the other topic's.
    expect(body.neighbours[0].label).toMatch(/mill|bakery|dough|bread|wheat|damp|deliver/);
    const unknown = await attorney.get(`${base()}/terms/neighbours?term=xylophone`);
    expect(unknown.status).toBe(200);
    expect(unknown.body.neighbours).toEqual([]);
    expect(unknown.body.notice).toMatch(/not in this matter's index/);
    const missing = await attorney.get(`${base()}/terms/neighbours`);
    expect(missing.status).toBe(400);
    expect(JSON.stringify(missing.body)).toMatch(/term/);
  });

  it('map: one point per indexed document, with its details, within the unit disk', async () => {
    const res = await attorney.get(`${base()}/map?x=1&y=2`);
    expect(res.status).toBe(200);
    const map = res.body as MapResponse;
    const members = await t.ctx.db
      .selectFrom('index_docs')
      .select('document_id')
      .where('index_id', '=', map.indexId)
      .execute();
    expect(map.count).toBe(members.length);
    expect(new Set(map.ids)).toEqual(new Set(members.map((m) => m.document_id)));
    for (const key of [
      'x',
      'y',
      'ids',
      'controlNumbers',
      'titles',
      'custodian',
      'codeIds',
      'foldedIn',
    ] as const)
      expect(map[key], key).toHaveLength(map.count);
    map.x.forEach((x, i) => expect(x * x + map.y[i] * map.y[i]).toBeLessThanOrEqual(1 + 1e-3));
    expect(map.dims).toEqual([1, 2]);
    const same = await attorney.get(`${base()}/map?x=2&y=2`);
    expect(same.status).toBe(400);
  });

  it('groups: k-means with a seed, deterministic, the two topics apart, usable as a filter', async () => {
    // A new grouping is a background job (k-means runs in a worker thread); the same
    // settings asked again while it runs get the same job, and once it has succeeded the
    // stored grouping.
    const res = await attorney.post(`${base()}/groupings`).send({ groups: 2, seed: 7 });
    expect(res.status).toBe(202);
    const jobId = (res.body as { job: Job }).job.id;
    expect((res.body as { job: Job }).job.kind).toBe('concept-grouping');
    const meanwhile = await lead.post(`${base()}/groupings`).send({ groups: 2, seed: 7 });
    if (meanwhile.status === 202) expect(meanwhile.body.job.id).toBe(jobId);
    await t.ctx.jobs.waitForIdle();
    const finished = await attorney.get(`/api/jobs/${jobId}`);
    expect(finished.body.job.status, finished.body.job.error ?? '').toBe('succeeded');
    const stored = await attorney.post(`${base()}/groupings`).send({ groups: 2, seed: 7 });
    expect(stored.status).toBe(200);
    const body = stored.body as GroupingResponse;
    const jobCount = await t.ctx.db
      .selectFrom('jobs')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('matter_id', '=', matter.id)
      .where('kind', '=', 'concept-grouping')
      .executeTakeFirstOrThrow();
    expect(jobCount.n).toBe(1);
    expect(body.groups.map((g) => g.number)).toEqual([1, 2]);
    expect(body.groups.reduce((s, g) => s + g.size, 0)).toBe(body.grouping.documents);
    expect(body.grouping.converged).toBe(true);
    const again = await lead.post(`${base()}/groupings`).send({ groups: 2, seed: 7 });
    expect(again.status).toBe(200);
    expect(again.body.grouping.id).toBe(body.grouping.id);
    const list = await attorney.get(`${base()}/groupings`);
    expect(list.body.groupings.map((g: { id: number }) => g.id)).toContain(body.grouping.id);
    const one = await attorney.get(`${base()}/groupings/${body.grouping.id}`);
    expect(one.body).toEqual(body);

    // Each group holds one topic (the texts are built to be separable).
    const docs = await t.ctx.db
      .selectFrom('documents as d')
      .innerJoin('document_texts as x', 'x.document_id', 'd.id')
      .select(['d.id', 'x.body'])
      .where('d.matter_id', '=', matter.id)
      .execute();
    const topic = new Map(
      docs.map((d) => [d.id, BAKERY.includes(d.body.trim()) ? 'bakery' : 'lease']),
    );
    const seen = new Set<string>();
    for (const g of body.groups) {
      const ids = await documentIdsInGroup(t.ctx, matter.id, body.grouping.id, g.id);
      expect(ids).toHaveLength(g.size);
      // The subquery form search can put in its WHERE gives the same documents.
      const viaSql = await t.ctx.db
        .selectFrom('documents as d')
        .select('d.id')
        .where('d.matter_id', '=', matter.id)
        .where('d.id', 'in', groupMemberIdsSubquery(t.ctx.db, g.id))
        .orderBy('d.id')
        .execute();
      expect(viaSql.map((r) => r.id)).toEqual(ids);
      const topics = new Set(ids!.map((id) => topic.get(id)));
      expect(topics.size).toBe(1);
      seen.add([...topics][0]!);
      expect(g.topTerms.length).toBeGreaterThan(0);
      // As a search filter: keyword and concept results stay inside the group.
      for (const mode of ['keyword', 'concept'] as const) {
        const found = await attorney
          .post(`/api/matters/${matter.id}/search`)
          .send({ query: BAKERY[0], mode, filters: { groupId: g.id }, limit: 100 });
        expect(found.status, mode).toBe(200);
        const hitIds = (found.body.hits as { documentId: number }[]).map((h) => h.documentId);
        for (const id of hitIds) expect(ids, `${mode} hit ${id}`).toContain(id);
        if (topic.get(ids![0]) === 'bakery') expect(hitIds.length, mode).toBeGreaterThan(0);
      }
    }
    expect(seen).toEqual(new Set(['bakery', 'lease']));
    // A group of another grouping, or of nothing, is not found.
    expect(
      await documentIdsInGroup(t.ctx, matter.id, body.grouping.id + 1, body.groups[0].id),
    ).toBeNull();
    expect(
      await conceptsServiceFor(t.ctx).documentIdsInGroup(
        matter.id + 1,
        undefined,
        body.groups[0].id,
      ),
    ).toBeNull();

    for (const groups of [1, 51, 11]) {
      const bad = await attorney.post(`${base()}/groupings`).send({ groups, seed: 1 });
      expect(bad.status, String(groups)).toBe(400);
    }
    const missing = await attorney.get(`${base()}/groupings/987654`);
    expect(missing.status).toBe(404);
  });

  it('health: the figures of the build, and drift of folded-in documents against U_k', async () => {
    await upload(
      [
        'An invoice for forklift hire at the depot, unrelated to flour.',
        'Forklift depot invoice and hire terms for the lease yard.',
      ],
      'late',
    );
    const state = await indexState();
    expect(state.counts.foldedIn).toBe(2);
    const res = await attorney.get(`${base()}/health`);
    expect(res.status).toBe(200);
    const h = res.body as HealthResponse;
    const current = state.current!;
    expect(h.documents).toBe(12);
    expect(h.builtDocuments).toBe(10);
    expect(h.foldedIn).toBe(2);
    expect(h.foldedShare).toBeCloseTo(2 / 12, 12);
    expect(h.sigma1).toBeCloseTo(current.diagnostics.sigma1!, 10);
    expect(h.conditionNumber).toBeCloseTo(current.diagnostics.conditionNumber!, 6);
    expect(h.sparsity).toBeCloseTo(1 - current.nnz / (current.nTerms * current.nDocs), 12);
    // Drift recomputed here from the definition, over the two folded-in texts.
    const space = (await t.ctx.index.getSpace(matter.id))!;
    const texts = await t.ctx.db
      .selectFrom('index_docs as x')
      .innerJoin('document_texts as d', 'd.document_id', 'x.document_id')
      .select(['d.title', 'd.body'])
      .where('x.index_id', '=', h.indexId)
      .where('x.folded_in', '=', 1)
      .execute();
    const drifts = texts.map(({ title, body }) => {
      const w = space.weightTerms(analyze(title ? `${title}\n${body}` : body));
      let dd = 0;
      for (const x of w.weights) dd += x * x;
      let pp = 0;
      for (let c = 0; c < space.k; c++) {
        let dot = 0;
        w.ids.forEach((id, p) => (dot += w.weights[p] * space.termVectors[id * space.k + c]));
        pp += dot * dot;
      }
      return dd > 0 ? 1 - pp / dd : 1;
    });
    expect(h.drift).toBeCloseTo((drifts[0] + drifts[1]) / 2, 5);
    expect(h.driftMax).toBeCloseTo(Math.max(...drifts), 5);
    // Thresholds: the configured fold-in share, the default drift 0.35.
    expect(h.thresholds).toMatchObject({ foldedShare: 0.5, drift: 0.35 });
    expect(h.rebuildRecommended).toBe(h.drift! > 0.35);
    expect(h.messages.some((m) => m.code === 'rebuild-drift')).toBe(h.drift! > 0.35);
    expect(h.messages.some((m) => m.code === 'rebuild-folded')).toBe(false);
    expect(h.summary.join(' ')).toMatch(/2-norm/);
    // The map follows the index: folded-in documents are points too.
    const map = (await attorney.get(`${base()}/map`)).body as MapResponse;
    expect(map.count).toBe(12);
    expect(map.foldedIn.filter((f) => f === 1)).toHaveLength(2);
  }, 30_000);

  it('spectrum: a rebuild with another k shows its figures beside the previous version (Eckart-Young)', async () => {
    const before = (await lead.get(`${base()}/spectrum`)).body as SpectrumResponse;
    const old = before.current!;
    expect(old.cumulativeEnergy).toHaveLength(old.k);
    expect(old.energyKept).toBeCloseTo(old.cumulativeEnergy![old.k - 1], 12);
    const labelledIndex = old.indexId;
    const rebuild = await lead.post(`/api/matters/${matter.id}/index/rebuild`).send({ k: 3 });
    expect(rebuild.status).toBe(202);
    await t.ctx.jobs.waitForIdle();
    const after = (await attorney.get(`${base()}/spectrum`)).body as SpectrumResponse;
    expect(after.current!.k).toBe(3);
    expect(after.previous!.indexId).toBe(labelledIndex);
    // The rebuild covers the 12 documents now; the previous one had 10.
    expect(after.current!.nDocs).toBe(12);
    expect(after.previous!.nDocs).toBe(10);
    const s = after.current!.singularValues;
    expect(s).toHaveLength(3);
    const fro = after.current!.frobeniusSq!;
    expect(after.current!.cumulativeEnergy![2]).toBeCloseTo(
      (s[0] ** 2 + s[1] ** 2 + s[2] ** 2) / fro,
      12,
    );
    expect(after.current!.energyBeyondK).toBeCloseTo(1 - after.current!.energyKept!, 12);
    // Labels stay with the version they were given for; the new version starts unnamed.
    const dims = (await lead.get(`${base()}/dimensions?count=3`)).body as DimensionsResponse;
    expect(dims.dimensions.every((d) => d.label === null)).toBe(true);
    const kept = await t.ctx.db
      .selectFrom('index_dimension_labels')
      .select(['index_id', 'label'])
      .execute();
    expect(kept).toEqual([{ index_id: labelledIndex, label: 'Flour v. lease' }]);
    // Same matrix, k = 3 and then k = 2: Eckart-Young gives the same leading values.
    await lead.post(`/api/matters/${matter.id}/index/rebuild`).send({ k: 2 });
    await t.ctx.jobs.waitForIdle();
    const two = (await lead.get(`${base()}/spectrum`)).body as SpectrumResponse;
    expect(two.current!.k).toBe(2);
    two.current!.singularValues.forEach((v, i) => expect(v).toBeCloseTo(s[i], 4));
    expect(two.current!.frobeniusSq).toBeCloseTo(fro, 8);
    expect(two.current!.cumulativeEnergy![1]).toBeCloseTo(after.current!.cumulativeEnergy![1], 4);
  }, 60_000);
});
