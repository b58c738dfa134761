/**
 * Ideal-gas thermochemistry from NASA 7-coefficient polynomials (REFERENCES.md §6) with the
 * GRI-Mech 3.0 data set in `nasa7-gri30.ts`.
 */
import { CalcInputError } from '../errors';
import { GAS_CONSTANT_J_PER_MOL_K } from '../constants';
import { GRI30_THERMO, type Nasa7Species } from './nasa7-gri30';

export { GRI30_THERMO, NASA7_REFERENCE_PRESSURE_KPA, type Nasa7Species } from './nasa7-gri30';

/** Species with thermodynamic data in {@link GRI30_THERMO}. */
export type ThermoSpecies = 'O' | 'O2' | 'H' | 'H2' | 'OH' | 'H2O' | 'CO' | 'CO2' | 'CH4' | 'C2H6' | 'C3H8' | 'N' | 'NO' | 'N2';

function speciesData(species: string): Nasa7Species {
  const data = GRI30_THERMO[species];
  if (data === undefined) {
    throw new CalcInputError(`No thermodynamic data for "${species}". Known: ${Object.keys(GRI30_THERMO).join(', ')}.`, 'species');
  }
  return data;
}

function coefficients(data: Nasa7Species, tempK: number): readonly number[] {
  return tempK < data.tempRangeK[1] ? data.low : data.high;
}

/** Dimensionless heat capacity cp°/R at `tempK` (K). NASA 7-coefficient form, GRI-Mech 3.0 data. */
export function cpOverR(species: string, tempK: number): number {
  const a = coefficients(speciesData(species), tempK);
  return a[0]! + tempK * (a[1]! + tempK * (a[2]! + tempK * (a[3]! + tempK * a[4]!)));
}

/** Dimensionless enthalpy h°/(R·T) (formation enthalpy included) at `tempK` (K). */
export function hOverRT(species: string, tempK: number): number {
  const a = coefficients(speciesData(species), tempK);
  const t = tempK;
  return a[0]! + t * (a[1]! / 2 + t * (a[2]! / 3 + t * (a[3]! / 4 + t * (a[4]! / 5)))) + a[5]! / t;
}

/** Dimensionless standard entropy s°/R at `tempK` (K) and 1 atm. */
export function sOverR(species: string, tempK: number): number {
  const a = coefficients(speciesData(species), tempK);
  const t = tempK;
  return a[0]! * Math.log(t) + t * (a[1]! + t * (a[2]! / 2 + t * (a[3]! / 3 + t * (a[4]! / 4)))) + a[6]!;
}

/** Molar heat capacity cp°, J/(mol·K). */
export function cpJPerMolK(species: ThermoSpecies | string, tempK: number): number {
  return cpOverR(species, tempK) * GAS_CONSTANT_J_PER_MOL_K;
}

/** Molar enthalpy h° (on the formation-enthalpy scale: elements at 298.15 K are zero), kJ/mol. */
export function enthalpyKJPerMol(species: ThermoSpecies | string, tempK: number): number {
  return (hOverRT(species, tempK) * GAS_CONSTANT_J_PER_MOL_K * tempK) / 1000;
}

/** Standard molar entropy s° at 1 atm, J/(mol·K). */
export function entropyJPerMolK(species: ThermoSpecies | string, tempK: number): number {
  return sOverR(species, tempK) * GAS_CONSTANT_J_PER_MOL_K;
}

/** Standard enthalpy of formation at 298.15 K, kJ/mol (h° at 298.15 K of the polynomial). */
export function formationEnthalpyKJPerMol(species: ThermoSpecies | string): number {
  return enthalpyKJPerMol(species, 298.15);
}

/** Dimensionless standard Gibbs energy g°/(R·T) = h°/RT − s°/R at `tempK` and 1 atm. */
export function gOverRT(species: string, tempK: number): number {
  return hOverRT(species, tempK) - sOverR(species, tempK);
}
