import { LIMIT_UNITS_WITHOUT_REFERENCE_O2 } from '@flueledger/calc';

import type { FFactorSource, FuelKind, FuelType } from '../core/api/fuels-api';
import type { AveragingPeriod, LimitUnit, Pollutant } from '../core/api/permits-api';
import type { Basis, ChannelParameter, ChannelUnit, Conditions, Regime, UnitType } from '../core/api/sites-api';
import { formatNumber } from './format-number';

/*
 * How the set-up vocabulary reads on screen: the trade's own terms (emission limit value,
 * reference O2, dry basis, averaging period) and plain words for the rest. Keys are the API's.
 */

export const regimeLabels: Record<Regime, string> = {
  eu_ied: 'EU Industrial Emissions Directive',
  us_epa: 'US EPA (40 CFR 60 / 75)',
  other: 'Other',
};

export const unitTypeLabels: Record<UnitType, string> = {
  boiler: 'Boiler',
  process_heater: 'Process heater or furnace',
  kiln: 'Kiln',
  gas_turbine: 'Gas turbine',
  engine: 'Engine',
  incinerator: 'Incinerator',
  other: 'Other',
};

export const parameterLabels: Record<ChannelParameter, string> = {
  NOx: 'NOx (as NO2)',
  NO: 'NO',
  NO2: 'NO2',
  SO2: 'SO2',
  CO: 'CO',
  dust: 'Dust',
  HCl: 'HCl',
  HF: 'HF',
  TOC: 'TOC (as C)',
  NH3: 'NH3',
  Hg: 'Hg',
  CO2: 'CO2',
  O2: 'O2',
  H2O: 'H2O (moisture)',
  flow: 'Flue-gas flow',
  temperature: 'Temperature',
  pressure: 'Pressure',
  load: 'Load',
  fuel_flow: 'Fuel flow',
};

/** Units each parameter may be reported in (mirrors the API's UNITS_BY_PARAMETER). */
export const unitsByParameter: Record<ChannelParameter, readonly ChannelUnit[]> = {
  NOx: ['mg/Nm3', 'ppm', 'ug/Nm3'],
  NO: ['mg/Nm3', 'ppm', 'ug/Nm3'],
  NO2: ['mg/Nm3', 'ppm', 'ug/Nm3'],
  SO2: ['mg/Nm3', 'ppm', 'ug/Nm3'],
  CO: ['mg/Nm3', 'ppm', 'ug/Nm3'],
  HCl: ['mg/Nm3', 'ppm', 'ug/Nm3'],
  HF: ['mg/Nm3', 'ppm', 'ug/Nm3'],
  TOC: ['mg/Nm3', 'ppm', 'ug/Nm3'],
  NH3: ['mg/Nm3', 'ppm', 'ug/Nm3'],
  dust: ['mg/Nm3', 'ug/Nm3'],
  Hg: ['mg/Nm3', 'ug/Nm3'],
  CO2: ['%'],
  O2: ['%'],
  H2O: ['%'],
  flow: ['Nm3/h', 'm3/h', 'scfh'],
  temperature: ['degC', 'degF', 'K'],
  pressure: ['kPa', 'hPa'],
  load: ['MW', '%'],
  fuel_flow: ['kg/h', 't/h', 'Nm3/h', 'm3/h'],
};

export const channelParameters = Object.keys(parameterLabels) as ChannelParameter[];

/** Units as people write them (the API keeps plain ASCII). */
export function unitLabel(unit: ChannelUnit | LimitUnit | string): string {
  switch (unit) {
    case 'degC':
      return '°C';
    case 'degF':
      return '°F';
    case 'ug/Nm3':
      return 'µg/Nm3';
    default:
      return unit;
  }
}

/** An analyser's range as people read it ("0 – 25 %"), or '' when it is not known. */
export function analyserRangeLabel(channel: { unit: ChannelUnit; rangeMin: number | null; rangeMax: number | null }): string {
  return channel.rangeMin !== null && channel.rangeMax !== null ? `${formatNumber(channel.rangeMin)} – ${formatNumber(channel.rangeMax)} ${unitLabel(channel.unit)}` : '';
}

export const basisLabels: Record<Basis, string> = { dry: 'Dry basis', wet: 'Wet basis' };
export const conditionsLabels: Record<Conditions, string> = {
  standard: 'Standard conditions',
  actual: 'Actual conditions',
};
export const intervalMinutesOptions = [1, 5, 10, 15, 30, 60] as const;

export const fuelTypeLabels: Record<FuelType, string> = {
  natural_gas: 'Natural gas',
  propane: 'Propane',
  butane: 'Butane',
  other_gas: 'Other gas',
  fuel_oil: 'Fuel oil',
  other_liquid: 'Other liquid',
  bituminous_coal: 'Bituminous coal',
  anthracite: 'Anthracite',
  lignite: 'Lignite',
  wood: 'Wood / wood residue',
  wood_bark: 'Wood bark',
  other_solid: 'Other solid',
};

/** The physical state each fuel type is fired in (mirrors the API's KIND_OF_FUEL_TYPE). */
export const kindOfFuelType: Record<FuelType, FuelKind> = {
  natural_gas: 'gas',
  propane: 'gas',
  butane: 'gas',
  other_gas: 'gas',
  fuel_oil: 'liquid',
  other_liquid: 'liquid',
  bituminous_coal: 'solid',
  anthracite: 'solid',
  lignite: 'solid',
  wood: 'solid',
  wood_bark: 'solid',
  other_solid: 'solid',
};

export const fuelKindLabels: Record<FuelKind, string> = { gas: 'Gas', liquid: 'Liquid', solid: 'Solid' };

export const fFactorSourceLabels: Record<FFactorSource, string> = {
  computed: 'Computed from the analysis (EPA Method 19)',
  method19_default: 'Method 19 Table 19-2 default',
};

export const pollutants: readonly Pollutant[] = ['NOx', 'NO', 'NO2', 'SO2', 'CO', 'dust', 'HCl', 'HF', 'TOC', 'NH3', 'Hg', 'CO2'];
export const limitUnits: readonly LimitUnit[] = ['mg/Nm3', 'ppm', 'ug/Nm3', 'lb/MMBtu', 'ng/J', 'kg/h', 't/yr'];
/** Limits on heat input or mass carry no reference O2 (the list the limit's sentence follows). */
export const limitUnitsWithoutO2: readonly LimitUnit[] = LIMIT_UNITS_WITHOUT_REFERENCE_O2;

export const periodLabels: Record<AveragingPeriod, string> = {
  half_hour: 'Half-hourly average',
  hour: 'Hourly average',
  day: 'Daily average',
  month: 'Monthly average',
  year: 'Annual average',
  rolling_days: 'Rolling average over days',
  rolling_hours: 'Rolling average over hours',
  block_hours: 'Block average over hours',
};
export const periodsWithLength: readonly AveragingPeriod[] = ['rolling_days', 'rolling_hours', 'block_hours'];

/** "2 items" / "1 item". */
export function plural(count: number, singular: string, pluralForm = `${singular}s`): string {
  return `${count} ${count === 1 ? singular : pluralForm}`;
}
