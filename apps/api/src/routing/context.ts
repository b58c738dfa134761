import type { Knex } from 'knex';
import type { Action, Role } from '../auth/permissions';

/** What a 'public' route's handler gets: no user, the pool itself. */
export interface PublicContext {
  kind: 'public';
  requestId: string;
  db: Knex;
}

/**
 * What an 'authenticated' route's handler gets: the signed-in user, inside a transaction scoped to
 * that user (app.user_id) and to the active organisation if any (app.tenant_id).
 */
export interface UserContext {
  kind: 'user';
  requestId: string;
  userId: string;
  organisationId: string | null;
  db: Knex.Transaction;
}

/**
 * What a tenant route's handler gets: the active organisation, the caller's role there and
 * permissions, inside a transaction whose row-level security is scoped to that organisation.
 * Repos still filter by `tenantId` themselves: RLS is the second wall.
 */
export interface TenantContext {
  kind: 'tenant';
  requestId: string;
  tenantId: string;
  userId: string;
  role: Role;
  permissions: ReadonlySet<Action>;
  db: Knex.Transaction;
}
