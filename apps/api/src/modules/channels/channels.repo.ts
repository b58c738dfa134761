import { toIso, toIsoRequired, toNumber } from '../sites/db-values';
import type { ListParams } from '../sites/list-query';
import { pageRows } from '../sites/list-query';
import type { SetupCtx } from '../sites/setup-context';
import { whereSiteVisible } from '../sites/site-access';
import type { ChannelDto, ChannelParameter, ChannelUnit } from './channels.schemas';

export interface ChannelRow {
  id: string;
  tenant_id: string;
  stack_id: string;
  parameter: ChannelParameter;
  unit: ChannelUnit;
  basis: 'wet' | 'dry';
  conditions: 'actual' | 'standard';
  range_min: string | null;
  range_max: string | null;
  interval_minutes: number;
  source_label: string | null;
  version: number;
  created_at: Date;
  updated_at: Date;
  archived_at: Date | null;
}

/** A channel row together with the site of its stack (visibility and same-site checks need it). */
export type ChannelWithSite = ChannelRow & { site_id: string };

export function toChannelDto(row: ChannelRow): ChannelDto {
  return {
    id: row.id,
    stackId: row.stack_id,
    parameter: row.parameter,
    unit: row.unit,
    basis: row.basis,
    conditions: row.conditions,
    rangeMin: toNumber(row.range_min),
    rangeMax: toNumber(row.range_max),
    intervalMinutes: row.interval_minutes,
    sourceLabel: row.source_label,
    archivedAt: toIso(row.archived_at),
    version: row.version,
    createdAt: toIsoRequired(row.created_at),
    updatedAt: toIsoRequired(row.updated_at),
  };
}

export async function findVisibleChannel(ctx: SetupCtx, channelId: string): Promise<ChannelWithSite | undefined> {
  const qb = ctx
    .db('channels')
    .join('stacks', 'stacks.id', 'channels.stack_id')
    .where({ 'channels.tenant_id': ctx.tenantId, 'channels.id': channelId })
    .first('channels.*', 'stacks.site_id');
  whereSiteVisible(qb, ctx, 'stacks.site_id');
  return (await qb) as ChannelWithSite | undefined;
}

const CHANNEL_LIST = {
  sortColumns: {
    parameter: 'parameter',
    unit: 'unit',
    basis: 'basis',
    intervalMinutes: 'interval_minutes',
    createdAt: 'created_at',
  },
  searchColumns: ['parameter', 'source_label'],
  archivedColumn: 'archived_at',
  idColumn: 'id',
};

export async function listChannelsOfStack(ctx: SetupCtx, stackId: string, params: ListParams) {
  const base = ctx.db('channels').where({ tenant_id: ctx.tenantId, stack_id: stackId }).select('*');
  return pageRows<ChannelRow>(base, params, CHANNEL_LIST);
}

/** Live channels of many stacks at once, ordered by parameter. */
export async function liveChannelsOfStacks(ctx: SetupCtx, stackIds: string[]): Promise<Map<string, ChannelRow[]>> {
  const byStack = new Map<string, ChannelRow[]>(stackIds.map((id) => [id, []]));
  if (stackIds.length === 0) return byStack;
  const rows = (await ctx
    .db('channels')
    .where({ tenant_id: ctx.tenantId })
    .whereIn('stack_id', stackIds)
    .whereNull('archived_at')
    .orderBy(['parameter', 'basis', 'id'])
    .select('*')) as ChannelRow[];
  for (const r of rows) byStack.get(r.stack_id)?.push(r);
  return byStack;
}
