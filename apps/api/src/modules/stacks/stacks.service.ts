import { liveChannelsOfStacks, toChannelDto } from '../channels/channels.repo';
import type { ListParams } from '../sites/list-query';
import type { SetupCtx } from '../sites/setup-context';
import { audit, notFound } from '../sites/setup-context';
import { assertAllOnSite } from '../sites/site-access';
import { findVisibleSite } from '../sites/sites.repo';
import { archiveRow, assertLive, assertVersion, updateVersioned } from '../sites/versioned';
import type { StackRow } from './stacks.repo';
import { findVisibleStack, listStacksOfSite, replaceStackUnits, toStackDto, unitIdsOfStacks } from './stacks.repo';
import type { CreateStackBody, StackDto, StackWithChannelsDto, UpdateStackBody } from './stacks.schemas';

const ENTITY = 'stack';

async function dto(ctx: SetupCtx, row: StackRow): Promise<StackDto> {
  return toStackDto(row, (await unitIdsOfStacks(ctx, [row.id])).get(row.id) ?? []);
}

export async function visibleStack(ctx: SetupCtx, stackId: string): Promise<StackRow> {
  const row = await findVisibleStack(ctx, stackId);
  if (!row) throw notFound('Stack');
  return row;
}

/** Stacks of a site with their unit ids and live channels (for the site page and stack page). */
export async function stacksWithChannels(ctx: SetupCtx, rows: StackRow[]): Promise<StackWithChannelsDto[]> {
  const ids = rows.map((r) => r.id);
  const [unitIds, channels] = [await unitIdsOfStacks(ctx, ids), await liveChannelsOfStacks(ctx, ids)];
  return rows.map((r) => ({
    ...toStackDto(r, unitIds.get(r.id) ?? []),
    channels: (channels.get(r.id) ?? []).map(toChannelDto),
  }));
}

export async function listStacks(ctx: SetupCtx, siteId: string, params: ListParams) {
  if (!(await findVisibleSite(ctx, siteId))) throw notFound('Site');
  const { rows, total } = await listStacksOfSite(ctx, siteId, params);
  const unitIds = await unitIdsOfStacks(ctx, rows.map((r) => r.id));
  return { items: rows.map((r) => toStackDto(r, unitIds.get(r.id) ?? [])), total };
}

export async function getStack(ctx: SetupCtx, stackId: string): Promise<StackWithChannelsDto> {
  const [stack] = await stacksWithChannels(ctx, [await visibleStack(ctx, stackId)]);
  return stack;
}

export async function createStack(ctx: SetupCtx, siteId: string, body: CreateStackBody): Promise<StackDto> {
  const site = await findVisibleSite(ctx, siteId);
  if (!site) throw notFound('Site');
  assertLive(site, 'site');
  await assertAllOnSite(ctx, 'emission_units', siteId, body.unitIds, 'unitIds', 'emission unit');
  const [row] = (await ctx
    .db('stacks')
    .insert({
      tenant_id: ctx.tenantId,
      site_id: siteId,
      name: body.name,
      height_m: body.heightM ?? null,
      diameter_m: body.diameterM ?? null,
    })
    .returning('*')) as StackRow[];
  await replaceStackUnits(ctx, row.id, [...new Set(body.unitIds)]);
  const after = await dto(ctx, row);
  await audit(ctx, 'created', ENTITY, row.id, null, after);
  return after;
}

export async function updateStack(ctx: SetupCtx, stackId: string, body: UpdateStackBody): Promise<StackDto> {
  const current = await visibleStack(ctx, stackId);
  assertLive(current, 'stack');
  assertVersion(current, body.version, 'stack');
  if (body.unitIds) await assertAllOnSite(ctx, 'emission_units', current.site_id, body.unitIds, 'unitIds', 'emission unit');
  const before = await dto(ctx, current);
  const patch: Record<string, unknown> = {};
  if (body.name !== undefined) patch.name = body.name;
  if (body.heightM !== undefined) patch.height_m = body.heightM;
  if (body.diameterM !== undefined) patch.diameter_m = body.diameterM;
  const row = await updateVersioned<StackRow>(ctx, 'stacks', stackId, body.version, patch, 'stack');
  if (body.unitIds) await replaceStackUnits(ctx, stackId, [...new Set(body.unitIds)]);
  const after = await dto(ctx, row);
  await audit(ctx, 'updated', ENTITY, stackId, before, after);
  return after;
}

/** Archiving a stack keeps its channels and readings as history; it leaves the lists. */
export async function archiveStack(ctx: SetupCtx, stackId: string, version?: number): Promise<StackDto> {
  const current = await visibleStack(ctx, stackId);
  assertVersion(current, version, 'stack');
  if (current.archived_at) return dto(ctx, current);
  const before = await dto(ctx, current);
  const after = await dto(ctx, await archiveRow(ctx, 'stacks', current));
  await audit(ctx, 'archived', ENTITY, stackId, before, after);
  return after;
}
