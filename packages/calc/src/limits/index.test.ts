import { CalcInputError } from '../errors';
import { IED_LCP_CONFIDENCE_INTERVAL_PERCENT, checkLimitRule, iedLcpRules, parseLimitRule, usRolling30DayRule, usThreeHourBlockRule } from './index';

describe('limit rules as data', () => {
  const minimal = {
    pollutant: 'NOx',
    elv: 100,
    unit: 'mg/Nm3',
    referenceO2Percent: 3,
    period: { kind: 'day' },
    criterion: { kind: 'every-period', factor: 1.1 },
  };

  it('fills defaults: ambient 21 %, dry basis, no CI, start-up/shut-down excluded', () => {
    const r = parseLimitRule(minimal);
    expect(r).toMatchObject({ ambientO2Percent: 21, basis: 'dry', confidenceIntervalPercent: 0, excludeStatuses: ['startup-shutdown'], correctOnlyWhenAboveReference: false });
  });

  it('returns every issue with its path and a message that says what to fix', () => {
    const c = checkLimitRule({ ...minimal, elv: -5, period: { kind: 'fortnight' }, criterion: { kind: 'share-of-periods', share: 95, factor: 2 }, ambientO2Percent: 20 });
    expect(c.ok).toBe(false);
    if (c.ok) return;
    const byPath = Object.fromEntries(c.issues.map((i) => [i.path, i.message]));
    expect(byPath['elv']).toMatch(/above 0/);
    expect(byPath['period.kind']).toMatch(/period.kind must be one of/);
    expect(byPath['criterion.share']).toMatch(/0.95 for 95 %/);
    expect(byPath['ambientO2Percent']).toMatch(/21 \(EU\) or 20.9 \(US\)/);
  });

  it('refuses a reference O2 at or above ambient', () => {
    expect(() => parseLimitRule({ ...minimal, referenceO2Percent: 21 })).toThrow(CalcInputError);
    expect(() => parseLimitRule({ ...minimal, referenceO2Percent: 21 })).toThrow(/below the ambient 21 %/);
  });

  describe('IED Annex V presets (Directive 2010/75/EU Annex V Part 3 point 9, Part 4 point 1)', () => {
    it('expresses monthly ≤ ELV, daily ≤ 110 %, 95 % of hours ≤ 200 % with the NOx CI of 20 %', () => {
      const [monthly, daily, hourly] = iedLcpRules({ pollutant: 'NOx', elvMgPerNm3: 100, referenceO2Percent: 3 });
      expect(monthly.period).toEqual({ kind: 'month' });
      expect(monthly.criterion).toEqual({ kind: 'every-period', factor: 1 });
      expect(daily.period).toEqual({ kind: 'day' });
      expect(daily.criterion).toEqual({ kind: 'every-period', factor: 1.1 });
      expect(hourly.period).toEqual({ kind: 'hour' });
      expect(hourly.criterion).toEqual({ kind: 'share-of-periods', share: 0.95, factor: 2 });
      for (const r of [monthly, daily, hourly]) {
        expect(r.confidenceIntervalPercent).toBe(20);
        expect(r.minData?.maxInvalidHoursPerDay).toBe(3);
        expect(r.source).toMatch(/Annex V/);
      }
    });

    it('carries the confidence intervals CO 10 %, SO2 20 %, NOx 20 %, dust 30 %', () => {
      expect(IED_LCP_CONFIDENCE_INTERVAL_PERCENT).toEqual({ CO: 10, SO2: 20, NOx: 20, dust: 30 });
      expect(iedLcpRules({ pollutant: 'dust', elvMgPerNm3: 10, referenceO2Percent: 6 })[1].confidenceIntervalPercent).toBe(30);
    });

    it('lets the monthly rule be a rolling 30 days (national practice)', () => {
      expect(iedLcpRules({ pollutant: 'SO2', elvMgPerNm3: 200, referenceO2Percent: 6, monthly: 'rolling-30-days' })[0].period).toEqual({
        kind: 'rolling-days',
        days: 30,
        operatingDaysOnly: false,
      });
    });
  });

  it('expresses a US 30-operating-day rolling limit (40 CFR 60.48Da(b) [pub]) and a 3-hour block limit (40 CFR 60 [memory])', () => {
    // §60.48Da(b): 30 successive boiler operating days, recomputed each boiler operating day, https://www.ecfr.gov/current/title-40/part-60/section-60.48Da;
    // minimum data 18 h on 22 of 30 days [memory]
    const r = usRolling30DayRule({ pollutant: 'NOx', elv: 0.15, unit: 'lb/MMBtu' });
    expect(r.period).toEqual({ kind: 'rolling-days', days: 30, operatingDaysOnly: true });
    expect(r.ambientO2Percent).toBe(20.9);
    expect(r.referenceO2Percent).toBeNull();
    expect(r.minData).toEqual({ minValidHoursPerDay: 18, minValidDays: 22 });
    expect(usThreeHourBlockRule({ pollutant: 'SO2', elv: 1.2, unit: 'lb/MMBtu' }).period).toEqual({ kind: 'block-hours', hours: 3 });
  });
});
