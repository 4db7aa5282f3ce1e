import { type ReactNode, createContext, useContext } from 'react';
import { type MatterPermission, type MatterRole, roleCan } from '@shared/roles';

/**
 * The current person's role on the matter being viewed, as the API returned it
 * (GET /api/matters/:matterId). The matter layout provides it; the UI hides what
 * the role may not do with the same table the server's policy module uses.
 */
const MatterRoleContext = createContext<MatterRole | null>(null);

export function MatterRoleProvider({ role, children }: { role: MatterRole; children: ReactNode }) {
  return <MatterRoleContext.Provider value={role}>{children}</MatterRoleContext.Provider>;
}

export function useMatterRole(): MatterRole | null {
  return useContext(MatterRoleContext);
}

export function useMatterPermission(permission: MatterPermission): boolean {
  return roleCan(useMatterRole(), permission);
}

/** Renders its children only when the current matter role holds `permission`. */
export function Can({
  permission,
  children,
  fallback = null,
}: {
  permission: MatterPermission;
  children: ReactNode;
  fallback?: ReactNode;
}) {
  return <>{useMatterPermission(permission) ? children : fallback}</>;
}
