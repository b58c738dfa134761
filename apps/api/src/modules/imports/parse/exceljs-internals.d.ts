/**
 * Types for the exceljs 4.4 value helpers that the sheet reader uses (read-file.ts). exceljs
 * ships no types for them.
 */
declare module 'exceljs/lib/utils/utils' {
  const utils: {
    xmlDecode(text: string): string;
    isDateFmt(fmt: string | undefined): boolean;
    excelToDate(serial: number, date1904: boolean | undefined): Date;
  };
  export default utils;
}

/** The part of unzipper 0.10 the workbook reader uses (read-file.ts): a zip read from memory. */
declare module 'unzipper' {
  import type { Readable } from 'node:stream';
  interface ZipEntry {
    path: string;
    type: 'File' | 'Directory';
    /** CRC-32 and size of the inflated content, from the central directory. */
    crc32: number;
    uncompressedSize: number;
    /** The entry's content, inflated. */
    stream(password?: string): Readable;
  }
  const unzipper: {
    Open: { buffer(bytes: Buffer): Promise<{ files: ZipEntry[] }> };
  };
  export default unzipper;
}
