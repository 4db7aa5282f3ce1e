// The demo seed (the product's "Accounts and access"): the six demo accounts with the
// password quarry-demo, each role on the demo matter, the admin and the outsider on none.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { createTestApp, type TestApp } from '../../tests/helpers';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, postSeedSteps, seedDemo, type SeededDemo } from './index';

let t: TestApp;
let seeded: SeededDemo | null;
beforeAll(async () => {
  t = await createTestApp();
  seeded = await seedDemo(t.ctx);
});
afterAll(() => t.close());

describe('seedDemo', () => {
  test('creates the demo accounts and the demo matter with one member per role', async () => {
    expect(seeded).not.toBeNull();
    const emails = DEMO_ACCOUNTS.map((a) => a.email);
    expect(emails).toEqual([
      'admin@quarry.example',
      'lead@quarry.example',
      'attorney@quarry.example',
      'paralegal@quarry.example',
      'reviewer@quarry.example',
      'outsider@quarry.example',
    ]);
    const members = await t.ctx.db
      .selectFrom('matter_members as mm')
      .innerJoin('users as u', 'u.id', 'mm.user_id')
      .select(['u.email', 'mm.role'])
      .where('mm.matter_id', '=', seeded!.matterId)
      .orderBy('u.email')
      .execute();
    expect(members).toEqual([
      { email: 'attorney@quarry.example', role: 'attorney' },
      { email: 'lead@quarry.example', role: 'lead' },
      { email: 'paralegal@quarry.example', role: 'paralegal' },
      { email: 'reviewer@quarry.example', role: 'reviewer' },
    ]);
    const admin = await t.ctx.db
      .selectFrom('users')
      .selectAll()
      .where('email', '=', 'admin@quarry.example')
      .executeTakeFirstOrThrow();
    expect(admin.is_admin).toBe(1);
  });

  test('every demo account signs in with quarry-demo; the lead sees the matter, the outsider none', async () => {
    const lead = await t.signIn(t.agent(), 'lead@quarry.example', DEMO_PASSWORD);
    const mine = await lead.get('/api/matters');
    expect(mine.body.matters).toHaveLength(1);
    expect(mine.body.matters[0]).toMatchObject({ role: 'lead', controlPrefix: 'BBHM' });
    const outsider = await t.signIn(t.agent(), 'outsider@quarry.example', DEMO_PASSWORD);
    expect((await outsider.get('/api/matters')).body.matters).toEqual([]);
    expect((await outsider.get(`/api/matters/${seeded!.matterId}`)).status).toBe(404);
  });

  test('does nothing when the database already has users', async () => {
    expect(await seedDemo(t.ctx)).toBeNull();
    const count = await t.ctx.db
      .selectFrom('users')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .executeTakeFirstOrThrow();
    expect(Number(count.n)).toBe(DEMO_ACCOUNTS.length);
  });

  test('runs the post-seed steps (the demo-corpus hook) after the matter exists', async () => {
    const other = await createTestApp();
    const seen: number[] = [];
    postSeedSteps.push({ name: 'test step', run: async (_ctx, s) => void seen.push(s.matterId) });
    try {
      const result = await seedDemo(other.ctx);
      expect(seen).toEqual([result!.matterId]);
    } finally {
      postSeedSteps.pop();
      await other.close();
    }
  });
});
