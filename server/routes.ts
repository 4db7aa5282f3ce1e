import { accountSetupRoutes } from './account-setup/router';
import { adminRoutes } from './admin/router';
import { auditRoutes } from './audit/router';
import { batchRoutes } from './batches/router';
import { codeRoutes } from './codes/router';
import { conceptRoutes } from './concepts/router';
import { authRoutes } from './auth/router';
import { devRoutes } from './dev/router';
import { exportRoutes } from './exports/router';
import { documentRoutes } from './documents/router';
import type { AnyRouteSpec } from './http/route';
import { indexRoutes } from './indexing/router';
import { invitationRoutes } from './invitations/router';
import { jobRoutes } from './jobs/router';
import { matterRoutes } from './matters/router';
import { memberRoutes } from './members/router';
import { qcRoutes } from './qc/router';
import { productionRoutes } from './productions/router';
import { redactionRoutes } from './redactions/router';
import { reviewRoutes } from './review/router';
import { savedSearchRoutes } from './saved-searches/router';
import { searchRoutes } from './search/router';
import { holdRoutes } from './holds/router';
import { trashRoutes } from './trash/router';
import { searchTermReportRoutes } from './search-term-report/router';
import { relationshipRoutes } from './relationships/router';
import { passwordRoutes } from './passwords/router';
import { prioritisedRoutes } from './prioritised/router';
import { validationRoutes } from './validation/router';

/**
 * Every API route, relative to /api. A feature adds its `xRoutes` array here (one line);
 * app.ts mounts them all and the authorization-matrix test enumerates them.
 */
export const apiRoutes: readonly AnyRouteSpec[] = [
  ...authRoutes,
  ...accountSetupRoutes,
  ...adminRoutes,
  ...matterRoutes,
  ...memberRoutes,
  ...invitationRoutes,
  ...auditRoutes,
  ...devRoutes,
  ...searchRoutes,
  ...codeRoutes,
  ...reviewRoutes,
  ...savedSearchRoutes,
  ...exportRoutes,
  ...documentRoutes,
  ...jobRoutes,
  ...indexRoutes,
  ...conceptRoutes,
  ...batchRoutes,
  ...qcRoutes,
  ...holdRoutes,
  ...trashRoutes,
  ...redactionRoutes,
  ...productionRoutes,
  ...searchTermReportRoutes,
  ...relationshipRoutes,
  ...passwordRoutes,
  ...prioritisedRoutes,
  ...validationRoutes,
];
