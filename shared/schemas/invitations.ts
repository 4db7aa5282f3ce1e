import { z } from 'zod';
import { PASSWORD_MAX_LENGTH } from '../limits';
import type { MatterRole } from '../roles';
import type { ApiUser } from './auth';
import {
  emailSchema,
  idSchema,
  newPasswordSchema,
  personNameSchema,
  roleSchema,
  text,
} from './common';
import type { PendingInvitation } from './members';

/** POST /api/matters/:matterId/invitations: e-mails a one-time link `${origin}/invitations/<token>`. */
export const createInvitationSchema = z.object({ email: emailSchema, role: roleSchema });
export type CreateInvitationReq = z.infer<typeof createInvitationSchema>;

export interface CreateInvitationResponse {
  invitation: PendingInvitation;
}

export const invitationParams = z.object({ matterId: idSchema, id: idSchema });
export type InvitationParams = z.infer<typeof invitationParams>;

/** The token from the link: 32 random bytes in base64url (43 characters). */
export const invitationTokenParams = z.object({
  token: text().regex(/^[A-Za-z0-9_-]{43}$/, 'is not a valid invitation token'),
});
export type InvitationTokenParams = z.infer<typeof invitationTokenParams>;

/** GET /api/invitations/:token (public). */
export interface InvitationPreviewResponse {
  matterName: string;
  role: MatterRole;
  email: string;
  invitedBy: string | null;
  expiresAt: string;
  /** True when an account with this e-mail exists: accept with that account's password (or signed in as it). */
  accountExists: boolean;
}

/**
 * POST /api/invitations/:token/accept.
 * - New account: name and password (at least 12 characters) are required.
 * - Existing account: signed in as that account, nothing is required; otherwise that
 *   account's password. `name` is ignored.
 * Success signs the browser in as the invited account.
 */
export const acceptInvitationSchema = z.object({
  name: personNameSchema.optional(),
  password: text().max(PASSWORD_MAX_LENGTH, 'is too long').optional(),
});
export type AcceptInvitationReq = z.infer<typeof acceptInvitationSchema>;

/** Same rules as the password of a new account (checked when the account is created). */
export const invitationNewPasswordSchema = newPasswordSchema;

export interface AcceptInvitationResponse {
  matterId: number;
  role: MatterRole;
  user: ApiUser;
  accountCreated: boolean;
}
