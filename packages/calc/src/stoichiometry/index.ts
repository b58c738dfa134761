/**
 * Combustion stoichiometry: air demand and flue-gas volumes per unit of fuel, at the
 * stoichiometric point and at any air ratio or measured O2.
 *
 * Source: REFERENCES.md §1 (any combustion text, e.g. S. R. Turns, An Introduction to
 * Combustion, ch. 2): complete combustion C → CO2, H → H2O, S → SO2, fuel N → N2; dry air
 * of O2 plus inert "atmospheric nitrogen" (mole fraction of O2 `o2InAir`, default 0.21);
 * ideal gas, Nm3 at 0 °C and 101.325 kPa (22.414 m3/kmol). Air humidity is not modelled.
 */
import { CalcInputError } from '../errors';
import { ATOMIC_WEIGHT, MOLAR_VOLUME_NM3_PER_KMOL } from '../constants';
import { fuelElements, type Fuel } from '../fuels';

/** Default mole fraction of O2 in dry air (Turns, ch. 2: 3.76 mol N2 per mol O2). */
export const DEFAULT_O2_IN_AIR = 0.21;

const MOLAR_MASS_O2 = 2 * ATOMIC_WEIGHT.O;
const MOLAR_MASS_N2 = 2 * ATOMIC_WEIGHT.N;

/** Stoichiometric quantities per basis unit of fuel (1 kg of solid/liquid, 1 Nm3 of gas). */
export interface Stoichiometry {
  basis: 'kg' | 'Nm3';
  /** O2 needed for complete combustion, kmol per basis unit. */
  o2DemandKmol: number;
  /** Stoichiometric dry air, Nm3 per basis unit. */
  airNm3: number;
  /** Stoichiometric dry air, kg per basis unit. */
  airKg: number;
  /** Stoichiometric air/fuel mass ratio, kg air per kg fuel. */
  airFuelMassRatio: number;
  /** CO2 in the flue gas, Nm3 per basis unit. */
  co2Nm3: number;
  /** SO2 in the flue gas, Nm3 per basis unit. */
  so2Nm3: number;
  /** N2 (air nitrogen + fuel N) in the flue gas, Nm3 per basis unit. */
  n2Nm3: number;
  /** H2O (from H, fuel moisture and gas H2O) in the flue gas, Nm3 per basis unit. */
  h2oNm3: number;
  /** Stoichiometric dry flue gas, Nm3 per basis unit. */
  flueGasDryNm3: number;
  /** Stoichiometric wet flue gas, Nm3 per basis unit. */
  flueGasWetNm3: number;
  /** Maximum CO2 (stoichiometric, dry), % by volume. */
  co2MaxPercentDry: number;
  /** H2O of the stoichiometric wet flue gas, % by volume. */
  h2oPercentWetStoichiometric: number;
  /** Mass of one basis unit of fuel, kg. */
  fuelMassKg: number;
  /** Mole fraction of O2 in the air used. */
  o2InAir: number;
}

function checkO2InAir(o2InAir: number): void {
  if (!(o2InAir > 0 && o2InAir <= 1)) throw new CalcInputError(`O2 in air must be a mole fraction above 0 and at most 1 (got ${o2InAir}); 0.21 is usual.`, 'o2InAir');
}

/**
 * Stoichiometric air and flue gas per kg (solid/liquid) or Nm3 (gas) of fuel.
 * O2 demand [kmol] = C + H/4 + S − O/2 (atoms, kmol); air = 22.414·O2demand/xO2;
 * dry flue gas = CO2 + SO2 + N2; wet = dry + H2O. Source: REFERENCES.md §1.
 * @example stoichiometry({ kind: 'gas', composition: { CH4: 100 } }).airNm3 //=> 9.524
 */
export function stoichiometry(fuel: Fuel, opts: { o2InAir?: number } = {}): Stoichiometry {
  const o2InAir = opts.o2InAir ?? DEFAULT_O2_IN_AIR;
  checkO2InAir(o2InAir);
  const e = fuelElements(fuel);
  const o2DemandKmol = e.C + e.H / 4 + e.S - e.O / 2;
  if (!(o2DemandKmol > 0)) throw new CalcInputError('The fuel needs no oxygen to burn (its oxygen covers C, H and S): check the analysis.', 'fuel');
  const airKmol = o2DemandKmol / o2InAir;
  const vm = MOLAR_VOLUME_NM3_PER_KMOL;
  const airKg = o2DemandKmol * MOLAR_MASS_O2 + airKmol * (1 - o2InAir) * MOLAR_MASS_N2;
  const co2Nm3 = e.C * vm;
  const so2Nm3 = e.S * vm;
  const n2Nm3 = (e.N / 2 + airKmol * (1 - o2InAir)) * vm;
  const h2oNm3 = (e.H / 2 + e.moistureKmol) * vm;
  const flueGasDryNm3 = co2Nm3 + so2Nm3 + n2Nm3;
  const flueGasWetNm3 = flueGasDryNm3 + h2oNm3;
  return {
    basis: e.basis,
    o2DemandKmol,
    airNm3: airKmol * vm,
    airKg,
    airFuelMassRatio: airKg / e.massKg,
    co2Nm3,
    so2Nm3,
    n2Nm3,
    h2oNm3,
    flueGasDryNm3,
    flueGasWetNm3,
    co2MaxPercentDry: (100 * co2Nm3) / flueGasDryNm3,
    h2oPercentWetStoichiometric: (100 * h2oNm3) / flueGasWetNm3,
    fuelMassKg: e.massKg,
    o2InAir,
  };
}

/** Flue gas per basis unit of fuel at a given air ratio (complete combustion, excess air). */
export interface FlueGasState {
  basis: 'kg' | 'Nm3';
  /** Air ratio λ (actual / stoichiometric air). */
  airRatio: number;
  /** Excess air, % = 100 (λ − 1). */
  excessAirPercent: number;
  /** Dry combustion air, Nm3 per basis unit. */
  airNm3: number;
  /** Dry flue gas, Nm3 per basis unit. */
  flueGasDryNm3: number;
  /** Wet flue gas, Nm3 per basis unit. */
  flueGasWetNm3: number;
  co2Nm3: number;
  so2Nm3: number;
  n2Nm3: number;
  o2Nm3: number;
  h2oNm3: number;
  o2PercentDry: number;
  co2PercentDry: number;
  so2PercentDry: number;
  o2PercentWet: number;
  co2PercentWet: number;
  h2oPercentWet: number;
  /** The stoichiometric quantities this state is built on. */
  stoichiometric: Stoichiometry;
}

/**
 * Flue gas at an air ratio λ, or at the air ratio that gives a measured dry O2. Complete
 * combustion; the excess air passes through unchanged. From O2:
 * `(λ − 1)·air = O2·V0dry/(xO2 − O2)` (fractions) — so `λ = 1 + (V0dry/V0air)·O2/(xO2 − O2)`,
 * and the dry flue gas is exactly `V0dry · xO2/(xO2 − O2)` (the 20.9/(20.9 − O2) dilution).
 * Source: REFERENCES.md §1.
 */
export function flueGasAt(fuel: Fuel, opts: { airRatio?: number; o2PercentDry?: number; o2InAir?: number }): FlueGasState {
  const st = stoichiometry(fuel, { o2InAir: opts.o2InAir });
  const x = st.o2InAir;
  let excessAirNm3: number;
  if (opts.airRatio !== undefined && opts.o2PercentDry !== undefined) {
    throw new CalcInputError('Give either the air ratio or the measured O2, not both.', 'airRatio');
  }
  if (opts.airRatio !== undefined) {
    if (!(opts.airRatio >= 1 && Number.isFinite(opts.airRatio))) {
      throw new CalcInputError(`Air ratio must be at least 1 for complete combustion (got ${opts.airRatio}).`, 'airRatio');
    }
    excessAirNm3 = (opts.airRatio - 1) * st.airNm3;
  } else if (opts.o2PercentDry !== undefined) {
    const o2 = opts.o2PercentDry / 100;
    if (!(o2 >= 0 && o2 < x)) {
      throw new CalcInputError(
        `Measured O2 ${opts.o2PercentDry} % dry must be at least 0 and below the O2 of the air (${(100 * x).toFixed(2)} %).`,
        'o2PercentDry',
      );
    }
    excessAirNm3 = (o2 * st.flueGasDryNm3) / (x - o2);
  } else {
    throw new CalcInputError('Give the air ratio (airRatio) or the measured O2 (o2PercentDry).', 'airRatio');
  }
  const o2Nm3 = x * excessAirNm3;
  const n2Nm3 = st.n2Nm3 + (1 - x) * excessAirNm3;
  const flueGasDryNm3 = st.flueGasDryNm3 + excessAirNm3;
  const flueGasWetNm3 = flueGasDryNm3 + st.h2oNm3;
  const airRatio = 1 + excessAirNm3 / st.airNm3;
  return {
    basis: st.basis,
    airRatio,
    excessAirPercent: 100 * (airRatio - 1),
    airNm3: st.airNm3 + excessAirNm3,
    flueGasDryNm3,
    flueGasWetNm3,
    co2Nm3: st.co2Nm3,
    so2Nm3: st.so2Nm3,
    n2Nm3,
    o2Nm3,
    h2oNm3: st.h2oNm3,
    o2PercentDry: (100 * o2Nm3) / flueGasDryNm3,
    co2PercentDry: (100 * st.co2Nm3) / flueGasDryNm3,
    so2PercentDry: (100 * st.so2Nm3) / flueGasDryNm3,
    o2PercentWet: (100 * o2Nm3) / flueGasWetNm3,
    co2PercentWet: (100 * st.co2Nm3) / flueGasWetNm3,
    h2oPercentWet: (100 * st.h2oNm3) / flueGasWetNm3,
    stoichiometric: st,
  };
}
