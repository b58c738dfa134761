import { IED_LCP_CONFIDENCE_INTERVAL_PERCENT as fromIndex } from './index';
import { IED_LCP_CONFIDENCE_INTERVAL_PERCENT } from './confidence-interval';
import { LimitSentenceInput, describeLimit } from './describe';

/** An IED daily NOx limit of a gas-fired boiler. */
const daily: LimitSentenceInput = {
  pollutant: 'NOx',
  elv: 100,
  unit: 'mg/Nm3',
  referenceO2Percent: 3,
  basis: 'dry',
  period: 'day',
  periodLength: null,
  operatingPeriodsOnly: true,
  criterion: { type: 'every_period', factor: 1.1 },
  confidenceIntervalPercent: 20,
  correctOnlyWhenAbove: false,
};

describe('describeLimit', () => {
  it('writes the IED daily rule: validated daily average ≤ 110 % of the ELV', () => {
    // IED 2010/75/EU Annex V Part 4 point 1(b) [pub] (daily ≤ 110 % of the ELV) and Part 3
    // point 9 [pub] (NOx confidence interval 20 %); the example sentence of the set-up contract.
    expect(describeLimit(daily)).toBe('NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily average, validated (−20 %), every day ≤ 110 % of ELV');
  });

  it('starts the sentence with a capital for a pollutant named in words, and keeps formulae as written', () => {
    expect(describeLimit({ ...daily, pollutant: 'dust', elv: 10 })).toMatch(/^Dust ≤ 10 mg\/Nm3, /);
    expect(describeLimit({ ...daily, pollutant: 'NOx' })).toMatch(/^NOx ≤ /);
  });

  it('writes the 95 % hourly rule as a share of periods', () => {
    // IED Annex V Part 4 point 1(d) [pub]: 95 % of the validated hourly averages ≤ 200 % of the ELV.
    expect(describeLimit({ ...daily, period: 'hour', criterion: { type: 'share_of_periods', factor: 2, share: 0.95 } })).toBe(
      'NOx ≤ 100 mg/Nm3, dry, 3 % O2, hourly average, validated (−20 %), 95 % of hours ≤ 200 % of ELV',
    );
  });

  it('leaves the O2 out of a heat-input limit and names an operating-day rolling window', () => {
    // 30-boiler-operating-day rolling average in lb/MMBtu: 40 CFR 60.48Da(b) [pub: https://www.ecfr.gov/current/title-40/part-60/section-60.48Da].
    const us: LimitSentenceInput = {
      ...daily,
      elv: 0.2,
      unit: 'lb/MMBtu',
      referenceO2Percent: null,
      period: 'rolling_days',
      periodLength: 30,
      criterion: { type: 'every_period', factor: 1 },
      confidenceIntervalPercent: null,
    };
    expect(describeLimit(us)).toBe(
      'NOx ≤ 0.2 lb/MMBtu, per heat input (F-factor), 30 operating-day rolling average, every 30-day average ≤ ELV',
    );
    expect(describeLimit({ ...us, unit: 'ng/J', elv: 86 })).toBe(
      'NOx ≤ 86 ng/J, per heat input (F-factor), 30 operating-day rolling average, every 30-day average ≤ ELV',
    );
  });

  it('says nothing of O2 or heat input for a mass limit', () => {
    expect(
      describeLimit({ ...daily, elv: 12.5, unit: 't/yr', referenceO2Percent: null, period: 'year', confidenceIntervalPercent: null, criterion: { type: 'every_period', factor: 1 } }),
    ).toBe('NOx ≤ 12.5 t/yr, annual average, every year ≤ ELV');
  });

  it('says when no O2 correction applies, and when it applies only above the reference', () => {
    expect(describeLimit({ ...daily, referenceO2Percent: null, confidenceIntervalPercent: null, criterion: { type: 'every_period', factor: 1 } })).toBe(
      'NOx ≤ 100 mg/Nm3, dry, no O2 correction, daily average, every day ≤ ELV',
    );
    expect(describeLimit({ ...daily, basis: 'wet', referenceO2Percent: 15, correctOnlyWhenAbove: true, confidenceIntervalPercent: 0 })).toBe(
      'NOx ≤ 100 mg/Nm3, wet, 15 % O2 (corrected only when above), daily average, every day ≤ 110 % of ELV',
    );
  });

  it('names half-hours, blocks and hour windows, with and without operating periods only', () => {
    expect(describeLimit({ ...daily, period: 'half_hour', confidenceIntervalPercent: null, criterion: { type: 'share_of_periods', factor: 2, share: 0.97 } })).toBe(
      'NOx ≤ 100 mg/Nm3, dry, 3 % O2, half-hourly average, 97 % of half-hours ≤ 200 % of ELV',
    );
    expect(describeLimit({ ...daily, period: 'block_hours', periodLength: 3, confidenceIntervalPercent: null, criterion: { type: 'every_period', factor: 1 } })).toBe(
      'NOx ≤ 100 mg/Nm3, dry, 3 % O2, 3-hour block average, every 3-hour block ≤ ELV',
    );
    expect(
      describeLimit({ ...daily, period: 'rolling_hours', periodLength: 24, operatingPeriodsOnly: false, confidenceIntervalPercent: null, criterion: { type: 'every_period', factor: 1 } }),
    ).toBe('NOx ≤ 100 mg/Nm3, dry, 3 % O2, 24-hour rolling average, every 24-hour average ≤ ELV');
    expect(describeLimit({ ...daily, period: 'month', confidenceIntervalPercent: null, criterion: { type: 'every_period', factor: 1 } })).toBe(
      'NOx ≤ 100 mg/Nm3, dry, 3 % O2, monthly average, every month ≤ ELV',
    );
  });

  it('writes numbers as people do: no binary-fraction noise, no trailing zeros', () => {
    // 0.1 + 0.2 is 0.30000000000000004 in binary floating point; 1.15 × 100 is 114.99999999999999.
    expect(describeLimit({ ...daily, elv: 0.1 + 0.2, referenceO2Percent: 3.5, criterion: { type: 'every_period', factor: 1.15 } })).toBe(
      'NOx ≤ 0.3 mg/Nm3, dry, 3.5 % O2, daily average, validated (−20 %), every day ≤ 115 % of ELV',
    );
  });
});

describe('IED_LCP_CONFIDENCE_INTERVAL_PERCENT', () => {
  it('holds the IED Annex V Part 3 point 9 values and is the one the limit presets use', () => {
    // IED 2010/75/EU Annex V Part 3 point 9 [pub]: CO 10 %, SO2 20 %, NOx 20 %, dust 30 % of the ELV.
    expect(IED_LCP_CONFIDENCE_INTERVAL_PERCENT).toEqual({ CO: 10, SO2: 20, NOx: 20, dust: 30 });
    expect(fromIndex).toBe(IED_LCP_CONFIDENCE_INTERVAL_PERCENT);
  });
});
