/**
 * A strict streaming reader for the worksheet part of an .xlsx (the SpreadsheetML `<worksheet>`
 * XML, ECMA-376 Part 1 §18.3), made for speed.
 *
 * Why our own scanner: reading a month of one-minute data (16.5 MB of sheet XML, 450,000 cells)
 * took ~1.2 s, most of it in a general SAX parser. Both general tokenizers at hand need 0.7–0.8 s
 * for that XML alone, doing nothing with the events (saxes, which exceljs uses, and htmlparser2
 * in xmlMode, measured on this project's 2-core build machine): they decode all of it to a
 * string, make a name string and an attribute object for every element and call back for every
 * attribute. A sheet needs far less: four element names, three attributes and the text of
 * `<v>`/`<t>`. This scanner walks the UTF-8 bytes (every byte of XML markup is ASCII, and no
 * byte of a multi-byte UTF-8 character is, so markup can be found without decoding), reads the
 * `r`, `s` and `t` attributes of `<row>` and `<c>` and the digits of a number straight from the
 * bytes, and decodes only the text of string values: ~0.1 s for the same XML. The usual cell,
 * `<c r="B2" s="1"><v>61.5</v></c>`, has a fast path of its own (`plainCellTag`, `plainValue`);
 * anything else goes through the general path and its checks (below); the fast paths accept only
 * what the general path would read the same way, and hand everything else to it.
 *
 * It is still a checking XML reader, so a damaged sheet is refused rather than half-read:
 * every end tag must match its start tag, the document must end with its root element closed
 * (a truncated part fails), one root only, attributes well formed (name, `=`, quoted value
 * without `<`, white space between attributes, no repeated `r`/`s`/`t` on rows and cells),
 * entity and character references must be the five predefined ones or numeric references to an
 * XML character, control characters XML does not allow (W3C XML 1.0 §2.2) are refused in text,
 * names and attribute values, and a document type declaration is refused (the Open Packaging
 * Conventions, ECMA-376 Part 2, do not allow DTDs in package parts [memory]). Not checked,
 * because they cannot change what is read: the XML name character classes, `--` inside
 * comments, `]]>` in text, repeated attributes on other elements, and characters inside
 * comments and processing instructions.
 *
 * Elements are matched by local name, so a prefixed sheet (`<x:row>`, `<x:c>`, as some .NET
 * writers produce) reads like an unprefixed one. Namespace URIs are not resolved: in a worksheet
 * part these names only come from the SpreadsheetML namespace (transitional or strict).
 *
 * The part arrives in chunks. Markup cut by the end of a chunk is read again, whole, with the
 * next one; text is read up to a point where no character, reference or CR LF pair is cut, and
 * the rest waits for the next chunk. XML line ends (`\r\n`, `\r`) in text become `\n`
 * (XML 1.0 §2.11) as saxes makes them.
 */
import type { RawCell } from './cells';

/** The sheet XML is not well formed (or ends early): the workbook is refused. */
export class SheetXmlError extends Error {}

/** What the reader needs of the workbook to turn a cell into a value. */
export interface SheetValueRules {
  /** The value of shared string `index`, or `undefined` when there is no such string (the cell is left out). */
  sharedString(index: number): RawCell | undefined;
  /** Whether cell style `id` has a date/time number format; `undefined` when the workbook has no such style. */
  isDateStyle(id: number): boolean | undefined;
  /** A serial day number as a Date whose UTC fields are the wall clock (1900 or 1904 date system). */
  serialToDate(serial: number): Date;
  /** A `t="str"` value after XML decoding (exceljs decodes these a second time; kept for the same cells out). */
  decodeStr(text: string): string;
}

/** Receives each `<row>` of `<sheetData>`: its number and its cells (index 0 = column A). */
export type RowSink = (rowNumber: number, cells: RawCell[]) => void;

// Byte values.
const LT = 60; // <
const GT = 62; // >
const SLASH = 47; // /
const BANG = 33; // !
const QUESTION = 63; // ?
const EQUALS = 61; // =
const DQUOTE = 34; // "
const SQUOTE = 39; // '
const AMP = 38; // &
const SEMICOLON = 59; // ;
const COLON = 58; // :
const MINUS = 45; // -
const POINT = 46; // .
const SPACE = 32;
const TAB = 9;
const LF = 10;
const CR = 13;

/** XML white space (XML 1.0 §2.3 production S). */
function isSpace(byte: number): boolean {
  return byte === SPACE || byte === LF || byte === TAB || byte === CR;
}

/** A control character XML 1.0 §2.2 does not allow (C0 controls but tab, LF and CR). */
function isForbiddenControl(byte: number): boolean {
  return byte < SPACE && byte !== TAB && byte !== LF && byte !== CR;
}

/**
 * Markup (a tag, comment, CDATA section) longer than this is refused: markup cut by a chunk end is
 * read again from its start with the next chunk, so an endless tag would cost quadratic time.
 * Real sheet tags are well under 1 KB.
 */
const MAX_MARKUP_BYTES = 1 << 20;

// Element kinds by local name.
const K_OTHER = 0;
const K_SHEET_DATA = 1;
const K_ROW = 2;
const K_C = 3;
const K_F = 4;
const K_V = 5;
const K_IS = 6;
const K_R = 7;
const K_T = 8;
/** Unprefixed names of the known kinds, kept on the element stack without making a new string. */
const KIND_NAMES = ['', 'sheetData', 'row', 'c', 'f', 'v', 'is', 'r', 't'];

// Cell types (`t` attribute of `<c>`, ECMA-376 Part 1 §18.18.11 ST_CellType).
const T_NUMBER = 0; // n, absent, d, anything unknown: read as a number (as exceljs does)
const T_SHARED = 1; // s
const T_STR = 2; // str
const T_INLINE = 3; // inlineStr
const T_BOOL = 4; // b
const T_ERROR = 5; // e

// What the text of the current element is collected for.
const COLLECT_NONE = 0;
const COLLECT_FORMULA = 1;
const COLLECT_VALUE = 2;

// Attributes read from rows and cells, as bits (a repeated one is an error).
const A_R = 1;
const A_S = 2;
const A_T = 4;
/** `attrS` of an empty `s=""`. */
const EMPTY_STYLE = -2;

// Cached date-style answers, by style id.
const STYLE_UNKNOWN = 0;
const STYLE_NOT_DATE = 1;
const STYLE_DATE = 2;
const STYLE_MISSING = 3;

const EMPTY = Buffer.alloc(0);
const UTF8_BOM = [0xef, 0xbb, 0xbf];

/**
 * Reads a worksheet's rows from its XML, fed chunk by chunk (`write`), then `end()`. Rows of
 * `<sheetData>` go to `onRow` as each is complete. Cells come out as exceljs's own workbook
 * loader gives them (through `toRawCell`): shared strings (rich text joined), inline strings
 * (rich-text runs joined, phonetic runs left out), `str` values, booleans, errors, numbers, dates
 * where the cell's style has a date format (or, for a cell without its own style, the row's),
 * formulas as their cached result (null without one). Rows or cells without a reference (`r`)
 * follow the previous one. Cells without a value are left out (null if a later cell follows).
 * Throws SheetXmlError when the XML is not well formed or ends early.
 */
export class SheetXmlReader {
  private started = false;
  /** Bytes cut by the end of the previous chunk (markup, or the end of a text), read again with the next one. */
  private carry: Buffer = EMPTY;
  /** Qualified names (as latin1 strings of their bytes) of the open elements, `names[0 … depth-1]`. */
  private readonly names: string[] = [];
  private depth = 0;
  private rootSeen = false;

  // Depth of the open element in each role, or -1.
  private sheetDataDepth = -1;
  private rowDepth = -1;
  private cellDepth = -1;
  private inlineDepth = -1;
  private runDepth = -1;
  private collect = COLLECT_NONE;
  private collectDepth = -1;

  // The row being read.
  private rowNumber = 0;
  private rowIsDate = false;
  private cells: RawCell[] = [];
  private width = 0;
  private column = 0;

  // The cell being read.
  private cellType = T_NUMBER;
  private cellStyle = -1;
  private formula = false;
  /** The value's text so far, decoded. */
  private valueText = '';
  /**
   * Or, in the usual case of a value in one piece, where its raw bytes lie: a number is then read
   * from the digits without making a string.
   */
  private valueSource: Buffer = EMPTY;
  private valueStart = 0;
  private valueEnd = 0;

  // Attributes of the start tag being read (rows, cells and formulas only).
  private attrSeen = 0;
  private attrR = -1;
  private attrS = -1;
  private attrT = T_NUMBER;
  private formulaTypeSet = false;

  private readonly dateStyles: number[] = [];

  constructor(
    private readonly rules: SheetValueRules,
    private readonly onRow: RowSink,
  ) {}

  /** Reads the next piece of the part (bytes are UTF-8; a string is encoded as such). */
  write(chunk: string | Uint8Array): void {
    const bytes = typeof chunk === 'string' ? Buffer.from(chunk, 'utf8') : Buffer.isBuffer(chunk) ? chunk : Buffer.from(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    if (bytes.length === 0) return;
    const buf = this.carry.length === 0 ? bytes : Buffer.concat([this.carry, bytes]);
    this.carry = EMPTY;
    this.scan(buf, false);
    // The caller may reuse its buffer: keep no range into it.
    if (this.valueEnd > this.valueStart) this.materializeValue();
  }

  /** The part has ended: reads what is left and checks that the document is complete. */
  end(): void {
    const rest = this.carry;
    this.carry = EMPTY;
    if (rest.length > 0) this.scan(rest, true);
    if (this.depth > 0) throw new SheetXmlError(`the sheet XML ends inside <${nameForMessage(this.names[this.depth - 1]!)}>`);
    if (!this.rootSeen) throw new SheetXmlError('the sheet XML has no root element');
  }

  /** Reads `buf`; unless `final`, what a chunk end cuts is kept for the next chunk. */
  private scan(buf: Buffer, final: boolean): void {
    const n = buf.length;
    let i = 0;
    if (!this.started) {
      // A byte order mark may start the part (XML 1.0 §4.3.3); it is not content.
      if (n < 3 && !final && buf.every((byte, k) => byte === UTF8_BOM[k])) {
        this.carry = Buffer.from(buf);
        return;
      }
      this.started = true;
      if (n >= 3 && buf[0] === 0xef && buf[1] === 0xbb && buf[2] === 0xbf) i = 3;
    }
    while (i < n) {
      if (buf[i] !== LT) {
        // Text, up to the next '<'.
        let end = i;
        let byte = 0;
        for (; end < n; end++) {
          byte = buf[end]!;
          if (byte === LT) break;
          if (byte < SPACE && isForbiddenControl(byte)) throw new SheetXmlError('the sheet XML holds a control character XML does not allow');
        }
        if (end === n && !final) {
          // The text goes on in the next chunk: read what cannot be cut, keep the rest.
          const cut = safeTextCut(buf, i, n);
          if (cut > i) this.text(buf, i, cut);
          this.carry = Buffer.from(buf.subarray(cut));
          return;
        }
        this.text(buf, i, end);
        i = end;
        if (i === n) break;
      }
      const next = this.markup(buf, i);
      if (next < 0) {
        if (final) throw new SheetXmlError(`the sheet XML ends inside markup (${JSON.stringify(buf.toString('utf8', i, Math.min(n, i + 40)))})`);
        if (n - i > MAX_MARKUP_BYTES) throw new SheetXmlError('the sheet XML holds markup longer than 1 MiB');
        this.carry = Buffer.from(buf.subarray(i));
        return;
      }
      i = next;
    }
  }

  // ---- text ------------------------------------------------------------------------------------

  /** Character data `buf[start, end)`, with no character, reference or CR LF pair cut. */
  private text(buf: Buffer, start: number, end: number): void {
    const collect = this.collect;
    if (collect === COLLECT_VALUE) {
      if (this.valueEnd > this.valueStart) this.materializeValue();
      if (this.valueText === '') {
        this.valueSource = buf;
        this.valueStart = start;
        this.valueEnd = end;
      } else {
        this.valueText += cleanText(buf.toString('utf8', start, end));
      }
      return;
    }
    if (collect === COLLECT_FORMULA) this.formula = true;
    const outsideRoot = this.depth === 0;
    for (let k = start; k < end; k++) {
      const byte = buf[k]!;
      if (outsideRoot && !isSpace(byte)) throw new SheetXmlError('the sheet XML has text outside its root element');
      if (byte === AMP) {
        decodeReferences(buf.toString('utf8', k, end)); // only to check them
        break;
      }
    }
  }

  /** Turns the value's raw byte range into decoded text. */
  private materializeValue(): void {
    this.valueText += cleanText(this.valueSource.toString('utf8', this.valueStart, this.valueEnd));
    this.valueSource = EMPTY;
    this.valueStart = this.valueEnd = 0;
  }

  private valueString(): string {
    if (this.valueEnd > this.valueStart) this.materializeValue();
    return this.valueText;
  }

  // ---- markup ----------------------------------------------------------------------------------

  /** Reads the markup starting with `<` at `i`; returns the index after it, or -1 if the bytes end first. */
  private markup(buf: Buffer, i: number): number {
    if (i + 1 >= buf.length) return -1;
    const next = buf[i + 1];
    if (next === SLASH) return this.endTag(buf, i);
    if (next === BANG) return this.declaration(buf, i);
    if (next === QUESTION) {
      // A processing instruction (the XML declaration is one): nothing in it is read.
      const close = buf.indexOf('?>', i + 2, 'latin1');
      return close < 0 ? -1 : close + 2;
    }
    return this.startTag(buf, i);
  }

  /** `<!--…-->`, `<![CDATA[…]]>`; a document type declaration is refused. */
  private declaration(buf: Buffer, i: number): number {
    const n = buf.length;
    if (startsWithAscii(buf, i, '<!--')) {
      const close = buf.indexOf('-->', i + 4, 'latin1');
      return close < 0 ? -1 : close + 3;
    }
    if (startsWithAscii(buf, i, '<![CDATA[')) {
      const close = buf.indexOf(']]>', i + 9, 'latin1');
      if (close < 0) return -1;
      if (this.depth === 0) throw new SheetXmlError('the sheet XML has a CDATA section outside its root element');
      if (this.collect === COLLECT_VALUE && close > i + 9) {
        // CDATA is text without references. (saxes reports it apart from text, so exceljs never read it.)
        if (this.valueEnd > this.valueStart) this.materializeValue();
        this.valueText += buf.toString('utf8', i + 9, close).replace(/\r\n?/g, '\n');
      } else if (this.collect === COLLECT_FORMULA) {
        this.formula = true;
      }
      return close + 3;
    }
    if (startsWithAscii(buf, i, '<!DOCTYPE')) throw new SheetXmlError('the sheet XML has a document type declaration, which a package part may not have');
    // Could still become one of the above once the next chunk arrives.
    if (n - i < 9 && (isAsciiPrefix(buf, i, '<!--') || isAsciiPrefix(buf, i, '<![CDATA[') || isAsciiPrefix(buf, i, '<!DOCTYPE'))) return -1;
    throw new SheetXmlError(`the sheet XML has malformed markup (${JSON.stringify(buf.toString('utf8', i, Math.min(n, i + 20)))})`);
  }

  private endTag(buf: Buffer, i: number): number {
    const n = buf.length;
    const depth = this.depth - 1;
    if (depth < 0) throw new SheetXmlError('the sheet XML has an end tag without a start tag');
    const name = this.names[depth]!;
    const length = name.length;
    let j = i + 2;
    for (let k = 0; k < length; k++, j++) {
      if (j >= n) return -1;
      if (buf[j] !== name.charCodeAt(k)) throw this.mismatch(buf, i, name);
    }
    let byte = buf[j]!;
    while (j < n && isSpace(byte)) byte = buf[++j]!;
    if (j >= n) return -1;
    if (byte !== GT) throw this.mismatch(buf, i, name);
    this.depth = depth;
    this.closeElement(depth);
    return j + 1;
  }

  private mismatch(buf: Buffer, i: number, name: string): SheetXmlError {
    return new SheetXmlError(`the sheet XML has a mismatched end tag for <${nameForMessage(name)}> (${JSON.stringify(buf.toString('utf8', i, Math.min(buf.length, i + 24)))})`);
  }

  private startTag(buf: Buffer, i: number): number {
    if (buf[i + 1] === 99 /* c */ && buf[i + 2] === SPACE && this.rowDepth >= 0 && this.depth === this.rowDepth + 1) {
      const end = this.plainCellTag(buf, i);
      if (end > 0) return end;
    }
    const n = buf.length;
    const nameStart = i + 1;
    let j = nameStart;
    let colon = -1;
    let byte = 0;
    for (; j < n; j++) {
      byte = buf[j]!;
      // Every delimiter is at most '>' (62): letters skip all the tests below.
      if (byte > GT) continue;
      if (byte === GT || byte === SLASH || isSpace(byte)) break;
      if (byte === COLON) colon = j;
      else if (byte === LT || byte === AMP || byte === EQUALS || byte === DQUOTE || byte === SQUOTE || isForbiddenControl(byte)) {
        throw malformed(buf, i, j, 'tag');
      }
    }
    if (j >= n) return -1;
    if (j === nameStart) throw malformed(buf, i, j, 'tag');
    const nameEnd = j;
    const kind = elementKind(buf, colon < 0 ? nameStart : colon + 1, nameEnd);

    const depth = this.depth;
    if (depth === 0 && this.rootSeen) throw new SheetXmlError('the sheet XML has a second root element');
    // The role this element plays here: rows only in sheetData, cells only in rows, and so on.
    let role = K_OTHER;
    switch (kind) {
      case K_SHEET_DATA:
        if (this.sheetDataDepth < 0) role = K_SHEET_DATA;
        break;
      case K_ROW:
        if (this.sheetDataDepth >= 0 && depth === this.sheetDataDepth + 1) role = K_ROW;
        break;
      case K_C:
        if (this.rowDepth >= 0 && depth === this.rowDepth + 1) role = K_C;
        break;
      case K_F:
      case K_V:
      case K_IS:
        if (this.cellDepth >= 0 && depth === this.cellDepth + 1) role = kind;
        break;
      case K_R:
        if (this.inlineDepth >= 0 && depth === this.inlineDepth + 1) role = K_R;
        break;
      case K_T:
        // Text of an inline string: `<is><t>` or a rich-text run `<is><r><t>`, not a phonetic run `<is><rPh><t>`.
        if (this.inlineDepth >= 0 && (depth === this.inlineDepth + 1 || (this.runDepth >= 0 && depth === this.runDepth + 1))) role = K_V;
        break;
      default:
        break;
    }
    const readsAttributes = role === K_ROW || role === K_C || role === K_F;
    if (readsAttributes) {
      this.attrSeen = 0;
      this.attrR = -1;
      this.attrS = -1;
      this.attrT = T_NUMBER;
      this.formulaTypeSet = false;
    }

    // Attributes.
    let selfClosing = false;
    for (;;) {
      let spaced = false;
      while (j < n && isSpace(byte)) {
        spaced = true;
        byte = buf[++j]!;
      }
      if (j >= n) return -1;
      if (byte === GT) {
        j++;
        break;
      }
      if (byte === SLASH) {
        if (j + 1 >= n) return -1;
        if (buf[j + 1] !== GT) throw malformed(buf, i, j + 1, 'tag');
        selfClosing = true;
        j += 2;
        break;
      }
      if (!spaced) throw malformed(buf, i, j, 'tag (attributes need space between them)');
      const attrStart = j;
      for (; j < n; j++) {
        byte = buf[j]!;
        if (byte > GT) continue;
        if (byte === EQUALS || isSpace(byte)) break;
        if (byte === GT || byte === SLASH || byte === LT || byte === DQUOTE || byte === SQUOTE || byte === AMP || isForbiddenControl(byte)) {
          throw malformed(buf, i, j, 'attribute');
        }
      }
      if (j >= n) return -1;
      if (j === attrStart) throw malformed(buf, i, j, 'attribute');
      const attrEnd = j;
      while (j < n && isSpace(byte)) byte = buf[++j]!;
      if (j >= n) return -1;
      if (byte !== EQUALS) throw malformed(buf, i, j, 'attribute (no value)');
      byte = buf[++j]!;
      while (j < n && isSpace(byte)) byte = buf[++j]!;
      if (j >= n) return -1;
      if (byte !== DQUOTE && byte !== SQUOTE) throw malformed(buf, i, j, 'attribute (value not quoted)');
      const quote = byte;
      const valueStart = j + 1;
      let hasReference = false;
      for (j = valueStart; j < n; j++) {
        byte = buf[j]!;
        // Letters, digits and most punctuation (40 and up, but '<') need no test.
        if (byte >= 40 && byte !== LT) continue;
        if (byte === quote) break;
        if (byte === LT || isForbiddenControl(byte)) throw malformed(buf, i, j, 'attribute value');
        if (byte === AMP) hasReference = true;
      }
      if (j >= n) return -1;
      const valueEnd = j;
      if (hasReference) {
        const value = decodeReferences(buf.toString('utf8', valueStart, valueEnd));
        if (readsAttributes && attrEnd === attrStart + 1) {
          const decoded = Buffer.from(value, 'utf8');
          this.attribute(role, buf[attrStart]!, decoded, 0, decoded.length);
        }
      } else if (readsAttributes && attrEnd === attrStart + 1) {
        this.attribute(role, buf[attrStart]!, buf, valueStart, valueEnd);
      }
      byte = buf[++j]!;
    }

    // The whole start tag is read: only now change state (an incomplete tag is read again).
    if (depth === 0) this.rootSeen = true;
    this.openElement(role, depth);
    if (selfClosing) {
      this.closeElement(depth);
    } else {
      this.names[depth] = colon < 0 && kind !== K_OTHER ? KIND_NAMES[kind]! : buf.toString('latin1', nameStart, nameEnd);
      this.depth = depth + 1;
      if (role === K_C) return this.plainValue(buf, j);
    }
    return j;
  }

  /**
   * The common cell start tag, `<c r="B2">` or `<c r="A2" s="1" t="s">` (one space before each
   * one-letter attribute, double quotes, plain values), read in one step: what the general path
   * does for it without its per-byte tests for every other case. Returns the index after the tag
   * (and after a plain value that follows), or 0 to leave the tag to the general path.
   */
  private plainCellTag(buf: Buffer, i: number): number {
    const n = buf.length;
    let j = i + 2;
    let seen = 0;
    let column = -1;
    let style = -1;
    let type = T_NUMBER;
    for (;;) {
      if (j + 4 >= n) return 0;
      if (buf[j] === GT) {
        j++;
        break;
      }
      if (buf[j] !== SPACE || buf[j + 2] !== EQUALS || buf[j + 3] !== DQUOTE) return 0;
      const name = buf[j + 1];
      const bit = name === 114 /* r */ ? A_R : name === 115 /* s */ ? A_S : name === 116 /* t */ ? A_T : 0;
      if (bit === 0 || seen & bit) return 0;
      seen |= bit;
      const start = j + 4;
      let k = start;
      let byte = 0;
      for (; k < n; k++) {
        byte = buf[k]!;
        if (byte < 40 || byte === LT) break;
      }
      if (byte !== DQUOTE || k >= n) return 0;
      if (bit === A_R) column = columnOfRef(buf, start, k);
      else if (bit === A_S) style = k > start ? integerAt(buf, start, k) : EMPTY_STYLE;
      else type = cellTypeAt(buf, start, k);
      j = k + 1;
    }
    this.attrSeen = seen;
    this.attrR = column;
    this.attrS = style;
    this.attrT = type;
    const depth = this.depth;
    this.openElement(K_C, depth);
    this.names[depth] = 'c';
    this.depth = depth + 1;
    return this.plainValue(buf, j);
  }

  /**
   * The common `<v>digits</v>` right after a cell's start tag at `j`, read in one step: what the
   * general path would do (open `v`, collect its text, close it) without its per-tag work. Returns
   * the index after `</v>`, or `j` to leave anything else (references, CR, a cut) to the general path.
   */
  private plainValue(buf: Buffer, j: number): number {
    const n = buf.length;
    if (j + 2 >= n || buf[j] !== LT || buf[j + 1] !== 118 /* v */ || buf[j + 2] !== GT) return j;
    const start = j + 3;
    let k = start;
    for (; k < n; k++) {
      const byte = buf[k]!;
      if (byte === LT) break;
      if (byte === AMP || byte < SPACE) return j;
    }
    if (k + 3 >= n || buf[k + 1] !== SLASH || buf[k + 2] !== 118 || buf[k + 3] !== GT) return j;
    if (k > start) {
      this.valueSource = buf;
      this.valueStart = start;
      this.valueEnd = k;
    }
    k += 4;
    // And the cell's own `</c>` (the general path checks the names; here it can only be `c`).
    if (k + 3 < n && buf[k] === LT && buf[k + 1] === SLASH && buf[k + 2] === 99 /* c */ && buf[k + 3] === GT && this.names[this.depth - 1] === 'c') {
      const depth = --this.depth;
      this.closeElement(depth);
      return k + 4;
    }
    return k;
  }

  /** One `r`, `s` or `t` attribute of a row, cell or formula, its value in `bytes[start, end)`. */
  private attribute(role: number, nameByte: number, bytes: Uint8Array, start: number, end: number): void {
    const bit = nameByte === 114 /* r */ ? A_R : nameByte === 115 /* s */ ? A_S : nameByte === 116 /* t */ ? A_T : 0;
    if (bit === 0) return;
    if (this.attrSeen & bit) throw new SheetXmlError('the sheet XML repeats an attribute of a row or cell');
    this.attrSeen |= bit;
    if (role === K_F) {
      // exceljs counts `<f t="shared">` (a shared formula's follower, no text of its own) as a formula.
      if (bit === A_T) this.formulaTypeSet = end > start;
      return;
    }
    if (bit === A_R) this.attrR = role === K_C ? columnOfRef(bytes, start, end) : integerAt(bytes, start, end);
    else if (bit === A_S) this.attrS = end > start ? integerAt(bytes, start, end) : EMPTY_STYLE;
    else if (role === K_C) this.attrT = cellTypeAt(bytes, start, end);
  }

  private openElement(role: number, depth: number): void {
    switch (role) {
      case K_SHEET_DATA:
        this.sheetDataDepth = depth;
        break;
      case K_ROW: {
        this.rowDepth = depth;
        this.rowNumber = this.attrSeen & A_R ? this.attrR : this.rowNumber + 1;
        // A style on the row dates its cells that have none of their own (as exceljs's streaming reader does).
        const style = this.attrS;
        this.rowIsDate = (this.attrSeen & A_S) !== 0 && style !== EMPTY_STYLE ? this.styleIsDate(style) === STYLE_DATE : false;
        this.cells = [];
        this.width = 0;
        this.column = 0;
        break;
      }
      case K_C:
        this.cellDepth = depth;
        this.column = this.attrSeen & A_R ? this.attrR : this.column + 1;
        this.cellType = this.attrT;
        this.cellStyle = this.attrSeen & A_S ? this.attrS : -1;
        this.formula = false;
        this.valueText = '';
        this.valueSource = EMPTY;
        this.valueStart = this.valueEnd = 0;
        break;
      case K_F:
        if (this.formulaTypeSet) this.formula = true;
        this.collect = COLLECT_FORMULA;
        this.collectDepth = depth;
        break;
      case K_V:
        this.collect = COLLECT_VALUE;
        this.collectDepth = depth;
        break;
      case K_IS:
        this.inlineDepth = depth;
        break;
      case K_R:
        this.runDepth = depth;
        break;
      default:
        break;
    }
  }

  private closeElement(depth: number): void {
    if (depth === this.collectDepth) {
      this.collect = COLLECT_NONE;
      this.collectDepth = -1;
    } else if (depth === this.runDepth) {
      this.runDepth = -1;
    } else if (depth === this.inlineDepth) {
      this.inlineDepth = -1;
    } else if (depth === this.cellDepth) {
      this.cellDepth = -1;
      this.finishCell();
    } else if (depth === this.rowDepth) {
      this.rowDepth = -1;
      const cells = this.cells;
      cells.length = this.width;
      this.onRow(this.rowNumber, cells);
    } else if (depth === this.sheetDataDepth) {
      this.sheetDataDepth = -1;
    }
  }

  // ---- values ----------------------------------------------------------------------------------

  /** The cell's value by exceljs's rules (see the class comment); left out when it has none. */
  private finishCell(): void {
    const hasValue = this.valueEnd > this.valueStart || this.valueText !== '';
    let value: RawCell;
    if (this.formula) {
      // A formula gives its cached result; without one it still is a (null) cell.
      if (!hasValue) value = null;
      else if (this.cellType === T_STR) value = this.rules.decodeStr(this.valueString());
      else if (this.cellType === T_BOOL) value = parseInt(this.valueString(), 10) !== 0;
      else if (this.cellType === T_ERROR) value = { error: this.valueString() };
      else value = this.number();
    } else {
      if (!hasValue) return;
      switch (this.cellType) {
        case T_SHARED: {
          const shared = this.rules.sharedString(parseInt(this.valueString(), 10));
          if (shared === undefined) return;
          value = shared;
          break;
        }
        case T_STR:
          value = this.rules.decodeStr(this.valueString());
          break;
        case T_INLINE:
          value = this.valueString();
          break;
        case T_BOOL:
          value = parseInt(this.valueString(), 10) !== 0;
          break;
        case T_ERROR:
          value = { error: this.valueString() };
          break;
        default:
          value = this.number();
      }
    }
    const column = this.column;
    if (column <= 0) return;
    const cells = this.cells;
    if (column === cells.length + 1) cells.push(value);
    else {
      while (cells.length < column - 1) cells.push(null);
      cells[column - 1] = value;
    }
    if (column > this.width) this.width = column;
  }

  /** The value as a number (`parseFloat`), or a date when the cell's own style (else the row's) has a date format. */
  private number(): number | Date {
    let serial = NaN;
    if (this.valueText === '') serial = exactDecimal(this.valueSource, this.valueStart, this.valueEnd);
    if (serial !== serial) serial = parseFloat(this.valueString());
    const style = this.cellStyle > 0 ? this.styleIsDate(this.cellStyle) : STYLE_MISSING;
    const isDate = style === STYLE_MISSING ? this.rowIsDate : style === STYLE_DATE;
    return isDate ? this.rules.serialToDate(serial) : serial;
  }

  private styleIsDate(id: number): number {
    const small = id >= 0 && id < 65536;
    let known = small ? (this.dateStyles[id] ?? STYLE_UNKNOWN) : STYLE_UNKNOWN;
    if (known === STYLE_UNKNOWN) {
      const answer = this.rules.isDateStyle(id);
      known = answer === undefined ? STYLE_MISSING : answer ? STYLE_DATE : STYLE_NOT_DATE;
      if (small) this.dateStyles[id] = known;
    }
    return known;
  }
}

function malformed(buf: Buffer, tagStart: number, at: number, what: string): SheetXmlError {
  return new SheetXmlError(`the sheet XML has a malformed ${what} (${JSON.stringify(buf.toString('utf8', tagStart, Math.min(buf.length, at + 1)).slice(-60))})`);
}

function nameForMessage(latin1Name: string): string {
  return Buffer.from(latin1Name, 'latin1').toString('utf8');
}

function startsWithAscii(buf: Uint8Array, at: number, text: string): boolean {
  if (at + text.length > buf.length) return false;
  for (let k = 0; k < text.length; k++) if (buf[at + k] !== text.charCodeAt(k)) return false;
  return true;
}

/** Whether `buf[at…]` (all of it) is the start of `text`. */
function isAsciiPrefix(buf: Uint8Array, at: number, text: string): boolean {
  for (let k = at; k < buf.length; k++) if (buf[k] !== text.charCodeAt(k - at)) return false;
  return true;
}

/**
 * Where text running to the end of a chunk can be cut: before a reference without its `;`, an
 * incomplete UTF-8 character, or a final CR (which may start a CR LF pair).
 */
function safeTextCut(buf: Uint8Array, start: number, end: number): number {
  let cut = end;
  // A reference is at most `&#x` + 8 digits + `;` long; an `&` further back without `;` is an error anyway.
  for (let k = end - 1; k >= start && k >= end - 16; k--) {
    const byte = buf[k];
    if (byte === SEMICOLON) break;
    if (byte === AMP) {
      cut = k;
      break;
    }
  }
  // A UTF-8 lead byte (11xxxxxx) among the last three bytes whose character needs more bytes than are there.
  for (let k = end - 1; k >= start && k >= end - 3; k--) {
    const byte = buf[k]!;
    if (byte < 0x80) break;
    if (byte >= 0xc0) {
      const length = byte >= 0xf0 ? 4 : byte >= 0xe0 ? 3 : 2;
      if (end - k < length && k < cut) cut = k;
      break;
    }
  }
  if (cut === end && end > start && buf[end - 1] === CR) cut = end - 1;
  return cut;
}

/** Text as XML reads it: line ends normalised (XML 1.0 §2.11), then references replaced. */
function cleanText(raw: string): string {
  let text = raw;
  if (text.indexOf('\r') >= 0) text = text.replace(/\r\n?/g, '\n');
  if (text.indexOf('&') >= 0) text = decodeReferences(text);
  return text;
}

/** Exact powers of ten: every one up to 10^22 is a double without rounding. */
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => 10 ** k);
const MAX_EXACT_INTEGER = 2 ** 53;

/**
 * `parseFloat` of the ASCII bytes `bytes[start, end)` when they are a plain decimal
 * (`-?digits[.digits]`) whose digits form an integer below 2^53 with at most 22 after the point;
 * NaN for anything else (the caller then uses parseFloat). Exact: the digits and the power of ten
 * are both doubles without rounding, so one IEEE division rounds the decimal's value correctly,
 * as parseFloat does (W. D. Clinger, "How to read floating point numbers accurately", PLDI 1990:
 * the fast path).
 */
export function exactDecimal(bytes: ArrayLike<number>, start: number, end: number): number {
  let k = start;
  const negative = bytes[k] === MINUS;
  if (negative) k++;
  let mantissa = 0;
  let digits = 0;
  let fractionDigits = 0;
  let point = false;
  for (; k < end; k++) {
    const byte = bytes[k]!;
    const digit = byte - 48;
    if (digit >= 0 && digit <= 9) {
      mantissa = mantissa * 10 + digit;
      digits++;
      if (point) fractionDigits++;
    } else if (byte === POINT && !point) {
      point = true;
    } else {
      return NaN;
    }
  }
  // Once the digits reach 2^53 the running value may have been rounded; rounding never takes it back below.
  if (digits === 0 || mantissa >= MAX_EXACT_INTEGER || fractionDigits > 22) return NaN;
  const value = fractionDigits === 0 ? mantissa : mantissa / POWERS_OF_TEN[fractionDigits]!;
  return negative ? -value : value;
}

/** The kind of element by its local name `buf[start, end)`. */
function elementKind(buf: Uint8Array, start: number, end: number): number {
  const b0 = buf[start];
  switch (end - start) {
    case 1:
      return b0 === 99 ? K_C : b0 === 118 ? K_V : b0 === 102 ? K_F : b0 === 116 ? K_T : b0 === 114 ? K_R : K_OTHER;
    case 2:
      return b0 === 105 && buf[start + 1] === 115 ? K_IS : K_OTHER;
    case 3:
      return b0 === 114 && buf[start + 1] === 111 && buf[start + 2] === 119 ? K_ROW : K_OTHER;
    case 9:
      return startsWithAscii(buf, start, 'sheetData') ? K_SHEET_DATA : K_OTHER;
    default:
      return K_OTHER;
  }
}

/** Column number (1-based) of a cell reference such as "AB12" in `bytes[start, end)`; 0 without letters. */
function columnOfRef(bytes: Uint8Array, start: number, end: number): number {
  let col = 0;
  for (let k = start; k < end; k++) {
    const byte = bytes[k]!;
    if (byte < 65 || byte > 90) break;
    col = col * 26 + (byte - 64);
  }
  return col;
}

/** `parseInt` of the ASCII bytes `bytes[start, end)`, without making a string for plain digits. */
function integerAt(bytes: Uint8Array, start: number, end: number): number {
  if (end > start && end - start <= 9) {
    let value = 0;
    let k = start;
    for (; k < end; k++) {
      const digit = bytes[k]! - 48;
      if (digit < 0 || digit > 9) break;
      value = value * 10 + digit;
    }
    if (k === end) return value;
  }
  return parseInt(Buffer.from(bytes.buffer, bytes.byteOffset + start, end - start).toString('utf8'), 10);
}

/** The cell type of a `t` attribute value `bytes[start, end)`. */
function cellTypeAt(bytes: Uint8Array, start: number, end: number): number {
  const length = end - start;
  const b0 = bytes[start];
  if (length === 1) return b0 === 115 ? T_SHARED : b0 === 98 ? T_BOOL : b0 === 101 ? T_ERROR : T_NUMBER;
  if (length === 3 && startsWithAscii(bytes, start, 'str')) return T_STR;
  if (length === 9 && startsWithAscii(bytes, start, 'inlineStr')) return T_INLINE;
  return T_NUMBER;
}

/** Whether `code` is a character XML 1.0 allows (§2.2 production Char). */
function isXmlChar(code: number): boolean {
  return code === 0x9 || code === 0xa || code === 0xd || (code >= 0x20 && code <= 0xd7ff) || (code >= 0xe000 && code <= 0xfffd) || (code >= 0x10000 && code <= 0x10ffff);
}

/**
 * Replaces the entity and character references of `s` (XML 1.0 §4.1, §4.6): `&amp;` `&lt;`
 * `&gt;` `&quot;` `&apos;`, `&#NN;` and `&#xNN;`. Any other `&` is an error (a sheet has no DTD
 * to declare entities in).
 */
export function decodeReferences(s: string): string {
  let out = '';
  let last = 0;
  let amp = s.indexOf('&');
  while (amp >= 0) {
    const semi = s.indexOf(';', amp + 1);
    if (semi < 0) throw new SheetXmlError(`the sheet XML has a "&" that starts no reference (${JSON.stringify(s.slice(amp, amp + 12))})`);
    const name = s.slice(amp + 1, semi);
    let replacement: string;
    switch (name) {
      case 'amp':
        replacement = '&';
        break;
      case 'lt':
        replacement = '<';
        break;
      case 'gt':
        replacement = '>';
        break;
      case 'quot':
        replacement = '"';
        break;
      case 'apos':
        replacement = "'";
        break;
      default: {
        const code = /^#x[0-9a-fA-F]{1,8}$/.test(name) ? parseInt(name.slice(2), 16) : /^#[0-9]{1,10}$/.test(name) ? parseInt(name.slice(1), 10) : -1;
        if (!isXmlChar(code)) throw new SheetXmlError(`the sheet XML has an unknown or invalid reference (${JSON.stringify(s.slice(amp, semi + 1).slice(0, 20))})`);
        replacement = String.fromCodePoint(code);
      }
    }
    out += s.slice(last, amp) + replacement;
    last = semi + 1;
    amp = s.indexOf('&', last);
  }
  return out + s.slice(last);
}
