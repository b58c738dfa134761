/**
 * The import workflow: upload → (re)map → preview → commit → (rollback). Every function runs in
 * the request's tenant transaction (ctx.db); progress of a commit is written from the pool on its
 * own short transactions, so a client polling GET …/progress sees it while the commit runs.
 */
import { createHash } from 'node:crypto';
import type { ReadingColumns } from '@flueledger/calc';
import type { Knex } from 'knex';
import { audit } from '../../lib/audit';
import { withScope } from '../../lib/db';
import { AppError, Conflict, Unprocessable, ValidationError, type ErrorDetail } from '../../lib/errors';
import { onReadingsChanged, prepareReadingsChange, type PreparedReadingsChange } from '../readings/readings.hooks';
import { ensureMonthPartitions, lockStackReadings, refreshMonthStatistics } from '../readings/readings.store';
import { READING_STATUS_CODE, type DbReadingStatus } from '../results/channel-hours';
import { wholeHours } from '../results/results.service';
import { float8Param, textCodesParam, timestamptzParam, uuidRunsParam } from '../../lib/pg-arrays';
import {
  clearStaging,
  findCommittedTwin,
  findImport,
  findStack,
  findStackForWrite,
  listChannels,
  listImports,
  loadFile,
  loadStackMap,
  loadStaged,
  relevantProblems,
  saveStackMap,
  stageParsed,
  type ChannelInfo,
  type ImportCtx,
  type ImportRow,
  type MappingEntry,
  type StackInfo,
  type StagedFile,
  type StoredColumn,
} from './imports.repo';
import type { CommitBody, CommitResultDto, ImportDraftDto, MappingBody, PreviewDto, UploadFields } from './imports.schemas';
import { suggestMapping, type Suggestion } from './mapping/suggest-mapping';
import { LocalTimeConverter, millisecondsInDay } from './parse/local-time';
import { FileRejected, parseImportFile, type ParsedFile } from './parse/read-file';
import type { IntervalConvention } from './parse/sheet-interpreter';

export type { ImportCtx } from './imports.repo';

export interface ImportDeps {
  /** The pool (not the request's transaction): progress is written on its own connections. */
  pool: Knex;
}

// ---- test hooks ---------------------------------------------------------------------------------

export type CommitPhase = 'staged' | 'channel_inserted' | 'inserted';

/**
 * Tests use this to fail or kill a commit at a known point (after the incoming values are staged
 * in the transaction, after each channel's INSERT, or after all are inserted) and check that
 * nothing of it remains.
 */
export const commitTestHooks: { onPhase: ((phase: CommitPhase, trx: Knex.Transaction) => Promise<void>) | null } = { onPhase: null };

// ---- helpers ------------------------------------------------------------------------------------

function iso(date: Date | null): string | null {
  return date ? date.toISOString() : null;
}

/** A `date` column (node-postgres gives a Date at local midnight) as 'YYYY-MM-DD'. */
function dateOnly(value: string | Date | null): string | null {
  if (value === null || typeof value === 'string') return value;
  const pad = (n: number): string => String(n).padStart(2, '0');
  return `${value.getFullYear()}-${pad(value.getMonth() + 1)}-${pad(value.getDate())}`;
}

function toNumber(value: string | number | null): number | null {
  return value === null ? null : Number(value);
}

/** The declared period as UTC instants: from the start of periodFrom to the end of periodTo, local days. */
export function periodToUtc(timeZone: string, from: string | null | undefined, to: string | null | undefined): { fromUtcMs: number; toUtcMs: number } | null {
  if (!from && !to) return null;
  const converter = new LocalTimeConverter(timeZone);
  const startOfLocalDay = (date: string): number => {
    const wall = Date.parse(`${date}T00:00:00Z`);
    for (let minutes = 0; minutes < 24 * 60; minutes += 15) {
      const result = converter.toUtc(wall + minutes * 60_000);
      if (result.kind === 'unique') return result.utcMs;
      if (result.kind === 'ambiguous') return result.earlierUtcMs;
    }
    return wall;
  };
  return {
    fromUtcMs: from ? startOfLocalDay(from) : -8.64e15,
    toUtcMs: to ? startOfLocalDay(new Date(Date.parse(`${to}T00:00:00Z`) + millisecondsInDay).toISOString().slice(0, 10)) : 8.64e15,
  };
}

function fileRejectedToAppError(error: FileRejected): AppError {
  return new AppError(error.status, error.code, error.message);
}

/** Per value column: the readings it brings (the rule of the commit's SQL, counted while the file is in hand). */
function incomingPerColumn(parsed: ParsedFile): number[] {
  const counts = parsed.values.map(() => 0);
  for (let i = 0; i < parsed.rowCount; i++) {
    if (!Number.isFinite(parsed.tUtcMs[i]!)) continue;
    const valid = parsed.statuses[i] === 'valid';
    for (let k = 0; k < parsed.values.length; k++) if (!valid || !Number.isNaN(parsed.values[k]![i]!)) counts[k]!++;
  }
  return counts;
}

function storedColumns(parsed: ParsedFile, suggestions: Suggestion[]): StoredColumn[] {
  const byIndex = new Map(suggestions.map((s) => [s.index, s]));
  const incoming = incomingPerColumn(parsed);
  return parsed.columns.map((c, k) => ({
    index: c.index,
    letter: c.letter,
    header: c.header,
    normalised: c.hints.normalised,
    unitHint: c.hints.unit,
    parameterHint: c.hints.parameter,
    basisHint: c.hints.basis,
    sample: c.sample,
    numbers: c.numbers,
    problems: c.problems,
    suggestedChannelId: byIndex.get(c.index)?.channelId ?? null,
    suggestionSource: byIndex.get(c.index)?.source ?? null,
    incoming: incoming[k]!,
  }));
}

function parsedCounts(parsed: ParsedFile): Record<string, unknown> {
  return {
    sheet_name: parsed.sheetName,
    header_row: parsed.headerRowNumber,
    timestamp_column: parsed.timestampColumn,
    timestamp_header: parsed.timestampHeader,
    status_column: parsed.statusColumn,
    interval_seconds: parsed.intervalSeconds,
    notes: JSON.stringify(parsed.notes),
    row_count: parsed.rowCount,
    cell_count: parsed.columns.reduce((sum, c) => sum + c.numbers, 0),
    problem_count: parsed.problemCount,
    problem_counts: JSON.stringify(parsed.problemCountsByCode),
    duplicate_rows: parsed.duplicateRows,
    span_from: parsed.span ? new Date(parsed.span.fromUtcMs) : null,
    span_to: parsed.span ? new Date(parsed.span.toUtcMs) : null,
  };
}

interface ParseSettings {
  intervalConvention: IntervalConvention;
  timestampColumn?: number;
  statusColumn?: number | null;
  periodFrom?: string | null;
  periodTo?: string | null;
}

async function parseFor(stack: StackInfo, channels: ChannelInfo[], bytes: Buffer, settings: ParseSettings): Promise<ParsedFile> {
  const live = channels.filter((c) => !c.archivedAt);
  const fallbackMinutes = live.length > 0 ? Math.min(...live.map((c) => c.intervalMinutes)) : 1;
  try {
    return await parseImportFile(bytes, {
      timeZone: stack.timeZone,
      country: stack.country,
      intervalConvention: settings.intervalConvention,
      timestampColumn: settings.timestampColumn,
      statusColumn: settings.statusColumn,
      period: periodToUtc(stack.timeZone, settings.periodFrom, settings.periodTo),
      fallbackIntervalSeconds: fallbackMinutes * 60,
    });
  } catch (error) {
    if (error instanceof FileRejected) throw fileRejectedToAppError(error);
    throw error;
  }
}

// ---- DTOs ---------------------------------------------------------------------------------------

function summaryOf(row: ImportRow) {
  return {
    id: row.id,
    stackId: row.stack_id,
    fileName: row.file_name,
    sha256: row.sha256,
    sizeBytes: Number(row.size_bytes),
    format: row.format,
    state: row.state,
    uploadedAt: row.uploaded_at.toISOString(),
    uploadedBy: row.uploaded_by,
    uploadedByName: row.uploaded_by_name ?? null,
    rowCount: row.row_count,
    span: row.span_from && row.span_to ? { from: row.span_from.toISOString(), to: row.span_to.toISOString() } : null,
    problemCount: row.problem_count,
    counts: {
      rows: row.row_count,
      cells: row.cell_count,
      problems: row.problem_count,
      inserted: row.inserted_count,
      unchanged: row.unchanged_count,
      superseded: row.superseded_count,
      conflicts: row.conflict_count,
    },
    committedAt: iso(row.committed_at),
    rolledBackAt: iso(row.rolled_back_at),
    rollbackReason: row.rollback_reason,
  };
}

async function draftOf(ctx: ImportCtx, row: ImportRow): Promise<ImportDraftDto> {
  const twin = await findCommittedTwin(ctx, row.stack_id, row.sha256, row.id);
  const mapped = new Map(row.mapping.map((m) => [m.index, m.channelId]));
  return {
    ...summaryOf(row),
    sheetName: row.sheet_name,
    headerRow: row.header_row,
    timestampColumn: row.timestamp_column,
    timestampHeader: row.timestamp_header,
    statusColumn: row.status_column,
    intervalConvention: row.interval_convention,
    intervalSeconds: row.interval_seconds,
    period: { from: dateOnly(row.period_from), to: dateOnly(row.period_to) },
    columns: row.columns.map((c) => ({
      index: c.index,
      letter: c.letter,
      header: c.header,
      unitHint: c.unitHint,
      parameterHint: c.parameterHint,
      basisHint: c.basisHint,
      suggestedChannelId: c.suggestedChannelId,
      suggestionSource: c.suggestionSource,
      mappedChannelId: mapped.get(c.index) ?? null,
      sample: c.sample,
      numbers: c.numbers,
      problems: c.problems,
    })),
    notes: row.notes,
    problemCountsByCode: row.problem_counts,
    duplicates: row.duplicate_rows,
    alreadyImported: twin ? { importId: twin.id, committedAt: twin.committed_at.toISOString() } : null,
    failureMessage: row.failure_message,
    progress: {
      phase: row.progress_phase,
      done: toNumber(row.progress_done),
      total: toNumber(row.progress_total),
      updatedAt: iso(row.progress_updated_at),
    },
  };
}

// ---- upload -------------------------------------------------------------------------------------

export interface UploadedFile {
  originalName: string;
  bytes: Buffer;
}

export async function upload(ctx: ImportCtx, stackId: string, file: UploadedFile, fields: UploadFields): Promise<ImportDraftDto> {
  const stack = await findStackForWrite(ctx, stackId);
  const channels = await listChannels(ctx, stackId);
  const stackMap = await loadStackMap(ctx, stackId);
  const intervalConvention = fields.intervalConvention ?? stackMap.intervalConvention ?? 'interval_end';
  const parsed = await parseFor(stack, channels, file.bytes, {
    intervalConvention,
    periodFrom: fields.periodFrom,
    periodTo: fields.periodTo,
  });
  const live = channels.filter((c) => !c.archivedAt);
  const suggestions = suggestMapping(parsed.columns.map((c) => ({ index: c.index, hints: c.hints })), live, stackMap.entries);
  const sha256 = createHash('sha256').update(file.bytes).digest('hex');
  const fileName = file.originalName.replace(/[\\/]/g, '_').slice(0, 255) || 'upload';

  const [{ id }] = (await ctx
    .db('imports')
    .insert({
      tenant_id: ctx.tenantId,
      stack_id: stackId,
      file_name: fileName,
      sha256,
      size_bytes: file.bytes.length,
      format: parsed.format,
      uploaded_by: ctx.userId,
      state: 'parsed',
      interval_convention: intervalConvention,
      period_from: fields.periodFrom ?? null,
      period_to: fields.periodTo ?? null,
      columns: JSON.stringify(storedColumns(parsed, suggestions)),
      mapping: JSON.stringify(suggestions.map((s) => ({ index: s.index, channelId: s.channelId }))),
      ...parsedCounts(parsed),
    })
    .returning('id')) as { id: string }[];
  await ctx.db('import_files').insert({ import_id: id, tenant_id: ctx.tenantId, content: file.bytes });
  await stageParsed(ctx, id, parsed);
  await audit(ctx as Parameters<typeof audit>[0], {
    action: 'import.uploaded',
    entity: 'import',
    entityId: id,
    after: { stackId, fileName, sha256, sizeBytes: file.bytes.length, rows: parsed.rowCount, problems: parsed.problemCount },
  });
  return draftOf(ctx, await findImport(ctx, id));
}

// ---- read ---------------------------------------------------------------------------------------

export async function getDraft(ctx: ImportCtx, importId: string): Promise<ImportDraftDto> {
  return draftOf(ctx, await findImport(ctx, importId));
}

export async function list(ctx: ImportCtx, stackId: string, limit: number, offset: number) {
  await findStack(ctx, stackId);
  const { rows, total } = await listImports(ctx, stackId, limit, offset);
  return { items: rows.map(summaryOf), total };
}

export async function progress(ctx: ImportCtx, importId: string) {
  const row = await findImport(ctx, importId);
  return { phase: row.progress_phase, done: toNumber(row.progress_done), total: toNumber(row.progress_total), updatedAt: iso(row.progress_updated_at) };
}

// ---- mapping ------------------------------------------------------------------------------------

const editableStates = new Set(['parsed', 'mapped', 'failed', 'committing']);

function assertEditable(row: ImportRow): void {
  if (!editableStates.has(row.state)) {
    throw new Conflict('import_closed', row.state === 'committed' ? 'This import is already committed.' : `This import is ${row.state.replace('_', ' ')}.`);
  }
}

/** Re-reads the stored file into staging with the given settings (and refreshes the columns). */
async function restage(
  ctx: ImportCtx,
  row: ImportRow,
  stack: StackInfo,
  channels: ChannelInfo[],
  settings: ParseSettings,
): Promise<{ parsed: ParsedFile; columns: StoredColumn[]; staged: StagedFile }> {
  const bytes = await loadFile(ctx, row.id);
  const parsed = await parseFor(stack, channels, bytes, settings);
  const stackMap = await loadStackMap(ctx, row.stack_id);
  const suggestions = suggestMapping(parsed.columns.map((c) => ({ index: c.index, hints: c.hints })), channels.filter((c) => !c.archivedAt), stackMap.entries);
  await clearStaging(ctx, row.id, true);
  const staged = await stageParsed(ctx, row.id, parsed);
  return { parsed, columns: storedColumns(parsed, suggestions), staged };
}

export async function setMapping(ctx: ImportCtx, importId: string, body: MappingBody): Promise<ImportDraftDto> {
  const row = await findImport(ctx, importId);
  assertEditable(row);
  const stack = await findStackForWrite(ctx, row.stack_id);
  const channels = await listChannels(ctx, row.stack_id);
  const statusColumn = body.statusColumn === undefined ? row.status_column : body.statusColumn;

  let columns = row.columns;
  let update: Record<string, unknown> = {};
  const layoutChanged =
    body.timestampColumn !== row.timestamp_column || statusColumn !== row.status_column || body.intervalConvention !== row.interval_convention;
  if (layoutChanged) {
    if (statusColumn !== null && statusColumn === body.timestampColumn) {
      throw new ValidationError('The status column cannot also be the timestamp column.', [{ location: 'body', path: 'statusColumn', message: 'Same as the timestamp column' }]);
    }
    const restaged = await restage(ctx, row, stack, channels, {
      intervalConvention: body.intervalConvention,
      timestampColumn: body.timestampColumn,
      statusColumn,
      periodFrom: dateOnly(row.period_from),
      periodTo: dateOnly(row.period_to),
    });
    columns = restaged.columns;
    update = { ...parsedCounts(restaged.parsed), columns: JSON.stringify(columns), interval_convention: body.intervalConvention };
  }

  // Validate the mapping against the (possibly new) columns and the stack's live channels.
  const issues: ErrorDetail[] = [];
  const valueIndexes = new Set(columns.map((c) => c.index));
  const liveChannels = new Map(channels.filter((c) => !c.archivedAt).map((c) => [c.id, c]));
  const seenChannels = new Map<string, number>();
  body.columns.forEach((entry, i) => {
    if (!valueIndexes.has(entry.index)) issues.push({ location: 'body', path: `columns.${i}.index`, message: `Column ${entry.index} is not a value column of this file` });
    if (entry.channelId === null) return;
    if (!liveChannels.has(entry.channelId)) issues.push({ location: 'body', path: `columns.${i}.channelId`, message: 'No live channel of this stack has this id' });
    const earlier = seenChannels.get(entry.channelId);
    if (earlier !== undefined) issues.push({ location: 'body', path: `columns.${i}.channelId`, message: `The channel is already mapped to column ${earlier}` });
    seenChannels.set(entry.channelId, entry.index);
  });
  if (issues.length > 0) throw new Unprocessable('invalid_mapping', 'The column mapping is not valid.', issues);

  const requested = new Map(body.columns.map((c) => [c.index, c.channelId]));
  const mapping: MappingEntry[] = columns.map((c) => ({ index: c.index, channelId: requested.has(c.index) ? requested.get(c.index)! : null }));
  await ctx.db('imports').where({ tenant_id: ctx.tenantId, id: importId }).update({
    ...update,
    mapping: JSON.stringify(mapping),
    state: row.state === 'committing' ? row.state : 'mapped',
  });

  if (body.saveAsStackMap) {
    const timestampHeader = (update.timestamp_header as string | undefined) ?? row.timestamp_header;
    await saveStackMap(ctx, row.stack_id, [
      { header: timestampHeader.toLowerCase().replace(/\s+/g, ' ').trim(), role: 'timestamp', channelId: null, intervalConvention: body.intervalConvention },
      ...columns.map((c) => {
        const channelId = mapping.find((m) => m.index === c.index)?.channelId ?? null;
        return { header: c.normalised, role: channelId ? ('channel' as const) : ('ignore' as const), channelId, intervalConvention: null };
      }),
    ]);
  }
  await audit(ctx as Parameters<typeof audit>[0], {
    action: 'import.mapped',
    entity: 'import',
    entityId: importId,
    before: { mapping: row.mapping, timestampColumn: row.timestamp_column, intervalConvention: row.interval_convention },
    after: { mapping, timestampColumn: body.timestampColumn, statusColumn, intervalConvention: body.intervalConvention, savedAsStackMap: body.saveAsStackMap },
  });
  return draftOf(ctx, await findImport(ctx, importId));
}

// ---- staging helpers shared by preview and commit ------------------------------------------------

interface MappedColumns {
  channelIds: string[];
  /** 1-based positions in imports.columns (the staged parts of the value columns). */
  positions: number[];
  columnIndexes: number[];
}

function mappedColumns(row: ImportRow): MappedColumns {
  const result: MappedColumns = { channelIds: [], positions: [], columnIndexes: [] };
  const channelOf = new Map(row.mapping.map((m) => [m.index, m.channelId]));
  row.columns.forEach((c, k) => {
    const channelId = channelOf.get(c.index);
    if (!channelId) return;
    result.channelIds.push(channelId);
    result.positions.push(k + 1);
    result.columnIndexes.push(c.index);
  });
  return result;
}

/**
 * The staged file with the mapped columns. Staging may be empty after a database crash
 * (UNLOGGED) or after housekeeping removed an old draft's: then it is rebuilt from the stored file.
 */
async function stagedFileOf(ctx: ImportCtx, row: ImportRow, mapped: MappedColumns): Promise<StagedFile> {
  if (row.row_count === 0) {
    return { rowCount: 0, rowNumbers: new Int32Array(0), tUtcMs: new Float64Array(0), statuses: [], values: new Map(mapped.positions.map((p) => [p, new Float64Array(0)])) };
  }
  const staged = await loadStaged(ctx, row.id, mapped.positions);
  if (staged) return staged;
  const stack = await findStack(ctx, row.stack_id);
  const channels = await listChannels(ctx, row.stack_id);
  const restaged = await restage(ctx, row, stack, channels, {
    intervalConvention: row.interval_convention,
    timestampColumn: row.timestamp_column,
    statusColumn: row.status_column,
    periodFrom: dateOnly(row.period_from),
    periodTo: dateOnly(row.period_to),
  });
  return restaged.staged;
}

/** The readings an import brings for one mapped channel (or a slice of them), in file order. */
interface ChannelIncoming {
  channelId: string;
  /** Interval start, UTC ms. */
  t: Float64Array;
  /** NaN = no value (a cell without a number in a row whose status is not valid). */
  value: Float64Array;
  /** Index into the statuses' names (`Incoming.names`). */
  status: Uint8Array;
}

interface Incoming {
  /** The statuses the file uses; a reading's `status` indexes this. */
  names: DbReadingStatus[];
  channels: ChannelIncoming[];
}

/**
 * Readings per statement when they go to the database as parameters: a month of one-minute data
 * is one statement per channel, the largest file a few, each with parameters of about 10 MB.
 * Tests lower it to send a small file in several pieces.
 */
export const importBatching = { readingsPerStatement: 200_000 };

/**
 * Per mapped channel, the readings the import brings: one per row with a time whose cell holds a
 * number, or whose status is not valid (then the reading records the status, with or without a
 * value). The rule every count, comparison and INSERT of an import uses.
 */
function incomingReadings(staged: StagedFile, mapped: MappedColumns): Incoming {
  const { rowCount, tUtcMs } = staged;
  const names: DbReadingStatus[] = [];
  const codeOf = new Map<string, number>();
  const codes = new Uint8Array(rowCount);
  const valid = new Uint8Array(rowCount);
  for (let i = 0; i < rowCount; i++) {
    const status = staged.statuses[i]!;
    let code = codeOf.get(status);
    if (code === undefined) {
      code = names.push(status as DbReadingStatus) - 1;
      codeOf.set(status, code);
    }
    codes[i] = code;
    valid[i] = status === 'valid' ? 1 : 0;
  }
  const channels = mapped.channelIds.map((channelId, k) => {
    const values = staged.values.get(mapped.positions[k]!)!;
    let count = 0;
    for (let i = 0; i < rowCount; i++) if (Number.isFinite(tUtcMs[i]!) && (!Number.isNaN(values[i]!) || !valid[i])) count++;
    const incoming: ChannelIncoming = { channelId, t: new Float64Array(count), value: new Float64Array(count), status: new Uint8Array(count) };
    let j = 0;
    for (let i = 0; i < rowCount; i++) {
      if (!Number.isFinite(tUtcMs[i]!) || (Number.isNaN(values[i]!) && valid[i])) continue;
      incoming.t[j] = tUtcMs[i]!;
      incoming.value[j] = values[i]!;
      incoming.status[j] = codes[i]!;
      j++;
    }
    return incoming;
  });
  return { names, channels };
}

function incomingCount(incoming: Incoming): number {
  return incoming.channels.reduce((sum, c) => sum + c.t.length, 0);
}

/** A channel's readings in slices of at most `readingsPerStatement` (views, not copies). */
function slicesOf(channel: ChannelIncoming): ChannelIncoming[] {
  const { readingsPerStatement } = importBatching;
  const slices: ChannelIncoming[] = [];
  for (let from = 0; from < channel.t.length; from += readingsPerStatement) {
    const to = Math.min(channel.t.length, from + readingsPerStatement);
    slices.push({ channelId: channel.channelId, t: channel.t.subarray(from, to), value: channel.value.subarray(from, to), status: channel.status.subarray(from, to) });
  }
  return slices;
}

/** All channels' readings in groups of at most `readingsPerStatement`, for the comparison. */
function comparisonGroups(incoming: Incoming): ChannelIncoming[][] {
  const groups: ChannelIncoming[][] = [];
  let group: ChannelIncoming[] = [];
  let size = 0;
  for (const slice of incoming.channels.flatMap(slicesOf)) {
    if (size + slice.t.length > importBatching.readingsPerStatement && group.length > 0) {
      groups.push(group);
      group = [];
      size = 0;
    }
    group.push(slice);
    size += slice.t.length;
  }
  if (group.length > 0) groups.push(group);
  return groups;
}

/** The incoming readings as engine columns by channel id (for the hourly results). */
function readingColumnsOf(incoming: Incoming): Map<string, ReadingColumns> {
  const engineCode = incoming.names.map((name) => READING_STATUS_CODE[name]);
  return new Map(
    incoming.channels.map((c) => {
      const status = new Uint8Array(c.status.length);
      for (let i = 0; i < status.length; i++) status[i] = engineCode[c.status[i]!]!;
      return [c.channelId, { t: c.t, value: c.value, status }];
    }),
  );
}

/**
 * SQL selecting a group of incoming readings (sent as binary array parameters) with the current
 * stored reading for the same channel and time, and the class: new, unchanged or conflict. A
 * stored value corrected since (current row not from an import) counts as unchanged when the
 * incoming value equals a value imported before: re-importing a file must not undo, or conflict
 * with, the corrections made to it. The planner sees the arrays' lengths (the parameters are
 * known when it plans), so the join is planned for the real number of incoming readings.
 */
function incomingSql(ctx: ImportCtx, group: readonly ChannelIncoming[], names: readonly string[]): { sql: string; bindings: Knex.RawBinding[] } {
  const total = group.reduce((sum, c) => sum + c.t.length, 0);
  const t = new Float64Array(total);
  const value = new Float64Array(total);
  const status = new Uint8Array(total);
  let at = 0;
  for (const c of group) {
    t.set(c.t, at);
    value.set(c.value, at);
    status.set(c.status, at);
    at += c.t.length;
  }
  return {
    sql: `
      select u.channel_id, u.t, u.value, u.status, r.id as current_id,
        case
          when r.id is null then 'new'
          when r.value is not distinct from u.value and r.status = u.status then 'unchanged'
          when r.import_id is null and exists (
            select 1 from readings o
            where o.tenant_id = ? and o.channel_id = u.channel_id and o.t = u.t and o.superseded_at is not null
              and o.import_id is not null and o.value is not distinct from u.value and o.status = u.status
          ) then 'unchanged'
          else 'conflict'
        end as cls
      from unnest(?::uuid[], ?::timestamptz[], ?::float8[], ?::text[]) as u(channel_id, t, value, status)
      left join readings r on r.tenant_id = ? and r.channel_id = u.channel_id and r.t = u.t and r.superseded_at is null`,
    bindings: [
      ctx.tenantId,
      uuidRunsParam(
        group.map((c) => c.channelId),
        group.map((c) => c.t.length),
      ),
      timestamptzParam(t),
      float8Param(value),
      textCodesParam(status, names),
      ctx.tenantId,
    ],
  };
}

/**
 * True when no current reading exists for the mapped channels within the whole hours covering the
 * import's span. Then every incoming value is new, and the channels' current readings in those
 * hours after the commit are exactly the incoming ones (so their hourly values can be computed
 * from staging, without reading them back).
 */
async function nothingStoredInSpan(ctx: ImportCtx, row: ImportRow, mapped: MappedColumns): Promise<boolean> {
  if (!row.span_from || !row.span_to) return false;
  const hours = wholeHours(row.span_from.getTime(), row.span_to.getTime());
  const result = await ctx.db.raw(
    `select not exists (
       select 1 from readings where tenant_id = ? and channel_id = any(?::uuid[]) and t >= ? and t < ? and superseded_at is null
     ) as empty`,
    [ctx.tenantId, mapped.channelIds, new Date(hours.from), new Date(hours.to)],
  );
  return result.rows[0].empty === true;
}

// ---- preview ------------------------------------------------------------------------------------

const previewProblemLimit = 500;

export async function preview(ctx: ImportCtx, importId: string): Promise<PreviewDto> {
  const row = await findImport(ctx, importId);
  const closed = row.state === 'committed' || row.state === 'rolled_back';
  const mapped = mappedColumns(row);
  const staged = closed ? null : await stagedFileOf(ctx, row, mapped);
  const problemsQuery = relevantProblems(ctx, importId, mapped.columnIndexes);
  const [{ count: problemCount }] = (await problemsQuery.clone().count({ count: '*' })) as { count: string }[];
  const problems = (await problemsQuery
    .clone()
    .orderBy(['row_number', 'column_index'])
    .limit(previewProblemLimit)
    .select('row_number', 'column_index', 'column_label', 'value', 'code', 'reason')) as {
    row_number: number;
    column_index: number;
    column_label: string;
    value: string;
    code: string;
    reason: string;
  }[];

  const base = {
    problems: problems.map((p) => ({ row: p.row_number, column: p.column_label, columnIndex: p.column_index, value: p.value, code: p.code, reason: p.reason })),
    problemCount: Number(problemCount),
    span: row.span_from && row.span_to ? { from: row.span_from.toISOString(), to: row.span_to.toISOString() } : null,
    intervalSeconds: row.interval_seconds,
    duplicates: row.duplicate_rows,
    notes: row.notes,
  };
  if (!staged) {
    // Staging is gone after commit/rollback; the stored readings are the record now.
    return { ...base, sampleRows: [], perChannel: [], gaps: [], overlap: { new: 0, unchanged: row.unchanged_count ?? 0, conflicting: 0 } };
  }

  // Rows with a time; the sample is the first of them by row number.
  const timed: number[] = [];
  for (let i = 0; i < staged.rowCount; i++) if (Number.isFinite(staged.tUtcMs[i]!)) timed.push(i);
  const columnValues = mapped.positions.map((p) => staged.values.get(p)!);
  const sampleRows = [...timed].sort((a, b) => staged.rowNumbers[a]! - staged.rowNumbers[b]!).slice(0, 20).map((i) => ({
    row: staged.rowNumbers[i]!,
    t: new Date(staged.tUtcMs[i]!).toISOString(),
    status: staged.statuses[i]!,
    values: Object.fromEntries(mapped.channelIds.map((channelId, k) => [channelId, Number.isNaN(columnValues[k]![i]!) ? null : columnValues[k]![i]!])),
  }));

  // Per channel: readings (the commit's rule), valid ones, and min/max/mean over valid rows.
  const perChannel: PreviewDto['perChannel'] = mapped.channelIds.map((channelId, k) => {
    const values = columnValues[k]!;
    let count = 0;
    let valid = 0;
    let min = Infinity;
    let max = -Infinity;
    let sum = 0;
    for (const i of timed) {
      const value = values[i]!;
      const isValid = staged.statuses[i] === 'valid';
      if (!Number.isNaN(value) || !isValid) count++;
      if (Number.isNaN(value) || !isValid) continue;
      valid++;
      if (value < min) min = value;
      if (value > max) max = value;
      sum += value;
    }
    return { channelId, columnIndex: mapped.columnIndexes[k]!, count, valid, invalid: count - valid, min: valid ? min : null, max: valid ? max : null, mean: valid ? sum / valid : null };
  });

  const overlap = { new: 0, unchanged: 0, conflicting: 0 };
  if (mapped.channelIds.length > 0) {
    const incoming = incomingReadings(staged, mapped);
    if (await nothingStoredInSpan(ctx, row, mapped)) {
      overlap.new = incomingCount(incoming);
    } else {
      for (const group of comparisonGroups(incoming)) {
        const query = incomingSql(ctx, group, incoming.names);
        const classes = await ctx.db.raw(`select cls, count(*) as n from (${query.sql}) i group by cls`, query.bindings);
        for (const c of classes.rows as { cls: string; n: string }[]) {
          if (c.cls === 'new') overlap.new += Number(c.n);
          else if (c.cls === 'unchanged') overlap.unchanged += Number(c.n);
          else overlap.conflicting += Number(c.n);
        }
      }
    }
  }

  // Gaps: consecutive times (in time order) further apart than the file's interval; the first 100.
  const gaps: { from: string; to: string }[] = [];
  if (row.interval_seconds) {
    const intervalMs = row.interval_seconds * 1000;
    const times = Float64Array.from(timed, (i) => staged.tUtcMs[i]!).sort();
    for (let i = 1; i < times.length && gaps.length < 100; i++) {
      if (times[i]! - times[i - 1]! > intervalMs) gaps.push({ from: new Date(times[i - 1]! + intervalMs).toISOString(), to: new Date(times[i]!).toISOString() });
    }
  }
  return { ...base, sampleRows, perChannel, gaps, overlap };
}

/** Every relevant problem of an import (for the problems workbook). */
export async function allProblems(ctx: ImportCtx, importId: string) {
  const row = await findImport(ctx, importId);
  const mapped = mappedColumns(row);
  const problems = (await relevantProblems(ctx, importId, mapped.columnIndexes)
    .orderBy(['row_number', 'column_index'])
    .select('row_number', 'column_label', 'value', 'code', 'reason')) as { row_number: number; column_label: string; value: string; code: string; reason: string }[];
  return { row, problems };
}

// ---- commit -------------------------------------------------------------------------------------

/** 409 with `details: { conflicts }` (the shape the import screens read). */
export class ConflictsFound extends AppError {
  constructor(readonly conflicts: number) {
    super(409, 'conflicts', `${conflicts} values differ from values already stored for the same times. Review them, then commit again choosing to replace them (with a reason).`, { conflicts } as unknown as ErrorDetail[]);
  }
}

/**
 * A progress note, on its own short transaction from the pool. Committed without waiting for its
 * write-ahead log to reach the disk (synchronous_commit off, for this note's transaction only):
 * while the commit it describes writes its readings, waiting for that flush meant waiting for the
 * readings' log written so far, up to tens of milliseconds a note. Readers see the note at once
 * either way; only a database crash in the next moment could lose it, and a crash also loses the
 * uncommitted import the note describes (which stays committable, as after a failed attempt).
 */
async function writeProgress(deps: ImportDeps, ctx: ImportCtx, importId: string, fields: Record<string, unknown>): Promise<void> {
  await withScope(deps.pool, { tenantId: ctx.tenantId, userId: ctx.userId }, async (trx) => {
    await trx.raw('set local synchronous_commit = off');
    await trx('imports')
      .where({ tenant_id: ctx.tenantId, id: importId })
      // A late note from an earlier, failed attempt must never overwrite a finished import.
      .whereNotIn('state', ['committed', 'rolled_back'])
      .update({ ...fields, progress_updated_at: trx.fn.now() });
  });
}

export async function commit(ctx: ImportCtx, deps: ImportDeps, importId: string, body: CommitBody): Promise<CommitResultDto> {
  const row = await findImport(ctx, importId);
  // One commit of an import at a time; a second one is told so instead of waiting.
  const locked = await ctx.db.raw("select pg_try_advisory_xact_lock(hashtextextended('import:' || ?, 0)) as ok", [importId]);
  if (!locked.rows[0].ok) throw new Conflict('commit_in_progress', 'This import is being committed right now.');
  const current = await findImport(ctx, importId);
  assertEditable(current);
  const mapped = mappedColumns(current);
  if (mapped.channelIds.length === 0) throw new Unprocessable('no_mapping', 'Map at least one column to a channel before committing.');
  const stack = await findStackForWrite(ctx, row.stack_id);
  const liveChannels = new Set((await listChannels(ctx, stack.id)).filter((c) => !c.archivedAt).map((c) => c.id));
  const stale = mapped.channelIds.filter((id) => !liveChannels.has(id));
  if (stale.length > 0) throw new Unprocessable('stale_mapping', 'A mapped channel was archived since; map the columns again.');
  const incoming = incomingReadings(await stagedFileOf(ctx, current, mapped), mapped);

  const totalCells = current.cell_count;
  // Progress notes during the inserts go out one after the other on the pool while the next
  // INSERT runs (nothing waits for them there); the last is awaited before the commit's final
  // statements, so a failed note still fails the commit.
  let notes: Promise<void> = Promise.resolve();
  try {
    await writeProgress(deps, ctx, importId, { state: 'committing', failure_message: null, progress_phase: 'preparing', progress_done: 0, progress_total: totalCells });
    // Partitions first, on their own short transactions: creating one locks the parent table.
    if (current.span_from && current.span_to) {
      await ensureMonthPartitions(deps.pool, 'readings', current.span_from.getTime(), current.span_to.getTime());
    }
    await lockStackReadings(ctx.db, stack.id);

    // After the stack lock: no other writer can add readings to this span until we commit.
    // Usually nothing is stored for these channels in the file's span yet: then every incoming
    // value is new and goes straight from staging into readings (no comparison table).
    const nothingStored = await nothingStoredInSpan(ctx, current, mapped);
    const counts = { new: 0, unchanged: 0, conflict: 0 };
    if (nothingStored) {
      counts.new = incomingCount(incoming);
    } else {
      await ctx.db.raw(
        'create temp table import_incoming (channel_id uuid, t timestamptz, value double precision, status text, current_id bigint, cls text) on commit drop',
      );
      for (const group of comparisonGroups(incoming)) {
        const query = incomingSql(ctx, group, incoming.names);
        await ctx.db.raw(`insert into import_incoming ${query.sql}`, query.bindings);
      }
      // Temporary tables are never analysed by autovacuum; the statements below join on this one.
      await ctx.db.raw('analyze import_incoming');
      const classes = await ctx.db.raw('select cls, count(*) as n from import_incoming group by cls');
      for (const c of classes.rows as { cls: keyof typeof counts; n: string }[]) counts[c.cls] = Number(c.n);
    }
    const totalIncoming = counts.new + counts.unchanged + counts.conflict;
    await writeProgress(deps, ctx, importId, { progress_phase: 'compared', progress_done: 0, progress_total: totalIncoming });
    await commitTestHooks.onPhase?.('staged', ctx.db);

    if (counts.conflict > 0 && !body.replaceConflicts) throw new ConflictsFound(counts.conflict);

    const hookCtx = { tenantId: ctx.tenantId, userId: ctx.userId, requestId: ctx.requestId, db: ctx.db };
    const change = current.span_from && current.span_to ? { channelIds: mapped.channelIds, from: current.span_from, to: current.span_to } : null;
    // Into hours that hold nothing yet, the new readings are exactly the staged ones: the hourly
    // results are computed from them while the database inserts (instead of reading 44,640
    // readings per channel back afterwards), and stored after the inserts, in this transaction.
    const prepared: PreparedReadingsChange | null = nothingStored && change && counts.new > 0 ? await prepareReadingsChange(hookCtx, change, readingColumnsOf(incoming)) : null;

    // New readings carry their import but no created_by: who brought them is the import's
    // committer (imports.committed_by), as the drill-down reports (migration 20261212000300).
    // New readings, one channel at a time so progress moves. Channels in id order and times in
    // order: the rows then reach the current-readings index in its own key order (channel, t), so
    // its pages fill from left to right instead of splitting all over. The staged readings are in
    // file order: a logger writes its rows in time order; a file out of order imports just as
    // correctly, only into less tidy index pages. They go in as binary arrays (no text on either
    // side), unnested by the INSERT, which row-level security checks row by row. The arrays are
    // unnested in the select list, in step: that streams the rows, where unnest in FROM would
    // first copy all of them into a tuplestore (a tenth or more of the INSERT's time).
    let done = 0;
    const channelOrder = [...incoming.channels].sort((a, b) => (a.channelId < b.channelId ? -1 : 1));
    // Without stored readings, each channel's readings go in as parameters (in slices of at most
    // readingsPerStatement); otherwise the new ones come from the comparison table, a channel a time.
    const order = nothingStored ? channelOrder.flatMap(slicesOf) : channelOrder;
    const encode = (c: ChannelIncoming): Buffer[] => [timestamptzParam(c.t), float8Param(c.value), textCodesParam(c.status, incoming.names)];
    let nextParams = nothingStored && order.length > 0 ? encode(order[0]!) : [];
    for (const [n, { channelId }] of order.entries()) {
      const insert = Promise.resolve(
        nothingStored
          ? ctx.db.raw(
              `insert into readings (tenant_id, channel_id, t, value, status, import_id)
               select ?::uuid, ?::uuid, unnest(?::timestamptz[]), unnest(?::float8[]), unnest(?::text[]), ?::uuid`,
              [ctx.tenantId, channelId, ...nextParams, importId],
            )
          : ctx.db.raw(
              `insert into readings (tenant_id, channel_id, t, value, status, import_id)
               select ?, channel_id, t, value, status, ? from import_incoming where cls = 'new' and channel_id = ? order by t`,
              [ctx.tenantId, importId, channelId],
            ),
      );
      insert.catch(() => undefined);
      // Let the INSERT reach the database, then do the CPU work while it runs: the next channel's
      // parameters and, the first time, the hours.
      await new Promise((resolve) => setImmediate(resolve));
      nextParams = nothingStored && n + 1 < order.length ? encode(order[n + 1]!) : [];
      if (n === 0 && prepared) prepared.compute();
      const inserted = await insert;
      done += inserted.rowCount ?? 0;
      const progressDone = done + counts.unchanged;
      notes = notes.then(() => writeProgress(deps, ctx, importId, { progress_phase: 'inserting', progress_done: progressDone, progress_total: totalIncoming }));
      notes.catch(() => undefined);
      await commitTestHooks.onPhase?.('channel_inserted', ctx.db);
    }
    await notes;
    // The statements' own counts are the record (the up-front count only drives progress).
    if (nothingStored) counts.new = done;

    let superseded = 0;
    if (counts.conflict > 0) {
      // Replace: the stored row is superseded (never changed otherwise), the file's value becomes current.
      const old = await ctx.db.raw(
        `update readings r set superseded_at = now()
         from import_incoming i
         where i.cls = 'conflict' and r.tenant_id = ? and r.channel_id = i.channel_id and r.t = i.t and r.superseded_at is null`,
        [ctx.tenantId],
      );
      superseded = old.rowCount ?? 0;
      await ctx.db.raw(
        `with fresh as (
           insert into readings (tenant_id, channel_id, t, value, status, import_id, reason)
           select ?, channel_id, t, value, status, ?, ? from import_incoming where cls = 'conflict'
           returning id, channel_id, t
         )
         update readings o set superseded_by = fresh.id
         from fresh join import_incoming i on i.channel_id = fresh.channel_id and i.t = fresh.t and i.cls = 'conflict'
         where o.tenant_id = ? and o.channel_id = fresh.channel_id and o.t = fresh.t and o.id = i.current_id`,
        [ctx.tenantId, importId, body.reason ?? null, ctx.tenantId],
      );
    }
    await commitTestHooks.onPhase?.('inserted', ctx.db);

    const inserted = counts.new + (body.replaceConflicts ? counts.conflict : 0);
    const result: CommitResultDto = {
      inserted,
      unchanged: counts.unchanged,
      superseded,
      conflicts: counts.conflict,
      nothingNew: inserted === 0,
    };
    if (change && inserted > 0) {
      // Statistics before the hourly results read the month back (and before the next import
      // compares against it): a first load into a month would otherwise be planned as empty.
      await refreshMonthStatistics(ctx.db, ['readings'], change.from.getTime(), change.to.getTime() + 1, inserted);
      if (prepared) await prepared.store();
      else await onReadingsChanged(hookCtx, change);
      await refreshMonthStatistics(ctx.db, ['hourly_values', 'limit_hourly_values'], change.from.getTime(), change.to.getTime() + 1, Math.ceil(inserted / 60));
    }
    await clearStaging(ctx, importId, false);
    await audit(ctx as Parameters<typeof audit>[0], {
      action: 'import.committed',
      entity: 'import',
      entityId: importId,
      after: { ...result, replaceReason: body.reason ?? null, fileName: current.file_name, sha256: current.sha256 },
    });
    // Last statement on the import row: the progress writer must never wait for this transaction.
    await ctx.db('imports').where({ tenant_id: ctx.tenantId, id: importId }).update({
      state: 'committed',
      committed_at: ctx.db.fn.now(),
      committed_by: ctx.userId,
      replace_reason: body.replaceConflicts ? body.reason : null,
      inserted_count: result.inserted,
      unchanged_count: result.unchanged,
      superseded_count: result.superseded,
      conflict_count: result.conflicts,
      progress_phase: 'done',
      progress_done: totalIncoming,
      progress_total: totalIncoming,
      progress_updated_at: ctx.db.fn.now(),
      failure_message: null,
    });
    return result;
  } catch (error) {
    // Not awaited: the request's transaction rolls back after this throws, and the note must not
    // wait for it. A refusal (conflicts) leaves the import as it was, ready to commit again.
    const refused = error instanceof AppError && error.status < 500;
    const previousState = current.state === 'committing' ? 'mapped' : current.state;
    // After any progress note still on its way, so none lands on top of this one.
    void notes
      .catch(() => undefined)
      .then(() =>
        writeProgress(
          deps,
          ctx,
          importId,
          refused
            ? { state: previousState, progress_phase: 'refused', failure_message: (error as AppError).message }
            : { state: 'failed', progress_phase: 'failed', failure_message: 'The commit failed; nothing of it was stored. Try again.' },
        ),
      )
      .catch(() => undefined);
    throw error;
  }
}

// ---- rollback -----------------------------------------------------------------------------------

export async function rollback(ctx: ImportCtx, importId: string, reason: string) {
  const row = await findImport(ctx, importId);
  if (row.state !== 'committed') throw new Conflict('not_committed', 'Only a committed import can be rolled back.');
  await lockStackReadings(ctx.db, row.stack_id);
  const mapped = mappedColumns(row);
  if (!row.span_from || !row.span_to || mapped.channelIds.length === 0) {
    await ctx.db('imports').where({ tenant_id: ctx.tenantId, id: importId }).update({ state: 'rolled_back', rolled_back_at: ctx.db.fn.now(), rolled_back_by: ctx.userId, rollback_reason: reason });
    return { withdrawn: 0, restored: 0, state: 'rolled_back' as const };
  }
  const scope: Knex.RawBinding[] = [ctx.tenantId, mapped.channelIds, row.span_from, row.span_to, importId];
  const scopeSql = 'tenant_id = ? and channel_id = any(?::uuid[]) and t >= ? and t < ? and import_id = ?';

  // Refuse when a later import or a correction replaced any of this import's values: rolling
  // back underneath it would silently change what that later change was based on.
  const later = await ctx.db.raw(
    `select count(*) as n from (select distinct channel_id, t from readings where ${scopeSql}) k
     join readings cur on cur.tenant_id = ? and cur.channel_id = k.channel_id and cur.t = k.t and cur.superseded_at is null
     where cur.import_id is distinct from ?`,
    [...scope, ctx.tenantId, importId],
  );
  const changedLater = Number(later.rows[0].n);
  if (changedLater > 0) {
    throw new Conflict('changed_later', `${changedLater} values of this import were replaced later (by another import or a correction); roll those back or correct them first.`);
  }

  // For each current row of this import: the row its first version displaced (if any) is restored.
  await ctx.db.raw(
    `create temp table rollback_rows on commit drop as
     select cur.id as current_id, cur.channel_id, cur.t, prev.value as prev_value, prev.status as prev_status,
            prev.import_id as prev_import_id, prev.id as prev_id
     from readings cur
     left join lateral (
       select first.id from readings first
       where first.tenant_id = cur.tenant_id and first.channel_id = cur.channel_id and first.t = cur.t and first.import_id = cur.import_id
       order by first.id limit 1
     ) f on true
     left join readings prev on prev.tenant_id = cur.tenant_id and prev.channel_id = cur.channel_id and prev.t = cur.t
       and prev.superseded_at is not null and prev.superseded_by = f.id
     where cur.${scopeSql.replace(/ and /g, ' and cur.')} and cur.superseded_at is null`,
    scope,
  );
  const withdrawn = await ctx.db.raw(
    `update readings r set superseded_at = now() from rollback_rows b
     where r.tenant_id = ? and r.channel_id = b.channel_id and r.t = b.t and r.superseded_at is null and r.id = b.current_id`,
    [ctx.tenantId],
  );
  const restored = await ctx.db.raw(
    `with back as (
       insert into readings (tenant_id, channel_id, t, value, status, import_id, created_by, reason)
       select ?, channel_id, t, prev_value, prev_status, prev_import_id, ?, ? from rollback_rows where prev_id is not null
       returning id, channel_id, t
     )
     update readings r set superseded_by = back.id
     from back join rollback_rows b on b.channel_id = back.channel_id and b.t = back.t
     where r.tenant_id = ? and r.channel_id = back.channel_id and r.t = back.t and r.id = b.current_id`,
    [ctx.tenantId, ctx.userId, `restored by the rollback of import ${importId}: ${reason}`, ctx.tenantId],
  );
  await onReadingsChanged(
    { tenantId: ctx.tenantId, userId: ctx.userId, requestId: ctx.requestId, db: ctx.db },
    { channelIds: mapped.channelIds, from: row.span_from, to: row.span_to },
  );
  const result = { withdrawn: withdrawn.rowCount ?? 0, restored: restored.rowCount ?? 0, state: 'rolled_back' as const };
  await audit(ctx as Parameters<typeof audit>[0], { action: 'import.rolled_back', entity: 'import', entityId: importId, after: { ...result, reason } });
  await ctx.db('imports').where({ tenant_id: ctx.tenantId, id: importId }).update({
    state: 'rolled_back',
    rolled_back_at: ctx.db.fn.now(),
    rolled_back_by: ctx.userId,
    rollback_reason: reason,
  });
  return result;
}
