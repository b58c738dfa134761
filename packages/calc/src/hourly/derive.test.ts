import { deriveHourlyValues } from './derive';
import { type HourlyValue, hourStatusAt, hourlySeriesFromValues, hourlyValuesFromSeries } from './series';

const H = 3_600_000;
const T0 = Date.UTC(2026, 4, 1);
const rows = (values: (number | null)[], status: (i: number) => HourlyValue['status'] = () => 'valid'): HourlyValue[] =>
  values.map((v, i) => ({ t: T0 + i * H, value: v, status: v === null ? 'invalid' : status(i) }));

describe('deriveHourlyValues', () => {
  it('corrects each hour to the reference O2 with the same hour\'s O2 (REFERENCES.md §4: 150 mg/Nm3 at 8 % → 207.69 at 3 %, ambient 21)', () => {
    const d = deriveHourlyValues(
      { pollutant: hourlySeriesFromValues(rows([150, 150])), o2: hourlySeriesFromValues(rows([8, 3])) },
      { pollutantUnit: 'mgPerNm3', pollutantBasis: 'dry', referenceO2Percent: 3 },
    );
    expect(d.value[0]).toBeCloseTo(207.69, 2);
    expect(d.value[1]).toBeCloseTo(150, 10);
    expect(d.dryValue[0]).toBe(150);
  });

  it('does not correct an hour whose O2 is invalid: the hour becomes invalid for the O2-referenced limit', () => {
    const d = deriveHourlyValues(
      { pollutant: hourlySeriesFromValues(rows([150, 150, 150])), o2: hourlySeriesFromValues(rows([8, null, 21])) },
      { pollutantUnit: 'mgPerNm3', pollutantBasis: 'dry', referenceO2Percent: 3 },
    );
    expect(hourStatusAt(d, 0)).toBe('valid');
    expect(hourStatusAt(d, 1)).toBe('invalid');
    expect(Number.isNaN(d.value[1]!)).toBe(true);
    expect(hourlyValuesFromSeries(d)[1]!.reason).toBe('o2-invalid');
    // O2 at ambient (21 %): no flue gas, no correction possible (IED Annex VI Part 7 formula has 21 − O2 in the denominator).
    expect(hourStatusAt(d, 2)).toBe('invalid');
    expect(hourlyValuesFromSeries(d)[2]!.reason).toBe('o2-out-of-range');
    // Without a reference O2 the same hours keep their dry values.
    const plain = deriveHourlyValues({ pollutant: hourlySeriesFromValues(rows([150, 150, 150])) }, { pollutantUnit: 'mgPerNm3', pollutantBasis: 'dry' });
    expect(Array.from(plain.value)).toEqual([150, 150, 150]);
  });

  it('treats an hour missing from the O2 series as invalid O2', () => {
    const o2 = hourlySeriesFromValues([{ t: T0, value: 5, status: 'valid' }]);
    const d = deriveHourlyValues({ pollutant: hourlySeriesFromValues(rows([100, 100])), o2 }, { pollutantUnit: 'mgPerNm3', pollutantBasis: 'dry', referenceO2Percent: 6 });
    expect([hourStatusAt(d, 0), hourStatusAt(d, 1)]).toEqual(['valid', 'invalid']);
  });

  it('goes ppm → mg/Nm3 → dry → reference O2 (REFERENCES.md §4: 200 ppm NO2 = 410.5 mg/Nm3; C_dry = C_wet/(1 − H2O))', () => {
    const d = deriveHourlyValues(
      {
        pollutant: hourlySeriesFromValues(rows([180])),
        moisture: hourlySeriesFromValues(rows([10])),
        o2: hourlySeriesFromValues(rows([3])),
      },
      { pollutantUnit: 'ppm', species: 'NOx', pollutantBasis: 'wet', referenceO2Percent: 3 },
    );
    // 180 ppm wet / 0.9 = 200 ppm dry = 410.5 mg/Nm3; measured O2 equals the reference.
    expect(d.value[0]).toBeCloseTo(410.5, 1);
  });

  it('brings wet O2 to dry before correcting', () => {
    const d = deriveHourlyValues(
      { pollutant: hourlySeriesFromValues(rows([100])), moisture: hourlySeriesFromValues(rows([10])), o2: hourlySeriesFromValues(rows([7.2])) },
      { pollutantUnit: 'mgPerNm3', pollutantBasis: 'dry', o2Basis: 'wet', referenceO2Percent: 3 },
    );
    expect(d.o2PercentDry[0]).toBeCloseTo(8, 12);
    expect(d.value[0]).toBeCloseTo((100 * 18) / 13, 10);
  });

  it('leaves values at or below the reference O2 uncorrected when the limit says so (IED Annex VI Part 7 [memory])', () => {
    const d = deriveHourlyValues(
      { pollutant: hourlySeriesFromValues(rows([100, 100])), o2: hourlySeriesFromValues(rows([9, 13])) },
      { pollutantUnit: 'mgPerNm3', pollutantBasis: 'dry', referenceO2Percent: 11, correctOnlyWhenAboveReference: true },
    );
    expect(d.value[0]).toBe(100);
    expect(d.value[1]).toBeCloseTo(125, 10);
  });

  it('computes a mass rate from the dry flow, and from the fuel flow with the O2-based F-factor form (Method 19 Eq. 19-1)', () => {
    const byFlow = deriveHourlyValues(
      { pollutant: hourlySeriesFromValues(rows([200])), flowNm3PerHour: hourlySeriesFromValues(rows([50_000])), o2: hourlySeriesFromValues(rows([6])) },
      { pollutantUnit: 'mgPerNm3', pollutantBasis: 'dry', referenceO2Percent: 3 },
    );
    expect(byFlow.massKgPerHour![0]).toBeCloseTo(10, 12); // 200 mg/Nm3 · 50,000 Nm3/h = 10 kg/h
    const byFuel = deriveHourlyValues(
      { pollutant: hourlySeriesFromValues(rows([200])), fuelKgPerHour: hourlySeriesFromValues(rows([1000])), o2: hourlySeriesFromValues(rows([7])) },
      { pollutantUnit: 'mgPerNm3', pollutantBasis: 'dry', dryFlueGasNm3PerKgFuelStoich: 10 },
    );
    // 1000 kg/h · 10 Nm3/kg · 21/(21 − 7) = 15,000 Nm3/h dry → 3 kg/h
    expect(byFuel.massKgPerHour![0]).toBeCloseTo(3, 12);
  });

  it('refuses an O2-referenced derivation without an O2 series', () => {
    expect(() => deriveHourlyValues({ pollutant: hourlySeriesFromValues(rows([1])) }, { pollutantUnit: 'mgPerNm3', pollutantBasis: 'dry', referenceO2Percent: 3 })).toThrow(/O2 series/);
  });
});
