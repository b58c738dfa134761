import type { SetupCtx } from '../sites/setup-context';
import { audit, notFound, unprocessable } from '../sites/setup-context';
import { assertAllOnSite } from '../sites/site-access';
import type { ListParams } from '../sites/list-query';
import { datesInOrder } from '../sites/shared-schemas';
import { archiveRow, assertLive, assertVersion, updateVersioned } from '../sites/versioned';
import { findVisibleSite } from '../sites/sites.repo';
import type { EmissionUnitDto, CreateUnitBody, UpdateUnitBody } from './units.schemas';
import type { UnitRow } from './units.repo';
import { findVisibleUnit, fuelIdsOfUnits, listUnitsOfSite, replaceUnitFuels, toUnitDto } from './units.repo';

const ENTITY = 'emission_unit';

async function dto(ctx: SetupCtx, row: UnitRow): Promise<EmissionUnitDto> {
  const fuelIds = (await fuelIdsOfUnits(ctx, [row.id])).get(row.id) ?? [];
  return toUnitDto(row, fuelIds);
}

async function visibleUnit(ctx: SetupCtx, unitId: string): Promise<UnitRow> {
  const row = await findVisibleUnit(ctx, unitId);
  if (!row) throw notFound('Emission unit');
  return row;
}

export async function listUnits(ctx: SetupCtx, siteId: string, params: ListParams) {
  if (!(await findVisibleSite(ctx, siteId))) throw notFound('Site');
  const { rows, total } = await listUnitsOfSite(ctx, siteId, params);
  const fuelIds = await fuelIdsOfUnits(ctx, rows.map((r) => r.id));
  return { items: rows.map((r) => toUnitDto(r, fuelIds.get(r.id) ?? [])), total };
}

export async function getUnit(ctx: SetupCtx, unitId: string): Promise<EmissionUnitDto> {
  return dto(ctx, await visibleUnit(ctx, unitId));
}

export async function createUnit(ctx: SetupCtx, siteId: string, body: CreateUnitBody): Promise<EmissionUnitDto> {
  const site = await findVisibleSite(ctx, siteId);
  if (!site) throw notFound('Site');
  assertLive(site, 'site');
  await assertAllOnSite(ctx, 'fuels', siteId, body.fuelIds, 'fuelIds', 'fuel');
  const [row] = (await ctx
    .db('emission_units')
    .insert({
      tenant_id: ctx.tenantId,
      site_id: siteId,
      name: body.name,
      unit_type: body.unitType,
      rated_thermal_input_mwth: body.ratedThermalInputMWth,
      in_service_from: body.inServiceFrom,
      in_service_to: body.inServiceTo ?? null,
    })
    .returning('*')) as UnitRow[];
  await replaceUnitFuels(ctx, row.id, [...new Set(body.fuelIds)]);
  const after = await dto(ctx, row);
  await audit(ctx, 'created', ENTITY, row.id, null, after);
  return after;
}

export async function updateUnit(ctx: SetupCtx, unitId: string, body: UpdateUnitBody): Promise<EmissionUnitDto> {
  const current = await visibleUnit(ctx, unitId);
  assertLive(current, 'emission unit');
  assertVersion(current, body.version, 'emission unit');
  const before = await dto(ctx, current);
  const inServiceFrom = body.inServiceFrom ?? before.inServiceFrom;
  const inServiceTo = body.inServiceTo === undefined ? before.inServiceTo : body.inServiceTo;
  if (!datesInOrder(inServiceFrom, inServiceTo)) {
    throw unprocessable('The unit leaves service before it enters it', [
      { path: 'inServiceTo', message: 'Must not be before the in-service date' },
    ]);
  }
  if (body.fuelIds) await assertAllOnSite(ctx, 'fuels', current.site_id, body.fuelIds, 'fuelIds', 'fuel');
  const patch: Record<string, unknown> = {};
  if (body.name !== undefined) patch.name = body.name;
  if (body.unitType !== undefined) patch.unit_type = body.unitType;
  if (body.ratedThermalInputMWth !== undefined) patch.rated_thermal_input_mwth = body.ratedThermalInputMWth;
  if (body.inServiceFrom !== undefined) patch.in_service_from = body.inServiceFrom;
  if (body.inServiceTo !== undefined) patch.in_service_to = body.inServiceTo;
  const row = await updateVersioned<UnitRow>(ctx, 'emission_units', unitId, body.version, patch, 'emission unit');
  if (body.fuelIds) await replaceUnitFuels(ctx, unitId, [...new Set(body.fuelIds)]);
  const after = await dto(ctx, row);
  await audit(ctx, 'updated', ENTITY, unitId, before, after);
  return after;
}

export async function archiveUnit(ctx: SetupCtx, unitId: string, version?: number): Promise<EmissionUnitDto> {
  const current = await visibleUnit(ctx, unitId);
  assertVersion(current, version, 'emission unit');
  if (current.archived_at) return dto(ctx, current);
  const before = await dto(ctx, current);
  const after = await dto(ctx, await archiveRow(ctx, 'emission_units', current));
  await audit(ctx, 'archived', ENTITY, unitId, before, after);
  return after;
}
