/**
 * The .xlsx reader (exceljs's WorkbookReader for the package + our sheet XML reader) against an
 * independent reference: exceljs's own non-streaming loader (`workbook.xlsx.load`), whose
 * `row.values` go through the same `toRawCell`. Workbooks are written with exceljs's normal
 * Workbook API; what exceljs cannot write (prefixed names, missing references, CDATA, row styles
 * …) is hand-written into a workbook's sheet part and checked against literal expectations.
 */
import { readdirSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PassThrough } from 'node:stream';
import ExcelJS from 'exceljs';
import fc from 'fast-check';
import JSZip from 'jszip';
import type { RawCell } from './cells';
import { FileRejected, parseImportFile, readFirstSheetWithData, toRawCell } from './read-file';
import { SheetXmlError } from './sheet-xml';
import type { InterpretOptions } from './sheet-interpreter';

type Row = [rowNumber: number, cells: RawCell[]];
interface SheetRows {
  sheetName: string | null;
  rows: Row[];
}

const isBlankCell = (cell: RawCell): boolean => cell === null || cell === undefined || (typeof cell === 'string' && cell.trim() === '');

/** Rows as our reader gives them, read once (rows without cells left out, as exceljs's eachRow leaves them out). */
async function readOurs(bytes: Buffer): Promise<SheetRows> {
  let rows: Row[] = [];
  const sheet = await readFirstSheetWithData(bytes, () => {
    rows = [];
    return (rowNumber, cells) => rows.push([rowNumber, cells]);
  });
  if (!sheet.found) return { sheetName: null, rows: [] };
  return { sheetName: sheet.sheetName, rows: rows.filter(([, cells]) => cells.length > 0) };
}

/** Rows as exceljs's non-streaming loader gives them: `row.values` through `toRawCell`. */
async function readReference(bytes: Buffer): Promise<SheetRows> {
  const workbook = new ExcelJS.Workbook();
  await workbook.xlsx.load(bytes as unknown as ExcelJS.Buffer);
  for (const worksheet of workbook.worksheets) {
    const rows: Row[] = [];
    worksheet.eachRow((row, rowNumber) => {
      const values = row.values as ExcelJS.CellValue[];
      rows.push([
        rowNumber,
        Array.from({ length: Math.max(0, values.length - 1) }, (_, k) => {
          const cell = row.getCell(k + 1);
          // exceljs's `value` of a formula leaves out a cached result that is falsy (0, false, ''):
          // its FormulaValue copies only truthy fields (exceljs 4.4 lib/doc/cell.js _copyModel). The
          // loaded result itself is right, so it is taken from the cell's `result`.
          if (cell.type === ExcelJS.ValueType.Formula) return toRawCell({ formula: cell.formula, result: cell.result } as ExcelJS.CellValue);
          return toRawCell(values[k + 1]);
        }),
      ]);
    });
    if (rows.some(([, cells]) => cells.some((cell) => !isBlankCell(cell)))) return { sheetName: worksheet.name, rows };
  }
  return { sheetName: null, rows: [] };
}

/** Dates compared by their time value (an Invalid Date equals another), numbers with Object.is (NaN, -0). */
function comparable(sheet: SheetRows): unknown {
  return {
    sheetName: sheet.sheetName,
    rows: sheet.rows.map(([n, cells]) => [n, cells.map((cell) => (cell instanceof Date ? { date: cell.getTime() } : cell))]),
  };
}


async function expectSameAsReference(bytes: Buffer): Promise<SheetRows> {
  const reference = await readReference(bytes);
  const ours = await readOurs(bytes);
  expect(comparable(ours)).toEqual(comparable(reference));
  return ours;
}

async function bufferOf(workbook: ExcelJS.Workbook): Promise<Buffer> {
  return Buffer.from(await workbook.xlsx.writeBuffer());
}

/**
 * The same cells written by exceljs's streaming writer without shared strings, the way it writes
 * them: text as `t="str"`, rich text as `t="inlineStr"` (the Workbook API always shares strings).
 */
async function streamedWithoutSharedStrings(workbook: ExcelJS.Workbook): Promise<Buffer> {
  const sink = new PassThrough();
  const chunks: Buffer[] = [];
  sink.on('data', (chunk: Buffer) => chunks.push(chunk));
  const ended = new Promise((resolve) => sink.on('end', resolve));
  const writer = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: sink, useSharedStrings: false, useStyles: true });
  for (const source of workbook.worksheets) {
    const target = writer.addWorksheet(source.name);
    source.eachRow((row, rowNumber) => {
      const copy = target.getRow(rowNumber);
      row.eachCell({ includeEmpty: true }, (cell, column) => {
        copy.getCell(column).value = cell.value;
        if (cell.numFmt) copy.getCell(column).numFmt = cell.numFmt;
      });
      copy.commit();
    });
    target.commit();
  }
  await writer.commit();
  await ended;
  return Buffer.concat(chunks);
}

const wall = (y: number, mo: number, d: number, h = 0, mi = 0, s = 0): Date => new Date(Date.UTC(y, mo - 1, d, h, mi, s));

/** One workbook with every kind of cell exceljs writes; the first sheet is empty, so the second is read. */
function casesWorkbook(date1904 = false): ExcelJS.Workbook {
  const workbook = new ExcelJS.Workbook();
  workbook.properties.date1904 = date1904;
  workbook.addWorksheet('Empty first');
  const ws = workbook.addWorksheet('Cases');
  ws.getRow(1).values = ['Time stamp', 'NOx <mg/Nm³> & "dry"', "O₂ 'ref'", '  padded  ', 'line\nbreak', 'tab\there', 'emoji 🔥 中文', '&amp; as text', '#N/A as text', 'CR\r\nLF'];
  ws.getRow(2).values = [0, 1, -1.5, Math.PI, 1e-7, 1.5e21, 0.1 + 0.2, Number.MAX_SAFE_INTEGER, 2 ** 53 + 2, 5e-324, Number.MAX_VALUE, -123456.789];
  const dates = ws.getRow(3);
  dates.values = [wall(2026, 12, 1, 0, 1), wall(2026, 12, 1, 12, 0, 30), wall(1999, 12, 31, 23, 59), wall(2026, 3, 29, 2, 30), 46357.25, 46357.25, 0.5, 46357.25, 46357.25];
  dates.getCell(1).numFmt = 'yyyy-mm-dd hh:mm';
  dates.getCell(3).numFmt = 'dd.mm.yyyy';
  dates.getCell(5).numFmt = '[h]:mm'; // a date format once the [..] part is dropped
  dates.getCell(6).numFmt = '0.00'; // a number format
  dates.getCell(7).numFmt = 'hh:mm:ss';
  dates.getCell(8).numFmt = '"Day" 0'; // quoted text is not a date code
  dates.getCell(9).numFmt = 'mmm-yy';
  ws.getRow(4).values = [true, false, { error: '#N/A' }, { error: '#DIV/0!' }, { error: '#VALUE!' }, { error: '#REF!' }, { error: '#NAME?' }, { error: '#NUM!' }, { error: '#NULL!' }];
  ws.getRow(5).values = [
    { formula: 'B2*2', result: 2 },
    { formula: 'A1&"x"', result: 'Time stampx' },
    { formula: 'TRUE()', result: true },
    { formula: '1/0', result: { error: '#DIV/0!' } },
    { formula: 'A3+1', result: wall(2026, 12, 2, 0, 1) },
    { formula: 'B2+1' },
    { formula: 'A1&""', result: 'a & <b>' },
  ];
  ws.getCell('E5').numFmt = 'yyyy-mm-dd hh:mm';
  // Row 6 and 7 empty; row 8 sparse; row 9 as wide as a sheet goes (column XFD = 16384).
  ws.getCell('A8').value = 'A8';
  ws.getCell('Z8').value = 26;
  ws.getCell('AB8').value = 28;
  ws.getCell('A9').value = 1;
  ws.getCell('XFD9').value = 'last column';
  ws.getCell('A10').value = { richText: [{ text: 'Bold', font: { bold: true } }, { text: ' and plain' }] };
  ws.getCell('B10').value = { richText: [{ text: 'x' }] };
  ws.getCell('A11').value = { text: 'Site page', hyperlink: 'https://example.org/site' };
  ws.getCell('C12').value = { formula: 'A12*2', result: 2, shareType: 'shared', ref: 'C12:E12' } as ExcelJS.CellValue;
  ws.getCell('D12').value = { sharedFormula: 'C12', result: 4 };
  ws.getCell('E12').value = { sharedFormula: 'C12', result: 6 };
  ws.getCell('F12').value = { formula: 'ROW()', result: 12, shareType: 'array', ref: 'F12' } as ExcelJS.CellValue;
  // A styled empty cell: no value, so the row has no cells; one before a value is a null.
  ws.getCell('A13').numFmt = '0.00';
  ws.getCell('A14').numFmt = '0.00';
  ws.getCell('B14').value = 5;
  ws.getCell('A15').value = '';
  ws.getCell('B15').value = '   ';
  ws.getCell('C15').value = 'after blanks';
  return workbook;
}

const options: InterpretOptions = { timeZone: 'Europe/Berlin', country: 'DE', intervalConvention: 'interval_end' };

describe('.xlsx reader, against exceljs’s own workbook loader', () => {
  it('reads every kind of cell (shared strings) as exceljs does', async () => {
    const rows = await expectSameAsReference(await bufferOf(casesWorkbook()));
    // The reference itself is checked on a few known values, so a wrong pair cannot agree unseen.
    const byRow = new Map(rows.rows);
    expect(rows.sheetName).toBe('Cases');
    expect(byRow.get(1)![1]).toBe('NOx <mg/Nm³> & "dry"');
    expect(byRow.get(1)![9]).toBe('CR\nLF'); // XML 1.0 §2.11: CR LF is read as LF
    expect(byRow.get(2)).toEqual([0, 1, -1.5, Math.PI, 1e-7, 1.5e21, 0.1 + 0.2, Number.MAX_SAFE_INTEGER, 2 ** 53 + 2, 5e-324, Number.MAX_VALUE, -123456.789]);
    expect(byRow.get(3)!.slice(0, 2)).toEqual([wall(2026, 12, 1, 0, 1), wall(2026, 12, 1, 12, 0, 30)]);
    expect(byRow.get(3)![5]).toBe(46357.25);
    expect(byRow.get(3)![7]).toBe(46357.25);
    expect(byRow.get(4)!.slice(0, 3)).toEqual([true, false, { error: '#N/A' }]);
    expect(byRow.get(5)).toEqual([2, 'Time stampx', true, { error: '#DIV/0!' }, wall(2026, 12, 2, 0, 1), null, 'a & <b>']);
    expect(byRow.get(9)!.length).toBe(16384);
    expect(byRow.get(9)![16383]).toBe('last column');
    expect(byRow.get(10)).toEqual(['Bold and plain', 'x']);
    expect(byRow.get(12)).toEqual([null, null, 2, 4, 6, 12]);
    expect(byRow.has(13)).toBe(false);
    expect(byRow.get(14)).toEqual([null, 5]);
  });

  it('reads the same workbook written without shared strings (str and inlineStr cells)', async () => {
    const bytes = await streamedWithoutSharedStrings(casesWorkbook());
    const zip = await JSZip.loadAsync(bytes);
    const sheetXml = await zip.file('xl/worksheets/sheet2.xml')!.async('string');
    expect(sheetXml).toContain('t="inlineStr"');
    expect(sheetXml).toContain('t="str"');
    const rows = await expectSameAsReference(bytes);
    expect(new Map(rows.rows).get(10)).toEqual(['Bold and plain', 'x']);
  });

  it('reads dates of a workbook in the 1904 date system', async () => {
    const rows = await expectSameAsReference(await bufferOf(casesWorkbook(true)));
    expect(new Map(rows.rows).get(3)!.slice(0, 2)).toEqual([wall(2026, 12, 1, 0, 1), wall(2026, 12, 1, 12, 0, 30)]);
  });

  it('reads a logger-style export from exceljs’s streaming writer (title, units row, date column style, gaps) as exceljs does', async () => {
    // The demo data's layout (demo-data.ts), two days of minutes: loading a whole month with
    // exceljs's non-streaming loader takes ~20 s here.
    const sink = new PassThrough();
    const chunks: Buffer[] = [];
    sink.on('data', (chunk: Buffer) => chunks.push(chunk));
    const ended = new Promise((resolve) => sink.on('end', resolve));
    const writer = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: sink, useStyles: true, useSharedStrings: false });
    const sheet = writer.addWorksheet('Minute values');
    sheet.columns = [{ key: 't', width: 18, style: { numFmt: 'yyyy-mm-dd hh:mm' } }, { key: 'nox' }, { key: 'o2' }, { key: 'status' }];
    sheet.addRow(['Invented logger export — one-minute averages']).commit();
    sheet.addRow([]).commit();
    sheet.addRow(['Time stamp', 'NOx [mg/Nm³] dry', 'O₂ [%] dry', 'Status']).commit();
    sheet.addRow(['local time', 'mg/Nm³', '%', '']).commit();
    for (let minute = 1; minute <= 2 * 1440; minute++) {
      const fault = minute % 97 === 0;
      sheet.addRow([wall(2026, 12, 1, 0, minute), fault ? null : 60 + (minute % 13) * 0.7, fault ? null : 3 + (minute % 7) / 10, fault ? 'FAULT' : 'OK']).commit();
    }
    sheet.commit();
    await writer.commit();
    await ended;
    const rows = await expectSameAsReference(Buffer.concat(chunks));
    expect(rows.rows.length).toBe(4 + 2 * 1440 - 1); // the empty row has no cells
    expect(rows.rows[3]![1].slice(0, 3)).toEqual([wall(2026, 12, 1, 0, 1), 60.7, 3.1]);
  });

  it('agrees on random grids of numbers, text, dates, booleans, blanks, errors and formulas', async () => {
    // Text XML can carry: no C0 controls but tab/LF/CR, no U+FFFE/U+FFFF (W3C XML 1.0 §2.2).
    const text = fc.string({ unit: 'grapheme', maxLength: 12 }).filter((s) => !/[\x00-\x08\x0B\x0C\x0E-\x1F\uFFFE\uFFFF]/.test(s));
    const tricky = fc.constantFrom('a&b', '<x>', '&amp;', '"q"', "'", ' lead', 'trail ', '\r\n', '°C', '🔥', '&#65;', ']]>');
    const finite = fc.double({ noNaN: true, noDefaultInfinity: true });
    const date = fc.date({ min: wall(1900, 3, 1), max: wall(2100, 12, 31), noInvalidDate: true });
    const error = fc.constantFrom('#N/A', '#DIV/0!', '#VALUE!', '#REF!', '#NAME?', '#NUM!', '#NULL!').map((e) => ({ error: e }) as ExcelJS.CellErrorValue);
    const result = fc.oneof(finite, text, fc.boolean(), error, date);
    const cell = fc.oneof(
      fc.constant(null),
      finite,
      fc.integer({ min: -1e9, max: 1e9 }),
      text,
      tricky,
      date,
      fc.boolean(),
      error,
      fc.record({ formula: fc.constantFrom('A1+1', 'NOW()', 'B2&"x"'), result }, { requiredKeys: ['formula'] }),
    );
    const format = fc.constantFrom(undefined, '0.00', 'yyyy-mm-dd hh:mm', 'dd.mm.yyyy', '[h]:mm', '"on" dd');
    const grid = fc.array(fc.array(fc.tuple(cell, format), { maxLength: 6 }), { minLength: 1, maxLength: 6 });
    await fc.assert(
      fc.asyncProperty(grid, fc.boolean(), fc.boolean(), async (rows, sharedStrings, date1904) => {
        const workbook = new ExcelJS.Workbook();
        workbook.properties.date1904 = date1904;
        const ws = workbook.addWorksheet('Grid');
        rows.forEach((cells, r) =>
          cells.forEach(([value, numFmt], c) => {
            const target = ws.getCell(r + 1, c + 1);
            target.value = value as ExcelJS.CellValue;
            // exceljs's loader turns any formula result in a date-formatted cell into a Date, even
            // text, booleans and errors (an Invalid Date or a day of 1899); we keep those as they are,
            // so such pairs are not generated. Text cells are not formatted either.
            const result = value !== null && typeof value === 'object' && 'formula' in value ? value.result : undefined;
            const nonNumericResult = typeof result === 'string' || typeof result === 'boolean' || (typeof result === 'object' && result !== null && 'error' in result);
            if (numFmt && typeof value !== 'string' && !nonNumericResult) target.numFmt = numFmt;
          }),
        );
        const bytes = sharedStrings ? await bufferOf(workbook) : await streamedWithoutSharedStrings(workbook);
        const reference = await readReference(bytes);
        const ours = await readOurs(bytes);
        expect(comparable(ours)).toEqual(comparable(reference));
      }),
      { numRuns: Number(process.env.GRID_RUNS ?? 80) },
    );
  }, 120_000);
});

function sizeOf(path: string): number {
  try {
    return statSync(path).size;
  } catch {
    return -1; // removed meanwhile
  }
}

describe('.xlsx reader, temporary files', () => {
  it('leaves no copy of the uploaded sheet in the temp folder', async () => {
    // exceljs's streaming reader copied a sheet that comes before the shared strings to a temp
    // file (tmp-…) and kept it when its iteration stopped early; the zip is read from memory now,
    // and a sheet of a size no other file here has shows that no copy is left behind either way.
    const workbook = new ExcelJS.Workbook();
    const ws = workbook.addWorksheet('Data');
    ws.addRow(['Time stamp', 'NOx', `run ${process.pid}-${Date.now()}`]);
    for (let minute = 1; minute <= 500; minute++) ws.addRow([wall(2026, 12, 1, 0, minute), 60 + (minute % 17)]);
    const bytes = await bufferOf(workbook);
    const sheetBytes = (await (await JSZip.loadAsync(bytes)).file('xl/worksheets/sheet1.xml')!.async('nodebuffer')).length;
    const copies = (): string[] => readdirSync(tmpdir()).filter((name) => name.startsWith('tmp-') && sizeOf(join(tmpdir(), name)) === sheetBytes);
    const before = new Set(copies());
    const newCopies = (): string[] => copies().filter((name) => !before.has(name));
    const rows = await readOurs(bytes);
    expect(rows.rows.length).toBe(501);
    // exceljs removes the copy asynchronously.
    for (let waited = 0; waited < 2000 && newCopies().length > 0; waited += 50) await new Promise((resolve) => setTimeout(resolve, 50));
    expect(newCopies()).toEqual([]);
  });

  it('leaves no copy of a sheet it refuses', async () => {
    const xml = `<worksheet xmlns="${spreadsheetNs}"><sheetData><row r="1"><c r="A1"><v>1</v></c></row><row r="2"><c r="A2"><v>2&nbsp;</v></c></row>${'<row/>'.repeat(997 + (process.pid % 1000))}</sheetData></worksheet>`;
    const bytes = await workbookWithSheet(xml);
    const copies = (): string[] => readdirSync(tmpdir()).filter((name) => name.startsWith('tmp-') && sizeOf(join(tmpdir(), name)) === Buffer.byteLength(xml));
    const before = new Set(copies());
    const error = await readOurs(bytes).then(
      () => null,
      (thrown: unknown) => thrown,
    );
    expect(error).toBeInstanceOf(SheetXmlError);
    for (let waited = 0; waited < 2000 && copies().some((name) => !before.has(name)); waited += 50) await new Promise((resolve) => setTimeout(resolve, 50));
    expect(copies().filter((name) => !before.has(name))).toEqual([]);
  });
});

// ---- hand-written sheet parts ---------------------------------------------------------------------

const spreadsheetNs = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
let dateStyle = '';
let numberStyle = '';

/**
 * A workbook written by exceljs (styles: a date format and a number format; shared strings 0 =
 * "first shared", 1 = rich text "rich text") whose sheet part is replaced by `sheetXml`.
 */
async function workbookWithSheet(sheetXml: string | Buffer, date1904 = false): Promise<Buffer> {
  const workbook = new ExcelJS.Workbook();
  workbook.properties.date1904 = date1904;
  const ws = workbook.addWorksheet('Hand written');
  ws.getCell('A1').value = 1;
  ws.getCell('A1').numFmt = 'yyyy-mm-dd hh:mm';
  ws.getCell('B1').value = 1;
  ws.getCell('B1').numFmt = '0.00';
  ws.getCell('A2').value = 'first shared';
  ws.getCell('B2').value = { richText: [{ text: 'rich ' }, { text: 'text', font: { bold: true } }] };
  const zip = await JSZip.loadAsync(await workbook.xlsx.writeBuffer());
  const original = await zip.file('xl/worksheets/sheet1.xml')!.async('string');
  dateStyle = /r="A1" s="(\d+)"/.exec(original)![1]!;
  numberStyle = /r="B1" s="(\d+)"/.exec(original)![1]!;
  zip.file('xl/worksheets/sheet1.xml', sheetXml);
  return zip.generateAsync({ type: 'nodebuffer', compression: 'DEFLATE' });
}

/** The rows of a hand-written sheet part (built once the style ids are known). */
async function handWritten(sheet: () => string, expected: Row[], date1904 = false): Promise<void> {
  await workbookWithSheet('<worksheet/>', date1904); // learns the style ids
  const bytes = await workbookWithSheet(sheet(), date1904);
  const rows = await readOurs(bytes);
  expect(rows.sheetName).toBe('Hand written');
  expect(rows.rows).toEqual(expected);
}

describe('.xlsx reader, hand-written sheet XML', () => {
  it('reads namespace prefixes, attributes in any order and quote, white space and self-closing elements', async () => {
    await handWritten(
      () => `<?xml version="1.0" encoding="UTF-8"?>
<x:worksheet xmlns:x="${spreadsheetNs}">
  <x:sheetData>
    <x:row r="1">
      <x:c r="A1" t="inlineStr"><x:is><x:t>Time</x:t></x:is></x:c>
      <x:c t='s' r='B1'><x:v>0</x:v></x:c>
    </x:row>
    <x:row
        spans="1:3" r = "2" >
      <x:c s="${dateStyle}" r="A2"><x:v>46357.5</x:v></x:c>
      <x:c r="B2" s="${numberStyle}"><x:v> 12.5 </x:v></x:c>
      <x:c r="C2" s="${numberStyle}"/>
      <x:c r="D2"><x:v/></x:c>
      <x:c r="E2" t="b"><x:v>1</x:v></x:c>
    </x:row>
    <x:row r="3"/>
  </x:sheetData>
</x:worksheet>`,
      [
        [1, ['Time', 'first shared']],
        [2, [wall(2026, 12, 1, 12), 12.5, null, null, true]],
      ],
    );
  });

  it('places rows and cells without a reference after the previous one', async () => {
    await handWritten(
      () => `<worksheet xmlns="${spreadsheetNs}"><sheetData>
<row><c><v>1</v></c><c><v>2</v></c><c r="E1"><v>5</v></c><c><v>6</v></c></row>
<row r="4"><c r="B4"><v>42</v></c></row>
<row><c><v>7</v></c></row>
</sheetData></worksheet>`,
      [
        [1, [1, 2, null, null, 5, 6]],
        [4, [null, 42]],
        [5, [7]],
      ],
    );
  });

  it('decodes entity and character references, CDATA and line ends, and keeps exceljs’s second decoding of str values', async () => {
    await handWritten(
      () => `<worksheet xmlns="${spreadsheetNs}"><sheetData><row r="1">
<c r="A1" t="inlineStr"><is><t>&amp;&lt;&gt;&quot;&apos; &#176;C &#xB5;g &#x1F525;</t></is></c>
<c r="B1" t="inlineStr"><is><t>a\r\nb\rc&#13;d</t></is></c>
<c r="C1" t="inlineStr"><is><t>&amp;lt;</t></is></c>
<c r="D1" t="str"><v>&amp;lt;</v></c>
<c r="E1"><v><![CDATA[12.5]]></v></c>
<c r="F1" t="inlineStr"><is><t><![CDATA[<b>&amp;</b>]]></t></is></c>
<c r="G1"><!-- a comment --><v>1<!-- split -->5</v><?pi between?></c>
</row></sheetData></worksheet>`,
      [[1, ['&<>"\' °C µg 🔥', 'a\nb\nc\rd', '&lt;', '<', 12.5, '<b>&amp;</b>', 15]]],
    );
  });

  it('joins rich-text runs of inline strings and leaves out phonetic runs', async () => {
    // Shared string 99 does not exist: that cell is left out.
    await handWritten(
      () => `<worksheet xmlns="${spreadsheetNs}"><sheetData><row r="1">
<c r="A1" t="inlineStr"><is><r><t>Ab</t></r><r><rPr><b/></rPr><t xml:space="preserve"> c</t></r><rPh sb="0" eb="1"><t>ふ</t></rPh></is></c>
<c r="B1" t="s"><v>1</v></c>
<c r="C1" t="s"><v>99</v></c>
<c r="D1" t="e"><v>#N/A</v></c>
</row></sheetData></worksheet>`,
      [[1, ['Ab c', 'rich text', null, { error: '#N/A' }]]],
    );
  });

  it('reads formulas with and without cached results, including shared-formula followers', async () => {
    await handWritten(
      () => `<worksheet xmlns="${spreadsheetNs}"><sheetData><row r="1">
<c r="A1"><f>1+1</f><v>2</v></c>
<c r="B1"><f t="shared" ref="B1:C1" si="0">A1*2</f><v>4</v></c>
<c r="C1"><f t="shared" si="0"/><v>8</v></c>
<c r="D1" t="str"><f>"x"</f><v>x</v></c>
<c r="E1" t="b"><f>TRUE()</f><v>0</v></c>
<c r="F1" t="e"><f>1/0</f><v>#DIV/0!</v></c>
<c r="G1" s="${dateStyle}"><f>NOW()</f><v>46357.25</v></c>
<c r="H1"><f>A1</f></c>
</row></sheetData></worksheet>`,
      [[1, [2, 4, 8, 'x', false, { error: '#DIV/0!' }, wall(2026, 12, 1, 6), null]]],
    );
  });

  it('dates a cell by the row’s style when the cell has none of its own, in both date systems', async () => {
    const sheet = (): string => `<worksheet xmlns="${spreadsheetNs}"><sheetData>
<row r="1" s="${dateStyle}" customFormat="1"><c r="A1"><v>46357.5</v></c><c r="B1" s="${numberStyle}"><v>46357.5</v></c><c r="C1" s="0"><v>46357.5</v></c></row>
<row r="2"><c r="A2"><v>46357.5</v></c></row>
</sheetData></worksheet>`;
    await handWritten(sheet, [
      [1, [wall(2026, 12, 1, 12), 46357.5, wall(2026, 12, 1, 12)]],
      [2, [46357.5]],
    ]);
    // 1904 system: serial 0 is 1904-01-01, 1462 days after the 1900 system's (ECMA-376 Part 1 §18.17.4.1).
    await handWritten(sheet, [
      [1, [wall(2030, 12, 2, 12), 46357.5, wall(2030, 12, 2, 12)]],
      [2, [46357.5]],
    ], true);
  });

  it('skips a byte order mark and reads UTF-8 text', async () => {
    const xml = `<worksheet xmlns="${spreadsheetNs}"><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>Temperatur [°C] – Ölkessel</t></is></c><c r="B1"><v>1</v></c></row></sheetData></worksheet>`;
    await workbookWithSheet('<worksheet/>');
    const bytes = await workbookWithSheet(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(xml, 'utf8')]));
    const expected: Row[] = [[1, ['Temperatur [°C] – Ölkessel', 1]]];
    expect((await readOurs(bytes)).rows).toEqual(expected);
  });
});

describe('.xlsx reader, damaged workbooks', () => {
  const goodSheet = `<worksheet xmlns="${spreadsheetNs}"><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>Time</t></is></c><c r="B1" t="inlineStr"><is><t>NOx</t></is></c></row><row r="2"><c r="A2" s="1"><v>46357.5</v></c><c r="B2"><v>61.5</v></c></row></sheetData></worksheet>`;

  async function rejection(bytes: Buffer): Promise<FileRejected> {
    try {
      await parseImportFile(bytes, options);
    } catch (error) {
      if (error instanceof FileRejected) return error;
      throw error;
    }
    throw new Error('the workbook was read');
  }

  it.each([
    ['cut in the middle of a row', goodSheet.slice(0, goodSheet.indexOf('<row r="2">') + 30)],
    ['missing its closing tags', goodSheet.replace('</sheetData></worksheet>', '')],
    ['with a mismatched end tag', goodSheet.replace('</row><row r="2">', '</rows><row r="2">')],
    ['with an undefined entity', goodSheet.replace('>NOx<', '>NOx&nbsp;<')],
    ['with a bare ampersand', goodSheet.replace('>NOx<', '>NOx & CO<')],
    ['with an unquoted attribute', goodSheet.replace('r="B2"', 'r=B2')],
    ['with attributes run together', goodSheet.replace('r="A2" s="1"', 'r="A2"s="1"')],
    ['with a control character', goodSheet.replace('>NOx<', '>NO\u0001x<')],
    ['with a second root element', `${goodSheet}<worksheet/>`],
    ['with text after the root element', `${goodSheet}garbage`],
    ['with a document type declaration', `<!DOCTYPE worksheet [<!ENTITY x "y">]>${goodSheet}`],
    ['that is empty', ''],
  ])('refuses a sheet %s as a corrupt workbook (422)', async (_what, xml) => {
    const rejected = await rejection(await workbookWithSheet(xml));
    expect([rejected.status, rejected.code]).toEqual([422, 'corrupt_workbook']);
  });

  it('reads the same sheet when it is whole', async () => {
    const bytes = await workbookWithSheet(goodSheet);
    const parsed = await parseImportFile(bytes, options);
    expect(parsed.rowCount).toBe(1);
    expect(parsed.sheetName).toBe('Hand written');
  });

  describe('checks each part against the CRC-32 the zip records', () => {
    /** A small logger sheet, its parts stored uncompressed: the sheet's digits are bytes of the file. */
    async function storedWorkbook(): Promise<Buffer> {
      const workbook = new ExcelJS.Workbook();
      const ws = workbook.addWorksheet('Data');
      ws.addRow(['Time stamp', 'NOx [mg/Nm3] dry']);
      for (let minute = 1; minute <= 30; minute++) ws.addRow([wall(2026, 12, 1, 0, minute), minute === 7 ? 61.25 : 50 + minute]);
      ws.getColumn(1).numFmt = 'yyyy-mm-dd hh:mm';
      const zip = await JSZip.loadAsync(await workbook.xlsx.writeBuffer());
      return zip.generateAsync({ type: 'nodebuffer', compression: 'STORE' });
    }

    it('reads the intact file', async () => {
      const parsed = await parseImportFile(await storedWorkbook(), options);
      expect(parsed.rowCount).toBe(30);
    });

    it('refuses a file in which one digit of a value changed, instead of importing the other value', async () => {
      const bytes = await storedWorkbook();
      const at = bytes.indexOf('61.25');
      expect(at).toBeGreaterThan(0);
      bytes[at + 1] = '7'.charCodeAt(0); // 61.25 → 67.25: still a number, still valid XML
      const rejected = await rejection(bytes);
      expect([rejected.status, rejected.code]).toEqual([422, 'corrupt_workbook']);
      expect(rejected.message).toMatch(/damaged .*checksum/);
    });

    it('reports damage as damage when it also garbles the sheet XML', async () => {
      const bytes = await storedWorkbook();
      const at = bytes.indexOf('<sheetData>');
      bytes[at + 3] = '>'.charCodeAt(0);
      const rejected = await rejection(bytes);
      expect(rejected.code).toBe('corrupt_workbook');
      expect(rejected.message).toMatch(/damaged .*checksum/);
    });
  });

  it('refuses a workbook file cut short', async () => {
    const bytes = await bufferOf(casesWorkbook());
    const rejected = await rejection(bytes.subarray(0, Math.floor(bytes.length * 0.6)));
    expect(rejected.status).toBe(422);
    expect(rejected.code).toBe('corrupt_workbook');
    // Said in words, not as the zip reader's code.
    expect(rejected.message).toMatch(/ends before the workbook does/);
    expect(rejected.message).not.toMatch(/FILE_ENDED/);
  });
});
