import type { Role } from '../../auth/permissions';
import { audit } from '../../lib/audit';
import { Conflict, NotFound } from '../../lib/errors';
import type { TenantContext } from '../../routing/context';
import type { Member } from './members.schemas';
import { deleteMember, findMember, listMembers, lockAndCountAdmins, updateRole } from './members.repo';

const memberNotFound = () => new NotFound('member_not_found', 'No such member in this organisation.');
const lastAdmin = () => new Conflict('last_admin', 'An organisation needs at least one admin.');

export async function list(ctx: TenantContext): Promise<{ items: Member[]; total: number }> {
  const items = await listMembers(ctx.db, ctx.tenantId);
  return { items, total: items.length };
}

export async function changeRole(ctx: TenantContext, userId: string, role: Role): Promise<Member> {
  const adminCount = await lockAndCountAdmins(ctx.db, ctx.tenantId);
  const member = await findMember(ctx.db, ctx.tenantId, userId, true);
  if (!member) throw memberNotFound();
  if (member.role === role) return member;
  if (member.role === 'admin' && adminCount <= 1) throw lastAdmin();
  await updateRole(ctx.db, ctx.tenantId, userId, role);
  await audit(ctx, { action: 'member.role_changed', entity: 'member', entityId: userId, before: { role: member.role }, after: { role } });
  return { ...member, role };
}

export async function remove(ctx: TenantContext, userId: string): Promise<void> {
  const adminCount = await lockAndCountAdmins(ctx.db, ctx.tenantId);
  const member = await findMember(ctx.db, ctx.tenantId, userId, true);
  if (!member) throw memberNotFound();
  if (member.role === 'admin' && adminCount <= 1) throw lastAdmin();
  await deleteMember(ctx.db, ctx.tenantId, userId);
  await audit(ctx, {
    action: 'member.removed',
    entity: 'member',
    entityId: userId,
    before: { email: member.email, name: member.name, role: member.role },
  });
}
