const formatters = new Map<string, Intl.NumberFormat>();

/**
 * A measured or calculated number as people read it: grouped thousands, at most
 * `maxFractionDigits` decimals (and at least `minFractionDigits`, so a column of figures lines
 * up), "—" where there is no value.
 * @example formatNumber(1234.5678) //=> "1,234.568"
 * @example formatNumber(7.1, 2, 2) //=> "7.10"
 * @example formatNumber(null) //=> "—"
 */
export function formatNumber(value: number | null | undefined, maxFractionDigits = 3, minFractionDigits = 0): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const key = `${minFractionDigits}-${maxFractionDigits}`;
  let formatter = formatters.get(key);
  if (!formatter) {
    formatter = new Intl.NumberFormat('en-GB', {
      minimumFractionDigits: Math.min(minFractionDigits, maxFractionDigits),
      maximumFractionDigits: maxFractionDigits,
    });
    formatters.set(key, formatter);
  }
  return formatter.format(value);
}

/**
 * How many decimals a concentration, rate or condition in `unit` is read with. Emission rates per
 * heat input are small numbers (an ELV of 0.2 lb/MMBtu): one decimal would hide the whole
 * margin, so they get three, as US reports state them [memory, 40 CFR 75 rounding practice];
 * mg/Nm3 and ppm get one, as monitoring reports commonly show them (common practice).
 * @example fractionDigitsFor('lb/MMBtu') //=> 3
 * @example fractionDigitsFor('mg/Nm3') //=> 1
 */
export function fractionDigitsFor(unit: string): number {
  switch (unit) {
    case 'lb/MMBtu':
      return 3;
    case '%':
    case 'ug/Nm3':
    case 'kg/h':
    case 'kPa':
    case 'MW':
    case 't/h':
      return 2;
    case 'Nm3/h':
    case 'm3/h':
    case 'scfh':
    case 't/yr':
      return 0;
    default:
      // mg/Nm3, ppm, ng/J, °C, °F, K, hPa
      return 1;
  }
}

/**
 * A value in `unit` with the decimals that unit is read with, always the same count, so the
 * figures of a column line up.
 * @example formatInUnit(7.1, 'mg/Nm3') //=> "7.1"
 * @example formatInUnit(0.1534, 'lb/MMBtu') //=> "0.153"
 */
export function formatInUnit(value: number | null | undefined, unit: string): string {
  const digits = fractionDigitsFor(unit);
  return formatNumber(value, digits, digits);
}
