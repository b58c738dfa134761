const formatters = new Map<number, Intl.NumberFormat>();

/**
 * A measured or calculated number as people read it: grouped thousands, at most
 * `maxFractionDigits` decimals, "—" where there is no value.
 * @example formatNumber(1234.5678) //=> "1,234.568"
 * @example formatNumber(null) //=> "—"
 */
export function formatNumber(value: number | null | undefined, maxFractionDigits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  let formatter = formatters.get(maxFractionDigits);
  if (!formatter) {
    formatter = new Intl.NumberFormat('en-GB', { maximumFractionDigits: maxFractionDigits });
    formatters.set(maxFractionDigits, formatter);
  }
  return formatter.format(value);
}
