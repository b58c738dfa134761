/** The cell values the workbook and CSV readers hand to the sheet interpreter. */

/** A spreadsheet error cell such as `#N/A` or `#DIV/0!`. */
export interface ErrorCell {
  error: string;
}

/**
 * One cell: empty, a number, text, a boolean, a date (the workbook reader turns date-formatted
 * numbers into Date objects whose UTC fields are the wall clock), or an error.
 */
export type RawCell = null | undefined | number | string | boolean | Date | ErrorCell;

export function isErrorCell(cell: RawCell): cell is ErrorCell {
  return typeof cell === 'object' && cell !== null && !(cell instanceof Date) && 'error' in cell;
}

export function isBlank(cell: RawCell): boolean {
  return cell === null || cell === undefined || (typeof cell === 'string' && cell.trim() === '');
}

/** Spreadsheet column letters: 0 → A, 25 → Z, 26 → AA. */
export function columnLetter(index: number): string {
  let n = index + 1;
  let letters = '';
  while (n > 0) {
    const rem = (n - 1) % 26;
    letters = String.fromCharCode(65 + rem) + letters;
    n = Math.floor((n - 1) / 26);
  }
  return letters;
}

/** How a cell is shown in a problem list. */
export function cellText(cell: RawCell): string {
  if (cell === null || cell === undefined) return '';
  if (cell instanceof Date) return cell.toISOString().replace('T', ' ').replace(/\.000Z$|Z$/, '');
  if (isErrorCell(cell)) return cell.error;
  return String(cell);
}
