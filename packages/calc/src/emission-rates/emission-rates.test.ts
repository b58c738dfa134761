import fc from 'fast-check';
import { CalcInputError } from '../errors';
import { DEFAULT_F_FACTORS, scfPerMMBtuToNm3PerGJ } from '../f-factors';
import { gasHeatingValue } from '../heating-value';
import { flueGasAt } from '../stoichiometry';
import {
  emissionRateLbPerMMBtu,
  gPerGJToMgPerNm3AtReferenceO2,
  lbPerMMBtuToMgPerNm3AtReferenceO2,
  lbPerMMBtuToNgPerJ,
  mgPerNm3AtReferenceO2ToGPerGJ,
  ngPerJToLbPerMMBtu,
  o2Co2Consistency,
  ppmToLbPerScf,
} from './index';

const gas = DEFAULT_F_FACTORS['natural-gas'];

describe('emissionRateLbPerMMBtu', () => {
  it('50 ppm NOx dry at 3 % O2 on natural gas → 0.0607 lb/MMBtu (26.1 ng/J)', () => {
    // REFERENCES.md §2 check [derived]; Method 19 eq. 19-1, Part 75 K = 1.194e-7 [pub]
    const e = emissionRateLbPerMMBtu({ ppm: 50, species: 'NOx', concentrationBasis: 'dry', diluent: 'O2', diluentPercent: 3, diluentBasis: 'dry', fFactors: gas });
    expect(e).toBeCloseTo(0.0607, 4);
    expect(lbPerMMBtuToNgPerJ(e)).toBeCloseTo(26.1, 1);
  });
  it('gives the same rate for the same gas on any basis (O2 forms, eqs. 19-1, 19-3 … 19-5)', () => {
    const bws = 0.12;
    const cd = ppmToLbPerScf(80, 'SO2');
    const o2d = 6;
    const ref = emissionRateLbPerMMBtu({ concentrationLbPerScf: cd, concentrationBasis: 'dry', diluent: 'O2', diluentPercent: o2d, diluentBasis: 'dry', fFactors: gas });
    const wetWet = emissionRateLbPerMMBtu({ concentrationLbPerScf: cd * (1 - bws), concentrationBasis: 'wet', diluent: 'O2', diluentPercent: o2d * (1 - bws), diluentBasis: 'wet', moisturePercent: 12, fFactors: gas });
    const wetDry = emissionRateLbPerMMBtu({ concentrationLbPerScf: cd * (1 - bws), concentrationBasis: 'wet', diluent: 'O2', diluentPercent: o2d, diluentBasis: 'dry', moisturePercent: 12, fFactors: gas });
    expect(wetWet).toBeCloseTo(ref, 12);
    expect(wetDry).toBeCloseTo(ref, 12);
  });
  it('CO2 dry form (eq. 19-6) agrees with the O2 form through CO2 = CO2max·(20.9 − O2)/20.9', () => {
    // For a fuel whose Fo = 0.209·Fd/Fc, the two diluents give one answer — REFERENCES.md §1–2
    const co2max = (100 * gas.fcScfPerMMBtu) / gas.fdDscfPerMMBtu;
    const o2 = 4;
    const co2 = (co2max * (20.9 - o2)) / 20.9;
    const viaO2 = emissionRateLbPerMMBtu({ ppm: 30, species: 'NOx', concentrationBasis: 'dry', diluent: 'O2', diluentPercent: o2, diluentBasis: 'dry', fFactors: gas });
    const viaCo2 = emissionRateLbPerMMBtu({ ppm: 30, species: 'NOx', concentrationBasis: 'dry', diluent: 'CO2', diluentPercent: co2, diluentBasis: 'dry', fFactors: gas });
    expect(viaCo2).toBeCloseTo(viaO2, 10);
  });
  it('eq. 19-2 uses Fw and the ambient-air moisture', () => {
    const e = emissionRateLbPerMMBtu({ concentrationLbPerScf: 1e-6, concentrationBasis: 'wet', diluent: 'O2', diluentPercent: 3, diluentBasis: 'wet', ambientAirMoisturePercent: 2.7, fFactors: gas });
    expect(e).toBeCloseTo((1e-6 * 10610 * 20.9) / (20.9 * (1 - 0.027) - 3), 12);
  });
  it('throws on missing moisture for mixed bases and on O2 at 20.9 %', () => {
    expect(() => emissionRateLbPerMMBtu({ ppm: 1, species: 'NOx', concentrationBasis: 'wet', diluent: 'O2', diluentPercent: 3, diluentBasis: 'dry', fFactors: gas })).toThrow(CalcInputError);
    expect(() => emissionRateLbPerMMBtu({ ppm: 1, species: 'NOx', concentrationBasis: 'dry', diluent: 'O2', diluentPercent: 20.9, diluentBasis: 'dry', fFactors: gas })).toThrow(CalcInputError);
  });
});

describe('unit conversions', () => {
  it('lb/MMBtu ↔ ng/J round trip (property)', () => {
    fc.assert(fc.property(fc.double({ min: 0, max: 100, noNaN: true }), (e) => expect(Math.abs(ngPerJToLbPerMMBtu(lbPerMMBtuToNgPerJ(e)) - e)).toBeLessThanOrEqual(1e-12 * Math.max(1, e))));
  });
  it('mg/Nm3 at 3 % O2 ↔ g/GJ (gross heat input) with Fd of natural gas', () => {
    // Cross-check [derived]: methane burnt to 3 % O2 (xO2 0.209) gives its dry flue gas per GJ
    // of gross heat input from the stoichiometry; Fd 8710 (Table 19-2) must agree within 1.5 %.
    const fdNm3PerGJ = scfPerMMBtuToNm3PerGJ(8710);
    const g = mgPerNm3AtReferenceO2ToGPerGJ(100, { referenceO2Percent: 3, fdNm3PerGJ });
    const methane = { kind: 'gas' as const, composition: { CH4: 100 } };
    const dryNm3PerGJ = flueGasAt(methane, { o2PercentDry: 3, o2InAir: 0.209 }).flueGasDryNm3 / (gasHeatingValue(methane).hhvMJPerNm3 / 1000);
    expect(Math.abs(g / (0.1 * dryNm3PerGJ) - 1)).toBeLessThan(0.015);
    expect(gPerGJToMgPerNm3AtReferenceO2(g, { referenceO2Percent: 3, fdNm3PerGJ })).toBeCloseTo(100, 10);
    // 0.0607 lb/MMBtu (50 ppm NOx at 3 % O2) → 102.6 mg/Nm3 (50 ppm × 2.0525 mg/Nm3 per ppm) within 0.5 %
    const mg = lbPerMMBtuToMgPerNm3AtReferenceO2(0.0607, { referenceO2Percent: 3, fdNm3PerGJ });
    expect(Math.abs(mg / (50 * 2.0525) - 1)).toBeLessThan(0.005);
  });
});

describe('o2Co2Consistency', () => {
  it('expects CO2 = CO2max·(20.9 − O2)/20.9 and returns the deviation', () => {
    // REFERENCES.md §1 plausibility check; methane CO2max 11.73 % [derived]
    const r = o2Co2Consistency({ o2PercentDry: 3, co2PercentDry: 9.8, co2MaxPercentDry: 11.73 });
    expect(r.expectedCo2PercentDry).toBeCloseTo((11.73 * 17.9) / 20.9, 10);
    expect(r.deviationPercentPoints).toBeCloseTo(9.8 - 10.0463, 3);
    expect(r.deviationRelativePercent).toBeCloseTo(-2.45, 1);
  });
  it('rejects O2 above ambient', () => {
    expect(() => o2Co2Consistency({ o2PercentDry: 22, co2PercentDry: 0, co2MaxPercentDry: 11.7 })).toThrow(CalcInputError);
  });
});
