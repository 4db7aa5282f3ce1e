// The demo mailbox holds every invitation and account set-up link: whoever reads a link
// can choose the new account's password. The review (issue "Hardening", point 1) took
// over a new firm-admin account by reading it signed out; these checks replay that path.
// Sources: OWASP ASVS 4.0.3 V2.5.4 (no shared or default secrets reachable by others) and
// V14.3.2 (debug features off in production); RFC 9110 sections 15.5.2 and 15.5.4 (401, 403).
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { createTestApp, type Agent, type TestApp, type TestUser } from '../../tests/helpers';

describe('demo mailbox in demo mode (the default)', () => {
  let t: TestApp;
  let admin: TestUser;
  let adminAgent: Agent;
  beforeAll(async () => {
    t = await createTestApp();
    admin = await t.buildUser({ isAdmin: true });
    adminAgent = await t.agentFor(admin);
  });
  afterAll(() => t.close());

  test('the account takeover from the review fails: a signed-out visitor cannot read the set-up link', async () => {
    const email = 'new.admin@example.com';
    const created = await adminAgent
      .post('/api/admin/users')
      .send({ name: 'New Admin', email, isAdmin: true });
    expect(created.status).toBe(201);
    expect(created.body.setupLinkSent).toBe(true);
    await t.mail.waitFor((m) => m.to.includes(email));

    const signedOut = await t.agent().get('/api/dev/mail');
    expect(signedOut.status).toBe(401);
    expect(signedOut.body.error.code).toBe('unauthenticated');
    expect(JSON.stringify(signedOut.body)).not.toContain('/account-setup/');

    const member = await t.agentFor(await t.buildUser());
    const notAdmin = await member.get('/api/dev/mail');
    expect(notAdmin.status).toBe(403);
    expect(JSON.stringify(notAdmin.body)).not.toContain('/account-setup/');

    const byAdmin = await adminAgent.get('/api/dev/mail');
    expect(byAdmin.status).toBe(200);
    const message = byAdmin.body.messages.find((m: { to: string[] }) => m.to.includes(email));
    expect(message.links.some((l: string) => l.includes('/account-setup/'))).toBe(true);
  });

  test('GET /api/instance tells the client it runs in demo mode with an admins-only mailbox', async () => {
    const response = await t.agent().get('/api/instance');
    expect(response.status).toBe(200);
    expect(response.body).toEqual({ demoMode: true, devMailbox: 'firm-admins' });
  });
});

describe('demo mailbox outside demo mode', () => {
  test('development (QUARRY_DEV=1, `npm run dev`) opens it to anyone; production has none', async () => {
    const dev = await createTestApp({ env: { QUARRY_DEMO: '0', QUARRY_DEV: '1' } });
    try {
      expect((await dev.agent().get('/api/dev/mail')).status).toBe(200);
      expect((await dev.agent().get('/api/instance')).body.devMailbox).toBe('anyone');
    } finally {
      await dev.close();
    }
    const production = await createTestApp({ env: { QUARRY_DEMO: '0' } });
    try {
      const admin = await production.agentFor(await production.buildUser({ isAdmin: true }));
      const response = await admin.get('/api/dev/mail');
      expect(response.status).toBe(404);
      expect(response.body.error.code).toBe('not_found');
      expect((await production.agent().get('/api/dev/mail')).status).toBe(401);
      expect((await production.agent().get('/api/instance')).body).toEqual({
        demoMode: false,
        devMailbox: 'off',
      });
    } finally {
      await production.close();
    }
  });
});
