import type { ErrorRequestHandler, RequestHandler } from 'express';
import multer from 'multer';
import type { Logger } from 'pino';
import { JSON_BODY_LIMIT_BYTES } from '../../shared/limits';
import { HttpError, notFound } from './errors';

// multer's limit codes -> the Quarry setting that raises each limit.
const MULTER_LIMITS: Record<string, string> = {
  LIMIT_FILE_SIZE: 'QUARRY_MAX_FILE_BYTES',
  LIMIT_FILE_COUNT: 'QUARRY_MAX_FILES_PER_REQUEST',
  LIMIT_PART_COUNT: 'parts per request',
  LIMIT_FIELD_KEY: 'field name length',
  LIMIT_FIELD_VALUE: 'field value length',
  LIMIT_FIELD_COUNT: 'fields per request',
};

/** Maps anything thrown to an HttpError; unknown errors become a 500 without details. */
export function toHttpError(error: unknown): HttpError {
  if (error instanceof HttpError) return error;
  if (error instanceof multer.MulterError) {
    const limit = MULTER_LIMITS[error.code];
    if (limit)
      return new HttpError(
        'payload_too_large',
        `Upload too large: ${error.message} (${limit}).`,
        error.field ?? limit,
      );
    return new HttpError(
      'validation_failed',
      `${error.field ?? 'file'}: ${error.message}`,
      error.field ?? 'file',
    );
  }
  const e = error as { type?: string; status?: number; expose?: boolean; message?: string };
  // body-parser (express.json) errors carry a `type`.
  if (e?.type === 'entity.parse.failed') {
    return new HttpError('malformed_json', 'The request body is not valid JSON.', 'body');
  }
  if (e?.type === 'entity.too.large') {
    return new HttpError(
      'payload_too_large',
      `The JSON body is larger than ${JSON_BODY_LIMIT_BYTES} bytes.`,
      'body',
    );
  }
  if (e?.type === 'encoding.unsupported' || e?.type === 'charset.unsupported') {
    return new HttpError('unsupported_media_type', e.message ?? 'Unsupported body encoding.');
  }
  if (typeof e?.status === 'number' && e.status >= 400 && e.status < 500 && e.expose) {
    return new HttpError('validation_failed', e.message ?? 'Bad request.', undefined, e.status);
  }
  return new HttpError(
    'internal_error',
    'Something went wrong on the server. The error has been logged.',
  );
}

/** Every API error leaves as JSON {"error": {"code", "message", "field"?}}; never a stack trace. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (error, req, res, next) => {
    const httpError = toHttpError(error);
    if (httpError.status >= 500)
      logger.error({ err: error, method: req.method, url: req.originalUrl }, 'request failed');
    if (res.headersSent) return next(error);
    const body: { code: string; message: string; field?: string } = {
      code: httpError.code,
      message: httpError.message,
    };
    if (httpError.field) body.field = httpError.field;
    res.status(httpError.status).json({ error: body });
  };
}

/** JSON 404 for any /api path no route matched. */
export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(notFound(`API route ${req.method} ${req.baseUrl}${req.path}`));
};
