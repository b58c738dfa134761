/**
 * Hourly values as the permit states them: dry basis, standard conditions, corrected to the
 * limit's reference O2 with the same hour's O2, and a mass rate when the flue-gas flow or the
 * fuel flow is known. Conversions come from `../conversions` (REFERENCES.md §4).
 */
import type { AmbientO2Percent, Species } from '../constants';
import { correctToReferenceO2, ppmToMgPerNm3, toStandardConditions, wetToDry } from '../conversions';
import { CalcInputError } from '../errors';
import { type HourlySeries, HourReasonCode, HourStatusCode } from './series';

/** Hourly series of one stack, aligned by hour start (missing hours in an input count as invalid). */
export interface DeriveInputs {
  /** The pollutant's hourly values in `pollutantUnit` on `pollutantBasis`. */
  readonly pollutant: HourlySeries;
  /** O2, % by volume, on `o2Basis` (needed for an O2-referenced limit). */
  readonly o2?: HourlySeries;
  /** Flue-gas moisture, % by volume (needed when the pollutant or the O2 is measured wet, or the flow is wet). */
  readonly moisture?: HourlySeries;
  /** Gas temperature (K) and absolute pressure (kPa) at the analyser, for `mgPerM3Actual` values. */
  readonly temperatureK?: HourlySeries;
  readonly pressureKPa?: HourlySeries;
  /** Flue-gas volume flow at standard conditions, Nm3/h, on `flowBasis`. */
  readonly flowNm3PerHour?: HourlySeries;
  /** Fuel mass flow, kg/h (with `dryFlueGasNm3PerKgFuelStoich`). */
  readonly fuelKgPerHour?: HourlySeries;
}

export interface DeriveOptions {
  /** `mgPerNm3` (already at 273.15 K, 101.325 kPa), `mgPerM3Actual` (at the analyser's T and p) or `ppm`. */
  readonly pollutantUnit: 'mgPerNm3' | 'mgPerM3Actual' | 'ppm';
  /** Species of ppm values (NOx as NO2). */
  readonly species?: Species;
  readonly pollutantBasis: 'wet' | 'dry';
  /** Basis of the O2 values; default `dry`. */
  readonly o2Basis?: 'wet' | 'dry';
  /** Fixed analyser conditions when no temperature/pressure series is given. */
  readonly actualConditions?: { readonly tempK: number; readonly pressureKPa: number };
  /** Reference O2 of the limit, % dry; null or absent: no correction. */
  readonly referenceO2Percent?: number | null;
  /** 21 (EU, IED Annex VI Part 7) or 20.9 (US, 40 CFR 60); default 21. */
  readonly ambientO2Percent?: AmbientO2Percent;
  /** Correct only when the measured O2 is above the reference (IED Annex VI Part 7 [memory]). */
  readonly correctOnlyWhenAboveReference?: boolean;
  /** Basis of `flowNm3PerHour`; default `dry`. */
  readonly flowBasis?: 'wet' | 'dry';
  /** Dry flue-gas volume per kg of fuel at stoichiometric combustion, Nm3/kg (from the fuel's analysis). */
  readonly dryFlueGasNm3PerKgFuelStoich?: number;
}

/** Derived hourly values: `value` is the concentration as the limit states it. */
export interface DerivedHourlySeries extends HourlySeries {
  /** mg/Nm3, dry, standard conditions, at the hour's measured O2 (before the O2 correction). */
  readonly dryValue: Float64Array;
  /** The hour's O2, % dry; NaN when not known. */
  readonly o2PercentDry: Float64Array;
  /** Mass emission rate, kg/h; NaN when there is no flow or it is invalid. Absent without flow inputs. */
  readonly massKgPerHour?: Float64Array;
  /** The reference O2 the values are corrected to, or null. */
  readonly referenceO2Percent: number | null;
}

/** For each hour of `base`, the index of the same hour in `other`, or -1 (two-pointer join). */
function alignIndex(base: HourlySeries, other: HourlySeries | undefined): Int32Array | undefined {
  if (!other) return undefined;
  if (other.periodMs !== base.periodMs) {
    throw new CalcInputError(`All hourly inputs need the same period length (${base.periodMs / 60_000} min).`, 'inputs');
  }
  const idx = new Int32Array(base.t.length);
  let j = 0;
  for (let i = 0; i < base.t.length; i++) {
    const t = base.t[i]!;
    while (j < other.t.length && other.t[j]! < t) j++;
    idx[i] = j < other.t.length && other.t[j] === t ? j : -1;
  }
  return idx;
}

/** Value of the aligned hour when it can be used (valid, substituted, or start-up/shut-down with a value), else NaN. */
function usable(s: HourlySeries | undefined, idx: Int32Array | undefined, i: number): number {
  if (!s || !idx) return NaN;
  const j = idx[i]!;
  if (j < 0) return NaN;
  const st = s.status[j]!;
  if (st === HourStatusCode.invalid || st === HourStatusCode['not-operating']) return NaN;
  return s.value[j]!;
}

function substitutedAt(s: HourlySeries | undefined, idx: Int32Array | undefined, i: number): boolean {
  return !!s && !!idx && idx[i]! >= 0 && s.status[idx[i]!] === HourStatusCode.substituted;
}

/**
 * Derives the hourly values a limit is tested against. For each hour:
 *
 * 1. ppm → mg/Nm3 (`ppmToMgPerNm3`), or mg/m3 at analyser conditions → standard conditions
 *    (`toStandardConditions`);
 * 2. wet → dry with the hour's moisture (`wetToDry`); O2 measured wet is brought to dry the same way;
 * 3. corrected to the reference O2 with the same hour's O2 (`correctToReferenceO2`,
 *    `E_ref = E·(O2amb − O2ref)/(O2amb − O2)`). An hour whose O2 is invalid, missing or at/above
 *    ambient cannot be corrected: it becomes `invalid` (reason `o2-invalid` / `o2-out-of-range`);
 * 4. mass rate, kg/h = dry concentration at measured O2 (mg/Nm3) · dry flow (Nm3/h) / 10⁶; from
 *    the fuel flow, the dry flow is fuel (kg/h) · V_stoich,dry (Nm3/kg) · O2amb/(O2amb − O2)
 *    (the O2-based F-factor form of 40 CFR 60 App. A Method 19 Eq. 19-1).
 *
 * Hours keep their status (not-operating, start-up/shut-down) unless an input makes them invalid;
 * substituted inputs make the hour `substituted`.
 */
export function deriveHourlyValues(inputs: DeriveInputs, opts: DeriveOptions): DerivedHourlySeries {
  const p = inputs.pollutant;
  const n = p.t.length;
  const ref = opts.referenceO2Percent ?? null;
  const ambient = opts.ambientO2Percent ?? 21;
  if (opts.pollutantUnit === 'ppm' && !opts.species) throw new CalcInputError('ppm values need the species (e.g. "NOx") to become mg/Nm3.', 'species');
  if (ref !== null && !inputs.o2) throw new CalcInputError('An O2-referenced limit needs the O2 series of the same stack.', 'o2');
  const o2Wet = (opts.o2Basis ?? 'dry') === 'wet';
  const needMoisture = opts.pollutantBasis === 'wet' || (o2Wet && !!inputs.o2) || (opts.flowBasis === 'wet' && !!inputs.flowNm3PerHour);
  if (needMoisture && !inputs.moisture) throw new CalcInputError('Wet values need the moisture series to reach the dry basis.', 'moisture');
  const actual = opts.pollutantUnit === 'mgPerM3Actual';
  if (actual && !opts.actualConditions && !(inputs.temperatureK && inputs.pressureKPa)) {
    throw new CalcInputError('Values at actual conditions need the gas temperature and pressure (series or actualConditions).', 'actualConditions');
  }
  if (inputs.fuelKgPerHour && !(opts.dryFlueGasNm3PerKgFuelStoich! > 0)) {
    throw new CalcInputError('A mass rate from the fuel flow needs dryFlueGasNm3PerKgFuelStoich > 0.', 'dryFlueGasNm3PerKgFuelStoich');
  }
  if (ref !== null) correctToReferenceO2(1, ref, ref, { ambientO2Percent: ambient }); // validates ref and ambient once

  const iO2 = alignIndex(p, inputs.o2);
  const iH2O = alignIndex(p, inputs.moisture);
  const iT = alignIndex(p, inputs.temperatureK);
  const iP = alignIndex(p, inputs.pressureKPa);
  const iF = alignIndex(p, inputs.flowNm3PerHour);
  const iFuel = alignIndex(p, inputs.fuelKgPerHour);
  const withMass = !!(inputs.flowNm3PerHour || inputs.fuelKgPerHour);

  const out = {
    periodMs: p.periodMs,
    t: p.t.slice(),
    value: new Float64Array(n).fill(NaN),
    status: p.status.slice(),
    reason: p.reason.slice(),
    coverage: p.coverage.slice(),
    validCount: p.validCount.slice(),
    readingCount: p.readingCount.slice(),
    firstReading: p.firstReading.slice(),
    lastReading: p.lastReading.slice(),
    dryValue: new Float64Array(n).fill(NaN),
    o2PercentDry: new Float64Array(n).fill(NaN),
    ...(withMass ? { massKgPerHour: new Float64Array(n).fill(NaN) } : {}),
    referenceO2Percent: ref,
  };
  const species = opts.species;
  const fail = (i: number, reason: number) => {
    if (out.status[i] !== HourStatusCode['startup-shutdown']) {
      out.status[i] = HourStatusCode.invalid;
      out.reason[i] = reason;
    }
  };

  for (let i = 0; i < n; i++) {
    const st = p.status[i]!;
    const raw = p.value[i]!;
    const moisture = needMoisture ? usable(inputs.moisture, iH2O, i) : 0;
    let o2 = usable(inputs.o2, iO2, i);
    if (o2Wet && o2 === o2) o2 = moisture === moisture && moisture >= 0 && moisture < 100 ? wetToDry(o2, moisture) : NaN;
    out.o2PercentDry[i] = o2;
    if (st === HourStatusCode.invalid || st === HourStatusCode['not-operating'] || raw !== raw) continue;

    let c = raw;
    if (opts.pollutantUnit === 'ppm') c = ppmToMgPerNm3(c, species!);
    else if (actual) {
      const tempK = inputs.temperatureK ? usable(inputs.temperatureK, iT, i) : opts.actualConditions!.tempK;
      const pressureKPa = inputs.pressureKPa ? usable(inputs.pressureKPa, iP, i) : opts.actualConditions!.pressureKPa;
      if (!(tempK > 0 && pressureKPa > 0)) {
        fail(i, HourReasonCode['conditions-invalid']);
        continue;
      }
      c = toStandardConditions(c, { tempK, pressureKPa });
    }
    if (opts.pollutantBasis === 'wet') {
      if (!(moisture >= 0 && moisture < 100)) {
        fail(i, HourReasonCode['moisture-invalid']);
        continue;
      }
      c = wetToDry(c, moisture);
    }
    out.dryValue[i] = c;
    const o2Ok = o2 >= 0 && o2 < ambient;
    if (ref !== null) {
      if (o2 !== o2) {
        fail(i, o2Wet && moisture !== moisture ? HourReasonCode['moisture-invalid'] : HourReasonCode['o2-invalid']);
        continue;
      }
      if (!o2Ok) {
        fail(i, HourReasonCode['o2-out-of-range']);
        continue;
      }
      out.value[i] = correctToReferenceO2(c, o2, ref, { ambientO2Percent: ambient, onlyWhenAbove: opts.correctOnlyWhenAboveReference ?? false });
    } else out.value[i] = c;
    if (
      out.status[i] === HourStatusCode.valid &&
      (substitutedAt(inputs.o2, iO2, i) || (opts.pollutantBasis === 'wet' && substitutedAt(inputs.moisture, iH2O, i)))
    ) {
      out.status[i] = HourStatusCode.substituted;
    }
    if (out.massKgPerHour) {
      let dryFlow = NaN;
      if (inputs.flowNm3PerHour) {
        const f = usable(inputs.flowNm3PerHour, iF, i);
        // Dry volume = wet volume · (1 − H2O/100) (40 CFR 60 App. A Method 4 moisture fraction) [derived].
        dryFlow = opts.flowBasis === 'wet' ? f * (1 - moisture / 100) : f;
      } else if (inputs.fuelKgPerHour && o2Ok) {
        const fuel = usable(inputs.fuelKgPerHour, iFuel, i);
        dryFlow = fuel * opts.dryFlueGasNm3PerKgFuelStoich! * (ambient / (ambient - o2));
      }
      // mg/h → kg/h: 10⁶ mg per kg.
      out.massKgPerHour[i] = dryFlow >= 0 ? (c * dryFlow) / 1e6 : NaN;
    }
  }
  return out;
}
