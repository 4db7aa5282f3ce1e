import { z } from 'zod';
import { emailSchema, newPasswordSchema, personNameSchema, text, type PersonRef } from './common';

/**
 * POST /api/admin/users: a new account, either with a temporary password the admin hands
 * over, or (temporaryPassword omitted) with a one-time set-up link e-mailed to the person
 * (`${origin}/account-setup/<token>`, see shared/schemas/auth.ts), valid for the
 * invitation lifetime (7 days by default). A temporary password must pass the same
 * quality rules as any new one (shared/password-policy.ts), must be changed at first
 * sign-in (until then other routes answer 403 password_change_required) and stops
 * working after QUARRY_TEMPORARY_PASSWORD_HOURS (72 by default).
 */
export const createUserSchema = z.object({
  name: personNameSchema,
  email: emailSchema,
  temporaryPassword: newPasswordSchema.optional(),
  isAdmin: z.boolean({ error: 'must be true or false' }).default(false),
});
export type CreateUserReq = z.infer<typeof createUserSchema>;

export const userParams = z.object({ userId: text().min(1, 'is required') });
export type UserParams = z.infer<typeof userParams>;

/**
 * PATCH /api/admin/users/:userId. Disabling ends every session of the account at once
 * and refuses its sign-ins; an admin cannot disable or demote their own account.
 */
export const updateUserSchema = z
  .object({
    disabled: z.boolean({ error: 'must be true or false' }).optional(),
    isAdmin: z.boolean({ error: 'must be true or false' }).optional(),
  })
  .refine((value) => value.disabled !== undefined || value.isAdmin !== undefined, {
    error: 'give disabled or isAdmin',
  });
export type UpdateUserReq = z.infer<typeof updateUserSchema>;

export interface UpdateUserResponse {
  user: AdminUser;
}

/** A user id or an e-mail address naming an existing account. */
export const userRefSchema = text().trim().min(1, 'is required').max(254, 'is too long');

/** PUT /api/admin/matters/:matterId/lead */
export const appointLeadSchema = z.object({ lead: userRefSchema });
export type AppointLeadReq = z.infer<typeof appointLeadSchema>;

export interface AdminUser {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
  disabled: boolean;
  createdAt: string;
  matterCount: number;
}

export interface AdminUsersResponse {
  users: AdminUser[];
}

export interface CreateUserResponse {
  user: AdminUser;
  /** True when a set-up link was e-mailed (no temporary password given). */
  setupLinkSent: boolean;
}

export interface AdminMatter {
  id: number;
  name: string;
  description: string;
  controlPrefix: string;
  createdAt: string;
  leads: PersonRef[];
  memberCount: number;
}

export interface AdminMattersResponse {
  matters: AdminMatter[];
}

export interface AppointLeadResponse {
  matter: AdminMatter;
}
