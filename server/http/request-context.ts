import type { MatterRole } from '../../shared/roles';

/** The signed-in person, as the session middleware attaches it (never a database row). */
export interface SessionUser {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
}

export interface AuthState {
  user: SessionUser;
  sessionId: string;
  /** A firm admin set this account's password: only changing it is allowed until then. */
  mustChangePassword: boolean;
}

/** Set by the policy middleware on every /api/matters/:matterId route: the caller's current role. */
export interface MatterAccess {
  matterId: number;
  role: MatterRole;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** null when the request carries no valid session. */
      auth: AuthState | null;
      matterAccess?: MatterAccess;
    }
  }
}
