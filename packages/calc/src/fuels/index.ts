/**
 * Fuel descriptions (ultimate analysis of a solid or liquid, composition of a gas), their
 * validation, and their reduction to element amounts — the common ground of the
 * stoichiometry, F-factor, heating-value and flame modules.
 *
 * Sources: ultimate analysis conventions of ASTM D3176 / ISO 17247 (as-fired mass %, hydrogen
 * excluding the hydrogen of moisture, moisture and ash reported separately); gas component
 * data of ISO 6976 (molar masses from IUPAC atomic weights; heating values see `heating-value`).
 */
import { CalcInputError } from '../errors';
import { ATOMIC_WEIGHT, MOLAR_VOLUME_NM3_PER_KMOL } from '../constants';

/** Ultimate analysis, as-fired mass %: C, H (excluding moisture), O, N, S, moisture, ash. Sums to 100 ± 0.5. */
export interface UltimateAnalysis {
  C: number;
  H: number;
  O: number;
  N: number;
  S: number;
  moisture: number;
  ash: number;
}

/** A solid or liquid fuel by its as-fired ultimate analysis. */
export interface SolidOrLiquidFuel {
  kind: 'solid' | 'liquid';
  ultimate: UltimateAnalysis;
  /** Gross calorific value (higher heating value), as fired, MJ/kg. */
  gcvMJPerKg?: number;
}

/** Components a gaseous fuel may contain. C4H10 is n-butane. */
export type GasComponent = 'CH4' | 'C2H6' | 'C3H8' | 'C4H10' | 'CO' | 'H2' | 'CO2' | 'N2' | 'O2' | 'H2S' | 'H2O';

/** A gaseous fuel by its composition, mol % (sums to 100 ± 0.5). */
export interface GaseousFuel {
  kind: 'gas';
  composition: Partial<Record<GasComponent, number>>;
  /** Gross calorific value (higher heating value), MJ per Nm3 (0 °C, 101.325 kPa). */
  gcvMJPerNm3?: number;
}

/** Any fuel FlueLedger computes with. */
export type Fuel = SolidOrLiquidFuel | GaseousFuel;

/** Element counts of each gas component (per molecule). */
export const GAS_COMPONENT_ELEMENTS: Readonly<Record<GasComponent, Readonly<{ C: number; H: number; O: number; N: number; S: number }>>> = {
  CH4: { C: 1, H: 4, O: 0, N: 0, S: 0 },
  C2H6: { C: 2, H: 6, O: 0, N: 0, S: 0 },
  C3H8: { C: 3, H: 8, O: 0, N: 0, S: 0 },
  C4H10: { C: 4, H: 10, O: 0, N: 0, S: 0 },
  CO: { C: 1, H: 0, O: 1, N: 0, S: 0 },
  H2: { C: 0, H: 2, O: 0, N: 0, S: 0 },
  CO2: { C: 1, H: 0, O: 2, N: 0, S: 0 },
  N2: { C: 0, H: 0, O: 0, N: 2, S: 0 },
  O2: { C: 0, H: 0, O: 2, N: 0, S: 0 },
  H2S: { C: 0, H: 2, O: 0, N: 0, S: 1 },
  H2O: { C: 0, H: 2, O: 1, N: 0, S: 0 },
};

/** Every gas component name. */
export const GAS_COMPONENTS = Object.keys(GAS_COMPONENT_ELEMENTS) as GasComponent[];

/** Molar mass of a gas component, g/mol, from the IUPAC atomic weights. */
export function gasComponentMolarMass(component: GasComponent): number {
  const e = GAS_COMPONENT_ELEMENTS[component];
  return e.C * ATOMIC_WEIGHT.C + e.H * ATOMIC_WEIGHT.H + e.O * ATOMIC_WEIGHT.O + e.N * ATOMIC_WEIGHT.N + e.S * ATOMIC_WEIGHT.S;
}

/** Tolerance on the sum of a composition or an ultimate analysis, percentage points. */
export const COMPOSITION_SUM_TOLERANCE_PERCENT = 0.5;

const ULTIMATE_KEYS = ['C', 'H', 'O', 'N', 'S', 'moisture', 'ash'] as const;

/**
 * Check a fuel and throw {@link CalcInputError} with an actionable message when it is not
 * usable: unknown kind or component, negative or non-finite fractions, a sum outside
 * 100 ± 0.5 %, a non-positive heating value.
 */
export function validateFuel(fuel: Fuel): void {
  if (fuel === null || typeof fuel !== 'object') throw new CalcInputError('A fuel is needed.', 'fuel');
  if (fuel.kind === 'gas') {
    const composition = fuel.composition ?? {};
    let sum = 0;
    for (const [component, value] of Object.entries(composition)) {
      if (!(component in GAS_COMPONENT_ELEMENTS)) {
        throw new CalcInputError(`Unknown gas component "${component}". Use: ${GAS_COMPONENTS.join(', ')}.`, `composition.${component}`);
      }
      if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
        throw new CalcInputError(`Gas component ${component} must be a mol % of at least 0 (got ${String(value)}).`, `composition.${component}`);
      }
      sum += value;
    }
    if (Math.abs(sum - 100) > COMPOSITION_SUM_TOLERANCE_PERCENT) {
      throw new CalcInputError(`The gas composition sums to ${sum.toFixed(2)} mol %; it must be 100 ± 0.5 %. Check the analysis.`, 'composition');
    }
    const combustible = sum - (composition.CO2 ?? 0) - (composition.N2 ?? 0) - (composition.O2 ?? 0) - (composition.H2O ?? 0);
    if (combustible <= 0) throw new CalcInputError('The gas contains nothing combustible.', 'composition');
    if (fuel.gcvMJPerNm3 !== undefined && !(fuel.gcvMJPerNm3 > 0)) {
      throw new CalcInputError(`Gross calorific value must be above 0 MJ/Nm3 (got ${fuel.gcvMJPerNm3}).`, 'gcvMJPerNm3');
    }
    return;
  }
  if (fuel.kind !== 'solid' && fuel.kind !== 'liquid') {
    throw new CalcInputError(`Fuel kind must be 'solid', 'liquid' or 'gas' (got ${String((fuel as { kind?: unknown }).kind)}).`, 'kind');
  }
  const ultimate = fuel.ultimate;
  if (ultimate === undefined || ultimate === null) throw new CalcInputError('A solid or liquid fuel needs its ultimate analysis.', 'ultimate');
  let sum = 0;
  for (const key of ULTIMATE_KEYS) {
    const value = ultimate[key];
    if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
      throw new CalcInputError(`Ultimate analysis ${key} must be a mass % of at least 0 (got ${String(value)}); give 0 if absent.`, `ultimate.${key}`);
    }
    sum += value;
  }
  for (const key of Object.keys(ultimate)) {
    if (!(ULTIMATE_KEYS as readonly string[]).includes(key)) {
      throw new CalcInputError(`Unknown ultimate-analysis entry "${key}". Use: ${ULTIMATE_KEYS.join(', ')}.`, `ultimate.${key}`);
    }
  }
  if (Math.abs(sum - 100) > COMPOSITION_SUM_TOLERANCE_PERCENT) {
    throw new CalcInputError(`The ultimate analysis sums to ${sum.toFixed(2)} %; it must be 100 ± 0.5 % (as fired, with moisture and ash).`, 'ultimate');
  }
  if (ultimate.C + ultimate.H + ultimate.S <= 0) throw new CalcInputError('The fuel contains no C, H or S: nothing burns.', 'ultimate');
  if (fuel.gcvMJPerKg !== undefined && !(fuel.gcvMJPerKg > 0)) {
    throw new CalcInputError(`Gross calorific value must be above 0 MJ/kg (got ${fuel.gcvMJPerKg}).`, 'gcvMJPerKg');
  }
}

/**
 * Element amounts in one basis unit of fuel (1 kg of solid/liquid, 1 Nm3 of gas), kmol.
 * C, H, O, N, S count the atoms bound in the fuel; free water (the moisture of a solid or
 * liquid, the H2O component of a gas) is kept apart in `moistureKmol`.
 */
export interface FuelElements {
  basis: 'kg' | 'Nm3';
  /** kmol of C atoms per basis unit. */
  C: number;
  /** kmol of H atoms per basis unit, excluding free moisture. */
  H: number;
  /** kmol of O atoms per basis unit, excluding free moisture. */
  O: number;
  /** kmol of N atoms per basis unit. */
  N: number;
  /** kmol of S atoms per basis unit. */
  S: number;
  /** kmol of free water (fuel moisture, or gas H2O) per basis unit. */
  moistureKmol: number;
  /** Mass of one basis unit, kg (1 for solids/liquids; the density at 0 °C, 101.325 kPa for gas). */
  massKg: number;
}

/**
 * Reduce a validated fuel to element amounts per basis unit. Gas compositions are
 * normalised to 100 % (the 0.5 % tolerance allows rounding). Ideal gas: 1 Nm3 = 1/22.414 kmol.
 */
export function fuelElements(fuel: Fuel): FuelElements {
  validateFuel(fuel);
  if (fuel.kind === 'gas') {
    let sum = 0;
    for (const value of Object.values(fuel.composition)) sum += value ?? 0;
    const kmolPerNm3 = 1 / MOLAR_VOLUME_NM3_PER_KMOL;
    const e: FuelElements = { basis: 'Nm3', C: 0, H: 0, O: 0, N: 0, S: 0, moistureKmol: 0, massKg: 0 };
    for (const [component, value] of Object.entries(fuel.composition) as [GasComponent, number][]) {
      const kmol = (value / sum) * kmolPerNm3;
      const counts = GAS_COMPONENT_ELEMENTS[component];
      e.massKg += kmol * gasComponentMolarMass(component);
      if (component === 'H2O') {
        e.moistureKmol += kmol;
        continue;
      }
      e.C += kmol * counts.C;
      e.H += kmol * counts.H;
      e.O += kmol * counts.O;
      e.N += kmol * counts.N;
      e.S += kmol * counts.S;
    }
    return e;
  }
  const u = fuel.ultimate;
  return {
    basis: 'kg',
    C: u.C / 100 / ATOMIC_WEIGHT.C,
    H: u.H / 100 / ATOMIC_WEIGHT.H,
    O: u.O / 100 / ATOMIC_WEIGHT.O,
    N: u.N / 100 / ATOMIC_WEIGHT.N,
    S: u.S / 100 / ATOMIC_WEIGHT.S,
    moistureKmol: u.moisture / 100 / (2 * ATOMIC_WEIGHT.H + ATOMIC_WEIGHT.O),
    massKg: 1,
  };
}

/**
 * Equivalent as-fired ultimate analysis (mass %) of any fuel — for a gas, from its
 * composition (Method 19 §12.3.2 computes gaseous-fuel F-factors from such an analysis).
 * Gas H2O is reported as moisture; gases have no ash.
 */
export function ultimateAnalysisOf(fuel: Fuel): UltimateAnalysis {
  if (fuel.kind !== 'gas') {
    validateFuel(fuel);
    return { ...fuel.ultimate };
  }
  const e = fuelElements(fuel);
  const pct = (kg: number) => (100 * kg) / e.massKg;
  return {
    C: pct(e.C * ATOMIC_WEIGHT.C),
    H: pct(e.H * ATOMIC_WEIGHT.H),
    O: pct(e.O * ATOMIC_WEIGHT.O),
    N: pct(e.N * ATOMIC_WEIGHT.N),
    S: pct(e.S * ATOMIC_WEIGHT.S),
    moisture: pct(e.moistureKmol * (2 * ATOMIC_WEIGHT.H + ATOMIC_WEIGHT.O)),
    ash: 0,
  };
}
