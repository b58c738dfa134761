import { toDateOnly } from '../sites/db-values';
import type { ListParams } from '../sites/list-query';
import type { SetupCtx } from '../sites/setup-context';
import { audit, notFound, unprocessable } from '../sites/setup-context';
import { assertAllOnSite } from '../sites/site-access';
import type { SiteRow } from '../sites/sites.repo';
import { archiveRow, assertLive, assertVersion, updateVersioned } from '../sites/versioned';
import { limitDefaults } from './limit-defaults';
import type { LimitRow } from './limits.repo';
import { findVisibleLimit, listLimitsOfPermit, targetProfile, toLimitDto } from './limits.repo';
import type { CreateLimitBody, LimitDefaultsQuery, LimitDto, UpdateLimitBody } from './limits.schemas';
import { limitIssues, PERIODS_WITH_LENGTH, UNITS_WITHOUT_O2 } from './limits.schemas';
import { visiblePermit } from './permits.service';

const ENTITY = 'limit';

async function visibleLimit(ctx: SetupCtx, limitId: string) {
  const row = await findVisibleLimit(ctx, limitId);
  if (!row) throw notFound('Limit');
  return row;
}

/** minData carries every minimum-data rule; minValidHoursPerDay is its most used field, kept flat for forms. */
function mergedMinData(
  current: Record<string, number> | null,
  minData: Record<string, number | undefined> | null | undefined,
  minValidHoursPerDay: number | null | undefined,
): Record<string, number> | null {
  let next: Record<string, number | undefined> | null = minData === undefined ? current : minData;
  if (minValidHoursPerDay !== undefined) next = { ...(next ?? {}), minValidHoursPerDay: minValidHoursPerDay ?? undefined };
  if (!next) return null;
  const defined = Object.entries(next).filter((e): e is [string, number] => e[1] !== undefined && e[1] !== null);
  return defined.length > 0 ? Object.fromEntries(defined) : null;
}

export async function listLimits(ctx: SetupCtx, permitId: string, params: ListParams) {
  await visiblePermit(ctx, permitId);
  const { rows, total } = await listLimitsOfPermit(ctx, permitId, params);
  return { items: rows.map(toLimitDto), total };
}

export async function createLimit(ctx: SetupCtx, permitId: string, body: CreateLimitBody): Promise<LimitDto> {
  const permit = await visiblePermit(ctx, permitId);
  assertLive(permit, 'permit');
  if (body.stackId) await assertAllOnSite(ctx, 'stacks', permit.site_id, [body.stackId], 'stackId', 'stack');
  if (body.unitId) await assertAllOnSite(ctx, 'emission_units', permit.site_id, [body.unitId], 'unitId', 'emission unit');

  const site = (await ctx.db('sites').where({ tenant_id: ctx.tenantId, id: permit.site_id }).first()) as SiteRow;
  const profile = await targetProfile(ctx, body);
  const defaults = limitDefaults({
    regime: site.regime,
    unitType: profile.unitTypes.length === 1 ? (profile.unitTypes[0] as LimitDefaultsQuery['unitType']) : undefined,
    fuelKind: profile.fuelKinds.length === 1 ? (profile.fuelKinds[0] as LimitDefaultsQuery['fuelKind']) : undefined,
  });
  const referenceO2Percent =
    body.referenceO2Percent !== undefined ? body.referenceO2Percent : UNITS_WITHOUT_O2.includes(body.unit) ? null : defaults.referenceO2Percent;
  const ambientO2Percent = body.ambientO2Percent ?? defaults.ambientO2Percent;
  const effectiveFrom = body.effectiveFrom ?? (toDateOnly(permit.effective_from) as string);
  const issues = limitIssues({ ...body, referenceO2Percent, ambientO2Percent, effectiveFrom });
  if (issues.length > 0) throw unprocessable('The limit is not consistent', issues);

  const [row] = (await ctx
    .db('permit_limits')
    .insert({
      tenant_id: ctx.tenantId,
      permit_id: permitId,
      stack_id: body.stackId ?? null,
      unit_id: body.unitId ?? null,
      pollutant: body.pollutant,
      elv: body.elv,
      unit: body.unit,
      reference_o2_percent: referenceO2Percent,
      ambient_o2_percent: ambientO2Percent,
      basis: body.basis,
      period: body.period,
      period_length: body.periodLength ?? null,
      operating_periods_only: body.operatingPeriodsOnly,
      criterion: JSON.stringify(body.criterion),
      confidence_interval_percent: body.confidenceIntervalPercent ?? null,
      near_miss_percent: body.nearMissPercent,
      correct_only_when_above: body.correctOnlyWhenAbove,
      exclude_statuses: body.excludeStatuses,
      min_data: jsonOrNull(mergedMinData(null, body.minData, body.minValidHoursPerDay)),
      effective_from: effectiveFrom,
      effective_to: body.effectiveTo ?? null,
    })
    .returning('*')) as LimitRow[];
  const after = toLimitDto(row);
  await audit(ctx, 'created', ENTITY, row.id, null, after);
  return after;
}

const jsonOrNull = (v: unknown) => (v === null || v === undefined ? null : JSON.stringify(v));


export async function updateLimit(ctx: SetupCtx, limitId: string, body: UpdateLimitBody): Promise<LimitDto> {
  const current = await visibleLimit(ctx, limitId);
  assertLive(current, 'limit');
  assertVersion(current, body.version, 'limit');
  const before = toLimitDto(current);
  const merged = { ...before, ...Object.fromEntries(Object.entries(body).filter(([, v]) => v !== undefined)) } as LimitDto;
  // moving to a period without a window drops the length of the former rolling or block window
  const dropLength = body.period !== undefined && !PERIODS_WITH_LENGTH.includes(body.period) && body.periodLength === undefined;
  if (dropLength) merged.periodLength = null;
  const issues = limitIssues(merged);
  if (issues.length > 0) throw unprocessable('The limit would not be consistent', issues);

  const columns: Record<string, string> = {
    pollutant: 'pollutant',
    elv: 'elv',
    unit: 'unit',
    referenceO2Percent: 'reference_o2_percent',
    ambientO2Percent: 'ambient_o2_percent',
    basis: 'basis',
    period: 'period',
    periodLength: 'period_length',
    operatingPeriodsOnly: 'operating_periods_only',
    confidenceIntervalPercent: 'confidence_interval_percent',
    nearMissPercent: 'near_miss_percent',
    correctOnlyWhenAbove: 'correct_only_when_above',
    excludeStatuses: 'exclude_statuses',
    effectiveFrom: 'effective_from',
    effectiveTo: 'effective_to',
  };
  const patch: Record<string, unknown> = {};
  for (const [field, column] of Object.entries(columns)) {
    const value = (body as Record<string, unknown>)[field];
    if (value !== undefined) patch[column] = value;
  }
  if (dropLength) patch.period_length = null;
  if (body.criterion !== undefined) patch.criterion = JSON.stringify(body.criterion);
  if (body.minData !== undefined || body.minValidHoursPerDay !== undefined) {
    patch.min_data = jsonOrNull(mergedMinData(current.min_data, body.minData, body.minValidHoursPerDay));
  }
  const row = await updateVersioned<LimitRow>(ctx, 'permit_limits', limitId, body.version, patch, 'limit');
  const after = toLimitDto(row);
  await audit(ctx, 'updated', ENTITY, limitId, before, after);
  return after;
}

export async function archiveLimit(ctx: SetupCtx, limitId: string, version?: number): Promise<LimitDto> {
  const current = await visibleLimit(ctx, limitId);
  assertVersion(current, version, 'limit');
  if (current.archived_at) return toLimitDto(current);
  const before = toLimitDto(current);
  const after = toLimitDto(await archiveRow<LimitRow>(ctx, 'permit_limits', current));
  await audit(ctx, 'archived', ENTITY, limitId, before, after);
  return after;
}
