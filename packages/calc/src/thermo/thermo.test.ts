import { cpJPerMolK, entropyJPerMolK, formationEnthalpyKJPerMol, GRI30_THERMO } from './index';

describe('GRI-Mech 3.0 NASA polynomials', () => {
  it('give the formation enthalpies at 298.15 K', () => {
    // REFERENCES.md §6 [derived from the GRI-Mech 3.0 set]: CO2 −393.51, H2O −241.83, CH4 −74.60 kJ/mol
    expect(formationEnthalpyKJPerMol('CO2')).toBeCloseTo(-393.51, 1);
    expect(formationEnthalpyKJPerMol('H2O')).toBeCloseTo(-241.83, 1);
    expect(formationEnthalpyKJPerMol('CH4')).toBeCloseTo(-74.6, 1);
    // NIST-JANAF [memory]: CO −110.53, OH 39.35, H 218.00, O 249.17, NO 91.27, N 472.68, C2H6 −83.85, C3H8 −103.85
    const janaf: Record<string, number> = { CO: -110.53, OH: 39.35, H: 218.0, O: 249.17, NO: 91.27, N: 472.68, C2H6: -83.85, C3H8: -103.85, O2: 0, N2: 0, H2: 0 };
    for (const [s, hf] of Object.entries(janaf)) expect(Math.abs(formationEnthalpyKJPerMol(s) - hf)).toBeLessThan(0.2);
  });
  it('give cp and S° at 298.15 K within 0.5 % of NIST-JANAF', () => {
    // NIST-JANAF tables [memory]: cp J/(mol·K), S° J/(mol·K)
    const ref: Record<string, [number, number]> = {
      CO2: [37.13, 213.79], H2O: [33.59, 188.83], N2: [29.12, 191.61], O2: [29.38, 205.15], CO: [29.14, 197.66],
      H2: [28.84, 130.68], CH4: [35.69, 186.25], OH: [29.89, 183.74], NO: [29.86, 210.76], H: [20.79, 114.72], O: [21.91, 161.06],
    };
    for (const [s, [cp, s0]] of Object.entries(ref)) {
      expect(Math.abs(cpJPerMolK(s, 298.15) / cp - 1)).toBeLessThan(0.005);
      expect(Math.abs(entropyJPerMolK(s, 298.15) / s0 - 1)).toBeLessThan(0.005);
    }
  });
  it('give cp of N2 and CO2 at 2000 K (NIST-JANAF 36.0 and 60.4 J/(mol·K), [memory])', () => {
    expect(cpJPerMolK('N2', 2000)).toBeCloseTo(36.0, 0);
    expect(cpJPerMolK('CO2', 2000)).toBeCloseTo(60.4, 0);
  });
  it('join continuously at the mid temperature (guards against a mistyped coefficient)', () => {
    for (const s of Object.values(GRI30_THERMO)) {
      const t = s.tempRangeK[1];
      const value = (a: readonly number[]) => [
        a[0]! + a[1]! * t + a[2]! * t ** 2 + a[3]! * t ** 3 + a[4]! * t ** 4,
        a[0]! + (a[1]! * t) / 2 + (a[2]! * t ** 2) / 3 + (a[3]! * t ** 3) / 4 + (a[4]! * t ** 4) / 5 + a[5]! / t,
        a[0]! * Math.log(t) + a[1]! * t + (a[2]! * t ** 2) / 2 + (a[3]! * t ** 3) / 3 + (a[4]! * t ** 4) / 4 + a[6]!,
      ];
      const lo = value(s.low);
      const hi = value(s.high);
      for (let k = 0; k < 3; k++) expect(Math.abs(lo[k]! - hi[k]!)).toBeLessThan(2e-4);
    }
  });
});
