import { cpJPerMolK, entropyJPerMolK, formationEnthalpyKJPerMol, GRI30_THERMO } from './index';

describe('GRI-Mech 3.0 NASA polynomials', () => {
  it('give the formation enthalpies at 298.15 K', () => {
    // REFERENCES.md §6 [derived from the GRI-Mech 3.0 set]: CO2 −393.51, H2O −241.83, CH4 −74.60 kJ/mol
    expect(formationEnthalpyKJPerMol('CO2')).toBeCloseTo(-393.51, 1);
    expect(formationEnthalpyKJPerMol('H2O')).toBeCloseTo(-241.83, 1);
    expect(formationEnthalpyKJPerMol('CH4')).toBeCloseTo(-74.6, 1);
    // Published evaluated values, kJ/mol, with the tolerance each check allows [pub]:
    // - CO −110.53 ± 0.17: CODATA (Cox, Wagman et al. 1984), NIST Chemistry WebBook, carbon monoxide,
    //   https://webbook.nist.gov/cgi/cbook.cgi?Mask=2285&Source=1973SLA%2FBLA194&Units=SI
    // - H 217.998 ± 0.006, O 249.18 ± 0.10, N 472.68 ± 0.40, OH 37.20 ± 0.38: Appendix A
    //   "Thermodynamic parameters", Table A-1 (gas phase, 298.15 K),
    //   https://studylib.net/doc/8917936/appendix-a.-thermodynamic-parameters
    // - NO 21.76 ± 0.02 kcal/mol = 91.04 kJ/mol: Ruscic et al., Active Thermochemical Tables,
    //   J. Phys. Chem. A 110 (2006) 6592, https://datapdf.com/active-thermochemical-tables-accurate-enthalpy-of-formation-.html
    // - C2H6 −84.00 ± 0.40 (Gurvich): NIST CCCBDB, https://cccbdb.nist.gov/exp2x.asp?casno=74840&charge=0
    // - C3H8 −104.7 ± 0.5 (Pittam & Pilcher 1972): NIST Chemistry WebBook, propane,
    //   https://webbook.nist.gov/cgi/cbook.cgi?ID=C74986&Mask=1
    // GRI-Mech 3.0 carries older values for three species, hence the wider tolerances: OH 39.35
    // (source tag RUS78), NO 91.26 and C3H8 −103.85 (the Prosen & Rossini 1945 value −103.8 ± 0.59
    // listed on the same WebBook page). Formerly labelled "NIST-JANAF" here from memory.
    const published: Record<string, [number, number]> = {
      CO: [-110.53, 0.2], H: [217.998, 0.2], O: [249.18, 0.2], N: [472.68, 0.4], OH: [37.2, 2.5],
      NO: [91.04, 0.3], C2H6: [-84.0, 0.4], C3H8: [-104.7, 1.0],
      O2: [0, 1e-3], N2: [0, 2e-3], H2: [0, 1e-3], // elements in their reference state (definition)
    };
    for (const [s, [hf, tol]] of Object.entries(published)) expect(Math.abs(formationEnthalpyKJPerMol(s) - hf)).toBeLessThan(tol);
  });
  it('give cp and S° at 298.15 K within 0.5 % of published values', () => {
    // [pub], cp and S° in J/(mol·K); S° at 1 bar (the polynomials use 1 atm: −0.11 J/(mol·K), inside 0.5 %):
    // - CO2 37.129, 213.795: NIST-JANAF table as printed in the py-janaf documentation, https://pypi.org/project/janaf/
    // - N2 S° 191.609 (CODATA), cp 29.124 from the WebBook Shomate fit (Chase 1998, 100–500 K) [derived],
    //   https://webbook.nist.gov/cgi/cbook.cgi?Mask=2017&Source=1981ARM%2FTAR2788&Units=SI
    // - O2 S° 205.152 (CODATA), https://webbook.nist.gov/cgi/cbook.cgi?Mask=7&Source=1974FLE%2FRAY3&Units=SI
    // - CO S° 197.660 (CODATA), WebBook URL above
    // - C2H6 52.49, 229.16 (Gurvich) and C3H8 73.60, 270.31 (TRC): NIST CCCBDB,
    //   https://cccbdb.nist.gov/exp2x.asp?casno=74840&charge=0, https://cccbdb.nist.gov/exp2x.asp?casno=74986&charge=0
    const pub: Record<string, [number | null, number]> = {
      CO2: [37.129, 213.795], N2: [29.124, 191.609], O2: [null, 205.152], CO: [null, 197.66],
      C2H6: [52.49, 229.16], C3H8: [73.6, 270.31],
    };
    // NIST-JANAF tables [memory] (no public text found): cp, S°
    const recalled: Record<string, [number, number]> = {
      H2O: [33.59, 188.83], O2: [29.38, 205.15], CO: [29.14, 197.66], H2: [28.84, 130.68], CH4: [35.69, 186.25],
      OH: [29.89, 183.74], NO: [29.86, 210.76], H: [20.79, 114.72], O: [21.91, 161.06],
    };
    for (const table of [pub, recalled]) {
      for (const [s, [cp, s0]] of Object.entries(table)) {
        if (cp !== null) expect(Math.abs(cpJPerMolK(s, 298.15) / cp - 1)).toBeLessThan(0.005);
        expect(Math.abs(entropyJPerMolK(s, 298.15) / s0 - 1)).toBeLessThan(0.005);
      }
    }
  });
  it('give cp of N2 and CO2 at 2000 K (N2 35.98 [pub], CO2 60.4 [memory])', () => {
    // N2: WebBook Shomate fit, 500–2000 K coefficients (Chase 1998), t = 2: 19.50583 + 19.88705·2
    // − 8.598535·4 + 1.369784·8 + 0.527601/4 = 35.98 J/(mol·K) [derived from pub], URL above.
    expect(cpJPerMolK('N2', 2000)).toBeCloseTo(35.98, 1);
    expect(cpJPerMolK('CO2', 2000)).toBeCloseTo(60.4, 0); // NIST-JANAF [memory]
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
