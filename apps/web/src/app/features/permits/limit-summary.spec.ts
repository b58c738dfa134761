import { LimitSummaryInput, limitSummary } from './limit-summary';

const daily: LimitSummaryInput = {
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

describe('limitSummary', () => {
  it('writes an IED daily NOx limit the way the set-up contract shows it', () => {
    // The example sentence of the set-up contract (issue 5): IED Annex V Part 3 point 9 (NOx CI 20 %)
    // and Part 4 point 1(b) (daily ≤ 110 % of the ELV).
    expect(limitSummary(daily)).toBe('NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily average, validated (−20 %), every day ≤ 110 % of ELV');
  });

  it('writes the 95 % hourly rule as a share of periods', () => {
    // IED Annex V Part 4 point 1(d): 95 % of validated hourly averages ≤ 200 % of the ELV.
    expect(limitSummary({ ...daily, period: 'hour', criterion: { type: 'share_of_periods', factor: 2, share: 0.95 } })).toBe(
      'NOx ≤ 100 mg/Nm3, dry, 3 % O2, hourly average, validated (−20 %), 95 % of hours ≤ 200 % of ELV',
    );
  });

  it('leaves the O2 out of a heat-input limit and names a rolling window', () => {
    expect(
      limitSummary({
        ...daily,
        elv: 0.2,
        unit: 'lb/MMBtu',
        referenceO2Percent: null,
        period: 'rolling_days',
        periodLength: 30,
        criterion: { type: 'every_period', factor: 1 },
        confidenceIntervalPercent: null,
      }),
    ).toBe('NOx ≤ 0.2 lb/MMBtu, per heat input (F-factor), 30 operating-day rolling average, every 30-day average ≤ ELV');
  });

  it('says when no O2 correction applies', () => {
    expect(limitSummary({ ...daily, referenceO2Percent: null, confidenceIntervalPercent: null, criterion: { type: 'every_period', factor: 1 } })).toBe(
      'NOx ≤ 100 mg/Nm3, dry, no O2 correction, daily average, every day ≤ ELV',
    );
  });
});
