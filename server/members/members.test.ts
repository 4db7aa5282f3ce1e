// Per-matter access management over HTTP: grant, role change and revoke by the lead,
// applied on the very next request; a matter always keeps a lead; the audit log records
// each change and can be filtered and paged.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import {
  createTestApp,
  type Agent,
  type TestApp,
  type TestMatter,
  type TestUser,
} from '../../tests/helpers';

let t: TestApp;
let lead: TestUser;
let leadAgent: Agent;
let matter: TestMatter;

beforeAll(async () => {
  t = await createTestApp();
  lead = await t.buildUser();
  matter = await t.buildMatter({ lead });
  leadAgent = await t.agentFor(lead);
});
afterAll(() => t.close());

describe('members', () => {
  test('the lead grants an existing account; unknown e-mails and duplicates are refused', async () => {
    const person = await t.buildUser({ email: 'grant.me@example.com' });
    const granted = await leadAgent
      .post(`/api/matters/${matter.id}/members`)
      .send({ email: 'GRANT.ME@example.com', role: 'paralegal' });
    expect(granted.status).toBe(201);
    expect(granted.body.member).toMatchObject({
      userId: person.id,
      role: 'paralegal',
      grantedBy: { id: lead.id },
    });
    const again = await leadAgent
      .post(`/api/matters/${matter.id}/members`)
      .send({ email: person.email, role: 'reviewer' });
    expect(again.status).toBe(409);
    const unknown = await leadAgent
      .post(`/api/matters/${matter.id}/members`)
      .send({ email: 'nobody@example.com', role: 'reviewer' });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.field).toBe('email');
    const list = await leadAgent.get(`/api/matters/${matter.id}/members`);
    expect(
      list.body.members.map((m: { email: string; role: string }) => [m.email, m.role]),
    ).toEqual(
      expect.arrayContaining([
        [lead.email, 'lead'],
        [person.email, 'paralegal'],
      ]),
    );
  });

  test('a role change applies to the next request', async () => {
    const person = await t.buildUser();
    await t.addMember(matter, person, 'reviewer');
    const agent = await t.agentFor(person);
    expect((await agent.get(`/api/matters/${matter.id}/members`)).status).toBe(403);
    const changed = await leadAgent
      .patch(`/api/matters/${matter.id}/members/${person.id}`)
      .send({ role: 'lead' });
    expect(changed.status).toBe(200);
    expect(changed.body.member.role).toBe('lead');
    expect((await agent.get(`/api/matters/${matter.id}/members`)).status).toBe(200);
    await leadAgent
      .patch(`/api/matters/${matter.id}/members/${person.id}`)
      .send({ role: 'reviewer' });
    expect((await agent.get(`/api/matters/${matter.id}/members`)).status).toBe(403);
    expect((await agent.get(`/api/matters/${matter.id}`)).body.role).toBe('reviewer');
  });

  test('the last lead can be neither demoted nor removed (409); with a second lead it can', async () => {
    const solo = await t.buildMatter();
    const soloLead = await t.agentFor(solo.lead);
    const demote = await soloLead
      .patch(`/api/matters/${solo.id}/members/${solo.lead.id}`)
      .send({ role: 'attorney' });
    expect(demote.status).toBe(409);
    const remove = await soloLead.delete(`/api/matters/${solo.id}/members/${solo.lead.id}`);
    expect(remove.status).toBe(409);
    const second = await t.buildUser();
    await t.addMember(solo, second, 'lead');
    expect((await soloLead.delete(`/api/matters/${solo.id}/members/${solo.lead.id}`)).status).toBe(
      204,
    );
    expect((await soloLead.get(`/api/matters/${solo.id}`)).status).toBe(404);
  });

  test('unknown members are 404 and bad roles 400', async () => {
    expect(
      (await leadAgent.patch(`/api/matters/${matter.id}/members/nobody`).send({ role: 'reviewer' }))
        .status,
    ).toBe(404);
    expect((await leadAgent.delete(`/api/matters/${matter.id}/members/nobody`)).status).toBe(404);
    const bad = await leadAgent
      .patch(`/api/matters/${matter.id}/members/${lead.id}`)
      .send({ role: 'owner' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toBe('role: must be one of lead, attorney, paralegal, reviewer');
  });
});

describe('audit log', () => {
  test('records grant, role change and revoke with actor, target and detail; filters by actor and action; pages by cursor', async () => {
    const other = await t.buildMatter({ lead });
    const people: TestUser[] = [];
    for (let i = 0; i < 3; i++) people.push(await t.buildUser());
    for (const person of people) {
      await leadAgent
        .post(`/api/matters/${other.id}/members`)
        .send({ email: person.email, role: 'reviewer' });
    }
    await leadAgent
      .patch(`/api/matters/${other.id}/members/${people[0].id}`)
      .send({ role: 'attorney' });
    await leadAgent.delete(`/api/matters/${other.id}/members/${people[1].id}`);

    const all = await leadAgent.get(`/api/matters/${other.id}/audit`);
    expect(all.status).toBe(200);
    const actions = all.body.events.map((e: { action: string }) => e.action);
    // Only this matter's events (the first matter has many more); matter.created and
    // matter.lead_appointed come from buildMatter (no actor).
    expect(actions).toEqual([
      'member.revoked',
      'member.role_changed',
      'member.granted',
      'member.granted',
      'member.granted',
      'matter.lead_appointed',
      'matter.created',
    ]);
    const roleChange = all.body.events[1];
    expect(roleChange).toMatchObject({
      actor: { id: lead.id, email: lead.email, name: lead.name },
      targetType: 'user',
      targetId: people[0].id,
      detail: { email: people[0].email, name: people[0].name, from: 'reviewer', to: 'attorney' },
    });
    expect(roleChange.ip).toMatch(/127\.0\.0\.1/);
    // The revoked person is no longer a member, so the event itself must name them.
    expect(all.body.events[0]).toMatchObject({
      action: 'member.revoked',
      targetId: people[1].id,
      detail: { email: people[1].email, name: people[1].name, role: 'reviewer' },
    });
    expect(all.body.events[2].detail).toMatchObject({
      email: people[2].email,
      name: people[2].name,
      role: 'reviewer',
    });
    expect(all.body.actors).toEqual([{ id: lead.id, email: lead.email, name: lead.name }]);

    const granted = await leadAgent.get(`/api/matters/${other.id}/audit?action=member.granted`);
    expect(granted.body.events).toHaveLength(3);
    const byActor = await leadAgent.get(`/api/matters/${other.id}/audit?actor=${lead.id}`);
    expect(byActor.body.events).toHaveLength(5);
    const nobody = await leadAgent.get(`/api/matters/${other.id}/audit?actor=someone-else`);
    expect(nobody.body.events).toEqual([]);

    const page1 = await leadAgent.get(`/api/matters/${other.id}/audit?limit=3`);
    expect(page1.body.events).toHaveLength(3);
    const page2 = await leadAgent.get(
      `/api/matters/${other.id}/audit?limit=3&before=${page1.body.nextCursor}`,
    );
    const page3 = await leadAgent.get(
      `/api/matters/${other.id}/audit?limit=3&before=${page2.body.nextCursor}`,
    );
    expect(page3.body.nextCursor).toBeNull();
    const paged = [...page1.body.events, ...page2.body.events, ...page3.body.events].map(
      (e: { id: number }) => e.id,
    );
    expect(paged).toEqual(all.body.events.map((e: { id: number }) => e.id));

    const badAction = await leadAgent.get(`/api/matters/${other.id}/audit?action=drop.tables`);
    expect(badAction.status).toBe(400);
    expect(badAction.body.error.field).toBe('action');
    const badLimit = await leadAgent.get(`/api/matters/${other.id}/audit?limit=1000`);
    expect(badLimit.body.error.field).toBe('limit');
  });

  test("members' sign-ins and failed sign-ins appear in the matter's log; other people's do not", async () => {
    const own = await t.buildMatter();
    const member = await t.buildUser();
    const stranger = await t.buildUser();
    await t.addMember(own, member, 'attorney');
    await t.signIn(t.agent(), member.email, member.password);
    await t
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: member.email, password: 'wrong password' });
    await t.signIn(t.agent(), stranger.email, stranger.password);
    const ownLead = await t.agentFor(own.lead);
    const log = await ownLead.get(`/api/matters/${own.id}/audit`);
    const auth = log.body.events.filter((e: { action: string }) => e.action.startsWith('auth.'));
    expect(
      auth.map((e: { action: string; actor: { id: string } }) => [e.action, e.actor.id]),
    ).toEqual([
      ['auth.sign_in_failed', member.id],
      ['auth.sign_in', member.id],
    ]);
    const filtered = await ownLead.get(`/api/matters/${own.id}/audit?action=auth.sign_in_failed`);
    expect(filtered.body.events).toHaveLength(1);
  });

  test('the audit table is append-only', async () => {
    await expect(t.ctx.db.deleteFrom('audit_events').execute()).rejects.toThrow(/append-only/);
    await expect(
      t.ctx.db.updateTable('audit_events').set({ action: 'x' }).execute(),
    ).rejects.toThrow(/append-only/);
  });
});
