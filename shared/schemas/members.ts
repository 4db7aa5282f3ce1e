import { z } from 'zod';
import type { MatterRole } from '../roles';
import { emailSchema, idSchema, roleSchema, text, type PersonRef } from './common';

export const memberParams = z.object({ matterId: idSchema, userId: text().min(1, 'is required') });
export type MemberParams = z.infer<typeof memberParams>;

/** POST /api/matters/:matterId/members: grant an existing account a role. */
export const grantMemberSchema = z.object({ email: emailSchema, role: roleSchema });
export type GrantMemberReq = z.infer<typeof grantMemberSchema>;

/** PATCH /api/matters/:matterId/members/:userId */
export const changeRoleSchema = z.object({ role: roleSchema });
export type ChangeRoleReq = z.infer<typeof changeRoleSchema>;

export interface Member {
  userId: string;
  name: string;
  email: string;
  role: MatterRole;
  grantedAt: string;
  grantedBy: PersonRef | null;
}

export interface PendingInvitation {
  id: number;
  email: string;
  role: MatterRole;
  invitedBy: PersonRef | null;
  createdAt: string;
  expiresAt: string;
}

/** GET /api/matters/:matterId/members: members and pending (unexpired, unused, unrevoked) invitations. */
export interface MembersResponse {
  members: Member[];
  invitations: PendingInvitation[];
}

export interface MemberResponse {
  member: Member;
}
