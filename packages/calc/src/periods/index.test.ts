import { TZDate } from '@date-fns/tz';
import { startOfDay } from 'date-fns';
import { hoursInLocalDay, localPeriodBoundaries, nextLocalPeriodStart, startOfLocalPeriod } from './index';

const H = 3_600_000;

describe('local calendar periods', () => {
  describe('DST days in Europe/Berlin (EU summer time: last Sunday of March and of October at 01:00 UTC, Directive 2000/84/EC)', () => {
    it('gives 2026-03-29 23 hours and 2026-10-25 25 hours', () => {
      expect(hoursInLocalDay(Date.UTC(2026, 2, 29, 12), 'Europe/Berlin')).toBe(23);
      expect(hoursInLocalDay(Date.UTC(2026, 9, 25, 12), 'Europe/Berlin')).toBe(25);
      expect(hoursInLocalDay(Date.UTC(2026, 5, 1, 12), 'Europe/Berlin')).toBe(24);
    });

    it('starts the spring-forward day at local midnight CET (23:00 UTC the day before)', () => {
      expect(startOfLocalPeriod(Date.UTC(2026, 2, 29, 12), 'day', 'Europe/Berlin')).toBe(Date.UTC(2026, 2, 28, 23));
      expect(nextLocalPeriodStart(Date.UTC(2026, 2, 28, 23), 'day', 'Europe/Berlin')).toBe(Date.UTC(2026, 2, 29, 22));
    });

    it('agrees with @date-fns/tz on every day boundary of 2026', () => {
      const b = localPeriodBoundaries(Date.UTC(2025, 11, 31, 23), Date.UTC(2026, 11, 31, 23), 'day', 'Europe/Berlin');
      expect(b.length).toBe(366);
      for (const x of b) {
        const d = new TZDate(x, 'Europe/Berlin');
        expect([d.getHours(), d.getMinutes()]).toEqual([0, 0]);
      }
      const lengths = Array.from(b.subarray(1), (e, k) => (e - b[k]!) / H);
      expect(lengths.filter((l) => l === 23)).toHaveLength(1);
      expect(lengths.filter((l) => l === 25)).toHaveLength(1);
    });
  });

  describe('DST days in America/Chicago (US DST: second Sunday of March, first Sunday of November at 02:00 local, 15 U.S.C. 260a)', () => {
    it('gives 2026-03-08 23 hours and 2026-11-01 25 hours', () => {
      expect(hoursInLocalDay(Date.UTC(2026, 2, 8, 18), 'America/Chicago')).toBe(23);
      expect(hoursInLocalDay(Date.UTC(2026, 10, 1, 18), 'America/Chicago')).toBe(25);
    });

    it('starts 2026-11-01 at 05:00 UTC (CDT, UTC−5) and the next day at 06:00 UTC (CST, UTC−6)', () => {
      const start = startOfLocalPeriod(Date.UTC(2026, 10, 1, 18), 'day', 'America/Chicago');
      expect(start).toBe(Date.UTC(2026, 10, 1, 5));
      expect(nextLocalPeriodStart(start, 'day', 'America/Chicago')).toBe(Date.UTC(2026, 10, 2, 6));
    });
  });

  describe('months and years (Gregorian calendar)', () => {
    it('gives months of 31, 28, 31, 30 days in 2026 (UTC)', () => {
      const b = localPeriodBoundaries(Date.UTC(2026, 0, 1), Date.UTC(2026, 4, 1), 'month', 'UTC');
      const days = Array.from(b.subarray(1), (e, k) => (e - b[k]!) / (24 * H));
      expect(days).toEqual([31, 28, 31, 30]);
    });

    it('gives February 2024 29 days (leap year: divisible by 4, not by 100 unless by 400)', () => {
      const start = startOfLocalPeriod(Date.UTC(2024, 1, 15), 'month', 'UTC');
      expect((nextLocalPeriodStart(start, 'month', 'UTC') - start) / (24 * H)).toBe(29);
      const y = startOfLocalPeriod(Date.UTC(2024, 6, 1), 'year', 'UTC');
      expect((nextLocalPeriodStart(y, 'year', 'UTC') - y) / (24 * H)).toBe(366);
    });

    it('gives Berlin March 2026 31 days minus the lost hour (743 hours) and October 745 hours', () => {
      const mar = startOfLocalPeriod(Date.UTC(2026, 2, 10), 'month', 'Europe/Berlin');
      expect((nextLocalPeriodStart(mar, 'month', 'Europe/Berlin') - mar) / H).toBe(31 * 24 - 1);
      const oct = startOfLocalPeriod(Date.UTC(2026, 9, 10), 'month', 'Europe/Berlin');
      expect((nextLocalPeriodStart(oct, 'month', 'Europe/Berlin') - oct) / H).toBe(31 * 24 + 1);
    });

    it('starts the Chicago year at 06:00 UTC on 1 January', () => {
      expect(startOfLocalPeriod(Date.UTC(2026, 6, 1), 'year', 'America/Chicago')).toBe(Date.UTC(2026, 0, 1, 6));
    });
  });

  it('starts a day whose midnight falls into a DST gap (America/Santiago, September) where date-fns does', () => {
    const b = localPeriodBoundaries(Date.UTC(2026, 7, 25), Date.UTC(2026, 8, 20), 'day', 'America/Santiago');
    for (let k = 0; k + 1 < b.length; k++) {
      const mid = (b[k]! + b[k + 1]!) / 2;
      expect(b[k]).toBe(startOfDay(new TZDate(mid, 'America/Santiago')).getTime());
    }
  });

  it('refuses an unknown time zone with a clear message', () => {
    expect(() => localPeriodBoundaries(0, H, 'day', 'Mars/Olympus')).toThrow(/not an IANA time zone/);
  });
});
