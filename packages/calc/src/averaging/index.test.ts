import fc from 'fast-check';
import { type HourStatus, type HourlyValue, hourlySeriesFromValues } from '../hourly/series';
import { localPeriodBoundaries } from '../periods';
import { blockAverages, periodAverages, rollingAverages, validatedAverage } from './index';

const H = 3_600_000;
const D = 24 * H;

function series(from: number, hours: number, value: (i: number) => number | null, status: (i: number) => HourStatus = () => 'valid') {
  const rows: HourlyValue[] = [];
  for (let i = 0; i < hours; i++) {
    const v = value(i);
    const st = v === null && status(i) === 'valid' ? 'invalid' : status(i);
    rows.push({ t: from + i * H, value: st === 'invalid' || st === 'not-operating' ? null : v, status: st });
  }
  return hourlySeriesFromValues(rows);
}

describe('validatedAverage (IED 2010/75/EU Annex V Part 3 points 9–10)', () => {
  it('subtracts the confidence interval as a share of the ELV: NOx ELV 100, hourly 95, CI 20 % → 75', () => {
    expect(validatedAverage(95, 100, 20)).toBe(75);
  });
  it('uses CO 10 %, SO2 20 %, dust 30 % the same way and floors at zero', () => {
    expect(validatedAverage(50, 100, 10)).toBe(40); // CO
    expect(validatedAverage(150, 200, 20)).toBe(110); // SO2
    expect(validatedAverage(12, 20, 30)).toBe(6); // dust
    expect(validatedAverage(5, 100, 20)).toBe(0);
  });
  it('refuses a confidence interval outside 0–100 %', () => {
    expect(() => validatedAverage(1, 100, 120)).toThrow(/0–100/);
  });
});

describe('periodAverages', () => {
  const tz = 'Europe/Berlin';
  const day0 = Date.UTC(2026, 5, 9, 22); // 2026-06-10 00:00 CEST

  describe('a day with more than 3 invalid hourly averages is invalid (IED Annex V Part 3 point 11)', () => {
    it('keeps a day with exactly 3 invalid hours valid and invalidates one with 4', () => {
      const s = series(day0, 48, (i) => ((i < 3) || (i >= 24 && i < 28) ? null : 80));
      const days = periodAverages(s, { period: 'day', timeZone: tz, minData: { maxInvalidHoursPerDay: 3 } });
      expect(days.map((d) => d.status)).toEqual(['valid', 'invalid']);
      expect(days[0]!.invalidHours).toBe(3);
      expect(days[1]!.invalidHours).toBe(4);
      expect(days[1]!.note).toMatch(/more than 3 invalidate a day/);
      expect(days[0]!.value).toBe(80);
    });

    it('does not count not-operating or start-up/shut-down hours as invalid', () => {
      const s = series(day0, 24, () => 80, (i) => (i < 6 ? 'not-operating' : i < 10 ? 'startup-shutdown' : 'valid'));
      const [d] = periodAverages(s, { period: 'day', timeZone: tz, minData: { maxInvalidHoursPerDay: 3 } });
      expect(d!.status).toBe('valid');
      expect([d!.validHours, d!.invalidHours, d!.excludedHours, d!.notOperatingHours]).toEqual([14, 0, 4, 6]);
    });

    it('counts invalid days inside a month', () => {
      const monthStart = Date.UTC(2026, 5, 30, 22); // 2026-07-01 00:00 CEST
      const s = series(monthStart, 31 * 24, (i) => (i % 24 < 5 && i < 3 * 24 ? null : 60));
      const [m] = periodAverages(s, { period: 'month', timeZone: tz, minData: { maxInvalidHoursPerDay: 3 } });
      expect(m!.invalidDays).toBe(3);
      expect(m!.totalHours).toBe(744);
      expect(m!.status).toBe('valid');
    });
  });

  it('subtracts the confidence interval from each hourly value before averaging (Annex V Part 3 point 10)', () => {
    const s = series(day0, 24, (i) => (i < 12 ? 95 : 55));
    const [d] = periodAverages(s, { period: 'day', timeZone: tz, confidenceInterval: 20 });
    expect(d!.value).toBe(55);
    expect(d!.measuredValue).toBe(75);
  });

  it('averages over 23- and 25-hour days at the DST changes (Europe/Berlin and America/Chicago)', () => {
    for (const [zone, spring, autumn] of [
      ['Europe/Berlin', Date.UTC(2026, 2, 29, 12), Date.UTC(2026, 9, 25, 12)],
      ['America/Chicago', Date.UTC(2026, 2, 8, 18), Date.UTC(2026, 10, 1, 18)],
    ] as const) {
      for (const [at, hours] of [[spring, 23], [autumn, 25]] as const) {
        const [b0, b1] = localPeriodBoundaries(at, at + 1, 'day', zone);
        // 3 days of hourly values around the change; value = the hour's index within its local day.
        const s = series(b0! - D, 3 * 26, (i) => i);
        const days = periodAverages(s, { period: 'day', timeZone: zone, from: b0!, to: b1! });
        expect(days).toHaveLength(1);
        expect(days[0]!.totalHours).toBe(hours);
        expect(days[0]!.validHours).toBe(hours);
        expect(days[0]!.hourTo - days[0]!.hourFrom).toBe(hours);
      }
    }
  });

  it('averages months of 28, 29, 30 and 31 days (Gregorian calendar, leap year 2024)', () => {
    const from = Date.UTC(2024, 0, 1);
    const to = Date.UTC(2024, 4, 1);
    const s = series(from, (to - from) / H, () => 40);
    const months = periodAverages(s, { period: 'month', timeZone: 'UTC' });
    expect(months.map((m) => m.totalHours / 24)).toEqual([31, 29, 31, 30]);
    const s23 = series(Date.UTC(2023, 1, 1), 28 * 24, () => 40);
    expect(periodAverages(s23, { period: 'month', timeZone: 'UTC' })[0]!.validHours).toBe(28 * 24);
  });

  it('marks a period still in progress incomplete', () => {
    const s = series(day0, 30, () => 50);
    const days = periodAverages(s, { period: 'day', timeZone: tz, to: day0 + 2 * D });
    expect(days.map((d) => d.status)).toEqual(['valid', 'incomplete']);
    // A day in progress that already has 4 invalid hours cannot become valid any more.
    const bad = series(day0, 30, (i) => (i >= 24 && i < 28 ? null : 50));
    const now = periodAverages(bad, { period: 'day', timeZone: tz, to: day0 + 2 * D, minData: { maxInvalidHoursPerDay: 3 } });
    expect(now.map((d) => d.status)).toEqual(['valid', 'invalid']);
  });

  it('a constant series gives that constant for every valid period (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 1e4, noNaN: true }),
        fc.constantFrom('day', 'month') as fc.Arbitrary<'day' | 'month'>,
        fc.constantFrom('UTC', 'Europe/Berlin', 'America/Chicago'),
        fc.array(fc.integer({ min: 0, max: 24 * 60 - 1 }), { maxLength: 40 }),
        (c, period, zone, invalid) => {
          const bad = new Set(invalid);
          const from = Date.UTC(2024, 1, 1);
          const s = series(from, 60 * 24, (i) => (bad.has(i) ? null : c));
          for (const p of periodAverages(s, { period, timeZone: zone, minData: { maxInvalidHoursPerDay: 3 } })) {
            if (p.status === 'valid') expect(p.value).toBeCloseTo(c, 9);
          }
          for (const p of rollingAverages(s, { window: { kind: 'days', days: 7 }, timeZone: zone })) if (p.value !== null) expect(p.value).toBeCloseTo(c, 9);
          for (const p of blockAverages(s, { hours: 3, timeZone: zone })) if (p.value !== null) expect(p.value).toBeCloseTo(c, 9);
        },
      ),
      { numRuns: 20 },
    );
  });
});

describe('rollingAverages', () => {
  const tz = 'America/Chicago';
  const start = Date.UTC(2026, 0, 1, 6); // 2026-01-01 00:00 CST

  it('forms a 30-operating-day rolling average from the hourly values of the last 30 operating days (40 CFR 60.48Da(b) [pub]; hourly-mean form [memory])', () => {
    // §60.48Da(b): average over 30 successive boiler operating days, a new one each boiler operating day, https://www.ecfr.gov/current/title-40/part-60/section-60.48Da
    // 40 days; days 10–14 the unit is off; day d's hours all have value d.
    const off = (d: number) => d >= 10 && d < 15;
    const s = series(start, 40 * 24, (i) => Math.floor(i / 24), (i) => (off(Math.floor(i / 24)) ? 'not-operating' : 'valid'));
    const r = rollingAverages(s, { window: { kind: 'days', days: 30 }, timeZone: tz });
    expect(r).toHaveLength(35); // one value per operating day
    const full = r.filter((p) => p.status === 'valid');
    // The first full window ends on day 34 (30 operating days: 0–9 and 15–34).
    expect(full[0]!.start).toBe(start + 34 * D);
    const days = [...Array.from({ length: 10 }, (_, d) => d), ...Array.from({ length: 20 }, (_, k) => 15 + k)];
    expect(full[0]!.value).toBeCloseTo(days.reduce((a, b) => a + b, 0) / 30, 12);
    expect(full[0]!.windowStart).toBe(start);
    expect(full[0]!.validHours).toBe(30 * 24);
    // Traceability: the hours inside the window.
    expect(full[0]!.hourFrom).toBe(0);
    expect(full[0]!.hourTo).toBe(35 * 24);
    expect(r[0]!.status).toBe('incomplete');
    // With calendar days (not operating days) the 30-day window ending on day 34 starts on day 5.
    const cal = rollingAverages(s, { window: { kind: 'days', days: 30, operatingOnly: false }, timeZone: tz });
    expect(cal.find((p) => p.start === start + 34 * D)!.windowStart).toBe(start + 5 * D);
  });

  it('requires N valid hours on M of the window\'s days (40 CFR 60 boiler rules: 18 h on 22 of 30 days [memory])', () => {
    // 30 days; on 9 of them only 17 valid hours.
    const s = series(start, 30 * 24, () => 50, (i) => (Math.floor(i / 24) < 9 && i % 24 >= 17 ? 'invalid' : 'valid'));
    const md = { minValidHoursPerDay: 18, minValidDays: 22 };
    const last = rollingAverages(s, { window: { kind: 'days', days: 30 }, timeZone: tz, minData: md }).at(-1)!;
    expect(last.status).toBe('invalid');
    expect(last.note).toMatch(/21 days/);
    const s8 = series(start, 30 * 24, () => 50, (i) => (Math.floor(i / 24) < 8 && i % 24 >= 17 ? 'invalid' : 'valid'));
    expect(rollingAverages(s8, { window: { kind: 'days', days: 30 }, timeZone: tz, minData: md }).at(-1)!.status).toBe('valid');
  });

  it('forms rolling N-operating-hour averages', () => {
    const s = series(start, 10, (i) => i, (i) => (i === 4 ? 'not-operating' : 'valid'));
    const r = rollingAverages(s, { window: { kind: 'hours', hours: 3 }, timeZone: tz });
    expect(r).toHaveLength(9);
    // Hour 5's window: operating hours 2, 3, 5.
    const h5 = r.find((p) => p.start === start + 5 * H)!;
    expect(h5.value).toBeCloseTo((2 + 3 + 5) / 3, 12);
    expect(h5.windowStart).toBe(start + 2 * H);
  });
});

describe('blockAverages', () => {
  it('forms 3-hour blocks from local midnight (40 CFR 60 3-hour periods [memory])', () => {
    const tz = 'America/Chicago';
    const start = Date.UTC(2026, 0, 1, 6);
    const s = series(start, 24, (i) => i);
    const b = blockAverages(s, { hours: 3, timeZone: tz, minData: { minValidHours: 2 } });
    expect(b).toHaveLength(8);
    expect(b.map((x) => x.value)).toEqual([1, 4, 7, 10, 13, 16, 19, 22]);
    expect(b[1]!.start).toBe(start + 3 * H);
  });

  it('keeps blocks inside 23- and 25-hour days, the last block shorter', () => {
    const tz = 'America/Chicago';
    const nov1 = Date.UTC(2026, 10, 1, 5); // 25-hour day
    const s = series(nov1, 25, () => 1);
    const b = blockAverages(s, { hours: 3, timeZone: tz, from: nov1, to: nov1 + 25 * H });
    expect(b.map((x) => x.totalHours)).toEqual([3, 3, 3, 3, 3, 3, 3, 3, 1]);
  });

  it('invalidates a block with fewer valid hours than required', () => {
    const s = series(Date.UTC(2026, 0, 1), 6, (i) => (i === 0 || i === 1 ? null : 10));
    const b = blockAverages(s, { hours: 3, timeZone: 'UTC', minData: { minValidHours: 2 } });
    expect(b.map((x) => x.status)).toEqual(['invalid', 'valid']);
  });
});
