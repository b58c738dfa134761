import fc from 'fast-check';
import { periodAverages } from '../averaging';
import { type HourlyValue, hourlySeriesFromValues } from '../hourly/series';
import { iedLcpRules, parseLimitRule } from '../limits';
import { headroom } from './index';

const H = 3_600_000;
const TZ = 'Europe/Berlin';
const JUNE = Date.UTC(2026, 4, 31, 22); // 2026-06-01 00:00 CEST
const JULY = Date.UTC(2026, 5, 30, 22);

const rows = (from: number, values: readonly (number | null)[]): HourlyValue[] =>
  values.map((v, i) => ({ t: from + i * H, value: v, status: v === null ? 'invalid' : 'valid' }));

// NOx ELV 100, CI 20 % of the ELV (IED Annex V Part 3 point 9); monthly ≤ ELV (Part 4 point 1(a)).
const [monthly, daily, hourly95] = iedLcpRules({ pollutant: 'NOx', elvMgPerNm3: 100, referenceO2Percent: 3 });

describe('headroom', () => {
  it('mid-month: 10 days at measured 120 (validated 100) leave 20 days at a validated 100 (measured 120)', () => {
    const s = hourlySeriesFromValues(rows(JUNE, Array(240).fill(120)));
    const h = headroom(s, monthly, { timeZone: TZ, asOf: JUNE + 240 * H });
    expect(h.periodStart).toBe(JUNE);
    expect(h.periodEnd).toBe(JULY);
    expect(h.remainingHours).toBe(480);
    expect(h.averageSoFar).toBeCloseTo(100, 12);
    expect(h.maxValidatedAverageRemaining).toBeCloseTo(100, 12);
    expect(h.maxAverageRemaining).toBeCloseTo(120, 12);
    expect(h.exceedanceCertain).toBe(false);
  });

  it('after a bad first half, shows the lower average the rest must keep', () => {
    // 15 days at measured 150 → validated 130; the remaining 15 days may average validated 70 → measured 90.
    const s = hourlySeriesFromValues(rows(JUNE, Array(360).fill(150)));
    const h = headroom(s, monthly, { timeZone: TZ, asOf: JUNE + 360 * H });
    expect(h.maxValidatedAverageRemaining).toBeCloseTo(70, 9);
    expect(h.maxAverageRemaining).toBeCloseTo(90, 9);
  });

  it('says an exceedance is certain when even zero emissions cannot bring the month back', () => {
    // 25 days at validated 130: (25·130)/30 = 108.3 > 100 even with five days at 0.
    const s = hourlySeriesFromValues(rows(JUNE, Array(600).fill(150)));
    const h = headroom(s, monthly, { timeZone: TZ, asOf: JUNE + 600 * H });
    expect(h.exceedanceCertain).toBe(true);
    expect(h.maxAverageRemaining).toBeNull();
  });

  it('notes a day already invalid (more than 3 invalid hours, IED Annex V Part 3 point 11)', () => {
    const s = hourlySeriesFromValues(rows(JUNE, [null, null, null, null, 80, 80]));
    const h = headroom(s, daily, { timeZone: TZ, asOf: JUNE + 6 * H });
    expect(h.remainingHours).toBe(18);
    expect(h.note).toMatch(/day is invalid/);
  });

  it('counts the hours above 200 % still allowed in the year for the 95 % rule', () => {
    const year = Date.UTC(2025, 11, 31, 23);
    const s = hourlySeriesFromValues(rows(year, [...Array(3).fill(250), ...Array(97).fill(80)]));
    const h = headroom(s, hourly95, { timeZone: TZ, asOf: year + 100 * H, remainingValidHours: 900 });
    // 1000 valid hours expected → 50 may be above; 3 used.
    expect(h.periodsAboveAllowedRemaining).toBe(47);
    expect(h.exceedanceCertain).toBe(false);
  });

  it('uses the window of a rolling 30-operating-day limit', () => {
    const rule = parseLimitRule({
      pollutant: 'NOx',
      elv: 100,
      unit: 'mg/Nm3',
      referenceO2Percent: 3,
      period: { kind: 'rolling-days', days: 30, operatingDaysOnly: true },
      criterion: { kind: 'every-period' },
    });
    // 40 days of data at 90; day 40 in progress with 12 hours at 90.
    const s = hourlySeriesFromValues(rows(JUNE, Array(40 * 24 + 12).fill(90)));
    const h = headroom(s, rule, { timeZone: TZ, asOf: JUNE + (40 * 24 + 12) * H });
    expect(h.windowStart).toBe(JUNE + 11 * 24 * H);
    expect(h.validHoursSoFar).toBe(29 * 24 + 12);
    // (100·720 − 90·708)/12 = 690
    expect(h.maxAverageRemaining).toBeCloseTo(690, 9);
  });

  it('filled exactly, the remaining hours give a period average equal to the limit (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0, max: 180, noNaN: true }), { minLength: 1, maxLength: 700 }),
        fc.constantFrom(monthly, daily),
        (soFar, rule) => {
          const s0 = hourlySeriesFromValues(rows(JUNE, soFar));
          const asOf = JUNE + soFar.length * H;
          const h = headroom(s0, rule, { timeZone: TZ, asOf });
          if (h.exceedanceCertain || h.maxAverageRemaining === null) return; // nothing to fill
          const fill = Array(h.remainingHours).fill(h.maxAverageRemaining);
          const full = hourlySeriesFromValues(rows(h.windowStart, [...soFar.slice(soFar.length - h.validHoursSoFar), ...fill]));
          const [p] = periodAverages(full, {
            period: rule.period.kind === 'month' ? 'month' : 'day',
            timeZone: TZ,
            from: h.periodStart,
            to: h.periodEnd,
            confidenceInterval: (rule.confidenceIntervalPercent / 100) * rule.elv,
          });
          expect(p!.value).toBeCloseTo(h.limit, 6);
        },
      ),
      { numRuns: 60 },
    );
  });
});
