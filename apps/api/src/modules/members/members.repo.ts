import type { Knex } from 'knex';
import type { Role } from '../../auth/permissions';
import { tables } from '../../lib/db';
import type { Member } from './members.schemas';

// Every query names the tenant itself; row-level security is the second wall, not the first.

function memberQuery(db: Knex, tenantId: string) {
  return db(`${tables.memberships} as m`)
    .join(`${tables.users} as u`, 'u.id', 'm.user_id')
    .where('m.tenant_id', tenantId)
    .select('m.user_id as userId', 'u.email', 'u.name', 'm.role', 'm.created_at as joinedAt');
}

export function listMembers(db: Knex, tenantId: string): Promise<Member[]> {
  return memberQuery(db, tenantId).orderBy([{ column: 'u.name' }, { column: 'u.email' }]);
}

/** One member, row-locked for the rest of the transaction when `forUpdate`. */
export function findMember(db: Knex, tenantId: string, userId: string, forUpdate = false): Promise<Member | undefined> {
  const query = memberQuery(db, tenantId).where('m.user_id', userId).first();
  return forUpdate ? query.forUpdate('m') : query;
}

/** Locks the organisation's admin memberships, so two concurrent demotions cannot remove the last admin. */
export async function lockAndCountAdmins(db: Knex, tenantId: string): Promise<number> {
  const rows = await db(tables.memberships).where({ tenant_id: tenantId, role: 'admin' }).forUpdate().select('user_id');
  return rows.length;
}

export async function updateRole(db: Knex, tenantId: string, userId: string, role: Role): Promise<void> {
  await db(tables.memberships).where({ tenant_id: tenantId, user_id: userId }).update({ role });
}

export async function deleteMember(db: Knex, tenantId: string, userId: string): Promise<void> {
  await db(tables.memberships).where({ tenant_id: tenantId, user_id: userId }).delete();
}
