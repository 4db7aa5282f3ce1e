import { mkdtempSync, rmSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Express } from 'express';
import request from 'supertest';
import type { MatterRole } from '../../shared/roles';
import { createApp, type AppOptions } from '../../server/app';
import { hashPassword } from '../../server/auth/password';
import { loadConfig, type Config } from '../../server/config';
import { createContext, type AppContext } from '../../server/context';
import type { FakeSmtp } from '../../server/mail/fake-smtp';
import { createMatter } from '../../server/matters/service';
import { SESSION_COOKIE } from '../../server/auth/session';

export type Agent = ReturnType<typeof request.agent>;

interface CookieJarHolder {
  jar: { setCookies(cookies: string[], host: string, path: string): void };
}

export interface TestUser {
  id: string;
  email: string;
  name: string;
  password: string;
  isAdmin: boolean;
}

export interface TestMatter {
  id: number;
  name: string;
  controlPrefix: string;
  lead: TestUser;
}

export interface TestAppOptions extends AppOptions {
  /** Environment variables as loadConfig reads them (QUARRY_DATA_DIR is set for you). */
  env?: Record<string, string>;
  /** Direct config overrides, applied after the environment. */
  config?: Partial<Config>;
  /** An existing data folder to open again (a restart); close() then leaves it in place. */
  dataDir?: string;
}

export interface TestApp {
  ctx: AppContext;
  app: Express;
  server: Server;
  /** The data folder (database, blobs). */
  dataDir: string;
  /** http://127.0.0.1:<port>; also the Origin header agents send. */
  baseUrl: string;
  /** The local fake SMTP server's mailbox. */
  mail: FakeSmtp;
  /** A cookie-keeping supertest agent that sends `Origin: <baseUrl>` (the CSRF check). */
  agent(): Agent;
  /** An agent carrying a fresh session for the user, without the cost of a password check. */
  agentFor(user: { id: string }): Promise<Agent>;
  buildUser(options?: {
    isAdmin?: boolean;
    email?: string;
    password?: string;
    name?: string;
  }): Promise<TestUser>;
  buildMatter(options?: {
    lead?: TestUser;
    name?: string;
    controlPrefix?: string;
  }): Promise<TestMatter>;
  addMember(matter: { id: number }, user: { id: string }, role: MatterRole): Promise<void>;
  /** Signs in over HTTP (checking the password) and returns the agent. */
  signIn(agent: Agent, email: string, password: string): Promise<Agent>;
  close(): Promise<void>;
}

export const DEFAULT_TEST_PASSWORD = 'correct horse battery staple';

// Argon2id at OWASP settings costs tens of milliseconds: hash each password once per file.
const hashCache = new Map<string, Promise<string>>();
const cachedHash = (password: string) => {
  let hash = hashCache.get(password);
  if (!hash) hashCache.set(password, (hash = hashPassword(password)));
  return hash;
};

let sequence = 0;
const nextSeq = () => `${process.pid}-${++sequence}`;

/**
 * A real Quarry app on a temporary data folder (mkdtemp), freshly migrated, listening on
 * 127.0.0.1 and a random port, with the fake SMTP server. Call close() in afterAll.
 */
export async function createTestApp(options: TestAppOptions = {}): Promise<TestApp> {
  const dataDir = options.dataDir ?? mkdtempSync(join(tmpdir(), 'quarry-test-'));
  const config: Config = {
    ...loadConfig({ QUARRY_DATA_DIR: dataDir, QUARRY_LOG_LEVEL: 'silent', ...options.env }),
    ...options.config,
  };
  const ctx = await createContext(config);
  if (!ctx.mail.fake)
    throw new Error('createTestApp needs the fake SMTP server: do not set SMTP_URL');
  const app = createApp(ctx, {
    distDir: options.distDir ?? join(dataDir, 'no-dist'),
    routes: options.routes,
  });
  const server = await new Promise<Server>((resolve) => {
    const listening = app.listen(0, '127.0.0.1', () => resolve(listening));
  });
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

  const agent = () => request.agent(baseUrl).set('Origin', baseUrl);

  const testApp: TestApp = {
    ctx,
    app,
    server,
    dataDir,
    baseUrl,
    mail: ctx.mail.fake,
    agent,
    async agentFor(user) {
      // The session is created the way sign-in creates it, minus the Argon2 check.
      const header = await ctx.auth.createSessionCookieHeader(user.id);
      const a = agent();
      (a as unknown as CookieJarHolder).jar.setCookies([`${header}; Path=/`], '127.0.0.1', '/');
      return a;
    },
    async buildUser(opts = {}) {
      const seq = nextSeq();
      const user: TestUser = {
        id: `user-${seq}`,
        email: (opts.email ?? `person-${seq}@example.com`).toLowerCase(),
        name: opts.name ?? `Person ${seq}`,
        password: opts.password ?? DEFAULT_TEST_PASSWORD,
        isAdmin: opts.isAdmin ?? false,
      };
      const now = new Date().toISOString();
      await ctx.db
        .insertInto('users')
        .values({
          id: user.id,
          email: user.email,
          name: user.name,
          password_hash: await cachedHash(user.password),
          is_admin: user.isAdmin ? 1 : 0,
          disabled_at: null,
          password_changed_at: now,
          created_at: now,
        })
        .execute();
      return user;
    },
    async buildMatter(opts = {}) {
      const lead = opts.lead ?? (await testApp.buildUser());
      const seq = ++sequence;
      const name = opts.name ?? `Matter ${process.pid}-${seq}`;
      const controlPrefix =
        opts.controlPrefix ?? `T${seq.toString(36).toUpperCase().padStart(4, '0')}`;
      const matter = await createMatter(
        ctx.db,
        { name, description: '', controlPrefix, lead: lead.id },
        { id: null, email: null, ip: null },
      );
      return { id: matter.id, name, controlPrefix, lead };
    },
    async addMember(matter, user, role) {
      await ctx.db
        .insertInto('matter_members')
        .values({
          matter_id: matter.id,
          user_id: user.id,
          role,
          granted_by: null,
          granted_at: new Date().toISOString(),
        })
        .onConflict((oc) => oc.columns(['matter_id', 'user_id']).doUpdateSet({ role }))
        .execute();
    },
    async signIn(a, email, password) {
      const response = await a.post('/api/auth/sign-in').send({ email, password });
      if (response.status !== 200) {
        throw new Error(
          `sign-in as ${email} failed: ${response.status} ${JSON.stringify(response.body)}`,
        );
      }
      return a;
    },
    async close() {
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await ctx.close();
      if (!options.dataDir) rmSync(dataDir, { recursive: true, force: true });
    },
  };
  return testApp;
}

export { SESSION_COOKIE };
