/**
 * What an uploaded file really is, from its first bytes — never from its name or the browser's
 * media type, which say what the file claims to be.
 *
 * - `.xlsx` is a ZIP package (local file header "PK\x03\x04", APPNOTE.TXT §4.3.7) holding
 *   `xl/workbook.xml` (ECMA-376 Part 2 package, Part 1 SpreadsheetML).
 * - A password-protected `.xlsx` is not a ZIP: Excel wraps the encrypted package in a Compound File
 *   (magic D0 CF 11 E0 A1 B1 1A E1, [MS-CFB] §2.2) whose streams are named "EncryptionInfo" and
 *   "EncryptedPackage" ([MS-OFFCRYPTO] §2.3.4). The legacy `.xls` format is a Compound File too.
 * - CSV is text: no NUL bytes, and readable as UTF-8 (or, failing that, Windows-1252).
 */

export type SniffedFile =
  | { kind: 'xlsx' }
  | { kind: 'csv' }
  | { kind: 'encrypted_workbook' }
  | { kind: 'legacy_xls' }
  | { kind: 'zip_not_workbook' }
  | { kind: 'empty' }
  | { kind: 'unknown' };

const zipMagic = Buffer.from([0x50, 0x4b, 0x03, 0x04]);
const cfbMagic = Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]);
const encryptedPackageName = Buffer.from('EncryptedPackage', 'utf16le');
const workbookPartName = Buffer.from('xl/workbook.xml', 'latin1');
const spreadsheetFolder = Buffer.from('xl/', 'latin1');
const wordFolder = Buffer.from('word/', 'latin1');
const slidesFolder = Buffer.from('ppt/', 'latin1');

/**
 * @example
 * sniffFileType(Buffer.from('Time;NOx\n2026-10-01 00:01;12,5\n')) //=> { kind: 'csv' }
 */
export function sniffFileType(bytes: Buffer): SniffedFile {
  if (bytes.length === 0) return { kind: 'empty' };
  if (bytes.subarray(0, 4).equals(zipMagic)) {
    // Part names are stored uncompressed in the local headers and the central directory. A
    // truncated workbook may have lost its workbook.xml but still shows spreadsheet parts ("xl/"):
    // it is read as a workbook and reported as damaged, not as "not a workbook".
    if (bytes.includes(workbookPartName)) return { kind: 'xlsx' };
    const spreadsheetParts = bytes.includes(spreadsheetFolder) && !bytes.includes(wordFolder) && !bytes.includes(slidesFolder);
    return spreadsheetParts ? { kind: 'xlsx' } : { kind: 'zip_not_workbook' };
  }
  if (bytes.subarray(0, 8).equals(cfbMagic)) {
    return bytes.includes(encryptedPackageName) ? { kind: 'encrypted_workbook' } : { kind: 'legacy_xls' };
  }
  return looksLikeText(bytes) ? { kind: 'csv' } : { kind: 'unknown' };
}

function looksLikeText(bytes: Buffer): boolean {
  const head = bytes.subarray(0, 64 * 1024);
  if (head.includes(0)) return false;
  let control = 0;
  for (const byte of head) {
    // Tab, LF, CR are text; other C0 controls are not.
    if (byte < 0x20 && byte !== 0x09 && byte !== 0x0a && byte !== 0x0d) control++;
  }
  return control === 0;
}

/** Decodes a CSV file: UTF-8 (with or without BOM), else Windows-1252 (older Windows exports). */
export function decodeText(bytes: Buffer): string {
  const withoutBom = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? bytes.subarray(3) : bytes;
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(withoutBom);
  } catch {
    return new TextDecoder('windows-1252').decode(withoutBom);
  }
}
