import { toDateOnly, toIso, toIsoRequired, toNumber } from '../sites/db-values';
import type { ListParams } from '../sites/list-query';
import { pageRows } from '../sites/list-query';
import type { SetupCtx } from '../sites/setup-context';
import { findInVisibleSite } from '../sites/site-access';
import type { EmissionUnitDto, UnitType } from './units.schemas';

export interface UnitRow {
  id: string;
  tenant_id: string;
  site_id: string;
  name: string;
  unit_type: UnitType;
  rated_thermal_input_mwth: string;
  in_service_from: Date | string;
  in_service_to: Date | string | null;
  version: number;
  created_at: Date;
  updated_at: Date;
  archived_at: Date | null;
}

export function toUnitDto(row: UnitRow, fuelIds: string[]): EmissionUnitDto {
  return {
    id: row.id,
    siteId: row.site_id,
    name: row.name,
    unitType: row.unit_type,
    ratedThermalInputMWth: toNumber(row.rated_thermal_input_mwth) as number,
    inServiceFrom: toDateOnly(row.in_service_from) as string,
    inServiceTo: toDateOnly(row.in_service_to),
    fuelIds,
    archivedAt: toIso(row.archived_at),
    version: row.version,
    createdAt: toIsoRequired(row.created_at),
    updatedAt: toIsoRequired(row.updated_at),
  };
}

export const findVisibleUnit = (ctx: SetupCtx, unitId: string) => findInVisibleSite<UnitRow>(ctx, 'emission_units', unitId);

export async function listUnitsOfSite(ctx: SetupCtx, siteId: string, params: ListParams) {
  const base = ctx.db('emission_units').where({ tenant_id: ctx.tenantId, site_id: siteId }).select('*');
  return pageRows<UnitRow>(base, params, {
    sortColumns: {
      name: 'name',
      unitType: 'unit_type',
      ratedThermalInputMWth: 'rated_thermal_input_mwth',
      inServiceFrom: 'in_service_from',
      createdAt: 'created_at',
    },
    searchColumns: ['name'],
    archivedColumn: 'archived_at',
    idColumn: 'id',
  });
}

/** fuel ids per unit, for many units at once */
export async function fuelIdsOfUnits(ctx: SetupCtx, unitIds: string[]): Promise<Map<string, string[]>> {
  const byUnit = new Map<string, string[]>(unitIds.map((id) => [id, []]));
  if (unitIds.length === 0) return byUnit;
  const rows = (await ctx
    .db('unit_fuels')
    .where({ tenant_id: ctx.tenantId })
    .whereIn('unit_id', unitIds)
    .orderBy('fuel_id')
    .select('unit_id', 'fuel_id')) as { unit_id: string; fuel_id: string }[];
  for (const r of rows) byUnit.get(r.unit_id)?.push(r.fuel_id);
  return byUnit;
}

export async function replaceUnitFuels(ctx: SetupCtx, unitId: string, fuelIds: string[]): Promise<void> {
  await ctx.db('unit_fuels').where({ tenant_id: ctx.tenantId, unit_id: unitId }).delete();
  if (fuelIds.length > 0) {
    await ctx
      .db('unit_fuels')
      .insert(fuelIds.map((fuelId) => ({ tenant_id: ctx.tenantId, unit_id: unitId, fuel_id: fuelId })));
  }
}
