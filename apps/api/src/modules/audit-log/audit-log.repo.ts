import type { Knex } from 'knex';
import { tables } from '../../lib/db';
import type { AuditLogEntry } from './audit-log.schemas';

export interface AuditLogFilter {
  limit: number;
  offset: number;
  entity?: string;
}

interface AuditRow {
  id: string;
  at: Date;
  actor_id: string | null;
  actor_name: string | null;
  actor_email: string | null;
  action: string;
  entity: string;
  entity_id: string | null;
  before: unknown;
  after: unknown;
}

export async function listAuditLog(db: Knex, tenantId: string, filter: AuditLogFilter): Promise<{ items: AuditLogEntry[]; total: number }> {
  const base = db(`${tables.auditLog} as a`).where('a.tenant_id', tenantId);
  if (filter.entity) base.where('a.entity', filter.entity);
  const [{ count }] = await base.clone().count<{ count: string }[]>({ count: '*' });
  const rows: AuditRow[] = await base
    .clone()
    .leftJoin(`${tables.users} as u`, 'u.id', 'a.actor_user_id')
    .orderBy('a.id', 'desc')
    .limit(filter.limit)
    .offset(filter.offset)
    .select('a.id', 'a.at', 'u.id as actor_id', 'u.name as actor_name', 'u.email as actor_email', 'a.action', 'a.entity', 'a.entity_id', 'a.before', 'a.after');
  const items = rows.map((row) => ({
    id: Number(row.id),
    at: row.at,
    actor: row.actor_id ? { id: row.actor_id, name: row.actor_name ?? '', email: row.actor_email ?? '' } : null,
    action: row.action,
    entity: row.entity,
    entityId: row.entity_id,
    before: row.before,
    after: row.after,
  }));
  return { items, total: Number(count) };
}
