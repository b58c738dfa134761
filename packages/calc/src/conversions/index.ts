/**
 * Per-reading concentration conversions: ppm ↔ mg/Nm3, wet ↔ dry, actual ↔ standard
 * conditions, and the correction to a reference O2 — each with a series form over
 * Float64Array that allocates nothing per element and lets NaN (a missing reading) through.
 *
 * Sources: REFERENCES.md §4 — ideal-gas molar volume (CODATA R), IED 2010/75/EU Annex V
 * Part 1 (273.15 K, 101.3 kPa, dry) and Annex VI Part 7 (O2 correction formula), 40 CFR 60
 * App. A Method 19 (20.9 % ambient O2).
 */
import { CalcInputError } from '../errors';
import {
  GAS_CONSTANT_J_PER_MOL_K,
  MOLAR_MASS_G_PER_MOL,
  NORMAL_TEMP_K,
  STANDARD_PRESSURE_KPA,
  type AmbientO2Percent,
  type Species,
} from '../constants';


/** A series input: a Float64Array (fastest), any numeric array, or one number applied to every reading. */
export type SeriesInput = ArrayLike<number> | number;

function molarMassOf(species: Species): number {
  const molarMassGPerMol = MOLAR_MASS_G_PER_MOL[species];
  if (molarMassGPerMol === undefined) {
    throw new CalcInputError(
      `Unknown species "${String(species)}". Use one of: ${Object.keys(MOLAR_MASS_G_PER_MOL).join(', ')}.`,
      'species',
    );
  }
  return molarMassGPerMol;
}

function molarVolumeM3PerKmol(referenceTempK: number, referencePressureKPa: number): number {
  if (!(referenceTempK > 0)) throw new CalcInputError(`Reference temperature must be above 0 K (got ${referenceTempK}).`, 'referenceTempK');
  if (!(referencePressureKPa > 0)) {
    throw new CalcInputError(`Reference pressure must be above 0 kPa (got ${referencePressureKPa}).`, 'referencePressureKPa');
  }
  return (GAS_CONSTANT_J_PER_MOL_K * referenceTempK) / referencePressureKPa;
}

/** Options of the ppm ↔ mg/m3 conversions. */
export interface ReferenceStateOptions {
  /** Temperature of the reference state, K. Default 273.15 K (IED Annex V Part 1; "N" in Nm3). */
  referenceTempK?: number;
  /** Pressure of the reference state, kPa. Default 101.325 kPa. */
  referencePressureKPa?: number;
}

/**
 * mg/m3 per ppm of a species at the reference state: M / Vm, with Vm = R·T/p (ideal gas).
 * At 273.15 K, 101.325 kPa Vm = 22.414 L/mol (REFERENCES.md §4).
 */
export function mgPerNm3PerPpm(species: Species, opts: ReferenceStateOptions = {}): number {
  return molarMassOf(species) / molarVolumeM3PerKmol(opts.referenceTempK ?? NORMAL_TEMP_K, opts.referencePressureKPa ?? STANDARD_PRESSURE_KPA);
}

/**
 * ppm (µmol/mol) → mg/Nm3: `mg/Nm3 = ppm · M / Vm`, Vm = 22.414 L/mol at 0 °C, 101.325 kPa
 * (ideal gas, CODATA R). NOx is expressed as NO2 (M = 46.0055 g/mol).
 * Source: REFERENCES.md §4; IED Annex V Part 1 reference conditions.
 * @example ppmToMgPerNm3(200, 'NO2') //=> 410.5
 */
export function ppmToMgPerNm3(ppm: number, species: Species, opts?: ReferenceStateOptions): number {
  return ppm * mgPerNm3PerPpm(species, opts);
}

/** mg/Nm3 → ppm (µmol/mol), the inverse of {@link ppmToMgPerNm3}. NOx as NO2. Source: REFERENCES.md §4. */
export function mgPerNm3ToPpm(mgPerNm3: number, species: Species, opts?: ReferenceStateOptions): number {
  return mgPerNm3 / mgPerNm3PerPpm(species, opts);
}

function checkMoisturePercent(moisturePercent: number): void {
  if (!(moisturePercent >= 0 && moisturePercent < 100)) {
    throw new CalcInputError(`Moisture must be at least 0 % and below 100 % by volume (got ${moisturePercent}).`, 'moisturePercent');
  }
}

/**
 * Wet-basis value → dry basis: `C_dry = C_wet / (1 − H2O%/100)`. Works for concentrations
 * and for gas percentages (e.g. O2). Source: REFERENCES.md §4; 40 CFR 60 App. A Method 4.
 * @example wetToDry(90, 10) //=> 100
 */
export function wetToDry(value: number, moisturePercent: number): number {
  checkMoisturePercent(moisturePercent);
  return value / (1 - moisturePercent / 100);
}

/** Dry-basis value → wet basis: `C_wet = C_dry · (1 − H2O%/100)`. Source: REFERENCES.md §4. */
export function dryToWet(value: number, moisturePercent: number): number {
  checkMoisturePercent(moisturePercent);
  return value * (1 - moisturePercent / 100);
}

/** Options of {@link toStandardConditions}. */
export interface ActualConditions {
  /** Gas temperature where the concentration was measured, K. */
  tempK: number;
  /** Absolute gas pressure where it was measured, kPa. */
  pressureKPa: number;
  /** Standard temperature, K. Default 273.15 K (IED Annex V Part 1). Use 293.15 K for US "standard" (Method 19). */
  referenceTempK?: number;
  /** Standard pressure, kPa. Default 101.325 kPa. */
  referencePressureKPa?: number;
}

/**
 * A mass concentration at actual conditions (mg/m3 at T, p) → at standard conditions:
 * multiply by `(T/T_ref)·(p_ref/p)` (ideal gas). Source: REFERENCES.md §4.
 * @example toStandardConditions(100, { tempK: 546.3, pressureKPa: 101.325 }) //=> 200
 */
export function toStandardConditions(value: number, opts: ActualConditions): number {
  const { tempK, pressureKPa } = opts;
  const referenceTempK = opts.referenceTempK ?? NORMAL_TEMP_K;
  const referencePressureKPa = opts.referencePressureKPa ?? STANDARD_PRESSURE_KPA;
  if (!(tempK > 0)) throw new CalcInputError(`Gas temperature must be above 0 K (got ${tempK}); give it in kelvin.`, 'tempK');
  if (!(pressureKPa > 0)) throw new CalcInputError(`Gas pressure must be above 0 kPa absolute (got ${pressureKPa}).`, 'pressureKPa');
  molarVolumeM3PerKmol(referenceTempK, referencePressureKPa);
  return value * (tempK / referenceTempK) * (referencePressureKPa / pressureKPa);
}

/** Options of the oxygen correction. */
export interface O2CorrectionOptions {
  /** O2 of ambient air, % dry: 21 (EU, IED Annex VI Part 7) or 20.9 (US, 40 CFR 60). Default 21. */
  ambientO2Percent?: AmbientO2Percent;
  /**
   * Correct only when the measured O2 is above the reference O2; otherwise return the value
   * unchanged (IED Annex VI Part 7 for some incinerator cases [memory]).
   */
  onlyWhenAbove?: boolean;
}

function checkAmbient(ambientO2Percent: number): void {
  if (ambientO2Percent !== 21 && ambientO2Percent !== 20.9) {
    throw new CalcInputError(`Ambient O2 must be 21 (EU) or 20.9 (US) % (got ${ambientO2Percent}).`, 'ambientO2Percent');
  }
}

function checkReferenceO2(referenceO2Percent: number, ambientO2Percent: number): void {
  if (!(referenceO2Percent >= 0 && referenceO2Percent < ambientO2Percent)) {
    throw new CalcInputError(
      `Reference O2 must be at least 0 % and below the ambient ${ambientO2Percent} % (got ${referenceO2Percent}).`,
      'referenceO2Percent',
    );
  }
}

/**
 * Correct a dry concentration measured at `measuredO2Percent` (dry) to the reference O2:
 * `E_ref = E_meas · (O2amb − O2ref)/(O2amb − O2meas)`, O2amb 21 (IED Annex VI Part 7) or 20.9
 * (40 CFR 60). Throws {@link CalcInputError} when the measured O2 is at or above ambient
 * (no combustion gas: the correction is undefined).
 * @example correctToReferenceO2(150, 8, 3) //=> 207.69
 */
export function correctToReferenceO2(
  value: number,
  measuredO2Percent: number,
  referenceO2Percent: number,
  opts: O2CorrectionOptions = {},
): number {
  const ambientO2Percent = opts.ambientO2Percent ?? 21;
  checkAmbient(ambientO2Percent);
  checkReferenceO2(referenceO2Percent, ambientO2Percent);
  if (Number.isNaN(measuredO2Percent)) return Number.NaN;
  if (!(measuredO2Percent >= 0 && measuredO2Percent < ambientO2Percent)) {
    throw new CalcInputError(
      `Measured O2 ${measuredO2Percent} % must be at least 0 % and below the ambient ${ambientO2Percent} %: at ambient O2 there is no flue gas to correct.`,
      'measuredO2Percent',
    );
  }
  if (opts.onlyWhenAbove && measuredO2Percent <= referenceO2Percent) return value;
  return (value * (ambientO2Percent - referenceO2Percent)) / (ambientO2Percent - measuredO2Percent);
}

// ---------------------------------------------------------------------------------------------
// Series forms. Each takes an optional `out` (may be the input itself, for in-place work),
// returns it, allocates only when `out` is omitted, and passes NaN through.
// ---------------------------------------------------------------------------------------------

function sharesMemory(a: Float64Array, b: ArrayLike<number>): boolean {
  return a === b || (ArrayBuffer.isView(b) && b.buffer === a.buffer);
}

function outFor(length: number, out: Float64Array | undefined): Float64Array {
  if (out === undefined) return new Float64Array(length);
  if (out.length < length) throw new CalcInputError(`Output array is shorter (${out.length}) than the input (${length}).`, 'out');
  return out;
}

function checkSameLength(name: string, input: SeriesInput, length: number): void {
  if (typeof input !== 'number' && input.length !== length) {
    throw new CalcInputError(`${name} has ${input.length} values but the readings have ${length}.`, name);
  }
}

/** Series form of {@link ppmToMgPerNm3}: every reading ppm → mg/Nm3. NaN stays NaN. */
export function ppmSeriesToMgPerNm3(ppm: ArrayLike<number>, species: Species, opts?: ReferenceStateOptions, out?: Float64Array): Float64Array {
  const factor = mgPerNm3PerPpm(species, opts);
  const n = ppm.length;
  const result = outFor(n, out);
  for (let i = 0; i < n; i++) result[i] = ppm[i]! * factor;
  return result;
}

/** Series form of {@link mgPerNm3ToPpm}. NaN stays NaN. */
export function mgPerNm3SeriesToPpm(mgPerNm3: ArrayLike<number>, species: Species, opts?: ReferenceStateOptions, out?: Float64Array): Float64Array {
  const factor = 1 / mgPerNm3PerPpm(species, opts);
  const n = mgPerNm3.length;
  const result = outFor(n, out);
  for (let i = 0; i < n; i++) result[i] = mgPerNm3[i]! * factor;
  return result;
}

/**
 * Series form of {@link wetToDry}. `moisturePercent` is one value or one per reading. A reading
 * whose moisture is NaN becomes NaN; a moisture outside 0 ≤ H2O < 100 % throws.
 */
export function wetSeriesToDry(values: ArrayLike<number>, moisturePercent: SeriesInput, out?: Float64Array): Float64Array {
  const n = values.length;
  const result = outFor(n, out);
  if (typeof moisturePercent === 'number') {
    checkMoisturePercent(moisturePercent);
    const factor = 1 / (1 - moisturePercent / 100);
    for (let i = 0; i < n; i++) result[i] = values[i]! * factor;
    return result;
  }
  checkSameLength('moisturePercent', moisturePercent, n);
  for (let i = 0; i < n; i++) {
    const m = moisturePercent[i]!;
    if (m < 0 || m >= 100) checkMoisturePercent(m);
    result[i] = values[i]! / (1 - m / 100);
  }
  return result;
}

/** Series form of {@link dryToWet}. */
export function drySeriesToWet(values: ArrayLike<number>, moisturePercent: SeriesInput, out?: Float64Array): Float64Array {
  const n = values.length;
  const result = outFor(n, out);
  if (typeof moisturePercent === 'number') {
    checkMoisturePercent(moisturePercent);
    const factor = 1 - moisturePercent / 100;
    for (let i = 0; i < n; i++) result[i] = values[i]! * factor;
    return result;
  }
  checkSameLength('moisturePercent', moisturePercent, n);
  for (let i = 0; i < n; i++) {
    const m = moisturePercent[i]!;
    if (m < 0 || m >= 100) checkMoisturePercent(m);
    result[i] = values[i]! * (1 - m / 100);
  }
  return result;
}

/** Series options of the O2 correction. */
export interface SeriesO2CorrectionOptions extends O2CorrectionOptions {
  /**
   * What to do with a reading whose measured O2 is at/above ambient or negative: 'throw'
   * (default, like the single-value form) or 'nan' (mark the corrected reading missing —
   * e.g. a unit at zero load blowing air through the stack).
   */
  invalidO2?: 'throw' | 'nan';
}

/**
 * Series form of {@link correctToReferenceO2}: each dry reading corrected with its own measured
 * O2 (dry, %), or one O2 for all. NaN in the value or the O2 gives NaN.
 */
export function correctSeriesToReferenceO2(
  values: ArrayLike<number>,
  measuredO2Percent: SeriesInput,
  referenceO2Percent: number,
  opts: SeriesO2CorrectionOptions = {},
  out?: Float64Array,
): Float64Array {
  const ambient = opts.ambientO2Percent ?? 21;
  checkAmbient(ambient);
  checkReferenceO2(referenceO2Percent, ambient);
  const n = values.length;
  const result = outFor(n, out);
  const numerator = ambient - referenceO2Percent;
  const onlyWhenAbove = opts.onlyWhenAbove === true;
  const nanOnInvalid = opts.invalidO2 === 'nan';
  if (typeof measuredO2Percent === 'number') {
    if (Number.isNaN(measuredO2Percent)) return result.fill(Number.NaN, 0, n);
    const factor = correctToReferenceO2(1, measuredO2Percent, referenceO2Percent, opts);
    for (let i = 0; i < n; i++) result[i] = values[i]! * factor;
    return result;
  }
  checkSameLength('measuredO2Percent', measuredO2Percent, n);
  for (let i = 0; i < n; i++) {
    const o2 = measuredO2Percent[i]!;
    const v = values[i]!;
    if (o2 >= 0 && o2 < ambient) {
      result[i] = onlyWhenAbove && o2 <= referenceO2Percent ? v : (v * numerator) / (ambient - o2);
    } else if (Number.isNaN(o2) || nanOnInvalid) {
      result[i] = Number.NaN;
    } else {
      throw new CalcInputError(
        `Measured O2 ${o2} % at reading ${i} must be at least 0 % and below the ambient ${ambient} %.`,
        'measuredO2Percent',
      );
    }
  }
  return result;
}

/** Options of {@link convertSeries}. */
export interface SeriesConversionOptions extends SeriesO2CorrectionOptions {
  /** Unit of the raw readings: 'ppm' (needs `species`) or 'mgPerNm3' (already mass at 0 °C, 101.325 kPa). */
  fromUnit: 'ppm' | 'mgPerNm3';
  /** Species of ppm readings (NOx as NO2). */
  species?: Species;
  /** Basis of the raw readings. 'wet' needs `moisturePercent`. */
  basis: 'wet' | 'dry';
  /** Flue-gas moisture, % by volume: one value or one per reading (used when basis is 'wet'). */
  moisturePercent?: SeriesInput;
  /** Measured O2, % dry: one value or one per reading. Omit to skip the O2 correction. */
  measuredO2PercentDry?: SeriesInput;
  /** Reference O2 of the limit, % dry (needed with `measuredO2PercentDry`). */
  referenceO2Percent?: number;
  /** Reference state of the mg/Nm3 result. Default 273.15 K, 101.325 kPa. */
  reference?: ReferenceStateOptions;
}

/**
 * The whole per-reading chain in one pass: raw readings (ppm or mg/Nm3, wet or dry) →
 * mg/Nm3 → dry basis → corrected to the reference O2. Same formulas as
 * {@link ppmToMgPerNm3}, {@link wetToDry} and {@link correctToReferenceO2}; one loop, no
 * allocation per element, NaN propagates.
 */
export function convertSeries(values: ArrayLike<number>, opts: SeriesConversionOptions, out?: Float64Array): Float64Array {
  const n = values.length;
  const result = outFor(n, out);
  let massFactor = 1;
  if (opts.fromUnit === 'ppm') {
    if (opts.species === undefined) throw new CalcInputError('ppm readings need the species (e.g. "NOx").', 'species');
    massFactor = mgPerNm3PerPpm(opts.species, opts.reference);
  }
  const moisture: SeriesInput = opts.basis === 'wet' ? (opts.moisturePercent ?? Number.NaN) : 0;
  if (opts.basis === 'wet' && opts.moisturePercent === undefined) {
    throw new CalcInputError('Wet readings need the flue-gas moisture (moisturePercent) to reach the dry basis.', 'moisturePercent');
  }
  const o2 = opts.measuredO2PercentDry;
  if (o2 === undefined) {
    wetSeriesToDry(values, moisture, result);
    if (massFactor !== 1) for (let i = 0; i < n; i++) result[i] = result[i]! * massFactor;
    return result;
  }
  if (opts.referenceO2Percent === undefined) {
    throw new CalcInputError('The O2 correction needs the reference O2 of the limit (referenceO2Percent).', 'referenceO2Percent');
  }
  const referenceO2Percent = opts.referenceO2Percent;
  const ambient = opts.ambientO2Percent ?? 21;
  checkAmbient(ambient);
  checkReferenceO2(referenceO2Percent, ambient);
  if (typeof moisture === 'number') checkMoisturePercent(moisture);
  else checkSameLength('moisturePercent', moisture, n);
  if (typeof o2 === 'number' || typeof moisture === 'number') {
    // Uncommon shapes: compose the single-purpose series functions.
    wetSeriesToDry(values, moisture, result);
    correctSeriesToReferenceO2(result, o2, referenceO2Percent, opts, result);
    if (massFactor !== 1) for (let i = 0; i < n; i++) result[i] = result[i]! * massFactor;
    return result;
  }
  checkSameLength('measuredO2PercentDry', o2, n);
  const numerator = (ambient - referenceO2Percent) * massFactor;
  const onlyWhenAbove = opts.onlyWhenAbove === true;
  const nanOnInvalid = opts.invalidO2 === 'nan';
  if (!onlyWhenAbove && !sharesMemory(result, values) && !sharesMemory(result, moisture) && !sharesMemory(result, o2)) {
    // Fast path: straight arithmetic, one flag for any out-of-range O2 or moisture (NaN
    // compares false and simply propagates). Rare bad data falls through to the careful loop.
    let outOfRange = false;
    for (let i = 0; i < n; i++) {
      const m = moisture[i]!;
      const o = o2[i]!;
      result[i] = ((values[i]! / (1 - m / 100)) * numerator) / (ambient - o);
      if (o >= ambient || o < 0 || m >= 100 || m < 0) outOfRange = true;
    }
    if (!outOfRange) return result;
  }
  for (let i = 0; i < n; i++) {
    const m = moisture[i]!;
    const o = o2[i]!;
    if (m < 0 || m >= 100) checkMoisturePercent(m);
    const dry = values[i]! / (1 - m / 100);
    if (o >= 0 && o < ambient) {
      result[i] = onlyWhenAbove && o <= referenceO2Percent ? dry * massFactor : (dry * numerator) / (ambient - o);
    } else if (Number.isNaN(o) || nanOnInvalid) {
      result[i] = Number.NaN;
    } else {
      throw new CalcInputError(`Measured O2 ${o} % at reading ${i} must be at least 0 % and below the ambient ${ambient} %.`, 'measuredO2PercentDry');
    }
  }
  return result;
}
