/// <reference path="./exceljs-internals.d.ts" />
/**
 * Reads an uploaded file (.xlsx through exceljs's streaming reader, or CSV) into the sheet
 * interpreter. The first sheet with data is read; a workbook's other sheets are ignored.
 */
import { Readable } from 'node:stream';
import ExcelJS from 'exceljs';
import parseSax from 'exceljs/lib/utils/parse-sax';
import excelUtils from 'exceljs/lib/utils/utils';
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

/** What the lean sheet reader needs of exceljs's WorkbookReader and WorksheetReader (exceljs 4.4). */
interface WorkbookInternals {
  sharedStrings?: ExcelValue[];
  styles: { getStyleModel(id: number): { numFmt?: string } | null };
  properties?: { model?: { date1904?: boolean } };
}
interface WorksheetInternals {
  name?: string;
  iterator: AsyncIterable<unknown>;
}

/** Column number (1-based) of a cell reference such as "AB12". */
function columnOfRef(ref: string): number {
  let col = 0;
  for (let i = 0; i < ref.length; i++) {
    const code = ref.charCodeAt(i);
    if (code < 65 || code > 90) break;
    col = col * 26 + (code - 64);
  }
  return col;
}

/**
 * Reads one worksheet's rows with exceljs's own SAX events and value rules (shared strings,
 * inline strings, errors, booleans, formulas' cached results, date formats from the cell's or
 * the row's style), handing each row to `onRow` as interpreter cells. This replaces exceljs's
 * row iterator, which builds a Row, a Cell per cell and a style object per cell and resolves one
 * promise per row: for a month of one-minute data (450,000 cells) that object churn cost about
 * as much as the XML parsing itself. Cells come out as exceljs's `row.values` would give them
 * through `toRawCell`. Unlike exceljs, rows or cells without a reference (`r`) are placed after
 * the previous one instead of failing.
 */
async function readSheetRows(worksheet: WorksheetInternals, workbook: WorkbookInternals, onRow: (rowNumber: number, cells: RawCell[]) => void): Promise<void> {
  const sharedStrings = workbook.sharedStrings;
  const date1904 = workbook.properties?.model?.date1904;
  const dateStyle = new Map<number, boolean>();
  const isDateStyle = (id: number): boolean | undefined => {
    let known = dateStyle.get(id);
    if (known === undefined) {
      const model = workbook.styles.getStyleModel(id);
      if (!model) return undefined;
      known = excelUtils.isDateFmt(model.numFmt);
      dateStyle.set(id, known);
    }
    return known;
  };

  let inRows = false;
  let inRow = false;
  let rowNumber = 0;
  let rowIsDate = false;
  let cells: RawCell[] = [];
  let width = 0;
  let column = 0;
  // The cell being read: its type, style, formula and value text (exceljs keeps appending text to
  // the last opened f/v/t element until the next one opens; so does this).
  let inCell = false;
  let cellType: string | undefined;
  let cellStyle = 0;
  let formula: string | null = null;
  let valueText: string | null = null;
  let current: 'f' | 'v' | null = null;

  for await (const events of parseSax(worksheet.iterator)) {
    for (const event of events) {
      if (event.eventType === 'text') {
        if (current === 'v') valueText += event.value;
        else if (current === 'f') formula += event.value;
        continue;
      }
      const node = event.value;
      if (event.eventType === 'opentag') {
        switch (node.name) {
          case 'sheetData':
            inRows = true;
            break;
          case 'row':
            if (!inRows) break;
            inRow = true;
            rowNumber = node.attributes.r !== undefined ? parseInt(node.attributes.r, 10) : rowNumber + 1;
            rowIsDate = node.attributes.s ? isDateStyle(parseInt(node.attributes.s, 10)) === true : false;
            cells = [];
            width = 0;
            column = 0;
            break;
          case 'c':
            if (!inRow) break;
            inCell = true;
            column = node.attributes.r !== undefined ? columnOfRef(node.attributes.r) : column + 1;
            cellType = node.attributes.t;
            cellStyle = parseInt(node.attributes.s ?? '', 10);
            formula = null;
            valueText = null;
            current = null;
            break;
          case 'f':
            if (inCell) {
              formula = '';
              current = 'f';
            }
            break;
          case 'v':
          case 'is':
          case 't':
            if (inCell) {
              valueText = '';
              current = 'v';
            }
            break;
          default:
            break;
        }
        continue;
      }
      // closetag
      if (node.name === 'c' && inCell) {
        inCell = false;
        let value: RawCell | undefined;
        let present = true;
        if (valueText === null) {
          // No value: a formula without a cached result still counts as a cell (exceljs keeps it).
          present = formula !== null;
          value = null;
        } else if (formula !== null) {
          value = cellType === 'str' ? excelUtils.xmlDecode(valueText) : parseFloat(valueText);
        } else {
          switch (cellType) {
            case 's': {
              const index = parseInt(valueText, 10);
              value = sharedStrings ? toRawCell(sharedStrings[index]) : null;
              present = sharedStrings ? sharedStrings[index] !== null && sharedStrings[index] !== undefined : true;
              break;
            }
            case 'inlineStr':
            case 'str':
              value = excelUtils.xmlDecode(valueText);
              break;
            case 'e':
              value = { error: valueText };
              break;
            case 'b':
              value = parseInt(valueText, 10) !== 0;
              break;
            default: {
              const own = cellStyle ? isDateStyle(cellStyle) : undefined;
              const number = parseFloat(valueText);
              value = (own ?? rowIsDate) ? excelUtils.excelToDate(number, date1904) : number;
            }
          }
        }
        if (present && column > 0) {
          while (cells.length < column - 1) cells.push(null);
          cells[column - 1] = value ?? null;
          if (column > width) width = column;
        }
      } else if (node.name === 'row' && inRow) {
        inRow = false;
        cells.length = width;
        onRow(rowNumber, cells);
      } else if (node.name === 'sheetData') {
        inRows = false;
      }
    }
  }
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
      const workbook = reader as unknown as WorkbookInternals;
      const date1904 = workbook.properties?.model?.date1904 ?? false;
      const interpreter = new SheetInterpreter({ ...options, date1904 });
      let anyRow = false;
      await readSheetRows(worksheet as unknown as WorksheetInternals, workbook, (rowNumber, cells) => {
        if (!anyRow) {
          for (const cell of cells) {
            if (cell !== null && !(typeof cell === 'string' && cell.trim() === '')) {
              anyRow = true;
              break;
            }
          }
        }
        interpreter.push(rowNumber, cells);
      });
      if (!anyRow) continue;
      const name = (worksheet as unknown as WorksheetInternals).name ?? null;
      return { ...interpreter.finish(), format: 'xlsx', sheetName: name };
    }
  } catch (error) {
    if (error instanceof SheetRejected || error instanceof FileRejected) rethrow(error);
    throw new FileRejected(422, 'corrupt_workbook', `The workbook cannot be read; it may be damaged or incomplete (${(error as Error).message.slice(0, 120)}).`);
  }
  throw new FileRejected(422, 'empty_sheet', sheetsSeen === 0 ? 'The workbook has no worksheets.' : 'The workbook has no rows with data.');
}
