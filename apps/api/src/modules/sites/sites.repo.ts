import type { ListParams } from './list-query';
import { pageRows } from './list-query';
import type { SetupCtx } from './setup-context';
import { whereSiteVisible } from './site-access';
import type { Regime, SiteDto, SiteMemberDto } from './sites.schemas';
import { toIso, toIsoRequired } from './db-values';

export interface SiteRow {
  id: string;
  tenant_id: string;
  name: string;
  time_zone: string;
  country: string;
  regime: Regime;
  address: string | null;
  version: number;
  created_at: Date;
  updated_at: Date;
  archived_at: Date | null;
}

export function toSiteDto(row: SiteRow): SiteDto {
  return {
    id: row.id,
    name: row.name,
    timeZone: row.time_zone,
    country: row.country.trim(),
    regime: row.regime,
    address: row.address,
    archivedAt: toIso(row.archived_at),
    version: row.version,
    createdAt: toIsoRequired(row.created_at),
    updatedAt: toIsoRequired(row.updated_at),
  };
}

/** A site of the current organisation the member may see, or undefined. */
export async function findVisibleSite(ctx: SetupCtx, siteId: string): Promise<SiteRow | undefined> {
  const qb = ctx.db('sites').where({ tenant_id: ctx.tenantId, id: siteId }).first();
  whereSiteVisible(qb, ctx, 'sites.id');
  return (await qb) as SiteRow | undefined;
}

export async function listSites(ctx: SetupCtx, params: ListParams) {
  const base = ctx.db('sites').where({ tenant_id: ctx.tenantId }).select('*');
  whereSiteVisible(base, ctx, 'sites.id');
  return pageRows<SiteRow>(base, params, {
    sortColumns: { name: 'name', country: 'country', regime: 'regime', createdAt: 'created_at', updatedAt: 'updated_at' },
    searchColumns: ['name', 'address'],
    archivedColumn: 'archived_at',
    idColumn: 'id',
  });
}

export async function insertSite(ctx: SetupCtx, values: Omit<SiteRow, 'id' | 'tenant_id' | 'version' | 'created_at' | 'updated_at' | 'archived_at'>): Promise<SiteRow> {
  const [row] = (await ctx.db('sites').insert({ ...values, tenant_id: ctx.tenantId }).returning('*')) as SiteRow[];
  return row;
}

export async function listSiteMembers(ctx: SetupCtx, siteId: string): Promise<SiteMemberDto[]> {
  const rows = (await ctx
    .db('site_members as sm')
    .join('memberships as m', function joinMembership() {
      this.on('m.tenant_id', '=', 'sm.tenant_id').andOn('m.user_id', '=', 'sm.user_id');
    })
    .join('users as u', 'u.id', 'sm.user_id')
    .where({ 'sm.tenant_id': ctx.tenantId, 'sm.site_id': siteId })
    .orderBy('u.name')
    .select('u.id as user_id', 'u.name', 'u.email', 'm.role')) as { user_id: string; name: string; email: string; role: string }[];
  return rows.map((r) => ({ userId: r.user_id, name: r.name, email: String(r.email), role: r.role }));
}

/** User ids among `userIds` that are members of the current organisation. */
export async function organisationMemberIds(ctx: SetupCtx, userIds: string[]): Promise<Set<string>> {
  if (userIds.length === 0) return new Set();
  const rows = (await ctx
    .db('memberships')
    .where({ tenant_id: ctx.tenantId })
    .whereIn('user_id', userIds)
    .select('user_id')) as { user_id: string }[];
  return new Set(rows.map((r) => r.user_id));
}

export async function replaceSiteMembers(ctx: SetupCtx, siteId: string, userIds: string[]): Promise<void> {
  await ctx.db('site_members').where({ tenant_id: ctx.tenantId, site_id: siteId }).delete();
  if (userIds.length > 0) {
    await ctx
      .db('site_members')
      .insert(userIds.map((userId) => ({ tenant_id: ctx.tenantId, site_id: siteId, user_id: userId })));
  }
}

/** Number of live (non-archived) rows per child table of a site. */
export async function countSiteChildren(ctx: SetupCtx, siteId: string) {
  const count = async (table: string): Promise<number> => {
    const [{ n }] = (await ctx
      .db(table)
      .where({ tenant_id: ctx.tenantId, site_id: siteId })
      .whereNull('archived_at')
      .count({ n: '*' })) as { n: string }[];
    return Number(n);
  };
  const [{ n: channels }] = (await ctx
    .db('channels as c')
    .join('stacks as s', 's.id', 'c.stack_id')
    .where({ 'c.tenant_id': ctx.tenantId, 's.site_id': siteId })
    .whereNull('c.archived_at')
    .whereNull('s.archived_at')
    .count({ n: '*' })) as { n: string }[];
  return {
    units: await count('emission_units'),
    stacks: await count('stacks'),
    channels: Number(channels),
    fuels: await count('fuels'),
    permits: await count('permits'),
  };
}
