// Firm administration over HTTP: accounts, matters and leads. A firm admin is not a
// member of any matter and sees none of its contents (blueprint roles table).
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { createTestApp, type Agent, type TestApp, type TestUser } from '../../tests/helpers';

let t: TestApp;
let admin: TestUser;
let adminAgent: Agent;

beforeAll(async () => {
  t = await createTestApp();
  admin = await t.buildUser({ isAdmin: true });
  adminAgent = await t.agentFor(admin);
});
afterAll(() => t.close());

describe('firm admin', () => {
  test('creates an account with a temporary password that then signs in', async () => {
    const created = await adminAgent.post('/api/admin/users').send({
      name: 'Tess Temp',
      email: 'Tess@Example.com',
      temporaryPassword: 'temporary password 1',
    });
    expect(created.status).toBe(201);
    expect(created.body.user).toMatchObject({
      email: 'tess@example.com',
      name: 'Tess Temp',
      isAdmin: false,
      matterCount: 0,
    });
    await t.signIn(t.agent(), 'tess@example.com', 'temporary password 1');
    const duplicate = await adminAgent.post('/api/admin/users').send({
      name: 'Tess Again',
      email: 'tess@example.com',
      temporaryPassword: 'temporary password 2',
    });
    expect(duplicate.status).toBe(409);
    expect(duplicate.body.error.field).toBe('email');
    const weak = await adminAgent
      .post('/api/admin/users')
      .send({ name: 'W', email: 'w@example.com', temporaryPassword: 'short' });
    expect(weak.status).toBe(400);
    expect(weak.body.error.field).toBe('temporaryPassword');
    const list = await adminAgent.get('/api/admin/users');
    expect(list.body.users.map((u: { email: string }) => u.email)).toContain('tess@example.com');
    const audit = await t.ctx.db
      .selectFrom('audit_events')
      .selectAll()
      .where('action', '=', 'user.created')
      .execute();
    expect(audit).toHaveLength(1);
    expect(audit[0].actor_id).toBe(admin.id);
  });

  test('without a temporary password, e-mails a one-time set-up link; the holder chooses the password', async () => {
    const created = await adminAgent
      .post('/api/admin/users')
      .send({ name: 'Sam Setup', email: 'sam.setup@example.com' });
    expect(created.status).toBe(201);
    expect(created.body.setupLinkSent).toBe(true);
    const mail = await t.mail.waitFor((m) => m.to.includes('sam.setup@example.com'));
    expect(mail.subject).toBe('Your Quarry account');
    const link = mail.links.find((l) => l.includes('/account-setup/')) as string;
    expect(link).toMatch(new RegExp(`^${t.baseUrl}/account-setup/[A-Za-z0-9_-]{43}$`));
    const token = link.split('/account-setup/')[1];
    // Nobody can sign in before the password is chosen.
    const early = await t
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: 'sam.setup@example.com', password: token });
    expect(early.status).toBe(401);
    const preview = await t.agent().get(`/api/account-setup/${token}`);
    expect(preview.body).toMatchObject({ email: 'sam.setup@example.com', name: 'Sam Setup' });
    const weak = await t.agent().post(`/api/account-setup/${token}`).send({ password: 'short' });
    expect(weak.status).toBe(400);
    expect(weak.body.error.field).toBe('password');
    const browser = t.agent();
    const done = await browser
      .post(`/api/account-setup/${token}`)
      .send({ password: 'sam chooses this one' });
    expect(done.status).toBe(200);
    expect(done.body.user.email).toBe('sam.setup@example.com');
    expect((await browser.get('/api/auth/me')).status).toBe(200);
    const reused = await t
      .agent()
      .post(`/api/account-setup/${token}`)
      .send({ password: 'someone else tries' });
    expect(reused.status).toBe(409);
    expect(reused.body.error.code).toBe('invitation_used');
    await t.signIn(t.agent(), 'sam.setup@example.com', 'sam chooses this one');
    const unknown = await t.agent().get(`/api/account-setup/${'B'.repeat(43)}`);
    expect(unknown.status).toBe(404);
  });

  test('an expired set-up link is 410 invitation_expired', async () => {
    const shortLived = await createTestApp({ config: { invitationTtlDays: 0.05 / 86_400 } });
    try {
      const boss = await shortLived.agentFor(await shortLived.buildUser({ isAdmin: true }));
      await boss.post('/api/admin/users').send({ name: 'Late', email: 'late.setup@example.com' });
      const mail = await shortLived.mail.waitFor((m) => m.to.includes('late.setup@example.com'));
      const token = mail.links[0].split('/account-setup/')[1];
      await new Promise((resolve) => setTimeout(resolve, 100));
      const response = await shortLived
        .agent()
        .post(`/api/account-setup/${token}`)
        .send({ password: 'too late for this' });
      expect(response.status).toBe(410);
      expect(response.body.error.code).toBe('invitation_expired');
    } finally {
      await shortLived.close();
    }
  });

  test('disabling an account ends its sessions at once and refuses its sign-ins; re-enabling restores them', async () => {
    const person = await t.buildUser();
    const session = await t.agentFor(person);
    expect((await session.get('/api/auth/me')).status).toBe(200);
    const disabled = await adminAgent
      .patch(`/api/admin/users/${person.id}`)
      .send({ disabled: true });
    expect(disabled.status).toBe(200);
    expect(disabled.body.user.disabled).toBe(true);
    expect((await session.get('/api/auth/me')).status).toBe(401);
    const signIn = await t
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: person.email, password: person.password });
    expect(signIn.status).toBe(401);
    expect(signIn.body.error.code).toBe('invalid_credentials');
    await adminAgent.patch(`/api/admin/users/${person.id}`).send({ disabled: false });
    await t.signIn(t.agent(), person.email, person.password);
    const actions = await t.ctx.db
      .selectFrom('audit_events')
      .select('action')
      .where('target_id', '=', person.id)
      .orderBy('id')
      .execute();
    expect(actions.map((a) => a.action)).toEqual(['user.disabled', 'user.enabled']);
  });

  test("grants and removes firm-admin rights, never on one's own account; unknown accounts 404; empty changes 400", async () => {
    const person = await t.buildUser();
    const promoted = await adminAgent
      .patch(`/api/admin/users/${person.id}`)
      .send({ isAdmin: true });
    expect(promoted.body.user.isAdmin).toBe(true);
    expect((await (await t.agentFor(person)).get('/api/admin/users')).status).toBe(200);
    await adminAgent.patch(`/api/admin/users/${person.id}`).send({ isAdmin: false });
    expect((await (await t.agentFor(person)).get('/api/admin/users')).status).toBe(403);
    expect(
      (await adminAgent.patch(`/api/admin/users/${admin.id}`).send({ disabled: true })).status,
    ).toBe(409);
    expect(
      (await adminAgent.patch(`/api/admin/users/${admin.id}`).send({ isAdmin: false })).status,
    ).toBe(409);
    expect(
      (await adminAgent.patch('/api/admin/users/nobody').send({ disabled: true })).status,
    ).toBe(404);
    const empty = await adminAgent.patch(`/api/admin/users/${person.id}`).send({});
    expect(empty.status).toBe(400);
    expect(empty.body.error.message).toBe('body: give disabled or isAdmin');
  });

  test('creates a matter with a lead by e-mail, and the lead (not the admin) can open it', async () => {
    const lead = await t.buildUser({ email: 'matter.lead@example.com' });
    const created = await adminAgent.post('/api/matters').send({
      name: 'Pellham Shipping v. Ostrava Grain',
      controlPrefix: 'psog',
      lead: 'Matter.Lead@example.com',
    });
    expect(created.status).toBe(201);
    expect(created.body.matter).toMatchObject({
      name: 'Pellham Shipping v. Ostrava Grain',
      controlPrefix: 'PSOG',
      leads: [{ id: lead.id, email: lead.email }],
      memberCount: 1,
    });
    const id = created.body.matter.id;
    expect((await (await t.agentFor(lead)).get(`/api/matters/${id}`)).body.role).toBe('lead');
    expect((await adminAgent.get(`/api/matters/${id}`)).status).toBe(404);
    expect((await adminAgent.get('/api/matters')).body.matters).toEqual([]);
    const adminList = await adminAgent.get('/api/admin/matters');
    expect(adminList.body.matters.map((m: { id: number }) => m.id)).toContain(id);
  });

  test('refuses duplicate names and prefixes (409), unknown leads and bad prefixes (400)', async () => {
    const lead = await t.buildUser();
    await adminAgent
      .post('/api/matters')
      .send({ name: 'Unique Matter', controlPrefix: 'UNQ', lead: lead.id });
    const sameName = await adminAgent
      .post('/api/matters')
      .send({ name: 'unique matter', controlPrefix: 'UNQ2', lead: lead.id });
    expect(sameName.status).toBe(409);
    expect(sameName.body.error.field).toBe('name');
    const samePrefix = await adminAgent
      .post('/api/matters')
      .send({ name: 'Other', controlPrefix: 'UNQ', lead: lead.id });
    expect(samePrefix.status).toBe(409);
    expect(samePrefix.body.error.field).toBe('controlPrefix');
    const noLead = await adminAgent
      .post('/api/matters')
      .send({ name: 'No Lead', controlPrefix: 'NOL', lead: 'ghost@example.com' });
    expect(noLead.status).toBe(400);
    expect(noLead.body.error.field).toBe('lead');
    const badPrefix = await adminAgent
      .post('/api/matters')
      .send({ name: 'Bad', controlPrefix: '1-A', lead: lead.id });
    expect(badPrefix.status).toBe(400);
    expect(badPrefix.body.error.field).toBe('controlPrefix');
  });

  test('appoints a lead (adding or promoting a member); appointing an existing lead is 409', async () => {
    const matter = await t.buildMatter();
    const member = await t.buildUser();
    await t.addMember(matter, member, 'attorney');
    const promoted = await adminAgent
      .put(`/api/admin/matters/${matter.id}/lead`)
      .send({ lead: member.email });
    expect(promoted.status).toBe(200);
    expect(promoted.body.matter.leads.map((l: { id: string }) => l.id).sort()).toEqual(
      [matter.lead.id, member.id].sort(),
    );
    expect((await (await t.agentFor(member)).get(`/api/matters/${matter.id}/members`)).status).toBe(
      200,
    );
    const again = await adminAgent
      .put(`/api/admin/matters/${matter.id}/lead`)
      .send({ lead: member.id });
    expect(again.status).toBe(409);
    const missing = await adminAgent.put('/api/admin/matters/99999/lead').send({ lead: member.id });
    expect(missing.status).toBe(404);
  });
});
