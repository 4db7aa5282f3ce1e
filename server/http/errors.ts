import { STATUS_OF, type ErrorCode } from '../../shared/errors';

/**
 * An error the API reports to the client as `{"error": {"code", "message", "field"?}}`.
 * Throw it from a handler or service (Express 5 forwards rejected promises); the error
 * handler turns it into the response. `status` follows the code (shared/errors.ts).
 */
export class HttpError extends Error {
  override name = 'HttpError';
  readonly status: number;

  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly field?: string,
    status?: number,
  ) {
    super(message);
    this.status = status ?? STATUS_OF[code];
  }
}

export const validationError = (field: string, message: string) =>
  new HttpError('validation_failed', `${field}: ${message}`, field);

export const unauthenticated = (message = 'Sign in to continue.') =>
  new HttpError('unauthenticated', message);

export const forbidden = (message = 'Your role does not allow this.') =>
  new HttpError('forbidden', message);

/** 404 naming what was not found, e.g. notFound('Matter') -> "Matter not found." */
export const notFound = (what = 'Resource') => new HttpError('not_found', `${what} not found.`);

export const conflict = (message: string, field?: string) =>
  new HttpError('conflict', message, field);

/** 413 naming the limit that was exceeded and the setting that raises it. */
export const payloadTooLarge = (limitName: string, detail?: string) =>
  new HttpError(
    'payload_too_large',
    `Too large: ${limitName}${detail ? ` (${detail})` : ''}.`,
    limitName,
  );

export const rateLimited = (message: string) => new HttpError('rate_limited', message);

/** The 404 every non-member and every unknown matter gets, so the two are indistinguishable. */
export const MATTER_NOT_FOUND_MESSAGE = 'Matter not found.';
export const matterNotFound = () => new HttpError('not_found', MATTER_NOT_FOUND_MESSAGE);
