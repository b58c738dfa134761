/**
 * Types for the parts of exceljs 4.4's streaming reader that the lean sheet reader uses
 * (read-file.ts): its SAX event source and value helpers. exceljs ships no types for them.
 */
declare module 'exceljs/lib/utils/parse-sax' {
  interface SaxTag {
    name: string;
    attributes: Record<string, string | undefined>;
  }
  type SaxEvent = { eventType: 'opentag' | 'closetag'; value: SaxTag } | { eventType: 'text'; value: string };
  /** SAX events of an XML byte stream, in batches (one batch per chunk read). */
  export default function parseSax(iterable: AsyncIterable<unknown>): AsyncGenerator<SaxEvent[]>;
}

declare module 'exceljs/lib/utils/utils' {
  const utils: {
    xmlDecode(text: string): string;
    isDateFmt(fmt: string | undefined): boolean;
    excelToDate(serial: number, date1904: boolean | undefined): Date;
  };
  export default utils;
}
