import { defineRoute } from '../../routing/route';
import { listAuditLog } from './audit-log.repo';
import { AuditLogPage, AuditLogQuery } from './audit-log.schemas';

export const auditLogRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/audit-log',
    permission: 'audit:read',
    summary: "The active organisation's audit trail, newest first",
    query: AuditLogQuery,
    response: AuditLogPage,
    handler: ({ ctx, query }) => listAuditLog(ctx.db, ctx.tenantId, query),
  }),
];
