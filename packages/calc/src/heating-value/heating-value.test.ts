import { CalcInputError } from '../errors';
import { GAS_COMPONENT_HEATING_VALUE_KJ_PER_MOL, gasHeatingValue, heatingValues, hhvFromLhvMJPerKg, lhvFromHhvMJPerKg, solidGcvChanniwalaParikhMJPerKg } from './index';

describe('gasHeatingValue', () => {
  it('gives methane HHV 55.5 and LHV 50.0 MJ/kg', () => {
    // REFERENCES.md §6 [derived; Turns Table B.1, memory]
    const hv = gasHeatingValue({ kind: 'gas', composition: { CH4: 100 } });
    expect(hv.hhvMJPerKg).toBeCloseTo(55.5, 1);
    expect(hv.lhvMJPerKg).toBeCloseTo(50.0, 1);
    // ISO 6976:1995 Table 3, CH4 at 25 °C: gross 890.63, net 802.60 kJ/mol [pub: NeqSim
    // ISO6976constants.csv, https://github.com/equinor/neqsim/blob/master/src/main/resources/data/ISO6976constants.csv]; 0 °C metering, ideal gas
    expect(hv.hhvMJPerNm3).toBeCloseTo(890.63 / 22.414, 2);
    expect(hv.lhvMJPerNm3).toBeCloseTo(802.6 / 22.414, 3);
    expect(hv.densityKgPerNm3).toBeCloseTo(0.7158, 3); // 16.043/22.414 [derived]
  });
  it('uses the 25 °C net values of ISO 6976 (gross − net = water formed × 44.016 kJ/mol)', () => {
    // ISO 6976:1995 Table 3, 25 °C column [pub: NeqSim ISO6976constants.csv, URL above]:
    // net CH4 802.60, C2H6 1428.64, C3H8 2043.11, n-C4H10 2657.32, H2S 517.99 kJ/mol;
    // water at 25 °C 44.016 kJ/mol. The 15 °C column (802.69, 1428.84 …) would fail this.
    const published = { CH4: 802.6, C2H6: 1428.64, C3H8: 2043.11, C4H10: 2657.32, H2S: 517.99, H2: 241.81, CO: 282.98 } as const;
    const waterFormed = { CH4: 2, C2H6: 3, C3H8: 4, C4H10: 5, H2S: 1, H2: 1, CO: 0 } as const;
    for (const [component, net] of Object.entries(published) as [keyof typeof published, number][]) {
      const lhvMJPerNm3 = gasHeatingValue({ kind: 'gas', composition: { [component]: 100 } }).lhvMJPerNm3;
      expect(lhvMJPerNm3 * 22.414).toBeCloseTo(net, 1);
      const hv = GAS_COMPONENT_HEATING_VALUE_KJ_PER_MOL[component];
      expect(hv.gross - hv.net).toBeCloseTo(waterFormed[component] * 44.016, 1);
    }
  });
  it('weights components by mole fraction (hydrogen HHV 12.75 MJ/Nm3)', () => {
    const h2 = gasHeatingValue({ kind: 'gas', composition: { H2: 100 } });
    expect(h2.hhvMJPerNm3).toBeCloseTo(12.75, 2); // 285.83/22.414 [derived from NIST ΔHf of H2O(l)]
    const mix = gasHeatingValue({ kind: 'gas', composition: { H2: 50, CH4: 50 } });
    expect(mix.hhvMJPerNm3).toBeCloseTo((h2.hhvMJPerNm3 + gasHeatingValue({ kind: 'gas', composition: { CH4: 100 } }).hhvMJPerNm3) / 2, 9);
  });
  it('rejects a composition that does not sum to 100 ± 0.5 %', () => {
    expect(() => gasHeatingValue({ kind: 'gas', composition: { CH4: 90, N2: 5 } })).toThrow(/sums to 95.00/);
  });
});

describe('solidGcvChanniwalaParikhMJPerKg', () => {
  it('reproduces a bituminous coal GCV of 13,650 Btu/lb (31.75 MJ/kg) within 1.5 %', () => {
    // Channiwala & Parikh (2002) stated mean error 1.45 % [pub]; coal analysis typical of a
    // Pittsburgh-seam bituminous coal, dry basis [memory]
    const gcv = solidGcvChanniwalaParikhMJPerKg({ C: 75.5, H: 5.0, O: 4.9, N: 1.2, S: 3.1, moisture: 0, ash: 10.3 });
    expect(Math.abs(gcv / 31.75 - 1)).toBeLessThan(0.015);
  });
  it('scales with the dry fraction when moisture is added', () => {
    const dry = solidGcvChanniwalaParikhMJPerKg({ C: 50, H: 6, O: 42, N: 0.5, S: 0.05, moisture: 0, ash: 1.45 });
    const wet = solidGcvChanniwalaParikhMJPerKg({ C: 40, H: 4.8, O: 33.6, N: 0.4, S: 0.04, moisture: 20, ash: 1.16 });
    expect(wet).toBeCloseTo(dry * 0.8, 9);
    expect(dry).toBeGreaterThan(18); // dry wood ≈ 19–20 MJ/kg (common practice)
    expect(dry).toBeLessThan(21);
  });
});

describe('lower ↔ higher heating value', () => {
  it('takes 2.442 MJ per kg of water formed or carried', () => {
    // methane: 25.13 % H → LHV 50.0 from HHV 55.5 [derived]
    expect(lhvFromHhvMJPerKg(55.51, { hydrogenPercent: 25.13, moisturePercent: 0 })).toBeCloseTo(50.03, 1);
    expect(hhvFromLhvMJPerKg(lhvFromHhvMJPerKg(30, { hydrogenPercent: 5, moisturePercent: 10 }), { hydrogenPercent: 5, moisturePercent: 10 })).toBeCloseTo(30, 12);
  });
});

describe('heatingValues', () => {
  it('throws for a solid without GCV unless estimation is allowed', () => {
    const coal = { kind: 'solid' as const, ultimate: { C: 75.5, H: 5.0, O: 4.9, N: 1.2, S: 3.1, moisture: 0, ash: 10.3 } };
    expect(() => heatingValues(coal)).toThrow(CalcInputError);
    expect(heatingValues(coal, { estimate: true }).source).toBe('channiwala-parikh-2002');
    expect(heatingValues({ ...coal, gcvMJPerKg: 31 }).hhvMJ).toBe(31);
  });
  it('rejects a zero heating value', () => {
    expect(() => heatingValues({ kind: 'gas', composition: { CH4: 100 }, gcvMJPerNm3: 0 })).toThrow(CalcInputError);
  });
});
