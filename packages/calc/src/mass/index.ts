/**
 * Mass emissions and heat input: 40 CFR Part 75 Appendix F equations, diluent caps, mass
 * rate from measured flow or from fuel flow × flue-gas volume, and period totals.
 *
 * Sources: 40 CFR Part 75 App. F §2.1–2.2 (SO2 mass rate, K = 1.660e-7 [pub]), §4 (CO2 eq. F-11:
 * 5.7e-7 [memory; derived 44.01/385.3/2000/100 = 5.71e-7]), §5 (heat input eqs. F-15 (CO2) and
 * F-17 (O2) [pub form, numbering from memory]), diluent cap: boilers 5.0 % CO2 / 14.0 % O2
 * [pub: App. F §2, "a minimum concentration of 5.0 percent CO2 and a maximum concentration of
 * 14.0 percent O2 may be substituted … at boilers", https://www.ecfr.gov/current/title-40/part-75/appendix-Appendix%20F%20to%20Part%2075],
 * turbines 1.0 % CO2 / 19.0 % O2 [memory] (the NOx section §3.3.4.1 of App. F was not found in a
 * readable public copy); REFERENCES.md §3.
 */
import { CalcInputError } from '../errors';
import type { Species } from '../constants';
import { ppmToLbPerScf } from '../emission-rates';
import { flueGasAt } from '../stoichiometry';
import type { Fuel } from '../fuels';

/** Unit type for the Part 75 diluent cap. */
export type DiluentCapUnitType = 'boiler' | 'turbine';

/** Diluent cap values of 40 CFR 75 App. F (§2 for SO2, §3.3.4.1 for NOx): boilers [pub, App. F §2], turbines [memory]. */
export const DILUENT_CAP: Readonly<Record<DiluentCapUnitType, { co2MinPercent: number; o2MaxPercent: number }>> = {
  boiler: { co2MinPercent: 5.0, o2MaxPercent: 14.0 },
  turbine: { co2MinPercent: 1.0, o2MaxPercent: 19.0 },
};

/**
 * Apply the Part 75 diluent cap: in an hour with CO2 below (or O2 above) the cap, the cap
 * value may be used instead, so that low-load hours do not inflate lb/MMBtu.
 */
export function applyDiluentCap(opts: { diluent: 'O2' | 'CO2'; percent: number; unitType: DiluentCapUnitType }): { percent: number; capped: boolean } {
  const cap = DILUENT_CAP[opts.unitType];
  if (cap === undefined) throw new CalcInputError(`Unit type must be 'boiler' or 'turbine' (got ${String(opts.unitType)}).`, 'unitType');
  if (opts.diluent === 'O2') return opts.percent > cap.o2MaxPercent ? { percent: cap.o2MaxPercent, capped: true } : { percent: opts.percent, capped: false };
  return opts.percent < cap.co2MinPercent ? { percent: cap.co2MinPercent, capped: true } : { percent: opts.percent, capped: false };
}

function positive(name: string, value: number, unit: string): void {
  if (!(value >= 0 && Number.isFinite(value))) throw new CalcInputError(`${name} must be at least 0 ${unit} (got ${value}).`, name);
}

function checkMoisture(moisturePercent: number): void {
  if (!(moisturePercent >= 0 && moisturePercent < 100)) {
    throw new CalcInputError(`Stack moisture must be at least 0 and below 100 % (got ${moisturePercent}).`, 'moisturePercent');
  }
}

/**
 * Heat input from stack flow and O2, mmBtu/h, 40 CFR 75 App. F eq. F-17:
 * `HI = Qw · (1/Fd) · ((100 − %H2O)/100) · ((20.9 − %O2d)/20.9)`.
 * With `diluentCap`, an O2 above the cap is replaced by the cap value.
 */
export function heatInputMMBtuPerHour(opts: {
  wetFlowScfh: number;
  moisturePercent: number;
  o2PercentDry: number;
  fdDscfPerMMBtu: number;
  diluentCap?: DiluentCapUnitType;
}): number {
  positive('wetFlowScfh', opts.wetFlowScfh, 'scfh');
  checkMoisture(opts.moisturePercent);
  if (!(opts.fdDscfPerMMBtu > 0)) throw new CalcInputError(`Fd must be above 0 dscf/MMBtu (got ${opts.fdDscfPerMMBtu}).`, 'fdDscfPerMMBtu');
  let o2 = opts.o2PercentDry;
  if (opts.diluentCap) o2 = applyDiluentCap({ diluent: 'O2', percent: o2, unitType: opts.diluentCap }).percent;
  if (!(o2 >= 0 && o2 < 20.9)) throw new CalcInputError(`O2 must be at least 0 and below 20.9 % dry (got ${o2}).`, 'o2PercentDry');
  return (opts.wetFlowScfh / opts.fdDscfPerMMBtu) * ((100 - opts.moisturePercent) / 100) * ((20.9 - o2) / 20.9);
}

/**
 * Heat input from stack flow and wet CO2, mmBtu/h, 40 CFR 75 App. F eq. F-15 [memory] (§5 of App. F
 * not found in a readable public copy; the form follows from Fc = scf CO2 per mmBtu):
 * `HI = Qw · (1/Fc) · %CO2w/100`. With `diluentCap`, a CO2 below the cap is replaced by it.
 */
export function heatInputFromCo2MMBtuPerHour(opts: { wetFlowScfh: number; co2PercentWet: number; fcScfPerMMBtu: number; diluentCap?: DiluentCapUnitType }): number {
  positive('wetFlowScfh', opts.wetFlowScfh, 'scfh');
  if (!(opts.fcScfPerMMBtu > 0)) throw new CalcInputError(`Fc must be above 0 scf/MMBtu (got ${opts.fcScfPerMMBtu}).`, 'fcScfPerMMBtu');
  let co2 = opts.co2PercentWet;
  if (opts.diluentCap) co2 = applyDiluentCap({ diluent: 'CO2', percent: co2, unitType: opts.diluentCap }).percent;
  positive('co2PercentWet', co2, '%');
  return (opts.wetFlowScfh / opts.fcScfPerMMBtu) * (co2 / 100);
}

/**
 * Pollutant mass rate from concentration and wet stack flow, lb/h, 40 CFR 75 App. F §2.1–2.2
 * (SO2; the same form serves other species): wet concentration (eq. F-1) `E = K·C·Qw`; dry concentration (eq. F-2)
 * `E = K·C·Qw·(100 − %H2O)/100`, K = lb/scf per ppm (SO2 1.660e-7).
 */
export function pollutantMassRateLbPerHour(opts: {
  ppm: number;
  species: Species;
  concentrationBasis: 'wet' | 'dry';
  wetFlowScfh: number;
  moisturePercent?: number;
}): number {
  positive('ppm', opts.ppm, 'ppm');
  positive('wetFlowScfh', opts.wetFlowScfh, 'scfh');
  const lbPerScf = ppmToLbPerScf(opts.ppm, opts.species);
  if (opts.concentrationBasis === 'wet') return lbPerScf * opts.wetFlowScfh;
  if (opts.moisturePercent === undefined) throw new CalcInputError('A dry concentration with a wet flow needs the stack moisture (moisturePercent).', 'moisturePercent');
  checkMoisture(opts.moisturePercent);
  return (lbPerScf * opts.wetFlowScfh * (100 - opts.moisturePercent)) / 100;
}

/**
 * CO2 mass rate, short tons/h, 40 CFR 75 App. F eq. F-11: `E = 5.7e-7 · %CO2w · Qw` [memory;
 * derived 44.01 lb/lbmol ÷ 385.3 scf/lbmol ÷ 2000 lb/ton ÷ 100 = 5.71e-7].
 */
export function co2MassRateTonsPerHour(opts: { co2PercentWet: number; wetFlowScfh: number }): number {
  positive('co2PercentWet', opts.co2PercentWet, '%');
  positive('wetFlowScfh', opts.wetFlowScfh, 'scfh');
  return 5.7e-7 * opts.co2PercentWet * opts.wetFlowScfh;
}

/**
 * Mass rate from an emission rate and the heat input, lb/h: `E = ER · HI`
 * (40 CFR 75 App. F §8, NOx mass from lb/mmBtu × mmBtu/h).
 */
export function massRateFromHeatInputLbPerHour(opts: { emissionRateLbPerMMBtu: number; heatInputMMBtuPerHour: number }): number {
  positive('emissionRateLbPerMMBtu', opts.emissionRateLbPerMMBtu, 'lb/MMBtu');
  positive('heatInputMMBtuPerHour', opts.heatInputMMBtuPerHour, 'MMBtu/h');
  return opts.emissionRateLbPerMMBtu * opts.heatInputMMBtuPerHour;
}

/** Mass rate from a measured flue-gas flow: concentration and flow on the same (or reconciled) basis. */
export interface MassRateFromFlow {
  from: 'flow';
  /** Concentration, mg/Nm3 (0 °C, 101.325 kPa) at the measured O2 (not O2-corrected). */
  concentrationMgPerNm3: number;
  concentrationBasis: 'dry' | 'wet';
  /** Flue-gas flow, Nm3/h. */
  flowNm3PerHour: number;
  flowBasis: 'dry' | 'wet';
  /** Flue-gas moisture, % by volume — needed when the two bases differ. */
  moisturePercent?: number;
}

/** Mass rate from the fuel flow and the flue-gas volume per unit of fuel at a stated O2. */
export interface MassRateFromFuel {
  from: 'fuel';
  fuel: Fuel;
  /** Fuel flow, kg/h for solid/liquid fuels, Nm3/h for gases. */
  fuelFlowPerHour: number;
  /** Dry concentration, mg/Nm3, stated at `o2PercentDry`. */
  concentrationMgPerNm3Dry: number;
  /** The dry O2 the concentration is stated at (measured, or the reference O2 of a corrected value), %. */
  o2PercentDry: number;
  /** O2 mole fraction of the air. Default 0.21. */
  o2InAir?: number;
}

/**
 * Pollutant mass rate, kg/h: from a measured flow (`C·Q/10⁶`), or from the fuel flow times
 * the dry flue gas per unit of fuel at the O2 the concentration is stated at
 * (`C · fuelFlow · V_dry(O2) / 10⁶`, V from {@link flueGasAt}). The fuel route is the EU
 * practice for plants without a flow monitor (e.g. EN ISO 16911 alternatives; REFERENCES.md §1).
 */
export function massRateKgPerHour(input: MassRateFromFlow | MassRateFromFuel): number {
  if (input.from === 'flow') {
    positive('concentrationMgPerNm3', input.concentrationMgPerNm3, 'mg/Nm3');
    positive('flowNm3PerHour', input.flowNm3PerHour, 'Nm3/h');
    let flow = input.flowNm3PerHour;
    if (input.concentrationBasis !== input.flowBasis) {
      if (input.moisturePercent === undefined) throw new CalcInputError('Concentration and flow on different bases need the flue-gas moisture.', 'moisturePercent');
      checkMoisture(input.moisturePercent);
      const dryFraction = 1 - input.moisturePercent / 100;
      flow = input.flowBasis === 'wet' ? flow * dryFraction : flow / dryFraction;
    }
    return (input.concentrationMgPerNm3 * flow) / 1e6;
  }
  if (input.from !== 'fuel') throw new CalcInputError("Mass rate input must say from: 'flow' or from: 'fuel'.", 'from');
  positive('concentrationMgPerNm3Dry', input.concentrationMgPerNm3Dry, 'mg/Nm3');
  positive('fuelFlowPerHour', input.fuelFlowPerHour, 'per hour');
  const gas = flueGasAt(input.fuel, { o2PercentDry: input.o2PercentDry, o2InAir: input.o2InAir });
  return (input.concentrationMgPerNm3Dry * gas.flueGasDryNm3 * input.fuelFlowPerHour) / 1e6;
}

/** A period total built from hourly mass rates. */
export interface MassTotal {
  /** Total mass in the requested unit. */
  total: number;
  /** Operating hours that carried a value. */
  hoursCounted: number;
  /** Values that were NaN (missing) and were left out — substitute them before totalling for a regulatory report. */
  valuesMissing: number;
}

function sumRateTimesHours(rates: ArrayLike<number>, hours: ArrayLike<number> | number | undefined): { sum: number; hoursCounted: number; valuesMissing: number } {
  const n = rates.length;
  if (typeof hours !== 'number' && hours !== undefined && hours.length !== n) {
    throw new CalcInputError(`operatingHours has ${hours.length} values but the rates have ${n}.`, 'operatingHours');
  }
  let sum = 0;
  let hoursCounted = 0;
  let valuesMissing = 0;
  for (let i = 0; i < n; i++) {
    const rate = rates[i]!;
    const t = hours === undefined ? 1 : typeof hours === 'number' ? hours : hours[i]!;
    if (!(t >= 0 && t <= 1)) throw new CalcInputError(`Operating time of hour ${i} must be between 0 and 1 h (got ${t}).`, 'operatingHours');
    if (Number.isNaN(rate)) {
      valuesMissing++;
      continue;
    }
    if (rate < 0) throw new CalcInputError(`Mass rate of hour ${i} is negative (${rate}).`, 'rates');
    sum += rate * t;
    hoursCounted += t;
  }
  return { sum, hoursCounted, valuesMissing };
}

/**
 * Annual (or any period's) mass in metric tonnes from hourly mass rates in kg/h:
 * `Σ(kg/h × operating hours)/1000`. `operatingHours` is the operating time of each hour
 * (0–1 h), default 1. NaN rates are left out and counted in `valuesMissing`.
 */
export function tonnesFromHourlyKgPerHour(hourlyKgPerHour: ArrayLike<number>, operatingHours?: ArrayLike<number> | number): MassTotal {
  const r = sumRateTimesHours(hourlyKgPerHour, operatingHours);
  return { total: r.sum / 1000, hoursCounted: r.hoursCounted, valuesMissing: r.valuesMissing };
}

/**
 * Quarterly or annual mass in short tons from hourly lb/h, 40 CFR 75 App. F §3.5/§8:
 * `Σ(lb/h × operating hours)/2000` [pub form].
 */
export function shortTonsFromHourlyLbPerHour(hourlyLbPerHour: ArrayLike<number>, operatingHours?: ArrayLike<number> | number): MassTotal {
  const r = sumRateTimesHours(hourlyLbPerHour, operatingHours);
  return { total: r.sum / 2000, hoursCounted: r.hoursCounted, valuesMissing: r.valuesMissing };
}
