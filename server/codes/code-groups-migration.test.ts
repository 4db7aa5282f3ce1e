// Migration 2026_12_04_1401: an existing matter's flat code set is sorted into groups,
// codes and coding kept, a Not privileged code added; run on a database made before it.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Migrator } from 'kysely';
import { afterAll, expect, test } from 'vitest';
import { migrations } from '../../migrations';
import { migrateToLatest, openDatabase } from '../db/database';

const dir = mkdtempSync(join(tmpdir(), 'quarry-groups-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

test('flat codes become Responsiveness, Privilege and Flags, coding untouched', async () => {
  const { db, sqlite } = openDatabase(join(dir, 'q.db'));
  try {
    const migrator = new Migrator({
      db,
      provider: { getMigrations: async () => migrations },
    });
    const before = await migrator.migrateTo('2026_12_04_1400_review_batches');
    expect(before.error).toBeUndefined();
    const now = new Date().toISOString();
    sqlite
      .prepare(
        `INSERT INTO users (id, email, name, password_hash, is_admin, password_changed_at, created_at)
         VALUES ('u1', 'a@example.com', 'A', 'x', 0, ?, ?)`,
      )
      .run(now, now);
    sqlite
      .prepare(`INSERT INTO matters (name, control_prefix, created_at) VALUES ('M', 'MM', ?)`)
      .run(now);
    const names = [
      ['Responsive', '1', 0],
      ['Not responsive', '2', 0],
      ['Privileged', '3', 1],
      ['Hot', '4', 0],
      ['Key witness', 'k', 0],
    ] as const;
    for (const [i, [name, key, priv]] of names.entries())
      sqlite
        .prepare(
          `INSERT INTO codes (matter_id, name, shortcut, sort_order, marks_privileged, created_at)
           VALUES (1, ?, ?, ?, ?, ?)`,
        )
        .run(name, key, (i + 1) * 10, priv, now);
    sqlite
      .prepare(
        `INSERT INTO documents (matter_id, control_number, original_name, sha256, size, created_at)
         VALUES (1, 'MM-000001', 'a.txt', 'x', 1, ?)`,
      )
      .run(now);
    sqlite
      .prepare(`INSERT INTO document_codes VALUES (1, 3, 'u1', ?), (1, 5, 'u1', ?)`)
      .run(now, now);

    await migrateToLatest(db);
    const groups = await db.selectFrom('code_groups').selectAll().orderBy('sort_order').execute();
    expect(groups.map((g) => [g.name, g.kind, g.required])).toEqual([
      ['Responsiveness', 'single', 1],
      ['Privilege', 'privilege', 0],
      ['Flags', 'multi', 0],
    ]);
    const codes = await db.selectFrom('codes').selectAll().orderBy('sort_order').execute();
    const groupName = (id: number | null) => groups.find((g) => g.id === id)?.name;
    expect(codes.map((c) => [c.name, groupName(c.group_id), c.shortcut, c.colour])).toEqual([
      ['Responsive', 'Responsiveness', '1', 'green'],
      ['Not responsive', 'Responsiveness', '2', 'slate'],
      ['Privileged', 'Privilege', '3', 'violet'],
      ['Hot', 'Flags', '4', 'red'],
      ['Key witness', 'Flags', 'k', 'slate'],
      ['Not privileged', 'Privilege', '6', 'teal'],
    ]);
    const coding = await db.selectFrom('document_codes').select('code_id').execute();
    expect(coding.map((r) => r.code_id).sort()).toEqual([3, 5]);
  } finally {
    await db.destroy();
  }
});
