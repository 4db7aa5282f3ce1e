// Limits used by both the server's zod schemas and the client's inputs.

export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_MAX_LENGTH = 256;
export const NAME_MAX_LENGTH = 200;
export const EMAIL_MAX_LENGTH = 254; // RFC 5321 path limit, common practice for addresses
export const MATTER_NAME_MAX_LENGTH = 120;
export const CONTROL_PREFIX_PATTERN = /^[A-Z][A-Z0-9]{1,7}$/;
export const QUERY_MAX_LENGTH = 20_000;
export const JSON_BODY_LIMIT_BYTES = 256 * 1024;
export const SEARCH_PAGE_MAX = 500;
export const INVITATION_TTL_DAYS = 7;

/** Upload limits; the server reads overrides from QUARRY_MAX_* environment variables. */
export const UPLOAD_DEFAULTS = {
  maxFileBytes: 100 * 1024 * 1024,
  maxFilesPerRequest: 500,
  maxRequestBytes: 1024 * 1024 * 1024,
  maxArchiveEntries: 10_000,
  maxArchiveUnpackedBytes: 2 * 1024 * 1024 * 1024,
  maxArchiveDepth: 3,
} as const;
