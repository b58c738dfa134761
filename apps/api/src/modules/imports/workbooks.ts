/**
 * Workbooks the import screens offer for download: the example (template) workbook of a stack and
 * the list of every problem found in a file. Both are written with exceljs's streaming writer
 * straight into the response.
 */
import type { Writable } from 'node:stream';
import ExcelJS from 'exceljs';

export interface TemplateChannel {
  parameter: string;
  unit: string;
  basis: 'wet' | 'dry';
  sourceLabel: string | null;
  intervalMinutes: number;
}

/** The header a channel gets in the template: its logger label, else "NOx [mg/Nm3] dry". */
export function templateHeader(channel: TemplateChannel): string {
  if (channel.sourceLabel) return channel.sourceLabel;
  const basis = ['O2', 'NOx', 'NO', 'NO2', 'SO2', 'CO', 'CO2', 'dust', 'HCl', 'HF', 'TOC', 'NH3', 'Hg'].includes(channel.parameter) ? ` ${channel.basis}` : '';
  return `${channel.parameter} [${channel.unit}]${basis}`;
}

export async function writeTemplateWorkbook(stream: Writable, stack: { name: string; timeZone: string }, channels: TemplateChannel[]): Promise<void> {
  const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ stream, useStyles: true, useSharedStrings: false });
  workbook.creator = 'FlueLedger';
  const data = workbook.addWorksheet('Data');
  data.columns = [
    { key: 't', width: 20, style: { numFmt: 'yyyy-mm-dd hh:mm' } },
    ...channels.map((c, i) => ({ key: `c${i}`, width: Math.max(14, templateHeader(c).length + 2) })),
    { key: 'status', width: 14 },
  ];
  const header = data.addRow(['Time stamp', ...channels.map(templateHeader), 'Status']);
  header.font = { bold: true };
  header.commit();
  data.commit();

  const notes = workbook.addWorksheet('How to fill in');
  notes.columns = [{ key: 'a', width: 110 }];
  const interval = channels.length > 0 ? Math.min(...channels.map((c) => c.intervalMinutes)) : 1;
  const lines = [
    `Example workbook for stack "${stack.name}" — one row per ${interval === 1 ? 'minute' : `${interval} minutes`}, one column per channel.`,
    '',
    `Time stamp: local time of the site (${stack.timeZone}), as an Excel date/time or text such as 2026-10-01 00:01 or 01.10.2026 00:01.`,
    'By default a time stamp marks the END of its interval (00:01 = the minute from 00:00 to 00:01); the import lets you choose the start instead.',
    'When summer time ends, write the repeated hour twice, in order (first summer time, then winter time).',
    'Values: numbers, with a decimal point or a decimal comma. Leave a cell blank when there is no value; text in a value cell is reported.',
    'Status (optional): OK, calibration (CAL), maintenance, fault, out of range, not operating, startup/shutdown. Blank means OK.',
    'Keep the header row as it is: the import maps the columns to channels by these names.',
    '',
    'FlueLedger supports, and does not replace, the operator\u2019s regulatory reporting; the permit and local regulations decide.',
  ];
  for (const line of lines) notes.addRow([line]).commit();
  notes.commit();
  await workbook.commit();
}

export interface ProblemLine {
  row_number: number;
  column_label: string;
  value: string;
  code: string;
  reason: string;
}

export async function writeProblemsWorkbook(stream: Writable, fileName: string, problems: ProblemLine[]): Promise<void> {
  const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ stream, useStyles: true, useSharedStrings: false });
  workbook.creator = 'FlueLedger';
  const sheet = workbook.addWorksheet('Problems');
  sheet.columns = [
    { key: 'row', width: 8 },
    { key: 'column', width: 34 },
    { key: 'value', width: 22 },
    { key: 'code', width: 22 },
    { key: 'reason', width: 90 },
  ];
  const header = sheet.addRow(['Row', 'Column', 'Value', 'Problem', 'Why it is not imported']);
  header.font = { bold: true };
  header.commit();
  for (const p of problems) sheet.addRow({ row: p.row_number, column: p.column_label, value: p.value, code: p.code, reason: p.reason }).commit();
  if (problems.length === 0) sheet.addRow({ reason: `No problems found in ${fileName}.` }).commit();
  sheet.commit();
  await workbook.commit();
}
