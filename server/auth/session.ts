import { BetterSqlite3Adapter } from '@lucia-auth/adapter-sqlite';
import type SQLite from 'better-sqlite3';
import type { Request, RequestHandler, Response } from 'express';
import { Lucia, TimeSpan } from 'lucia';
import type { Config } from '../config';
import type { AuthState, SessionUser } from '../http/request-context';
import { PasswordThrottle } from './rate-limit';

// ALL lucia code lives in this module. Sessions are rows in `sessions`
// (id, user_id, expires_at in seconds) read through @lucia-auth/adapter-sqlite.

export const SESSION_COOKIE = 'quarry_session';

interface DatabaseUserAttributes {
  email: string;
  name: string;
  is_admin: number;
  disabled_at: string | null;
}

function createLucia(sqlite: SQLite.Database, config: Config) {
  return new Lucia(new BetterSqlite3Adapter(sqlite, { user: 'users', session: 'sessions' }), {
    // Idle timeout: lucia extends a session that is used in the second half of its
    // lifetime, so an active user stays signed in and an idle one is signed out.
    sessionExpiresIn: new TimeSpan(config.sessionTtlHours * 60, 'm'),
    sessionCookie: {
      name: SESSION_COOKIE,
      // Persistent cookie with Max-Age; Secure is decided per request (see cookieFor).
      expires: true,
      attributes: { sameSite: 'lax', secure: false, path: '/' },
    },
    getUserAttributes: (row) => ({
      email: row.email,
      name: row.name,
      isAdmin: row.is_admin === 1,
      disabled: row.disabled_at !== null,
    }),
  });
}

declare module 'lucia' {
  interface Register {
    Lucia: ReturnType<typeof createLucia>;
    DatabaseUserAttributes: DatabaseUserAttributes;
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

export function createAuth(sqlite: SQLite.Database, config: Config): Auth {
  const lucia = createLucia(sqlite, config);

  // HttpOnly and SameSite=Lax always (RFC 6265 section 4.1.2.6; SameSite per RFC 6265bis);
  // Secure when the request came over HTTPS, directly or via a trusted proxy
  // (X-Forwarded-Proto, see QUARRY_TRUST_PROXY).
  const serialize = (req: Request, cookie: ReturnType<typeof lucia.createBlankSessionCookie>) => {
    cookie.attributes.secure = req.secure;
    cookie.attributes.httpOnly = true;
    return cookie.serialize();
  };

  const middleware: RequestHandler = async (req, res, next) => {
    req.auth = null;
    const sessionId = lucia.readSessionCookie(req.headers.cookie ?? '');
    if (!sessionId) return next();
    const { session, user } = await lucia.validateSession(sessionId);
    if (!session || !user) {
      res.append('Set-Cookie', serialize(req, lucia.createBlankSessionCookie()));
      return next();
    }
    if (user.disabled) {
      await lucia.invalidateSession(session.id);
      res.append('Set-Cookie', serialize(req, lucia.createBlankSessionCookie()));
      return next();
    }
    if (session.fresh)
      res.append('Set-Cookie', serialize(req, lucia.createSessionCookie(session.id)));
    const sessionUser: SessionUser = {
      id: user.id,
      email: user.email,
      name: user.name,
      isAdmin: user.isAdmin,
    };
    const auth: AuthState = { user: sessionUser, sessionId: session.id };
    req.auth = auth;
    next();
  };

  return {
    async startSession(req, res, userId) {
      // A new id on every sign-in; the browser's previous session ends (session fixation,
      // OWASP Session Management Cheat Sheet, "Renew the Session ID After Any Privilege
      // Level Change").
      if (req.auth) await lucia.invalidateSession(req.auth.sessionId);
      const session = await lucia.createSession(userId, {});
      res.append('Set-Cookie', serialize(req, lucia.createSessionCookie(session.id)));
      return session.id;
    },
    async endSession(req, res) {
      if (req.auth) await lucia.invalidateSession(req.auth.sessionId);
      res.append('Set-Cookie', serialize(req, lucia.createBlankSessionCookie()));
    },
    endAllSessions: (userId) => lucia.invalidateUserSessions(userId),
    async createSessionCookieHeader(userId) {
      const session = await lucia.createSession(userId, {});
      return `${SESSION_COOKIE}=${session.id}`;
    },
    middleware,
    deleteExpiredSessions: () => lucia.deleteExpiredSessions(),
    throttle: new PasswordThrottle(),
  };
}
