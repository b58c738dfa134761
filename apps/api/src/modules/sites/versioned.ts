/**
 * Optimistic concurrency and archiving for the set-up tables: every mutable row carries
 * `version`; an update names the version it was based on and fails with 409 when the row moved on.
 */
import type { SetupCtx } from './setup-context';
import { conflict, staleVersion } from './setup-context';

/** Updates one row if it still has `expectedVersion`; bumps version and updated_at. */
export async function updateVersioned<Row>(
  ctx: SetupCtx,
  table: string,
  id: string,
  expectedVersion: number,
  patch: Record<string, unknown>,
  entity: string,
): Promise<Row> {
  const rows = (await ctx
    .db(table)
    .where({ tenant_id: ctx.tenantId, id, version: expectedVersion })
    .update({ ...patch, version: ctx.db.raw('version + 1'), updated_at: ctx.db.fn.now() })
    .returning('*')) as Row[];
  if (rows.length === 0) throw staleVersion(entity);
  return rows[0];
}

/** Sets archived_at (once); archiving an archived row changes nothing and returns it. */
export async function archiveRow<Row extends { archived_at: unknown }>(
  ctx: SetupCtx,
  table: string,
  current: Row & { id: string },
): Promise<Row> {
  if (current.archived_at) return current;
  const rows = (await ctx
    .db(table)
    .where({ tenant_id: ctx.tenantId, id: current.id })
    .update({ archived_at: ctx.db.fn.now(), version: ctx.db.raw('version + 1'), updated_at: ctx.db.fn.now() })
    .returning('*')) as Row[];
  return rows[0];
}

/** Archived rows are history: they are read, not changed, and nothing new is added under them. */
export function assertLive(row: { archived_at: unknown }, entity: string): void {
  if (row.archived_at) throw conflict('archived', `The ${entity} is archived; it can be read but not changed`);
}

/** 409 when the body's version is not the row's (checked again atomically by updateVersioned). */
export function assertVersion(row: { version: number }, expected: number | undefined, entity: string): void {
  if (expected !== undefined && row.version !== expected) throw staleVersion(entity);
}
