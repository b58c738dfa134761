/**
 * Turns the rows of one sheet (from the workbook or CSV reader) into timestamped readings and a
 * list of problems, one row at a time so a month of one-minute data is never held twice.
 *
 * Decisions made here, in order:
 * 1. Header row: the first rows (up to 50) are held back until the first data row is found — a
 *    row with a timestamp-like cell and at least one number. The nearest text row above it is the
 *    header; a row of units directly under a name row is folded into the names ("NOx" + "mg/Nm3").
 *    Title lines above the header are ignored. No text row above → columns are named by letter.
 * 2. Timestamp column: the one that holds timestamps in the data rows (dates, text dates, or Excel
 *    serial numbers under a header such as "Time"), preferring a header that says so, else the
 *    leftmost. The officer may choose another one.
 * 3. Status column: a header such as "Status" (optional; the officer may choose or clear it).
 * 4. Every other column is a value column; each cell is a number or a problem.
 * 5. After the last row: slashed dates settle day-first or month-first for the whole column; local
 *    times become UTC in the site's zone (times the clock skips are problems; times it shows twice
 *    are resolved only when the file itself shows them twice in order, else they are problems);
 *    the reading interval is the most common step between timestamps; interval-end labels are
 *    moved to the start of their interval (readings are stored by the start of the interval they
 *    cover); duplicate timestamps and rows outside the declared period are problems.
 */
import { cellText, columnLetter, isBlank, isErrorCell, type RawCell } from './cells';
import { headerHints, looksLikeStatusHeader, looksLikeTimestampHeader, type HeaderHints } from './headers';
import { LocalTimeConverter, excelSerialToWallMs, formatWall, millisecondsInSecond } from './local-time';
import { parseDecimalText } from './numbers';
import { parseStatusText, type ImportedStatus } from './status-values';
import { leadingDayMonthPair, parseTextTimestamp, settleDayMonthOrder, type DayMonthDecision } from './text-dates';

export type IntervalConvention = 'interval_end' | 'interval_start';

export type ProblemCode =
  | 'blank'
  | 'text'
  | 'error_cell'
  | 'date_in_value'
  | 'bad_timestamp'
  | 'missing_local_time'
  | 'ambiguous_local_time'
  | 'duplicate_timestamp'
  | 'outside_period'
  | 'unknown_status';

/** Row-level problems reject the whole row; the others reject one cell. */
export const rowProblemCodes: ReadonlySet<ProblemCode> = new Set([
  'bad_timestamp', 'missing_local_time', 'ambiguous_local_time', 'duplicate_timestamp', 'outside_period', 'unknown_status',
]);

export interface Problem {
  /** Row number in the file (spreadsheet row, or CSV line). */
  row: number;
  /** 0-based column index in the sheet. */
  columnIndex: number;
  value: string;
  code: ProblemCode;
  reason: string;
}

export interface ParsedColumn {
  /** 0-based column index in the sheet. */
  index: number;
  letter: string;
  header: string;
  hints: HeaderHints;
  /** First few numbers of the column (for the mapping screen). */
  sample: number[];
  numbers: number;
  problems: number;
}

export interface InterpretOptions {
  timeZone: string;
  /** Site's country (ISO 3166-1 alpha-2): settles day/month order when the data cannot. */
  country: string | null;
  /** The workbook's 1904 date system flag (only for serial numbers that are not date-formatted). */
  date1904?: boolean;
  /** 0-based column index; undefined = detect. */
  timestampColumn?: number;
  /** 0-based column index, null = none; undefined = detect. */
  statusColumn?: number | null;
  intervalConvention: IntervalConvention;
  /** Declared period, [fromUtcMs, toUtcMs): readings must start and end inside it. */
  period?: { fromUtcMs: number; toUtcMs: number } | null;
  /** Interval to assume when the file has a single timestamp. */
  fallbackIntervalSeconds?: number;
  maxRows?: number;
  /** Stored problems are capped; counts stay exact. */
  maxProblems?: number;
}

export interface ParsedSheet {
  headerRowNumber: number | null;
  timestampColumn: number;
  timestampHeader: string;
  statusColumn: number | null;
  /** Value columns, in sheet order. */
  columns: ParsedColumn[];
  /** Rows that carry data (blank rows skipped), in file order. */
  rowCount: number;
  rowNumbers: Int32Array;
  /** Start of the interval each row covers, UTC ms; NaN when the row is rejected. */
  tUtcMs: Float64Array;
  statuses: ImportedStatus[];
  /** Per value column (same order as `columns`): value per row, NaN = no reading. */
  values: Float64Array[];
  problems: Problem[];
  problemCount: number;
  problemCountsByCode: Partial<Record<ProblemCode, number>>;
  intervalSeconds: number | null;
  dayMonth: DayMonthDecision | null;
  span: { fromUtcMs: number; toUtcMs: number } | null;
  duplicateRows: number;
  notes: string[];
}

/** A reason the file cannot be imported at all (answered as 422). */
export class SheetRejected extends Error {
  constructor(
    readonly code: 'empty_sheet' | 'no_timestamp_column' | 'no_data_columns' | 'no_valid_rows' | 'too_many_rows' | 'all_outside_period',
    message: string,
  ) {
    super(message);
  }
}

const headRowsHeld = 50;
const minPlausibleYear = 1990;
const maxPlausibleYear = 2100;
const serialRange = { min: 25569 /* 1970-01-01 */, max: 73051 /* 2100-01-01 */ };

// Timestamp states per row, kept in a byte array.
const TS_NONE = 0;
const TS_WALL = 1;
const TS_INSTANT = 2;
const TS_PENDING_TEXT = 3;

function timestampLike(cell: RawCell, headerSaysTime: boolean): boolean {
  if (cell instanceof Date) return true;
  if (typeof cell === 'number') return headerSaysTime && cell >= serialRange.min && cell < serialRange.max;
  if (typeof cell === 'string') return parseTextTimestamp(cell, 'day_first') !== null || leadingDayMonthPair(cell) !== null;
  return false;
}

function isNumberish(cell: RawCell): boolean {
  return typeof cell === 'number' || (typeof cell === 'string' && parseDecimalText(cell) !== null);
}

function isTextish(cell: RawCell): boolean {
  return typeof cell === 'string' && cell.trim() !== '' && parseDecimalText(cell) === null && parseTextTimestamp(cell, 'day_first') === null;
}

export class SheetInterpreter {
  private held: { rowNumber: number; cells: RawCell[] }[] = [];
  private layoutDecided = false;

  private headerRowNumber: number | null = null;
  private headers: string[] = [];
  private tsColumn = -1;
  private statusColumn: number | null = null;
  private valueColumns: number[] = [];

  private rowNumbers: number[] = [];
  private tsKind: number[] = [];
  private tsMs: number[] = [];
  private pendingText = new Map<number, string>();
  private tsDisplay = new Map<number, string>();
  private statuses: ImportedStatus[] = [];
  private rowRejected: boolean[] = [];
  private columnValues: number[][] = [];
  private columnSamples: number[][] = [];
  private columnNumbers: number[] = [];
  private columnProblems: number[] = [];

  private problems: Problem[] = [];
  private problemCount = 0;
  private problemCountsByCode: Partial<Record<ProblemCode, number>> = {};
  private readonly converter: LocalTimeConverter;

  constructor(private readonly options: InterpretOptions) {
    this.converter = new LocalTimeConverter(options.timeZone);
  }

  push(rowNumber: number, cells: RawCell[]): void {
    if (!this.layoutDecided) {
      this.held.push({ rowNumber, cells });
      if (this.held.length >= headRowsHeld) this.decideLayout();
      return;
    }
    this.interpretRow(rowNumber, cells);
  }

  finish(): ParsedSheet {
    if (!this.layoutDecided) this.decideLayout();
    return this.finishRows();
  }

  // ---- layout ---------------------------------------------------------------------------------

  private decideLayout(): void {
    this.layoutDecided = true;
    const rows = this.held;
    this.held = [];
    const nonBlank = rows.filter((r) => r.cells.some((c) => !isBlank(c)));
    if (nonBlank.length === 0) throw new SheetRejected('empty_sheet', 'The sheet is empty: there are no rows with data in it.');

    const forcedTs = this.options.timestampColumn;
    let firstData = -1;
    let tsColumn = -1;
    for (let i = 0; i < nonBlank.length && firstData < 0; i++) {
      const { cells } = nonBlank[i]!;
      const headerAbove = this.nearestTextRow(nonBlank, i);
      const candidates: number[] = [];
      for (let c = 0; c < cells.length; c++) {
        if (forcedTs !== undefined && c !== forcedTs) continue;
        const headerText = headerAbove ? cellText(headerAbove.cells[c]) : '';
        if (timestampLike(cells[c], looksLikeTimestampHeader(headerText.toLowerCase()) || forcedTs === c)) candidates.push(c);
      }
      const hasNumber = cells.some((cell, c) => !candidates.includes(c) && isNumberish(cell));
      if (candidates.length > 0 && hasNumber) {
        firstData = i;
        const named = headerAbove
          ? candidates.find((c) => looksLikeTimestampHeader(cellText(headerAbove.cells[c]).toLowerCase()))
          : undefined;
        tsColumn = named ?? candidates[0]!;
      }
    }
    if (firstData < 0) {
      throw new SheetRejected(
        'no_timestamp_column',
        forcedTs !== undefined
          ? `Column ${columnLetter(forcedTs)} holds no dates or times next to numbers.`
          : 'No timestamp column found: no column holds dates or times next to numeric values in the first rows.',
      );
    }

    // Header: nearest text row above the first data row that is not itself a data row (a row with
    // a time but no number, e.g. an outage row, is data); a units row under a names row is folded in.
    let headerIndex = -1;
    for (let i = firstData - 1; i >= 0; i--) {
      const cells = nonBlank[i]!.cells;
      if (timestampLike(cells[tsColumn], true)) continue;
      if (cells.some((c) => isTextish(c))) {
        headerIndex = i;
        break;
      }
    }
    const dataStart = headerIndex >= 0 ? headerIndex + 1 : firstData;
    let headers: string[] = [];
    if (headerIndex >= 0) {
      const headerCells = nonBlank[headerIndex]!.cells;
      headers = headerCells.map((c) => cellText(c).trim());
      this.headerRowNumber = nonBlank[headerIndex]!.rowNumber;
      const above = headerIndex > 0 ? nonBlank[headerIndex - 1] : undefined;
      if (above && this.isUnitsRow(headerCells) && above.cells.filter((c) => isTextish(c)).length >= 2) {
        headers = above.cells.map((c, i) => {
          const name = cellText(c).trim();
          const unit = headers[i] ?? '';
          return unit && name ? `${name} [${unit}]` : name || unit;
        });
        this.headerRowNumber = above.rowNumber;
      }
    }
    const width = Math.max(headers.length, ...nonBlank.slice(dataStart).map((r) => r.cells.length));
    for (let c = 0; c < width; c++) if (!headers[c]) headers[c] = '';
    this.headers = headers;
    this.tsColumn = tsColumn;

    if (this.options.statusColumn !== undefined) this.statusColumn = this.options.statusColumn;
    else {
      const found = headers.findIndex((h, c) => c !== tsColumn && h !== '' && looksLikeStatusHeader(headers[c]!.toLowerCase()));
      this.statusColumn = found >= 0 ? found : null;
    }
    if (this.statusColumn === tsColumn) this.statusColumn = null;

    const dataRows = nonBlank.slice(dataStart);
    for (let c = 0; c < width; c++) {
      if (c === tsColumn || c === this.statusColumn) continue;
      // A column with neither a header nor any value in the held rows is padding, not data.
      if (headers[c] === '' && !dataRows.some((r) => !isBlank(r.cells[c]))) continue;
      this.valueColumns.push(c);
    }
    if (this.valueColumns.length === 0) throw new SheetRejected('no_data_columns', 'The sheet has a timestamp column but no value columns.');
    this.columnValues = this.valueColumns.map(() => []);
    this.columnSamples = this.valueColumns.map(() => []);
    this.columnNumbers = this.valueColumns.map(() => 0);
    this.columnProblems = this.valueColumns.map(() => 0);

    const firstDataRowNumber = nonBlank[dataStart]!.rowNumber;
    for (const row of rows) {
      if (row.rowNumber < firstDataRowNumber) continue;
      this.interpretRow(row.rowNumber, row.cells);
    }
  }

  private nearestTextIndex(rows: { cells: RawCell[] }[], dataIndex: number): number {
    for (let i = dataIndex - 1; i >= 0; i--) {
      if (rows[i]!.cells.filter((c) => isTextish(c)).length >= 1) return i;
    }
    return -1;
  }

  private nearestTextRow(rows: { cells: RawCell[] }[], dataIndex: number): { cells: RawCell[] } | undefined {
    const i = this.nearestTextIndex(rows, dataIndex);
    return i >= 0 ? rows[i] : undefined;
  }

  private isUnitsRow(cells: RawCell[]): boolean {
    const texts = cells.filter((c) => isTextish(c)).map((c) => cellText(c));
    if (texts.length < 2) return false;
    const units = texts.filter((t) => {
      const hints = headerHints(`[${t}]`);
      return hints.unit !== null;
    });
    return units.length >= Math.ceil(texts.length * 0.6);
  }

  // ---- rows -----------------------------------------------------------------------------------

  private addProblem(problem: Problem): void {
    this.problemCount++;
    this.problemCountsByCode[problem.code] = (this.problemCountsByCode[problem.code] ?? 0) + 1;
    if (this.problems.length < (this.options.maxProblems ?? 100_000)) this.problems.push(problem);
  }

  private interpretRow(rowNumber: number, cells: RawCell[]): void {
    if (!cells.some((c) => !isBlank(c))) return;
    const index = this.rowNumbers.length;
    if (index >= (this.options.maxRows ?? 1_000_000)) {
      throw new SheetRejected('too_many_rows', `The sheet has more than ${this.options.maxRows ?? 1_000_000} rows; split the file.`);
    }
    this.rowNumbers.push(rowNumber);
    let rejected = false;

    // Timestamp
    const tsCell = cells[this.tsColumn];
    let kind = TS_NONE;
    let ms = NaN;
    // Set when the timestamp is unusable (no closure per row: a month is 44,640 rows).
    let tsReason: string | null = null;
    if (isBlank(tsCell)) tsReason = 'No timestamp in this row.';
    else if (tsCell instanceof Date) {
      kind = TS_WALL;
      ms = Math.round(tsCell.getTime() / millisecondsInSecond) * millisecondsInSecond;
    } else if (typeof tsCell === 'number') {
      const wall = excelSerialToWallMs(tsCell, this.options.date1904 ?? false);
      if (wall === null) tsReason = `${tsCell} is not a date (Excel serial day 60 is the non-existent 29 February 1900).`;
      else {
        kind = TS_WALL;
        ms = wall;
      }
    } else if (typeof tsCell === 'string') {
      if (leadingDayMonthPair(tsCell)) {
        kind = TS_PENDING_TEXT;
        this.pendingText.set(index, tsCell);
      } else {
        const parsed = parseTextTimestamp(tsCell, 'day_first');
        if (parsed === null) tsReason = `"${tsCell.trim()}" is not a date and time.`;
        else if (parsed.kind === 'invalid') tsReason = `"${tsCell.trim()}": ${parsed.reason}.`;
        else if (parsed.kind === 'wall') {
          kind = TS_WALL;
          ms = parsed.wallMs;
        } else {
          kind = TS_INSTANT;
          ms = parsed.utcMs;
        }
      }
    } else if (isErrorCell(tsCell)) tsReason = `The timestamp cell holds the spreadsheet error ${tsCell.error}.`;
    else tsReason = `"${cellText(tsCell)}" is not a date and time.`;
    if (kind === TS_WALL || kind === TS_INSTANT) {
      const year = new Date(ms).getUTCFullYear();
      if (year < minPlausibleYear || year >= maxPlausibleYear) {
        tsReason = `${formatWall(ms)} is not a plausible measurement time.`;
        kind = TS_NONE;
      }
    }
    if (tsReason !== null) {
      rejected = true;
      this.addProblem({ row: rowNumber, columnIndex: this.tsColumn, value: cellText(tsCell), code: 'bad_timestamp', reason: tsReason });
    }
    // Text timestamps are shown as written; the others are formatted only if a problem needs them.
    if (kind !== TS_NONE && typeof tsCell === 'string') this.tsDisplay.set(index, tsCell.trim());
    this.tsKind.push(kind);
    this.tsMs.push(ms);

    // Status
    let status: ImportedStatus = 'valid';
    if (this.statusColumn !== null) {
      const statusCell = cells[this.statusColumn];
      const text = isBlank(statusCell) ? '' : cellText(statusCell);
      const parsed = parseStatusText(text);
      if (parsed === null) {
        rejected = true;
        this.addProblem({
          row: rowNumber,
          columnIndex: this.statusColumn,
          value: text,
          code: 'unknown_status',
          reason: `Unknown status "${text}": the row is not imported (known: valid/ok, calibration, maintenance, fault, out of range, not operating, startup/shutdown).`,
        });
      } else status = parsed;
    }
    this.statuses.push(status);

    // Values
    for (let k = 0; k < this.valueColumns.length; k++) {
      const c = this.valueColumns[k]!;
      const cell = cells[c];
      let value = NaN;
      let problem: { code: ProblemCode; reason: string } | null = null;
      if (isBlank(cell)) {
        // A blank cell in a row the logger marked as not valid is the logger saying "no value".
        if (status === 'valid') problem = { code: 'blank', reason: 'Blank cell: no reading.' };
      } else if (typeof cell === 'number') value = cell;
      else if (cell instanceof Date) problem = { code: 'date_in_value', reason: 'A date in a value column.' };
      else if (typeof cell === 'string') {
        const parsed = parseDecimalText(cell);
        if (parsed === null) problem = { code: 'text', reason: `Text "${cell.trim()}" where a number is expected.` };
        else value = parsed;
      } else if (isErrorCell(cell)) problem = { code: 'error_cell', reason: `The cell holds the spreadsheet error ${cell.error}.` };
      else problem = { code: 'text', reason: `${cellText(cell)} where a number is expected.` };
      if (Number.isFinite(value)) {
        this.columnNumbers[k]!++;
        if (this.columnSamples[k]!.length < 5) this.columnSamples[k]!.push(value);
      } else value = NaN;
      if (problem) {
        this.columnProblems[k]!++;
        this.addProblem({ row: rowNumber, columnIndex: c, value: cellText(cell), ...problem });
      }
      this.columnValues[k]!.push(value);
    }
    this.rowRejected.push(rejected);
  }

  // ---- after the last row ----------------------------------------------------------------------

  private rejectRow(i: number, columnIndex: number, value: string, code: ProblemCode, reason: string): void {
    this.rowRejected[i] = true;
    this.addProblem({ row: this.rowNumbers[i]!, columnIndex, value, code, reason });
  }

  private finishRows(): ParsedSheet {
    const n = this.rowNumbers.length;
    const notes: string[] = [];
    const labelUtc = new Float64Array(n).fill(NaN);

    // 1. Slashed dates: one day/month order for the column.
    let dayMonth: DayMonthDecision | null = null;
    if (this.pendingText.size > 0) {
      dayMonth = settleDayMonthOrder(this.pendingText.values(), this.options.country);
      const orderText = dayMonth.order === 'day_first' ? 'day/month/year' : 'month/day/year';
      if (dayMonth.settledBy === 'site') {
        notes.push(`Dates such as "${this.pendingText.values().next().value}" could be day/month or month/day; no day above 12 settles it, so the site's country decided: ${orderText}.`);
      } else if (dayMonth.settledBy === 'contradictory') {
        notes.push(`The timestamp column mixes day/month and month/day dates; read as ${orderText}, and the others are reported.`);
      }
      for (const [i, text] of this.pendingText) {
        const parsed = parseTextTimestamp(text, dayMonth.order);
        if (parsed === null || parsed.kind === 'invalid') {
          this.rejectRow(i, this.tsColumn, text, 'bad_timestamp', parsed ? `"${text.trim()}" read as ${orderText}: ${parsed.reason}.` : `"${text.trim()}" is not a date and time.`);
          continue;
        }
        if (parsed.kind === 'wall') {
          this.tsKind[i] = TS_WALL;
          this.tsMs[i] = parsed.wallMs;
        } else {
          this.tsKind[i] = TS_INSTANT;
          this.tsMs[i] = parsed.utcMs;
        }
      }
    }

    // 2. Wall clock → UTC in the site's zone.
    const ambiguous = new Map<number, number[]>();
    const ambiguousResult = new Map<number, { earlierUtcMs: number; laterUtcMs: number }>();
    for (let i = 0; i < n; i++) {
      const kind = this.tsKind[i];
      if (kind === TS_INSTANT) labelUtc[i] = this.tsMs[i]!;
      if (kind !== TS_WALL) continue;
      const wall = this.tsMs[i]!;
      const result = this.converter.toUtc(wall);
      if (result.kind === 'unique') labelUtc[i] = result.utcMs;
      else if (result.kind === 'missing') {
        this.rejectRow(i, this.tsColumn, formatWall(wall), 'missing_local_time',
          `${formatWall(wall)} does not exist in ${this.options.timeZone}: the clocks skip it when summer time starts.`);
      } else {
        const group = ambiguous.get(wall) ?? [];
        group.push(i);
        ambiguous.set(wall, group);
        ambiguousResult.set(wall, result);
      }
    }
    let resolvedByOrder = 0;
    for (const [wall, group] of ambiguous) {
      const result = ambiguousResult.get(wall)!;
      if (group.length === 2) {
        // The file shows this wall time twice: in time order, the first is summer time.
        labelUtc[group[0]!] = result.earlierUtcMs;
        labelUtc[group[1]!] = result.laterUtcMs;
        resolvedByOrder += 2;
        continue;
      }
      const reason = group.length === 1
        ? `${formatWall(wall)} happens twice in ${this.options.timeZone} when summer time ends, and the file shows it once: it cannot tell which is meant.`
        : `${formatWall(wall)} happens twice in ${this.options.timeZone} when summer time ends, but the file shows it ${group.length} times.`;
      for (const i of group) this.rejectRow(i, this.tsColumn, formatWall(wall), 'ambiguous_local_time', reason);
    }
    if (resolvedByOrder > 0) {
      notes.push(`${resolvedByOrder} rows in the repeated hour at the end of summer time were placed by their order in the file (first summer time, then winter time).`);
    }

    // 3. Reading interval: the most common step between consecutive distinct timestamps.
    const sorted = Array.from(labelUtc).filter((t) => Number.isFinite(t)).sort((a, b) => a - b);
    const stepCounts = new Map<number, number>();
    for (let i = 1; i < sorted.length; i++) {
      const step = sorted[i]! - sorted[i - 1]!;
      if (step > 0) stepCounts.set(step, (stepCounts.get(step) ?? 0) + 1);
    }
    let intervalMs: number | null = null;
    let best = 0;
    for (const [step, count] of stepCounts) {
      if (count > best || (count === best && step < (intervalMs ?? Infinity))) [intervalMs, best] = [step, count];
    }
    if (intervalMs === null && this.options.fallbackIntervalSeconds) intervalMs = this.options.fallbackIntervalSeconds * 1000;
    const intervalSeconds = intervalMs === null ? null : intervalMs / 1000;

    // 4. Interval convention: store the start of the interval each reading covers.
    const tUtc = new Float64Array(n).fill(NaN);
    const shiftMs = this.options.intervalConvention === 'interval_end' ? intervalMs ?? 0 : 0;
    for (let i = 0; i < n; i++) if (Number.isFinite(labelUtc[i]!)) tUtc[i] = labelUtc[i]! - shiftMs;

    // 5. Duplicate timestamps: identical rows are imported once; differing ones are not imported.
    const firstRowAt = new Map<number, number>();
    let duplicateRows = 0;
    for (let i = 0; i < n; i++) {
      const t = tUtc[i]!;
      if (!Number.isFinite(t)) continue;
      const first = firstRowAt.get(t);
      if (first === undefined) {
        firstRowAt.set(t, i);
        continue;
      }
      duplicateRows++;
      const display = this.timestampDisplay(i, labelUtc[i]!);
      if (this.sameRow(first, i)) {
        this.rejectRow(i, this.tsColumn, display, 'duplicate_timestamp',
          `Same timestamp and values as row ${this.rowNumbers[first]}: imported once.`);
      } else {
        if (!this.rowRejected[first]) {
          duplicateRows++;
          this.rejectRow(first, this.tsColumn, this.timestampDisplay(first, labelUtc[first]!), 'duplicate_timestamp',
            `Row ${this.rowNumbers[i]} has the same timestamp with different values: neither is imported.`);
        }
        this.rejectRow(i, this.tsColumn, display, 'duplicate_timestamp',
          `Row ${this.rowNumbers[first]} has the same timestamp with different values: neither is imported.`);
      }
    }

    // 6. Declared period.
    const period = this.options.period;
    let outside = 0;
    let withTime = 0;
    if (period) {
      for (let i = 0; i < n; i++) {
        const t = tUtc[i]!;
        if (!Number.isFinite(t)) continue;
        withTime++;
        if (t < period.fromUtcMs || t + (intervalMs ?? 0) > period.toUtcMs) {
          outside++;
          this.rejectRow(i, this.tsColumn, this.timestampDisplay(i, labelUtc[i]!), 'outside_period',
            'The reading lies outside the declared period of this import.');
        }
      }
      if (withTime > 0 && outside === withTime) {
        throw new SheetRejected('all_outside_period', `All ${withTime} rows lie outside the declared period.`);
      }
    }

    // Rejected rows carry no time, so nothing downstream can import them.
    let importable = 0;
    let spanFrom = Infinity;
    let spanTo = -Infinity;
    for (let i = 0; i < n; i++) {
      if (this.rowRejected[i]) tUtc[i] = NaN;
      const t = tUtc[i]!;
      if (Number.isFinite(t)) {
        importable++;
        if (t < spanFrom) spanFrom = t;
        if (t > spanTo) spanTo = t;
      }
    }
    if (importable === 0) {
      throw new SheetRejected('no_valid_rows', n === 0
        ? 'The sheet has a header but no data rows.'
        : `None of the ${n} rows has a usable timestamp (first problem: ${this.problems.find((p) => rowProblemCodes.has(p.code))?.reason ?? 'none'}).`);
    }
    if (intervalSeconds !== null) {
      notes.push(`Readings every ${describeSeconds(intervalSeconds)}; timestamps read as the ${this.options.intervalConvention === 'interval_end' ? 'end' : 'start'} of each interval.`);
    }

    const columns: ParsedColumn[] = this.valueColumns.map((c, k) => {
      const header = this.headers[c] || `Column ${columnLetter(c)}`;
      return {
        index: c,
        letter: columnLetter(c),
        header,
        hints: headerHints(this.headers[c] ?? ''),
        sample: this.columnSamples[k]!,
        numbers: this.columnNumbers[k]!,
        problems: this.columnProblems[k]!,
      };
    });
    this.problems.sort((a, b) => a.row - b.row || a.columnIndex - b.columnIndex);
    return {
      headerRowNumber: this.headerRowNumber,
      timestampColumn: this.tsColumn,
      timestampHeader: this.headers[this.tsColumn] || `Column ${columnLetter(this.tsColumn)}`,
      statusColumn: this.statusColumn,
      columns,
      rowCount: n,
      rowNumbers: Int32Array.from(this.rowNumbers),
      tUtcMs: tUtc,
      statuses: this.statuses,
      values: this.columnValues.map((values) => Float64Array.from(values)),
      problems: this.problems,
      problemCount: this.problemCount,
      problemCountsByCode: this.problemCountsByCode,
      intervalSeconds,
      dayMonth,
      span: Number.isFinite(spanFrom) ? { fromUtcMs: spanFrom, toUtcMs: spanTo + (intervalMs ?? 0) } : null,
      duplicateRows,
      notes,
    };
  }

  private timestampDisplay(i: number, labelUtcMs: number): string {
    const text = this.tsDisplay.get(i);
    if (text !== undefined) return text;
    // A date or serial cell: its wall-clock time as read (tsMs keeps it for such cells).
    if (this.tsKind[i] === TS_WALL && !this.pendingText.has(i)) return formatWall(this.tsMs[i]!);
    return new Date(labelUtcMs).toISOString();
  }

  private sameRow(a: number, b: number): boolean {
    if (this.statuses[a] !== this.statuses[b]) return false;
    for (const values of this.columnValues) {
      const x = values[a]!;
      const y = values[b]!;
      if (!(x === y || (Number.isNaN(x) && Number.isNaN(y)))) return false;
    }
    return true;
  }
}

function describeSeconds(seconds: number): string {
  if (seconds % 3600 === 0) return seconds === 3600 ? 'hour' : `${seconds / 3600} hours`;
  if (seconds % 60 === 0) return seconds === 60 ? 'minute' : `${seconds / 60} minutes`;
  return `${seconds} seconds`;
}
