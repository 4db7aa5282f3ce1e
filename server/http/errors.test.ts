// The API's error contract (docs/ARCHITECTURE.md "Errors"): every error is JSON
// {"error": {"code", "message", "field"?}} with the right status, never an HTML page or
// a stack trace. Status codes per RFC 9110 section 15.5 (400, 401, 403, 404, 409, 413)
// and RFC 6585 (429).
import multer from 'multer';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { z } from 'zod';
import { JSON_BODY_LIMIT_BYTES } from '../../shared/limits';
import { createTestApp, type Agent, type TestApp } from '../../tests/helpers';
import { apiRoutes } from '../routes';
import { defineRoute } from './route';

const probeRoutes = [
  defineRoute({
    method: 'post',
    path: '/test/echo',
    access: 'public',
    schemas: {
      body: z.object({
        count: z.number({ error: 'must be a number' }).int(),
        tags: z.array(z.string()).max(2),
      }),
      query: z.object({
        page: z.coerce.number({ error: 'must be a number' }).int().min(1).default(1),
      }),
    },
    summary: 'test-only echo',
    handler: ({ body, query }) => ({ body, query }),
  }),
  defineRoute({
    method: 'get',
    path: '/test/boom',
    access: 'public',
    summary: 'test-only crash',
    handler: () => {
      throw new Error('secret database path /var/lib/quarry.db exploded');
    },
  }),
  defineRoute({
    method: 'post',
    path: '/test/upload',
    access: 'public',
    middleware: () => [multer({ limits: { fileSize: 10, files: 1 } }).array('files')],
    summary: 'test-only upload',
    handler: () => ({ ok: true }),
  }),
];

let t: TestApp;
let agent: Agent;
beforeAll(async () => {
  t = await createTestApp({ routes: [...apiRoutes, ...probeRoutes] });
  agent = t.agent();
});
afterAll(() => t.close());

describe('request validation', () => {
  test('malformed JSON -> 400 malformed_json', async () => {
    const response = await agent
      .post('/api/auth/sign-in')
      .set('Content-Type', 'application/json')
      .send('{"email": ');
    expect(response.status).toBe(400);
    expect(response.headers['content-type']).toMatch(/application\/json/);
    expect(response.body).toEqual({
      error: {
        code: 'malformed_json',
        message: 'The request body is not valid JSON.',
        field: 'body',
      },
    });
  });

  test('a missing field is named', async () => {
    const response = await agent.post('/api/auth/sign-in').send({ password: 'x' });
    expect(response.status).toBe(400);
    expect(response.body).toEqual({
      error: { code: 'validation_failed', message: 'email: is required', field: 'email' },
    });
  });

  test('an empty body reports the first required field', async () => {
    const response = await agent.post('/api/auth/sign-in');
    expect(response.status).toBe(400);
    expect(response.body.error.field).toBe('email');
  });

  test('a wrong type is named', async () => {
    const response = await agent.post('/api/auth/sign-in').send({ email: 42, password: 'x' });
    expect(response.body).toEqual({
      error: { code: 'validation_failed', message: 'email: must be text', field: 'email' },
    });
    const invalid = await agent
      .post('/api/auth/sign-in')
      .send({ email: 'not-an-address', password: 'x' });
    expect(invalid.body.error).toEqual({
      code: 'validation_failed',
      message: 'email: must be an e-mail address',
      field: 'email',
    });
  });

  test('nested paths and query strings are named, and parsed values reach the handler', async () => {
    const nested = await agent.post('/api/test/echo').send({ count: 1, tags: ['a', 7] });
    expect(nested.status).toBe(400);
    expect(nested.body.error.field).toBe('tags.1');
    const query = await agent.post('/api/test/echo?page=zero').send({ count: 1, tags: [] });
    expect(query.body.error).toMatchObject({ code: 'validation_failed', field: 'page' });
    const ok = await agent
      .post('/api/test/echo?page=3')
      .send({ count: 2, tags: ['x'], extra: 'dropped' });
    expect(ok.status).toBe(200);
    expect(ok.body).toEqual({ body: { count: 2, tags: ['x'] }, query: { page: 3 } });
  });

  test('a JSON body over the limit -> 413 payload_too_large', async () => {
    const big = JSON.stringify({
      email: 'a@example.com',
      password: 'x'.repeat(JSON_BODY_LIMIT_BYTES),
    });
    const response = await agent
      .post('/api/auth/sign-in')
      .set('Content-Type', 'application/json')
      .send(big);
    expect(response.status).toBe(413);
    expect(response.body.error.code).toBe('payload_too_large');
    expect(response.body.error.message).toContain(String(JSON_BODY_LIMIT_BYTES));
  });

  test("multer's limits -> 413 naming the limit", async () => {
    const response = await agent
      .post('/api/test/upload')
      .attach('files', Buffer.from('more than ten bytes'), 'a.txt');
    expect(response.status).toBe(413);
    expect(response.body.error.code).toBe('payload_too_large');
    expect(response.body.error.message).toContain('QUARRY_MAX_FILE_BYTES');
    const tooMany = await agent
      .post('/api/test/upload')
      .attach('files', Buffer.from('a'), 'a.txt')
      .attach('files', Buffer.from('b'), 'b.txt');
    expect(tooMany.status).toBe(413);
    expect(tooMany.body.error.message).toContain('QUARRY_MAX_FILES_PER_REQUEST');
  });
});

describe('unknown routes and server errors', () => {
  test('an unknown /api route -> JSON 404, for any method', async () => {
    for (const method of ['get', 'post', 'delete'] as const) {
      const response = await agent[method]('/api/no/such/thing');
      expect(response.status).toBe(404);
      expect(response.headers['content-type']).toMatch(/application\/json/);
      expect(response.body.error).toEqual({
        code: 'not_found',
        message: `API route ${method.toUpperCase()} /api/no/such/thing not found.`,
      });
    }
  });

  test('an unexpected error -> 500 internal_error without stack or message details', async () => {
    const response = await agent.get('/api/test/boom');
    expect(response.status).toBe(500);
    expect(response.body.error.code).toBe('internal_error');
    expect(JSON.stringify(response.body)).not.toMatch(/secret|quarry\.db|at .*\.ts/);
  });

  test('security headers: CSP allows self only', async () => {
    const response = await agent.get('/api/auth/me');
    expect(response.headers['content-security-policy']).toContain("default-src 'self'");
    expect(response.headers['content-security-policy']).toContain("font-src 'self' data:");
    expect(response.headers['x-content-type-options']).toBe('nosniff');
    expect(response.headers['cache-control']).toBe('no-store');
  });
});

describe('client build', () => {
  test('serves dist/ with an SPA fallback, while /api stays JSON', async () => {
    const { mkdtempSync, writeFileSync } = await import('node:fs');
    const { tmpdir } = await import('node:os');
    const { join } = await import('node:path');
    const dist = mkdtempSync(join(tmpdir(), 'quarry-dist-'));
    writeFileSync(join(dist, 'index.html'), '<!doctype html><title>Quarry</title>');
    writeFileSync(join(dist, 'app.js'), 'console.log(1)');
    const withClient = await createTestApp({ distDir: dist });
    try {
      const deep = await withClient.agent().get('/matters/12/access');
      expect(deep.status).toBe(200);
      expect(deep.text).toContain('<title>Quarry</title>');
      expect((await withClient.agent().get('/app.js')).text).toBe('console.log(1)');
      const api = await withClient.agent().get('/api/unknown');
      expect(api.status).toBe(404);
      expect(api.body.error.code).toBe('not_found');
    } finally {
      await withClient.close();
    }
  });
});
