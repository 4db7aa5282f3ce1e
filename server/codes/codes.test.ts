// Codes, coding, notes, privilege entries and saved searches over HTTP.
// The roles table is shared/roles.ts (the product blueprint's roles); expectations
// here are written out from it.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { MatterRole } from '../../shared/roles';
import { createTestApp, type Agent, type TestApp, type TestUser } from '../../tests/helpers';
import { decide } from '../policy/policy';
import { buildMemoMatter, type MemoMatter } from '../search/test-fixture';

let t: TestApp;
let m: MemoMatter;
let base: string;
const people = {} as Record<MatterRole, TestUser>;
const agents = {} as Record<MatterRole, Agent>;
let codes: { id: number; name: string; marksPrivileged: boolean; shortcut: string | null }[];
const codeId = (name: string) => codes.find((c) => c.name === name)!.id;

beforeAll(async () => {
  t = await createTestApp();
  m = await buildMemoMatter(t);
  base = `/api/matters/${m.matter.id}`;
  people.lead = m.matter.lead;
  for (const role of ['attorney', 'paralegal', 'reviewer'] as const) {
    people[role] = await t.buildUser();
    await t.addMember(m.matter, people[role], role);
  }
  for (const role of ['lead', 'attorney', 'paralegal', 'reviewer'] as const)
    agents[role] = await t.agentFor(people[role]);
  codes = (await agents.reviewer.get(`${base}/codes`)).body.codes;
});
afterAll(() => t?.close());

const codingRows = (after = 0) =>
  t.ctx.db
    .selectFrom('audit_events')
    .selectAll()
    .where('matter_id', '=', m.matter.id)
    .where('action', '=', 'coding.changed')
    .where('id', '>', after)
    .orderBy('id')
    .execute();
const lastAuditId = async () =>
  Number(
    (
      await t.ctx.db
        .selectFrom('audit_events')
        .select((eb) => eb.fn.max('id').as('id'))
        .executeTakeFirst()
    )?.id ?? 0,
  );

describe('code set', () => {
  test('every new matter gets the default codes; Privileged marks the privilege log', () => {
    expect(codes.map((c) => c.name)).toEqual([
      'Responsive',
      'Not responsive',
      'Privileged',
      'Not privileged',
      'Hot',
      'Needs second look',
    ]);
    expect(codes.filter((c) => c.marksPrivileged).map((c) => c.name)).toEqual(['Privileged']);
    expect(new Set(codes.map((c) => c.shortcut)).size).toBe(6);
  });

  test('the lead adds, renames and archives codes; others may not (codes.manage)', async () => {
    const refused = await agents.attorney.post(`${base}/codes`).send({ name: 'Key witness' });
    expect(refused.status).toBe(403);
    const created = await agents.lead
      .post(`${base}/codes`)
      .send({ name: 'Key witness', shortcut: 'k' });
    expect(created.status).toBe(201);
    const id = created.body.code.id as number;
    const clash = await agents.lead.post(`${base}/codes`).send({ name: 'key WITNESS' });
    expect(clash.status).toBe(409);
    expect(clash.body.error.field).toBe('name');
    const renamed = await agents.lead
      .patch(`${base}/codes/${id}`)
      .send({ name: 'Key witness (2)' });
    expect(renamed.body.code.name).toBe('Key witness (2)');
    // Code a document, then archive: the document keeps it, but it can no longer be applied.
    expect(
      (await agents.reviewer.put(`${base}/documents/${m.ids.m1}/codes`).send({ codeIds: [id] }))
        .status,
    ).toBe(200);
    const archived = await agents.lead.delete(`${base}/codes/${id}`);
    expect(archived.status).toBe(200);
    expect(archived.body.code.archivedAt).not.toBeNull();
    expect(archived.body.code.documentCount).toBe(1);
    const apply = await agents.reviewer
      .put(`${base}/documents/${m.ids.m2}/codes`)
      .send({ codeIds: [id] });
    expect(apply.status).toBe(400);
    expect(apply.body.error.message).toMatch(/archived/);
    const keep = await agents.reviewer
      .put(`${base}/documents/${m.ids.m1}/codes`)
      .send({ codeIds: [id] });
    expect(keep.status).toBe(200);
    expect(keep.body.added).toEqual([]);
    const audit = await t.ctx.db
      .selectFrom('audit_events')
      .select('action')
      .where('matter_id', '=', m.matter.id)
      .where('target_type', '=', 'code')
      .execute();
    expect(audit.map((a) => a.action)).toEqual(['code.created', 'code.updated', 'code.archived']);
    await agents.reviewer.put(`${base}/documents/${m.ids.m1}/codes`).send({ codeIds: [] });
  });
});

describe('coding', () => {
  test('PUT sets the codes exactly and writes one audit row with added and removed', async () => {
    const after = await lastAuditId();
    const first = await agents.reviewer
      .put(`${base}/documents/${m.ids.c2}/codes`)
      .send({ codeIds: [codeId('Responsive'), codeId('Hot')] });
    expect(first.status).toBe(200);
    expect(first.body.codes.map((c: { name: string }) => c.name)).toEqual(['Responsive', 'Hot']);
    expect(first.body.codes[0].codedBy.id).toBe(people.reviewer.id);
    const second = await agents.reviewer
      .put(`${base}/documents/${m.ids.c2}/codes`)
      .send({ codeIds: [codeId('Hot')] });
    expect(second.body.removed).toEqual([codeId('Responsive')]);
    const same = await agents.reviewer
      .put(`${base}/documents/${m.ids.c2}/codes`)
      .send({ codeIds: [codeId('Hot')] });
    expect(same.body.added).toEqual([]);
    const rows = await codingRows(after);
    expect(rows).toHaveLength(2); // the unchanged third call writes nothing
    expect(JSON.parse(rows[0].detail)).toMatchObject({
      added: [codeId('Responsive'), codeId('Hot')],
      removed: [],
    });
    expect(JSON.parse(rows[1].detail)).toMatchObject({
      added: [],
      removed: [codeId('Responsive')],
      removedNames: ['Responsive'],
    });
    expect(
      rows.every(
        (r) => r.actor_id === people.reviewer.id && r.target_id === String(m.ids.c2) && r.at,
      ),
    ).toBe(true);
    await agents.reviewer.put(`${base}/documents/${m.ids.c2}/codes`).send({ codeIds: [] });
  });

  test('bulk coding writes exactly one audit row per document changed', async () => {
    const hot = codeId('Hot');
    await agents.reviewer.put(`${base}/documents/${m.ids.c1}/codes`).send({ codeIds: [hot] });
    const after = await lastAuditId();
    const docs = [m.ids.c1, m.ids.c3, m.ids.c4, m.ids.c5];
    const res = await agents.reviewer
      .post(`${base}/codes/bulk`)
      .send({ documentIds: docs, add: [hot, codeId('Responsive')] });
    expect(res.status).toBe(200);
    // Responsiveness follows exact duplicates by default: c1's copy gets Responsive too.
    expect(res.body.changed).toBe(5);
    const rows = await codingRows(after);
    expect(rows.map((r) => Number(r.target_id)).sort()).toEqual([...docs, m.duplicateOfC1].sort());
    expect(
      JSON.parse(rows.find((r) => r.target_id === String(m.duplicateOfC1))!.detail),
    ).toMatchObject({
      added: [codeId('Responsive')],
      source: 'duplicate',
      fromDocumentId: m.ids.c1,
    });
    // c1 already had Hot: its row adds only Responsive.
    const c1Row = rows.find((r) => r.target_id === String(m.ids.c1))!;
    expect(JSON.parse(c1Row.detail).added).toEqual([codeId('Responsive')]);
    const stored = await t.ctx.db
      .selectFrom('document_codes')
      .select(['document_id', 'code_id'])
      .where('document_id', 'in', docs)
      .execute();
    expect(stored).toHaveLength(8);

    const after2 = await lastAuditId();
    const removal = await agents.reviewer
      .post(`${base}/codes/bulk`)
      .send({ documentIds: [...docs, m.ids.m1], remove: [hot, codeId('Responsive')] });
    expect(removal.body).toMatchObject({ changed: 5, unchanged: 1 });
    expect(await codingRows(after2)).toHaveLength(5);
    expect(
      await t.ctx.db
        .selectFrom('document_codes')
        .select('document_id')
        .where('document_id', 'in', docs)
        .execute(),
    ).toHaveLength(0);
  });

  test('bulk coding refuses documents or codes of another matter, changing nothing', async () => {
    const other = await buildMemoMatter(t);
    const after = await lastAuditId();
    const foreignDoc = await agents.lead
      .post(`${base}/codes/bulk`)
      .send({ documentIds: [m.ids.c1, other.ids.c1], add: [codeId('Hot')] });
    expect(foreignDoc.status).toBe(400);
    expect(foreignDoc.body.error.field).toBe('documentIds');
    const otherCodes = (
      await (await t.agentFor(other.matter.lead)).get(`/api/matters/${other.matter.id}/codes`)
    ).body.codes;
    const foreignCode = await agents.lead
      .post(`${base}/codes/bulk`)
      .send({ documentIds: [m.ids.c1], add: [otherCodes[0].id] });
    expect(foreignCode.status).toBe(400);
    expect(foreignCode.body.error.field).toBe('add');
    expect(await codingRows(after)).toHaveLength(0);
  });

  test('a refused coding: non-members and firm admins get 404; a role without documents.code is refused', async () => {
    const outsider = await t.agentFor(await t.buildUser());
    const admin = await t.agentFor(await t.buildUser({ isAdmin: true }));
    const body = { documentIds: [m.ids.c1], add: [codeId('Hot')] };
    for (const agent of [outsider, admin]) {
      expect((await agent.post(`${base}/codes/bulk`).send(body)).status).toBe(404);
      expect(
        (await agent.put(`${base}/documents/${m.ids.c1}/codes`).send({ codeIds: [] })).status,
      ).toBe(404);
    }
    // Every matter role holds documents.code today (shared/roles.ts), so no real role can be
    // refused over HTTP; the policy decision is checked with a role outside the table, and a
    // route whose permission a real role lacks (codes.manage) shows the same refusal over HTTP.
    const principal = {
      kind: 'user' as const,
      user: { id: 'x', email: 'x', name: 'x', isAdmin: false },
      matterRole: 'observer' as MatterRole,
    };
    expect(decide({ matter: 'documents.code' }, principal)).toBe('forbidden');
    const res = await agents.reviewer.post(`${base}/codes`).send({ name: 'Reviewer code' });
    expect(res.status).toBe(403);
    expect(res.body.error.message).toMatch(/codes\.manage/);
    expect(
      await t.ctx.db
        .selectFrom('document_codes')
        .select('code_id')
        .where('document_id', '=', m.ids.c1)
        .execute(),
    ).toHaveLength(0);
  });
});

describe('viewer, notes and privilege entry', () => {
  test('review data highlights query and concept terms, and is audited', async () => {
    const res = await agents.reviewer
      .get(`${base}/documents/${m.ids.c3}/review`)
      .query({ q: 'human computer interaction' });
    expect(res.status).toBe(200);
    const body = res.body.text.body as string;
    expect(body).toBe('The EPS user interface management system');
    const marked = res.body.highlights.map((h: { start: number; end: number; mark: string }) => [
      body.slice(h.start, h.end),
      h.mark,
    ]);
    // No query word is in c3: every highlight is a concept-related term of the query.
    expect(marked.length).toBeGreaterThan(0);
    expect(marked.every(([, mark]: [string, string]) => mark === 'concept')).toBe(true);
    const keyword = await agents.reviewer
      .get(`${base}/documents/${m.ids.c1}/review`)
      .query({ q: 'human computer', mode: 'keyword' });
    const text1 = keyword.body.text.body as string;
    expect(
      keyword.body.highlights.map((h: { start: number; end: number }) =>
        text1.slice(h.start, h.end),
      ),
    ).toEqual(['Human', 'computer']);
    const viewed = await t.ctx.db
      .selectFrom('audit_events')
      .selectAll()
      .where('action', '=', 'document.viewed')
      .where('target_id', '=', String(m.ids.c3))
      .execute();
    expect(viewed).toHaveLength(1);
    expect(viewed[0].actor_id).toBe(people.reviewer.id);
    const dup = await agents.reviewer.get(`${base}/documents/${m.duplicateOfC1}/review`);
    expect(dup.body.document.duplicateOf).toBe(m.ids.c1);
    expect(dup.body.text.body).toBe(text1);
  });

  test('notes are added and listed with their author', async () => {
    const created = await agents.reviewer
      .post(`${base}/documents/${m.ids.c4}/notes`)
      .send({ body: '  Check the EPS test dates.  ' });
    expect(created.status).toBe(201);
    expect(created.body.note.body).toBe('Check the EPS test dates.');
    const empty = await agents.reviewer
      .post(`${base}/documents/${m.ids.c4}/notes`)
      .send({ body: '   ' });
    expect(empty.status).toBe(400);
    const list = await agents.attorney.get(`${base}/documents/${m.ids.c4}/notes`);
    expect(list.body.notes).toHaveLength(1);
    expect(list.body.notes[0].author.id).toBe(people.reviewer.id);
    const review = await agents.attorney.get(`${base}/documents/${m.ids.c4}/review`);
    expect(review.body.notes).toHaveLength(1);
  });

  test('privilege entry is stored, replaced and audited', async () => {
    const put = await agents.reviewer
      .put(`${base}/documents/${m.ids.c5}/privilege`)
      .send({ basis: 'Attorney-client', description: 'Advice on response-time claims' });
    expect(put.status).toBe(200);
    await agents.reviewer
      .put(`${base}/documents/${m.ids.c5}/privilege`)
      .send({ basis: 'Work product', description: 'Draft prepared for counsel' });
    const review = await agents.lead.get(`${base}/documents/${m.ids.c5}/review`);
    expect(review.body.privilege).toMatchObject({
      basis: 'Work product',
      description: 'Draft prepared for counsel',
    });
    const rows = await t.ctx.db
      .selectFrom('audit_events')
      .select('detail')
      .where('action', '=', 'privilege.updated')
      .where('target_id', '=', String(m.ids.c5))
      .orderBy('id')
      .execute();
    expect(rows).toHaveLength(2);
    expect(JSON.parse(rows[1].detail).before).toEqual({
      basis: 'Attorney-client',
      description: 'Advice on response-time claims',
    });
  });
});

describe('saved searches', () => {
  test('saved by searches.save, listed and re-run by anyone on the matter, deleted by author or lead', async () => {
    const body = {
      name: 'Interface memos',
      query: 'user interface',
      mode: 'concept',
      filters: { docTypes: ['pdf'] },
    };
    expect((await agents.reviewer.post(`${base}/saved-searches`).send(body)).status).toBe(403);
    const saved = await agents.attorney.post(`${base}/saved-searches`).send(body);
    expect(saved.status).toBe(201);
    expect((await agents.attorney.post(`${base}/saved-searches`).send(body)).status).toBe(409);
    const list = await agents.reviewer.get(`${base}/saved-searches`);
    expect(list.body.savedSearches).toHaveLength(1);
    const s = list.body.savedSearches[0];
    expect(s).toMatchObject({
      name: body.name,
      query: body.query,
      mode: 'concept',
      filters: body.filters,
    });
    const rerun = await agents.reviewer
      .post(`${base}/search`)
      .send({ query: s.query, mode: s.mode, filters: s.filters, savedSearchId: s.id });
    expect(rerun.status).toBe(200);
    expect(rerun.body.hits.every((h: { docType: string }) => h.docType === 'pdf')).toBe(true);
    const audit = await t.ctx.db
      .selectFrom('audit_events')
      .select('detail')
      .where('action', '=', 'search.run')
      .where('actor_id', '=', people.reviewer.id)
      .orderBy('id', 'desc')
      .executeTakeFirstOrThrow();
    expect(JSON.parse(audit.detail).savedSearchId).toBe(s.id);
    const other = await t.buildUser();
    await t.addMember(m.matter, other, 'attorney');
    expect((await (await t.agentFor(other)).delete(`${base}/saved-searches/${s.id}`)).status).toBe(
      403,
    );
    expect((await agents.lead.delete(`${base}/saved-searches/${s.id}`)).status).toBe(204);
    expect((await agents.reviewer.get(`${base}/saved-searches`)).body.savedSearches).toHaveLength(
      0,
    );
  });
});
