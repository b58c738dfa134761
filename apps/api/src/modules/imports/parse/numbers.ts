/**
 * Numbers written as text, as loggers and spreadsheets in different locales write them:
 * `12.5`, `12,5`, `-0.03`, `1.5E-3`, `1,234.5` (comma groups, dot decimal), `1.234,5` (dot groups,
 * comma decimal), `1 234,5` (space groups). A lone comma is a decimal comma (`1,234` → 1.234):
 * logger exports do not group thousands without decimals, while `;`-separated exports with decimal
 * commas are common.
 */

const plain = /^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?$/;
const commaGroupsDotDecimal = /^[+-]?\d{1,3}(,\d{3})+(\.\d+)?$/;
const dotGroupsCommaDecimal = /^[+-]?\d{1,3}(\.\d{3})+(,\d+)?$/;
const spaceGroups = /^[+-]?\d{1,3}( \d{3})+([.,]\d+)?$/;

/**
 * Parses a decimal number written as text; null when the text is not a number.
 *
 * @example
 * parseDecimalText('12,5')      //=> 12.5
 * parseDecimalText('1.234,5')   //=> 1234.5
 * parseDecimalText('1,234.5')   //=> 1234.5
 * parseDecimalText('n/a')       //=> null
 */
export function parseDecimalText(raw: string): number | null {
  // Non-breaking and thin spaces appear as group separators in exports from some locales.
  const text = raw.trim().replace(/[\u00a0\u202f\u2009]/g, ' ');
  if (text === '') return null;
  let normalised: string;
  if (plain.test(text)) normalised = text.replace(',', '.');
  else if (commaGroupsDotDecimal.test(text) && text.includes('.')) normalised = text.replace(/,/g, '');
  else if (dotGroupsCommaDecimal.test(text) && text.includes(',')) normalised = text.replace(/\./g, '').replace(',', '.');
  else if (spaceGroups.test(text)) normalised = text.replace(/ /g, '').replace(',', '.');
  else return null;
  const value = Number(normalised);
  return Number.isFinite(value) ? value : null;
}
