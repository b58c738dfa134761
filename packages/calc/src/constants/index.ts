/**
 * Physical constants, reference conditions and molar masses used by the combustion half of
 * `@flueledger/calc`. Each value names its source; derived values show their derivation.
 *
 * Sources:
 * - CODATA 2018 (exact SI values of R, k, N_A since the 2019 redefinition of the SI).
 * - IUPAC conventional standard atomic weights (CIAAW 2021): C 12.011, H 1.008, O 15.999,
 *   N 14.007, S 32.06.
 * - US EPA 40 CFR Part 60 App. A Method 19 (standard conditions 20 °C, 760 mm Hg) and
 *   40 CFR Part 75 App. F (ppm → lb/scf conversion constants).
 * - Directive 2010/75/EU (IED) Annex V Part 1 / Annex VI Part 2: 273.15 K, 101.3 kPa, dry gas.
 */

/** Molar gas constant, J/(mol·K). CODATA 2018 (exact). */
export const GAS_CONSTANT_J_PER_MOL_K = 8.314462618;

/** Normal temperature, K (0 °C). IED Annex V Part 1 "273,15 K". */
export const NORMAL_TEMP_K = 273.15;
/** Standard atmosphere, kPa (760 mm Hg). */
export const STANDARD_PRESSURE_KPA = 101.325;
/** US standard temperature of Method 19 / Part 75: 20 °C = 68 °F, in K. 40 CFR 60 App. A Method 19 §2. */
export const US_STANDARD_TEMP_K = 293.15;

/**
 * Ideal-gas molar volume at 273.15 K and 101.325 kPa, m3/kmol (= L/mol).
 * Derived: R·T/p = 8.314462618 × 273.15 / 101.325 = 22.41397. The trade rounds to 22.414.
 */
export const MOLAR_VOLUME_NM3_PER_KMOL = (GAS_CONSTANT_J_PER_MOL_K * NORMAL_TEMP_K) / STANDARD_PRESSURE_KPA;
/** Ideal-gas molar volume at 20 °C and 101.325 kPa, m3/kmol. Derived: 24.055. */
export const MOLAR_VOLUME_20C_M3_PER_KMOL = (GAS_CONSTANT_J_PER_MOL_K * US_STANDARD_TEMP_K) / STANDARD_PRESSURE_KPA;
/** Ideal-gas molar volume at 25 °C and 101.325 kPa, m3/kmol. Derived: 24.465. */
export const MOLAR_VOLUME_25C_M3_PER_KMOL = (GAS_CONSTANT_J_PER_MOL_K * 298.15) / STANDARD_PRESSURE_KPA;

/** Cubic foot in m3 (exact: 0.3048³). */
export const CUBIC_FOOT_M3 = 0.028316846592;
/** Pound (avoirdupois) in kg (exact, 1959 international yard and pound agreement). */
export const POUND_KG = 0.45359237;
/** International Table Btu in J (exact by definition, 1956). */
export const BTU_J = 1055.05585262;
/** 1 Btu/lb in MJ/kg (exact: 1055.05585262 J / 0.45359237 kg = 2326 J/kg). */
export const BTU_PER_LB_IN_MJ_PER_KG = BTU_J / POUND_KG / 1e6;

/**
 * Molar volume at 68 °F and 29.92 in Hg, scf/lbmol (Method 19 standard conditions).
 * Derived: 24.055 m3/kmol × (1 kmol / 2.20462 lbmol) / 0.0283168 m3/ft3 = 385.3.
 */
export const MOLAR_VOLUME_SCF_PER_LBMOL = (MOLAR_VOLUME_20C_M3_PER_KMOL * POUND_KG) / CUBIC_FOOT_M3;

/** IUPAC conventional atomic weights, g/mol (kg/kmol). CIAAW 2021. */
export const ATOMIC_WEIGHT = { C: 12.011, H: 1.008, O: 15.999, N: 14.007, S: 32.06 } as const;

/** Pollutants and gases the concentration conversions know. 'NOx' is expressed as NO2. 'TOC' is total organic carbon expressed as C. */
export type Species = 'NOx' | 'NO2' | 'NO' | 'SO2' | 'CO' | 'NH3' | 'HCl' | 'HF' | 'CO2' | 'TOC' | 'N2O' | 'CH4' | 'H2S' | 'O2';

/**
 * Molar masses, g/mol, from the IUPAC atomic weights above (values as listed in
 * REFERENCES.md §4 for NO2 46.0055, NO 30.006, SO2 64.064, CO 28.010, NH3 17.031, HCl 36.461,
 * HF 20.006, CO2 44.009, C 12.011). NOx is expressed as NO2 (IED Annex V Part 1 note;
 * 40 CFR 60.44Da "NOx expressed as NO2").
 */
export const MOLAR_MASS_G_PER_MOL: Readonly<Record<Species, number>> = {
  NOx: 46.0055,
  NO2: 46.0055,
  NO: 30.006,
  SO2: 64.064,
  CO: 28.01,
  NH3: 17.031,
  HCl: 36.461,
  HF: 20.006,
  CO2: 44.009,
  TOC: 12.011,
  N2O: 44.013,
  CH4: 16.043,
  H2S: 34.08,
  O2: 31.998,
};

/**
 * ppm → lb/scf conversion constants: SO2 1.660e-7 (40 CFR Part 75 App. F §2.1–2.2, "K = 1.660 ×
 * 10−7 for SO2, (lb/scf)/ppm" [pub: https://www.ecfr.gov/current/title-40/part-75/appendix-Appendix%20F%20to%20Part%2075]),
 * NOx (as NO2) 1.194e-7 (App. F §3; Method 19 Table 19-1) [pub]; CO 7.267e-8 [memory] — no
 * published text found; 7.267e-8 is 28.0/385.3 × 1e-6, and with M = 28.010 the derivation gives
 * 7.270e-8 (0.04 % higher). Other species are derived from their molar mass: 1e-6 × M / 385.3 scf/lbmol.
 */
export const PART75_LB_PER_SCF_PER_PPM: Readonly<Partial<Record<Species, number>>> = {
  SO2: 1.66e-7,
  NOx: 1.194e-7,
  NO2: 1.194e-7,
  CO: 7.267e-8,
};

/**
 * 1 lb/MMBtu in ng/J. Derived: 453.59237 g ÷ 1.05505585262 GJ = 429.923 g/GJ = 429.923 ng/J.
 */
export const NG_PER_J_PER_LB_PER_MMBTU = (POUND_KG * 1e12) / (BTU_J * 1e6);

/** Ambient O2, % by volume in dry air. 20.9 in US rules (40 CFR 60 Method 19), 21 in the EU formula (IED Annex VI Part 7). */
export type AmbientO2Percent = 21 | 20.9;

/** Every species name accepted by {@link MOLAR_MASS_G_PER_MOL}. */
export const SPECIES: readonly Species[] = Object.keys(MOLAR_MASS_G_PER_MOL) as Species[];
