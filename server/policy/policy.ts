import type { RequestHandler } from 'express';
import {
  FIRM_PERMISSIONS,
  MATTER_PERMISSIONS,
  MATTER_ROLES,
  ROLE_LABELS,
  roleCan,
  type FirmPermission,
  type MatterPermission,
  type MatterRole,
} from '../../shared/roles';
import type { Db } from '../db/database';
import { forbidden, matterNotFound, notFound, unauthenticated } from '../http/errors';
import type { SessionUser } from '../http/request-context';
import { findJobMatterId, findMemberRole } from './queries';

// THE policy module: every permission decision in the server is made here, from
// the table in shared/roles.ts (which the client reads to hide what a role may not do).

/**
 * Who may call a route:
 * - 'public': anyone, signed in or not;
 * - 'signed-in': any valid session;
 * - { firm: P }: a firm permission, held by accounts with the admin flag;
 * - { matter: P }: a member of the route's :matterId whose role holds P. Non-members
 *   (firm admins included) get the same 404 as a matter that does not exist.
 * - { matter: P, via: 'job' }: the same rule for a route without :matterId whose matter is
 *   the one of its :jobId (GET /api/jobs/:jobId); unknown jobs and non-members get 404.
 */
export type Access =
  'public' | 'signed-in' | { firm: FirmPermission } | { matter: MatterPermission; via?: 'job' };

export type Principal =
  { kind: 'anonymous' } | { kind: 'user'; user: SessionUser; matterRole: MatterRole | null };

/** Firm permissions come from the admin flag; every firm permission belongs to admins. */
export function firmCan(user: SessionUser | null | undefined, permission: FirmPermission): boolean {
  return Boolean(user?.isAdmin) && FIRM_PERMISSIONS.includes(permission);
}

export type Decision = 'allow' | 'unauthenticated' | 'forbidden' | 'not_found';

/**
 * The pure decision for one access rule and one principal (the matter role, if any, is
 * that principal's role on the route's matter). The HTTP middleware and the
 * authorization-matrix test both use this function.
 */
export function decide(access: Access, principal: Principal): Decision {
  if (access === 'public') return 'allow';
  if (principal.kind === 'anonymous') return 'unauthenticated';
  if (access === 'signed-in') return 'allow';
  if ('firm' in access) return firmCan(principal.user, access.firm) ? 'allow' : 'forbidden';
  if (principal.matterRole === null) return 'not_found';
  return roleCan(principal.matterRole, access.matter) ? 'allow' : 'forbidden';
}

export function isMatterAccess(access: Access): access is { matter: MatterPermission } {
  return typeof access === 'object' && 'matter' in access;
}

/** Describes an access rule for docs and test names, e.g. "matter:documents.upload". */
export function describeAccess(access: Access): string {
  if (typeof access === 'string') return access;
  if ('firm' in access) return `firm:${access.firm}`;
  return access.via ? `matter:${access.matter} (via ${access.via})` : `matter:${access.matter}`;
}

/** Throws when a declared access rule names a permission that does not exist. */
export function assertKnownAccess(access: Access, where: string): void {
  if (typeof access === 'string') {
    if (access === 'public' || access === 'signed-in') return;
  } else if ('firm' in access && FIRM_PERMISSIONS.includes(access.firm)) return;
  else if (
    'matter' in access &&
    MATTER_PERMISSIONS.includes(access.matter) &&
    (access.via === undefined || access.via === 'job')
  )
    return;
  throw new Error(`${where}: unknown access rule ${JSON.stringify(access)}`);
}

function parseMatterId(raw: unknown): number | null {
  if (typeof raw !== 'string' || !/^[1-9]\d{0,15}$/.test(raw)) return null;
  const id = Number(raw);
  return Number.isSafeInteger(id) ? id : null;
}

/** The matter of a job named by a route's :jobId (null when unknown or matter-less). */
async function matterOfJob(db: Db, raw: unknown): Promise<number | null> {
  const jobId = parseMatterId(raw);
  if (jobId === null) return null;
  return (await findJobMatterId(db, jobId))?.matter_id ?? null;
}

function asRole(value: string | undefined): MatterRole | null {
  return value !== undefined && (MATTER_ROLES as readonly string[]).includes(value)
    ? (value as MatterRole)
    : null;
}

/**
 * Express middleware enforcing one access rule. For matter rules the member's role is
 * read from the database on every request, so a revocation or role change applies to
 * the very next request; it is attached as req.matterAccess = { matterId, role }.
 */
export function requireAccess(db: Db, access: Access): RequestHandler {
  return async (req, _res, next) => {
    const user = req.auth?.user ?? null;
    let matterRole: MatterRole | null = null;
    let matterId: number | null = null;
    const viaJob = isMatterAccess(access) && access.via === 'job';
    if (isMatterAccess(access) && user) {
      matterId = viaJob
        ? await matterOfJob(db, req.params.jobId)
        : parseMatterId(req.params.matterId);
      if (matterId === null) return next(viaJob ? notFound('Job') : matterNotFound());
      matterRole = asRole(await findMemberRole(db, matterId, user.id));
    }
    const decision = decide(
      access,
      user ? { kind: 'user', user, matterRole } : { kind: 'anonymous' },
    );
    switch (decision) {
      case 'allow':
        if (matterId !== null && matterRole !== null)
          req.matterAccess = { matterId, role: matterRole };
        return next();
      case 'unauthenticated':
        return next(unauthenticated());
      case 'not_found':
        return next(viaJob ? notFound('Job') : matterNotFound());
      case 'forbidden':
        return next(forbidden(forbiddenMessage(access, matterRole)));
    }
  };
}

function forbiddenMessage(access: Access, role: MatterRole | null): string {
  if (typeof access === 'object' && 'firm' in access)
    return 'Only a firm administrator may do this.';
  if (typeof access === 'object' && 'matter' in access && role) {
    return `A ${ROLE_LABELS[role].toLowerCase()} on this matter may not do this (${access.matter}).`;
  }
  return 'You may not do this.';
}

/**
 * Deleting a document: a failed one may be removed by whoever may organise documents
 * (to clear a bad load); any other needs documents.delete (leads).
 */
export function assertCanDeleteDocument(role: MatterRole, extractStatus: string): void {
  assertMatterPermission(
    role,
    extractStatus === 'failed' ? 'documents.organise' : 'documents.delete',
  );
}

/** For services that must check a permission inside a handler (e.g. per-action rules). */
export function assertMatterPermission(role: MatterRole, permission: MatterPermission): void {
  if (!roleCan(role, permission)) throw forbidden(forbiddenMessage({ matter: permission }, role));
}
