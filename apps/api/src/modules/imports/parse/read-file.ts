/**
 * Reads an uploaded file (.xlsx through exceljs's streaming reader, or CSV) into the sheet
 * interpreter. The first sheet with data is read; a workbook's other sheets are ignored.
 */
import { Readable } from 'node:stream';
import ExcelJS from 'exceljs';
import type { RawCell } from './cells';
import { readCsv, detectDelimiter } from './csv';
import { decodeText, sniffFileType } from './file-type';
import { SheetInterpreter, SheetRejected, type InterpretOptions, type ParsedSheet } from './sheet-interpreter';

export type FileFormat = 'xlsx' | 'csv';

export interface ParsedFile extends ParsedSheet {
  format: FileFormat;
  sheetName: string | null;
}

/** Why a file cannot be read at all; `status` is the HTTP status it is answered with. */
export class FileRejected extends Error {
  constructor(
    readonly status: 415 | 422,
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

export async function parseImportFile(bytes: Buffer, options: InterpretOptions): Promise<ParsedFile> {
  const sniffed = sniffFileType(bytes);
  switch (sniffed.kind) {
    case 'xlsx':
      return parseWorkbook(bytes, options);
    case 'csv':
      return parseCsvFile(bytes, options);
    case 'encrypted_workbook':
      throw new FileRejected(422, 'password_protected', 'This is a password-protected workbook. Remove the password in Excel (File › Info › Protect Workbook), save, and upload again.');
    case 'legacy_xls':
      throw new FileRejected(415, 'legacy_xls', 'This is an old Excel 97–2003 (.xls) file. Save it as an Excel workbook (.xlsx) or as CSV and upload again.');
    case 'zip_not_workbook':
      throw new FileRejected(415, 'not_a_workbook', 'This is a ZIP file but not an Excel workbook (.xlsx).');
    case 'empty':
      throw new FileRejected(422, 'empty_file', 'The file is empty.');
    default:
      throw new FileRejected(415, 'not_a_workbook', 'This is neither an Excel workbook (.xlsx) nor a CSV file.');
  }
}

function rethrow(error: unknown): never {
  if (error instanceof SheetRejected) throw new FileRejected(422, error.code, error.message);
  throw error;
}

// ---- CSV ----------------------------------------------------------------------------------------

function parseCsvFile(bytes: Buffer, options: InterpretOptions): ParsedFile {
  const text = decodeText(bytes);
  const delimiter = detectDelimiter(text);
  const interpreter = new SheetInterpreter(options);
  try {
    readCsv(text, delimiter, (fields, line) => interpreter.push(line, fields.map((f) => (f.trim() === '' ? null : f))));
    return { ...interpreter.finish(), format: 'csv', sheetName: null };
  } catch (error) {
    rethrow(error);
  }
}

// ---- xlsx ---------------------------------------------------------------------------------------

type ExcelValue = ExcelJS.CellValue | undefined;

/** exceljs cell values → the interpreter's cells (formulas give their cached result). */
export function toRawCell(value: ExcelValue): RawCell {
  if (value === null || value === undefined) return null;
  if (typeof value === 'number' || typeof value === 'string' || typeof value === 'boolean' || value instanceof Date) return value;
  if (typeof value === 'object') {
    if ('error' in value && typeof value.error === 'string') return { error: value.error };
    if ('result' in value) return toRawCell(value.result as ExcelValue);
    if ('formula' in value || 'sharedFormula' in value) return null;
    if ('richText' in value && Array.isArray(value.richText)) return value.richText.map((part) => part.text).join('');
    if ('text' in value && typeof value.text === 'string') return value.text;
  }
  return String(value);
}

async function parseWorkbook(bytes: Buffer, options: InterpretOptions): Promise<ParsedFile> {
  const reader = new ExcelJS.stream.xlsx.WorkbookReader(Readable.from([bytes]), {
    entries: 'emit',
    sharedStrings: 'cache',
    styles: 'cache',
    hyperlinks: 'ignore',
    worksheets: 'emit',
  });
  let sheetsSeen = 0;
  try {
    for await (const worksheet of reader) {
      sheetsSeen++;
      const readerProps = reader as unknown as { properties?: { model?: { date1904?: boolean } } };
      const date1904 = readerProps.properties?.model?.date1904 ?? false;
      const interpreter = new SheetInterpreter({ ...options, date1904 });
      let anyRow = false;
      for await (const row of worksheet as unknown as AsyncIterable<ExcelJS.Row>) {
        const values = row.values as ExcelValue[];
        const cells: RawCell[] = [];
        // row.values is 1-based (index 0 is empty).
        for (let c = 1; c < values.length; c++) cells.push(toRawCell(values[c]));
        if (cells.some((cell) => cell !== null && !(typeof cell === 'string' && cell.trim() === ''))) anyRow = true;
        interpreter.push(row.number, cells);
      }
      if (!anyRow) continue;
      const name = (worksheet as unknown as { name?: string }).name ?? null;
      return { ...interpreter.finish(), format: 'xlsx', sheetName: name };
    }
  } catch (error) {
    if (error instanceof SheetRejected || error instanceof FileRejected) rethrow(error);
    throw new FileRejected(422, 'corrupt_workbook', `The workbook cannot be read; it may be damaged or incomplete (${(error as Error).message.slice(0, 120)}).`);
  }
  throw new FileRejected(422, 'empty_sheet', sheetsSeen === 0 ? 'The workbook has no worksheets.' : 'The workbook has no rows with data.');
}
