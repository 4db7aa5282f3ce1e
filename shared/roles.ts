// Per-matter roles and the permissions each one grants (see docs/ARCHITECTURE.md).
// The server's policy module (server/policy) decides with this table, and the
// client reads the same table to hide what a role may not do.

export const MATTER_ROLES = ['lead', 'attorney', 'paralegal', 'reviewer'] as const;
export type MatterRole = (typeof MATTER_ROLES)[number];

export const ROLE_LABELS: Record<MatterRole, string> = {
  lead: 'Matter lead',
  attorney: 'Attorney',
  paralegal: 'Paralegal',
  reviewer: 'Reviewer',
};

export const MATTER_PERMISSIONS = [
  'matter.view',
  'documents.read',
  'documents.upload',
  'documents.organise',
  'documents.delete',
  'documents.code',
  'search.run',
  'searches.save',
  'codes.manage',
  'exports.create',
  'members.view',
  'members.manage',
  'audit.read',
  'index.view',
  'index.rebuild',
  'concepts.view',
  'concepts.label',
  'batches.manage',
  'qc.manage',
  'privilege_log.edit',
  'holds.manage',
  'documents.restore',
  'documents.purge',
  'documents.redact',
  'productions.manage',
  'passwords.manage',
  'relationships.manage',
  'ranking.train',
  'validation.view',
  'validation.run',
] as const;
export type MatterPermission = (typeof MATTER_PERMISSIONS)[number];

const everyone: MatterRole[] = ['lead', 'attorney', 'paralegal', 'reviewer'];

/** Which roles hold each matter permission. */
export const MATTER_POLICY: Record<MatterPermission, readonly MatterRole[]> = {
  'matter.view': everyone,
  'documents.read': everyone,
  'documents.upload': ['lead', 'paralegal'],
  'documents.organise': ['lead', 'paralegal'],
  'documents.delete': ['lead'],
  'documents.code': everyone,
  'search.run': everyone,
  'searches.save': ['lead', 'attorney'],
  'codes.manage': ['lead'],
  'exports.create': ['lead', 'attorney'],
  'members.view': ['lead'],
  'members.manage': ['lead'],
  'audit.read': ['lead'],
  'index.view': everyone,
  'index.rebuild': ['lead'],
  'concepts.view': ['lead', 'attorney'],
  'concepts.label': ['lead'],
  // Leads and attorneys cut and assign batches; anyone who codes works their own.
  'batches.manage': ['lead', 'attorney'],
  // Drawing QC samples and unlocking QC'd decisions is the lead's.
  'qc.manage': ['lead'],
  // The in-app privilege log: read and edit descriptions.
  'privilege_log.edit': ['lead', 'attorney'],
  // Legal holds and the trash: only the matter lead sets or releases a hold, restores a
  // deleted document or destroys it for good.
  'holds.manage': ['lead'],
  'documents.restore': ['lead'],
  'documents.purge': ['lead'],
  // Redactions are marked in review; they only take effect when a production burns them in.
  'documents.redact': everyone,
  'productions.manage': ['lead', 'attorney'],
  'passwords.manage': ['lead'],
  'relationships.manage': ['lead'],
  'ranking.train': ['lead', 'attorney'],
  'validation.view': ['lead', 'attorney'],
  'validation.run': ['lead'],
};

/** Firm-level permissions come from the account's admin flag, not from a matter role. */
export const FIRM_PERMISSIONS = ['admin.accounts', 'admin.matters'] as const;
export type FirmPermission = (typeof FIRM_PERMISSIONS)[number];

export function roleCan(
  role: MatterRole | null | undefined,
  permission: MatterPermission,
): boolean {
  return role != null && MATTER_POLICY[permission].includes(role);
}

export function permissionsOf(role: MatterRole): MatterPermission[] {
  return MATTER_PERMISSIONS.filter((permission) => roleCan(role, permission));
}
