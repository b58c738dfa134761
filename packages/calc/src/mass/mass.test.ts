import { CalcInputError } from '../errors';
import { DEFAULT_F_FACTORS } from '../f-factors';
import { flueGasAt } from '../stoichiometry';
import {
  applyDiluentCap,
  co2MassRateTonsPerHour,
  heatInputFromCo2MMBtuPerHour,
  heatInputMMBtuPerHour,
  massRateFromHeatInputLbPerHour,
  massRateKgPerHour,
  pollutantMassRateLbPerHour,
  shortTonsFromHourlyLbPerHour,
  tonnesFromHourlyKgPerHour,
} from './index';

describe('Part 75 App. F', () => {
  it('heat input from flow and O2 (eq. F-17)', () => {
    // HI = Qw·(1/Fd)·((100 − H2O)/100)·((20.9 − O2)/20.9) — REFERENCES.md §3 [pub form]
    const hi = heatInputMMBtuPerHour({ wetFlowScfh: 10_000_000, moisturePercent: 10, o2PercentDry: 5, fdDscfPerMMBtu: 8710 });
    expect(hi).toBeCloseTo(((10_000_000 / 8710) * 0.9 * 15.9) / 20.9, 6);
  });
  it('applies the boiler diluent cap of 14.0 % O2 / 5.0 % CO2', () => {
    // 40 CFR 75 App. F §2: 5.0 % CO2 minimum / 14.0 % O2 maximum at boilers [pub:
    // https://www.ecfr.gov/current/title-40/part-75/appendix-Appendix%20F%20to%20Part%2075]
    expect(applyDiluentCap({ diluent: 'O2', percent: 16, unitType: 'boiler' })).toEqual({ percent: 14, capped: true });
    expect(applyDiluentCap({ diluent: 'CO2', percent: 3, unitType: 'boiler' })).toEqual({ percent: 5, capped: true });
    expect(applyDiluentCap({ diluent: 'O2', percent: 18, unitType: 'turbine' })).toEqual({ percent: 18, capped: false }); // 19.0 % [memory]
    const capped = heatInputMMBtuPerHour({ wetFlowScfh: 1e6, moisturePercent: 0, o2PercentDry: 17, fdDscfPerMMBtu: 8710, diluentCap: 'boiler' });
    expect(capped).toBeCloseTo(((1e6 / 8710) * 6.9) / 20.9, 9);
  });
  it('heat input from CO2 equals the O2 route for consistent readings', () => {
    const gas = DEFAULT_F_FACTORS['natural-gas'];
    const o2 = 3;
    const moisture = 18;
    const co2Dry = ((100 * gas.fcScfPerMMBtu) / gas.fdDscfPerMMBtu) * ((20.9 - o2) / 20.9);
    const viaCo2 = heatInputFromCo2MMBtuPerHour({ wetFlowScfh: 5e6, co2PercentWet: co2Dry * (1 - moisture / 100), fcScfPerMMBtu: gas.fcScfPerMMBtu });
    const viaO2 = heatInputMMBtuPerHour({ wetFlowScfh: 5e6, moisturePercent: moisture, o2PercentDry: o2, fdDscfPerMMBtu: gas.fdDscfPerMMBtu });
    expect(viaCo2).toBeCloseTo(viaO2, 8);
  });
  it('SO2 mass rate with a dry concentration (eq. F-2)', () => {
    // E = 1.660e-7 · C · Q · (100 − H2O)/100 — REFERENCES.md §3 [pub]
    expect(pollutantMassRateLbPerHour({ ppm: 400, species: 'SO2', concentrationBasis: 'dry', wetFlowScfh: 2e7, moisturePercent: 8 })).toBeCloseTo(1.66e-7 * 400 * 2e7 * 0.92, 6);
    expect(pollutantMassRateLbPerHour({ ppm: 400, species: 'SO2', concentrationBasis: 'wet', wetFlowScfh: 2e7 })).toBeCloseTo(1.66e-7 * 400 * 2e7, 6);
    expect(() => pollutantMassRateLbPerHour({ ppm: 1, species: 'SO2', concentrationBasis: 'dry', wetFlowScfh: 1 })).toThrow(CalcInputError);
  });
  it('CO2 tons/h (eq. F-11) matches 44.01/385.3/2000 within 0.3 %', () => {
    const tons = co2MassRateTonsPerHour({ co2PercentWet: 10, wetFlowScfh: 1e7 });
    expect(Math.abs(tons / ((0.1 * 1e7 * 44.01) / 385.33 / 2000) - 1)).toBeLessThan(0.003); // [derived]
  });
  it('NOx mass = lb/MMBtu × MMBtu/h', () => {
    expect(massRateFromHeatInputLbPerHour({ emissionRateLbPerMMBtu: 0.0607, heatInputMMBtuPerHour: 500 })).toBeCloseTo(30.35, 6);
  });
  it('period totals: Σ(lb/h × hours)/2000 and Σ(kg/h × h)/1000, counting missing values', () => {
    const lb = shortTonsFromHourlyLbPerHour([100, 200, Number.NaN, 300], [1, 0.5, 1, 1]); // REFERENCES.md §3 [pub form]
    expect(lb.total).toBeCloseTo(500 / 2000, 12);
    expect(lb.hoursCounted).toBe(2.5);
    expect(lb.valuesMissing).toBe(1);
    const kg = tonnesFromHourlyKgPerHour(new Float64Array(8760).fill(10));
    expect(kg.total).toBeCloseTo(87.6, 9);
    expect(() => tonnesFromHourlyKgPerHour([1], [2])).toThrow(CalcInputError);
  });
});

describe('massRateKgPerHour', () => {
  it('from measured flow, reconciling wet flow with a dry concentration', () => {
    expect(massRateKgPerHour({ from: 'flow', concentrationMgPerNm3: 200, concentrationBasis: 'dry', flowNm3PerHour: 100_000, flowBasis: 'wet', moisturePercent: 10 })).toBeCloseTo(18, 9);
    expect(massRateKgPerHour({ from: 'flow', concentrationMgPerNm3: 200, concentrationBasis: 'dry', flowNm3PerHour: 90_000, flowBasis: 'dry' })).toBeCloseTo(18, 9);
  });
  it('from fuel flow gives the same mass whether the concentration is at measured or reference O2', () => {
    const fuel = { kind: 'gas' as const, composition: { CH4: 100 } };
    const atMeasured = massRateKgPerHour({ from: 'fuel', fuel, fuelFlowPerHour: 1000, concentrationMgPerNm3Dry: 80, o2PercentDry: 6 });
    const corrected = (80 * (21 - 3)) / (21 - 6);
    const atReference = massRateKgPerHour({ from: 'fuel', fuel, fuelFlowPerHour: 1000, concentrationMgPerNm3Dry: corrected, o2PercentDry: 3 });
    expect(atReference).toBeCloseTo(atMeasured, 10);
    expect(atMeasured).toBeCloseTo((80 * flueGasAt(fuel, { o2PercentDry: 6 }).flueGasDryNm3 * 1000) / 1e6, 12);
  });
});
