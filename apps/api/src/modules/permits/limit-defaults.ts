/**
 * Default reference and ambient O2 of a new limit, by regime, unit type and fuel. They only
 * pre-fill the form: the permit decides, and every value stays editable.
 */
import type { LimitDefaultsDto, LimitDefaultsQuery } from './limits.schemas';

/**
 * IED 2010/75/EU Annex V Part 1 (general provisions, point 1 of the reference conditions) [pub]:
 * 6 % O2 for solid fuels; 3 % for liquid and gaseous fuels in combustion plants other than gas
 * turbines and gas engines; 15 % for gas turbines and gas engines (REFERENCES.md §4).
 */
export const IED_ANNEX_V_PART_1_REFERENCE_O2_PERCENT = { solid: 6, liquidOrGas: 3, turbineOrEngine: 15 } as const;
/** IED Annex VI Part 3 (waste incineration), 11 % O2 [memory]. */
export const IED_ANNEX_VI_REFERENCE_O2_PERCENT = 11;
/** Ambient O2 of the oxygen-correction formula: 21 in the EU (IED Annex VI Part 7 form [memory]), 20.9 in the US (40 CFR 60) [pub]. */
export const AMBIENT_O2_PERCENT = { eu: 21, us: 20.9 } as const;

const IED = 'IED 2010/75/EU Annex V Part 1';

export function limitDefaults(q: LimitDefaultsQuery): LimitDefaultsDto {
  const { regime, unitType, fuelKind } = q;
  if (regime === 'eu_ied') {
    const eu = AMBIENT_O2_PERCENT.eu;
    if (unitType === 'gas_turbine' || unitType === 'engine') {
      return {
        referenceO2Percent: IED_ANNEX_V_PART_1_REFERENCE_O2_PERCENT.turbineOrEngine,
        ambientO2Percent: eu,
        source: `${IED}: 15 % O2 for gas turbines and gas engines`,
      };
    }
    if (unitType === 'incinerator') {
      return {
        referenceO2Percent: IED_ANNEX_VI_REFERENCE_O2_PERCENT,
        ambientO2Percent: eu,
        source: 'IED 2010/75/EU Annex VI Part 3: 11 % O2 for waste incineration [memory]',
      };
    }
    if (fuelKind === 'solid') {
      return { referenceO2Percent: IED_ANNEX_V_PART_1_REFERENCE_O2_PERCENT.solid, ambientO2Percent: eu, source: `${IED}: 6 % O2 for solid fuels` };
    }
    if (fuelKind === 'liquid' || fuelKind === 'gas') {
      return {
        referenceO2Percent: IED_ANNEX_V_PART_1_REFERENCE_O2_PERCENT.liquidOrGas,
        ambientO2Percent: eu,
        source: `${IED}: 3 % O2 for liquid and gaseous fuels (plants other than gas turbines and gas engines)`,
      };
    }
    return {
      referenceO2Percent: null,
      ambientO2Percent: eu,
      source: `${IED}: 6 % O2 for solid, 3 % for liquid and gaseous fuels, 15 % for gas turbines and engines — choose the fuel`,
    };
  }
  if (regime === 'us_epa') {
    if (unitType === 'gas_turbine') {
      return {
        referenceO2Percent: 15,
        ambientO2Percent: AMBIENT_O2_PERCENT.us,
        source: '40 CFR 60 Subpart KKKK: turbine ppm limits at 15 % O2 [memory]; check the permit',
      };
    }
    return {
      referenceO2Percent: null,
      ambientO2Percent: AMBIENT_O2_PERCENT.us,
      source: '40 CFR 60: lb/MMBtu limits use F-factors (Method 19), no reference O2; a ppm limit states its own O2 in the rule',
    };
  }
  return { referenceO2Percent: null, ambientO2Percent: AMBIENT_O2_PERCENT.eu, source: 'No regime default: take the reference O2 from the permit' };
}
