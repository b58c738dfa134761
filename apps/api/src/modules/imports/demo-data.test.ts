import { type ReadingStatus, aggregateHours, isUsableHour, o2Co2Consistency } from '@flueledger/calc';
import { northmoorDemoMonth } from '../../cli/generate-demo-workbook';
import { PLAUSIBILITY_TOLERANCE_PERCENT } from '../review/review.service';
import {
  type DemoRow,
  co2DriftWorstSpanErrorPercent,
  demoBoilerChannels,
  demoMonthEvents,
  demoMonthRows,
  northmoorBoiler2Channels,
  northmoorGasCo2MaxPercentDry,
  northmoorGridGas2026,
} from './demo-data';

const month = { year: 2026, month: 10, timeZone: 'Europe/Berlin' };

describe('demo month', () => {
  const rows = [...demoMonthRows(month)];
  const nox = demoBoilerChannels.findIndex((c) => c.parameter === 'NOx');

  it('has one row per minute of the local month, the repeated autumn hour included', () => {
    expect(rows).toHaveLength(31 * 1440 + 60);
    expect(new Date(rows[0]!.startUtcMs).toISOString()).toBe('2026-09-30T22:00:00.000Z');
    expect(new Date(rows.at(-1)!.startUtcMs + 60_000).toISOString()).toBe('2026-10-31T23:00:00.000Z');
    const repeated = rows.filter((r) => new Date(r.wallMs).toISOString().startsWith('2026-10-25T02:30'));
    expect(repeated).toHaveLength(2);
  });

  it('is the same for the same seed, and different for another', () => {
    const again = [...demoMonthRows(month)];
    expect(again.slice(0, 500)).toEqual(rows.slice(0, 500));
    const other = [...demoMonthRows({ ...month, seed: 7 })];
    expect(other[100]!.values).not.toEqual(rows[100]!.values);
  });

  it('carries a calibration hour, an analyser outage, a spike and text cells where it says', () => {
    const events = demoMonthEvents(month);
    expect(events.dstRepeatedHour).toBe('2026-10-25 02:00–02:59');
    expect(rows.filter((r) => r.status === 'calibration')).toHaveLength(60);
    const outage = rows.filter((r) => r.status === 'fault');
    expect(outage.length).toBe(165);
    expect(outage.every((r) => r.values[nox] === null)).toBe(true);
    const peak = Math.max(...rows.filter((r) => r.status === 'valid').map((r) => r.values[nox] as number));
    expect(peak).toBeGreaterThan(200);
    expect(rows.flatMap((r) => r.values).filter((v) => v === '----')).toHaveLength(5);
  });

  it('keeps ordinary NOx in a gas boiler’s usual range (common practice: low-NOx burner, tens of mg/Nm3)', () => {
    const valid = rows.filter((r) => r.status === 'valid').map((r) => r.values[nox] as number).sort((a, b) => a - b);
    const median = valid[Math.floor(valid.length / 2)]!;
    expect(median).toBeGreaterThan(50);
    expect(median).toBeLessThan(90);
  });
});

/** "2026-10-18 07:00" (site wall clock) → wall milliseconds. */
const wall = (label: string): number => Date.parse(`${label.replace(' ', 'T')}:00Z`);

/**
 * CO2 expected from O2 on a dry basis with complete combustion: CO2max · (20.9 − O2)/20.9
 * (REFERENCES.md §1, the dilution of the stoichiometric dry flue gas by excess air).
 */
const expectedCo2 = (o2PercentDry: number): number => (northmoorGasCo2MaxPercentDry * (20.9 - o2PercentDry)) / 20.9;

describe('the Northmoor Boiler 2 month (the example file and the demo seed)', () => {
  const rows = [...demoMonthRows(northmoorDemoMonth)];
  const events = demoMonthEvents(northmoorDemoMonth);
  const o2 = northmoorBoiler2Channels.findIndex((c) => c.parameter === 'O2');
  const co2 = northmoorBoiler2Channels.findIndex((c) => c.parameter === 'CO2');
  const drift = events.co2Drift!;
  const inDrift = (r: DemoRow): boolean => r.wallMs >= wall(drift.from) && r.wallMs <= wall(drift.to);

  it('has a CO2 column in the logger’s style, and its drift among the events', () => {
    expect(northmoorBoiler2Channels[co2]).toMatchObject({ header: 'K2_CO2', unit: '%', analyser: true });
    expect(drift).toEqual({ from: '2026-10-16 00:01', to: '2026-10-19 10:00', channel: 'K2_CO2', worstSpanErrorPercent: -15 });
    // The other faults stay where they were.
    expect(events.calibration.from).toBe('2026-10-07 09:01');
    expect(events.outage.from).toBe('2026-10-14 13:21');
    expect(events.spike.from).toBe('2026-10-21 06:11');
    expect(events.dstRepeatedHour).toBe('2026-10-25 02:00–02:59');
  });

  it('works CO2max out of the seeded grid gas as a hand calculation does', () => {
    // Per mole of fuel (REFERENCES.md §1 [derived], air 21 % O2): CO2 = 0.932 + 2·0.036 + 3·0.008
    // + 4·0.003 + 0.009 = 1.049; O2 demand = 2·0.932 + 3.5·0.036 + 5·0.008 + 6.5·0.003 = 2.0495;
    // dry flue gas = 1.049 + 2.0495·79/21 + 0.012 = 8.7710; CO2max = 104.9/8.7710 = 11.960 %.
    expect(northmoorGridGas2026.composition).toEqual({ CH4: 93.2, C2H6: 3.6, C3H8: 0.8, C4H10: 0.3, CO2: 0.9, N2: 1.2 });
    expect(northmoorGasCo2MaxPercentDry).toBeCloseTo(11.96, 2);
  });

  it('writes CO2 as O2 and the fuel’s CO2max make it outside the drift, zero and span gas while calibrating, nothing in the outage', () => {
    const steady = rows.filter((r) => r.status === 'valid' && !inDrift(r));
    const worst = Math.max(...steady.map((r) => Math.abs((r.values[co2] as number) - expectedCo2(r.values[o2] as number))));
    // Analyser noise (σ 0.03 %) and 2-decimal rounding of both columns: well under 0.2 % CO2.
    expect(worst).toBeLessThan(0.2);
    const calibration = rows.filter((r) => r.status === 'calibration').map((r) => r.values[co2] as number);
    expect(calibration).toHaveLength(60);
    expect(Math.max(...calibration.slice(0, 30).map(Math.abs))).toBeLessThan(0.1);
    expect(Math.min(...calibration.slice(30))).toBeGreaterThan(15.9);
    expect(rows.filter((r) => r.status === 'fault').every((r) => r.values[co2] === null)).toBe(true);
  });

  it('lets the CO2 reading fall slowly to 85 % of the true value during the drift, then recover', () => {
    const ratio = (r: DemoRow): number => (r.values[co2] as number) / expectedCo2(r.values[o2] as number);
    const window = rows.filter(inDrift);
    expect(window).toHaveLength((3 * 24 + 10) * 60);
    const mean = (xs: DemoRow[]) => xs.reduce((sum, r) => sum + ratio(r), 0) / xs.length;
    expect(mean(window.slice(0, 60))).toBeCloseTo(1, 2);
    expect(mean(window.slice(-60))).toBeCloseTo(1 + co2DriftWorstSpanErrorPercent / 100, 2);
    // Slow: no hour-to-hour step larger than the linear ramp's (15 % over 82 h ≈ 0.18 % an hour, plus noise).
    const hourly = Array.from({ length: window.length / 60 }, (_, h) => mean(window.slice(h * 60, h * 60 + 60)));
    for (let h = 1; h < hourly.length; h++) expect(Math.abs(hourly[h]! - hourly[h - 1]!)).toBeLessThan(0.005);
    const after = rows.filter((r) => r.status === 'valid' && r.wallMs > wall(drift.to)).slice(0, 60);
    expect(mean(after)).toBeCloseTo(1, 2);
  });

  it('makes the O2/CO2 plausibility check flag hours in the drift window only', () => {
    // The stored path: readings → hourly values of each channel (calc's aggregateHours, the default
    // quadrant rule, as results/channel-hours.ts runs it) → usable hours of both → the check
    // CO2 vs CO2max·(20.9 − O2)/20.9 (REFERENCES.md §1) at the review's tolerance (common practice).
    const hoursOf = (k: number) =>
      aggregateHours(
        rows.map((r) => ({ t: r.startUtcMs, value: typeof r.values[k] === 'number' ? r.values[k] : null, status: r.status as ReadingStatus })),
        { from: rows[0]!.startUtcMs, to: rows.at(-1)!.startUtcMs + 60_000, intervalMinutes: 1, timestampMarks: 'start' },
      );
    const o2Hours = hoursOf(o2);
    const co2Hours = hoursOf(co2);
    const flagged: number[] = [];
    let checked = 0;
    for (let i = 0; i < o2Hours.t.length; i++) {
      if (!isUsableHour(o2Hours, i) || !isUsableHour(co2Hours, i)) continue;
      checked++;
      const r = o2Co2Consistency({ o2PercentDry: o2Hours.value[i]!, co2PercentDry: co2Hours.value[i]!, co2MaxPercentDry: northmoorGasCo2MaxPercentDry });
      if (Math.abs(r.deviationRelativePercent) > PLAUSIBILITY_TOLERANCE_PERCENT) flagged.push(o2Hours.t[i]!);
    }
    // 745 hours; the calibration hour is not usable.
    expect(checked).toBeGreaterThan(740);
    // Europe/Berlin is UTC+2 in the drift window (before 25 October).
    const driftFromUtc = wall(drift.from) - 60_000 - 2 * 3_600_000;
    const driftToUtc = wall(drift.to) - 2 * 3_600_000;
    expect(flagged.length).toBeGreaterThanOrEqual(20);
    for (const t of flagged) {
      expect(t).toBeGreaterThanOrEqual(driftFromUtc);
      expect(t).toBeLessThan(driftToUtc);
    }
    // The drift reaches the tolerance after 10/15 of its 82 hours: the flags are its last day.
    expect(flagged[0]).toBeGreaterThanOrEqual(driftFromUtc + (10 / 15) * 82 * 3_600_000 - 3_600_000);
    expect(flagged.at(-1)).toBe(driftToUtc - 3_600_000);
  });
});
