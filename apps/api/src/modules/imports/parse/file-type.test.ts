import { decodeText, sniffFileType } from './file-type';

describe('sniffFileType', () => {
  it('knows a workbook by its ZIP signature and workbook part', () => {
    expect(sniffFileType(Buffer.concat([Buffer.from('PK\x03\x04', 'latin1'), Buffer.from('....xl/workbook.xml....')]))).toEqual({ kind: 'xlsx' });
  });

  it('tells a ZIP that is no workbook', () => {
    expect(sniffFileType(Buffer.concat([Buffer.from('PK\x03\x04', 'latin1'), Buffer.from('word/document.xml')]))).toEqual({ kind: 'zip_not_workbook' });
  });

  it('tells an encrypted workbook from a legacy .xls (both Compound Files, [MS-CFB] §2.2)', () => {
    const cfb = Buffer.from('d0cf11e0a1b11ae1', 'hex');
    expect(sniffFileType(Buffer.concat([cfb, Buffer.from('EncryptedPackage', 'utf16le')]))).toEqual({ kind: 'encrypted_workbook' });
    expect(sniffFileType(Buffer.concat([cfb, Buffer.from('Workbook', 'utf16le')]))).toEqual({ kind: 'legacy_xls' });
  });

  it('takes text as CSV and binary as unknown', () => {
    expect(sniffFileType(Buffer.from('Time;NOx\n2026-10-01 00:01;12,5\n'))).toEqual({ kind: 'csv' });
    expect(sniffFileType(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0, 1, 2]))).toEqual({ kind: 'unknown' });
    expect(sniffFileType(Buffer.alloc(0))).toEqual({ kind: 'empty' });
  });

  it('decodes UTF-8 with a BOM and falls back to Windows-1252', () => {
    expect(decodeText(Buffer.from('\ufeffTemp °C', 'utf8'))).toBe('Temp °C');
    expect(decodeText(Buffer.from([0x54, 0x20, 0xb0, 0x43]))).toBe('T °C');
  });
});
