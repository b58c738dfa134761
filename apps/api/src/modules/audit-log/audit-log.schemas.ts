import { z } from 'zod';
import { IsoDateTime, PageQuery } from '../../lib/schemas';

export const AuditLogQuery = PageQuery.extend({
  entity: z.string().trim().min(1).max(64).optional(),
});

export const AuditLogEntryDto = z.object({
  id: z.coerce.number().int(),
  at: IsoDateTime,
  actor: z.object({ id: z.string(), name: z.string(), email: z.string() }).nullable(),
  action: z.string(),
  entity: z.string(),
  entityId: z.string().nullable(),
  before: z.unknown(),
  after: z.unknown(),
});

export const AuditLogPage = z.object({ items: z.array(AuditLogEntryDto), total: z.number().int() });

export type AuditLogEntry = z.input<typeof AuditLogEntryDto>;
