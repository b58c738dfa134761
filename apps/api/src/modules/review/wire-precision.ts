/**
 * How precisely the review's hourly series travel. The database keeps every hourly value at full
 * double precision and the compliance engine evaluates those; only the copy sent for tables and
 * charts is rounded, to 10 significant digits.
 *
 * Why that is enough: the relative error is at most 5 · 10⁻¹⁰, many orders of magnitude below
 * what the measuring chain resolves (gas analysers and flow meters resolve about 0.1 % of their
 * measuring range, common practice), and a value below 1000 still agrees with an independent
 * computation to better than 10⁻⁶ of its unit, as the review's tests check. Why bother: a full
 * double takes up to 17 significant digits in JSON, and a month of a stack is some 15,000 hourly
 * values, most of the answer's bytes and of its encode and decode time.
 */

/** Significant digits an hourly value keeps on the wire. */
export const WIRE_SIGNIFICANT_DIGITS = 10;

/** 10^0 … 10^22: every power of ten a binary64 holds exactly. */
const EXACT_POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => 10 ** k);

/**
 * `value` rounded for the wire (see the file header); zero unchanged; null for null and for
 * anything not a finite number (a stored NaN arrives from the database as the string "NaN"): the
 * hour shows no value, as the engine treats it.
 *
 * A whole number divided by an exact power of ten is the double nearest the decimal, which
 * JSON.stringify writes as that short decimal.
 *
 * @example
 * toWirePrecision(3.797061794091458) //=> 3.797061794
 * toWirePrecision(50477.963455685924) //=> 50477.96346
 * toWirePrecision(0.000012345678912345) //=> 0.00001234567891
 */
export function toWirePrecision(value: number | null): number | null {
  if (typeof value !== 'number' || !Number.isFinite(value)) return null;
  if (value === 0) return 0;
  const decimals = WIRE_SIGNIFICANT_DIGITS - 1 - Math.floor(Math.log10(Math.abs(value)));
  // From 10^9 up only the decimals go (no real hourly figure is that large). Below 10^-13 the
  // scale is past the exact powers: the slow, exact path (trace values that small are rare).
  if (decimals <= 0) return Math.round(value);
  if (decimals >= EXACT_POWERS_OF_TEN.length) return Number(value.toPrecision(WIRE_SIGNIFICANT_DIGITS));
  const scale = EXACT_POWERS_OF_TEN[decimals]!;
  return Math.round(value * scale) / scale;
}
