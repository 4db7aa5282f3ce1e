// Audit actions, named here so the server records and the client labels the same
// strings. Later features append their actions (document.uploaded, search.run, ...).

export const AUDIT_ACTIONS = [
  'auth.sign_in',
  'auth.sign_in_failed',
  'auth.sign_out',
  'auth.password_changed',
  'invitation.sent',
  'invitation.accepted',
  'invitation.revoked',
  'member.granted',
  'member.role_changed',
  'member.revoked',
  'matter.created',
  'matter.lead_appointed',
  'user.created',
] as const;
export type AuditAction = (typeof AUDIT_ACTIONS)[number];

export const AUDIT_ACTION_LABELS: Record<AuditAction, string> = {
  'auth.sign_in': 'Signed in',
  'auth.sign_in_failed': 'Failed sign-in',
  'auth.sign_out': 'Signed out',
  'auth.password_changed': 'Changed password',
  'invitation.sent': 'Sent an invitation',
  'invitation.accepted': 'Accepted an invitation',
  'invitation.revoked': 'Revoked an invitation',
  'member.granted': 'Granted access',
  'member.role_changed': 'Changed a role',
  'member.revoked': 'Revoked access',
  'matter.created': 'Created the matter',
  'matter.lead_appointed': 'Appointed a lead',
  'user.created': 'Created an account',
};
