import { iedLcpRules, usRolling30DayRule, type LimitRule } from '@flueledger/calc';
import type { Knex } from 'knex';
import { analysisFigures } from '../apps/api/src/modules/fuels/fuel-factors';
import { northmoorGridGas2026 } from '../apps/api/src/modules/imports/demo-data';
import type { CreateAnalysisBody, FuelKind, FuelType } from '../apps/api/src/modules/fuels/fuels.schemas';
import { fromLimitRule } from '../apps/api/src/modules/permits/limits.mapper';

// The demo plants: an invented paper mill under the EU Industrial Emissions Directive and an
// invented US cooperative under 40 CFR 60. Names, numbers and analyses are made up but typical.
// Idempotent: fixed ids, and every insert skips rows that exist. Runs as the schema owner inside
// each organisation's row-level security scope (FORCEd), after 01_demo_organisations.
// F-factors and heating values come from @flueledger/calc, exactly as the API computes them.

const NORTHMOOR = '4f1c2a7e-3b5d-4c8e-9a10-6d2e8b7c1a01';
const RED_MESA = '8a3d5e21-7c4b-4f6a-b2d9-0e1f3c5a7b02';

/** Fixed demo ids: d5e7<kind>-0000-4000-8000-<n>. */
const id = (kind: string, n: number) => `d5e7${kind}-0000-4000-8000-${String(n).padStart(12, '0')}`;

const ids = {
  northmoorMill: id('5172', 1),
  gas: id('f0e1', 1),
  woodChips: id('f0e1', 2),
  gasAnalysis2025: id('a0a1', 1),
  gasAnalysis2026: id('a0a1', 2),
  woodAnalysis: id('a0a1', 3),
  boiler2: id('0417', 1),
  biomassBoiler: id('0417', 2),
  gt1: id('0417', 3),
  stack1: id('57ac', 1),
  stack2: id('57ac', 2),
  stack3: id('57ac', 3),
  permitNm: id('9e41', 1),
  redMesaStation: id('5172', 2),
  rmGas: id('f0e1', 3),
  rmGasAnalysis: id('a0a1', 4),
  auxBoiler: id('0417', 4),
  rmStack: id('57ac', 4),
  permitRm: id('9e41', 2),
};

interface ChannelSeed {
  parameter: string;
  unit: string;
  basis: 'wet' | 'dry';
  conditions: 'actual' | 'standard';
  rangeMin: number;
  rangeMax: number;
  label: string;
}

/** The usual set of a combustion stack's monitors, with the logger's column names. */
function standardChannels(prefix: string, extra: ChannelSeed[] = []): ChannelSeed[] {
  return [
    { parameter: 'NOx', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 400, label: `${prefix}_NOX` },
    { parameter: 'CO', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 300, label: `${prefix}_CO` },
    { parameter: 'O2', unit: '%', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 25, label: `${prefix}_O2` },
    { parameter: 'H2O', unit: '%', basis: 'wet', conditions: 'standard', rangeMin: 0, rangeMax: 40, label: `${prefix}_H2O` },
    { parameter: 'flow', unit: 'Nm3/h', basis: 'wet', conditions: 'standard', rangeMin: 0, rangeMax: 120000, label: `${prefix}_FLOW` },
    { parameter: 'temperature', unit: 'degC', basis: 'wet', conditions: 'actual', rangeMin: 0, rangeMax: 400, label: `${prefix}_TEMP` },
    ...extra,
  ];
}

async function inTenant(knex: Knex, tenantId: string, work: (trx: Knex.Transaction) => Promise<void>): Promise<void> {
  await knex.transaction(async (trx) => {
    await trx.raw("select set_config('app.tenant_id', ?, true)", [tenantId]);
    await work(trx);
  });
}

async function upsert(trx: Knex.Transaction, table: string, rows: Record<string, unknown>[], conflict: string[] = ['id']) {
  if (rows.length > 0) await trx(table).insert(rows).onConflict(conflict).ignore();
}

async function addFuel(
  trx: Knex.Transaction,
  tenantId: string,
  fuel: { id: string; siteId: string; name: string; fuelType: FuelType; kind: FuelKind },
  analyses: { id: string; body: CreateAnalysisBody }[],
  createdBy: string | null,
) {
  await upsert(trx, 'fuels', [{ id: fuel.id, tenant_id: tenantId, site_id: fuel.siteId, name: fuel.name, fuel_type: fuel.fuelType, kind: fuel.kind }]);
  for (const analysis of analyses) {
    const f = analysisFigures(fuel.fuelType, fuel.kind, analysis.body);
    await upsert(trx, 'fuel_analyses', [
      {
        id: analysis.id,
        tenant_id: tenantId,
        fuel_id: fuel.id,
        valid_from: analysis.body.validFrom,
        ultimate: f.ultimate ? JSON.stringify(f.ultimate) : null,
        composition: f.composition ? JSON.stringify(f.composition) : null,
        gcv_mj_per_kg: f.gcvMJPerKg,
        gcv_mj_per_nm3: f.gcvMJPerNm3,
        gcv_source: f.gcvSource,
        fd_dscf_per_mmbtu: f.fdDscfPerMMBtu,
        fw_wscf_per_mmbtu: f.fwWscfPerMMBtu,
        fc_scf_per_mmbtu: f.fcScfPerMMBtu,
        f_factor_source: f.fFactorSource,
        created_by: createdBy,
      },
    ]);
  }
}

async function addChannels(trx: Knex.Transaction, tenantId: string, stackId: string, stackNo: number, channels: ChannelSeed[]) {
  await upsert(
    trx,
    'channels',
    channels.map((c, i) => ({
      id: id('c4a0', stackNo * 100 + i + 1),
      tenant_id: tenantId,
      stack_id: stackId,
      parameter: c.parameter,
      unit: c.unit,
      basis: c.basis,
      conditions: c.conditions,
      range_min: c.rangeMin,
      range_max: c.rangeMax,
      interval_minutes: 1,
      source_label: c.label,
    })),
  );
}

async function addLimits(
  trx: Knex.Transaction,
  tenantId: string,
  permitId: string,
  effectiveFrom: string,
  firstNo: number,
  stackId: string,
  rules: LimitRule[],
) {
  await upsert(
    trx,
    'permit_limits',
    rules.map((rule, i) => {
      const l = fromLimitRule(rule);
      return {
        id: id('11e1', firstNo + i),
        tenant_id: tenantId,
        permit_id: permitId,
        stack_id: stackId,
        unit_id: null,
        pollutant: l.pollutant,
        elv: l.elv,
        unit: l.unit,
        reference_o2_percent: l.referenceO2Percent,
        ambient_o2_percent: l.ambientO2Percent,
        basis: l.basis,
        period: l.period,
        period_length: l.periodLength,
        operating_periods_only: l.operatingPeriodsOnly,
        criterion: JSON.stringify(l.criterion),
        confidence_interval_percent: l.confidenceIntervalPercent,
        near_miss_percent: l.nearMissPercent,
        correct_only_when_above: l.correctOnlyWhenAbove,
        exclude_statuses: l.excludeStatuses,
        min_data: l.minData ? JSON.stringify(l.minData) : null,
        effective_from: effectiveFrom,
      };
    }),
  );
}

async function seedNorthmoor(knex: Knex, officerId: string | null, managerId: string | null) {
  const t = NORTHMOOR;
  await inTenant(knex, t, async (trx) => {
    await upsert(trx, 'sites', [
      { id: ids.northmoorMill, tenant_id: t, name: 'Northmoor Mill', time_zone: 'Europe/Berlin', country: 'DE', regime: 'eu_ied', address: 'Mühlenweg 12, Northmoor (invented)' },
    ]);
    if (managerId) await upsert(trx, 'site_members', [{ tenant_id: t, site_id: ids.northmoorMill, user_id: managerId }], ['tenant_id', 'site_id', 'user_id']);

    // Grid gas (H-gas), mol %; two lab reports to show the history. The 2026 one is the gas of the
    // demo month (its CO2max, 11.96 % dry, is what the example file's CO2 follows).
    await addFuel(
      trx,
      t,
      { id: ids.gas, siteId: ids.northmoorMill, name: 'Natural gas (grid, H-gas)', fuelType: 'natural_gas', kind: 'gas' },
      [
        { id: ids.gasAnalysis2025, body: { validFrom: '2025-01-01', composition: { CH4: 94.0, C2H6: 3.0, C3H8: 0.6, C4H10: 0.2, CO2: 1.0, N2: 1.2 } } },
        { id: ids.gasAnalysis2026, body: { validFrom: '2026-01-01', composition: { ...northmoorGridGas2026.composition } } },
      ],
      officerId,
    );
    // Forest-residue wood chips as fired (30 % moisture), mass %, with a measured GCV.
    await addFuel(
      trx,
      t,
      { id: ids.woodChips, siteId: ids.northmoorMill, name: 'Wood chips (forest residue)', fuelType: 'wood', kind: 'solid' },
      [{ id: ids.woodAnalysis, body: { validFrom: '2026-01-01', ultimate: { C: 35.2, H: 4.3, O: 28.6, N: 0.25, S: 0.03, moisture: 30.0, ash: 1.62 }, gcvMJPerKg: 14.2 } }],
      officerId,
    );

    await upsert(trx, 'emission_units', [
      { id: ids.boiler2, tenant_id: t, site_id: ids.northmoorMill, name: 'Boiler 2', unit_type: 'boiler', rated_thermal_input_mwth: 48, in_service_from: '2004-09-01' },
      { id: ids.biomassBoiler, tenant_id: t, site_id: ids.northmoorMill, name: 'Biomass Boiler', unit_type: 'boiler', rated_thermal_input_mwth: 22, in_service_from: '2016-03-15' },
      { id: ids.gt1, tenant_id: t, site_id: ids.northmoorMill, name: 'GT1', unit_type: 'gas_turbine', rated_thermal_input_mwth: 9, in_service_from: '2019-06-01' },
    ]);
    await upsert(
      trx,
      'unit_fuels',
      [
        { tenant_id: t, unit_id: ids.boiler2, fuel_id: ids.gas },
        { tenant_id: t, unit_id: ids.biomassBoiler, fuel_id: ids.woodChips },
        { tenant_id: t, unit_id: ids.gt1, fuel_id: ids.gas },
      ],
      ['tenant_id', 'unit_id', 'fuel_id'],
    );

    await upsert(trx, 'stacks', [
      { id: ids.stack1, tenant_id: t, site_id: ids.northmoorMill, name: 'Stack 1 (Boiler 2)', height_m: 55, diameter_m: 2.2 },
      { id: ids.stack2, tenant_id: t, site_id: ids.northmoorMill, name: 'Stack 2 (Biomass Boiler)', height_m: 45, diameter_m: 1.6 },
      { id: ids.stack3, tenant_id: t, site_id: ids.northmoorMill, name: 'GT1 exhaust', height_m: 25, diameter_m: 1.4 },
    ]);
    await upsert(
      trx,
      'stack_units',
      [
        { tenant_id: t, stack_id: ids.stack1, unit_id: ids.boiler2 },
        { tenant_id: t, stack_id: ids.stack2, unit_id: ids.biomassBoiler },
        { tenant_id: t, stack_id: ids.stack3, unit_id: ids.gt1 },
      ],
      ['tenant_id', 'stack_id', 'unit_id'],
    );
    // Boiler 2's stack also measures CO2 (dry), so the review can check it against O2 and the gas's
    // CO2max (analyser drift). Appended: the other channels keep their ids.
    await addChannels(
      trx,
      t,
      ids.stack1,
      1,
      standardChannels('K2', [{ parameter: 'CO2', unit: '%', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 20, label: 'K2_CO2' }]),
    );
    await addChannels(
      trx,
      t,
      ids.stack2,
      2,
      standardChannels('BIO', [
        { parameter: 'SO2', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 200, label: 'BIO_SO2' },
        { parameter: 'dust', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 50, label: 'BIO_DUST' },
      ]),
    );
    await addChannels(trx, t, ids.stack3, 3, standardChannels('GT1'));

    const effectiveFrom = '2024-07-01';
    await upsert(trx, 'permits', [
      { id: ids.permitNm, tenant_id: t, site_id: ids.northmoorMill, reference: 'NM-IED-2024-017', authority: 'Northmoor Regional Environment Agency (invented)', effective_from: effectiveFrom },
    ]);
    // IED Annex V Part 4 point 1: validated monthly ≤ ELV, daily ≤ 110 %, 95 % of hours ≤ 200 %;
    // reference O2 per Annex V Part 1 (3 % gas boilers, 6 % solid fuel, 15 % gas turbines).
    const co = (elv: number, o2: number) => iedLcpRules({ pollutant: 'CO', elvMgPerNm3: elv, referenceO2Percent: o2 })[1];
    await addLimits(trx, t, ids.permitNm, effectiveFrom, 1, ids.stack1, [
      ...iedLcpRules({ pollutant: 'NOx', elvMgPerNm3: 100, referenceO2Percent: 3 }),
      co(100, 3),
    ]);
    await addLimits(trx, t, ids.permitNm, effectiveFrom, 11, ids.stack2, [
      ...iedLcpRules({ pollutant: 'NOx', elvMgPerNm3: 300, referenceO2Percent: 6 }),
      ...iedLcpRules({ pollutant: 'dust', elvMgPerNm3: 20, referenceO2Percent: 6 }),
      co(250, 6),
    ]);
    await addLimits(trx, t, ids.permitNm, effectiveFrom, 21, ids.stack3, iedLcpRules({ pollutant: 'NOx', elvMgPerNm3: 50, referenceO2Percent: 15 }));
  });
}

async function seedRedMesa(knex: Knex, adminId: string | null) {
  const t = RED_MESA;
  await inTenant(knex, t, async (trx) => {
    await upsert(trx, 'sites', [
      { id: ids.redMesaStation, tenant_id: t, name: 'Red Mesa Station', time_zone: 'America/Denver', country: 'US', regime: 'us_epa', address: '1 Mesa Road, Red Mesa (invented)' },
    ]);
    // Pipeline gas on the Method 19 Table 19-2 default F-factors (Fd 8710 dscf/MMBtu).
    await addFuel(
      trx,
      t,
      { id: ids.rmGas, siteId: ids.redMesaStation, name: 'Pipeline natural gas', fuelType: 'natural_gas', kind: 'gas' },
      [{ id: ids.rmGasAnalysis, body: { validFrom: '2023-01-01', fFactorSource: 'method19_default' } }],
      adminId,
    );
    // 250 MMBtu/h heat input ≈ 73.3 MWth
    await upsert(trx, 'emission_units', [
      { id: ids.auxBoiler, tenant_id: t, site_id: ids.redMesaStation, name: 'Auxiliary Boiler 1', unit_type: 'boiler', rated_thermal_input_mwth: 73.3, in_service_from: '2011-10-01' },
    ]);
    await upsert(trx, 'unit_fuels', [{ tenant_id: t, unit_id: ids.auxBoiler, fuel_id: ids.rmGas }], ['tenant_id', 'unit_id', 'fuel_id']);
    await upsert(trx, 'stacks', [{ id: ids.rmStack, tenant_id: t, site_id: ids.redMesaStation, name: 'AB1 stack', height_m: 61, diameter_m: 2.7 }]);
    await upsert(trx, 'stack_units', [{ tenant_id: t, stack_id: ids.rmStack, unit_id: ids.auxBoiler }], ['tenant_id', 'stack_id', 'unit_id']);
    await addChannels(trx, t, ids.rmStack, 4, [
      { parameter: 'NOx', unit: 'ppm', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 200, label: 'AB1_NOX_PPM' },
      { parameter: 'O2', unit: '%', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 25, label: 'AB1_O2' },
      // US practice: flow in standard cubic feet per hour (68 °F), temperature in °F.
      { parameter: 'flow', unit: 'scfh', basis: 'wet', conditions: 'standard', rangeMin: 0, rangeMax: 5_000_000, label: 'AB1_FLOW_SCFH' },
      { parameter: 'temperature', unit: 'degF', basis: 'wet', conditions: 'actual', rangeMin: 32, rangeMax: 650, label: 'AB1_TEMP_F' },
    ]);
    const effectiveFrom = '2023-05-01';
    await upsert(trx, 'permits', [
      { id: ids.permitRm, tenant_id: t, site_id: ids.redMesaStation, reference: 'RM-AQ-2023-0042', authority: 'State Air Quality Division (invented)', effective_from: effectiveFrom },
    ]);
    await addLimits(trx, t, ids.permitRm, effectiveFrom, 31, ids.rmStack, [
      usRolling30DayRule({ pollutant: 'NOx', elv: 0.2, unit: 'lb/MMBtu' }),
    ]);
  });
}

export async function seed(knex: Knex): Promise<void> {
  const userId = async (email: string) => ((await knex('users').where({ email }).first('id')) as { id: string } | undefined)?.id ?? null;
  await seedNorthmoor(knex, await userId('officer@northmoor.example'), await userId('manager@northmoor.example'));
  await seedRedMesa(knex, await userId('admin@redmesa.example'));
}
