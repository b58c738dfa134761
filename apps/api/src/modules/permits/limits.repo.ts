import { toDateOnly, toIso, toIsoRequired, toNumber } from '../sites/db-values';
import type { ListParams } from '../sites/list-query';
import { pageRows } from '../sites/list-query';
import type { SetupCtx } from '../sites/setup-context';
import { whereSiteVisible } from '../sites/site-access';
import { limitSummary } from './limit-summary';
import type { Criterion, LimitDto, LimitUnit, Period, Pollutant } from './limits.schemas';

export interface LimitRow {
  id: string;
  tenant_id: string;
  permit_id: string;
  stack_id: string | null;
  unit_id: string | null;
  pollutant: Pollutant;
  elv: string;
  unit: LimitUnit;
  reference_o2_percent: string | null;
  ambient_o2_percent: string;
  basis: 'dry' | 'wet';
  period: Period;
  period_length: number | null;
  operating_periods_only: boolean;
  criterion: Criterion;
  confidence_interval_percent: string | null;
  near_miss_percent: string;
  correct_only_when_above: boolean;
  exclude_statuses: string[];
  min_data: Record<string, number> | null;
  effective_from: Date | string;
  effective_to: Date | string | null;
  version: number;
  created_at: Date;
  updated_at: Date;
  archived_at: Date | null;
}

export type LimitWithSite = LimitRow & { site_id: string };

export function toLimitDto(row: LimitRow): LimitDto {
  const fields = {
    pollutant: row.pollutant,
    elv: toNumber(row.elv) as number,
    unit: row.unit,
    referenceO2Percent: toNumber(row.reference_o2_percent),
    ambientO2Percent: toNumber(row.ambient_o2_percent) as number,
    basis: row.basis,
    period: row.period,
    periodLength: row.period_length,
    operatingPeriodsOnly: row.operating_periods_only,
    criterion: row.criterion,
    confidenceIntervalPercent: toNumber(row.confidence_interval_percent),
    correctOnlyWhenAbove: row.correct_only_when_above,
  };
  return {
    id: row.id,
    permitId: row.permit_id,
    stackId: row.stack_id,
    unitId: row.unit_id,
    ...fields,
    nearMissPercent: toNumber(row.near_miss_percent) as number,
    excludeStatuses: row.exclude_statuses,
    minValidHoursPerDay: row.min_data?.minValidHoursPerDay ?? null,
    minData: row.min_data,
    effectiveFrom: toDateOnly(row.effective_from) as string,
    effectiveTo: toDateOnly(row.effective_to),
    summary: limitSummary(fields),
    archivedAt: toIso(row.archived_at),
    version: row.version,
    createdAt: toIsoRequired(row.created_at),
    updatedAt: toIsoRequired(row.updated_at),
  };
}

export async function findVisibleLimit(ctx: SetupCtx, limitId: string): Promise<LimitWithSite | undefined> {
  const qb = ctx
    .db('permit_limits')
    .join('permits', 'permits.id', 'permit_limits.permit_id')
    .where({ 'permit_limits.tenant_id': ctx.tenantId, 'permit_limits.id': limitId })
    .first('permit_limits.*', 'permits.site_id');
  whereSiteVisible(qb, ctx, 'permits.site_id');
  return (await qb) as LimitWithSite | undefined;
}

const LIMIT_LIST = {
  sortColumns: { pollutant: 'pollutant', period: 'period', elv: 'elv', effectiveFrom: 'effective_from', createdAt: 'created_at' },
  searchColumns: ['pollutant'],
  archivedColumn: 'archived_at',
  idColumn: 'id',
};

export async function listLimitsOfPermit(ctx: SetupCtx, permitId: string, params: ListParams) {
  const base = ctx.db('permit_limits').where({ tenant_id: ctx.tenantId, permit_id: permitId }).select('*');
  return pageRows<LimitRow>(base, params, LIMIT_LIST);
}

export async function liveLimitsOfPermit(ctx: SetupCtx, permitId: string): Promise<LimitRow[]> {
  return (await ctx
    .db('permit_limits')
    .where({ tenant_id: ctx.tenantId, permit_id: permitId })
    .whereNull('archived_at')
    .orderBy(['pollutant', 'created_at', 'id'])) as LimitRow[];
}

/** Unit types and fuel kinds behind a limit's target, to pick default reference O2. */
export async function targetProfile(ctx: SetupCtx, target: { stackId?: string | null; unitId?: string | null }) {
  const unitIds = target.unitId
    ? [target.unitId]
    : ((await ctx.db('stack_units').where({ tenant_id: ctx.tenantId, stack_id: target.stackId }).pluck('unit_id')) as string[]);
  if (unitIds.length === 0) return { unitTypes: [] as string[], fuelKinds: [] as string[] };
  const unitTypes = (await ctx.db('emission_units').where({ tenant_id: ctx.tenantId }).whereIn('id', unitIds).distinct().pluck('unit_type')) as string[];
  const fuelKinds = (await ctx
    .db('unit_fuels as uf')
    .join('fuels as f', 'f.id', 'uf.fuel_id')
    .where({ 'uf.tenant_id': ctx.tenantId })
    .whereIn('uf.unit_id', unitIds)
    .distinct()
    .pluck('f.kind')) as string[];
  return { unitTypes, fuelKinds };
}
