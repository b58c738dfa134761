/// <reference path="./exceljs-internals.d.ts" />
/**
 * Reads an uploaded file (.xlsx through exceljs's streaming reader, or CSV) into the sheet
 * interpreter. The first sheet with data is read; a workbook's other sheets are ignored.
 */
import { Readable } from 'node:stream';
import zlib from 'node:zlib';
import ExcelJS from 'exceljs';
import unzipper from 'unzipper';
import excelUtils from 'exceljs/lib/utils/utils';
import type { RawCell } from './cells';
import { readCsv, detectDelimiter } from './csv';
import { decodeText, sniffFileType } from './file-type';
import { SheetInterpreter, SheetRejected, type InterpretOptions, type ParsedSheet } from './sheet-interpreter';
import { SheetXmlReader } from './sheet-xml';

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

/**
 * What the sheet reader uses of exceljs's WorkbookReader (exceljs 4.4): its parsers of the
 * package's small parts, and what they leave behind.
 */
interface WorkbookInternals {
  _parseRels(entry: Readable): Promise<void>;
  _parseWorkbook(entry: Readable): Promise<void>;
  _parseSharedStrings(entry: Readable): AsyncIterable<unknown>;
  _parseStyles(entry: Readable): Promise<void>;
  workbookRels?: { Id: string; Target: string }[];
  model?: { sheets?: { id: number; name: string; rId: string }[] };
  sharedStrings?: ExcelValue[];
  styles: { getStyleModel(id: number): { numFmt?: string } | null };
  properties?: { model?: { date1904?: boolean } };
}

/**
 * Reads one worksheet's rows with our own sheet XML reader (sheet-xml.ts), handing each row to
 * `onRow` as interpreter cells. exceljs still reads the package's other parts (shared strings,
 * styles, date system, sheet names); only the worksheet's XML is ours: saxes (exceljs's SAX
 * parser) and exceljs's per-cell objects took ~0.8 s of the ~1.2 s a month of one-minute data
 * took to parse. Cells come out as exceljs's own workbook loader gives them through `toRawCell`;
 * read-file.test.ts checks that against it.
 */
async function readSheetRows(chunks: AsyncIterable<string | Uint8Array>, workbook: WorkbookInternals, onRow: (rowNumber: number, cells: RawCell[]) => void): Promise<void> {
  const sharedStrings = workbook.sharedStrings;
  const date1904 = workbook.properties?.model?.date1904;
  const sharedCells: (RawCell | undefined)[] = [];
  const reader = new SheetXmlReader(
    {
      sharedString(index) {
        // Without a shared-string table the cell is kept, empty (as exceljs's streaming reader does).
        if (!sharedStrings) return null;
        const entry = sharedStrings[index];
        if (entry === undefined) return undefined;
        // exceljs keeps an empty `<si>` as null; it is the empty string (as exceljs's loader reads it).
        if (entry === null) return '';
        let cell = sharedCells[index];
        if (cell === undefined) sharedCells[index] = cell = toRawCell(entry);
        return cell;
      },
      isDateStyle(id) {
        const model = workbook.styles.getStyleModel(id);
        return model ? excelUtils.isDateFmt(model.numFmt) : undefined;
      },
      serialToDate: (serial) => excelUtils.excelToDate(serial, date1904),
      decodeStr: (text) => excelUtils.xmlDecode(text),
    },
    onRow,
  );
  for await (const chunk of chunks) reader.write(chunk);
  reader.end();
}

/** Receives the rows of one worksheet: row number (1-based) and cells (index 0 = column A). */
export type SheetRowSink = (rowNumber: number, cells: RawCell[]) => void;

export interface SheetRead {
  /** Whether a worksheet with a non-blank cell was found (and read). */
  found: boolean;
  sheetsSeen: number;
  sheetName: string | null;
}

const worksheetPart = /^xl\/worksheets\/sheet(\d+)\.xml$/;

/**
 * Reads the rows of the workbook's first worksheet that has a non-blank cell. `open(date1904)`
 * gives the receiver for each worksheet tried; a worksheet without data is read through and
 * passed over. Throws what the zip reader, exceljs or the sheet reader throws (`parseWorkbook`
 * turns that into a FileRejected).
 *
 * The upload is in memory, so the zip is read through its central directory (unzipper, which
 * exceljs itself uses; parts inflated by Node's zlib): first the parts every sheet depends on, in
 * that order, then the worksheets in the order the zip holds them (the order exceljs's streaming
 * reader emits them in for the files Excel and exceljs write, whose sheets come before their
 * shared strings). Reading the zip as a stream, as exceljs's WorkbookReader does, meant copying
 * each such sheet to a temporary file and reading it back (16.5 MB, about 0.1–0.2 s, for a
 * month of one-minute data for eight channels); nothing is written to disk now.
 */
export async function readFirstSheetWithData(bytes: Buffer, open: (date1904: boolean) => SheetRowSink): Promise<SheetRead> {
  const directory = await unzipper.Open.buffer(bytes);
  const parts = new Map(directory.files.filter((f) => f.type === 'File').map((f) => [f.path, f]));
  const workbook = new ExcelJS.stream.xlsx.WorkbookReader(Readable.from([]), {
    sharedStrings: 'cache',
    styles: 'cache',
    hyperlinks: 'ignore',
    worksheets: 'emit',
  }) as unknown as WorkbookInternals;
  const part = (path: string): Readable | null => {
    const file = parts.get(path);
    return file ? Readable.from(checkedContent(file)) : null;
  };
  const rels = part('xl/_rels/workbook.xml.rels');
  if (rels) await workbook._parseRels(rels);
  const book = part('xl/workbook.xml');
  if (book) await workbook._parseWorkbook(book);
  const sharedStrings = part('xl/sharedStrings.xml');
  if (sharedStrings) for await (const _ of workbook._parseSharedStrings(sharedStrings));
  const styles = part('xl/styles.xml');
  if (styles) await workbook._parseStyles(styles);

  let sheetsSeen = 0;
  for (const [path, file] of parts) {
    const sheetNo = worksheetPart.exec(path)?.[1];
    if (sheetNo === undefined) continue;
    sheetsSeen++;
    let anyRow = false;
    const sink = open(workbook.properties?.model?.date1904 ?? false);
    try {
      await readSheetRows(checkedContent(file), workbook, (rowNumber, cells) => {
        if (!anyRow) {
          for (const cell of cells) {
            if (cell !== null && cell !== undefined && !(typeof cell === 'string' && cell.trim() === '')) {
              anyRow = true;
              break;
            }
          }
        }
        sink(rowNumber, cells);
      });
    } catch (error) {
      // Damage usually garbles the XML before the part's end, where its checksum is checked:
      // a sheet that cannot be read is checked through, so damage is reported as damage.
      if (!(error instanceof DamagedPart)) for await (const _ of checkedContent(file));
      throw error;
    }
    if (anyRow) return { found: true, sheetsSeen, sheetName: sheetNameOf(workbook, sheetNo) };
  }
  return { found: false, sheetsSeen, sheetName: null };
}

/** A part of the zip whose inflated content does not match the size and CRC-32 the zip records. */
class DamagedPart extends Error {}

/**
 * A zip part's content, checked against the CRC-32 and size its central directory records (the
 * zip reader does not check them). A damaged part can still inflate, or be stored uncompressed:
 * without the check, a changed digit in a sheet would be imported as a different value. The
 * check ends the part's stream, so a sheet's rows are refused before anything is staged.
 */
async function* checkedContent(file: ZipPart): AsyncGenerator<Buffer> {
  let crc = 0;
  let size = 0;
  for await (const chunk of file.stream() as AsyncIterable<Buffer>) {
    crc = zlib.crc32(chunk, crc);
    size += chunk.length;
    yield chunk;
  }
  // 0xffffffff: the real size is in the zip64 extra field; the CRC-32 is always here.
  const sizeKnown = file.uncompressedSize !== 0xffffffff;
  if (crc !== file.crc32 || (sizeKnown && size !== file.uncompressedSize)) {
    throw new DamagedPart(`the part ${file.path} does not match its recorded checksum`);
  }
}

type ZipPart = Awaited<ReturnType<typeof unzipper.Open.buffer>>['files'][number];

/** The worksheet's name in the workbook (its tab), found as exceljs's WorkbookReader finds it. */
function sheetNameOf(workbook: WorkbookInternals, sheetNo: string): string {
  const rel = (workbook.workbookRels ?? []).find((r) => r.Target === `worksheets/sheet${sheetNo}.xml`);
  const sheet = rel && (workbook.model?.sheets ?? []).find((s) => s.rId === rel.Id);
  return sheet?.name ?? `Sheet${sheetNo}`;
}

async function parseWorkbook(bytes: Buffer, options: InterpretOptions): Promise<ParsedFile> {
  let interpreter: SheetInterpreter | null = null;
  let sheet: SheetRead;
  try {
    sheet = await readFirstSheetWithData(bytes, (date1904) => {
      const current = new SheetInterpreter({ ...options, date1904 });
      interpreter = current;
      return (rowNumber, cells) => current.push(rowNumber, cells);
    });
    if (sheet.found && interpreter) return { ...(interpreter as SheetInterpreter).finish(), format: 'xlsx', sheetName: sheet.sheetName };
  } catch (error) {
    if (error instanceof SheetRejected || error instanceof FileRejected) rethrow(error);
    throw new FileRejected(422, 'corrupt_workbook', corruptWorkbookMessage(error));
  }
  throw new FileRejected(422, 'empty_sheet', sheet.sheetsSeen === 0 ? 'The workbook has no worksheets.' : 'The workbook has no rows with data.');
}

/** Why a workbook cannot be read, in words (the zip reader's own codes mean nothing to a reader). */
function corruptWorkbookMessage(error: unknown): string {
  const cause = error instanceof Error ? error.message : String(error);
  if (error instanceof DamagedPart) {
    return 'The workbook cannot be read: part of the file is damaged (its content no longer matches the checksum the file records), so values in it cannot be trusted. Export it again and upload the new file.';
  }
  if (cause === 'FILE_ENDED') {
    return 'The workbook cannot be read: the file ends before the workbook does, so it was probably cut short while it was exported, copied or downloaded. Export it again and upload the new file.';
  }
  return `The workbook cannot be read; it may be damaged or incomplete (${cause.slice(0, 120)}).`;
}
