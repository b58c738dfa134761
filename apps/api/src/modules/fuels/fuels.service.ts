import type { ListParams } from '../sites/list-query';
import type { SetupCtx } from '../sites/setup-context';
import { audit, notFound } from '../sites/setup-context';
import { findVisibleSite } from '../sites/sites.repo';
import { archiveRow, assertLive, assertVersion, updateVersioned } from '../sites/versioned';
import { analysisFigures } from './fuel-factors';
import type { FuelRow } from './fuels.repo';
import { currentAnalyses, findVisibleFuel, insertAnalysis, listAnalysesOfFuel, listFuelsOfSite, toAnalysisDto, toFuelDto } from './fuels.repo';
import type { CreateAnalysisBody, CreateFuelBody, FuelAnalysisDto, FuelDto, UpdateFuelBody } from './fuels.schemas';
import { KIND_OF_FUEL_TYPE } from './fuels.schemas';
import { unprocessable } from '../sites/setup-context';

const ENTITY = 'fuel';

async function dto(ctx: SetupCtx, row: FuelRow): Promise<FuelDto> {
  return toFuelDto(row, (await currentAnalyses(ctx, [row.id])).get(row.id));
}

export async function visibleFuel(ctx: SetupCtx, fuelId: string): Promise<FuelRow> {
  const row = await findVisibleFuel(ctx, fuelId);
  if (!row) throw notFound('Fuel');
  return row;
}

export async function fuelDtos(ctx: SetupCtx, rows: FuelRow[]): Promise<FuelDto[]> {
  const current = await currentAnalyses(ctx, rows.map((r) => r.id));
  return rows.map((r) => toFuelDto(r, current.get(r.id)));
}

export async function listFuels(ctx: SetupCtx, siteId: string, params: ListParams) {
  if (!(await findVisibleSite(ctx, siteId))) throw notFound('Site');
  const { rows, total } = await listFuelsOfSite(ctx, siteId, params);
  return { items: await fuelDtos(ctx, rows), total };
}

export async function getFuel(ctx: SetupCtx, fuelId: string): Promise<FuelDto> {
  return dto(ctx, await visibleFuel(ctx, fuelId));
}

export async function createFuel(ctx: SetupCtx, siteId: string, body: CreateFuelBody): Promise<FuelDto> {
  const site = await findVisibleSite(ctx, siteId);
  if (!site) throw notFound('Site');
  assertLive(site, 'site');
  const kind = KIND_OF_FUEL_TYPE[body.fuelType];
  // compute before writing, so an unusable analysis leaves nothing behind
  const figures = body.analysis ? analysisFigures(body.fuelType, kind, body.analysis) : null;
  const [row] = (await ctx
    .db('fuels')
    .insert({ tenant_id: ctx.tenantId, site_id: siteId, name: body.name, fuel_type: body.fuelType, kind })
    .returning('*')) as FuelRow[];
  if (body.analysis && figures) await insertAnalysis(ctx, row.id, body.analysis.validFrom, figures);
  const after = await dto(ctx, row);
  await audit(ctx, 'created', ENTITY, row.id, null, after);
  return after;
}

export async function updateFuel(ctx: SetupCtx, fuelId: string, body: UpdateFuelBody): Promise<FuelDto> {
  const current = await visibleFuel(ctx, fuelId);
  assertLive(current, 'fuel');
  assertVersion(current, body.version, 'fuel');
  if (body.fuelType && KIND_OF_FUEL_TYPE[body.fuelType] !== current.kind) {
    throw unprocessable('A fuel cannot change between gas, liquid and solid: its analyses would no longer fit', [
      { path: 'fuelType', message: `Choose a ${current.kind} fuel type, or add a new fuel` },
    ]);
  }
  const before = await dto(ctx, current);
  const patch: Record<string, unknown> = {};
  if (body.name !== undefined) patch.name = body.name;
  if (body.fuelType !== undefined) patch.fuel_type = body.fuelType;
  const row = await updateVersioned<FuelRow>(ctx, 'fuels', fuelId, body.version, patch, 'fuel');
  const after = await dto(ctx, row);
  await audit(ctx, 'updated', ENTITY, fuelId, before, after);
  return after;
}

export async function archiveFuel(ctx: SetupCtx, fuelId: string, version?: number): Promise<FuelDto> {
  const current = await visibleFuel(ctx, fuelId);
  assertVersion(current, version, 'fuel');
  if (current.archived_at) return dto(ctx, current);
  const before = await dto(ctx, current);
  const after = await dto(ctx, await archiveRow(ctx, 'fuels', current));
  await audit(ctx, 'archived', ENTITY, fuelId, before, after);
  return after;
}

export async function listAnalyses(ctx: SetupCtx, fuelId: string, params: ListParams) {
  await visibleFuel(ctx, fuelId);
  const { rows, total } = await listAnalysesOfFuel(ctx, fuelId, params);
  return { items: rows.map(toAnalysisDto), total };
}

/** A new analysis is a new row: earlier ones stay as they were (history). */
export async function addAnalysis(ctx: SetupCtx, fuelId: string, body: CreateAnalysisBody): Promise<FuelAnalysisDto> {
  const fuel = await visibleFuel(ctx, fuelId);
  assertLive(fuel, 'fuel');
  const figures = analysisFigures(fuel.fuel_type, fuel.kind, body);
  const after = toAnalysisDto(await insertAnalysis(ctx, fuelId, body.validFrom, figures));
  await audit(ctx, 'analysis_added', ENTITY, fuelId, null, after);
  return after;
}
