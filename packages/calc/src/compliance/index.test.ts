import { type HourStatus, type HourlyValue, hourlySeriesFromValues } from '../hourly/series';
import { aggregateHours } from '../hourly/aggregate';
import { deriveHourlyValues } from '../hourly/derive';
import type { Reading } from '../readings';
import { iedLcpRules, parseLimitRule, usRolling30DayRule } from '../limits';
import { evaluateLimit } from './index';

const H = 3_600_000;
const D = 24 * H;
const TZ = 'Europe/Berlin';
const JUNE = Date.UTC(2026, 4, 31, 22); // 2026-06-01 00:00 CEST
const JULY = Date.UTC(2026, 5, 30, 22);

function series(from: number, hours: number, value: (i: number) => number | null, status: (i: number) => HourStatus = () => 'valid') {
  const rows: HourlyValue[] = [];
  for (let i = 0; i < hours; i++) {
    const v = value(i);
    const st = v === null ? 'invalid' : status(i);
    rows.push({ t: from + i * H, value: st === 'invalid' || st === 'not-operating' ? null : v, status: st });
  }
  return hourlySeriesFromValues(rows);
}

// NOx, ELV 100 mg/Nm3 at 3 % O2; validated values subtract 20 % of the ELV (IED Annex V Part 3 point 9).
const [monthly, daily, hourly95] = iedLcpRules({ pollutant: 'NOx', elvMgPerNm3: 100, referenceO2Percent: 3, nearMissPercent: 90 });

describe('evaluateLimit', () => {
  describe('IED Annex V Part 4 point 1(a): no validated monthly average above the ELV', () => {
    it('is compliant when the measured monthly average is 110 (validated 90)', () => {
      const e = evaluateLimit(series(JUNE, 30 * 24, () => 110), monthly, { from: JUNE, to: JULY }, { timeZone: TZ });
      expect(e.verdict).toBe('compliant');
      expect(e.periods).toHaveLength(1);
      expect(e.periods[0]!.value).toBeCloseTo(90, 12);
      expect(e.periods[0]!.measuredValue).toBeCloseTo(110, 12);
      expect(e.periods[0]!.outcome).toBe('near-miss'); // 90 % of the ELV
      expect(e.nearMisses).toHaveLength(1);
    });

    it('is an exceedance when the measured monthly average is 125 (validated 105)', () => {
      const e = evaluateLimit(series(JUNE, 30 * 24, () => 125), monthly, { from: JUNE, to: JULY }, { timeZone: TZ });
      expect(e.verdict).toBe('exceedance');
      expect(e.exceedances).toHaveLength(1);
      expect(e.exceedances[0]).toMatchObject({ kind: 'exceedance', start: JUNE, end: JULY, peakPercentOfElv: 105, durationMs: 30 * D });
    });
  });

  describe('IED Annex V Part 4 point 1(b): no validated daily average above 110 % of the ELV', () => {
    it('passes a day at validated 110 % exactly and fails one at 111 %, with the event traced', () => {
      // Day 0: measured 130 → validated 110; days 1–2: measured 131 → 111; day 3: 100.
      const s = series(JUNE, 4 * 24, (i) => [130, 131, 131, 100][Math.floor(i / 24)]!);
      const e = evaluateLimit(s, daily, { from: JUNE, to: JUNE + 4 * D }, { timeZone: TZ });
      expect(e.periods.map((p) => p.outcome)).toEqual(['near-miss', 'above', 'above', 'within']);
      expect(e.verdict).toBe('exceedance');
      expect(e.exceedances).toHaveLength(1);
      const ev = e.exceedances[0]!;
      expect(ev).toMatchObject({ start: JUNE + D, end: JUNE + 3 * D, durationMs: 2 * D, periodCount: 2, threshold: 110 });
      expect(ev.peak).toBeCloseTo(111, 12);
      expect(ev.peakPercentOfElv).toBeCloseTo(111, 12);
      // Traceability: the period's hours in the series.
      expect([e.periods[1]!.hourFrom, e.periods[1]!.hourTo]).toEqual([24, 48]);
    });

    it('does not judge a day with more than 3 invalid hours (IED Annex V Part 3 point 11), and counts it', () => {
      const s = series(JUNE, 2 * 24, (i) => (i >= 24 && i < 28 ? null : 200));
      const e = evaluateLimit(s, daily, { from: JUNE, to: JUNE + 2 * D }, { timeZone: TZ });
      expect(e.periods.map((p) => p.status)).toEqual(['valid', 'invalid']);
      expect(e.periods[1]!.outcome).toBe('not-assessed');
      expect(e.invalidDays).toBe(1);
      expect(e.availability).toMatchObject({ validHours: 44, invalidHours: 4, operatingHours: 48 });
      expect(e.availability.percent).toBeCloseTo((100 * 44) / 48, 12);
    });
  });

  describe('IED Annex V Part 4 point 1(d): 95 % of validated hourly averages ≤ 200 % of the ELV', () => {
    // 200 hourly values: at most floor(5 % · 200) = 10 may exceed 200.
    const run = (nAbove: number) =>
      evaluateLimit(series(JUNE, 200, (i) => (i < nAbove ? 230 : 100)), hourly95, { from: JUNE, to: JUNE + 200 * H }, { timeZone: TZ });

    it('is compliant with 10 of 200 hours above (validated 210 > 200)', () => {
      const e = run(10);
      expect(e.verdict).toBe('compliant');
      expect(e.share).toEqual({ required: 0.95, achieved: 0.95, validPeriods: 200, periodsAbove: 10, allowedAbove: 10 });
      expect(e.exceedances).toEqual([expect.objectContaining({ kind: 'above-threshold', periodCount: 10 })]);
    });

    it('is an exceedance with 11 of 200 hours above', () => {
      const e = run(11);
      expect(e.verdict).toBe('exceedance');
      expect(e.share!.achieved).toBeCloseTo(189 / 200, 12);
    });

    it('disregards start-up and shut-down hours (IED Annex V Part 4 point 3)', () => {
      const s = series(JUNE, 200, (i) => (i < 20 ? 500 : 100), (i) => (i < 20 ? 'startup-shutdown' : 'valid'));
      const e = evaluateLimit(s, hourly95, { from: JUNE, to: JUNE + 200 * H }, { timeZone: TZ });
      expect(e.verdict).toBe('compliant');
      expect(e.share!.validPeriods).toBe(180);
      expect(e.availability.excludedHours).toBe(20);
    });
  });

  it('says "insufficient-data" when the unit operated but no period is valid', () => {
    const s = series(JUNE, 24, (i) => (i < 5 ? null : 50));
    const e = evaluateLimit(s, daily, { from: JUNE, to: JUNE + D }, { timeZone: TZ });
    expect(e.verdict).toBe('insufficient-data');
  });

  it('evaluates a US-style 30-operating-day rolling limit', () => {
    const rule = usRolling30DayRule({ pollutant: 'NOx', elv: 0.15, unit: 'lb/MMBtu', nearMissPercent: 95 });
    const chicago = Date.UTC(2026, 0, 1, 6);
    // 40 operating days at 0.14 lb/MMBtu, then 10 days at 0.30: the rolling value crosses 0.15 on
    // the day the window's mean passes it: (k·0.30 + (30 − k)·0.14)/30 > 0.15 ⇔ k ≥ 2.
    const s = series(chicago, 50 * 24, (i) => (i < 40 * 24 ? 0.14 : 0.3));
    const e = evaluateLimit(s, rule, { from: chicago, to: chicago + 50 * D }, { timeZone: 'America/Chicago' });
    expect(e.verdict).toBe('exceedance');
    expect(e.exceedances[0]!.start).toBe(chicago + 41 * D);
    expect(e.periods.filter((p) => p.status === 'incomplete')).toHaveLength(29);
    expect(e.nearMisses[0]!.start).toBe(chicago + 40 * D); // (0.30 + 29·0.14)/30 = 0.1453 ≥ 95 % of 0.15
  });

  it('runs end to end from minute readings: an hour with invalid O2 is not corrected and not counted', () => {
    const readings: Reading[] = [];
    const o2: Reading[] = [];
    for (let m = 0; m < 24 * 60; m++) {
      const t = JUNE + m * 60_000;
      readings.push({ t, value: 60, status: 'valid' });
      // O2 analyser fault for the whole of hour 5.
      o2.push({ t, value: 8, status: m >= 300 && m < 360 ? 'fault' : 'valid' });
    }
    const hourly = deriveHourlyValues(
      { pollutant: aggregateHours(readings, { intervalMinutes: 1 }), o2: aggregateHours(o2, { intervalMinutes: 1 }) },
      { pollutantUnit: 'mgPerNm3', pollutantBasis: 'dry', referenceO2Percent: daily.referenceO2Percent },
    );
    const e = evaluateLimit(hourly, daily, { from: JUNE, to: JUNE + D }, { timeZone: TZ });
    expect(e.availability).toMatchObject({ validHours: 23, invalidHours: 1 });
    // 60 mg/Nm3 at 8 % O2 → 60·18/13 = 83.08 at 3 %, validated 63.08.
    expect(e.periods[0]!.measuredValue).toBeCloseTo((60 * 18) / 13, 9);
    expect(e.periods[0]!.value).toBeCloseTo((60 * 18) / 13 - 20, 9);
  });

  it('accepts a rule as plain data and refuses an invalid one', () => {
    const s = series(JUNE, 24, () => 10);
    const rule = { pollutant: 'CO', elv: 50, unit: 'mg/Nm3', referenceO2Percent: null, period: { kind: 'day' }, criterion: { kind: 'every-period' } } as const;
    expect(evaluateLimit(s, rule, { from: JUNE, to: JUNE + D }, { timeZone: TZ }).verdict).toBe('compliant');
    expect(() => evaluateLimit(s, { ...rule, elv: 0 }, { from: JUNE, to: JUNE + D }, { timeZone: TZ })).toThrow(/elv/);
    expect(parseLimitRule(rule).criterion).toEqual({ kind: 'every-period', factor: 1 });
  });
});
