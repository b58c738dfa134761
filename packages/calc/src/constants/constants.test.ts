import {
  BTU_PER_LB_IN_MJ_PER_KG,
  MOLAR_MASS_G_PER_MOL,
  MOLAR_VOLUME_20C_M3_PER_KMOL,
  MOLAR_VOLUME_25C_M3_PER_KMOL,
  MOLAR_VOLUME_NM3_PER_KMOL,
  MOLAR_VOLUME_SCF_PER_LBMOL,
  NG_PER_J_PER_LB_PER_MMBTU,
  PART75_LB_PER_SCF_PER_PPM,
} from './index';

describe('constants', () => {
  it('molar volumes: 22.414, 24.055, 24.465 L/mol and 385.33 scf/lbmol', () => {
    // REFERENCES.md §4 [derived from R = 8.314462618]; ±0.1 % tolerance for unit constants
    expect(MOLAR_VOLUME_NM3_PER_KMOL).toBeCloseTo(22.414, 3);
    expect(MOLAR_VOLUME_20C_M3_PER_KMOL).toBeCloseTo(24.055, 3);
    expect(MOLAR_VOLUME_25C_M3_PER_KMOL).toBeCloseTo(24.465, 3);
    expect(MOLAR_VOLUME_SCF_PER_LBMOL).toBeCloseTo(385.33, 1);
  });
  it('1 lb/MMBtu = 429.92 ng/J', () => {
    expect(NG_PER_J_PER_LB_PER_MMBTU).toBeCloseTo(429.92, 2); // REFERENCES.md §2 [derived]
  });
  it('1 Btu/lb = 2.326 kJ/kg (exact)', () => {
    expect(BTU_PER_LB_IN_MJ_PER_KG).toBeCloseTo(0.002326, 9); // International Table Btu definition [pub]
  });
  it('Part 75 ppm → lb/scf constants agree with M/385.3 within 0.3 %', () => {
    // 40 CFR 75 App. F [pub] SO2 1.660e-7, NOx 1.194e-7; cross-check from molar masses (REFERENCES.md §2)
    for (const s of ['SO2', 'NOx', 'CO'] as const) {
      const fromMolarMass = (1e-6 * MOLAR_MASS_G_PER_MOL[s]) / MOLAR_VOLUME_SCF_PER_LBMOL;
      expect(Math.abs(PART75_LB_PER_SCF_PER_PPM[s]! / fromMolarMass - 1)).toBeLessThan(0.003);
    }
    expect(PART75_LB_PER_SCF_PER_PPM.SO2).toBe(1.66e-7);
    expect(PART75_LB_PER_SCF_PER_PPM.NOx).toBe(1.194e-7);
  });
  it('molar masses of REFERENCES.md §4', () => {
    expect(MOLAR_MASS_G_PER_MOL).toMatchObject({ NO2: 46.0055, NO: 30.006, SO2: 64.064, CO: 28.01, NH3: 17.031, HCl: 36.461, HF: 20.006, CO2: 44.009, TOC: 12.011 });
  });
});
