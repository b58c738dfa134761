/**
 * Adiabatic flame temperature of a fuel burnt with air at constant pressure, with complete
 * combustion (no dissociation) or at chemical equilibrium.
 *
 * Method: the enthalpy of the reactants at the initial temperature equals the enthalpy of
 * the products at the flame temperature (first law, constant pressure, adiabatic; Turns,
 * An Introduction to Combustion, §2.5). Thermochemistry: NASA 7-coefficient polynomials with
 * the GRI-Mech 3.0 data (`thermo/nasa7-gri30.ts`). Equilibrium over CO2, H2O, N2, O2, CO,
 * H2, OH, H, O, NO, N by Gibbs minimisation (NASA RP-1311 form, `equilibrium.ts`), nested in
 * a bracketed secant search on temperature.
 *
 * - Gas components without GRI-Mech 3.0 data (C4H10, H2S) get their formation enthalpy from
 *   the ISO 6976 gross heating value; they can only enter at 298.15 K.
 * - Solid and liquid fuels get their formation enthalpy from the gross calorific value
 *   (given, or estimated with `estimateGcv`); the fuel enters at 298.15 K (its sensible heat
 *   is not modelled) while the air is at `initialTempK`; moisture enters as liquid water; ash
 *   is left out of the energy balance.
 * - Fuel sulphur leaves as SO2 (ΔHf −296.81 kJ/mol, CODATA via NIST WebBook), not dissociated, with the
 *   sensible enthalpy of CO2 as an approximation (GRI-Mech 3.0 carries no sulphur species).
 * - Rich mixtures with the 'complete' model: products CO2, H2O, CO, H2, N2 in water–gas-shift
 *   equilibrium (no other dissociation), the usual textbook treatment (Turns §2.5).
 */
import { CalcInputError } from '../errors';
import { MOLAR_VOLUME_NM3_PER_KMOL, STANDARD_PRESSURE_KPA } from '../constants';
import { fuelElements, validateFuel, type Fuel, type GasComponent } from '../fuels';
import { GAS_COMPONENT_HEATING_VALUE_KJ_PER_MOL, heatingValues, WATER_LATENT_HEAT_25C_KJ_PER_MOL } from '../heating-value';
import { enthalpyKJPerMol, GRI30_THERMO } from '../thermo';
import { DEFAULT_O2_IN_AIR } from '../stoichiometry';
import { buildSystem, EQUILIBRIUM_SPECIES, solveTP, type EquilibriumState, type EquilibriumSystem } from './equilibrium';

export { EQUILIBRIUM_SPECIES } from './equilibrium';

/** Thrown when the flame-temperature iteration does not converge. */
export class FlameConvergenceError extends Error {
  override readonly name = 'FlameConvergenceError';
}

/**
 * Standard enthalpy of formation of SO2(g), kJ/mol [pub]: −70.939 ± 0.048 kcal/mol (CODATA, Cox,
 * Wagman et al. 1984) = −296.81 kJ/mol, NIST Chemistry WebBook, sulfur dioxide,
 * https://webbook.nist.gov/cgi/cbook.cgi?Mask=37&Source=1984GRA%2FVAN575&Units=CAL
 */
export const SO2_FORMATION_ENTHALPY_KJ_PER_MOL = -296.81;

const T_REF_K = 298.15;

/** Options of {@link adiabaticFlameTemperature}. */
export interface FlameOptions {
  /** 'complete': no dissociation; 'equilibrium': chemical equilibrium of 11 species. */
  model: 'complete' | 'equilibrium';
  /** Equivalence ratio φ = (fuel/air) / (fuel/air)stoichiometric. Default 1. Accepted 0.3–2. */
  equivalenceRatio?: number;
  /** Temperature of the reactants (air; and gaseous fuel), K. Default 298.15 K. Accepted 250–1200 K. */
  initialTempK?: number;
  /** Pressure, kPa absolute. Default 101.325 kPa. Accepted 10–5000 kPa. */
  pressureKPa?: number;
  /** O2 mole fraction of the air. Default 0.21 (the rest N2). */
  o2InAir?: number;
  /** For a solid/liquid without a GCV, estimate it by Channiwala–Parikh (2002) instead of throwing. */
  estimateGcv?: boolean;
}

/** Result of {@link adiabaticFlameTemperature}. */
export interface FlameResult {
  /** Adiabatic flame temperature, K. */
  temperatureK: number;
  /** Mole fractions of the products (wet), by species name. */
  moleFractions: Record<string, number>;
}

interface Reactants {
  elements: { C: number; H: number; O: number; N: number };
  sulphurKmol: number;
  enthalpyKJ: number;
}

function reactantsOf(fuel: Fuel, phi: number, t0: number, o2InAir: number, estimateGcv: boolean | undefined): Reactants {
  const e = fuelElements(fuel);
  const o2Demand = e.C + e.H / 4 + e.S - e.O / 2;
  if (!(o2Demand > 0)) throw new CalcInputError('The fuel needs no oxygen to burn: check the analysis.', 'fuel');
  const o2Kmol = o2Demand / phi;
  const n2AirKmol = (o2Kmol * (1 - o2InAir)) / o2InAir;
  const airKJ = 1000 * (o2Kmol * enthalpyKJPerMol('O2', t0) + n2AirKmol * enthalpyKJPerMol('N2', t0));
  const hfCO2 = enthalpyKJPerMol('CO2', T_REF_K);
  const hfH2OLiquid = enthalpyKJPerMol('H2O', T_REF_K) - WATER_LATENT_HEAT_25C_KJ_PER_MOL;
  let fuelKJ = 0;
  if (fuel.kind === 'gas') {
    let sum = 0;
    for (const v of Object.values(fuel.composition)) sum += v ?? 0;
    const kmolPerNm3 = 1 / MOLAR_VOLUME_NM3_PER_KMOL;
    for (const [component, value] of Object.entries(fuel.composition) as [GasComponent, number][]) {
      if (value === 0) continue;
      const kmol = (value / sum) * kmolPerNm3;
      if (GRI30_THERMO[component] !== undefined) {
        fuelKJ += 1000 * kmol * enthalpyKJPerMol(component, t0);
        continue;
      }
      if (Math.abs(t0 - T_REF_K) > 0.5) {
        throw new CalcInputError(
          `${component} has no heat-capacity data in GRI-Mech 3.0: a preheated fuel containing it is not supported; use initialTempK 298.15.`,
          `composition.${component}`,
        );
      }
      // Formation enthalpy from the gross heating value (products CO2, H2O(l), SO2).
      const counts = component === 'C4H10' ? { C: 4, H: 10, S: 0 } : { C: 0, H: 2, S: 1 };
      const hf = counts.C * hfCO2 + (counts.H / 2) * hfH2OLiquid + counts.S * SO2_FORMATION_ENTHALPY_KJ_PER_MOL + GAS_COMPONENT_HEATING_VALUE_KJ_PER_MOL[component].gross;
      fuelKJ += 1000 * kmol * hf;
    }
  } else {
    const hv = heatingValues(fuel, { estimate: estimateGcv });
    const hhvKJ = hv.hhvMJ * 1000;
    // fuel + O2 → CO2 + H2O(l) + SO2 + N2 releases the GCV; moisture enters and leaves as liquid.
    fuelKJ = 1000 * (e.C * hfCO2 + (e.H / 2) * hfH2OLiquid + e.S * SO2_FORMATION_ENTHALPY_KJ_PER_MOL + e.moistureKmol * hfH2OLiquid) + hhvKJ;
  }
  return {
    elements: { C: e.C, H: e.H + 2 * e.moistureKmol, O: e.O + e.moistureKmol + 2 * o2Kmol, N: e.N + 2 * n2AirKmol },
    sulphurKmol: e.S,
    enthalpyKJ: fuelKJ + airKJ,
  };
}

function so2EnthalpyKJPerKmol(tempK: number): number {
  return 1000 * (SO2_FORMATION_ENTHALPY_KJ_PER_MOL + enthalpyKJPerMol('CO2', tempK) - enthalpyKJPerMol('CO2', T_REF_K));
}

function productsEnthalpyKJ(species: readonly string[], kmol: ArrayLike<number>, so2Kmol: number, tempK: number): number {
  let h = 0;
  for (let j = 0; j < species.length; j++) h += kmol[j]! * enthalpyKJPerMol(species[j]!, tempK);
  return 1000 * h + (so2Kmol > 0 ? so2Kmol * so2EnthalpyKJPerKmol(tempK) : 0);
}

/**
 * Find T in [lo, hi] where f(T) = 0 (f increasing): bisection safeguarded secant
 * (Illinois variant of regula falsi).
 */
function solveTemperature(f: (t: number) => number, lo: number, hi: number): number {
  let fLo = f(lo);
  let fHi = f(hi);
  if (fLo > 0) throw new FlameConvergenceError(`The products at ${lo.toFixed(0)} K already hold more enthalpy than the reactants: no flame.`);
  if (fHi < 0) throw new FlameConvergenceError(`The flame temperature would exceed ${hi} K, beyond the thermodynamic data.`);
  let side = 0;
  for (let i = 0; i < 100; i++) {
    let t = (lo * fHi - hi * fLo) / (fHi - fLo);
    if (!(t > lo && t < hi)) t = 0.5 * (lo + hi);
    const ft = f(t);
    if (Math.abs(ft) < 1e-9 * (Math.abs(fLo) + Math.abs(fHi)) || hi - lo < 1e-6) return t;
    if (ft < 0) {
      lo = t;
      fLo = ft;
      if (side === -1) fHi /= 2;
      side = -1;
    } else {
      hi = t;
      fHi = ft;
      if (side === 1) fLo /= 2;
      side = 1;
    }
    if (hi - lo < 1e-4) return 0.5 * (lo + hi);
  }
  throw new FlameConvergenceError('The flame temperature search did not converge in 100 steps.');
}

function moleFractionsOf(species: readonly string[], kmol: ArrayLike<number>, so2Kmol: number): Record<string, number> {
  let total = so2Kmol;
  for (let j = 0; j < species.length; j++) total += kmol[j]!;
  const out: Record<string, number> = {};
  for (let j = 0; j < species.length; j++) out[species[j]!] = kmol[j]! / total;
  if (so2Kmol > 0) out['SO2'] = so2Kmol / total;
  return out;
}

function equilibriumFlame(system: EquilibriumSystem, reactants: Reactants, pressureKPa: number, lowK: number): FlameResult {
  let warm: EquilibriumState | undefined;
  let lastKmol: Float64Array | undefined;
  const f = (t: number): number => {
    let r = solveTP(system, t, pressureKPa, warm);
    if (r === undefined && warm !== undefined) r = solveTP(system, t, pressureKPa, undefined, 500);
    if (r === undefined) {
      throw new FlameConvergenceError(
        `Chemical equilibrium did not converge at ${t.toFixed(0)} K and ${pressureKPa} kPa. Check the equivalence ratio (0.5–1.5 is supported) and the pressure.`,
      );
    }
    warm = r.state;
    lastKmol = r.kmol;
    return productsEnthalpyKJ(system.species, r.kmol, reactants.sulphurKmol, t) - reactants.enthalpyKJ;
  };
  const t = solveTemperature(f, lowK, 4500);
  f(t);
  return { temperatureK: t, moleFractions: moleFractionsOf(system.species, lastKmol!, reactants.sulphurKmol) };
}

/**
 * Adiabatic flame temperature, K, and the product mole fractions, of a fuel with air at
 * constant pressure. 'complete' assumes no dissociation (lean: CO2, H2O, N2, O2; rich:
 * water–gas-shift equilibrium of CO2, H2O, CO, H2, N2); 'equilibrium' solves the chemical
 * equilibrium of CO2, H2O, N2, O2, CO, H2, OH, H, O, NO, N. Converges for φ 0.5–1.5,
 * reactants 298–800 K, 0.5–20 atm; otherwise a {@link FlameConvergenceError}.
 * Sources: Turns, An Introduction to Combustion, §2.5; NASA RP-1311; GRI-Mech 3.0 thermo data.
 * @example adiabaticFlameTemperature({ kind: 'gas', composition: { CH4: 100 } }, { model: 'equilibrium' }).temperatureK //=> ≈ 2226
 */
export function adiabaticFlameTemperature(fuel: Fuel, opts: FlameOptions): FlameResult {
  validateFuel(fuel);
  const model = opts.model;
  if (model !== 'complete' && model !== 'equilibrium') throw new CalcInputError(`Model must be 'complete' or 'equilibrium' (got ${String(model)}).`, 'model');
  const phi = opts.equivalenceRatio ?? 1;
  const t0 = opts.initialTempK ?? T_REF_K;
  const pressureKPa = opts.pressureKPa ?? STANDARD_PRESSURE_KPA;
  const o2InAir = opts.o2InAir ?? DEFAULT_O2_IN_AIR;
  if (!(phi >= 0.3 && phi <= 2)) throw new CalcInputError(`Equivalence ratio must be between 0.3 and 2 (got ${phi}).`, 'equivalenceRatio');
  if (!(t0 >= 250 && t0 <= 1200)) throw new CalcInputError(`Initial temperature must be between 250 and 1200 K (got ${t0}); give it in kelvin.`, 'initialTempK');
  if (!(pressureKPa >= 10 && pressureKPa <= 5000)) throw new CalcInputError(`Pressure must be between 10 and 5000 kPa absolute (got ${pressureKPa}).`, 'pressureKPa');
  if (!(o2InAir > 0 && o2InAir <= 1)) throw new CalcInputError(`O2 in air must be a mole fraction in (0, 1] (got ${o2InAir}).`, 'o2InAir');

  const reactants = reactantsOf(fuel, phi, t0, o2InAir, opts.estimateGcv);
  const el = reactants.elements;
  if (el.O < el.C) {
    throw new CalcInputError(`At φ = ${phi} there is too little oxygen to gasify the carbon (solid carbon would form): lower the equivalence ratio.`, 'equivalenceRatio');
  }
  const lowK = Math.min(t0, T_REF_K);

  if (model === 'equilibrium') {
    return equilibriumFlame(buildSystem(el, EQUILIBRIUM_SPECIES, reactants.sulphurKmol), reactants, pressureKPa, lowK);
  }
  const o2LeftKmol = (el.O - 2 * el.C - el.H / 2) / 2;
  if (o2LeftKmol >= -1e-12 * (el.O + el.C + el.H)) {
    const species = ['CO2', 'H2O', 'N2', 'O2'];
    const kmol = [el.C, el.H / 2, el.N / 2, Math.max(0, o2LeftKmol)];
    const t = solveTemperature((tk) => productsEnthalpyKJ(species, kmol, reactants.sulphurKmol, tk) - reactants.enthalpyKJ, lowK, 5000);
    return { temperatureK: t, moleFractions: moleFractionsOf(species, kmol, reactants.sulphurKmol) };
  }
  return equilibriumFlame(buildSystem(el, ['CO2', 'H2O', 'N2', 'CO', 'H2'], reactants.sulphurKmol), reactants, pressureKPa, lowK);
}
