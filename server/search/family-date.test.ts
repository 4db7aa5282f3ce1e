// The family date (the top-level item's date, migration 2026_12_04_0200) as a filter basis
// and a sort, so an attachment stays with its e-mail.
import { afterAll, beforeAll, expect, test } from 'vitest';
import { createTestApp, type TestApp } from '../../tests/helpers';
import { filteredDocumentIds, sortedPage } from './queries';
import { buildMemoMatter, type MemoMatter } from './test-fixture';

let t: TestApp;
let m: MemoMatter;
beforeAll(async () => {
  t = await createTestApp();
  m = await buildMemoMatter(t, { withoutIndex: true });
  // m4 (undated) becomes an attachment of c1; its family date is c1's.
  const c1 = await t.ctx.db
    .selectFrom('documents')
    .select('sent_at')
    .where('id', '=', m.ids.c1)
    .executeTakeFirstOrThrow();
  await t.ctx.db
    .updateTable('documents')
    .set({ parent_id: m.ids.c1, family_id: m.ids.c1, family_date: c1.sent_at })
    .where('id', '=', m.ids.m4)
    .execute();
});
afterAll(() => t?.close());

test('dateBasis family lets an undated attachment pass its e-mail date filter', async () => {
  const c1 = await t.ctx.db
    .selectFrom('documents')
    .select('sent_at')
    .where('id', '=', m.ids.c1)
    .executeTakeFirstOrThrow();
  const day = c1.sent_at!.slice(0, 10);
  const own = filteredDocumentIds(t.ctx.db, t.ctx.sqlite, m.matter.id, {
    dateFrom: day,
    dateTo: day,
  });
  expect(own).toContain(m.ids.c1);
  expect(own).not.toContain(m.ids.m4);
  const family = filteredDocumentIds(t.ctx.db, t.ctx.sqlite, m.matter.id, {
    dateFrom: day,
    dateTo: day,
    dateBasis: 'family',
  });
  expect(family).toEqual(expect.arrayContaining([m.ids.c1, m.ids.m4]));
});

test('sorting by family date puts the attachment beside its e-mail', async () => {
  const ids = Object.values(m.ids);
  const order = await sortedPage(
    t.ctx.db,
    ids,
    { field: 'familyDate', direction: 'asc' },
    ids.length,
    0,
  );
  const at = order.indexOf(m.ids.c1);
  const dates = await t.ctx.db
    .selectFrom('documents')
    .select(['id', 'family_date'])
    .where('id', 'in', ids)
    .execute();
  const dateOf = new Map(dates.map((d) => [d.id, d.family_date]));
  // Only documents of the same family date may sit between them.
  const between = order.slice(
    Math.min(at, order.indexOf(m.ids.m4)),
    Math.max(at, order.indexOf(m.ids.m4)) + 1,
  );
  expect(new Set(between.map((id) => dateOf.get(id))).size).toBe(1);
  // The undated attachment no longer sorts last.
  expect(order[order.length - 1]).not.toBe(m.ids.m4);
});
