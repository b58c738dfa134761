import fc from 'fast-check';
import { CalcInputError } from '../errors';
import { MOLAR_VOLUME_NM3_PER_KMOL } from '../constants';
import { fuelElements, type Fuel } from '../fuels';
import { flueGasAt, stoichiometry } from './index';

const methane: Fuel = { kind: 'gas', composition: { CH4: 100 } };

describe('stoichiometry', () => {
  it('pure methane: air 9.524, dry flue gas 8.524, wet 10.524 Nm3/Nm3, CO2max 11.73 %', () => {
    // REFERENCES.md §1 check values [derived], xO2 = 0.21
    const s = stoichiometry(methane);
    expect(s.basis).toBe('Nm3');
    expect(s.airNm3).toBeCloseTo(9.524, 3);
    expect(s.flueGasDryNm3).toBeCloseTo(8.524, 3);
    expect(s.flueGasWetNm3).toBeCloseTo(10.524, 3);
    expect(s.co2MaxPercentDry).toBeCloseTo(11.73, 2);
  });
  it('methane air/fuel mass ratio 17.1 (Turns, [memory])', () => {
    expect(stoichiometry(methane).airFuelMassRatio).toBeCloseTo(17.1, 1);
  });
  it('takes the O2 content of air as a parameter', () => {
    expect(stoichiometry(methane, { o2InAir: 0.2095 }).airNm3).toBeCloseTo(2 / 0.2095, 6); // REFERENCES.md §1
  });
  it('solid fuel per kg by the REFERENCES.md §1 formulas', () => {
    const coal: Fuel = { kind: 'solid', ultimate: { C: 70, H: 4.5, O: 7, N: 1.4, S: 1.1, moisture: 8, ash: 8 } };
    const o2Demand = 0.7 / 12.011 + 0.045 / 4.032 + 0.011 / 32.06 - 0.07 / 31.998; // kmol/kg [REFERENCES.md §1]
    const s = stoichiometry(coal);
    expect(s.basis).toBe('kg');
    expect(s.airNm3).toBeCloseTo((22.414 * o2Demand) / 0.21, 2);
    const dry = 22.414 * (0.7 / 12.011 + 0.011 / 32.06 + 0.014 / 28.014) + 0.79 * s.airNm3;
    expect(s.flueGasDryNm3).toBeCloseTo(dry, 2);
    expect(s.flueGasWetNm3).toBeCloseTo(dry + 22.414 * (0.045 / 2.016 + 0.08 / 18.015), 2);
    // a bituminous coal needs about 7–8 Nm3 air per kg (common practice)
    expect(s.airNm3).toBeGreaterThan(6.5);
    expect(s.airNm3).toBeLessThan(8);
  });
});

describe('flueGasAt', () => {
  it('methane at 3 % O2 dry has λ = 1.150 (xO2 = 0.209)', () => {
    expect(flueGasAt(methane, { o2PercentDry: 3, o2InAir: 0.209 }).airRatio).toBeCloseTo(1.15, 3); // REFERENCES.md §1 [derived]
  });
  it('returns the O2 it was given, and the same state from the air ratio', () => {
    const atO2 = flueGasAt(methane, { o2PercentDry: 6 });
    expect(atO2.o2PercentDry).toBeCloseTo(6, 10);
    const atLambda = flueGasAt(methane, { airRatio: atO2.airRatio });
    expect(atLambda.flueGasDryNm3).toBeCloseTo(atO2.flueGasDryNm3, 10);
    expect(atLambda.co2PercentDry).toBeCloseTo((11.7318 * (21 - 6)) / 21, 3); // CO2 = CO2max·(xO2 − O2)/xO2, REFERENCES.md §1
  });
  it('refuses O2 at or above the O2 of air, and a sub-stoichiometric air ratio', () => {
    expect(() => flueGasAt(methane, { o2PercentDry: 21 })).toThrow(CalcInputError);
    expect(() => flueGasAt(methane, { airRatio: 0.9 })).toThrow(CalcInputError);
    expect(() => flueGasAt(methane, {})).toThrow(CalcInputError);
  });

  const gasFuel = fc
    .record({ CH4: fc.double({ min: 1, max: 100, noNaN: true }), C2H6: fc.double({ min: 0, max: 20, noNaN: true }), H2: fc.double({ min: 0, max: 30, noNaN: true }), CO: fc.double({ min: 0, max: 20, noNaN: true }), CO2: fc.double({ min: 0, max: 10, noNaN: true }), N2: fc.double({ min: 0, max: 10, noNaN: true }), H2S: fc.double({ min: 0, max: 2, noNaN: true }) })
    .map((c): Fuel => {
      const sum = Object.values(c).reduce((a, b) => a + b, 0);
      return { kind: 'gas', composition: Object.fromEntries(Object.entries(c).map(([k, v]) => [k, (100 * v) / sum])) };
    });

  it('conserves every element from fuel + air to flue gas (property)', () => {
    fc.assert(
      fc.property(gasFuel, fc.double({ min: 0, max: 15, noNaN: true }), fc.constantFrom(0.21, 0.2095, 0.209), (fuel, o2, x) => {
        const g = flueGasAt(fuel, { o2PercentDry: o2, o2InAir: x });
        const e = fuelElements(fuel);
        const vm = MOLAR_VOLUME_NM3_PER_KMOL;
        const airKmol = g.airNm3 / vm;
        const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(1e-9, Math.abs(b));
        expect(rel(g.co2Nm3 / vm, e.C)).toBeLessThan(1e-9);
        expect(rel((2 * g.h2oNm3) / vm, e.H + 2 * e.moistureKmol)).toBeLessThan(1e-9);
        expect(rel((2 * g.co2Nm3 + 2 * g.so2Nm3 + g.h2oNm3 + 2 * g.o2Nm3) / vm, e.O + e.moistureKmol + 2 * x * airKmol)).toBeLessThan(1e-9);
        expect(rel((2 * g.n2Nm3) / vm, e.N + 2 * (1 - x) * airKmol)).toBeLessThan(1e-9);
        if (e.S > 0) expect(rel(g.so2Nm3 / vm, e.S)).toBeLessThan(1e-9);
      }),
    );
  });
  it('dilutes the dry flue gas exactly as xO2/(xO2 − O2) (property)', () => {
    fc.assert(
      fc.property(gasFuel, fc.double({ min: 0, max: 18, noNaN: true }), (fuel, o2) => {
        const g = flueGasAt(fuel, { o2PercentDry: o2, o2InAir: 0.209 });
        const expected = (g.stoichiometric.flueGasDryNm3 * 20.9) / (20.9 - o2);
        expect(Math.abs(g.flueGasDryNm3 / expected - 1)).toBeLessThan(1e-12);
      }),
    );
  });
});
