/**
 * The one place where the set-up modules (sites, units, stacks, channels, fuels, permits) meet the
 * API foundation: the request context, the error constructors and the audit trail.
 */
import { audit as appendAudit } from '../../lib/audit';
import { Conflict, Forbidden, NotFound, Unprocessable, type ErrorDetail } from '../../lib/errors';
import type { TenantContext } from '../../routing/context';

/** What the set-up services need of a tenant request (seeds build one for the owner connection). */
export type SetupCtx = Pick<TenantContext, 'tenantId' | 'userId' | 'role' | 'db' | 'requestId'>;

export type FieldIssue = Pick<ErrorDetail, 'path' | 'message'>;

export const notFound = (entity: string): Error => new NotFound('not_found', `${entity} not found.`);
export const staleVersion = (entity: string): Error =>
  new Conflict('stale_version', `The ${entity} was changed by someone else. Reload it and apply your change again.`);
export const conflict = (code: string, message: string): Error => new Conflict(code, message);
export const unprocessable = (message: string, details: FieldIssue[]): Error =>
  new Unprocessable('unprocessable', message, details.map((d) => ({ location: 'body', ...d })));
export const forbidden = (message = 'You do not have permission to do this.'): Error => new Forbidden('forbidden', message);

/** Appends `<entity>.<verb>` with before/after to the audit trail, in the request's transaction. */
export async function audit(
  ctx: SetupCtx,
  verb: 'created' | 'updated' | 'archived' | 'members_replaced' | 'document_uploaded' | 'analysis_added',
  entity: string,
  entityId: string,
  before: unknown,
  after: unknown,
): Promise<void> {
  await appendAudit(ctx, { action: `${entity}.${verb}`, entity, entityId, before: before ?? null, after: after ?? null });
}
