import {
  adiabaticFlameTemperature,
  CalcInputError,
  DEFAULT_F_FACTORS,
  type DefaultFFactorFuel,
  fFactors,
  flueGasAt,
  type Fuel,
  type GasComponent,
  heatingValues,
  type HeatingValueSource,
  stoichiometry,
  type UltimateAnalysis,
} from '@flueledger/calc';

import type { FFactorSource, FuelKind, FuelType } from '../../../core/api/fuels-api';
import { kindOfFuelType } from '../../../shared/setup-labels';

/*
 * The fuel editor's live calculation panel: every figure comes from @flueledger/calc (the same
 * code the API uses for the record), with its unit and how it was obtained.
 */

export const gasComponents: readonly GasComponent[] = ['CH4', 'C2H6', 'C3H8', 'C4H10', 'CO', 'H2', 'CO2', 'N2', 'O2', 'H2S', 'H2O'];
export const ultimateKeys: readonly (keyof UltimateAnalysis)[] = ['C', 'H', 'O', 'N', 'S', 'moisture', 'ash'];

export const gasComponentLabels: Record<GasComponent, string> = {
  CH4: 'Methane CH4',
  C2H6: 'Ethane C2H6',
  C3H8: 'Propane C3H8',
  C4H10: 'n-Butane C4H10',
  CO: 'Carbon monoxide CO',
  H2: 'Hydrogen H2',
  CO2: 'Carbon dioxide CO2',
  N2: 'Nitrogen N2',
  O2: 'Oxygen O2',
  H2S: 'Hydrogen sulphide H2S',
  H2O: 'Water vapour H2O',
};

export const ultimateLabels: Record<keyof UltimateAnalysis, string> = {
  C: 'Carbon C',
  H: 'Hydrogen H',
  O: 'Oxygen O',
  N: 'Nitrogen N',
  S: 'Sulphur S',
  moisture: 'Moisture',
  ash: 'Ash',
};

/** Fuel types with a default F-factor row in Method 19 Table 19-2. */
export const method19DefaultOf: Partial<Record<FuelType, DefaultFFactorFuel>> = {
  natural_gas: 'natural-gas',
  propane: 'propane',
  butane: 'butane',
  fuel_oil: 'oil',
  bituminous_coal: 'coal-bituminous',
  anthracite: 'coal-anthracite',
  lignite: 'coal-lignite',
  wood: 'wood',
  wood_bark: 'wood-bark',
};

/** What the editor's form holds: empty fields are null. */
export interface FuelPreviewInput {
  fuelType: FuelType;
  composition: Partial<Record<GasComponent, number | null>>;
  ultimate: Partial<Record<keyof UltimateAnalysis, number | null>>;
  /** Gross calorific value as entered: MJ/Nm3 for a gas, MJ/kg for a solid or liquid; null = not measured. */
  gcv: number | null;
  fFactorSource: FFactorSource;
  /** Flue-gas O2, % dry, at which to show the diluted flue gas. */
  o2PercentDry: number | null;
}

export interface PreviewRow {
  key: string;
  label: string;
  value: number;
  unit: string;
  /** Decimal places to show. */
  digits: number;
  /** How the figure was obtained, in words, with its source. */
  how: string;
}

export type FuelPreview =
  | { state: 'ok'; fuel: Fuel; rows: PreviewRow[] }
  | { state: 'empty'; message: string }
  | { state: 'error'; message: string; field?: string };

function present(value: number | null | undefined): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

/**
 * The calc package's fuel for the form's analysis, or null when no analysis value is entered.
 * Empty gas components are absent (0 mol %); empty ultimate-analysis entries count as 0 %.
 */
export function toCalcFuel(input: Pick<FuelPreviewInput, 'fuelType' | 'composition' | 'ultimate' | 'gcv'>): Fuel | null {
  const kind: FuelKind = kindOfFuelType[input.fuelType];
  if (kind === 'gas') {
    const composition: Partial<Record<GasComponent, number>> = {};
    for (const component of gasComponents) {
      const value = input.composition[component];
      if (present(value)) composition[component] = value;
    }
    if (Object.keys(composition).length === 0) return null;
    return { kind: 'gas', composition, ...(present(input.gcv) ? { gcvMJPerNm3: input.gcv } : {}) };
  }
  if (!ultimateKeys.some((key) => present(input.ultimate[key]))) return null;
  const ultimate = Object.fromEntries(ultimateKeys.map((key) => [key, input.ultimate[key] ?? 0])) as unknown as UltimateAnalysis;
  return { kind, ultimate, ...(present(input.gcv) ? { gcvMJPerKg: input.gcv } : {}) };
}

const STOICHIOMETRY_SOURCE =
  'computed from the analysis: complete combustion, O2 demand = C + H/4 + S − O/2 per kmol, dry air with 21 % O2, 22.414 Nm3/kmol (Turns, An Introduction to Combustion, ch. 2)';

function heatingValueSource(source: HeatingValueSource, kind: FuelKind): string {
  switch (source) {
    case 'given':
      return 'the laboratory value you entered';
    case 'gas-composition-iso6976':
      return 'computed from the composition with the ISO 6976 component heating values (ideal gas, combustion at 25 °C)';
    case 'channiwala-parikh-2002':
      return `estimated from the ${kind === 'liquid' ? 'liquid' : 'solid'}'s ultimate analysis (Channiwala & Parikh 2002 correlation, typically within ±1.5 %); enter the laboratory value when you have it`;
  }
}

/**
 * Every figure of the live panel for the analysis in the form, or the reason there is none.
 * Input problems come back as the calc package's CalcInputError message.
 *
 * @example
 * fuelPreview({ fuelType: 'natural_gas', composition: { CH4: 100 }, ultimate: {}, gcv: null,
 *   fFactorSource: 'computed', o2PercentDry: 3 }).rows[0].value //=> 9.524 (Nm3 air per Nm3)
 */
export function fuelPreview(input: FuelPreviewInput): FuelPreview {
  const fuel = toCalcFuel(input);
  const kind = kindOfFuelType[input.fuelType];
  if (!fuel) {
    return {
      state: 'empty',
      message:
        kind === 'gas'
          ? 'Enter the gas composition (mol %) to see its combustion figures.'
          : 'Enter the ultimate analysis (mass %, as fired) to see its combustion figures.',
    };
  }
  try {
    return { state: 'ok', fuel, rows: previewRows(fuel, input) };
  } catch (error) {
    if (error instanceof CalcInputError) return { state: 'error', message: error.message, field: error.field };
    // A method that does not converge for an unusual fuel must not take the whole page down.
    if (error instanceof Error) return { state: 'error', message: error.message };
    throw error;
  }
}

function previewRows(fuel: Fuel, input: FuelPreviewInput): PreviewRow[] {
  const per = fuel.kind === 'gas' ? 'Nm3' : 'kg';
  const st = stoichiometry(fuel);
  const rows: PreviewRow[] = [
    { key: 'airNm3', label: 'Stoichiometric air', value: st.airNm3, unit: `Nm3 air/${per} fuel`, digits: 3, how: STOICHIOMETRY_SOURCE },
    {
      key: 'airFuelMassRatio',
      label: 'Stoichiometric air/fuel mass ratio',
      value: st.airFuelMassRatio,
      unit: 'kg air/kg fuel',
      digits: 2,
      how: 'the stoichiometric air as mass (O2 and N2 molar masses) over the fuel mass',
    },
    {
      key: 'flueGasDryNm3',
      label: 'Dry flue gas, stoichiometric',
      value: st.flueGasDryNm3,
      unit: `Nm3/${per} fuel`,
      digits: 3,
      how: 'CO2 + SO2 + N2 of complete combustion with stoichiometric air (Turns, An Introduction to Combustion, ch. 2)',
    },
    {
      key: 'flueGasWetNm3',
      label: 'Wet flue gas, stoichiometric',
      value: st.flueGasWetNm3,
      unit: `Nm3/${per} fuel`,
      digits: 3,
      how: 'the dry flue gas plus the water from the fuel hydrogen and moisture (combustion air taken as dry)',
    },
    {
      key: 'co2MaxPercentDry',
      label: 'CO2max',
      value: st.co2MaxPercentDry,
      unit: '% dry',
      digits: 2,
      how: 'CO2 of the stoichiometric dry flue gas; a check for CO2 and O2 analysers: CO2 = CO2max · (21 − O2)/21',
    },
  ];

  if (present(input.o2PercentDry)) {
    const at = flueGasAt(fuel, { o2PercentDry: input.o2PercentDry });
    const where = `at ${input.o2PercentDry} % O2 dry`;
    rows.push(
      {
        key: 'airRatio',
        label: `Air ratio λ ${where}`,
        value: at.airRatio,
        unit: '–',
        digits: 3,
        how: 'λ = 1 + (V0 dry flue gas / V0 air) · O2/(21 − O2), complete combustion (Turns, An Introduction to Combustion, ch. 2)',
      },
      { key: 'excessAirPercent', label: `Excess air ${where}`, value: at.excessAirPercent, unit: '%', digits: 1, how: '100 · (λ − 1)' },
      {
        key: 'flueGasDryAtO2',
        label: `Dry flue gas ${where}`,
        value: at.flueGasDryNm3,
        unit: `Nm3/${per} fuel`,
        digits: 3,
        how: 'the stoichiometric dry flue gas diluted by the excess air: V0 · 21/(21 − O2)',
      },
      {
        key: 'flueGasWetAtO2',
        label: `Wet flue gas ${where}`,
        value: at.flueGasWetNm3,
        unit: `Nm3/${per} fuel`,
        digits: 3,
        how: 'the dry flue gas at this O2 plus the combustion water',
      },
    );
  }

  // Solids and liquids without a laboratory GCV use the correlation, and say so.
  const hv = heatingValues(fuel, { estimate: true });
  const hvUnit = fuel.kind === 'gas' ? 'MJ/Nm3' : 'MJ/kg';
  rows.push(
    { key: 'gcv', label: 'Gross calorific value (GCV, HHV)', value: hv.hhvMJ, unit: hvUnit, digits: 2, how: heatingValueSource(hv.source, kindOfFuelType[input.fuelType]) },
    {
      key: 'ncv',
      label: 'Net calorific value (NCV, LHV)',
      value: hv.lhvMJ,
      unit: hvUnit,
      digits: 2,
      how: 'the GCV less the latent heat of the water formed and of the fuel moisture (44.0 kJ/mol at 25 °C)',
    },
  );

  rows.push(...fFactorRows(fuel, input));

  const flame = adiabaticFlameTemperature(fuel, { model: 'complete', estimateGcv: true });
  rows.push({
    key: 'flameComplete',
    label: 'Adiabatic flame temperature, complete combustion',
    value: flame.temperatureK,
    unit: 'K',
    digits: 0,
    how: 'energy balance with stoichiometric air (φ = 1), reactants at 25 °C and 1 atm, no dissociation; GRI-Mech 3.0 thermodynamic data (Turns §2.5). An upper bound',
  });
  return rows;
}

function fFactorRows(fuel: Fuel, input: FuelPreviewInput): PreviewRow[] {
  if (input.fFactorSource === 'method19_default') {
    const key = method19DefaultOf[input.fuelType];
    if (!key) {
      throw new CalcInputError(
        'Method 19 Table 19-2 has no default F-factors for this fuel type: choose “Computed from the analysis”.',
        'fFactorSource',
      );
    }
    const row = DEFAULT_F_FACTORS[key];
    const how = `Method 19 Table 19-2 default for ${row.label.toLowerCase()} (${row.source})`;
    const rows: PreviewRow[] = [
      { key: 'fd', label: 'Fd, dry F-factor', value: row.fdDscfPerMMBtu, unit: 'dscf/MMBtu', digits: 0, how },
    ];
    if (row.fwWscfPerMMBtu !== undefined) {
      rows.push({ key: 'fw', label: 'Fw, wet F-factor', value: row.fwWscfPerMMBtu, unit: 'wscf/MMBtu', digits: 0, how });
    }
    rows.push({ key: 'fc', label: 'Fc, carbon F-factor', value: row.fcScfPerMMBtu, unit: 'scf CO2/MMBtu', digits: 0, how });
    return rows;
  }
  const f = fFactors(fuel, { estimateGcv: true });
  const gcvNote = f.gcvSource === 'channiwala-parikh-2002' ? ', with the estimated GCV' : '';
  const method = 'computed from the analysis (EPA Method 19 §12.3.2';
  return [
    { key: 'fd', label: 'Fd, dry F-factor', value: f.fdDscfPerMMBtu, unit: 'dscf/MMBtu', digits: 0, how: `${method}, eq. 19-13${gcvNote})` },
    { key: 'fdSi', label: 'Fd, dry F-factor (SI)', value: f.fdNm3PerGJ, unit: 'Nm3/GJ', digits: 1, how: 'Fd converted to 0 °C, 101.325 kPa and GJ' },
    { key: 'fw', label: 'Fw, wet F-factor', value: f.fwWscfPerMMBtu, unit: 'wscf/MMBtu', digits: 0, how: `${method}, eq. 19-14${gcvNote})` },
    { key: 'fc', label: 'Fc, carbon F-factor', value: f.fcScfPerMMBtu, unit: 'scf CO2/MMBtu', digits: 0, how: `${method}, eq. 19-15${gcvNote})` },
  ];
}

export interface EquilibriumFlame {
  temperatureK: number;
  how: string;
}

/** The heavier equilibrium flame temperature, or the reason it could not be found. */
export function equilibriumFlame(fuel: Fuel): EquilibriumFlame | { error: string } {
  try {
    const result = adiabaticFlameTemperature(fuel, { model: 'equilibrium', estimateGcv: true });
    return {
      temperatureK: result.temperatureK,
      how: 'chemical equilibrium of CO2, H2O, N2, O2, CO, H2, OH, H, O, NO, N (Gibbs minimisation, NASA RP-1311 form), stoichiometric air, reactants at 25 °C, 1 atm; GRI-Mech 3.0 data',
    };
  } catch (error) {
    if (error instanceof Error) return { error: error.message };
    throw error;
  }
}
