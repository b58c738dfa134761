/**
 * Everything the hourly results of one stack depend on, loaded in a handful of queries: the site
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

interface ChannelDbRow {
  id: string;
  stack_id: string;
  parameter: ChannelParameter;
  unit: string;
  basis: 'wet' | 'dry';
  conditions: 'actual' | 'standard';
  interval_minutes: number;
  updated_at: Date;
}

function toChannelInfo(r: ChannelDbRow): ChannelInfo {
  return {
    id: r.id,
    stackId: r.stack_id,
    parameter: r.parameter,
    unit: r.unit,
    basis: r.basis,
    conditions: r.conditions,
    intervalMinutes: r.interval_minutes,
    updatedAt: r.updated_at,
  };
}

/** The stack's context, or undefined when the stack is not in the organisation. */
export async function loadStackContext(scope: ResultsScope, stackId: string): Promise<StackContext | undefined> {
  const { db, tenantId } = scope;
  const stack = (await db('stacks')
    .join('sites', function joinSite() {
      this.on('sites.id', '=', 'stacks.site_id').andOn('sites.tenant_id', '=', 'stacks.tenant_id');
    })
    .where({ 'stacks.tenant_id': tenantId, 'stacks.id': stackId })
    .first('stacks.id', 'stacks.name', 'stacks.site_id', 'sites.name as site_name', 'sites.time_zone', 'sites.regime')) as
    | { id: string; name: string; site_id: string; site_name: string; time_zone: string; regime: StackContext['regime'] }
    | undefined;
  if (!stack) return undefined;

  const unitIds = db('stack_units').select('unit_id').where({ tenant_id: tenantId, stack_id: stackId });
  // One connection per transaction: the three queries run one after the other.
  const channelRows = (await db('channels')
    .where({ tenant_id: tenantId, stack_id: stackId })
    .whereNull('archived_at')
    .orderBy([{ column: 'parameter' }, { column: 'basis' }, { column: 'created_at' }])
    .select('id', 'stack_id', 'parameter', 'unit', 'basis', 'conditions', 'interval_minutes', 'updated_at')) as ChannelDbRow[];
  const limits = (await db('permit_limits')
    .join('permits', function joinPermit() {
      this.on('permits.id', '=', 'permit_limits.permit_id').andOn('permits.tenant_id', '=', 'permit_limits.tenant_id');
    })
    .where('permit_limits.tenant_id', tenantId)
    .whereNull('permit_limits.archived_at')
    .whereNull('permits.archived_at')
    .where((q) => q.where('permit_limits.stack_id', stackId).orWhereIn('permit_limits.unit_id', unitIds))
    .orderBy([{ column: 'permit_limits.pollutant' }, { column: 'permit_limits.created_at' }])
    .select('permit_limits.*')) as LimitRow[];
  // The fuel of the stack's units with its latest analysis in force today (or the earliest one).
  const fuelRow = (await db('unit_fuels')
    .join('fuels', function joinFuel() {
      this.on('fuels.id', '=', 'unit_fuels.fuel_id').andOn('fuels.tenant_id', '=', 'unit_fuels.tenant_id');
    })
    .join('fuel_analyses', function joinAnalysis() {
      this.on('fuel_analyses.fuel_id', '=', 'fuels.id').andOn('fuel_analyses.tenant_id', '=', 'fuels.tenant_id');
    })
    .where('unit_fuels.tenant_id', tenantId)
    .whereIn('unit_fuels.unit_id', unitIds)
    .whereNull('fuels.archived_at')
    .orderBy([
      { column: 'fuels.name' },
      { column: db.raw('(fuel_analyses.valid_from <= current_date)') as unknown as string, order: 'desc' },
      { column: 'fuel_analyses.valid_from', order: 'desc' },
      { column: 'fuel_analyses.created_at', order: 'desc' },
    ])
    .first(
      'fuels.id as fuel_id',
      'fuels.name',
      'fuels.kind',
      'fuel_analyses.ultimate',
      'fuel_analyses.composition',
      'fuel_analyses.fd_dscf_per_mmbtu',
      'fuel_analyses.created_at as analysis_created_at',
    )) as
    | {
        fuel_id: string;
        name: string;
        kind: FuelInfo['kind'];
        ultimate: Record<string, number> | null;
        composition: Record<string, number> | null;
        fd_dscf_per_mmbtu: string;
        analysis_created_at: Date;
      }
    | undefined;

  let fuel: FuelInfo | null = null;
  if (fuelRow) {
    const calcFuel: Fuel | null =
      fuelRow.kind === 'gas'
        ? fuelRow.composition ? { kind: 'gas', composition: fuelRow.composition } : null
        : fuelRow.ultimate ? { kind: fuelRow.kind, ultimate: fuelRow.ultimate as unknown as Extract<Fuel, { kind: 'solid' }>['ultimate'] } : null;
    fuel = {
      fuelId: fuelRow.fuel_id,
      name: fuelRow.name,
      kind: fuelRow.kind,
      fuel: calcFuel,
      fdDscfPerMMBtu: Number(fuelRow.fd_dscf_per_mmbtu),
      analysisCreatedAt: fuelRow.analysis_created_at,
    };
  }

  return {
    stackId: stack.id,
    stackName: stack.name,
    siteId: stack.site_id,
    siteName: stack.site_name,
    timeZone: stack.time_zone,
    regime: stack.regime,
    channels: channelRows.map(toChannelInfo),
    limits,
    fuel,
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
