import { type HourlySeries, hourlySeriesFromValues } from '@flueledger/calc';
import { channelHours, validityRuleFor } from './channel-hours';
import { deriveLimitHours, planLimit } from './limit-hours';
import type { ChannelInfo, FuelInfo } from './stack-context';

const H = 3_600_000;
const T0 = Date.UTC(2026, 10, 2, 0);

let seq = 0;
function channel(parameter: ChannelInfo['parameter'], unit: string, basis: 'wet' | 'dry' = 'dry'): ChannelInfo {
  seq++;
  return { id: `00000000-0000-4000-8000-${String(seq).padStart(12, '0')}`, stackId: 's', parameter, unit, basis, conditions: 'standard', intervalMinutes: 1, updatedAt: new Date(0) };
}

/** Two valid hours of a constant value. */
const constant = (value: number): HourlySeries =>
  hourlySeriesFromValues([
    { t: T0, value, status: 'valid', coverage: 1 },
    { t: T0 + H, value, status: 'valid', coverage: 1 },
  ]);

const limit = (over: Partial<Parameters<typeof deriveLimitHours>[0]>) => ({
  pollutant: 'NOx' as const,
  unit: 'mg/Nm3' as const,
  basis: 'dry' as const,
  reference_o2_percent: '3' as string | null,
  ambient_o2_percent: '21',
  correct_only_when_above: false,
  ...over,
});

const naturalGas: FuelInfo = {
  fuelId: 'f',
  name: 'Natural gas',
  kind: 'gas',
  fuel: { kind: 'gas', composition: { CH4: 100 } },
  fdDscfPerMMBtu: 8710, // Method 19 Table 19-2, natural gas [pub] (REFERENCES.md §2)
  analysisCreatedAt: new Date(0),
};

describe('planLimit', () => {
  it('picks the dry pollutant channel and the stack’s O2', () => {
    const wet = channel('NOx', 'mg/Nm3', 'wet');
    const dry = channel('NOx', 'mg/Nm3', 'dry');
    const o2 = channel('O2', '%');
    const plan = planLimit({ channels: [wet, dry, o2], fuel: null }, { pollutant: 'NOx', unit: 'mg/Nm3' });
    expect(plan.ok && plan.inputs.pollutant.id).toBe(dry.id);
    expect(plan.ok && plan.inputs.o2?.id).toBe(o2.id);
  });

  it('says why a limit has no hourly values', () => {
    const nox = channel('NOx', 'mg/Nm3');
    expect(planLimit({ channels: [nox], fuel: null }, { pollutant: 'SO2', unit: 'mg/Nm3' })).toEqual({ ok: false, problem: expect.stringContaining('No SO2 channel') });
    expect(planLimit({ channels: [nox], fuel: null }, { pollutant: 'NOx', unit: 't/yr' })).toEqual({ ok: false, problem: expect.stringContaining('annual') });
  });
});

describe('deriveLimitHours', () => {
  it('corrects to the reference O2 with the same hour’s O2: 150 mg/Nm3 at 8 % → 207.69 at 3 % (REFERENCES.md §4 [derived])', () => {
    const nox = channel('NOx', 'mg/Nm3');
    const o2 = channel('O2', '%');
    const plan = planLimit({ channels: [nox, o2], fuel: null }, { pollutant: 'NOx', unit: 'mg/Nm3' });
    if (!plan.ok) throw new Error(plan.problem);
    const rows = deriveLimitHours(limit({}), plan, new Map([[nox.id, constant(150)], [o2.id, constant(8)]]), null);
    expect(rows).toHaveLength(2);
    expect(rows[0]!.value).toBeCloseTo(207.69, 2);
    expect(rows[0]).toMatchObject({ status: 'valid', o2PercentDry: 8, dryMgPerNm3: 150, channelId: nox.id });
  });

  it('brings ppm to mg/Nm3 as NO2: 100 ppm NOx → 205.25 mg/Nm3 (200 ppm → 410.5, REFERENCES.md §4 [derived])', () => {
    const nox = channel('NOx', 'ppm');
    const plan = planLimit({ channels: [nox], fuel: null }, { pollutant: 'NOx', unit: 'mg/Nm3' });
    if (!plan.ok) throw new Error(plan.problem);
    const rows = deriveLimitHours(limit({ reference_o2_percent: null }), plan, new Map([[nox.id, constant(100)]]), null);
    expect(rows[0]!.value).toBeCloseTo(410.5 / 2, 1);
  });

  it('puts a wet measurement on a dry basis with the hour’s moisture: 100 wet at 10 % H2O → 111.11 dry (C/(1 − 0.10))', () => {
    const nox = channel('NOx', 'mg/Nm3', 'wet');
    const h2o = channel('H2O', '%', 'wet');
    const plan = planLimit({ channels: [nox, h2o], fuel: null }, { pollutant: 'NOx', unit: 'mg/Nm3' });
    if (!plan.ok) throw new Error(plan.problem);
    const rows = deriveLimitHours(limit({ reference_o2_percent: null }), plan, new Map([[nox.id, constant(100)], [h2o.id, constant(10)]]), null);
    expect(rows[0]!.value).toBeCloseTo(100 / 0.9, 6);
  });

  it('states a heat-input limit by Method 19: 50 ppm NOx dry at 3.0 % O2 on natural gas → 0.0607 lb/MMBtu (REFERENCES.md §2 [derived])', () => {
    const nox = channel('NOx', 'ppm');
    const o2 = channel('O2', '%');
    const plan = planLimit({ channels: [nox, o2], fuel: naturalGas }, { pollutant: 'NOx', unit: 'lb/MMBtu' });
    if (!plan.ok) throw new Error(plan.problem);
    expect(plan.usesFuel).toBe(true);
    const rows = deriveLimitHours(limit({ unit: 'lb/MMBtu', reference_o2_percent: null }), plan, new Map([[nox.id, constant(50)], [o2.id, constant(3)]]), naturalGas);
    // Via mg/Nm3 (0 °C) and Fd in Nm3/GJ: the same figure as the lb/scf route of eq. 19-1 to 4 decimals.
    expect(rows[0]!.value).toBeCloseTo(0.0607, 4);
  });

  it('gives the mass rate from the dry flow: 100 mg/Nm3 × 50,000 Nm3/h = 5 kg/h', () => {
    const nox = channel('NOx', 'mg/Nm3');
    const flow = channel('flow', 'Nm3/h');
    const plan = planLimit({ channels: [nox, flow], fuel: null }, { pollutant: 'NOx', unit: 'kg/h' });
    if (!plan.ok) throw new Error(plan.problem);
    const rows = deriveLimitHours(limit({ unit: 'kg/h', reference_o2_percent: null }), plan, new Map([[nox.id, constant(100)], [flow.id, constant(50_000)]]), null);
    expect(rows[0]).toMatchObject({ value: 5, massKgPerHour: 5, status: 'valid' });
  });

  it('takes a US flow in standard cubic feet per hour: 1,000,000 scfh (68 °F) = 26,385 Nm3/h → 2.6385 kg/h at 100 mg/Nm3', () => {
    // 1 Nm3 = 35.3147 ft3 × 293.15 K / 273.15 K = 37.900 scf at 68 °F, 29.92 in Hg (40 CFR 60.2 standard
    // conditions; 0.3048 m/ft exact; ideal gas) [derived].
    const nox = channel('NOx', 'mg/Nm3');
    const flow = channel('flow', 'scfh');
    const plan = planLimit({ channels: [nox, flow], fuel: null }, { pollutant: 'NOx', unit: 'kg/h' });
    if (!plan.ok) throw new Error(plan.problem);
    const rows = deriveLimitHours(limit({ unit: 'kg/h', reference_o2_percent: null }), plan, new Map([[nox.id, constant(100)], [flow.id, constant(1_000_000)]]), null);
    const nm3PerHour = 1_000_000 / ((1 / 0.3048 ** 3) * (293.15 / 273.15));
    expect(nm3PerHour).toBeCloseTo(26_385, 0);
    expect(rows[0]!.massKgPerHour).toBeCloseTo((100 * nm3PerHour) / 1e6, 9);
  });

  it('reads a temperature in °F as the same temperature in °C (212 °F = 100 °C, 50 °F = 10 °C)', () => {
    const at = (unit: 'degC' | 'degF', value: number) => {
      const nox = { ...channel('NOx', 'mg/Nm3'), conditions: 'actual' as const };
      const temperature = channel('temperature', unit);
      const pressure = channel('pressure', 'kPa');
      const plan = planLimit({ channels: [nox, temperature, pressure], fuel: null }, { pollutant: 'NOx', unit: 'mg/Nm3' });
      if (!plan.ok) throw new Error(plan.problem);
      return deriveLimitHours(limit({ reference_o2_percent: null }), plan, new Map([[nox.id, constant(100)], [temperature.id, constant(value)], [pressure.id, constant(101.325)]]), null)[0]!;
    };
    for (const [f, c] of [[212, 100], [50, 10]] as const) {
      const inC = at('degC', c);
      expect(inC.status).toBe('valid');
      expect(at('degF', f).value).toBeCloseTo(inC.value!, 9);
    }
    // 100 mg/m3 at 100 °C and 101.325 kPa is 100 × 373.15 / 273.15 mg/Nm3 (ideal gas).
    expect(at('degF', 212).value).toBeCloseTo((100 * 373.15) / 273.15, 6);
  });

  it('makes every hour invalid for an O2-referenced limit on a stack without O2', () => {
    const nox = channel('NOx', 'mg/Nm3');
    const plan = planLimit({ channels: [nox], fuel: null }, { pollutant: 'NOx', unit: 'mg/Nm3' });
    if (!plan.ok) throw new Error(plan.problem);
    const rows = deriveLimitHours(limit({}), plan, new Map([[nox.id, constant(80)]]), null);
    expect(rows.map((r) => [r.status, r.reason, r.value])).toEqual([
      ['invalid', 'o2_invalid', null],
      ['invalid', 'o2_invalid', null],
    ]);
  });
});

describe('channelHours', () => {
  it('averages valid readings and applies the regime’s validity rule', () => {
    // One hour of minutes: 40 valid at 50, 20 in calibration (two thirds valid).
    const n = 60;
    const t = Float64Array.from({ length: n }, (_, m) => T0 + m * 60_000);
    const value = Float64Array.from({ length: n }, () => 50);
    const status = Uint8Array.from({ length: n }, (_, m) => (m < 20 ? 1 : 0)); // 1 = calibration
    const eu = channelHours({ t, value, status }, { fromMs: T0, toMs: T0 + H, intervalMinutes: 1, rule: validityRuleFor('eu_ied') });
    expect(eu).toEqual([{ hourStart: T0, value: 50, status: 'valid', coverage: 40 / 60, readingsValid: 40, readingsTotal: 60, reason: null }]);
    // US: the first quadrant has no valid reading, but a calibration hour only needs two valid
    // readings 15 minutes apart (40 CFR 60.13(h)(2)(iii) [memory]).
    const us = channelHours({ t, value, status }, { fromMs: T0, toMs: T0 + H, intervalMinutes: 1, rule: validityRuleFor('us_epa') });
    expect(us[0]!.status).toBe('valid');
    // Half the hour in fault: invalid under the EU share rule, with the cause.
    const faulty = Uint8Array.from({ length: n }, (_, m) => (m < 30 ? 3 : 0)); // 3 = fault
    const bad = channelHours({ t, value, status: faulty }, { fromMs: T0, toMs: T0 + H, intervalMinutes: 1, rule: validityRuleFor('eu_ied') });
    expect(bad[0]).toMatchObject({ status: 'invalid', reason: 'fault', value: 50 });
  });
});
