/**
 * The sheet XML reader on its own: text fed in chunks cut anywhere (inside tags, references,
 * multi-byte characters, CR LF pairs), documents cut short, malformed XML, and the exact number
 * reading. Expected values are written out by hand or come from the generator, not from the reader.
 */
import excelUtils from 'exceljs/lib/utils/utils';
import fc from 'fast-check';
import type { RawCell } from './cells';
import { SheetXmlError, SheetXmlReader, decodeReferences, exactDecimal, type SheetValueRules } from './sheet-xml';

type Row = [number, RawCell[]];

const rules: SheetValueRules = {
  sharedString: (index) => ['zero', 'one'][index],
  isDateStyle: (id) => (id === 1 ? true : id === 2 ? false : undefined),
  serialToDate: (serial) => excelUtils.excelToDate(serial, false),
  decodeStr: (text) => excelUtils.xmlDecode(text),
};

/** Feeds `chunks` (bytes or strings) to a reader and returns its rows. */
function read(chunks: (Uint8Array | string)[]): Row[] {
  const rows: Row[] = [];
  const reader = new SheetXmlReader(rules, (rowNumber, cells) => rows.push([rowNumber, cells]));
  for (const chunk of chunks) reader.write(chunk);
  reader.end();
  return rows;
}

/** `bytes` cut at the given offsets. */
function cutAt(bytes: Buffer, offsets: number[]): Buffer[] {
  const points = [0, ...[...new Set(offsets)].filter((o) => o > 0 && o < bytes.length).sort((a, b) => a - b), bytes.length];
  return points.slice(1).map((end, k) => bytes.subarray(points[k], end));
}

const wall = (y: number, mo: number, d: number, h = 0, mi = 0): Date => new Date(Date.UTC(y, mo - 1, d, h, mi));

// Every feature at once, ending exactly at the root's end tag (so every shorter prefix is incomplete).
const sampleXml =
  '\uFEFF<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\r\n' +
  '<x:worksheet xmlns:x="http://schemas.openxmlformats.org/spreadsheetml/2006/main" note="a>b">' +
  '<x:dimension ref="A1:D3"/><!-- comment with <tags> & ampersands -->' +
  '<x:sheetData>\r\n' +
  '<x:row r="1" spans="1:4"><x:c r="A1" t="inlineStr"><x:is><x:t>Zeit &amp; Datum</x:t></x:is></x:c>' +
  "<x:c r='B1' t='s'><x:v>1</x:v></x:c><x:c r=\"C1\" t=\"inlineStr\"><x:is><x:r><x:t>Temp [°C]</x:t></x:r><x:r><x:t> – Kessel 🔥</x:t></x:r></x:is></x:c>" +
  '<x:c r="D1" t="str"><x:v>a\r\nb &#x3bc;g&#13;</x:v></x:c></x:row>' +
  '<x:row r="2" s="1" customFormat="1"><x:c r="A2"><x:v>46357.5</x:v></x:c><x:c r="B2" s="2"><x:v>-12.25</x:v></x:c>' +
  '<x:c r="C2" t="b"><x:v>1</x:v></x:c><x:c r="D2" t="e"><x:v>#N/A</x:v></x:c></x:row>' +
  '<row><c><v>1e3</v></c><c t="str"><f>"x"</f><v><![CDATA[<x>]]></v></c><c><f>A1</f></c><c r="F3"><v>7</v></c></row>' +
  '</x:sheetData></x:worksheet>';
const sampleRows: Row[] = [
  [1, ['Zeit & Datum', 'one', 'Temp [°C] – Kessel 🔥', 'a\nb μg\r']],
  [2, [wall(2026, 12, 1, 12), -12.25, true, { error: '#N/A' }]],
  [3, [1000, '<x>', null, null, null, 7]],
];
const sampleBytes = Buffer.from(sampleXml, 'utf8');

describe('SheetXmlReader', () => {
  it('reads a sheet given whole', () => {
    expect(read([sampleBytes])).toEqual(sampleRows);
  });

  it('reads the same rows however the bytes are cut in two (tags, references, UTF-8 characters, CR LF)', () => {
    for (let cut = 1; cut < sampleBytes.length; cut++) {
      expect([cut, read(cutAt(sampleBytes, [cut]))]).toEqual([cut, sampleRows]);
    }
  });

  it('reads the same rows from one-byte chunks and from string chunks', () => {
    expect(read(cutAt(sampleBytes, Array.from({ length: sampleBytes.length }, (_, k) => k)))).toEqual(sampleRows);
    expect(read(sampleXml.match(/[\s\S]{1,7}/gu)!)).toEqual(sampleRows);
  });

  it('refuses every cut-short document: no prefix reads as a whole sheet', () => {
    for (let length = 0; length < sampleBytes.length; length++) {
      expect(() => read([sampleBytes.subarray(0, length)])).toThrow(SheetXmlError);
    }
  });

  it('reads random sheets fed in random chunks as they were generated, by the fast and the general path alike', () => {
    const text = fc.string({ unit: 'grapheme', maxLength: 10 }).filter((s) => !/[\x00-\x08\x0B\x0C\x0E-\x1F\uFFFE\uFFFF\r]/.test(s));
    const cell = fc.oneof(
      // String(-0) is "0": the value read is what the text says.
      fc.double({ noNaN: true, noDefaultInfinity: true }).map((n) => ({ xml: `<v>${n}</v>`, type: '', value: Number(String(n)) as RawCell })),
      text.map((s) => ({ xml: `<is><t>${s.replace(/&/g, '&amp;').replace(/</g, '&lt;')}</t></is>`, type: 'inlineStr', value: s === '' ? null : (s as RawCell) })),
      fc.boolean().map((b) => ({ xml: `<v>${b ? 1 : 0}</v>`, type: 'b', value: b as RawCell })),
      fc.constantFrom('#N/A', '#DIV/0!').map((e) => ({ xml: `<v>${e}</v>`, type: 'e', value: { error: e } as RawCell })),
    );
    const sheet = fc.array(fc.array(cell, { minLength: 1, maxLength: 5 }), { minLength: 1, maxLength: 5 });
    fc.assert(
      fc.property(sheet, fc.array(fc.nat(), { maxLength: 12 }), fc.boolean(), (rows, cuts, general) => {
        // Single quotes and a line break in the cell tag take the general path instead of the fast one.
        const cellTag = (ref: string, type: string): string => (general ? `<c\n r='${ref}'${type ? ` t='${type}'` : ''}>` : `<c r="${ref}"${type ? ` t="${type}"` : ''}>`);
        const xml =
          '<worksheet><sheetData>' +
          rows.map((cells, r) => `<row r="${r + 1}">${cells.map((c, k) => `${cellTag(`${String.fromCharCode(65 + k)}${r + 1}`, c.type ?? '')}${c.xml}</c>`).join('')}</row>`).join('') +
          '</sheetData></worksheet>';
        const expected: Row[] = rows.map((cells, r) => {
          const values = cells.map((c) => c.value);
          while (values.length > 0 && values[values.length - 1] === null) values.pop();
          return [r + 1, values];
        });
        const bytes = Buffer.from(xml, 'utf8');
        expect(read(cutAt(bytes, cuts.map((c) => c % bytes.length)))).toEqual(expected);
      }),
      { numRuns: 300 },
    );
  });

  it.each([
    ['an end tag that does not match', '<worksheet><sheetData></sheetDatum></worksheet>'],
    ['an end tag without a start tag', '</worksheet>'],
    ['a second root element', '<worksheet/><worksheet/>'],
    ['text outside the root element', '<worksheet/>x'],
    ['text before the root element', 'x<worksheet/>'],
    ['an undefined entity', '<worksheet><sheetData><row><c t="inlineStr"><is><t>&nbsp;</t></is></c></row></sheetData></worksheet>'],
    ['an undefined entity in ignored text', '<worksheet>&bogus;</worksheet>'],
    ['a bare ampersand', '<worksheet><sheetData><row><c><v>1 & 2</v></c></row></sheetData></worksheet>'],
    ['a reference to a character XML does not allow', '<worksheet><sheetData><row><c t="inlineStr"><is><t>&#1;</t></is></c></row></sheetData></worksheet>'],
    ['a control character', '<worksheet>\u0002</worksheet>'],
    ['an unquoted attribute value', '<worksheet><sheetData><row r=1/></sheetData></worksheet>'],
    ['attributes without space between them', '<worksheet><sheetData><row r="1"s="2"/></sheetData></worksheet>'],
    ['a repeated cell attribute', '<worksheet><sheetData><row><c r="A1" r="B1"><v>1</v></c></row></sheetData></worksheet>'],
    ['"<" in an attribute value', '<worksheet a="<"/>'],
    ['an attribute without a value', '<worksheet a/>'],
    ['a document type declaration', '<!DOCTYPE worksheet><worksheet/>'],
    ['markup that is not a comment, CDATA or declaration', '<worksheet><!foo></worksheet>'],
    ['a CDATA section outside the root', '<![CDATA[x]]><worksheet/>'],
    ['nothing at all', ''],
    ['only white space', ' \r\n'],
  ])('refuses %s', (_what, xml) => {
    expect(() => read([xml])).toThrow(SheetXmlError);
  });

  it('leaves out cells without a value, reads the row after a row without a number, and ignores cells outside rows', () => {
    const xml =
      '<worksheet><sheetData><c r="A9"><v>9</v></c><row r="3"><c r="A3" s="2"/><c r="B3"><v/></c><c r="C3"><v>3</v></c><c r="D3" s="2"/></row>' +
      '<row><c><v>4</v></c></row><row r="7"/></sheetData><c><v>0</v></c></worksheet>';
    expect(read([xml])).toEqual([
      [3, [null, null, 3]],
      [4, [4]],
      [7, []],
    ]);
  });
});

describe('decodeReferences', () => {
  it('replaces the predefined entities and numeric character references (XML 1.0 §4.1, §4.6)', () => {
    expect(decodeReferences('&lt;a&gt; &amp;&amp; &quot;&apos; &#65;&#x42;&#x1F525;')).toBe('<a> && "\' AB🔥');
  });

  // `&#X43;`: XML 1.0 §4.1 (production CharRef) has a small 'x' only; surrogates and NUL are no Char (§2.2).
  it.each(['&#X43;', '&#;', '&#x;', '&#xD800;', '&#0;', '&amp', '&unknown;', '& ;'])('refuses %s', (text) => {
    expect(() => decodeReferences(text)).toThrow(SheetXmlError);
  });
});

describe('exactDecimal', () => {
  const bytesOf = (s: string): Buffer => Buffer.from(s, 'latin1');

  it('reads plain decimals exactly as parseFloat does', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        const text = String(x);
        const fast = exactDecimal(bytesOf(text), 0, text.length);
        if (!Number.isNaN(fast)) expect(Object.is(fast, parseFloat(text))).toBe(true);
      }),
      { numRuns: 2000 },
    );
    fc.assert(
      fc.property(fc.stringMatching(/^-?[0-9]{1,17}(\.[0-9]{0,24})?$/), (text) => {
        const fast = exactDecimal(bytesOf(text), 0, text.length);
        if (!Number.isNaN(fast)) expect(Object.is(fast, parseFloat(text))).toBe(true);
      }),
      { numRuns: 2000 },
    );
  });

  it('takes the fast path for logger values and leaves the rest to parseFloat', () => {
    expect(exactDecimal(bytesOf('46357.00069444445'), 0, 17)).toBe(46357.00069444445);
    expect(exactDecimal(bytesOf('x-0.5x'), 1, 5)).toBe(-0.5);
    expect(Object.is(exactDecimal(bytesOf('-0'), 0, 2), -0)).toBe(true);
    // 2^53 + 1 cannot be held exactly; exponents, signs and spaces are parseFloat's to read.
    for (const text of ['9007199254740993', '1e3', '+1', ' 1', '1.2.3', '', '-', '.']) {
      expect([text, exactDecimal(bytesOf(text), 0, text.length)]).toEqual([text, NaN]);
    }
  });
});
