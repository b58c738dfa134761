/**
 * A small CSV reader (RFC 4180 quoting: fields in double quotes may hold the delimiter, line
 * breaks and doubled quotes) with the delimiter detected from the file: logger exports use `,`,
 * `;` (where the decimal separator is a comma) or tabs.
 */

export type CsvDelimiter = ',' | ';' | '\t';

/**
 * The delimiter whose count is the same, and above zero, on each of the first lines. Tab and
 * semicolon are tried first: a `;` file with decimal commas can also have a steady comma count,
 * but a `,` file never has a steady semicolon count.
 */
export function detectDelimiter(text: string): CsvDelimiter {
  const lines = text.split(/\r\n|\n|\r/).filter((line) => line.trim() !== '').slice(0, 20);
  const candidates: CsvDelimiter[] = ['\t', ';', ','];
  for (const delimiter of candidates) {
    const counts = lines.map((line) => countOutsideQuotes(line, delimiter));
    // Title lines above the header may have no delimiter: judge the lines that have one.
    const withDelimiter = counts.filter((count) => count > 0);
    if (withDelimiter.length >= Math.min(2, lines.length) && withDelimiter.every((count) => count === withDelimiter[withDelimiter.length - 1])) {
      return delimiter;
    }
  }
  let best: CsvDelimiter = ',';
  let bestCount = -1;
  for (const delimiter of candidates) {
    const count = lines.reduce((sum, line) => sum + countOutsideQuotes(line, delimiter), 0);
    if (count > bestCount) [best, bestCount] = [delimiter, count];
  }
  return best;
}

function countOutsideQuotes(line: string, delimiter: string): number {
  let count = 0;
  let quoted = false;
  for (const char of line) {
    if (char === '"') quoted = !quoted;
    else if (char === delimiter && !quoted) count++;
  }
  return count;
}

/**
 * Splits CSV text into rows of fields (strings, unquoted). Calls `onRow` for each row so a large
 * file need not be held twice.
 *
 * @example
 * const rows: string[][] = [];
 * readCsv('a;"b;c"\n1,5;2', ';', (row) => rows.push(row));
 * rows //=> [['a', 'b;c'], ['1,5', '2']]
 */
export function readCsv(text: string, delimiter: CsvDelimiter, onRow: (fields: string[], lineNumber: number) => void): void {
  let fields: string[] = [];
  let field = '';
  let quoted = false;
  let line = 1;
  let rowStartLine = 1;
  let i = 0;
  const n = text.length;
  const endRow = (): void => {
    fields.push(field);
    field = '';
    onRow(fields, rowStartLine);
    fields = [];
  };
  while (i < n) {
    const char = text[i]!;
    if (quoted) {
      if (char === '"') {
        if (text[i + 1] === '"') {
          field += '"';
          i += 2;
          continue;
        }
        quoted = false;
      } else {
        if (char === '\n') line++;
        field += char;
      }
      i++;
      continue;
    }
    if (char === '"' && field.trim() === '') {
      quoted = true;
      field = '';
    } else if (char === delimiter) {
      fields.push(field);
      field = '';
    } else if (char === '\n' || char === '\r') {
      endRow();
      if (char === '\r' && text[i + 1] === '\n') i++;
      line++;
      rowStartLine = line;
    } else {
      field += char;
    }
    i++;
  }
  if (field !== '' || fields.length > 0) endRow();
}
