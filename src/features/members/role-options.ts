import { MATTER_ROLES, ROLE_LABELS } from '@shared/roles';

/** The matter roles as select options, in the roles table's order. */
export const roleOptions = MATTER_ROLES.map((role) => ({ value: role, label: ROLE_LABELS[role] }));
