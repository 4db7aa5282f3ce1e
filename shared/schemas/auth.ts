import { z } from 'zod';
import { PASSWORD_MAX_LENGTH } from '../limits';
import type { FirmPermission, MatterPermission, MatterRole } from '../roles';
import { emailSchema, newPasswordSchema, text } from './common';

/** POST /api/auth/sign-in. The password is not length-checked: stored passwords predate rules. */
export const signInSchema = z.object({
  email: emailSchema,
  password: text().min(1, 'is required').max(PASSWORD_MAX_LENGTH, 'is too long'),
});
export type SignInReq = z.infer<typeof signInSchema>;

/** POST /api/auth/password. Ends every session of the user, then starts a new one for this browser. */
export const changePasswordSchema = z.object({
  currentPassword: text().min(1, 'is required').max(PASSWORD_MAX_LENGTH, 'is too long'),
  newPassword: newPasswordSchema,
});
export type ChangePasswordReq = z.infer<typeof changePasswordSchema>;

export interface ApiUser {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
}

/** One of my matters, with my role and what it lets me do. */
export interface MyMatter {
  id: number;
  name: string;
  controlPrefix: string;
  role: MatterRole;
  permissions: MatterPermission[];
}

/** GET /api/auth/me, and the body of a successful sign-in or password change. */
export interface MeResponse {
  user: ApiUser;
  firmPermissions: FirmPermission[];
  matters: MyMatter[];
}
