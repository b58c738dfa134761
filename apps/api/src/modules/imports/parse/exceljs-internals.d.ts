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
