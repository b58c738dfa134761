/**
 * Which sites a member may see. Managers see only the sites they are listed on (site_members);
 * admins, officers and auditors see every site of the organisation. An invisible site answers
 * 404, exactly like another organisation's site, so a manager learns nothing about it.
 */
import type { Knex } from 'knex';
import type { SetupCtx } from './setup-context';
import { unprocessable } from './setup-context';

/** Roles whose view is limited to the sites they are members of. */
const SITE_RESTRICTED_ROLES = new Set(['manager']);

export function isSiteRestricted(ctx: SetupCtx): boolean {
  return SITE_RESTRICTED_ROLES.has(ctx.role);
}

/** Narrows a query to rows whose `siteIdColumn` is a site the member may see. */
export function whereSiteVisible(qb: Knex.QueryBuilder, ctx: SetupCtx, siteIdColumn: string): Knex.QueryBuilder {
  if (!isSiteRestricted(ctx)) return qb;
  return qb.whereIn(
    siteIdColumn,
    ctx.db('site_members').select('site_id').where({ tenant_id: ctx.tenantId, user_id: ctx.userId }),
  );
}

/** A row of a table with a `site_id` column, in the current organisation and a visible site. */
export async function findInVisibleSite<Row>(ctx: SetupCtx, table: string, id: string): Promise<Row | undefined> {
  const qb = ctx.db(table).where({ [`${table}.tenant_id`]: ctx.tenantId, [`${table}.id`]: id }).first(`${table}.*`);
  whereSiteVisible(qb, ctx, `${table}.site_id`);
  return (await qb) as Row | undefined;
}

/** Ids among `ids` that are live rows of `table` on the given site. */
export async function liveIdsOnSite(ctx: SetupCtx, table: string, siteId: string, ids: string[]): Promise<Set<string>> {
  if (ids.length === 0) return new Set();
  const rows = (await ctx
    .db(table)
    .where({ tenant_id: ctx.tenantId, site_id: siteId })
    .whereNull('archived_at')
    .whereIn('id', ids)
    .select('id')) as { id: string }[];
  return new Set(rows.map((r) => r.id));
}

/** 422 unless every id is a live row of `table` on the site (a body may only link within a site). */
export async function assertAllOnSite(
  ctx: SetupCtx,
  table: string,
  siteId: string,
  ids: string[],
  field: string,
  label: string,
): Promise<void> {
  const found = await liveIdsOnSite(ctx, table, siteId, [...new Set(ids)]);
  const issues = ids.flatMap((id, i) =>
    found.has(id) ? [] : [{ path: `${field}.${i}`, message: `No ${label} of this site has this id` }],
  );
  if (issues.length > 0) throw unprocessable(`Every ${label} must belong to the same site`, issues);
}
