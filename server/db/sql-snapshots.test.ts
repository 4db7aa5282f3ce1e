// The SQL the main Kysely queries compile to (search filters, listings, coding), kept
// as Vitest snapshots (__snapshots__/sql-snapshots.test.ts.snap) so that a change in a
// query shows up in review as a diff of the SQL, not only as a changed result. The SQL
// is recorded where it reaches SQLite (better-sqlite3's prepare), running each query
// function for real against a migrated test database. After an intended change, run
// `npx vitest run server/db/sql-snapshots.test.ts -u` and review the .snap diff.
import type SQLite from 'better-sqlite3';
import { Kysely, SqliteDialect } from 'kysely';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { createTestApp, type TestApp } from '../../tests/helpers';
import {
  addDocumentCodes,
  listAppliedCodes,
  listCodesWithCounts,
  removeDocumentCodes,
} from '../codes/queries';
import { countDocumentsFiltered, listDocumentsPage } from '../documents/queries';
import { documentsByIds, duplicatesOf, filteredDocumentIds, sortedPage } from '../search/queries';
import { buildMemoMatter, type MemoMatter } from '../search/test-fixture';
import type { Database } from './schema';

let t: TestApp;
let m: MemoMatter;
let recorded: string[] = [];
let sqlite: SQLite.Database;
let db: Kysely<Database>;

beforeAll(async () => {
  t = await createTestApp();
  m = await buildMemoMatter(t);
  const real = t.ctx.sqlite;
  sqlite = new Proxy(real, {
    get(target, key) {
      if (key === 'prepare')
        return (text: string) => {
          recorded.push(text.replace(/\s+/g, ' ').trim());
          return target.prepare(text);
        };
      const value = Reflect.get(target, key, target);
      return typeof value === 'function' ? value.bind(target) : value;
    },
  });
  db = new Kysely<Database>({ dialect: new SqliteDialect({ database: sqlite }) });
});
afterAll(() => t?.close());

/** The distinct statements `run` sends to SQLite, in order. */
async function sqlOf(run: () => unknown): Promise<string[]> {
  recorded = [];
  await run();
  return [...new Set(recorded)];
}

const EVERY_FILTER = {
  custodianIds: [1, 2],
  dateFrom: '2021-01-01',
  dateTo: '2021-12-31',
  docTypes: ['email', 'pdf'],
  codeIds: [1],
  uncodedOnly: false,
  groupId: 1,
};

describe('search', () => {
  test('filter candidates, no filters', async () => {
    expect(await sqlOf(() => filteredDocumentIds(db, sqlite, m.matter.id, {}))).toMatchSnapshot();
  });
  test('filter candidates, every filter', async () => {
    expect(
      await sqlOf(() => filteredDocumentIds(db, sqlite, m.matter.id, EVERY_FILTER)),
    ).toMatchSnapshot();
  });
  test('uncoded only', async () => {
    expect(
      await sqlOf(() => filteredDocumentIds(db, sqlite, m.matter.id, { uncodedOnly: true })),
    ).toMatchSnapshot();
  });
  test('duplicates of first copies', async () => {
    expect(await sqlOf(() => duplicatesOf(db, m.matter.id, [m.ids.c1], {}))).toMatchSnapshot();
  });
  test('a page sorted by custodian, and by date', async () => {
    const ids = Object.values(m.ids);
    expect(
      await sqlOf(async () => {
        await sortedPage(db, ids, { field: 'custodian', direction: 'asc' }, 10, 0);
        await sortedPage(db, ids, { field: 'date', direction: 'desc' }, 10, 0);
      }),
    ).toMatchSnapshot();
  });
  test('listing fields of a page', async () => {
    expect(
      await sqlOf(() => documentsByIds(db, m.matter.id, [m.ids.c1, m.ids.m1])),
    ).toMatchSnapshot();
  });
});

describe('listings', () => {
  test('the documents page and its count, filtered', async () => {
    const filter = { status: 'extracted' as const, custodian: 1, batch: 1 };
    expect(
      await sqlOf(async () => {
        await listDocumentsPage(db, m.matter.id, 1, filter, { limit: 50, offset: 0 });
        await countDocumentsFiltered(db, m.matter.id, filter);
      }),
    ).toMatchSnapshot();
  });
  test('the code set with counts', async () => {
    expect(await sqlOf(() => listCodesWithCounts(db, m.matter.id))).toMatchSnapshot();
  });
});

describe('coding', () => {
  test('apply, read and remove codes', async () => {
    const [code] = await listCodesWithCounts(db, m.matter.id);
    const rows = [{ documentId: m.ids.c1, codeId: code.id }];
    expect(
      await sqlOf(async () => {
        await addDocumentCodes(db, rows, m.matter.lead.id, new Date().toISOString());
        await listAppliedCodes(db, [m.ids.c1]);
        await removeDocumentCodes(db, rows);
      }),
    ).toMatchSnapshot();
  });
});
