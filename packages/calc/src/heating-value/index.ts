/**
 * Heating values: of a gas from its composition (ideal-gas summation, ISO 6976 component
 * values), of a solid or liquid from its ultimate analysis (Channiwala & Parikh 2002
 * correlation) when no measured GCV is given, and lower ↔ higher heating value.
 *
 * Sources:
 * - ISO 6976:1995 "Natural gas — Calculation of calorific values, density, relative density
 *   and Wobbe index from composition", Table 3, molar gross and net calorific values at
 *   25 °C combustion reference temperature [pub: the ISO 6976:1995 table as reproduced in the
 *   open-source NeqSim data file ISO6976constants.csv, columns Hsupmolar25 / Hinfmolar25,
 *   https://github.com/equinor/neqsim/blob/master/src/main/resources/data/ISO6976constants.csv].
 *   Check: CH4 gross 890.63 kJ/mol → 55.51 MJ/kg, net 802.60 → 50.03 MJ/kg (REFERENCES.md §6:
 *   55.5 / 50.0); gross − net = moles of water formed × 44.016 kJ/mol (the 25 °C water entry of
 *   the same table).
 * - S. A. Channiwala, P. P. Parikh, "A unified correlation for estimating HHV of solid,
 *   liquid and gaseous fuels", Fuel 81 (2002) 1051–1063, eq. (3):
 *   HHV [MJ/kg] = 0.3491 C + 1.1783 H + 0.1005 S − 0.1034 O − 0.0151 N − 0.0211 A (mass %).
 *   Stated average absolute error 1.45 %.
 * - Latent heat of water at 25 °C: ΔHf H2O(l) − ΔHf H2O(g) = −285.83 − (−241.83) = 44.0 kJ/mol
 *   (NIST-JANAF; GRI-Mech 3.0 gives H2O(g) −241.83) → 2.442 MJ/kg.
 */
import { CalcInputError } from '../errors';
import { ATOMIC_WEIGHT, MOLAR_VOLUME_NM3_PER_KMOL } from '../constants';
import { fuelElements, validateFuel, type Fuel, type GasComponent, type GaseousFuel, type UltimateAnalysis } from '../fuels';

/**
 * Molar gross (higher) and net (lower) heating values at 25 °C combustion reference
 * temperature, kJ/mol. ISO 6976:1995 Table 3, 25 °C column [pub: as reproduced in NeqSim
 * ISO6976constants.csv, see the file header]. The net values were earlier typed from the
 * 15 °C column (CH4 802.69, C2H6 1428.84, C3H8 2043.37, n-C4H10 2657.60, H2S 517.95); the
 * 25 °C values below satisfy gross − net = n(H2O) × 44.016 kJ/mol.
 */
export const GAS_COMPONENT_HEATING_VALUE_KJ_PER_MOL: Readonly<Record<GasComponent, { gross: number; net: number }>> = {
  CH4: { gross: 890.63, net: 802.6 },
  C2H6: { gross: 1560.69, net: 1428.64 },
  C3H8: { gross: 2219.17, net: 2043.11 },
  C4H10: { gross: 2877.4, net: 2657.32 },
  CO: { gross: 282.98, net: 282.98 },
  H2: { gross: 285.83, net: 241.81 },
  H2S: { gross: 562.01, net: 517.99 },
  CO2: { gross: 0, net: 0 },
  N2: { gross: 0, net: 0 },
  O2: { gross: 0, net: 0 },
  H2O: { gross: 0, net: 0 },
};

/** Enthalpy of vaporisation of water at 25 °C, kJ/mol. NIST-JANAF formation enthalpies (liquid − gas). */
export const WATER_LATENT_HEAT_25C_KJ_PER_MOL = 44.0;
/** Enthalpy of vaporisation of water at 25 °C, MJ/kg (44.0 kJ/mol ÷ 18.015 g/mol). */
export const WATER_LATENT_HEAT_25C_MJ_PER_KG = WATER_LATENT_HEAT_25C_KJ_PER_MOL / (2 * ATOMIC_WEIGHT.H + ATOMIC_WEIGHT.O);

/** Heating values of a gas by ideal-gas summation over its composition. */
export interface GasHeatingValue {
  /** Gross (higher) heating value, MJ/Nm3 (metered at 0 °C, 101.325 kPa; combustion at 25 °C). */
  hhvMJPerNm3: number;
  /** Net (lower) heating value, MJ/Nm3. */
  lhvMJPerNm3: number;
  /** Gross heating value, MJ/kg. */
  hhvMJPerKg: number;
  /** Net heating value, MJ/kg. */
  lhvMJPerKg: number;
  /** Ideal-gas density at 0 °C, 101.325 kPa, kg/Nm3. */
  densityKgPerNm3: number;
}

/**
 * Heating value of a gas from its composition (mol %), ideal gas, ISO 6976:1995 component
 * values at 25 °C [pub]. Real-gas compression factors (< 0.3 % for natural gas) are ignored.
 * @example gasHeatingValue({ kind: 'gas', composition: { CH4: 100 } }).hhvMJPerNm3 //=> 39.74
 */
export function gasHeatingValue(fuel: GaseousFuel): GasHeatingValue {
  validateFuel(fuel);
  let sum = 0;
  for (const value of Object.values(fuel.composition)) sum += value ?? 0;
  let grossKJPerMol = 0;
  let netKJPerMol = 0;
  for (const [component, value] of Object.entries(fuel.composition) as [GasComponent, number][]) {
    const hv = GAS_COMPONENT_HEATING_VALUE_KJ_PER_MOL[component];
    grossKJPerMol += (value / sum) * hv.gross;
    netKJPerMol += (value / sum) * hv.net;
  }
  const densityKgPerNm3 = fuelElements(fuel).massKg;
  const hhvMJPerNm3 = grossKJPerMol / MOLAR_VOLUME_NM3_PER_KMOL;
  const lhvMJPerNm3 = netKJPerMol / MOLAR_VOLUME_NM3_PER_KMOL;
  return { hhvMJPerNm3, lhvMJPerNm3, hhvMJPerKg: hhvMJPerNm3 / densityKgPerNm3, lhvMJPerKg: lhvMJPerNm3 / densityKgPerNm3, densityKgPerNm3 };
}

/**
 * Gross calorific value of a solid or liquid fuel from its ultimate analysis by the
 * Channiwala–Parikh (2002) unified correlation, MJ/kg. The correlation is linear with no
 * moisture term, so as-fired percentages give the as-fired GCV. An estimate (±1.5 % typical):
 * prefer a measured GCV.
 * @example solidGcvChanniwalaParikhMJPerKg({ C: 75.5, H: 5, O: 4.9, N: 1.2, S: 3.1, moisture: 0, ash: 10.3 }) //=> 31.82
 */
export function solidGcvChanniwalaParikhMJPerKg(ultimate: UltimateAnalysis): number {
  validateFuel({ kind: 'solid', ultimate });
  const u = ultimate;
  return 0.3491 * u.C + 1.1783 * u.H + 0.1005 * u.S - 0.1034 * u.O - 0.0151 * u.N - 0.0211 * u.ash;
}

/**
 * Net (lower) from gross (higher) heating value of a solid or liquid, MJ/kg, at constant
 * pressure: `LHV = HHV − L·(8.936·H + W)/100`, L = 2.442 MJ/kg water at 25 °C, 8.936 = kg water
 * per kg H (18.015/2.016), H and W = hydrogen and moisture, as-fired mass %.
 */
export function lhvFromHhvMJPerKg(hhvMJPerKg: number, opts: { hydrogenPercent: number; moisturePercent: number }): number {
  return hhvMJPerKg - waterLatentMJPerKg(hhvMJPerKg, opts);
}

/** Gross (higher) from net (lower) heating value of a solid or liquid, MJ/kg; inverse of {@link lhvFromHhvMJPerKg}. */
export function hhvFromLhvMJPerKg(lhvMJPerKg: number, opts: { hydrogenPercent: number; moisturePercent: number }): number {
  return lhvMJPerKg + waterLatentMJPerKg(lhvMJPerKg, opts);
}

function waterLatentMJPerKg(heatingValue: number, opts: { hydrogenPercent: number; moisturePercent: number }): number {
  if (!(heatingValue > 0)) throw new CalcInputError(`Heating value must be above 0 MJ/kg (got ${heatingValue}).`, 'heatingValue');
  const { hydrogenPercent, moisturePercent } = opts;
  if (!(hydrogenPercent >= 0 && hydrogenPercent < 100)) throw new CalcInputError(`Hydrogen must be 0–100 mass % (got ${hydrogenPercent}).`, 'hydrogenPercent');
  if (!(moisturePercent >= 0 && moisturePercent < 100)) throw new CalcInputError(`Moisture must be 0–100 mass % (got ${moisturePercent}).`, 'moisturePercent');
  const waterKgPerKgH = (2 * ATOMIC_WEIGHT.H + ATOMIC_WEIGHT.O) / (2 * ATOMIC_WEIGHT.H);
  return (WATER_LATENT_HEAT_25C_MJ_PER_KG * (waterKgPerKgH * hydrogenPercent + moisturePercent)) / 100;
}

/** Where a heating value came from. */
export type HeatingValueSource = 'given' | 'gas-composition-iso6976' | 'channiwala-parikh-2002';

/** Gross and net heating values of any fuel per basis unit (kg of solid/liquid, Nm3 of gas). */
export interface FuelHeatingValue {
  basis: 'kg' | 'Nm3';
  /** Gross (higher) heating value per basis unit, MJ. */
  hhvMJ: number;
  /** Net (lower) heating value per basis unit, MJ. */
  lhvMJ: number;
  /** Gross heating value per kg, MJ/kg. */
  hhvMJPerKg: number;
  /** Net heating value per kg, MJ/kg. */
  lhvMJPerKg: number;
  source: HeatingValueSource;
}

/**
 * Gross and net heating values of a fuel. A given GCV wins. Otherwise a gas's value comes
 * from its composition (ISO 6976 summation); a solid's or liquid's needs
 * `estimate: true` to fall back on the Channiwala–Parikh correlation, else it throws.
 */
export function heatingValues(fuel: Fuel, opts: { estimate?: boolean } = {}): FuelHeatingValue {
  validateFuel(fuel);
  if (fuel.kind === 'gas') {
    const fromComposition = gasHeatingValue(fuel);
    const latentMJPerNm3 = fromComposition.hhvMJPerNm3 - fromComposition.lhvMJPerNm3;
    const hhvMJ = fuel.gcvMJPerNm3 ?? fromComposition.hhvMJPerNm3;
    const lhvMJ = hhvMJ - latentMJPerNm3;
    const d = fromComposition.densityKgPerNm3;
    return { basis: 'Nm3', hhvMJ, lhvMJ, hhvMJPerKg: hhvMJ / d, lhvMJPerKg: lhvMJ / d, source: fuel.gcvMJPerNm3 === undefined ? 'gas-composition-iso6976' : 'given' };
  }
  let hhvMJ = fuel.gcvMJPerKg;
  let source: HeatingValueSource = 'given';
  if (hhvMJ === undefined) {
    if (!opts.estimate) {
      throw new CalcInputError(
        'This calculation needs the gross calorific value (gcvMJPerKg) of the fuel: give the laboratory value, or allow an estimate from the ultimate analysis.',
        'gcvMJPerKg',
      );
    }
    hhvMJ = solidGcvChanniwalaParikhMJPerKg(fuel.ultimate);
    source = 'channiwala-parikh-2002';
    if (!(hhvMJ > 0)) throw new CalcInputError('The ultimate analysis gives no positive heating value; give a measured GCV.', 'gcvMJPerKg');
  }
  const lhvMJ = lhvFromHhvMJPerKg(hhvMJ, { hydrogenPercent: fuel.ultimate.H, moisturePercent: fuel.ultimate.moisture });
  return { basis: 'kg', hhvMJ, lhvMJ, hhvMJPerKg: hhvMJ, lhvMJPerKg: lhvMJ, source };
}
