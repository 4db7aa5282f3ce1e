// Sign-in, sessions and CSRF over HTTP against a real database.
// Sources: RFC 6265 (HTTP State Management: HttpOnly, Secure, Max-Age), RFC 6265bis
// (SameSite), OWASP Authentication Cheat Sheet (generic failure message, throttling),
// OWASP Session Management Cheat Sheet (renew/invalidate sessions on password change),
// OWASP CSRF Prevention Cheat Sheet (Origin verification), RFC 9110 section 10.2.3
// (Retry-After) and RFC 6585 section 4 (429 Too Many Requests).
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, test, vi } from 'vitest';
import { createTestApp, type TestApp, type TestUser } from '../../tests/helpers';
import {
  PasswordThrottle,
  SIGN_IN_FIRST_DELAY_MS,
  SIGN_IN_FREE_FAILURES_PER_ADDRESS,
  SIGN_IN_MAX_FAILURES_PER_ACCOUNT,
  SIGN_IN_MAX_FAILURES_PER_IP,
  SIGN_IN_WINDOW_MS,
} from './rate-limit';
import { SECURE_SESSION_COOKIE, SESSION_COOKIE } from './session';

function sessionCookie(
  setCookie: string[] | string | undefined,
  name = SESSION_COOKIE,
): string | undefined {
  const list = Array.isArray(setCookie) ? setCookie : setCookie ? [setCookie] : [];
  return list.find((cookie) => cookie.startsWith(`${name}=`));
}

function attributes(cookie: string): Map<string, string> {
  const parts = cookie.split(';').map((part) => part.trim());
  return new Map(
    parts.slice(1).map((part) => {
      const [name, ...value] = part.split('=');
      return [name.toLowerCase(), value.join('=')] as const;
    }),
  );
}

describe('sign-in and session cookie', () => {
  let t: TestApp;
  let user: TestUser;
  beforeAll(async () => {
    t = await createTestApp();
    user = await t.buildUser({ email: 'Jo.Bloggs@Example.com' });
  });
  afterAll(() => t.close());

  test('a correct e-mail (any case) and password start a session with HttpOnly, SameSite=Lax, no Secure over http', async () => {
    const agent = t.agent();
    const response = await agent
      .post('/api/auth/sign-in')
      .send({ email: ' JO.BLOGGS@example.com ', password: user.password });
    expect(response.status).toBe(200);
    expect(response.body.user).toEqual({
      id: user.id,
      email: user.email,
      name: user.name,
      isAdmin: false,
    });
    const cookie = sessionCookie(response.headers['set-cookie']);
    expect(cookie).toBeDefined();
    const attrs = attributes(cookie as string);
    // RFC 6265 section 4.1.2.6 (HttpOnly), 4.1.2.5 (Secure), RFC 6265bis SameSite.
    expect(attrs.has('httponly')).toBe(true);
    expect(attrs.get('samesite')?.toLowerCase()).toBe('lax');
    expect(attrs.get('path')).toBe('/');
    expect(attrs.has('secure')).toBe(false);
    // The session has a bounded lifetime (12 h idle by default).
    expect(Number(attrs.get('max-age'))).toBe(12 * 60 * 60);
    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.id).toBe(user.id);
  });

  test('GET /api/auth/me without a session is 401 unauthenticated', async () => {
    const response = await t.agent().get('/api/auth/me');
    expect(response.status).toBe(401);
    expect(response.body).toEqual({
      error: { code: 'unauthenticated', message: 'Sign in to continue.' },
    });
  });

  test('an invalid session cookie is ignored and cleared', async () => {
    const response = await t
      .agent()
      .get('/api/auth/me')
      .set('Cookie', `${SESSION_COOKIE}=forged-session-id`);
    expect(response.status).toBe(401);
    const cleared = sessionCookie(response.headers['set-cookie']);
    expect(attributes(cleared as string).get('max-age')).toBe('0');
  });

  test('unknown e-mail and wrong password get the same 401 body, and similar timing', async () => {
    const time = async (email: string) => {
      const started = performance.now();
      const response = await t
        .agent()
        .post('/api/auth/sign-in')
        .send({ email, password: 'not the password' });
      return { response, ms: performance.now() - started };
    };
    const wrong = [await time(user.email), await time(user.email)];
    const unknown = [await time('nobody@example.com'), await time('nobody-else@example.com')];
    for (const { response } of [...wrong, ...unknown]) {
      expect(response.status).toBe(401);
      expect(response.body).toEqual({
        error: {
          code: 'invalid_credentials',
          message: 'The e-mail address or password is incorrect.',
        },
      });
    }
    // Both paths run one Argon2id verification (a dummy hash for unknown accounts), so
    // an unknown e-mail is not answered markedly faster (loose bound against CI noise).
    const fastestWrong = Math.min(...wrong.map((r) => r.ms));
    const slowestUnknown = Math.max(...unknown.map((r) => r.ms));
    expect(slowestUnknown).toBeGreaterThan(fastestWrong * 0.3);
  });

  test('failed and successful sign-ins are in the audit log', async () => {
    const events = await t.ctx.db
      .selectFrom('audit_events')
      .select(['action', 'actor_email', 'detail'])
      .where('action', 'in', ['auth.sign_in', 'auth.sign_in_failed'])
      .execute();
    expect(events.some((e) => e.action === 'auth.sign_in' && e.actor_email === user.email)).toBe(
      true,
    );
    expect(
      events.some(
        (e) => e.action === 'auth.sign_in_failed' && e.actor_email === 'nobody@example.com',
      ),
    ).toBe(true);
  });

  test('sign-out ends the session on the server, not only in the browser', async () => {
    const agent = t.agent();
    const signedIn = await agent
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: user.password });
    const stolenCookie = (sessionCookie(signedIn.headers['set-cookie']) as string).split(';')[0];
    expect((await agent.get('/api/auth/me')).status).toBe(200);
    const out = await agent.post('/api/auth/sign-out');
    expect(out.status).toBe(204);
    expect((await agent.get('/api/auth/me')).status).toBe(401);
    // Even a copy of the old cookie no longer works.
    expect((await t.agent().get('/api/auth/me').set('Cookie', stolenCookie)).status).toBe(401);
  });

  test('signing in again replaces the session: the previous session id stops working', async () => {
    const agent = t.agent();
    const first = await agent
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: user.password });
    const firstCookie = (sessionCookie(first.headers['set-cookie']) as string).split(';')[0];
    const second = await agent
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: user.password });
    const secondCookie = (sessionCookie(second.headers['set-cookie']) as string).split(';')[0];
    expect(secondCookie).not.toBe(firstCookie);
    expect((await t.agent().get('/api/auth/me').set('Cookie', firstCookie)).status).toBe(401);
    expect((await t.agent().get('/api/auth/me').set('Cookie', secondCookie)).status).toBe(200);
  });

  test('over HTTPS behind a trusted proxy (X-Forwarded-Proto) the cookie is __Host-quarry_session and Secure', async () => {
    const proxied = await createTestApp({ env: { QUARRY_TRUST_PROXY: '1' } });
    try {
      const person = await proxied.buildUser();
      const https = proxied.baseUrl.replace('http:', 'https:');
      const response = await proxied
        .agent()
        .post('/api/auth/sign-in')
        .set('X-Forwarded-Proto', 'https')
        .set('Origin', https)
        .send({ email: person.email, password: person.password });
      expect(response.status).toBe(200);
      // RFC 6265bis section 4.1.3.2: a __Host- cookie must be Secure, Path=/, without Domain.
      expect(sessionCookie(response.headers['set-cookie'])).toBeUndefined();
      const cookie = sessionCookie(response.headers['set-cookie'], SECURE_SESSION_COOKIE);
      expect(cookie).toBeDefined();
      const attrs = attributes(cookie as string);
      expect(attrs.has('secure')).toBe(true);
      expect(attrs.get('path')).toBe('/');
      expect(attrs.has('domain')).toBe(false);
      expect(attrs.has('httponly')).toBe(true);
      // The prefixed cookie is the one read over HTTPS; a plain-named one is ignored there.
      const id = (cookie as string).split(';')[0].split('=')[1];
      const me = (name: string) =>
        proxied
          .agent()
          .get('/api/auth/me')
          .set('X-Forwarded-Proto', 'https')
          .set('Cookie', `${name}=${id}`);
      expect((await me(SECURE_SESSION_COOKIE)).status).toBe(200);
      expect((await me(SESSION_COOKIE)).status).toBe(401);
    } finally {
      await proxied.close();
    }
  });
});

describe('session lifetime', () => {
  test('an idle session expires after QUARRY_SESSION_TTL_HOURS (here 4 s) and is then refused', async () => {
    const shortLived = await createTestApp({ config: { sessionTtlHours: 4 / 3600 } });
    try {
      const person = await shortLived.buildUser();
      const agent = await shortLived.agentFor(person);
      expect((await agent.get('/api/auth/me')).status).toBe(200);
      await new Promise((resolve) => setTimeout(resolve, 4600));
      const expired = await agent.get('/api/auth/me');
      expect(expired.status).toBe(401);
      const left = await shortLived.ctx.db
        .selectFrom('sessions')
        .selectAll()
        .where('user_id', '=', person.id)
        .execute();
      expect(left).toEqual([]);
    } finally {
      await shortLived.close();
    }
  });
});

describe('absolute session lifetime (OWASP ASVS 4.0.3 V3.3.2), with a controlled clock', () => {
  const HOUR = 60 * 60 * 1000;
  afterEach(() => {
    vi.useRealTimers();
  });

  test('a session used every 7 hours is extended, but never past 7 days from its start, and then ends', async () => {
    const t = await createTestApp(); // defaults: 12 h idle, 168 h absolute
    try {
      const start = Date.UTC(2026, 11, 4, 9, 0, 0);
      // Only Date is faked: lucia and the middleware read the time from it.
      vi.useFakeTimers({ toFake: ['Date'], now: start });
      const person = await t.buildUser();
      const agent = await t.agentFor(person);
      const end = start + t.ctx.config.sessionMaxHours * HOUR;
      expect(t.ctx.config.sessionMaxHours).toBe(7 * 24);
      let extensions = 0;
      for (let at = start + 7 * HOUR; at < end; at += 7 * HOUR) {
        vi.setSystemTime(at);
        const response = await agent.get('/api/auth/me');
        expect(response.status, new Date(at).toISOString()).toBe(200);
        const row = await t.ctx.db
          .selectFrom('sessions')
          .select(['created_at', 'expires_at'])
          .where('user_id', '=', person.id)
          .executeTakeFirstOrThrow();
        expect(row.created_at).toBe(start / 1000);
        expect(row.expires_at).toBeLessThanOrEqual(end / 1000);
        const cookie = sessionCookie(response.headers['set-cookie']);
        if (cookie) {
          extensions++;
          expect(Number(attributes(cookie).get('max-age'))).toBeLessThanOrEqual((end - at) / 1000);
        }
      }
      // Past 12 h of use, the idle lifetime alone would have kept it forever.
      expect(extensions).toBeGreaterThan(10);
      vi.setSystemTime(end + 1000);
      expect((await agent.get('/api/auth/me')).status).toBe(401);
    } finally {
      vi.useRealTimers();
      await t.close();
    }
  });
});

describe('password change', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(() => t.close());

  test('ends every session of the user, keeps this browser signed in, and swaps the password', async () => {
    const user = await t.buildUser();
    const other = await t.buildUser();
    const here = await t.signIn(t.agent(), user.email, user.password);
    const elsewhere = await t.signIn(t.agent(), user.email, user.password);
    const someoneElse = await t.agentFor(other);

    const wrong = await here
      .post('/api/auth/password')
      .send({ currentPassword: 'nope', newPassword: 'a brand new passphrase' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error).toEqual({
      code: 'validation_failed',
      message: 'currentPassword: is incorrect',
      field: 'currentPassword',
    });

    const short = await here
      .post('/api/auth/password')
      .send({ currentPassword: user.password, newPassword: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.error.field).toBe('newPassword');

    const changed = await here
      .post('/api/auth/password')
      .send({ currentPassword: user.password, newPassword: 'a brand new passphrase' });
    expect(changed.status).toBe(200);
    expect((await here.get('/api/auth/me')).status).toBe(200);
    expect((await elsewhere.get('/api/auth/me')).status).toBe(401);
    expect((await someoneElse.get('/api/auth/me')).status).toBe(200);

    const oldPassword = await t
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: user.password });
    expect(oldPassword.status).toBe(401);
    await t.signIn(t.agent(), user.email, 'a brand new passphrase');
    const audit = await t.ctx.db
      .selectFrom('audit_events')
      .select('action')
      .where('actor_id', '=', user.id)
      .execute();
    expect(audit.map((e) => e.action)).toContain('auth.password_changed');
  });
});

describe('failed sign-in rate limits', () => {
  let t: TestApp;
  beforeEach(async () => {
    t = await createTestApp();
  });
  afterEach(() => t.close());

  const attempt = (email: string, password: string) =>
    t.agent().post('/api/auth/sign-in').send({ email, password });

  test(`per account and address: after ${SIGN_IN_FREE_FAILURES_PER_ADDRESS} failures even the right password gets 429 with Retry-After; other accounts are unaffected`, async () => {
    const user = await t.buildUser();
    const bystander = await t.buildUser();
    for (let i = 0; i < SIGN_IN_FREE_FAILURES_PER_ADDRESS; i++) {
      expect((await attempt(user.email, `wrong ${i}`)).status).toBe(401);
    }
    const blocked = await attempt(user.email, user.password);
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe('rate_limited');
    const retryAfter = Number(blocked.headers['retry-after']);
    expect(retryAfter).toBeGreaterThan(0);
    expect(retryAfter).toBeLessThanOrEqual(SIGN_IN_FIRST_DELAY_MS / 1000);
    expect((await attempt(bystander.email, bystander.password)).status).toBe(200);
  });

  test('unknown accounts are limited the same way (the limit does not reveal existence)', async () => {
    for (let i = 0; i < SIGN_IN_FREE_FAILURES_PER_ADDRESS; i++) {
      expect((await attempt('ghost@example.com', 'x')).status).toBe(401);
    }
    expect((await attempt('ghost@example.com', 'x')).status).toBe(429);
  });

  test('successful sign-ins do not count towards the limit', async () => {
    const user = await t.buildUser();
    for (let i = 0; i < SIGN_IN_FREE_FAILURES_PER_ADDRESS + 1; i++) {
      expect((await attempt(user.email, user.password)).status).toBe(200);
    }
    for (let i = 0; i < SIGN_IN_FREE_FAILURES_PER_ADDRESS - 1; i++) {
      expect((await attempt(user.email, 'wrong')).status).toBe(401);
    }
    // Still one failure short of the limit: the right password works.
    expect((await attempt(user.email, user.password)).status).toBe(200);
    expect((await attempt(user.email, 'wrong')).status).toBe(401);
    expect((await attempt(user.email, user.password)).status).toBe(429);
  });

  test(`per client address: ${SIGN_IN_MAX_FAILURES_PER_IP} failures across many accounts, then 429 for everyone from there`, async () => {
    const user = await t.buildUser();
    for (let i = 0; i < SIGN_IN_MAX_FAILURES_PER_IP; i++) {
      expect((await attempt(`spray-${i}@example.com`, 'Winter2021!')).status).toBe(401);
    }
    const blocked = await attempt(user.email, user.password);
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
  });
});

describe('an attacker elsewhere cannot lock the owner out', () => {
  // The review: five wrong passwords from any addresses made the owner's right password
  // fail for 15 minutes. Addresses here come from X-Forwarded-For behind a trusted proxy.
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp({ env: { QUARRY_TRUST_PROXY: '1' } });
  });
  afterAll(() => t.close());

  const from = (address: string, email: string, password: string) =>
    t.agent().post('/api/auth/sign-in').set('X-Forwarded-For', address).send({ email, password });

  test('after many failures from one address, the owner signs in from another', async () => {
    const owner = await t.buildUser();
    for (let i = 0; i < SIGN_IN_FREE_FAILURES_PER_ADDRESS + 1; i++)
      expect([401, 429]).toContain((await from('203.0.113.9', owner.email, `guess ${i}`)).status);
    expect((await from('203.0.113.9', owner.email, owner.password)).status).toBe(429);
    expect((await from('198.51.100.20', owner.email, owner.password)).status).toBe(200);
  });

  test('failures spread over several addresses do not lock the owner either', async () => {
    const owner = await t.buildUser();
    for (let i = 0; i < 10; i++)
      expect((await from(`203.0.113.${100 + i}`, owner.email, 'wrong')).status).toBe(401);
    expect((await from('198.51.100.21', owner.email, owner.password)).status).toBe(200);
  });
});

describe('password throttle (controllable clock)', () => {
  test('delays grow: free failures, then a wait that doubles from the first delay up to the window', () => {
    let now = 1_000_000;
    const throttle = new PasswordThrottle(() => now);
    for (let i = 0; i < SIGN_IN_FREE_FAILURES_PER_ADDRESS; i++) {
      expect(throttle.waitMs('a@example.com', '192.0.2.1')).toBe(0);
      throttle.recordFailure('a@example.com', '192.0.2.1');
    }
    const waits: number[] = [];
    for (let i = 0; i < 5; i++) {
      const wait = throttle.waitMs('a@example.com', '192.0.2.1');
      waits.push(wait);
      now += wait;
      expect(throttle.waitMs('A@Example.com ', '192.0.2.1')).toBe(0);
      throttle.recordFailure('a@example.com', '192.0.2.1');
    }
    // 30 s, 1, 2, 4 and 8 minutes (the window, 15 minutes, caps the delay).
    expect(waits).toEqual([1, 2, 4, 8, 16].map((m) => m * SIGN_IN_FIRST_DELAY_MS));
    // Another address is not slowed at all.
    expect(throttle.waitMs('a@example.com', '192.0.2.2')).toBe(0);
    // Failures older than the window are forgotten.
    now += SIGN_IN_WINDOW_MS;
    expect(throttle.waitMs('a@example.com', '192.0.2.1')).toBe(0);
  });

  test(`the per-account cap (${SIGN_IN_MAX_FAILURES_PER_ACCOUNT} failures from all addresses) sits far above the per-address one`, () => {
    let now = 5_000_000;
    const throttle = new PasswordThrottle(() => now);
    expect(SIGN_IN_MAX_FAILURES_PER_ACCOUNT).toBeGreaterThanOrEqual(
      10 * SIGN_IN_FREE_FAILURES_PER_ADDRESS,
    );
    for (let i = 0; i < SIGN_IN_MAX_FAILURES_PER_ACCOUNT - 1; i++) {
      throttle.recordFailure('b@example.com', `10.0.${Math.floor(i / 250)}.${i % 250}`);
      now += 1000;
    }
    expect(throttle.waitMs('b@example.com', '192.0.2.9')).toBe(0);
    throttle.recordFailure('b@example.com', '10.9.9.9');
    const wait = throttle.waitMs('b@example.com', '192.0.2.9');
    expect(wait).toBeGreaterThan(0);
    expect(wait).toBeLessThanOrEqual(SIGN_IN_WINDOW_MS);
    expect(throttle.waitMs('other@example.com', '192.0.2.9')).toBe(0);
  });
});

describe('every password check is throttled like sign-in', () => {
  let t: TestApp;
  beforeEach(async () => {
    t = await createTestApp();
  });
  afterEach(() => t.close());

  test('the current password on a password change: 429 after the free failures, even when right', async () => {
    const user = await t.buildUser();
    const agent = await t.agentFor(user);
    for (let i = 0; i < SIGN_IN_FREE_FAILURES_PER_ADDRESS; i++) {
      const wrong = await agent
        .post('/api/auth/password')
        .send({ currentPassword: `wrong ${i}`, newPassword: 'a brand new passphrase' });
      expect(wrong.status).toBe(400);
    }
    const blocked = await agent
      .post('/api/auth/password')
      .send({ currentPassword: user.password, newPassword: 'a brand new passphrase' });
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe('rate_limited');
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    // The same account's sign-in from this address shares the count.
    const signIn = await t
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: user.password });
    expect(signIn.status).toBe(429);
  });
});

describe('password quality (OWASP ASVS 4.0.3 V2.1.7, V2.3.1)', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(() => t.close());

  test.each([
    // On the leaked-password frequency list of @zxcvbn-ts/language-common ("passwords").
    ['a breached password from the list', '123qweasdzxc'],
    ['a listed password with digits added', 'password1234'],
    ['a keyboard walk', 'qwertyuiop12'],
    ['one repeated character', 'aaaaaaaaaaaa'],
  ])(
    'a new password that is %s is refused with 400 naming newPassword',
    async (_name, newPassword) => {
      const user = await t.buildUser();
      const agent = await t.agentFor(user);
      const response = await agent
        .post('/api/auth/password')
        .send({ currentPassword: user.password, newPassword });
      expect(response.status).toBe(400);
      expect(response.body.error).toMatchObject({
        code: 'validation_failed',
        field: 'newPassword',
      });
      expect(response.body.error.message).toMatch(/^newPassword: is too easy to guess/);
    },
  );

  test('a password built from the account e-mail is refused', async () => {
    const user = await t.buildUser({ email: 'marguerite.hollowell@example.com' });
    const agent = await t.agentFor(user);
    const response = await agent
      .post('/api/auth/password')
      .send({ currentPassword: user.password, newPassword: 'margueritehollowell1' });
    expect(response.status).toBe(400);
    expect(response.body.error.field).toBe('newPassword');
  });

  test('reusing the current password is refused', async () => {
    const user = await t.buildUser();
    const agent = await t.agentFor(user);
    const response = await agent
      .post('/api/auth/password')
      .send({ currentPassword: user.password, newPassword: user.password });
    expect(response.status).toBe(400);
    expect(response.body.error).toMatchObject({
      field: 'newPassword',
      message: 'newPassword: must differ from the current password',
    });
  });

  test('an admin-set temporary password must be changed before anything else, then works normally', async () => {
    const admin = await t.agentFor(await t.buildUser({ isAdmin: true }));
    const temporary = 'lichen harbour pewter kettle';
    const created = await admin.post('/api/admin/users').send({
      name: 'Tamsin Vale',
      email: 'tamsin.vale@example.com',
      temporaryPassword: temporary,
    });
    expect(created.status).toBe(201);
    const agent = t.agent();
    const signedIn = await agent
      .post('/api/auth/sign-in')
      .send({ email: 'tamsin.vale@example.com', password: temporary });
    expect(signedIn.status).toBe(200);
    expect(signedIn.body.passwordChangeRequired).toBe(true);
    expect((await agent.get('/api/auth/me')).body.passwordChangeRequired).toBe(true);
    const refused = await agent.get('/api/matters');
    expect(refused.status).toBe(403);
    expect(refused.body.error.code).toBe('password_change_required');
    const changed = await agent
      .post('/api/auth/password')
      .send({ currentPassword: temporary, newPassword: 'my own quiet orchard lane' });
    expect(changed.status).toBe(200);
    expect(changed.body.passwordChangeRequired).toBe(false);
    expect((await agent.get('/api/matters')).status).toBe(200);
  });

  test(`a temporary password stops working after QUARRY_TEMPORARY_PASSWORD_HOURS (72 h)`, async () => {
    expect(t.ctx.config.temporaryPasswordHours).toBe(72);
    const admin = await t.agentFor(await t.buildUser({ isAdmin: true }));
    const temporary = 'copper wren meadow signal';
    await admin.post('/api/admin/users').send({
      name: 'Ewan Lark',
      email: 'ewan.lark@example.com',
      temporaryPassword: temporary,
    });
    const signIn = () =>
      t
        .agent()
        .post('/api/auth/sign-in')
        .send({ email: 'ewan.lark@example.com', password: temporary });
    try {
      vi.useFakeTimers({ toFake: ['Date'], now: Date.now() + 71 * 60 * 60 * 1000 });
      expect((await signIn()).status).toBe(200);
      vi.setSystemTime(Date.now() + 2 * 60 * 60 * 1000);
      const expired = await signIn();
      expect(expired.status).toBe(401);
      expect(expired.body.error.message).toMatch(/temporary password has expired/);
    } finally {
      vi.useRealTimers();
    }
  });

  test('an admin cannot hand out a guessable temporary password either', async () => {
    const admin = await t.agentFor(await t.buildUser({ isAdmin: true }));
    const response = await admin.post('/api/admin/users').send({
      name: 'Guessable',
      email: 'guessable@example.com',
      temporaryPassword: 'Password1234',
    });
    expect(response.status).toBe(400);
    expect(response.body.error.field).toBe('temporaryPassword');
  });
});

describe('cross-site request forgery', () => {
  let t: TestApp;
  let user: TestUser;
  beforeAll(async () => {
    t = await createTestApp({ env: { QUARRY_PUBLIC_ORIGIN: 'https://quarry.example.com' } });
    user = await t.buildUser();
  });
  afterAll(() => t.close());

  test('a mutating request from a foreign Origin is refused with 403 csrf_rejected', async () => {
    const agent = await t.agentFor(user);
    const response = await agent
      .post('/api/auth/password')
      .set('Origin', 'https://evil.example')
      .send({ currentPassword: user.password, newPassword: 'attacker chosen password' });
    expect(response.status).toBe(403);
    expect(response.body.error.code).toBe('csrf_rejected');
    expect(response.body.error.message).toContain('https://evil.example');
  });

  test('a mutating request with neither Origin nor Referer is refused', async () => {
    const request = (await import('supertest')).default;
    const response = await request(t.baseUrl)
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: user.password });
    expect(response.status).toBe(403);
    expect(response.body.error.code).toBe('csrf_rejected');
  });

  test('same-origin Referer, the configured public origin, and GET requests pass', async () => {
    const request = (await import('supertest')).default;
    const byReferer = await request(t.baseUrl)
      .post('/api/auth/sign-in')
      .set('Referer', `${t.baseUrl}/sign-in`)
      .send({ email: user.email, password: user.password });
    expect(byReferer.status).toBe(200);
    const byPublicOrigin = await request(t.baseUrl)
      .post('/api/auth/sign-in')
      .set('Origin', 'https://quarry.example.com')
      .send({ email: user.email, password: user.password });
    expect(byPublicOrigin.status).toBe(200);
    const get = await request(t.baseUrl).get('/api/auth/me').set('Origin', 'https://evil.example');
    expect(get.status).toBe(401);
  });
});
