import { CalcInputError } from '../errors';
import type { Fuel } from '../fuels';
import { adiabaticFlameTemperature, FlameConvergenceError } from './index';

const methane: Fuel = { kind: 'gas', composition: { CH4: 100 } };

describe('adiabaticFlameTemperature', () => {
  it('methane–air, φ = 1, 298 K, 1 atm: ≈ 2226 K at equilibrium (Turns, [memory])', () => {
    const r = adiabaticFlameTemperature(methane, { model: 'equilibrium' });
    expect(Math.abs(r.temperatureK - 2226)).toBeLessThanOrEqual(10);
    // dissociation products at tenths of a percent, as in Turns's methane–air equilibrium example [memory]
    expect(r.moleFractions['CO']).toBeGreaterThan(0.005);
    expect(r.moleFractions['OH']).toBeGreaterThan(0.001);
    expect(r.moleFractions['NO']).toBeGreaterThan(0.001);
    const sum = Object.values(r.moleFractions).reduce((a, b) => a + b, 0);
    expect(sum).toBeCloseTo(1, 12);
  });
  it('methane–air, φ = 1, complete combustion: ≈ 2326 K (REFERENCES.md §6 [derived])', () => {
    const r = adiabaticFlameTemperature(methane, { model: 'complete' });
    expect(Math.abs(r.temperatureK - 2326)).toBeLessThanOrEqual(5);
    expect(r.moleFractions['CO2']).toBeCloseTo(1 / 10.524, 4); // 1 CO2 in 10.524 mol wet products (REFERENCES.md §1)
  });
  it('equilibrium is below complete combustion, and peaks slightly rich of stoichiometric', () => {
    // Turns Fig. 2.14 shape: maximum near φ ≈ 1.05 [memory]
    const t = (phi: number) => adiabaticFlameTemperature(methane, { model: 'equilibrium', equivalenceRatio: phi }).temperatureK;
    expect(t(1.05)).toBeGreaterThan(t(1));
    expect(t(1.05)).toBeGreaterThan(t(1.2));
    expect(adiabaticFlameTemperature(methane, { model: 'complete', equivalenceRatio: 0.8 }).temperatureK).toBeGreaterThan(t(0.8));
  });
  it('lean flames agree between the models where dissociation is negligible (φ = 0.5)', () => {
    const eq = adiabaticFlameTemperature(methane, { model: 'equilibrium', equivalenceRatio: 0.5 }).temperatureK;
    const complete = adiabaticFlameTemperature(methane, { model: 'complete', equivalenceRatio: 0.5 }).temperatureK;
    expect(Math.abs(eq - complete)).toBeLessThan(3);
  });
  it('converges over φ 0.5–1.5, 298–800 K and 0.5–20 atm, rising with preheat and pressure at φ = 1', () => {
    for (const phi of [0.5, 0.8, 1, 1.2, 1.5]) {
      for (const t0 of [298.15, 500, 800]) {
        for (const atm of [0.5, 1, 5, 20]) {
          const r = adiabaticFlameTemperature(methane, { model: 'equilibrium', equivalenceRatio: phi, initialTempK: t0, pressureKPa: atm * 101.325 });
          expect(r.temperatureK).toBeGreaterThan(1300);
          expect(r.temperatureK).toBeLessThan(2700);
        }
      }
    }
    const at = (t0: number, atm: number) => adiabaticFlameTemperature(methane, { model: 'equilibrium', initialTempK: t0, pressureKPa: atm * 101.325 }).temperatureK;
    expect(at(800, 1)).toBeGreaterThan(at(298.15, 1));
    expect(at(298.15, 20)).toBeGreaterThan(at(298.15, 1)); // Le Chatelier: less dissociation at high pressure
  });
  it('hydrogen–air, φ = 1: ≈ 2400 K at equilibrium (Turns/Glassman tables ≈ 2383–2400 K, [memory])', () => {
    const r = adiabaticFlameTemperature({ kind: 'gas', composition: { H2: 100 } }, { model: 'equilibrium' });
    expect(r.temperatureK).toBeGreaterThan(2370);
    expect(r.temperatureK).toBeLessThan(2420);
  });
  it('propane–air, φ = 1: ≈ 2267 K at equilibrium (Turns Table B.1, [memory]) within 15 K', () => {
    const r = adiabaticFlameTemperature({ kind: 'gas', composition: { C3H8: 100 } }, { model: 'equilibrium' });
    expect(Math.abs(r.temperatureK - 2267)).toBeLessThan(15);
  });
  it('solid fuel through its GCV: a bituminous coal burns near 2200–2300 K at φ = 1 (common practice)', () => {
    const coal: Fuel = { kind: 'solid', ultimate: { C: 72, H: 4.8, O: 6.2, N: 1.4, S: 2.2, moisture: 5, ash: 8.4 }, gcvMJPerKg: 30.2 };
    const r = adiabaticFlameTemperature(coal, { model: 'equilibrium' });
    expect(r.temperatureK).toBeGreaterThan(2100);
    expect(r.temperatureK).toBeLessThan(2400);
    expect(r.moleFractions['SO2']).toBeGreaterThan(0);
    expect(() => adiabaticFlameTemperature({ ...coal, gcvMJPerKg: undefined }, { model: 'complete' })).toThrow(CalcInputError);
  });
  it('refuses inputs outside its range with a clear error', () => {
    expect(() => adiabaticFlameTemperature(methane, { model: 'equilibrium', equivalenceRatio: 0 })).toThrow(CalcInputError);
    expect(() => adiabaticFlameTemperature(methane, { model: 'equilibrium', initialTempK: 25 })).toThrow(/kelvin/);
    expect(() => adiabaticFlameTemperature({ kind: 'gas', composition: { C4H10: 100 } }, { model: 'complete', initialTempK: 600 })).toThrow(/C4H10/);
    expect(() => adiabaticFlameTemperature(methane, { model: 'other' as never })).toThrow(CalcInputError);
    expect(FlameConvergenceError).toBeDefined();
  });
  it('n-butane at 298 K, formation enthalpy from its ISO 6976 heating value: ≈ 2270 K at equilibrium', () => {
    const r = adiabaticFlameTemperature({ kind: 'gas', composition: { C4H10: 100 } }, { model: 'equilibrium' });
    expect(Math.abs(r.temperatureK - 2270)).toBeLessThan(20); // n-butane–air ≈ 2270 K (Turns Table B.1 [memory])
  });
});
