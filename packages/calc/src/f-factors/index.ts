/**
 * Method 19 F-factors: volumes of combustion gas per unit of heat input.
 *
 * Source: US EPA 40 CFR Part 60 Appendix A, Method 19 §12.3 (equations 19-13 … 19-15 for
 * Fd, Fw, Fc from the ultimate analysis; §12.3.3 heat-input-weighted factors for fuel
 * mixes) and Table 19-2 (default F-factors; also 40 CFR 75 App. F Table 1). Standard
 * conditions 20 °C, 760 mm Hg. Constants per REFERENCES.md §2: Fd 3.64 H, 1.53 C, 0.57 S,
 * 0.14 N, −0.46 O [pub]; Fw 5.57 H and 0.21 H2O [memory]; Fc 0.321 C [memory]. No public copy of
 * the Method 19 equations was found to confirm 5.57, 0.21 and 0.321; they agree with the ideal-gas
 * derivation at 385.3 scf/lbmol: 0.321 ≈ 385.3/12.011/100 = 0.3208, 0.21 ≈ 385.3/18.015/100 =
 * 0.214, 5.57 ≈ 3.64 + 385.3/2.016/100 = 5.55 [derived].
 */
import { CalcInputError } from '../errors';
import { BTU_J, BTU_PER_LB_IN_MJ_PER_KG, CUBIC_FOOT_M3, NORMAL_TEMP_K, US_STANDARD_TEMP_K } from '../constants';
import { ultimateAnalysisOf, type Fuel } from '../fuels';
import { heatingValues, type HeatingValueSource } from '../heating-value';

/**
 * 1 scf/MMBtu in m3/GJ (at the same 20 °C standard): 0.0283168 m3 ÷ 1.055056 GJ = 0.0268392.
 * Derived (REFERENCES.md §2: 2.68392e-11 m3/J).
 */
export const SCF_PER_MMBTU_IN_M3_PER_GJ = CUBIC_FOOT_M3 / (BTU_J * 1e6 / 1e9);

/** The three F-factors, US units (20 °C standard). */
export interface FFactorSet {
  /** Dry F-factor, dscf of dry flue gas per MMBtu (stoichiometric). */
  fdDscfPerMMBtu: number;
  /** Wet F-factor, wscf of wet flue gas per MMBtu. */
  fwWscfPerMMBtu?: number;
  /** Carbon F-factor, scf of CO2 per MMBtu. */
  fcScfPerMMBtu: number;
}

/** F-factors of a fuel, in US and SI units, with where the heating value came from. */
export interface FFactors extends FFactorSet {
  fwWscfPerMMBtu: number;
  /** Fd in m3 (20 °C, 101.325 kPa) per GJ — Method 19's SI form. */
  fdSm3PerGJ: number;
  /** Fd in Nm3 (0 °C, 101.325 kPa) per GJ. */
  fdNm3PerGJ: number;
  /** Fw in Nm3 (0 °C) per GJ. */
  fwNm3PerGJ: number;
  /** Fc in Nm3 (0 °C) per GJ. */
  fcNm3PerGJ: number;
  /** Fo = 0.209·Fd/Fc (Method 19 §12.3.2, a fuel check from O2 and CO2 readings). */
  fo: number;
  /** Gross calorific value used, Btu/lb as fired. */
  gcvBtuPerLb: number;
  gcvSource: HeatingValueSource;
}

/** Convert an F-factor from scf/MMBtu (20 °C) to Nm3/GJ (0 °C, 101.325 kPa). */
export function scfPerMMBtuToNm3PerGJ(scfPerMMBtu: number): number {
  return scfPerMMBtu * SCF_PER_MMBTU_IN_M3_PER_GJ * (NORMAL_TEMP_K / US_STANDARD_TEMP_K);
}

/** Convert an F-factor from Nm3/GJ (0 °C) to scf/MMBtu (20 °C). */
export function nm3PerGJToScfPerMMBtu(nm3PerGJ: number): number {
  return nm3PerGJ / (SCF_PER_MMBTU_IN_M3_PER_GJ * (NORMAL_TEMP_K / US_STANDARD_TEMP_K));
}

/**
 * F-factors of a fuel from its ultimate analysis (gases: the equivalent analysis of their
 * composition) and gross calorific value, Method 19 §12.3.2:
 * Fd = 10⁶(3.64 H + 1.53 C + 0.57 S + 0.14 N − 0.46 O)/GCV,
 * Fw = 10⁶(5.57 H + 1.53 C + 0.57 S + 0.14 N − 0.46 O + 0.21 H2O)/GCVw,
 * Fc = 10⁶(0.321 C)/GCV — mass % and Btu/lb, all as fired (H excluding moisture), which gives
 * the same Fd and Fc as the dry-basis form. Needs a heating value: a gas's comes from its
 * composition if not given; a solid's or liquid's must be given unless `estimateGcv` is set.
 */
export function fFactors(fuel: Fuel, opts: { estimateGcv?: boolean } = {}): FFactors {
  const u = ultimateAnalysisOf(fuel);
  const hv = heatingValues(fuel, { estimate: opts.estimateGcv });
  const gcvBtuPerLb = hv.hhvMJPerKg / BTU_PER_LB_IN_MJ_PER_KG;
  if (!(gcvBtuPerLb > 0)) throw new CalcInputError('F-factors need a heating value above zero.', 'gcv');
  const common = 1.53 * u.C + 0.57 * u.S + 0.14 * u.N - 0.46 * u.O;
  const fdDscfPerMMBtu = (1e6 * (3.64 * u.H + common)) / gcvBtuPerLb;
  const fwWscfPerMMBtu = (1e6 * (5.57 * u.H + common + 0.21 * u.moisture)) / gcvBtuPerLb;
  const fcScfPerMMBtu = (1e6 * 0.321 * u.C) / gcvBtuPerLb;
  if (!(fcScfPerMMBtu > 0)) throw new CalcInputError('The fuel contains no carbon: Fc and Fo are undefined.', 'ultimate.C');
  return {
    fdDscfPerMMBtu,
    fwWscfPerMMBtu,
    fcScfPerMMBtu,
    fdSm3PerGJ: fdDscfPerMMBtu * SCF_PER_MMBTU_IN_M3_PER_GJ,
    fdNm3PerGJ: scfPerMMBtuToNm3PerGJ(fdDscfPerMMBtu),
    fwNm3PerGJ: scfPerMMBtuToNm3PerGJ(fwWscfPerMMBtu),
    fcNm3PerGJ: scfPerMMBtuToNm3PerGJ(fcScfPerMMBtu),
    fo: (0.209 * fdDscfPerMMBtu) / fcScfPerMMBtu,
    gcvBtuPerLb,
    gcvSource: hv.source,
  };
}

/** Fuels with a default F-factor in Method 19 Table 19-2. */
export type DefaultFFactorFuel =
  | 'natural-gas'
  | 'propane'
  | 'butane'
  | 'oil'
  | 'coal-anthracite'
  | 'coal-bituminous'
  | 'coal-lignite'
  | 'wood'
  | 'wood-bark';

/** One row of Table 19-2 with the provenance of each value (REFERENCES.md §2 tags). */
export interface DefaultFFactor extends FFactorSet {
  label: string;
  source: string;
}

const TABLE_19_2 = '40 CFR Part 60 App. A Method 19 Table 19-2; 40 CFR Part 75 App. F Table 1';

/**
 * Default F-factors, Method 19 Table 19-2 (= 40 CFR 75 App. F Table 1), dscf/MMBtu,
 * wscf/MMBtu, scf CO2/MMBtu at 20 °C. Fd and Fc [pub]; the propane and butane Fc (1,190 and
 * 1,250) confirmed in the Part 75 App. F F-/Fc-factor table as reproduced at
 * https://www.ecfr.gov/current/title-40/part-75/appendix-Appendix%20F%20to%20Part%2075 (coal anthracite 10,100/1,970, bituminous and
 * subbituminous 9,780/1,800, lignite 9,860/1,910, oil 9,190/1,420, natural gas, propane, butane
 * 8,710 with 1,040/1,190/1,250, bark 9,600/1,920, wood residue 9,240/1,830; 20 °C, 29.92 in Hg).
 * Fw values [memory] — that table has no Fw column and no public copy of Table 19-2 with Fw was
 * found; re-check before relying on them. Table 19-2 gives no Fw for wood and bark.
 */
export const DEFAULT_F_FACTORS: Readonly<Record<DefaultFFactorFuel, Readonly<DefaultFFactor>>> = {
  'natural-gas': { label: 'Natural gas', fdDscfPerMMBtu: 8710, fwWscfPerMMBtu: 10610, fcScfPerMMBtu: 1040, source: `${TABLE_19_2}: Fd, Fc [pub]; Fw [memory]` },
  propane: { label: 'Propane', fdDscfPerMMBtu: 8710, fwWscfPerMMBtu: 10200, fcScfPerMMBtu: 1190, source: `${TABLE_19_2}: Fd, Fc [pub]; Fw [memory]` },
  butane: { label: 'Butane', fdDscfPerMMBtu: 8710, fwWscfPerMMBtu: 10390, fcScfPerMMBtu: 1250, source: `${TABLE_19_2}: Fd, Fc [pub]; Fw [memory]` },
  oil: { label: 'Oil', fdDscfPerMMBtu: 9190, fwWscfPerMMBtu: 10320, fcScfPerMMBtu: 1420, source: `${TABLE_19_2}: Fd, Fc [pub]; Fw [memory]` },
  'coal-anthracite': { label: 'Coal, anthracite', fdDscfPerMMBtu: 10100, fwWscfPerMMBtu: 10540, fcScfPerMMBtu: 1970, source: `${TABLE_19_2}: Fd, Fc [pub]; Fw [memory]` },
  'coal-bituminous': { label: 'Coal, bituminous', fdDscfPerMMBtu: 9780, fwWscfPerMMBtu: 10640, fcScfPerMMBtu: 1800, source: `${TABLE_19_2}: Fd, Fc [pub]; Fw [memory]` },
  'coal-lignite': { label: 'Coal, lignite', fdDscfPerMMBtu: 9860, fwWscfPerMMBtu: 11950, fcScfPerMMBtu: 1910, source: `${TABLE_19_2}: Fd, Fc [pub]; Fw [memory]` },
  wood: { label: 'Wood / wood residue', fdDscfPerMMBtu: 9240, fcScfPerMMBtu: 1830, source: `${TABLE_19_2}: Fd, Fc [pub]` },
  'wood-bark': { label: 'Wood bark', fdDscfPerMMBtu: 9600, fcScfPerMMBtu: 1920, source: `${TABLE_19_2}: Fd, Fc [pub]` },
};

/** One fuel of a mix: its F-factors and its heat input (any consistent unit, e.g. MMBtu or a fraction). */
export interface FuelMixPart {
  fFactors: FFactorSet;
  heatInput: number;
}

/**
 * Heat-input-weighted F-factors of fuels fired together: F = Σ xₖ·Fₖ, xₖ = heat input of
 * fuel k / total heat input. Method 19 §12.3.3 (eq. 19-13 form). Fw is given only when every
 * part has one.
 */
export function mixedFFactors(parts: readonly FuelMixPart[]): FFactorSet {
  if (parts.length === 0) throw new CalcInputError('A fuel mix needs at least one fuel.', 'parts');
  let total = 0;
  for (const [i, p] of parts.entries()) {
    if (!(p.heatInput >= 0 && Number.isFinite(p.heatInput))) {
      throw new CalcInputError(`Heat input of fuel ${i + 1} must be at least 0 (got ${p.heatInput}).`, `parts.${i}.heatInput`);
    }
    if (!(p.fFactors.fdDscfPerMMBtu > 0 && p.fFactors.fcScfPerMMBtu > 0)) {
      throw new CalcInputError(`Fuel ${i + 1} needs positive Fd and Fc.`, `parts.${i}.fFactors`);
    }
    total += p.heatInput;
  }
  if (!(total > 0)) throw new CalcInputError('The fuel mix has no heat input.', 'parts');
  let fd = 0;
  let fc = 0;
  let fw = 0;
  let allFw = true;
  for (const p of parts) {
    const x = p.heatInput / total;
    fd += x * p.fFactors.fdDscfPerMMBtu;
    fc += x * p.fFactors.fcScfPerMMBtu;
    if (p.fFactors.fwWscfPerMMBtu === undefined) allFw = false;
    else fw += x * p.fFactors.fwWscfPerMMBtu;
  }
  return allFw ? { fdDscfPerMMBtu: fd, fwWscfPerMMBtu: fw, fcScfPerMMBtu: fc } : { fdDscfPerMMBtu: fd, fcScfPerMMBtu: fc };
}
