import { toIso, toIsoRequired, toNumber } from '../sites/db-values';
import type { ListParams } from '../sites/list-query';
import { pageRows } from '../sites/list-query';
import type { SetupCtx } from '../sites/setup-context';
import { findInVisibleSite } from '../sites/site-access';
import type { StackDto } from './stacks.schemas';

export interface StackRow {
  id: string;
  tenant_id: string;
  site_id: string;
  name: string;
  height_m: string | null;
  diameter_m: string | null;
  version: number;
  created_at: Date;
  updated_at: Date;
  archived_at: Date | null;
}

export function toStackDto(row: StackRow, unitIds: string[]): StackDto {
  return {
    id: row.id,
    siteId: row.site_id,
    name: row.name,
    heightM: toNumber(row.height_m),
    diameterM: toNumber(row.diameter_m),
    unitIds,
    archivedAt: toIso(row.archived_at),
    version: row.version,
    createdAt: toIsoRequired(row.created_at),
    updatedAt: toIsoRequired(row.updated_at),
  };
}

export const findVisibleStack = (ctx: SetupCtx, stackId: string) => findInVisibleSite<StackRow>(ctx, 'stacks', stackId);

export async function listStacksOfSite(ctx: SetupCtx, siteId: string, params: ListParams) {
  const base = ctx.db('stacks').where({ tenant_id: ctx.tenantId, site_id: siteId }).select('*');
  return pageRows<StackRow>(base, params, {
    sortColumns: { name: 'name', heightM: 'height_m', createdAt: 'created_at' },
    searchColumns: ['name'],
    archivedColumn: 'archived_at',
    idColumn: 'id',
  });
}

export async function unitIdsOfStacks(ctx: SetupCtx, stackIds: string[]): Promise<Map<string, string[]>> {
  const byStack = new Map<string, string[]>(stackIds.map((id) => [id, []]));
  if (stackIds.length === 0) return byStack;
  const rows = (await ctx
    .db('stack_units')
    .where({ tenant_id: ctx.tenantId })
    .whereIn('stack_id', stackIds)
    .orderBy('unit_id')
    .select('stack_id', 'unit_id')) as { stack_id: string; unit_id: string }[];
  for (const r of rows) byStack.get(r.stack_id)?.push(r.unit_id);
  return byStack;
}

export async function replaceStackUnits(ctx: SetupCtx, stackId: string, unitIds: string[]): Promise<void> {
  await ctx.db('stack_units').where({ tenant_id: ctx.tenantId, stack_id: stackId }).delete();
  if (unitIds.length > 0) {
    await ctx
      .db('stack_units')
      .insert(unitIds.map((unitId) => ({ tenant_id: ctx.tenantId, stack_id: stackId, unit_id: unitId })));
  }
}
