/**
 * Emission rates per unit of heat input (Method 19), their unit conversions, and the O2/CO2
 * consistency check of a pair of diluent analysers.
 *
 * Sources: 40 CFR Part 60 App. A Method 19 §12.2 (equations 19-1 … 19-9: O2- or CO2-based,
 * wet, dry or mixed bases) [pub for 19-1 and the CO2-dry form; equation numbers of the mixed
 * forms from memory]; 40 CFR Part 75 App. F §3 ppm → lb/scf constants; REFERENCES.md §1, §2.
 */
import { CalcInputError } from '../errors';
import {
  MOLAR_MASS_G_PER_MOL,
  MOLAR_VOLUME_SCF_PER_LBMOL,
  NG_PER_J_PER_LB_PER_MMBTU,
  PART75_LB_PER_SCF_PER_PPM,
  type Species,
} from '../constants';
import type { FFactorSet } from '../f-factors';

/**
 * lb/scf per ppm of a species: the 40 CFR 75 App. F constant where one exists (SO2 1.660e-7,
 * NOx as NO2 1.194e-7 [pub], CO 7.267e-8 [memory] (no published text found; derived 7.270e-8));
 * otherwise 10⁻⁶·M/385.3 scf/lbmol (20 °C).
 */
export function lbPerScfPerPpm(species: Species): number {
  const regulatory = PART75_LB_PER_SCF_PER_PPM[species];
  if (regulatory !== undefined) return regulatory;
  const m = MOLAR_MASS_G_PER_MOL[species];
  if (m === undefined) throw new CalcInputError(`Unknown species "${String(species)}".`, 'species');
  return (1e-6 * m) / MOLAR_VOLUME_SCF_PER_LBMOL;
}

/** ppm → lb/scf (Method 19 units). Part 75 App. F constants for SO2, NOx, CO. */
export function ppmToLbPerScf(ppm: number, species: Species): number {
  return ppm * lbPerScfPerPpm(species);
}

/** Inputs of {@link emissionRateLbPerMMBtu}. */
export interface EmissionRateInput {
  /** Pollutant concentration in lb/scf; or give `ppm` and `species`. */
  concentrationLbPerScf?: number;
  /** Pollutant concentration in ppm (µmol/mol). */
  ppm?: number;
  /** Species of `ppm` (NOx as NO2). */
  species?: Species;
  /** Basis of the pollutant concentration. */
  concentrationBasis: 'dry' | 'wet';
  /** Diluent measured: O2 or CO2. */
  diluent: 'O2' | 'CO2';
  /** Diluent concentration, % by volume. */
  diluentPercent: number;
  /** Basis of the diluent reading. */
  diluentBasis: 'dry' | 'wet';
  /** Stack-gas moisture Bws, % by volume — needed whenever a wet reading meets an Fd-based form. */
  moisturePercent?: number;
  /**
   * Moisture of the ambient air Bwa, % by volume: with both readings wet, O2 diluent and an
   * Fw factor, eq. 19-2 uses it instead of the stack moisture.
   */
  ambientAirMoisturePercent?: number;
  /** The fuel's F-factors (Table 19-2 defaults or {@link fFactors}). */
  fFactors: FFactorSet;
}

/**
 * Pollutant emission rate, lb/MMBtu of heat input, by Method 19 §12.2:
 * - O2, both dry (eq. 19-1): `E = Cd·Fd·20.9/(20.9 − %O2d)`
 * - O2, both wet with Bwa and Fw (eq. 19-2): `E = Cw·Fw·20.9/(20.9(1 − Bwa) − %O2w)`
 * - O2, any other mix with Bws (eqs. 19-3 … 19-5): wet readings are put on a dry basis
 *   with Bws and eq. 19-1 applied — algebraically the published forms.
 * - CO2, both dry (eq. 19-6): `E = Cd·Fc·100/%CO2d`; both wet (eq. 19-7): `E = Cw·Fc·100/%CO2w`;
 *   mixed (eqs. 19-8, 19-9): the reading that differs is converted with Bws.
 * @example emissionRateLbPerMMBtu({ ppm: 50, species: 'NOx', concentrationBasis: 'dry', diluent: 'O2', diluentPercent: 3, diluentBasis: 'dry', fFactors: DEFAULT_F_FACTORS['natural-gas'] }) //=> 0.0607
 */
export function emissionRateLbPerMMBtu(input: EmissionRateInput): number {
  let c: number;
  if (input.concentrationLbPerScf !== undefined) {
    c = input.concentrationLbPerScf;
  } else if (input.ppm !== undefined && input.species !== undefined) {
    c = ppmToLbPerScf(input.ppm, input.species);
  } else {
    throw new CalcInputError('Give the concentration in lb/scf, or in ppm with its species.', 'concentrationLbPerScf');
  }
  if (!(c >= 0)) throw new CalcInputError(`Concentration must be at least 0 (got ${c}).`, 'concentration');
  const { diluent, diluentPercent, concentrationBasis, diluentBasis, fFactors } = input;
  const bws = input.moisturePercent === undefined ? undefined : input.moisturePercent / 100;
  if (bws !== undefined && !(bws >= 0 && bws < 1)) {
    throw new CalcInputError(`Stack moisture must be at least 0 and below 100 % (got ${input.moisturePercent}).`, 'moisturePercent');
  }
  const needBws = (): number => {
    if (bws === undefined) {
      throw new CalcInputError('Readings on different bases (or wet readings with Fd/Fc) need the stack moisture (moisturePercent).', 'moisturePercent');
    }
    return bws;
  };

  if (diluent === 'O2') {
    if (!(fFactors.fdDscfPerMMBtu > 0)) throw new CalcInputError('The O2-based forms need Fd above zero.', 'fFactors.fdDscfPerMMBtu');
    if (!(diluentPercent >= 0)) throw new CalcInputError(`O2 must be at least 0 % (got ${diluentPercent}).`, 'diluentPercent');
    if (concentrationBasis === 'wet' && diluentBasis === 'wet' && input.ambientAirMoisturePercent !== undefined && bws === undefined) {
      // eq. 19-2: Fw with the ambient-air moisture.
      const bwa = input.ambientAirMoisturePercent / 100;
      const fw = fFactors.fwWscfPerMMBtu;
      if (fw === undefined || !(fw > 0)) throw new CalcInputError('Eq. 19-2 needs the wet F-factor Fw.', 'fFactors.fwWscfPerMMBtu');
      const denominator = 20.9 * (1 - bwa) - diluentPercent;
      if (!(denominator > 0)) throw new CalcInputError(`Wet O2 ${diluentPercent} % is at or above ambient air O2 (wet): no flue gas.`, 'diluentPercent');
      return (c * fw * 20.9) / denominator;
    }
    const cd = concentrationBasis === 'dry' ? c : c / (1 - needBws());
    const o2d = diluentBasis === 'dry' ? diluentPercent : diluentPercent / (1 - needBws());
    if (!(o2d < 20.9)) throw new CalcInputError(`O2 ${o2d.toFixed(2)} % dry is at or above 20.9 %: no flue gas to relate to heat input.`, 'diluentPercent');
    return (cd * fFactors.fdDscfPerMMBtu * 20.9) / (20.9 - o2d); // eq. 19-1
  }
  if (!(fFactors.fcScfPerMMBtu > 0)) throw new CalcInputError('The CO2-based forms need Fc above zero.', 'fFactors.fcScfPerMMBtu');
  if (!(diluentPercent > 0)) throw new CalcInputError(`CO2 must be above 0 % (got ${diluentPercent}).`, 'diluentPercent');
  let cOnDiluentBasis = c;
  if (concentrationBasis !== diluentBasis) {
    const b = needBws();
    cOnDiluentBasis = concentrationBasis === 'dry' ? c * (1 - b) : c / (1 - b);
  }
  return (cOnDiluentBasis * fFactors.fcScfPerMMBtu * 100) / diluentPercent; // eqs. 19-6 … 19-9
}

/** lb/MMBtu → ng/J (= g/GJ). 1 lb/MMBtu = 429.92 ng/J (REFERENCES.md §2, derived). */
export function lbPerMMBtuToNgPerJ(lbPerMMBtu: number): number {
  return lbPerMMBtu * NG_PER_J_PER_LB_PER_MMBTU;
}

/** ng/J → lb/MMBtu. */
export function ngPerJToLbPerMMBtu(ngPerJ: number): number {
  return ngPerJ / NG_PER_J_PER_LB_PER_MMBTU;
}

/** lb/MMBtu → g/GJ (numerically equal to ng/J). */
export function lbPerMMBtuToGPerGJ(lbPerMMBtu: number): number {
  return lbPerMMBtuToNgPerJ(lbPerMMBtu);
}

/** g/GJ → lb/MMBtu. */
export function gPerGJToLbPerMMBtu(gPerGJ: number): number {
  return ngPerJToLbPerMMBtu(gPerGJ);
}

/** Options relating a concentration at a reference O2 to heat input. */
export interface ReferenceO2HeatBasis {
  /** Reference O2 of the concentration, % dry. */
  referenceO2Percent: number;
  /** Dry F-factor, Nm3 (0 °C) per GJ — from {@link fFactors} or `scfPerMMBtuToNm3PerGJ`. */
  fdNm3PerGJ: number;
  /** O2 of ambient air the F-factor relation uses, %. Default 20.9 (Method 19). */
  ambientO2Percent?: 21 | 20.9;
}

function dryGasNm3PerGJ(opts: ReferenceO2HeatBasis): number {
  const ambient = opts.ambientO2Percent ?? 20.9;
  if (!(opts.referenceO2Percent >= 0 && opts.referenceO2Percent < ambient)) {
    throw new CalcInputError(`Reference O2 must be at least 0 and below ${ambient} % (got ${opts.referenceO2Percent}).`, 'referenceO2Percent');
  }
  if (!(opts.fdNm3PerGJ > 0)) throw new CalcInputError(`Fd must be above 0 Nm3/GJ (got ${opts.fdNm3PerGJ}).`, 'fdNm3PerGJ');
  return (opts.fdNm3PerGJ * ambient) / (ambient - opts.referenceO2Percent);
}

/**
 * mg/Nm3 (dry, at the reference O2) → g/GJ of heat input:
 * `E = C · Fd · 20.9/(20.9 − O2ref) / 1000` (Method 19 eq. 19-1 in SI units). The heat input is
 * on the gross (higher heating value) basis of Method 19's F-factors; for a net (LHV) basis,
 * as in EU practice, divide the result by LHV/HHV of the fuel (≈ 0.90 for natural gas).
 */
export function mgPerNm3AtReferenceO2ToGPerGJ(mgPerNm3: number, opts: ReferenceO2HeatBasis): number {
  return (mgPerNm3 * dryGasNm3PerGJ(opts)) / 1000;
}

/** g/GJ → mg/Nm3 (dry, at the reference O2); inverse of {@link mgPerNm3AtReferenceO2ToGPerGJ}. */
export function gPerGJToMgPerNm3AtReferenceO2(gPerGJ: number, opts: ReferenceO2HeatBasis): number {
  return (gPerGJ * 1000) / dryGasNm3PerGJ(opts);
}

/** lb/MMBtu → mg/Nm3 (dry, at the reference O2). */
export function lbPerMMBtuToMgPerNm3AtReferenceO2(lbPerMMBtu: number, opts: ReferenceO2HeatBasis): number {
  return gPerGJToMgPerNm3AtReferenceO2(lbPerMMBtuToGPerGJ(lbPerMMBtu), opts);
}

/** mg/Nm3 (dry, at the reference O2) → lb/MMBtu. */
export function mgPerNm3AtReferenceO2ToLbPerMMBtu(mgPerNm3: number, opts: ReferenceO2HeatBasis): number {
  return gPerGJToLbPerMMBtu(mgPerNm3AtReferenceO2ToGPerGJ(mgPerNm3, opts));
}

/** Result of {@link o2Co2Consistency}. */
export interface O2Co2Consistency {
  /** CO2 expected from the O2 reading, % dry: CO2max·(20.9 − O2)/20.9. */
  expectedCo2PercentDry: number;
  /** Measured − expected CO2, percentage points. */
  deviationPercentPoints: number;
  /** Deviation relative to the expected CO2, %. */
  deviationRelativePercent: number;
}

/**
 * Plausibility of a pair of diluent readings: with complete combustion,
 * `CO2 = CO2max·(20.9 − O2)/20.9` (dry). A persistent deviation points to analyser drift,
 * air in-leakage or a different fuel. Source: REFERENCES.md §1 (dilution identity); the
 * tolerance to flag is site practice and left to the caller.
 */
export function o2Co2Consistency(opts: { o2PercentDry: number; co2PercentDry: number; co2MaxPercentDry: number; ambientO2Percent?: 21 | 20.9 }): O2Co2Consistency {
  const ambient = opts.ambientO2Percent ?? 20.9;
  if (!(opts.co2MaxPercentDry > 0 && opts.co2MaxPercentDry <= 100)) {
    throw new CalcInputError(`CO2max must be between 0 and 100 % (got ${opts.co2MaxPercentDry}).`, 'co2MaxPercentDry');
  }
  if (!(opts.o2PercentDry >= 0 && opts.o2PercentDry <= ambient)) {
    throw new CalcInputError(`O2 must be between 0 and ${ambient} % (got ${opts.o2PercentDry}).`, 'o2PercentDry');
  }
  if (!(opts.co2PercentDry >= 0)) throw new CalcInputError(`CO2 must be at least 0 % (got ${opts.co2PercentDry}).`, 'co2PercentDry');
  const expectedCo2PercentDry = (opts.co2MaxPercentDry * (ambient - opts.o2PercentDry)) / ambient;
  const deviationPercentPoints = opts.co2PercentDry - expectedCo2PercentDry;
  return {
    expectedCo2PercentDry,
    deviationPercentPoints,
    deviationRelativePercent: expectedCo2PercentDry > 0 ? (100 * deviationPercentPoints) / expectedCo2PercentDry : Number.NaN,
  };
}
