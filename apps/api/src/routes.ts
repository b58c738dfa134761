import { auditLogRoutes } from './modules/audit-log/audit-log.routes';
import { authRoutes } from './modules/auth/auth.routes';
import { healthRoutes } from './modules/health/health.routes';
import { importsRoutes } from './modules/imports/imports.routes';
import { reviewRoutes } from './modules/review/review.routes';
import { membersRoutes } from './modules/members/members.routes';
import { channelsRoutes } from './modules/channels/channels.routes';
import { fuelsRoutes } from './modules/fuels/fuels.routes';
import { permitsRoutes } from './modules/permits/permits.routes';
import { sitesRoutes } from './modules/sites/sites.routes';
import { stacksRoutes } from './modules/stacks/stacks.routes';
import { unitsRoutes } from './modules/units/units.routes';
import { describeRoutes, type RouteSummary } from './routing/register-routes';
import type { AnyRoute } from './routing/route';

/** Every API route. A new module adds its `x.routes.ts` table here. */
export const apiRoutes: readonly AnyRoute[] = [...healthRoutes, ...authRoutes, ...membersRoutes, ...auditLogRoutes, ...sitesRoutes, ...unitsRoutes, ...stacksRoutes, ...channelsRoutes, ...fuelsRoutes, ...permitsRoutes, ...importsRoutes, ...reviewRoutes];

/** Method, path and permission of every registered route. */
export function listRoutes(): RouteSummary[] {
  return describeRoutes(apiRoutes);
}
