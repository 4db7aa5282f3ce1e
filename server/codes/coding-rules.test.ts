// Coding layouts enforced by the API: single-choice groups, the privilege group's type and
// basis, required groups when moving on, and family / duplicate propagation checked
// against the database. The refusal messages are the product's own wording.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { createTestApp, type Agent, type TestApp } from '../../tests/helpers';
import { buildMemoMatter, type MemoMatter } from '../search/test-fixture';

let t: TestApp;
let m: MemoMatter;
let base: string;
let lead: Agent;
let codes: { id: number; name: string; groupId: number }[];
let groups: { id: number; name: string; kind: string }[];
const codeId = (name: string) => codes.find((c) => c.name === name)!.id;
const groupId = (name: string) => groups.find((g) => g.name === name)!.id;

beforeAll(async () => {
  t = await createTestApp();
  m = await buildMemoMatter(t, { withoutIndex: true });
  base = `/api/matters/${m.matter.id}`;
  lead = await t.agentFor(m.matter.lead);
  for (const child of [m.ids.c2, m.ids.c3])
    await t.ctx.db
      .updateTable('documents')
      .set({ parent_id: m.ids.c1, family_id: m.ids.c1 })
      .where('id', '=', child)
      .execute();
  const body = (await lead.get(`${base}/codes`)).body;
  codes = body.codes;
  groups = body.groups;
});
afterAll(() => t?.close());

const codesOn = async (docId: number) =>
  (
    await t.ctx.db
      .selectFrom('document_codes')
      .select('code_id')
      .where('document_id', '=', docId)
      .orderBy('code_id')
      .execute()
  ).map((r) => r.code_id);

const docsWith = async (code: number) =>
  (
    await t.ctx.db
      .selectFrom('document_codes')
      .select('document_id')
      .where('code_id', '=', code)
      .orderBy('document_id')
      .execute()
  ).map((r) => r.document_id);

const put = (docId: number, body: object) =>
  lead.put(`${base}/documents/${docId}/codes`).send(body);
const clear = async () => {
  await t.ctx.db.deleteFrom('document_codes').execute();
};

describe('the default layout', () => {
  test('groups in order, responsiveness single-choice and required', () => {
    expect(groups.map((g) => [g.name, g.kind])).toEqual([
      ['Responsiveness', 'single'],
      ['Privilege', 'privilege'],
      ['Flags', 'multi'],
      ['Issues', 'multi'],
    ]);
    expect(codes.filter((c) => c.groupId === groupId('Responsiveness')).map((c) => c.name)).toEqual(
      ['Responsive', 'Not responsive'],
    );
  });
});

describe('single-choice groups', () => {
  test('two new choices in one group are refused, naming the group', async () => {
    const res = await put(m.ids.m3, { codeIds: [codeId('Responsive'), codeId('Not responsive')] });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe(
      'codeIds: "Responsiveness" takes one code; choose one of Responsive, Not responsive',
    );
    expect(await codesOn(m.ids.m3)).toEqual([]);
  });

  test('a second choice replaces the first, audited as a change', async () => {
    await put(m.ids.m3, { codeIds: [codeId('Responsive'), codeId('Hot')] });
    const res = await put(m.ids.m3, {
      codeIds: [codeId('Responsive'), codeId('Hot'), codeId('Not responsive')],
    });
    expect(res.status).toBe(200);
    expect(res.body.replaced).toEqual([
      {
        groupId: groupId('Responsiveness'),
        from: codeId('Responsive'),
        to: codeId('Not responsive'),
      },
    ]);
    expect(await codesOn(m.ids.m3)).toEqual(
      [codeId('Not responsive'), codeId('Hot')].sort((a, b) => a - b),
    );
    const audit = await t.ctx.db
      .selectFrom('audit_events')
      .select('detail')
      .where('action', '=', 'coding.changed')
      .where('target_id', '=', String(m.ids.m3))
      .orderBy('id', 'desc')
      .executeTakeFirstOrThrow();
    expect(JSON.parse(audit.detail)).toMatchObject({
      added: [codeId('Not responsive')],
      removed: [codeId('Responsive')],
      replaced: [{ fromName: 'Responsive', toName: 'Not responsive' }],
    });
  });

  test('bulk: two codes of one group refused; one replaces the group code each document has', async () => {
    const both = await lead
      .post(`${base}/codes/bulk`)
      .send({ documentIds: [m.ids.m3], add: [codeId('Responsive'), codeId('Not responsive')] });
    expect(both.status).toBe(400);
    expect(both.body.error.message).toBe(
      'add: "Responsiveness" takes one code; add only one of its codes',
    );
    const res = await lead
      .post(`${base}/codes/bulk`)
      .send({ documentIds: [m.ids.m3, m.ids.m4], add: [codeId('Responsive')] });
    expect(res.status).toBe(200);
    expect(await codesOn(m.ids.m3)).toEqual(
      [codeId('Responsive'), codeId('Hot')].sort((a, b) => a - b),
    );
    expect(await codesOn(m.ids.m4)).toEqual([codeId('Responsive')]);
    await clear();
  });
});

describe('the privilege group and required groups', () => {
  test('Privileged needs a privilege type and a basis; each refusal names the field', async () => {
    const privileged = codeId('Privileged');
    const noType = await put(m.ids.m1, { codeIds: [privileged] });
    expect(noType.status).toBe(400);
    expect(noType.body.error).toMatchObject({
      field: 'privilege.type',
      message: 'privilege.type: is required when "Privileged" is chosen',
    });
    const noBasis = await put(m.ids.m1, {
      codeIds: [privileged],
      privilege: { type: 'Work product' },
    });
    expect(noBasis.body.error.message).toBe(
      'privilege.basis: is required when "Privileged" is chosen',
    );
    expect(await codesOn(m.ids.m1)).toEqual([]);
    const ok = await put(m.ids.m1, {
      codeIds: [privileged],
      privilege: { type: 'Work product', basis: 'Prepared for counsel in this dispute' },
    });
    expect(ok.status).toBe(200);
    const entry = await t.ctx.db
      .selectFrom('privilege_entries')
      .selectAll()
      .where('document_id', '=', m.ids.m1)
      .executeTakeFirstOrThrow();
    expect(entry).toMatchObject({
      privilege_type: 'Work product',
      basis: 'Prepared for counsel in this dispute',
      treatment: 'withheld',
    });
    // Privileged and Not privileged are one single-choice group.
    const swap = await put(m.ids.m1, { codeIds: [privileged, codeId('Not privileged')] });
    expect(swap.body.replaced).toHaveLength(1);
    await clear();
  });

  test('moving on (complete: true) without a required group is refused, naming the group', async () => {
    const res = await put(m.ids.m2, { codeIds: [codeId('Hot')], complete: true });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe(
      'codeIds: "Responsiveness" is required: choose Responsive or Not responsive',
    );
    expect(await codesOn(m.ids.m2)).toEqual([]);
    expect(
      (await put(m.ids.m2, { codeIds: [codeId('Hot'), codeId('Responsive')], complete: true }))
        .status,
    ).toBe(200);
    await clear();
  });
});

describe('families and duplicates', () => {
  test('exactly the family and the duplicates get the code, per group setting', async () => {
    // Responsiveness follows duplicates by default; the lead makes it follow families too.
    const patched = await lead
      .patch(`${base}/code-groups/${groupId('Responsiveness')}`)
      .send({ followFamily: true });
    expect(patched.body.group).toMatchObject({ followFamily: true, followDuplicates: true });
    const res = await put(m.ids.c1, { codeIds: [codeId('Responsive')] });
    expect(res.body.propagated.map((p: { documentId: number }) => p.documentId).sort()).toEqual(
      [m.ids.c2, m.ids.c3, m.duplicateOfC1].sort(),
    );
    expect(await docsWith(codeId('Responsive'))).toEqual(
      [m.ids.c1, m.ids.c2, m.ids.c3, m.duplicateOfC1].sort((a, b) => a - b),
    );
    // A second choice on an attachment replaces the family's code (one hop: the family).
    await put(m.ids.c2, { codeIds: [codeId('Not responsive')] });
    expect(await docsWith(codeId('Not responsive'))).toEqual(
      [m.ids.c1, m.ids.c2, m.ids.c3].sort((a, b) => a - b),
    );
    expect(await docsWith(codeId('Responsive'))).toEqual([m.duplicateOfC1]);
    // Flags follow neither: Hot stays on c1 alone.
    await put(m.ids.c1, { codeIds: [codeId('Not responsive'), codeId('Hot')] });
    expect(await docsWith(codeId('Hot'))).toEqual([m.ids.c1]);
    await clear();
  });

  test('bulk coding "with families" widens to whole families', async () => {
    const res = await lead
      .post(`${base}/codes/bulk`)
      .send({ documentIds: [m.ids.c3, m.ids.m4], add: [codeId('Hot')], withFamilies: true });
    expect(res.status).toBe(200);
    expect(await docsWith(codeId('Hot'))).toEqual(
      [m.ids.c1, m.ids.c2, m.ids.c3, m.ids.m4].sort((a, b) => a - b),
    );
    await clear();
  });
});
