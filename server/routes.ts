import { adminRoutes } from './admin/router';
import { auditRoutes } from './audit/router';
import { authRoutes } from './auth/router';
import { devRoutes } from './dev/router';
import { documentRoutes } from './documents/router';
import type { AnyRouteSpec } from './http/route';
import { indexRoutes } from './indexing/router';
import { invitationRoutes } from './invitations/router';
import { jobRoutes } from './jobs/router';
import { matterRoutes } from './matters/router';
import { memberRoutes } from './members/router';

/**
 * Every API route, relative to /api. A feature adds its `xRoutes` array here (one line);
 * app.ts mounts them all and the authorization-matrix test enumerates them.
 */
export const apiRoutes: readonly AnyRouteSpec[] = [
  ...authRoutes,
  ...adminRoutes,
  ...matterRoutes,
  ...memberRoutes,
  ...invitationRoutes,
  ...auditRoutes,
  ...devRoutes,
  ...documentRoutes,
  ...jobRoutes,
  ...indexRoutes,
];
