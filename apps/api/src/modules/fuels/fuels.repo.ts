import { toDateOnly, toIso, toIsoRequired, toNumber } from '../sites/db-values';
import type { ListParams } from '../sites/list-query';
import { pageRows } from '../sites/list-query';
import type { SetupCtx } from '../sites/setup-context';
import { findInVisibleSite } from '../sites/site-access';
import type { AnalysisFigures } from './fuel-factors';
import type { FuelAnalysisDto, FuelDto, FuelKind, FuelType } from './fuels.schemas';

export interface FuelRow {
  id: string;
  tenant_id: string;
  site_id: string;
  name: string;
  fuel_type: FuelType;
  kind: FuelKind;
  version: number;
  created_at: Date;
  updated_at: Date;
  archived_at: Date | null;
}

export interface AnalysisRow {
  id: string;
  tenant_id: string;
  fuel_id: string;
  valid_from: Date | string;
  ultimate: Record<string, number> | null;
  composition: Record<string, number> | null;
  gcv_mj_per_kg: string | null;
  gcv_mj_per_nm3: string | null;
  gcv_source: 'measured' | 'correlation' | 'none';
  fd_dscf_per_mmbtu: string;
  fw_wscf_per_mmbtu: string | null;
  fc_scf_per_mmbtu: string;
  f_factor_source: 'computed' | 'method19_default';
  created_by: string | null;
  created_at: Date;
}

export function toAnalysisDto(row: AnalysisRow): FuelAnalysisDto {
  return {
    id: row.id,
    fuelId: row.fuel_id,
    validFrom: toDateOnly(row.valid_from) as string,
    ultimate: row.ultimate,
    composition: row.composition,
    gcvMJPerKg: toNumber(row.gcv_mj_per_kg),
    gcvMJPerNm3: toNumber(row.gcv_mj_per_nm3),
    gcvSource: row.gcv_source,
    fdDscfPerMMBtu: toNumber(row.fd_dscf_per_mmbtu) as number,
    fwWscfPerMMBtu: toNumber(row.fw_wscf_per_mmbtu),
    fcScfPerMMBtu: toNumber(row.fc_scf_per_mmbtu) as number,
    fFactorSource: row.f_factor_source,
    createdBy: row.created_by,
    createdAt: toIsoRequired(row.created_at),
  };
}

export function toFuelDto(row: FuelRow, current: AnalysisRow | undefined): FuelDto {
  return {
    id: row.id,
    siteId: row.site_id,
    name: row.name,
    fuelType: row.fuel_type,
    kind: row.kind,
    currentAnalysis: current ? toAnalysisDto(current) : null,
    archivedAt: toIso(row.archived_at),
    version: row.version,
    createdAt: toIsoRequired(row.created_at),
    updatedAt: toIsoRequired(row.updated_at),
  };
}

export const findVisibleFuel = (ctx: SetupCtx, fuelId: string) => findInVisibleSite<FuelRow>(ctx, 'fuels', fuelId);

export async function listFuelsOfSite(ctx: SetupCtx, siteId: string, params: ListParams) {
  const base = ctx.db('fuels').where({ tenant_id: ctx.tenantId, site_id: siteId }).select('*');
  return pageRows<FuelRow>(base, params, {
    sortColumns: { name: 'name', fuelType: 'fuel_type', kind: 'kind', createdAt: 'created_at' },
    searchColumns: ['name'],
    archivedColumn: 'archived_at',
    idColumn: 'id',
  });
}

/**
 * The analysis in force today for each fuel: the latest valid_from on or before today; a fuel
 * whose only analyses start in the future shows the earliest of them.
 */
export async function currentAnalyses(ctx: SetupCtx, fuelIds: string[]): Promise<Map<string, AnalysisRow>> {
  const byFuel = new Map<string, AnalysisRow>();
  if (fuelIds.length === 0) return byFuel;
  const rows = (await ctx
    .db('fuel_analyses')
    .where({ tenant_id: ctx.tenantId })
    .whereIn('fuel_id', fuelIds)
    .distinctOn('fuel_id')
    .orderBy([
      { column: 'fuel_id' },
      { column: ctx.db.raw('(valid_from <= current_date)') as unknown as string, order: 'desc' },
      { column: ctx.db.raw('CASE WHEN valid_from <= current_date THEN valid_from END') as unknown as string, order: 'desc', nulls: 'last' },
      { column: 'valid_from', order: 'asc' },
      { column: 'created_at', order: 'desc' },
    ])
    .select('*')) as AnalysisRow[];
  for (const r of rows) byFuel.set(r.fuel_id, r);
  return byFuel;
}

export async function listAnalysesOfFuel(ctx: SetupCtx, fuelId: string, params: ListParams) {
  const base = ctx.db('fuel_analyses').where({ tenant_id: ctx.tenantId, fuel_id: fuelId }).select('*');
  // analyses are never archived: `created_at` stands in so the shared filter has a column to test
  return pageRows<AnalysisRow>(base, { ...params, q: undefined, includeArchived: true }, {
    sortColumns: { validFrom: 'valid_from', createdAt: 'created_at' },
    searchColumns: [],
    archivedColumn: 'created_at',
    idColumn: 'id',
  });
}

export async function insertAnalysis(
  ctx: SetupCtx,
  fuelId: string,
  validFrom: string,
  figures: AnalysisFigures,
): Promise<AnalysisRow> {
  const [row] = (await ctx
    .db('fuel_analyses')
    .insert({
      tenant_id: ctx.tenantId,
      fuel_id: fuelId,
      valid_from: validFrom,
      ultimate: figures.ultimate ? JSON.stringify(figures.ultimate) : null,
      composition: figures.composition ? JSON.stringify(figures.composition) : null,
      gcv_mj_per_kg: figures.gcvMJPerKg,
      gcv_mj_per_nm3: figures.gcvMJPerNm3,
      gcv_source: figures.gcvSource,
      fd_dscf_per_mmbtu: figures.fdDscfPerMMBtu,
      fw_wscf_per_mmbtu: figures.fwWscfPerMMBtu,
      fc_scf_per_mmbtu: figures.fcScfPerMMBtu,
      f_factor_source: figures.fFactorSource,
      created_by: ctx.userId,
    })
    .returning('*')) as AnalysisRow[];
  return row;
}
