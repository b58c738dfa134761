import { CalcInputError } from '../errors';
import { BTU_PER_LB_IN_MJ_PER_KG } from '../constants';
import { stoichiometry } from '../stoichiometry';
import type { Fuel } from '../fuels';
import { DEFAULT_F_FACTORS, fFactors, mixedFFactors, SCF_PER_MMBTU_IN_M3_PER_GJ, scfPerMMBtuToNm3PerGJ } from './index';

const within = (value: number, reference: number, fraction: number) => expect(Math.abs(value / reference - 1)).toBeLessThan(fraction);

// A typical pipeline natural gas (composition of the kind listed in gas-quality tariffs) [memory].
const naturalGas: Fuel = { kind: 'gas', composition: { CH4: 93.1, C2H6: 3.2, C3H8: 0.7, C4H10: 0.4, N2: 1.6, CO2: 1.0 } };
// A high-volatile bituminous coal, dry basis, Pittsburgh-seam type, GCV 13,650 Btu/lb [memory].
const bituminous: Fuel = {
  kind: 'solid',
  ultimate: { C: 75.5, H: 5.0, O: 4.9, N: 1.2, S: 3.1, moisture: 0, ash: 10.3 },
  gcvMJPerKg: 13650 * BTU_PER_LB_IN_MJ_PER_KG,
};

describe('DEFAULT_F_FACTORS', () => {
  it('holds Method 19 Table 19-2 values with their source', () => {
    // 40 CFR 60 App. A Method 19 Table 19-2 [pub] (REFERENCES.md §2)
    expect(DEFAULT_F_FACTORS['natural-gas']).toMatchObject({ fdDscfPerMMBtu: 8710, fcScfPerMMBtu: 1040 });
    expect(DEFAULT_F_FACTORS.oil).toMatchObject({ fdDscfPerMMBtu: 9190, fcScfPerMMBtu: 1420 });
    expect(DEFAULT_F_FACTORS['coal-bituminous']).toMatchObject({ fdDscfPerMMBtu: 9780, fcScfPerMMBtu: 1800 });
    expect(DEFAULT_F_FACTORS['coal-anthracite']).toMatchObject({ fdDscfPerMMBtu: 10100, fcScfPerMMBtu: 1970 });
    expect(DEFAULT_F_FACTORS['coal-lignite']).toMatchObject({ fdDscfPerMMBtu: 9860, fcScfPerMMBtu: 1910 });
    expect(DEFAULT_F_FACTORS.wood).toMatchObject({ fdDscfPerMMBtu: 9240, fcScfPerMMBtu: 1830 });
    expect(DEFAULT_F_FACTORS['wood-bark']).toMatchObject({ fdDscfPerMMBtu: 9600, fcScfPerMMBtu: 1920 });
    // Propane and butane Fd 8,710, Fc 1,190 / 1,250: Part 75 App. F F-/Fc-factor table [pub, as
    // reproduced at https://www.ecfr.gov/current/title-40/part-75/appendix-Appendix%20F%20to%20Part%2075]
    expect(DEFAULT_F_FACTORS.propane).toMatchObject({ fdDscfPerMMBtu: 8710, fcScfPerMMBtu: 1190 });
    expect(DEFAULT_F_FACTORS.butane).toMatchObject({ fdDscfPerMMBtu: 8710, fcScfPerMMBtu: 1250 });
    for (const row of Object.values(DEFAULT_F_FACTORS)) expect(row.source).toMatch(/Method 19 Table 19-2/);
  });
});

describe('fFactors', () => {
  it('natural gas lands within 1.5 % of Table 19-2 (Fd 8710, Fw 10610, Fc 1040)', () => {
    const f = fFactors(naturalGas);
    within(f.fdDscfPerMMBtu, 8710, 0.015); // [pub]
    within(f.fcScfPerMMBtu, 1040, 0.015); // [pub]
    within(f.fwWscfPerMMBtu, 10610, 0.015); // [memory]
    expect(f.gcvSource).toBe('gas-composition-iso6976');
  });
  it('pure methane Fd within 1.5 % of 8710', () => {
    within(fFactors({ kind: 'gas', composition: { CH4: 100 } }).fdDscfPerMMBtu, 8710, 0.015); // Table 19-2 [pub]
  });
  it('bituminous coal lands within 1.5 % of Table 19-2 (Fd 9780, Fc 1800)', () => {
    const f = fFactors(bituminous);
    within(f.fdDscfPerMMBtu, 9780, 0.015); // [pub]
    within(f.fcScfPerMMBtu, 1800, 0.015); // [pub]
  });
  it('agrees with the stoichiometric dry flue gas per heat input within 0.5 %', () => {
    // Fd is the stoichiometric dry flue gas (xO2 = 0.209) per MMBtu at 20 °C — REFERENCES.md §1–2 [derived]
    const st = stoichiometry(bituminous, { o2InAir: 0.209 });
    const nm3PerGJ = st.flueGasDryNm3 / ((bituminous as { gcvMJPerKg: number }).gcvMJPerKg / 1000);
    within(fFactors(bituminous).fdNm3PerGJ, nm3PerGJ, 0.005);
  });
  it('is unchanged between dry and as-fired analyses (Fd, Fc)', () => {
    const asFired: Fuel = { kind: 'solid', ultimate: { C: 75.5 * 0.9, H: 4.5, O: 4.9 * 0.9, N: 1.08, S: 3.1 * 0.9, moisture: 10, ash: 10.3 * 0.9 }, gcvMJPerKg: 13650 * 0.9 * BTU_PER_LB_IN_MJ_PER_KG };
    within(fFactors(asFired).fdDscfPerMMBtu, fFactors(bituminous).fdDscfPerMMBtu, 1e-9);
    within(fFactors(asFired).fcScfPerMMBtu, fFactors(bituminous).fcScfPerMMBtu, 1e-9);
  });
  it('needs a heating value for a solid (or explicit estimation)', () => {
    const noGcv: Fuel = { kind: 'solid', ultimate: { C: 75.5, H: 5.0, O: 4.9, N: 1.2, S: 3.1, moisture: 0, ash: 10.3 } };
    expect(() => fFactors(noGcv)).toThrow(CalcInputError);
    within(fFactors(noGcv, { estimateGcv: true }).fdDscfPerMMBtu, 9780, 0.02);
  });
  it('SI conversion: 1 scf/MMBtu = 2.68392e-11 m3/J', () => {
    expect(SCF_PER_MMBTU_IN_M3_PER_GJ * 1e-9).toBeCloseTo(2.68392e-11, 15); // REFERENCES.md §2 [derived]
    expect(scfPerMMBtuToNm3PerGJ(8710)).toBeCloseTo(8710 * 0.0268392 * (273.15 / 293.15), 3);
  });
});

describe('mixedFFactors', () => {
  it('weights by heat input (Method 19 §12.3.3)', () => {
    const mix = mixedFFactors([
      { fFactors: DEFAULT_F_FACTORS['natural-gas'], heatInput: 75 },
      { fFactors: DEFAULT_F_FACTORS.oil, heatInput: 25 },
    ]);
    expect(mix.fdDscfPerMMBtu).toBeCloseTo(0.75 * 8710 + 0.25 * 9190, 9);
    expect(mix.fcScfPerMMBtu).toBeCloseTo(0.75 * 1040 + 0.25 * 1420, 9);
    expect(mix.fwWscfPerMMBtu).toBeCloseTo(0.75 * 10610 + 0.25 * 10320, 9);
  });
  it('drops Fw when a part has none, and refuses no heat input', () => {
    expect(mixedFFactors([{ fFactors: DEFAULT_F_FACTORS.wood, heatInput: 1 }, { fFactors: DEFAULT_F_FACTORS.oil, heatInput: 1 }]).fwWscfPerMMBtu).toBeUndefined();
    expect(() => mixedFFactors([{ fFactors: DEFAULT_F_FACTORS.oil, heatInput: 0 }])).toThrow(CalcInputError);
  });
});
