// Invitations end to end over HTTP with the local fake SMTP server (smtp-server):
// the mail arrives, its link works once, expired, reused and revoked links are
// refused, and a revoked member is refused on the very next request.
// Token handling follows the OWASP Forgot Password Cheat Sheet's advice for URL
// tokens (long random value, single use, expiry, stored hashed).
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import {
  createTestApp,
  type Agent,
  type TestApp,
  type TestMatter,
  type TestUser,
} from '../../tests/helpers';
import { SIGN_IN_FREE_FAILURES_PER_ADDRESS } from '../auth/rate-limit';

let t: TestApp;
let lead: TestUser;
let leadAgent: Agent;
let matter: TestMatter;

beforeAll(async () => {
  t = await createTestApp();
  lead = await t.buildUser({ name: 'Lena Lead' });
  matter = await t.buildMatter({ lead, name: 'Quillon Freight v. Marrow Bay' });
  leadAgent = await t.agentFor(lead);
});
afterAll(() => t.close());

async function invite(email: string, role: string, agent = leadAgent) {
  const response = await agent.post(`/api/matters/${matter.id}/invitations`).send({ email, role });
  return response;
}

async function linkFor(email: string, since = 0): Promise<string> {
  const mail = await t.mail.waitFor((m) => m.to.includes(email) && m.id > since);
  const link = mail.links.find((l) => l.includes('/invitations/'));
  if (!link) throw new Error(`no invitation link in ${mail.text}`);
  return link;
}

const tokenOf = (link: string) => link.split('/invitations/')[1];

describe('a new person accepts an invitation', () => {
  const email = 'new.reviewer@example.com';
  let link: string;
  let invitee: Agent;

  test('the lead invites; the API never returns the token; the mail carries a one-time link', async () => {
    const response = await invite(email, 'reviewer');
    expect(response.status).toBe(201);
    expect(response.body.invitation).toMatchObject({
      email,
      role: 'reviewer',
      invitedBy: { id: lead.id },
    });
    expect(JSON.stringify(response.body)).not.toMatch(/token/i);
    link = await linkFor(email);
    expect(link).toMatch(new RegExp(`^${t.baseUrl}/invitations/[A-Za-z0-9_-]{43}$`));
    const mail = t.mail.messages().find((m) => m.to.includes(email));
    expect(mail?.subject).toBe('Invitation to Quillon Freight v. Marrow Bay on Quarry');
    expect(mail?.text).toContain('Lena Lead invited you');
    // Only the SHA-256 of the token is stored.
    const row = await t.ctx.db
      .selectFrom('invitations')
      .selectAll()
      .where('email', '=', email)
      .executeTakeFirstOrThrow();
    expect(row.token_hash).toBe(createHash('sha256').update(tokenOf(link)).digest('hex'));
    expect(JSON.stringify(row)).not.toContain(tokenOf(link));
  });

  test('the dev mailbox lists the message with its link (for a firm admin)', async () => {
    const admin = await t.agentFor(await t.buildUser({ isAdmin: true }));
    const response = await admin.get('/api/dev/mail');
    expect(response.status).toBe(200);
    expect(response.body.fakeSmtp).toBe(true);
    const message = response.body.messages.find((m: { to: string[] }) => m.to.includes(email));
    expect(message.links).toContain(link);
    expect(typeof message.receivedAt).toBe('string');
  });

  test('the pending invitation appears on the access page', async () => {
    const response = await leadAgent.get(`/api/matters/${matter.id}/members`);
    expect(response.body.invitations.map((i: { email: string }) => i.email)).toContain(email);
  });

  test('the link previews the matter and role', async () => {
    const response = await t.agent().get(`/api/invitations/${tokenOf(link)}`);
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({
      matterName: matter.name,
      role: 'reviewer',
      email,
      invitedBy: 'Lena Lead',
      accountExists: false,
    });
  });

  test('accepting needs a name and a password of at least 12 characters', async () => {
    const noName = await t
      .agent()
      .post(`/api/invitations/${tokenOf(link)}/accept`)
      .send({ password: 'long enough password' });
    expect(noName.status).toBe(400);
    expect(noName.body.error.field).toBe('name');
    const shortPassword = await t
      .agent()
      .post(`/api/invitations/${tokenOf(link)}/accept`)
      .send({ name: 'Nell Reviewer', password: 'short' });
    expect(shortPassword.status).toBe(400);
    expect(shortPassword.body.error).toMatchObject({
      code: 'validation_failed',
      field: 'password',
    });
  });

  test('accepting creates the account, grants the role and signs the browser in', async () => {
    invitee = t.agent();
    const response = await invitee
      .post(`/api/invitations/${tokenOf(link)}/accept`)
      .send({ name: 'Nell Reviewer', password: 'a long reviewer passphrase' });
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({
      matterId: matter.id,
      role: 'reviewer',
      accountCreated: true,
      user: { email },
    });
    const me = await invitee.get('/api/auth/me');
    expect(me.body.matters).toEqual([
      expect.objectContaining({
        id: matter.id,
        role: 'reviewer',
        permissions: expect.arrayContaining(['documents.code']),
      }),
    ]);
    expect(me.body.matters[0].permissions).not.toContain('members.manage');
    expect((await invitee.get(`/api/matters/${matter.id}`)).status).toBe(200);
    expect((await invitee.get(`/api/matters/${matter.id}/members`)).status).toBe(403);
    // The new account can sign in with the chosen password.
    await t.signIn(t.agent(), email, 'a long reviewer passphrase');
  });

  test('the link works once: reuse is 409 invitation_used', async () => {
    const again = await t
      .agent()
      .post(`/api/invitations/${tokenOf(link)}/accept`)
      .send({ name: 'X', password: 'another long password' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('invitation_used');
    const preview = await t.agent().get(`/api/invitations/${tokenOf(link)}`);
    expect(preview.status).toBe(409);
  });

  test('a revoked member is refused on the very next request', async () => {
    expect((await invitee.get(`/api/matters/${matter.id}`)).status).toBe(200);
    const userId = (await invitee.get('/api/auth/me')).body.user.id;
    const revoked = await leadAgent.delete(`/api/matters/${matter.id}/members/${userId}`);
    expect(revoked.status).toBe(204);
    const next = await invitee.get(`/api/matters/${matter.id}`);
    expect(next.status).toBe(404);
    expect(next.body.error).toEqual({ code: 'not_found', message: 'Matter not found.' });
    expect((await invitee.get('/api/matters')).body.matters).toEqual([]);
  });

  test('the log shows who invited, accepted and revoked, newest first', async () => {
    const response = await leadAgent.get(`/api/matters/${matter.id}/audit`);
    expect(response.status).toBe(200);
    const actions = response.body.events.map((e: { action: string }) => e.action);
    // The invitee's sign-in (a former member now) stays in the matter's log.
    expect(actions.slice(0, 4)).toEqual([
      'member.revoked',
      'auth.sign_in',
      'invitation.accepted',
      'invitation.sent',
    ]);
    const ids = response.body.events.map((e: { id: number }) => e.id);
    expect([...ids].sort((a, b) => b - a)).toEqual(ids);
  });
});

describe('refused links', () => {
  test('an unknown token is 404 and a malformed one 400', async () => {
    const unknown = await t.agent().get(`/api/invitations/${'A'.repeat(43)}`);
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.code).toBe('not_found');
    const malformed = await t.agent().get('/api/invitations/short');
    expect(malformed.status).toBe(400);
    expect(malformed.body.error.field).toBe('token');
  });

  test('a revoked invitation is 410 invitation_revoked', async () => {
    const sent = await invite('withdrawn@example.com', 'attorney');
    const link = await linkFor('withdrawn@example.com');
    const revoke = await leadAgent.delete(
      `/api/matters/${matter.id}/invitations/${sent.body.invitation.id}`,
    );
    expect(revoke.status).toBe(204);
    const accept = await t
      .agent()
      .post(`/api/invitations/${tokenOf(link)}/accept`)
      .send({ name: 'W', password: 'a long enough password' });
    expect(accept.status).toBe(410);
    expect(accept.body.error.code).toBe('invitation_revoked');
    const revokeAgain = await leadAgent.delete(
      `/api/matters/${matter.id}/invitations/${sent.body.invitation.id}`,
    );
    expect(revokeAgain.status).toBe(410);
  });

  test('re-inviting an address replaces its earlier pending link', async () => {
    await invite('twice@example.com', 'paralegal');
    const first = await linkFor('twice@example.com');
    const firstId = t.mail.messages().find((m) => m.links.includes(first))?.id ?? 0;
    await invite('twice@example.com', 'attorney');
    const second = await linkFor('twice@example.com', firstId);
    expect(second).not.toBe(first);
    expect((await t.agent().get(`/api/invitations/${tokenOf(first)}`)).body.error.code).toBe(
      'invitation_revoked',
    );
    expect((await t.agent().get(`/api/invitations/${tokenOf(second)}`)).body.role).toBe('attorney');
  });

  test('an expired invitation is 410 invitation_expired (config.invitationTtlDays)', async () => {
    // 50 ms lifetime through the same setting that gives the 7-day default.
    const shortLived = await createTestApp({ config: { invitationTtlDays: 0.05 / 86_400 } });
    try {
      const owner = await shortLived.buildUser();
      const m = await shortLived.buildMatter({ lead: owner });
      const agent = await shortLived.agentFor(owner);
      expect(
        (
          await agent
            .post(`/api/matters/${m.id}/invitations`)
            .send({ email: 'late@example.com', role: 'reviewer' })
        ).status,
      ).toBe(201);
      const mail = await shortLived.mail.waitFor((x) => x.to.includes('late@example.com'));
      const token = tokenOf(mail.links[0]);
      await new Promise((resolve) => setTimeout(resolve, 100));
      const accept = await shortLived
        .agent()
        .post(`/api/invitations/${token}/accept`)
        .send({ name: 'Late', password: 'a long enough password' });
      expect(accept.status).toBe(410);
      expect(accept.body.error.code).toBe('invitation_expired');
      expect((await agent.get(`/api/matters/${m.id}/members`)).body.invitations).toEqual([]);
    } finally {
      await shortLived.close();
    }
  });

  test('the default lifetime is 7 days', async () => {
    await invite('week@example.com', 'reviewer');
    const row = await t.ctx.db
      .selectFrom('invitations')
      .selectAll()
      .where('email', '=', 'week@example.com')
      .executeTakeFirstOrThrow();
    const days = (Date.parse(row.expires_at) - Date.parse(row.created_at)) / 86_400_000;
    expect(days).toBeCloseTo(7, 3);
  });

  test('inviting an existing member is 409; a bad role is 400 naming role', async () => {
    const member = await invite(lead.email, 'reviewer');
    expect(member.status).toBe(409);
    const badRole = await invite('x@example.com', 'partner');
    expect(badRole.status).toBe(400);
    expect(badRole.body.error.field).toBe('role');
  });
});

describe('an existing account accepts', () => {
  test('with its password, or already signed in as that account; never as someone else', async () => {
    const existing = await t.buildUser({ email: 'already@example.com' });
    await invite(existing.email, 'attorney');
    const link = await linkFor(existing.email);
    const token = tokenOf(link);
    expect((await t.agent().get(`/api/invitations/${token}`)).body.accountExists).toBe(true);

    const noPassword = await t.agent().post(`/api/invitations/${token}/accept`).send({});
    expect(noPassword.status).toBe(400);
    expect(noPassword.body.error.field).toBe('password');

    const wrong = await t
      .agent()
      .post(`/api/invitations/${token}/accept`)
      .send({ password: 'not it at all' });
    expect(wrong.status).toBe(401);
    expect(wrong.body.error.code).toBe('invalid_credentials');

    // Signed in as a different person does not help: the invitation names its e-mail.
    const stranger = await t.agentFor(await t.buildUser());
    expect((await stranger.post(`/api/invitations/${token}/accept`).send({})).status).toBe(400);

    const signedIn = await t.agentFor(existing);
    const accepted = await signedIn.post(`/api/invitations/${token}/accept`).send({});
    expect(accepted.status).toBe(200);
    expect(accepted.body).toMatchObject({
      role: 'attorney',
      accountCreated: false,
      user: { id: existing.id },
    });
    expect((await signedIn.get(`/api/matters/${matter.id}`)).body.role).toBe('attorney');
  });

  test('with the password, the browser is signed in as the invited account', async () => {
    const existing = await t.buildUser({ email: 'by-password@example.com' });
    await invite(existing.email, 'paralegal');
    const token = tokenOf(await linkFor(existing.email));
    const agent = t.agent();
    const accepted = await agent
      .post(`/api/invitations/${token}/accept`)
      .send({ password: existing.password });
    expect(accepted.status).toBe(200);
    expect((await agent.get('/api/auth/me')).body.user.id).toBe(existing.id);
  });
});

describe('password guesses through an invitation link', () => {
  // The review: 30 guesses of an existing account's password through its invitation all
  // got a plain 401, never 429. They now share the sign-in throttle (server/auth/rate-limit.ts).
  test('429 with Retry-After after the free failures, even for the right password; sign-in shares the count', async () => {
    const existing = await t.buildUser({ email: 'guessed@example.com' });
    await invite(existing.email, 'reviewer');
    const token = tokenOf(await linkFor(existing.email));
    for (let i = 0; i < SIGN_IN_FREE_FAILURES_PER_ADDRESS; i++) {
      const wrong = await t
        .agent()
        .post(`/api/invitations/${token}/accept`)
        .send({ password: `guess number ${i}` });
      expect(wrong.status).toBe(401);
    }
    const blocked = await t
      .agent()
      .post(`/api/invitations/${token}/accept`)
      .send({ password: existing.password });
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe('rate_limited');
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    const signIn = await t
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: existing.email, password: existing.password });
    expect(signIn.status).toBe(429);
  });
});

describe('dev mailbox visibility', () => {
  test('GET /api/dev/mail is 404 outside demo and dev mode (server/dev/dev.test.ts has the rest)', async () => {
    const production = await createTestApp({ env: { QUARRY_DEMO: '0' } });
    try {
      const admin = await production.agentFor(await production.buildUser({ isAdmin: true }));
      const response = await admin.get('/api/dev/mail');
      expect(response.status).toBe(404);
      expect(response.body.error.code).toBe('not_found');
    } finally {
      await production.close();
    }
  });
});
