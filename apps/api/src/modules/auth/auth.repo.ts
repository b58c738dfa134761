import type { Knex } from 'knex';
import type { Role } from '../../auth/permissions';
import { tables } from '../../lib/db';

export interface UserRow {
  id: string;
  email: string;
  name: string;
}

export interface MembershipOrganisation {
  id: string;
  name: string;
  slug: string;
  role: Role;
}

/** The user's own row (the users policy lets a user see themself). */
export function findUser(db: Knex, userId: string): Promise<UserRow | undefined> {
  return db(tables.users).where({ id: userId }).whereNull('disabled_at').first('id', 'email', 'name');
}

/** Every organisation the user belongs to, by name. Needs app.user_id = userId (memberships_own_rows). */
export function listMemberships(db: Knex, userId: string): Promise<MembershipOrganisation[]> {
  return db(`${tables.memberships} as m`)
    .join(`${tables.organisations} as o`, 'o.id', 'm.tenant_id')
    .where('m.user_id', userId)
    .orderBy([{ column: 'o.name' }, { column: 'o.id' }])
    .select('o.id', 'o.name', 'o.slug', 'm.role');
}
