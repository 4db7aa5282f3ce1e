import type { Response } from 'superagent';

/**
 * A supertest parser that keeps a response body as raw bytes (CSV with its byte-order mark,
 * zips, originals): `.buffer(true).parse(bytesBody)`, then `res.body as Buffer`.
 */
export function bytesBody(
  response: Response,
  done: (error: Error | null, body: Buffer) => void,
): void {
  const chunks: Buffer[] = [];
  response.on('data', (c: Buffer) => chunks.push(c));
  response.on('end', () => done(null, Buffer.concat(chunks)));
}
