import { join, resolve } from 'node:path';
import { z } from 'zod';
import { UPLOAD_DEFAULTS } from '../shared/limits';
import { DEFAULT_HEALTH_THRESHOLDS } from './engine/index';

/** Everything the server reads from the environment, validated once at start-up. */
export interface Config {
  port: number;
  /** First firm admin, created on an empty database when demo mode is off. */
  bootstrapAdmin: { email: string; password: string } | null;
  dataDir: string;
  dbFile: string;
  blobDir: string;
  tmpDir: string;
  /** nodemailer SMTP URL; when unset the app runs a local fake SMTP server (see server/mail). */
  smtpUrl: string | null;
  mailFrom: string;
  /** Demo mode (default on): seeds demo accounts; firm admins may read the dev mail page. */
  demoMode: boolean;
  /** Development mode (`npm run dev`): the dev mail page is open to anyone. */
  devMode: boolean;
  /** Origin users reach the app on (e.g. https://quarry.example.com); used for links and the CSRF check. */
  publicOrigin: string | null;
  /** Express "trust proxy" setting, so req.secure follows X-Forwarded-Proto behind a proxy. */
  trustProxy: boolean | number | string;
  /** Idle session lifetime; lucia extends a session used in the second half of its life. */
  sessionTtlHours: number;
  /** Absolute session lifetime: no extension passes created + this (ASVS 4.0.3 V3.3.2). */
  sessionMaxHours: number;
  invitationTtlDays: number;
  /** How long a temporary password set by a firm admin works (it must be changed at first sign-in). */
  temporaryPasswordHours: number;
  upload: {
    maxFileBytes: number;
    maxFilesPerRequest: number;
    maxRequestBytes: number;
    maxArchiveEntries: number;
    maxArchiveUnpackedBytes: number;
    maxArchiveDepth: number;
  };
  /** Share of folded-in documents above which a rebuild of the concept space is queued. */
  rebuildFoldInShare: number;
  /** Mean fold-in drift above which the index health view advises a rebuild. */
  rebuildDrift: number;
  /** Quiet logs (tests). */
  logLevel: string;
}

const int = (min: number) => z.coerce.number().int().min(min);
const flag = z
  .enum(['0', '1', 'true', 'false'])
  .transform((value) => value === '1' || value === 'true');

// One entry per variable: the variable's name is the key, so an error names it.
const envSchema = z.object({
  PORT: int(0).max(65535).default(3000),
  QUARRY_API_PORT: int(0).max(65535).default(3001),
  QUARRY_ADMIN_EMAIL: z.email().optional(),
  QUARRY_ADMIN_PASSWORD: z.string().min(12, 'must be at least 12 characters').optional(),
  QUARRY_DATA_DIR: z.string().min(1).default('./data'),
  SMTP_URL: z
    .string()
    .regex(/^smtps?:\/\//, 'must start with smtp:// or smtps://')
    .optional(),
  QUARRY_MAIL_FROM: z.string().min(3).default('Quarry <no-reply@quarry.example>'),
  QUARRY_DEMO: flag.default(true),
  QUARRY_DEV: flag.default(false),
  QUARRY_PUBLIC_ORIGIN: z
    .url()
    .transform((value) => new URL(value).origin)
    .optional(),
  QUARRY_TRUST_PROXY: z
    .string()
    .transform((value): boolean | number | string => {
      // "true" trusts every hop (only behind a proxy that overwrites X-Forwarded-*);
      // a number is the count of proxies in front of Quarry; anything else a subnet list.
      if (value === 'true') return true;
      if (value === 'false' || value === '0' || value === '') return false;
      return /^\d+$/.test(value) ? Number(value) : value;
    })
    .default(false),
  QUARRY_SESSION_TTL_HOURS: z.coerce
    .number()
    .positive()
    .max(24 * 90)
    .default(12),
  QUARRY_SESSION_MAX_HOURS: z.coerce
    .number()
    .positive()
    .max(24 * 365)
    .default(24 * 7),
  QUARRY_INVITATION_TTL_DAYS: z.coerce.number().positive().max(90).default(7),
  QUARRY_TEMPORARY_PASSWORD_HOURS: z.coerce
    .number()
    .positive()
    .max(24 * 30)
    .default(72),
  QUARRY_MAX_FILE_BYTES: int(1).default(UPLOAD_DEFAULTS.maxFileBytes),
  QUARRY_MAX_FILES_PER_REQUEST: int(1).default(UPLOAD_DEFAULTS.maxFilesPerRequest),
  QUARRY_MAX_REQUEST_BYTES: int(1).default(UPLOAD_DEFAULTS.maxRequestBytes),
  QUARRY_MAX_ARCHIVE_ENTRIES: int(1).default(UPLOAD_DEFAULTS.maxArchiveEntries),
  QUARRY_MAX_ARCHIVE_UNPACKED_BYTES: int(1).default(UPLOAD_DEFAULTS.maxArchiveUnpackedBytes),
  QUARRY_MAX_ARCHIVE_DEPTH: int(0).default(UPLOAD_DEFAULTS.maxArchiveDepth),
  QUARRY_REBUILD_FOLD_IN_SHARE: z.coerce.number().gt(0).max(1).default(0.1),
  QUARRY_REBUILD_DRIFT: z.coerce.number().gt(0).max(1).default(DEFAULT_HEALTH_THRESHOLDS.drift),
  QUARRY_LOG_LEVEL: z
    .enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'])
    .default('info'),
});

export class ConfigError extends Error {
  override name = 'ConfigError';
}

/** Reads and validates the environment; throws ConfigError naming the first bad variable. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  // Treat empty strings as unset, the way shells and .env files usually mean them.
  const present = Object.fromEntries(
    Object.entries(env).filter(([, value]) => value !== undefined && value !== ''),
  );
  const parsed = envSchema.safeParse(present);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const variable = String(issue.path[0] ?? 'environment');
    throw new ConfigError(
      `${variable}: ${issue.message} (got ${JSON.stringify(env[variable] ?? null)})`,
    );
  }
  const e = parsed.data;
  const dataDir = resolve(e.QUARRY_DATA_DIR);
  return {
    // `npm run dev` runs the API beside Vite on QUARRY_API_PORT (Vite proxies /api to it).
    port: e.QUARRY_DEV ? e.QUARRY_API_PORT : e.PORT,
    bootstrapAdmin:
      e.QUARRY_ADMIN_EMAIL && e.QUARRY_ADMIN_PASSWORD
        ? { email: e.QUARRY_ADMIN_EMAIL.toLowerCase(), password: e.QUARRY_ADMIN_PASSWORD }
        : null,
    dataDir,
    dbFile: join(dataDir, 'quarry.db'),
    blobDir: join(dataDir, 'blobs'),
    tmpDir: join(dataDir, 'tmp'),
    smtpUrl: e.SMTP_URL ?? null,
    mailFrom: e.QUARRY_MAIL_FROM,
    demoMode: e.QUARRY_DEMO,
    devMode: e.QUARRY_DEV,
    publicOrigin: e.QUARRY_PUBLIC_ORIGIN ?? null,
    trustProxy: e.QUARRY_TRUST_PROXY,
    sessionTtlHours: e.QUARRY_SESSION_TTL_HOURS,
    sessionMaxHours: e.QUARRY_SESSION_MAX_HOURS,
    invitationTtlDays: e.QUARRY_INVITATION_TTL_DAYS,
    temporaryPasswordHours: e.QUARRY_TEMPORARY_PASSWORD_HOURS,
    upload: {
      maxFileBytes: e.QUARRY_MAX_FILE_BYTES,
      maxFilesPerRequest: e.QUARRY_MAX_FILES_PER_REQUEST,
      maxRequestBytes: e.QUARRY_MAX_REQUEST_BYTES,
      maxArchiveEntries: e.QUARRY_MAX_ARCHIVE_ENTRIES,
      maxArchiveUnpackedBytes: e.QUARRY_MAX_ARCHIVE_UNPACKED_BYTES,
      maxArchiveDepth: e.QUARRY_MAX_ARCHIVE_DEPTH,
    },
    rebuildFoldInShare: e.QUARRY_REBUILD_FOLD_IN_SHARE,
    rebuildDrift: e.QUARRY_REBUILD_DRIFT,
    logLevel: e.QUARRY_LOG_LEVEL,
  };
}

/** Whether the dev-only pages (the fake mailbox) are served. */
export function devPagesEnabled(config: Config): boolean {
  return config.demoMode || config.devMode;
}

/**
 * Who may read the fake mailbox: anyone on the developer's own `npm run dev` server,
 * only firm admins in demo mode (its links are credentials), nobody otherwise.
 */
export function devMailboxAccess(config: Config): 'anyone' | 'firm-admins' | 'off' {
  if (config.devMode) return 'anyone';
  return config.demoMode ? 'firm-admins' : 'off';
}
