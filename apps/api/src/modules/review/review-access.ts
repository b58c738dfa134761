/**
 * Lookups shared by the review, drill-down and correction routes: a stack or channel of the
 * organisation on a site the caller may see (404 otherwise, like another organisation's id), and
 * the time ranges the routes accept.
 */
import { TZDate } from '@date-fns/tz';
import { nextLocalPeriodStart, startOfLocalPeriod } from '@flueledger/calc';
import { NotFound, ValidationError } from '../../lib/errors';
import type { TenantContext } from '../../routing/context';
import { type StackContext, loadStackContext } from '../results/stack-context';
import { isSiteRestricted, whereSiteVisible } from '../sites/site-access';

export type ReviewCtx = Pick<TenantContext, 'tenantId' | 'userId' | 'role' | 'db' | 'requestId'>;

export interface VisibleChannel {
  id: string;
  stack_id: string;
  site_id: string;
  parameter: string;
  unit: string;
  basis: string;
  interval_minutes: number;
  time_zone: string;
}

/** The stack's context (results/stack-context.ts), checked visible to the caller in the same query; 404 otherwise. */
export async function loadVisibleStackContext(ctx: ReviewCtx, stackId: string): Promise<StackContext> {
  const sc = await loadStackContext({ tenantId: ctx.tenantId, db: ctx.db }, stackId, isSiteRestricted(ctx) ? { siteMemberUserId: ctx.userId } : {});
  if (!sc) throw new NotFound('not_found', 'Stack not found.');
  return sc;
}

export async function findVisibleChannel(ctx: ReviewCtx, channelId: string): Promise<VisibleChannel> {
  const qb = ctx
    .db('channels')
    .join('stacks', function joinStack() {
      this.on('stacks.id', '=', 'channels.stack_id').andOn('stacks.tenant_id', '=', 'channels.tenant_id');
    })
    .join('sites', function joinSite() {
      this.on('sites.id', '=', 'stacks.site_id').andOn('sites.tenant_id', '=', 'stacks.tenant_id');
    })
    .where({ 'channels.tenant_id': ctx.tenantId, 'channels.id': channelId })
    .first('channels.id', 'channels.stack_id', 'stacks.site_id', 'channels.parameter', 'channels.unit', 'channels.basis', 'channels.interval_minutes', 'sites.time_zone');
  whereSiteVisible(qb, ctx, 'stacks.site_id');
  const row = (await qb) as VisibleChannel | undefined;
  if (!row) throw new NotFound('not_found', 'Channel not found.');
  return row;
}

/** A date (YYYY-MM-DD: local midnight at the site) or an ISO date-time → UTC ms. */
export function parseInstant(value: string, timeZone: string): number {
  const date = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value);
  if (date) return new TZDate(Number(date[1]), Number(date[2]) - 1, Number(date[3]), timeZone).getTime();
  return Date.parse(value);
}

/** The site's local calendar month holding `t`, [start, end) in UTC ms. */
export function localMonthOf(t: number, timeZone: string): { from: number; to: number } {
  const from = startOfLocalPeriod(t, 'month', timeZone);
  return { from, to: nextLocalPeriodStart(from, 'month', timeZone) };
}

export const millisecondsInDay = 86_400_000;

/** Checks from < to and a maximum span; 400 otherwise. */
export function checkRange(from: number, to: number, maxDays: number): void {
  if (!(Number.isFinite(from) && Number.isFinite(to))) throw new ValidationError('from and to must be valid dates.', [{ location: 'query', path: 'from', message: 'Not a date' }]);
  if (!(from < to)) throw new ValidationError('"to" must be after "from".', [{ location: 'query', path: 'to', message: 'Must be after from' }]);
  if (to - from > maxDays * millisecondsInDay) {
    throw new ValidationError(`The period may span at most ${maxDays} days.`, [{ location: 'query', path: 'to', message: `At most ${maxDays} days after from` }]);
  }
}
