/**
 * Everything the hourly results of one stack depend on, loaded in one query: the site
 * (time zone, regime), the stack's live channels, the live limits that apply to it (directly or
 * through one of its emission units) and the analysis of the fuel its units burn.
 */
import type { Fuel } from '@flueledger/calc';
import type { Knex } from 'knex';
import type { LimitRow } from '../permits/limits.repo';

export interface ResultsScope {
  tenantId: string;
  db: Knex.Transaction;
}

export type ChannelParameter =
  | 'NOx' | 'NO' | 'NO2' | 'SO2' | 'CO' | 'dust' | 'HCl' | 'HF' | 'TOC' | 'NH3' | 'Hg' | 'CO2'
  | 'O2' | 'H2O' | 'flow' | 'temperature' | 'pressure' | 'load' | 'fuel_flow';

export interface ChannelInfo {
  id: string;
  stackId: string;
  parameter: ChannelParameter;
  unit: string;
  basis: 'wet' | 'dry';
  conditions: 'actual' | 'standard';
  intervalMinutes: number;
  updatedAt: Date;
}

export interface FuelInfo {
  fuelId: string;
  name: string;
  kind: 'gas' | 'liquid' | 'solid';
  /** The analysis as a calc fuel; null when only Method 19 default F-factors are known. */
  fuel: Fuel | null;
  fdDscfPerMMBtu: number;
  analysisCreatedAt: Date;
}

export interface StackContext {
  stackId: string;
  stackName: string;
  siteId: string;
  siteName: string;
  timeZone: string;
  regime: 'eu_ied' | 'us_epa' | 'other';
  channels: ChannelInfo[];
  limits: LimitRow[];
  /**
   * The fuel burned by the stack's units (the first by name when there are several: F-factors of
   * fuel mixes need heat-input shares the set-up model does not hold yet).
   */
  fuel: FuelInfo | null;
}

/** A channel as the context query sends it (JSON; the change time as epoch ms). */
interface ChannelJson {
  id: string;
  stackId: string;
  parameter: ChannelParameter;
  unit: string;
  basis: 'wet' | 'dry';
  conditions: 'actual' | 'standard';
  intervalMinutes: number;
  updatedAtMs: number;
}

interface FuelJson {
  fuelId: string;
  name: string;
  kind: FuelInfo['kind'];
  ultimate: Record<string, number> | null;
  composition: Record<string, number> | null;
  fdDscfPerMMBtu: number | string;
  analysisCreatedAtMs: number;
}

interface StackJson {
  id: string;
  name: string;
  siteId: string;
  siteName: string;
  timeZone: string;
  regime: StackContext['regime'];
}

/** One row of the context query: the stack's data (the same on every row) and one limit's columns (all null without limits). */
type ContextRow = { ctx_stack: StackJson; ctx_channels: ChannelJson[]; ctx_fuel: FuelJson | null } & { [K in keyof LimitRow]: LimitRow[K] | null };

// Change times leave as whole epoch ms, truncated as node-postgres truncates a timestamptz to a
// Date, so a time read here equals the same time read as a row elsewhere (freshness compares them).
const epochMs = (column: string) => `floor(extract(epoch from ${column}) * 1000)::float8`;

/**
 * The context query: one round trip. The stack, site, channels and fuel analysis travel as JSON
 * beside the limits, whose columns stay plain columns (one row per limit; one row of nulls when
 * there is none) so a limit reads exactly as `permit_limits` rows read everywhere else.
 */
const CONTEXT_SQL = (siteRestricted: boolean) => `
  with s as (
    select st.id, st.name, st.site_id, si.name as site_name, si.time_zone, si.regime
      from stacks st
      join sites si on si.id = st.site_id and si.tenant_id = st.tenant_id
     where st.tenant_id = :tenantId and st.id = :stackId
       ${siteRestricted ? 'and st.site_id in (select site_id from site_members where tenant_id = :tenantId and user_id = :userId)' : ''}
  ),
  units as (select unit_id from stack_units where tenant_id = :tenantId and stack_id = :stackId)
  select
    json_build_object('id', s.id, 'name', s.name, 'siteId', s.site_id, 'siteName', s.site_name, 'timeZone', s.time_zone, 'regime', s.regime) as ctx_stack,
    (select coalesce(json_agg(json_build_object(
              'id', c.id, 'stackId', c.stack_id, 'parameter', c.parameter, 'unit', c.unit, 'basis', c.basis,
              'conditions', c.conditions, 'intervalMinutes', c.interval_minutes, 'updatedAtMs', ${epochMs('c.updated_at')})
            order by c.parameter, c.basis, c.created_at), '[]')
       from channels c
      where c.tenant_id = :tenantId and c.stack_id = s.id and c.archived_at is null) as ctx_channels,
    -- The fuel of the stack's units with its latest analysis in force today (or the earliest one).
    (select json_build_object(
              'fuelId', f.id, 'name', f.name, 'kind', f.kind, 'ultimate', a.ultimate, 'composition', a.composition,
              'fdDscfPerMMBtu', a.fd_dscf_per_mmbtu, 'analysisCreatedAtMs', ${epochMs('a.created_at')})
       from unit_fuels uf
       join fuels f on f.id = uf.fuel_id and f.tenant_id = uf.tenant_id
       join fuel_analyses a on a.fuel_id = f.id and a.tenant_id = f.tenant_id
      where uf.tenant_id = :tenantId and uf.unit_id in (select unit_id from units) and f.archived_at is null
      order by f.name, (a.valid_from <= current_date) desc, a.valid_from desc, a.created_at desc
      limit 1) as ctx_fuel,
    l.*
  from s
  left join lateral (
    select pl.*
      from permit_limits pl
      join permits p on p.id = pl.permit_id and p.tenant_id = pl.tenant_id
     where pl.tenant_id = :tenantId and pl.archived_at is null and p.archived_at is null
       and (pl.stack_id = :stackId or pl.unit_id in (select unit_id from units))
  ) l on true
  order by l.pollutant, l.created_at`;

function toFuelInfo(f: FuelJson): FuelInfo {
  const calcFuel: Fuel | null =
    f.kind === 'gas'
      ? f.composition ? { kind: 'gas', composition: f.composition } : null
      : f.ultimate ? { kind: f.kind, ultimate: f.ultimate as unknown as Extract<Fuel, { kind: 'solid' }>['ultimate'] } : null;
  return {
    fuelId: f.fuelId,
    name: f.name,
    kind: f.kind,
    fuel: calcFuel,
    fdDscfPerMMBtu: Number(f.fdDscfPerMMBtu),
    analysisCreatedAt: new Date(f.analysisCreatedAtMs),
  };
}

export interface LoadStackContextOptions {
  /**
   * Only when the stack's site lists this user among its members (a site-restricted role): the
   * visibility check of a read, made in the same query.
   */
  siteMemberUserId?: string;
}

/**
 * The stack's context, or undefined when the stack is not in the organisation (or, with
 * `siteMemberUserId`, not on one of that user's sites). One query.
 */
export async function loadStackContext(scope: ResultsScope, stackId: string, options: LoadStackContextOptions = {}): Promise<StackContext | undefined> {
  const siteRestricted = options.siteMemberUserId !== undefined;
  const { rows } = (await scope.db.raw(CONTEXT_SQL(siteRestricted), {
    tenantId: scope.tenantId,
    stackId,
    ...(siteRestricted ? { userId: options.siteMemberUserId! } : {}),
  })) as { rows: ContextRow[] };
  const first = rows[0];
  if (!first) return undefined;
  const stack = first.ctx_stack;
  const limits: LimitRow[] = [];
  for (const row of rows) {
    if (row.id === null) continue;
    const { ctx_stack: _stack, ctx_channels: _channels, ctx_fuel: _fuel, ...limit } = row;
    limits.push(limit as LimitRow);
  }
  return {
    stackId: stack.id,
    stackName: stack.name,
    siteId: stack.siteId,
    siteName: stack.siteName,
    timeZone: stack.timeZone,
    regime: stack.regime,
    channels: first.ctx_channels.map(({ updatedAtMs, ...c }) => ({ ...c, updatedAt: new Date(updatedAtMs) })),
    limits,
    fuel: first.ctx_fuel ? toFuelInfo(first.ctx_fuel) : null,
  };
}

/** Stack ids of the given channels (archived channels included: their history still changes). */
export async function stacksOfChannels(scope: ResultsScope, channelIds: readonly string[]): Promise<Map<string, string[]>> {
  const rows = (await scope
    .db('channels')
    .where({ tenant_id: scope.tenantId })
    .whereIn('id', [...channelIds])
    .select('id', 'stack_id')) as { id: string; stack_id: string }[];
  const byStack = new Map<string, string[]>();
  for (const r of rows) byStack.set(r.stack_id, [...(byStack.get(r.stack_id) ?? []), r.id]);
  return byStack;
}
