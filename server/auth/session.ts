import { BetterSqlite3Adapter } from '@lucia-auth/adapter-sqlite';
import type SQLite from 'better-sqlite3';
import type { Request, RequestHandler, Response } from 'express';
import { Lucia, TimeSpan } from 'lucia';
import type { Config } from '../config';
import type { AuthState, SessionUser } from '../http/request-context';
import { PasswordThrottle } from './rate-limit';

// ALL lucia code lives in this module. Sessions are rows in `sessions`
// (id, user_id, expires_at and created_at in unix seconds) read through
// @lucia-auth/adapter-sqlite. Cookies are written here, not by lucia, because their name
// and Max-Age depend on the request (HTTPS) and on the session's absolute end.

export const SESSION_COOKIE = 'quarry_session';
/**
 * The name over HTTPS. The `__Host-` prefix makes the browser refuse the cookie unless it
 * is Secure, has Path=/ and no Domain, so no other host (a sibling subdomain) can plant
 * or overwrite it (RFC 6265bis section 4.1.3.2, "Cookie Name Prefixes").
 */
export const SECURE_SESSION_COOKIE = `__Host-${SESSION_COOKIE}`;

/** The session cookie's name for this request: prefixed over HTTPS, plain over http. */
export function sessionCookieName(req: Request): string {
  return req.secure ? SECURE_SESSION_COOKIE : SESSION_COOKIE;
}

interface DatabaseUserAttributes {
  email: string;
  name: string;
  is_admin: number;
  disabled_at: string | null;
  password_must_change: number;
}

interface DatabaseSessionAttributes {
  created_at: number;
}

function createLucia(sqlite: SQLite.Database, config: Config) {
  return new Lucia(new BetterSqlite3Adapter(sqlite, { user: 'users', session: 'sessions' }), {
    // Idle timeout: lucia extends a session that is used in the second half of its
    // lifetime, so an active user stays signed in and an idle one is signed out. The
    // middleware below caps every extension at the absolute lifetime.
    sessionExpiresIn: new TimeSpan(config.sessionTtlHours * 60, 'm'),
    getUserAttributes: (row) => ({
      email: row.email,
      name: row.name,
      isAdmin: row.is_admin === 1,
      disabled: row.disabled_at !== null,
      mustChangePassword: row.password_must_change === 1,
    }),
    getSessionAttributes: (row) => ({ createdAt: row.created_at }),
  });
}

declare module 'lucia' {
  interface Register {
    Lucia: ReturnType<typeof createLucia>;
    DatabaseUserAttributes: DatabaseUserAttributes;
    DatabaseSessionAttributes: DatabaseSessionAttributes;
  }
}

export interface Auth {
  /** Starts a session (ending the request's current one) and writes its cookie on the response. */
  startSession(req: Request, res: Response, userId: string): Promise<string>;
  /** Ends the request's session and clears its cookie. */
  endSession(req: Request, res: Response): Promise<void>;
  /** Ends every session of the user (password change, account disabled). */
  endAllSessions(userId: string): Promise<void>;
  /** Creates a session without a request (tests, CLI) and returns the Cookie header value. */
  createSessionCookieHeader(userId: string): Promise<string>;
  /** Reads the session cookie and sets req.auth (null when absent, expired or invalid). */
  middleware: RequestHandler;
  deleteExpiredSessions(): Promise<void>;
  /** Failed password checks of every kind, per account and client address (rate-limit.ts). */
  throttle: PasswordThrottle;
}

/** The value of cookie `name` in a Cookie header (RFC 6265 section 5.4), or null. */
function readCookie(header: string | undefined, name: string): string | null {
  for (const part of (header ?? '').split(';')) {
    const eq = part.indexOf('=');
    if (eq > 0 && part.slice(0, eq).trim() === name) return part.slice(eq + 1).trim() || null;
  }
  return null;
}

export function createAuth(sqlite: SQLite.Database, config: Config): Auth {
  const lucia = createLucia(sqlite, config);
  const absoluteMs = config.sessionMaxHours * 60 * 60 * 1000;
  const capExpiry = sqlite.prepare(
    'UPDATE sessions SET expires_at = ? WHERE id = ? AND expires_at > ?',
  );

  // HttpOnly and SameSite=Lax always (RFC 6265 section 4.1.2.6; SameSite per RFC 6265bis);
  // Secure and the __Host- name when the request came over HTTPS, directly or via a
  // trusted proxy (X-Forwarded-Proto, see QUARRY_TRUST_PROXY).
  const cookie = (req: Request, value: string, maxAgeSeconds: number) =>
    [
      `${sessionCookieName(req)}=${value}`,
      'Path=/',
      `Max-Age=${Math.max(0, Math.ceil(maxAgeSeconds))}`,
      'HttpOnly',
      'SameSite=Lax',
      ...(req.secure ? ['Secure'] : []),
    ].join('; ');
  const blank = (req: Request) => cookie(req, '', 0);

  /** Creates the row with its start time; the first expiry never passes the absolute end. */
  async function create(userId: string): Promise<{ id: string; expiresAt: number }> {
    const createdAt = Math.floor(Date.now() / 1000);
    const session = await lucia.createSession(userId, { created_at: createdAt });
    const end = createdAt + absoluteMs / 1000;
    const expiresAt = Math.min(Math.floor(session.expiresAt.getTime() / 1000), Math.floor(end));
    capExpiry.run(expiresAt, session.id, expiresAt);
    return { id: session.id, expiresAt };
  }

  const middleware: RequestHandler = async (req, res, next) => {
    req.auth = null;
    const sessionId = readCookie(req.headers.cookie, sessionCookieName(req));
    if (!sessionId) return next();
    const { session, user } = await lucia.validateSession(sessionId);
    if (!session || !user) {
      res.append('Set-Cookie', blank(req));
      return next();
    }
    // Absolute lifetime (OWASP ASVS 4.0.3 V3.3.2): however active, a session ends
    // sessionMaxHours after it began; the idle extension never reaches past that.
    const endSeconds = session.createdAt + absoluteMs / 1000;
    const nowSeconds = Date.now() / 1000;
    if (user.disabled || nowSeconds >= endSeconds) {
      await lucia.invalidateSession(session.id);
      res.append('Set-Cookie', blank(req));
      return next();
    }
    if (session.fresh) {
      // lucia just extended it by the idle lifetime: cut that back to the absolute end.
      const expires = Math.min(session.expiresAt.getTime() / 1000, Math.floor(endSeconds));
      capExpiry.run(Math.floor(expires), session.id, Math.floor(expires));
      res.append('Set-Cookie', cookie(req, session.id, expires - nowSeconds));
    }
    const sessionUser: SessionUser = {
      id: user.id,
      email: user.email,
      name: user.name,
      isAdmin: user.isAdmin,
    };
    const auth: AuthState = {
      user: sessionUser,
      sessionId: session.id,
      mustChangePassword: user.mustChangePassword,
    };
    req.auth = auth;
    next();
  };

  return {
    async startSession(req, res, userId) {
      // A new id on every sign-in; the browser's previous session ends (session fixation,
      // OWASP Session Management Cheat Sheet, "Renew the Session ID After Any Privilege
      // Level Change").
      if (req.auth) await lucia.invalidateSession(req.auth.sessionId);
      const session = await create(userId);
      res.append('Set-Cookie', cookie(req, session.id, session.expiresAt - Date.now() / 1000));
      return session.id;
    },
    async endSession(req, res) {
      if (req.auth) await lucia.invalidateSession(req.auth.sessionId);
      res.append('Set-Cookie', blank(req));
    },
    endAllSessions: (userId) => lucia.invalidateUserSessions(userId),
    async createSessionCookieHeader(userId) {
      const session = await create(userId);
      return `${SESSION_COOKIE}=${session.id}`;
    },
    middleware,
    deleteExpiredSessions: () => lucia.deleteExpiredSessions(),
    throttle: new PasswordThrottle(),
  };
}
