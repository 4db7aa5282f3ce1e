// Authorization matrix over HTTP. For EVERY mounted API route and every kind of caller
// (each matter role, a signed-in non-member, a firm admin who is not a member, and an
// anonymous caller) the expected outcome comes from the table written out by hand in
// authorization-matrix.expected.ts (route -> who may call it), independent of the
// routes' own declarations and of policy.ts, and is checked against a real request. A
// route mounted without a declaration fails the inventory test, and a declared route
// without a row in the table fails by name, so new routes cannot go unchecked.
import { randomBytes } from 'node:crypto';
import type { Router } from 'express';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { FIRM_PERMISSIONS, MATTER_ROLES, type MatterRole } from '../../shared/roles';
import {
  createTestApp,
  type Agent,
  type TestApp,
  type TestMatter,
  type TestUser,
} from '../../tests/helpers';
import { MATTER_NOT_FOUND_MESSAGE } from '../http/errors';
import type { AnyRouteSpec } from '../http/route';
import { apiRoutes } from '../routes';
import { EXPECTED_ACCESS, type ExpectedAccess } from './authorization-matrix.expected';
import { decide, describeAccess, type Access } from './policy';
import { listMountedRoutes } from './route-inventory';

type Caller = MatterRole | 'non-member' | 'firm-admin' | 'anonymous';
const CALLERS: Caller[] = [...MATTER_ROLES, 'non-member', 'firm-admin', 'anonymous'];

type Outcome = 'allowed' | 401 | 403 | 404;

const TABLE_FILE = 'server/policy/authorization-matrix.expected.ts';
const routeKey = (spec: AnyRouteSpec) => `${spec.method.toUpperCase()} ${spec.path}`;

/** The outcome a caller gets under a row of the table (docs/ARCHITECTURE.md "Access rules"). */
function expectedOutcome(row: ExpectedAccess, caller: Caller): Outcome {
  if (row.kind === 'public') return 'allowed';
  if (caller === 'anonymous') return 401;
  if (row.kind === 'signed-in') return 'allowed';
  if (row.kind === 'firm-admin') return caller === 'firm-admin' ? 'allowed' : 403;
  if (caller === 'non-member' || caller === 'firm-admin') return 404;
  return row.roles.includes(caller) ? 'allowed' : 403;
}

function expectedRow(spec: AnyRouteSpec): ExpectedAccess {
  const row = EXPECTED_ACCESS[routeKey(spec)];
  if (!row)
    throw new Error(
      `${routeKey(spec)} has no row in ${TABLE_FILE}: add one saying who may call it`,
    );
  return row;
}

let t: TestApp;
let matter: TestMatter;
const users = {} as Record<Exclude<Caller, 'anonymous'>, TestUser>;

beforeAll(async () => {
  t = await createTestApp();
  users.lead = await t.buildUser();
  matter = await t.buildMatter({ lead: users.lead });
  for (const role of ['attorney', 'paralegal', 'reviewer'] as const) {
    users[role] = await t.buildUser();
    await t.addMember(matter, users[role], role);
  }
  users['non-member'] = await t.buildUser();
  users['firm-admin'] = await t.buildUser({ isAdmin: true });
  // A second matter where the outsider is a lead: membership elsewhere must not leak in.
  await t.buildMatter({ lead: users['non-member'] });
  // Routes addressed by another id (GET /api/jobs/:jobId) take their matter from it.
  const job = await t.ctx.db
    .insertInto('jobs')
    .values({
      matter_id: matter.id,
      kind: 'matrix-probe',
      status: 'succeeded',
      created_at: new Date().toISOString(),
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  targets = { matterId: matter.id, jobId: job.id };
});

interface Targets {
  matterId: number;
  jobId: number;
}
let targets: Targets;
const MISSING: Targets = { matterId: 987654, jobId: 987654 };

/** The 404 a non-member gets: "Matter not found." or, for { via: 'job' } rules, "Job not found.". */
function hiddenMessage(access: Access): string {
  const via =
    typeof access === 'object' && 'matter' in access ? (access as { via?: string }).via : undefined;
  return via ? `${via[0].toUpperCase()}${via.slice(1)} not found.` : MATTER_NOT_FOUND_MESSAGE;
}

afterAll(() => t?.close());

/** Fills path parameters: the test matter (and its job) for the scope ids, harmless unknown values otherwise. */
function urlFor(spec: AnyRouteSpec, ids: Targets): string {
  const path = spec.path.replace(/:(\w+)/g, (_m, name: string) => {
    if (name === 'matterId') return String(ids.matterId);
    if (name === 'jobId') return String(ids.jobId);
    if (name === 'token') return randomBytes(32).toString('base64url');
    if (name === 'userId') return 'no-such-user';
    return '999999';
  });
  return `/api${path}`;
}

async function callAs(caller: Caller, spec: AnyRouteSpec, ids: Targets = targets) {
  // A fresh session per request: some allowed calls (sign-out, password) end sessions.
  const agent: Agent = caller === 'anonymous' ? t.agent() : await t.agentFor(users[caller]);
  const url = urlFor(spec, ids);
  const request = agent[spec.method](url);
  return spec.method === 'get' ? request : request.send({});
}

describe('route inventory', () => {
  test('every mounted route was declared with an access rule (no undeclared routes)', () => {
    const mounted = listMountedRoutes(t.app);
    const undeclared = mounted.filter((route) => !route.spec && route.path !== '/{*splat}');
    expect(undeclared.map((route) => `${route.methods.join(',')} ${route.path}`)).toEqual([]);
    const mountedSpecs = new Set(mounted.map((route) => route.spec));
    for (const spec of apiRoutes)
      expect(mountedSpecs.has(spec), `${spec.method} ${spec.path}`).toBe(true);
  });

  test('the inventory notices a route mounted behind the declarations', async () => {
    const other = await createTestApp();
    try {
      (other.app.locals.apiRouter as Router).get('/rogue', (_req, res) => {
        res.json({ ok: true });
      });
      const undeclared = listMountedRoutes(other.app).filter(
        (route) => !route.spec && route.path !== '/{*splat}',
      );
      expect(undeclared.map((route) => route.path)).toEqual(['/rogue']);
    } finally {
      await other.close();
    }
  });

  test(`every declared route has a row in ${TABLE_FILE}, and every row a route`, () => {
    const declared = new Set(apiRoutes.map(routeKey));
    const missing = [...declared].filter((key) => !(key in EXPECTED_ACCESS));
    expect(missing, `routes with no row in ${TABLE_FILE}`).toEqual([]);
    const stale = Object.keys(EXPECTED_ACCESS).filter((key) => !declared.has(key));
    expect(stale, `rows in ${TABLE_FILE} for routes that do not exist`).toEqual([]);
  });

  test('matter-scoped rules sit on paths with the id they are scoped by', () => {
    for (const spec of apiRoutes) {
      if (typeof spec.access !== 'object' || !('matter' in spec.access)) continue;
      const via = (spec.access as { via?: string }).via ?? 'matter';
      expect(spec.path, `${spec.method} ${spec.path}`).toMatch(new RegExp(`:${via}Id(/|$)`));
    }
  });
});

describe('policy table spot checks (blueprint roles table)', () => {
  // From the blueprint: reviewers search, read and code but do not upload, export or
  // change access; paralegals upload; attorneys export; only the lead manages access,
  // rebuilds the index and deletes documents.
  test.each([
    ['reviewer', 'documents.upload', false],
    ['reviewer', 'exports.create', false],
    ['reviewer', 'members.manage', false],
    ['reviewer', 'documents.code', true],
    ['reviewer', 'search.run', true],
    ['paralegal', 'documents.upload', true],
    ['paralegal', 'exports.create', false],
    ['attorney', 'exports.create', true],
    ['attorney', 'documents.upload', false],
    ['attorney', 'members.manage', false],
    ['lead', 'members.manage', true],
    ['lead', 'index.rebuild', true],
    ['lead', 'documents.delete', true],
    ['paralegal', 'documents.delete', false],
  ] as const)('%s may %s: %s', (role, permission, allowed) => {
    expect(
      decide(
        { matter: permission },
        {
          kind: 'user',
          user: { id: 'u', email: 'e', name: 'n', isAdmin: false },
          matterRole: role,
        },
      ),
    ).toBe(allowed ? 'allow' : 'forbidden');
  });

  test('firm permissions belong to admins only, and an admin is a non-member of matters', () => {
    const admin = { id: 'a', email: 'a', name: 'a', isAdmin: true };
    for (const permission of FIRM_PERMISSIONS) {
      expect(decide({ firm: permission }, { kind: 'user', user: admin, matterRole: null })).toBe(
        'allow',
      );
      expect(
        decide(
          { firm: permission },
          { kind: 'user', user: { ...admin, isAdmin: false }, matterRole: null },
        ),
      ).toBe('forbidden');
    }
    expect(
      decide({ matter: 'documents.read' }, { kind: 'user', user: admin, matterRole: null }),
    ).toBe('not_found');
  });
});

describe.each(
  apiRoutes.map(
    (spec) =>
      [
        `${spec.method.toUpperCase()} /api${spec.path} [${describeAccess(spec.access)}]`,
        spec,
      ] as const,
  ),
)('%s', (_name, spec) => {
  // The callers of one route run concurrently (independent sessions); routes run in turn.
  test.concurrent.for(CALLERS)('as %s', async (caller, { expect }) => {
    const expected = expectedOutcome(expectedRow(spec), caller);
    const response = await callAs(caller, spec);
    const detail = `${caller} -> ${response.status} ${JSON.stringify(response.body)}`;
    // Refusals are JSON; an allowed file download (a CSV export) answers its own type.
    expect(response.headers['content-type'] ?? '', detail).toMatch(
      expected === 'allowed' ? /json|^text\/csv|^$/ : /json|^$/,
    );
    if (expected === 'allowed') {
      expect([401, 403], detail).not.toContain(response.status);
      expect(response.status, detail).toBeLessThan(500);
      expect(
        response.status === 404 && response.body?.error?.message === hiddenMessage(spec.access),
        detail,
      ).toBe(false);
    } else if (expected === 404) {
      expect(response.status, detail).toBe(404);
      expect(response.body.error, detail).toEqual({
        code: 'not_found',
        message: hiddenMessage(spec.access),
      });
    } else {
      expect(response.status, detail).toBe(expected);
      expect(response.body.error.code, detail).toBe(
        expected === 401 ? 'unauthenticated' : 'forbidden',
      );
    }
  });
});

describe('a non-member cannot tell a hidden matter from a missing one', () => {
  const matterRoutes = apiRoutes.filter(
    (spec) => typeof spec.access === 'object' && 'matter' in spec.access,
  );
  test.each(
    matterRoutes.map((spec) => [`${spec.method.toUpperCase()} ${spec.path}`, spec] as const),
  )('%s', async (_name, spec) => {
    const hidden = await callAs('non-member', spec);
    const missing = await callAs('lead', spec, MISSING);
    const leadAgent = await t.agentFor(users.lead);
    const malformedUrl = urlFor(spec, { matterId: -1, jobId: -1 }).replace('/-1', '/abc');
    const malformed = await leadAgent[spec.method](malformedUrl).send({});
    expect(missing.status).toBe(404);
    expect(hidden.body).toEqual(missing.body);
    expect(malformed.status).toBe(404);
    expect(malformed.body).toEqual(missing.body);
  });
});
