import { fuelDtos } from '../fuels/fuels.service';
import type { FuelRow } from '../fuels/fuels.repo';
import { stacksWithChannels } from '../stacks/stacks.service';
import type { StackRow } from '../stacks/stacks.repo';
import type { UnitRow } from '../units/units.repo';
import { fuelIdsOfUnits, toUnitDto } from '../units/units.repo';
import type { ListParams } from './list-query';
import type { SetupCtx } from './setup-context';
import { audit, notFound, unprocessable } from './setup-context';
import type { SiteRow } from './sites.repo';
import {
  countSiteChildren,
  findVisibleSite,
  insertSite,
  listSiteMembers,
  listSites,
  organisationMemberIds,
  replaceSiteMembers,
  toSiteDto,
} from './sites.repo';
import type { CreateSiteBody, SiteDetailDto, SiteDto, SiteMemberDto, UpdateSiteBody } from './sites.schemas';
import { archiveRow, assertLive, assertVersion, updateVersioned } from './versioned';

const ENTITY = 'site';

export async function visibleSite(ctx: SetupCtx, siteId: string): Promise<SiteRow> {
  const row = await findVisibleSite(ctx, siteId);
  if (!row) throw notFound('Site');
  return row;
}

export async function list(ctx: SetupCtx, params: ListParams) {
  const { rows, total } = await listSites(ctx, params);
  return { items: rows.map(toSiteDto), total };
}

export async function get(ctx: SetupCtx, siteId: string): Promise<SiteDetailDto> {
  const site = await visibleSite(ctx, siteId);
  const live = (table: string) =>
    ctx.db(table).where({ tenant_id: ctx.tenantId, site_id: siteId }).whereNull('archived_at').orderBy(['name', 'id']);
  const units = (await live('emission_units')) as UnitRow[];
  const fuelIds = await fuelIdsOfUnits(ctx, units.map((u) => u.id));
  return {
    ...toSiteDto(site),
    units: units.map((u) => toUnitDto(u, fuelIds.get(u.id) ?? [])),
    stacks: await stacksWithChannels(ctx, (await live('stacks')) as StackRow[]),
    fuels: await fuelDtos(ctx, (await live('fuels')) as FuelRow[]),
    counts: await countSiteChildren(ctx, siteId),
  };
}

export async function create(ctx: SetupCtx, body: CreateSiteBody): Promise<SiteDto> {
  const row = await insertSite(ctx, {
    name: body.name,
    time_zone: body.timeZone,
    country: body.country,
    regime: body.regime,
    address: body.address ?? null,
  });
  const after = toSiteDto(row);
  await audit(ctx, 'created', ENTITY, row.id, null, after);
  return after;
}

export async function update(ctx: SetupCtx, siteId: string, body: UpdateSiteBody): Promise<SiteDto> {
  const current = await visibleSite(ctx, siteId);
  assertLive(current, 'site');
  assertVersion(current, body.version, 'site');
  const patch: Record<string, unknown> = {};
  if (body.name !== undefined) patch.name = body.name;
  if (body.timeZone !== undefined) patch.time_zone = body.timeZone;
  if (body.country !== undefined) patch.country = body.country;
  if (body.regime !== undefined) patch.regime = body.regime;
  if (body.address !== undefined) patch.address = body.address;
  const row = await updateVersioned<SiteRow>(ctx, 'sites', siteId, body.version, patch, 'site');
  const before = toSiteDto(current);
  const after = toSiteDto(row);
  await audit(ctx, 'updated', ENTITY, siteId, before, after);
  return after;
}

export async function archive(ctx: SetupCtx, siteId: string, version?: number): Promise<SiteDto> {
  const current = await visibleSite(ctx, siteId);
  assertVersion(current, version, 'site');
  if (current.archived_at) return toSiteDto(current);
  const after = toSiteDto(await archiveRow(ctx, 'sites', current));
  await audit(ctx, 'archived', ENTITY, siteId, toSiteDto(current), after);
  return after;
}

export async function members(ctx: SetupCtx, siteId: string): Promise<SiteMemberDto[]> {
  await visibleSite(ctx, siteId);
  return listSiteMembers(ctx, siteId);
}

/** Replaces the site's member list; every user must be a member of the organisation. */
export async function replaceMembers(ctx: SetupCtx, siteId: string, userIds: string[]): Promise<SiteMemberDto[]> {
  await visibleSite(ctx, siteId);
  const unique = [...new Set(userIds)];
  const known = await organisationMemberIds(ctx, unique);
  const issues = userIds.flatMap((id, i) =>
    known.has(id) ? [] : [{ path: `userIds.${i}`, message: 'Not a member of this organisation' }],
  );
  if (issues.length > 0) throw unprocessable('Only members of the organisation can be given access to a site', issues);
  const before = await listSiteMembers(ctx, siteId);
  await replaceSiteMembers(ctx, siteId, unique);
  const after = await listSiteMembers(ctx, siteId);
  await audit(
    ctx,
    'members_replaced',
    ENTITY,
    siteId,
    { userIds: before.map((m) => m.userId) },
    { userIds: after.map((m) => m.userId) },
  );
  return after;
}
