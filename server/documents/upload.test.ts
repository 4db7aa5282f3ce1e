// Hostile multipart/form-data (RFC 7578) on the upload route: a NUL byte in a file name
// and malformed parts are the client's fault, so they get a 400 naming the problem and a
// warning in the log, never a 500 with a stack at error level. (RFC 7578 section 4.2
// carries the file name in Content-Disposition; a NUL cannot be part of a POSIX path,
// see POSIX.1-2017 "3.170 Filename".)
import { afterAll, beforeAll, describe, expect, test, vi } from 'vitest';
import { createTestApp, type Agent, type TestApp, type TestMatter } from '../../tests/helpers';

describe('malformed uploads', () => {
  let t: TestApp;
  let matter: TestMatter;
  let lead: Agent;
  beforeAll(async () => {
    t = await createTestApp();
    matter = await t.buildMatter();
    lead = await t.agentFor(matter.lead);
  });
  afterAll(() => t.close());

  const raw = (body: string, boundary = 'qb0undary') =>
    lead
      .post(`/api/matters/${matter.id}/documents`)
      .set('Content-Type', `multipart/form-data; boundary=${boundary}`)
      .send(Buffer.from(body, 'latin1'));

  function spyLogs() {
    const warn = vi.spyOn(t.ctx.logger, 'warn');
    const error = vi.spyOn(t.ctx.logger, 'error');
    return {
      warn,
      error,
      restore() {
        warn.mockRestore();
        error.mockRestore();
      },
    };
  }

  const part = (disposition: string) =>
    `--qb0undary\r\nContent-Disposition: form-data; name="files"; ${disposition}\r\n` +
    `Content-Type: text/plain\r\n\r\nhello\r\n--qb0undary--\r\n`;

  test.each([
    // RFC 7578 section 4.2 / RFC 5987 encoding: the name decodes to "memo\0.txt".
    ['percent-encoded in filename*', part(`filename*=UTF-8''memo%00.txt`), /contains a NUL byte/],
    // A raw NUL in the header itself: busboy refuses the part header.
    ['raw in the part header', part('filename="memo\u0000.txt"'), /malformed/],
  ])(
    'a NUL byte in a file name (%s): 400 naming the problem, a warning, nothing stored',
    async (_n, body, message) => {
      const logs = spyLogs();
      try {
        const response = await raw(body);
        expect(response.status).toBe(400);
        expect(response.body.error.code).toBe('validation_failed');
        expect(response.body.error.field).toBe('files');
        expect(response.body.error.message).toMatch(message);
        expect(logs.warn).toHaveBeenCalled();
        expect(logs.error).not.toHaveBeenCalled();
        const stored = await t.ctx.db
          .selectFrom('documents')
          .select('id')
          .where('matter_id', '=', matter.id)
          .execute();
        expect(stored).toEqual([]);
      } finally {
        logs.restore();
      }
    },
  );

  test.each([
    [
      'a part header without a blank line before the body',
      '--qb0undary\r\nContent-Disposition: form-data; name="files"; filename="a.txt"\r\nbroken',
    ],
    [
      'a body cut off before the closing boundary',
      '--qb0undary\r\nContent-Disposition: form-data; name="files"; filename="a.txt"\r\n\r\nhello',
    ],
  ])('%s: 400 with a message and a warning, no error-level stack', async (_name, body) => {
    const logs = spyLogs();
    try {
      const response = await raw(body);
      expect(response.status).toBe(400);
      expect(response.body.error.code).toBe('validation_failed');
      expect(response.body.error.message).toMatch(
        /^files: the multipart\/form-data body is malformed/,
      );
      expect(logs.warn).toHaveBeenCalled();
      expect(logs.error).not.toHaveBeenCalled();
    } finally {
      logs.restore();
    }
  });

  test('a well-formed upload still works after them', async () => {
    const response = await lead
      .post(`/api/matters/${matter.id}/documents`)
      .attach('files', Buffer.from('a plain memo'), 'memo.txt');
    expect(response.status).toBeLessThan(300);
  });
});
