import { z } from 'zod';
import { PASSWORD_MAX_LENGTH } from '../limits';
import { PASSWORD_SAME_AS_CURRENT } from '../password-policy';
import type { FirmPermission, MatterPermission, MatterRole } from '../roles';
import { emailSchema, newPasswordSchema, text } from './common';

/** POST /api/auth/sign-in. The password is not length-checked: stored passwords predate rules. */
export const signInSchema = z.object({
  email: emailSchema,
  password: text().min(1, 'is required').max(PASSWORD_MAX_LENGTH, 'is too long'),
});
export type SignInReq = z.infer<typeof signInSchema>;

/** POST /api/auth/password. Ends every session of the user, then starts a new one for this browser. */
export const changePasswordSchema = z
  .object({
    currentPassword: text().min(1, 'is required').max(PASSWORD_MAX_LENGTH, 'is too long'),
    newPassword: newPasswordSchema,
  })
  // The rest of the password rules need the dictionary: shared/password-policy.ts.
  .refine((value) => value.newPassword !== value.currentPassword, {
    path: ['newPassword'],
    error: PASSWORD_SAME_AS_CURRENT,
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
  /**
   * A firm admin set this account's password: until it is changed (POST
   * /api/auth/password) every other signed-in route answers 403 password_change_required.
   */
  passwordChangeRequired: boolean;
  firmPermissions: FirmPermission[];
  matters: MyMatter[];
}

/** The token of an account set-up link: 32 random bytes in base64url (43 characters). */
export const accountSetupParams = z.object({
  token: text().regex(/^[A-Za-z0-9_-]{43}$/, 'is not a valid set-up link'),
});
export type AccountSetupParams = z.infer<typeof accountSetupParams>;

/** GET /api/account-setup/:token (public): whose account the link sets up. */
export interface AccountSetupPreviewResponse {
  email: string;
  name: string;
  expiresAt: string;
}

/** POST /api/account-setup/:token: choose the password; signs the browser in (MeResponse). */
export const completeAccountSetupSchema = z.object({ password: newPasswordSchema });
export type CompleteAccountSetupReq = z.infer<typeof completeAccountSetupSchema>;
