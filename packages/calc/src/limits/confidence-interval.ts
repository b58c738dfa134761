/**
 * 95 % confidence interval of a single measured result, % of the ELV, for large combustion
 * plants (IED 2010/75/EU Annex V Part 3 point 9 [pub]). Kept apart from the zod limit schemas so
 * the browser can pre-fill a form with it without loading zod.
 */
export const IED_LCP_CONFIDENCE_INTERVAL_PERCENT = { CO: 10, SO2: 20, NOx: 20, dust: 30 } as const;
export type IedLcpPollutant = keyof typeof IED_LCP_CONFIDENCE_INTERVAL_PERCENT;
