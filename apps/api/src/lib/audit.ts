import type { TenantContext } from '../routing/context';
import { tables } from './db';

export interface AuditEntry {
  /** What happened, as `entity.verb_past` (e.g. `member.role_changed`). */
  action: string;
  /** The kind of thing changed (e.g. `member`, `site`). */
  entity: string;
  entityId?: string | null;
  before?: unknown;
  after?: unknown;
}

type AuditScope = Pick<TenantContext, 'tenantId' | 'userId' | 'requestId' | 'db'>;

/**
 * Appends one row to the tenant's audit trail inside the request's transaction, so the record
 * and the change commit or roll back together.
 */
export async function audit(ctx: AuditScope, entry: AuditEntry): Promise<void> {
  await ctx.db(tables.auditLog).insert({
    tenant_id: ctx.tenantId,
    actor_user_id: ctx.userId,
    action: entry.action,
    entity: entry.entity,
    entity_id: entry.entityId ?? null,
    before: entry.before === undefined ? null : JSON.stringify(entry.before),
    after: entry.after === undefined ? null : JSON.stringify(entry.after),
    request_id: ctx.requestId || null,
  });
}
