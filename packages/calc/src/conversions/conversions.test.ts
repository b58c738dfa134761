import fc from 'fast-check';
import { CalcInputError } from '../errors';
import {
  convertSeries,
  correctSeriesToReferenceO2,
  correctToReferenceO2,
  dryToWet,
  mgPerNm3SeriesToPpm,
  mgPerNm3ToPpm,
  ppmSeriesToMgPerNm3,
  ppmToMgPerNm3,
  toStandardConditions,
  wetSeriesToDry,
  wetToDry,
} from './index';

describe('ppmToMgPerNm3', () => {
  it('converts 200 ppm NO2 to 410.5 mg/Nm3 at 0 °C', () => {
    expect(ppmToMgPerNm3(200, 'NO2')).toBeCloseTo(410.5, 1); // REFERENCES.md §4 [derived]
  });
  it('expresses NOx as NO2', () => {
    expect(ppmToMgPerNm3(100, 'NOx')).toBe(ppmToMgPerNm3(100, 'NO2')); // IED Annex V Part 1 note [pub]
  });
  it('uses the molar volume 22.414 L/mol at 0 °C and 24.055 L/mol at 20 °C', () => {
    // REFERENCES.md §4 [derived from CODATA R]: mg/m3 per ppm = M / Vm
    expect(ppmToMgPerNm3(1, 'SO2')).toBeCloseTo(64.064 / 22.414, 4);
    expect(ppmToMgPerNm3(1, 'SO2', { referenceTempK: 293.15 })).toBeCloseTo(64.064 / 24.055, 4);
    expect(ppmToMgPerNm3(1, 'CO', { referenceTempK: 298.15 })).toBeCloseTo(28.01 / 24.465, 4);
  });
  it('gives CO 1.2497 and SO2 2.858 mg/Nm3 per ppm', () => {
    // common practice factors (e.g. 1 ppm SO2 = 2.86 mg/Nm3, 1 ppm CO = 1.25 mg/Nm3) [memory]
    expect(ppmToMgPerNm3(1, 'CO')).toBeCloseTo(1.2497, 3);
    expect(ppmToMgPerNm3(1, 'SO2')).toBeCloseTo(2.858, 2);
  });
  it('refuses an unknown species', () => {
    expect(() => ppmToMgPerNm3(1, 'XYZ' as never)).toThrow(CalcInputError);
  });
  it('round-trips with mgPerNm3ToPpm (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e5, noNaN: true }), fc.constantFrom('NOx', 'SO2', 'CO', 'HCl', 'NH3', 'TOC'), (ppm, species) => {
        const back = mgPerNm3ToPpm(ppmToMgPerNm3(ppm, species as never), species as never);
        expect(Math.abs(back - ppm)).toBeLessThanOrEqual(1e-12 * Math.max(1, ppm));
      }),
    );
  });
});

describe('wetToDry / dryToWet', () => {
  it('divides by (1 − H2O)', () => {
    expect(wetToDry(90, 10)).toBeCloseTo(100, 12); // REFERENCES.md §4 formula [pub form]
    expect(dryToWet(100, 10)).toBeCloseTo(90, 12);
  });
  it('refuses moisture of 100 % or negative', () => {
    expect(() => wetToDry(1, 100)).toThrow(CalcInputError);
    expect(() => dryToWet(1, -1)).toThrow(CalcInputError);
  });
  it('round-trips (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e6, noNaN: true }), fc.double({ min: 0, max: 60, noNaN: true }), (v, m) => {
        expect(Math.abs(dryToWet(wetToDry(v, m), m) - v)).toBeLessThanOrEqual(1e-12 * Math.max(1, v));
      }),
    );
  });
});

describe('toStandardConditions', () => {
  it('scales by (T/273.15)·(101.325/p)', () => {
    // REFERENCES.md §4 [pub form]; 100 mg/m3 at 546.3 K, 1 atm is 200 mg/Nm3
    expect(toStandardConditions(100, { tempK: 546.3, pressureKPa: 101.325 })).toBeCloseTo(200, 9);
    expect(toStandardConditions(100, { tempK: 273.15, pressureKPa: 50.6625 })).toBeCloseTo(200, 9);
  });
  it('refuses a temperature in °C by mistake (≤ 0 K)', () => {
    expect(() => toStandardConditions(1, { tempK: 0, pressureKPa: 100 })).toThrow(/kelvin/);
  });
});

describe('correctToReferenceO2', () => {
  it('corrects 150 mg/Nm3 at 8 % O2 to 207.69 at 3 % (ambient 21)', () => {
    expect(correctToReferenceO2(150, 8, 3)).toBeCloseTo(207.69, 2); // REFERENCES.md §4 [derived], IED Annex VI Part 7 form
  });
  it('uses 20.9 when asked (US, 40 CFR 60)', () => {
    expect(correctToReferenceO2(100, 10.9, 15, { ambientO2Percent: 20.9 })).toBeCloseTo((100 * 5.9) / 10, 10);
  });
  it('leaves the value when onlyWhenAbove and measured O2 is below the reference', () => {
    expect(correctToReferenceO2(100, 9, 11, { onlyWhenAbove: true })).toBe(100); // IED Annex VI Part 7 [memory]
    expect(correctToReferenceO2(100, 9, 11)).toBeCloseTo(100 * (10 / 12), 10);
  });
  it('throws when measured O2 is at or above ambient', () => {
    expect(() => correctToReferenceO2(100, 21, 3)).toThrow(CalcInputError);
    expect(() => correctToReferenceO2(100, 20.95, 3, { ambientO2Percent: 20.9 })).toThrow(CalcInputError);
  });
  it('follows the 20.9/(20.9 − O2) dilution identity (property)', () => {
    // correcting to 0 % O2 multiplies by 20.9/(20.9 − O2) — REFERENCES.md §1
    fc.assert(
      fc.property(fc.double({ min: 0, max: 20.8, noNaN: true }), fc.double({ min: 0.001, max: 1e4, noNaN: true }), (o2, c) => {
        const expected = (c * 20.9) / (20.9 - o2);
        expect(Math.abs(correctToReferenceO2(c, o2, 0, { ambientO2Percent: 20.9 }) - expected)).toBeLessThanOrEqual(1e-12 * expected);
      }),
    );
  });
  it('grows monotonically with the measured O2 (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 20, noNaN: true }), fc.double({ min: 0, max: 20, noNaN: true }), fc.double({ min: 0, max: 15, noNaN: true }), (a, b, ref) => {
        const [lo, hi] = a <= b ? [a, b] : [b, a];
        expect(correctToReferenceO2(50, lo, ref)).toBeLessThanOrEqual(correctToReferenceO2(50, hi, ref));
      }),
    );
  });
});

describe('series conversions', () => {
  const ppm = Float64Array.from([10, 50, Number.NaN, 200]);
  const o2 = Float64Array.from([3, 8, 5, Number.NaN]);
  const moisture = Float64Array.from([10, 12, 8, 15]);

  it('match the single-value forms and let NaN through', () => {
    const mg = ppmSeriesToMgPerNm3(ppm, 'NOx');
    expect(mg[3]).toBeCloseTo(410.5, 1);
    expect(Number.isNaN(mg[2]!)).toBe(true);
    const dry = wetSeriesToDry(mg, moisture);
    expect(dry[1]).toBeCloseTo(wetToDry(ppmToMgPerNm3(50, 'NOx'), 12), 10);
    const corrected = correctSeriesToReferenceO2(dry, o2, 3);
    expect(corrected[1]).toBeCloseTo(correctToReferenceO2(dry[1]!, 8, 3), 10);
    expect(Number.isNaN(corrected[3]!)).toBe(true);
    expect(mgPerNm3SeriesToPpm(mg, 'NOx')[0]).toBeCloseTo(10, 10);
  });
  it('write into a given output array (in place)', () => {
    const values = Float64Array.from([100, 200]);
    const out = correctSeriesToReferenceO2(values, 8, 3, {}, values);
    expect(out).toBe(values);
    expect(values[0]).toBeCloseTo(138.46, 2);
  });
  it('throw on O2 at ambient, or mark it NaN when asked', () => {
    expect(() => correctSeriesToReferenceO2([1, 1], [5, 21], 3)).toThrow(/reading 1/);
    const out = correctSeriesToReferenceO2([1, 1], [5, 21], 3, { invalidO2: 'nan' });
    expect(Number.isNaN(out[1]!)).toBe(true);
  });
  it('convertSeries equals the chained single-purpose functions', () => {
    const fused = convertSeries(ppm, { fromUnit: 'ppm', species: 'NOx', basis: 'wet', moisturePercent: moisture, measuredO2PercentDry: o2, referenceO2Percent: 3 });
    const chained = correctSeriesToReferenceO2(wetSeriesToDry(ppmSeriesToMgPerNm3(ppm, 'NOx'), moisture), o2, 3);
    for (let i = 0; i < ppm.length; i++) {
      if (Number.isNaN(chained[i]!)) expect(Number.isNaN(fused[i]!)).toBe(true);
      else expect(fused[i]).toBeCloseTo(chained[i]!, 9);
    }
    const constantO2 = convertSeries([100], { fromUnit: 'mgPerNm3', basis: 'dry', measuredO2PercentDry: 8, referenceO2Percent: 3 });
    expect(constantO2[0]).toBeCloseTo(138.46, 2);
  });
  it('convertSeries handles out-of-range O2 like the single-value form (throw, or NaN when asked), also in place', () => {
    const values = Float64Array.from([100, 100, 100]);
    const base = { fromUnit: 'mgPerNm3' as const, basis: 'wet' as const, moisturePercent: Float64Array.from([10, 10, 10]), referenceO2Percent: 3 };
    expect(() => convertSeries(values, { ...base, measuredO2PercentDry: Float64Array.from([5, 21, 5]) })).toThrow(/reading 1/);
    const marked = convertSeries(values, { ...base, measuredO2PercentDry: Float64Array.from([5, 21, Number.NaN]), invalidO2: 'nan' });
    expect(marked[0]).toBeCloseTo(correctToReferenceO2(wetToDry(100, 10), 5, 3), 10);
    expect(Number.isNaN(marked[1]!)).toBe(true);
    expect(Number.isNaN(marked[2]!)).toBe(true);
    const inPlace = convertSeries(values, { ...base, measuredO2PercentDry: Float64Array.from([5, 21, 5]), invalidO2: 'nan' }, values);
    expect(inPlace[2]).toBeCloseTo(marked[0]!, 10);
    expect(() => convertSeries([1], { ...base, moisturePercent: [100], measuredO2PercentDry: [5] })).toThrow(CalcInputError);
    const onlyAbove = convertSeries([100], { fromUnit: 'mgPerNm3', basis: 'dry', measuredO2PercentDry: [2], referenceO2Percent: 3, onlyWhenAbove: true });
    expect(onlyAbove[0]).toBe(100);
  });
  it('refuses arrays of different lengths', () => {
    expect(() => wetSeriesToDry([1, 2], [10])).toThrow(CalcInputError);
  });
});
