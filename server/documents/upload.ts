// multipart/form-data uploads (RFC 7578) streamed by multer to a per-request temporary
// folder under <dataDir>/tmp; the folder is removed when the response is done.
import type { Request, RequestHandler } from 'express';
import multer from 'multer';
import type { AppContext } from '../context';
import { safeEntryPath } from '../extraction/archive';
import { payloadTooLarge, validationError } from '../http/errors';
import { makeTempDir, removeTempDir } from '../storage/temp-dirs';
import type { IncomingFile } from './ingest';

export const UPLOAD_FIELD = 'files';

declare module 'express-serve-static-core' {
  interface Request {
    uploadDir?: string;
  }
}

/** The file's path as the client gave it, made safe; its base name when the path is unsafe. */
export function uploadedPath(originalName: string): string {
  const normalised = originalName.replace(/\\/g, '/');
  const safe = safeEntryPath(normalised);
  if (safe) return safe;
  const base = normalised
    .split('/')
    .filter((p) => p && p !== '.' && p !== '..')
    .pop();
  return base || 'unnamed';
}

function describeMulterError(ctx: AppContext, error: multer.MulterError): Error {
  const { upload } = ctx.config;
  switch (error.code) {
    case 'LIMIT_FILE_SIZE':
      return payloadTooLarge(
        'QUARRY_MAX_FILE_BYTES',
        `file exceeds the size limit: ${error.field ?? 'a file'} is larger than ${upload.maxFileBytes} bytes`,
      );
    case 'LIMIT_FILE_COUNT':
      return payloadTooLarge(
        'QUARRY_MAX_FILES_PER_REQUEST',
        `more than ${upload.maxFilesPerRequest} files in one upload`,
      );
    case 'LIMIT_UNEXPECTED_FILE':
      return validationError(error.field ?? 'files', `files go in the field "${UPLOAD_FIELD}"`);
    default:
      return error;
  }
}

/**
 * busboy's parse errors ("Malformed part header", "Unexpected end of form", ...) mean
 * the request body is broken: a 400 with busboy's reason and a warning. Filesystem errors
 * (they carry an errno code such as ENOSPC) stay server errors.
 */
function malformedOrServerError(ctx: AppContext, req: Request, error: unknown): unknown {
  const code = (error as { code?: unknown } | null)?.code;
  if (!(error instanceof Error) || (typeof code === 'string' && /^E[A-Z]+$/.test(code)))
    return error;
  ctx.logger.warn(
    { url: req.originalUrl, reason: error.message },
    'upload refused: malformed multipart/form-data body',
  );
  return validationError(
    'files',
    `the multipart/form-data body is malformed (${error.message}); send the files again`,
  );
}

/** Middleware chain for POST /api/matters/:matterId/documents. */
export function uploadMiddleware(ctx: AppContext): RequestHandler[] {
  const { upload } = ctx.config;
  const storage = multer.diskStorage({
    // One folder per request, made once even when parts arrive before it exists.
    destination: (req, _file, callback) => {
      const holder = req as unknown as { uploadDirMade?: Promise<string> };
      holder.uploadDirMade ??= makeTempDir(ctx.config.dataDir, 'upload').then((dir) => {
        req.uploadDir = dir;
        return dir;
      });
      holder.uploadDirMade.then(
        (dir) => callback(null, dir),
        (error: Error) => callback(error, ''),
      );
    },
    // Stored under a counter, never under the client's name.
    filename: (req, _file, callback) => {
      const counter = ((req as unknown as { uploadCount?: number }).uploadCount ?? 0) + 1;
      (req as unknown as { uploadCount?: number }).uploadCount = counter;
      callback(null, `part-${counter}`);
    },
  });
  const parse = multer({
    storage,
    preservePath: true,
    defParamCharset: 'utf8',
    limits: {
      fileSize: upload.maxFileBytes,
      files: upload.maxFilesPerRequest,
      fields: 20,
      fieldSize: 64 * 1024,
      parts: upload.maxFilesPerRequest + 20,
    },
  }).array(UPLOAD_FIELD, upload.maxFilesPerRequest);

  const cleanup: RequestHandler = (req, res, next) => {
    const remove = () => {
      if (req.uploadDir)
        void removeTempDir(ctx.config.dataDir, req.uploadDir).catch(() => undefined);
    };
    res.on('close', remove);
    res.on('finish', remove);
    next();
  };
  const checkLength: RequestHandler = (req, _res, next) => {
    if (!req.is('multipart/form-data'))
      return next(
        validationError('files', 'send the files as multipart/form-data in the field "files"'),
      );
    const declared = Number(req.get('content-length') ?? 0);
    if (declared > upload.maxRequestBytes)
      return next(
        payloadTooLarge(
          'QUARRY_MAX_REQUEST_BYTES',
          `the upload is ${declared} bytes; at most ${upload.maxRequestBytes} bytes per request`,
        ),
      );
    next();
  };
  const run: RequestHandler = (req, res, next) => {
    parse(req, res, (error: unknown) => {
      if (error instanceof multer.MulterError) {
        // Stop reading the rest of the body: the answer is already known.
        return next(describeMulterError(ctx, error));
      }
      if (error) return next(malformedOrServerError(ctx, req, error));
      const files = (req.files as Express.Multer.File[] | undefined) ?? [];
      // A NUL cannot be part of a file name on any filesystem Quarry writes to (POSIX
      // "Filename"; Node's fs refuses it): the client's fault, not a server failure.
      const withNul = files.find((f) => f.originalname.includes('\0'));
      if (withNul) {
        ctx.logger.warn(
          { url: req.originalUrl, field: 'files' },
          'upload refused: a file name contains a NUL byte',
        );
        return next(
          validationError(
            'files',
            `the file name "${withNul.originalname.replace(/\0/g, '\\0')}" contains a NUL byte; rename the file and upload it again`,
          ),
        );
      }
      if (files.length === 0)
        return next(validationError('files', `choose at least one file (field "${UPLOAD_FIELD}")`));
      const total = files.reduce((sum, f) => sum + f.size, 0);
      if (total > upload.maxRequestBytes)
        return next(
          payloadTooLarge(
            'QUARRY_MAX_REQUEST_BYTES',
            `the files total ${total} bytes; at most ${upload.maxRequestBytes} bytes per request`,
          ),
        );
      next();
    });
  };
  return [cleanup, checkLength, run];
}

/** Removes the request's temporary folder (the blobs are stored by now). */
export async function removeUploadDir(ctx: AppContext, req: Request): Promise<void> {
  const dir = req.uploadDir;
  if (!dir) return;
  req.uploadDir = undefined;
  await removeTempDir(ctx.config.dataDir, dir).catch(() => undefined);
}

/** The uploaded files in the order they were sent. */
export function incomingFilesOf(files: Express.Multer.File[]): IncomingFile[] {
  return files.map((file) => ({
    filePath: file.path,
    relativePath: uploadedPath(file.originalname),
  }));
}
