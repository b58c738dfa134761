import type { Knex } from 'knex';
import { permissionsFor } from '../../auth/permissions';
import { Forbidden, NotFound, Unauthorized } from '../../lib/errors';
import type { Me } from './auth.schemas';
import { findUser, listMemberships } from './auth.repo';

/**
 * Builds `Me` for a user, choosing `preferredOrganisationId` when the user is still a member there
 * and otherwise the first organisation by name. Runs in a transaction scoped to the user.
 */
export async function buildMe(db: Knex, userId: string, preferredOrganisationId: string | null): Promise<Me> {
  const user = await findUser(db, userId);
  if (!user) throw new Unauthorized();
  const organisations = await listMemberships(db, userId);
  const active = organisations.find((o) => o.id === preferredOrganisationId) ?? organisations[0];
  if (!active) throw new Forbidden('no_organisation', 'Your account is not a member of any organisation.');
  return {
    user: { id: user.id, email: user.email, name: user.name },
    organisation: { id: active.id, name: active.name, slug: active.slug },
    role: active.role,
    permissions: permissionsFor(active.role),
    organisations: organisations.map(({ id, name, slug, role }) => ({ id, name, slug, role })),
  };
}

/** Checks that the user belongs to the organisation (404 otherwise, also for ids that do not exist). */
export async function assertMember(db: Knex, userId: string, organisationId: string): Promise<void> {
  const organisations = await listMemberships(db, userId);
  if (!organisations.some((o) => o.id === organisationId)) throw new NotFound('organisation_not_found', 'Organisation not found.');
}
