import type { MatterRole } from '../../shared/roles';
import type { PersonRef } from '../../shared/schemas/common';
import type {
  ChangeRoleReq,
  GrantMemberReq,
  Member,
  MembersResponse,
  PendingInvitation,
} from '../../shared/schemas/members';
import { recordAudit } from '../audit/record';
import type { Db } from '../db/database';
import { conflict, HttpError, notFound } from '../http/errors';
import { findUserByEmail, findUserById } from '../users/queries';
import {
  countLeads,
  deleteMember,
  findMemberRow,
  insertMember,
  listMemberRows,
  listPendingInvitationRows,
  updateMemberRole,
  type MemberListRow,
  type PendingInvitationRow,
} from './queries';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

const person = (id: string | null, name: string | null, email: string | null): PersonRef | null =>
  id ? { id, name: name ?? '', email: email ?? '' } : null;

export function memberRowToMember(row: MemberListRow): Member {
  return {
    userId: row.user_id,
    name: row.name,
    email: row.email,
    role: row.role as MatterRole,
    grantedAt: row.granted_at,
    grantedBy: person(row.granted_by_id, row.granted_by_name, row.granted_by_email),
  };
}

export function invitationRowToPending(row: PendingInvitationRow): PendingInvitation {
  return {
    id: row.id,
    email: row.email,
    role: row.role as MatterRole,
    invitedBy: person(row.invited_by_id, row.invited_by_name, row.invited_by_email),
    createdAt: row.created_at,
    expiresAt: row.expires_at,
  };
}

export async function listMembers(db: Db, matterId: number): Promise<MembersResponse> {
  const members = await listMemberRows(db, matterId);
  const invitations = await listPendingInvitationRows(db, matterId, new Date().toISOString());
  return {
    members: members.map(memberRowToMember),
    invitations: invitations.map(invitationRowToPending),
  };
}

async function readMember(db: Db, matterId: number, userId: string): Promise<Member> {
  const row = (await listMemberRows(db, matterId)).find((member) => member.user_id === userId);
  if (!row) throw notFound('Member');
  return memberRowToMember(row);
}

const lastLead = () =>
  conflict('A matter must keep at least one lead: appoint another lead first.', 'role');

/** Grants an existing account a role on the matter. */
export async function grantMember(
  db: Db,
  matterId: number,
  input: GrantMemberReq,
  actor: Actor,
): Promise<Member> {
  const user = await findUserByEmail(db, input.email);
  if (!user)
    throw new HttpError(
      'not_found',
      'No account has this e-mail address; send an invitation instead.',
      'email',
    );
  await db.transaction().execute(async (trx) => {
    if (await findMemberRow(trx, matterId, user.id))
      throw conflict(`${user.email} is already a member of this matter.`, 'email');
    await insertMember(trx, { matterId, userId: user.id, role: input.role, grantedBy: actor.id });
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'member.granted',
      targetType: 'user',
      targetId: user.id,
      detail: { email: user.email, name: user.name, role: input.role },
    });
  });
  return readMember(db, matterId, user.id);
}

/** Changes a member's role; the last lead cannot be demoted. */
export async function changeRole(
  db: Db,
  matterId: number,
  userId: string,
  input: ChangeRoleReq,
  actor: Actor,
): Promise<Member> {
  await db.transaction().execute(async (trx) => {
    const member = await findMemberRow(trx, matterId, userId);
    if (!member) throw notFound('Member');
    if (member.role === input.role) return;
    if (member.role === 'lead' && (await countLeads(trx, matterId)) <= 1) throw lastLead();
    const account = await findUserById(trx, userId);
    await updateMemberRole(trx, matterId, userId, input.role);
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'member.role_changed',
      targetType: 'user',
      targetId: userId,
      // Who it was, so the log can still name them after they leave the matter.
      detail: { email: account?.email, name: account?.name, from: member.role, to: input.role },
    });
  });
  return readMember(db, matterId, userId);
}

/** Revokes a member's access; it applies to their very next request (policy reads roles fresh). */
export async function revokeMember(
  db: Db,
  matterId: number,
  userId: string,
  actor: Actor,
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const member = await findMemberRow(trx, matterId, userId);
    if (!member) throw notFound('Member');
    if (member.role === 'lead' && (await countLeads(trx, matterId)) <= 1) throw lastLead();
    const account = await findUserById(trx, userId);
    await deleteMember(trx, matterId, userId);
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'member.revoked',
      targetType: 'user',
      targetId: userId,
      detail: { email: account?.email, name: account?.name, role: member.role },
    });
  });
}
