/**
 * Database access of the import module: stacks and channels as imports see them, the imports
 * table, staging (import_columns, import_problems) and the stack's column map.
 */
import type { Knex } from 'knex';
import { NotFound, Conflict } from '../../lib/errors';
import { whereSiteVisible } from '../sites/site-access';
import type { SetupCtx } from '../sites/setup-context';
import { copyField, copyLines, copyOutBinary, packStagedColumn, packStagedRows, type StagedRows, unpackStagedColumn, unpackStagedRows } from './imports.copy';
import type { ParsedFile } from './parse/read-file';
import { columnLetter } from './parse/cells';
import { rowProblemCodes } from './parse/sheet-interpreter';
import type { StackMapEntry } from './mapping/suggest-mapping';

/** What the import services need of a tenant request (the seed builds one for the owner connection). */
export type ImportCtx = SetupCtx;

export interface StackInfo {
  id: string;
  siteId: string;
  name: string;
  archivedAt: Date | null;
  timeZone: string;
  country: string;
}

export interface ChannelInfo {
  id: string;
  parameter: string;
  unit: string;
  basis: 'wet' | 'dry';
  sourceLabel: string | null;
  intervalMinutes: number;
  archivedAt: Date | null;
}

/** One value column as stored in imports.columns (position k + 1 ↔ staged part k + 1, import_columns). */
export interface StoredColumn {
  index: number;
  letter: string;
  header: string;
  normalised: string;
  unitHint: string | null;
  parameterHint: string | null;
  basisHint: string | null;
  sample: number[];
  numbers: number;
  problems: number;
  suggestedChannelId: string | null;
  suggestionSource: string | null;
  /**
   * Readings the column brings when mapped (a number in a row with a time, or any cell of such a
   * row whose status is not valid); absent on imports staged before it was recorded.
   */
  incoming?: number;
}

export interface MappingEntry {
  index: number;
  channelId: string | null;
}

export interface ImportRow {
  id: string;
  tenant_id: string;
  stack_id: string;
  file_name: string;
  sha256: string;
  size_bytes: string | number;
  format: 'xlsx' | 'csv';
  sheet_name: string | null;
  uploaded_by: string;
  uploaded_at: Date;
  state: 'parsed' | 'mapped' | 'committing' | 'committed' | 'rolled_back' | 'failed';
  header_row: number | null;
  timestamp_column: number;
  timestamp_header: string;
  status_column: number | null;
  interval_convention: 'interval_end' | 'interval_start';
  interval_seconds: number | null;
  period_from: string | Date | null;
  period_to: string | Date | null;
  columns: StoredColumn[];
  mapping: MappingEntry[];
  notes: string[];
  row_count: number;
  cell_count: number;
  problem_count: number;
  problem_counts: Record<string, number>;
  duplicate_rows: number;
  inserted_count: number | null;
  unchanged_count: number | null;
  superseded_count: number | null;
  conflict_count: number | null;
  span_from: Date | null;
  span_to: Date | null;
  committed_at: Date | null;
  committed_by: string | null;
  rolled_back_at: Date | null;
  rollback_reason: string | null;
  progress_phase: string | null;
  progress_done: string | number | null;
  progress_total: string | number | null;
  progress_updated_at: Date | null;
  failure_message: string | null;
  uploaded_by_name?: string | null;
}

type SiteScope = ImportCtx;

/** The stack with its site's zone and country; 404 for another organisation's or an invisible site's. */
export async function findStack(ctx: SiteScope, stackId: string): Promise<StackInfo> {
  const qb = ctx
    .db('stacks as s')
    .join('sites as si', function joinSite() {
      this.on('si.id', '=', 's.site_id').andOn('si.tenant_id', '=', 's.tenant_id');
    })
    .where('s.tenant_id', ctx.tenantId)
    .andWhere('s.id', stackId)
    .first('s.id', 's.site_id', 's.name', 's.archived_at', 'si.time_zone', 'si.country');
  whereSiteVisible(qb, ctx, 's.site_id');
  const row = (await qb) as { id: string; site_id: string; name: string; archived_at: Date | null; time_zone: string; country: string } | undefined;
  if (!row) throw new NotFound('not_found', 'Stack not found.');
  return { id: row.id, siteId: row.site_id, name: row.name, archivedAt: row.archived_at, timeZone: row.time_zone, country: row.country.trim() };
}

export async function findStackForWrite(ctx: SiteScope, stackId: string): Promise<StackInfo> {
  const stack = await findStack(ctx, stackId);
  if (stack.archivedAt) throw new Conflict('archived', 'This stack is archived: data can no longer be imported into it.');
  return stack;
}

export async function listChannels(ctx: SiteScope, stackId: string): Promise<ChannelInfo[]> {
  const rows = (await ctx
    .db('channels')
    .where({ tenant_id: ctx.tenantId, stack_id: stackId })
    .orderBy('created_at')
    .select('id', 'parameter', 'unit', 'basis', 'source_label', 'interval_minutes', 'archived_at')) as {
    id: string;
    parameter: string;
    unit: string;
    basis: 'wet' | 'dry';
    source_label: string | null;
    interval_minutes: number;
    archived_at: Date | null;
  }[];
  return rows.map((r) => ({
    id: r.id,
    parameter: r.parameter,
    unit: r.unit,
    basis: r.basis,
    sourceLabel: r.source_label,
    intervalMinutes: r.interval_minutes,
    archivedAt: r.archived_at,
  }));
}

export async function loadStackMap(ctx: SiteScope, stackId: string): Promise<{ entries: Map<string, StackMapEntry>; intervalConvention: 'interval_end' | 'interval_start' | null }> {
  const rows = (await ctx
    .db('stack_column_maps')
    .where({ tenant_id: ctx.tenantId, stack_id: stackId })
    .select('header', 'role', 'channel_id', 'interval_convention')) as {
    header: string;
    role: 'channel' | 'timestamp' | 'status' | 'ignore';
    channel_id: string | null;
    interval_convention: 'interval_end' | 'interval_start' | null;
  }[];
  const entries = new Map<string, StackMapEntry>();
  let intervalConvention: 'interval_end' | 'interval_start' | null = null;
  for (const row of rows) {
    if (row.role === 'channel' && row.channel_id) entries.set(row.header, { role: 'channel', channelId: row.channel_id });
    else if (row.role === 'timestamp') {
      entries.set(row.header, { role: 'timestamp' });
      intervalConvention = row.interval_convention ?? intervalConvention;
    } else if (row.role === 'status') entries.set(row.header, { role: 'status' });
    else entries.set(row.header, { role: 'ignore' });
  }
  return { entries, intervalConvention };
}

/** Replaces the stack's column map entries for the headers of this file (others are kept). */
export async function saveStackMap(
  ctx: ImportCtx,
  stackId: string,
  entries: { header: string; role: 'channel' | 'timestamp' | 'status' | 'ignore'; channelId: string | null; intervalConvention: string | null }[],
): Promise<void> {
  const unique = new Map(entries.filter((e) => e.header !== '').map((e) => [e.header, e]));
  if (unique.size === 0) return;
  await ctx
    .db('stack_column_maps')
    .insert(
      [...unique.values()].map((e) => ({
        tenant_id: ctx.tenantId,
        stack_id: stackId,
        header: e.header,
        role: e.role,
        channel_id: e.channelId,
        interval_convention: e.intervalConvention,
        updated_by: ctx.userId,
        updated_at: ctx.db.fn.now(),
      })),
    )
    .onConflict(['tenant_id', 'stack_id', 'header'])
    .merge(['role', 'channel_id', 'interval_convention', 'updated_by', 'updated_at']);
}

/** The import, if it belongs to the organisation and to a stack on a site the caller may see. */
export async function findImport(ctx: SiteScope, importId: string): Promise<ImportRow> {
  const qb = ctx
    .db('imports as i')
    .join('stacks as s', function joinStack() {
      this.on('s.id', '=', 'i.stack_id').andOn('s.tenant_id', '=', 'i.tenant_id');
    })
    .leftJoin('users as u', 'u.id', 'i.uploaded_by')
    .where('i.tenant_id', ctx.tenantId)
    .andWhere('i.id', importId)
    .first('i.*', 'u.name as uploaded_by_name');
  whereSiteVisible(qb, ctx, 's.site_id');
  const row = (await qb) as ImportRow | undefined;
  if (!row) throw new NotFound('not_found', 'Import not found.');
  return row;
}

export async function listImports(ctx: SiteScope, stackId: string, limit: number, offset: number): Promise<{ rows: ImportRow[]; total: number }> {
  const base = ctx.db('imports as i').where('i.tenant_id', ctx.tenantId).andWhere('i.stack_id', stackId);
  const [{ count }] = (await base.clone().count({ count: '*' })) as { count: string }[];
  const rows = (await base
    .clone()
    .leftJoin('users as u', 'u.id', 'i.uploaded_by')
    .orderBy('i.uploaded_at', 'desc')
    .orderBy('i.id')
    .limit(limit)
    .offset(offset)
    .select('i.*', 'u.name as uploaded_by_name')) as ImportRow[];
  return { rows, total: Number(count) };
}

/** The latest committed import of the same file (same SHA-256) into the same stack. */
export async function findCommittedTwin(ctx: SiteScope, stackId: string, sha256: string, exceptId: string): Promise<{ id: string; committed_at: Date } | null> {
  const row = (await ctx
    .db('imports')
    .where({ tenant_id: ctx.tenantId, stack_id: stackId, sha256, state: 'committed' })
    .whereNot('id', exceptId)
    .orderBy('committed_at', 'desc')
    .first('id', 'committed_at')) as { id: string; committed_at: Date } | undefined;
  return row ?? null;
}

/** A staged file with the value columns that were asked for. */
export interface StagedFile extends StagedRows {
  /** Values by 1-based position (k ↔ imports.columns[k - 1]); NaN = no number in the cell. */
  values: Map<number, Float64Array>;
}

/**
 * Parts per INSERT up to about this many bytes: a month of one-minute data goes in one statement,
 * the largest file the limits allow in a few (each statement's parameters are held in memory).
 */
const stagedBytesPerStatement = 32 * 1024 * 1024;

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * Stages a parsed file (import_columns: the row fields as part 0, value column k as part k) and its
 * problems, and returns it as staged. The parts are packed byte strings sent as binary parameters:
 * nothing is formatted as text or parsed on either side.
 */
export async function stageParsed(ctx: ImportCtx, importId: string, parsed: ParsedFile): Promise<StagedFile> {
  const tenant = ctx.tenantId;
  // Packed a statement's worth at a time, so a large file is not held twice over in memory.
  const parts = [
    { bytes: 64 + parsed.rowCount * 13, pack: () => packStagedRows(parsed) },
    ...parsed.values.map((values) => ({ bytes: 8 + values.length * 8, pack: () => packStagedColumn(values) })),
  ];
  for (let from = 0; from < parts.length; ) {
    let to = from + 1;
    let bytes = parts[from]!.bytes;
    while (to < parts.length && bytes + parts[to]!.bytes <= stagedBytesPerStatement) bytes += parts[to++]!.bytes;
    const rows = [];
    for (let part = from; part < to; part++) rows.push({ tenant_id: tenant, import_id: importId, part, content: parts[part]!.pack() });
    await ctx.db('import_columns').insert(rows);
    from = to;
  }
  const headers = new Map<number, string>([[parsed.timestampColumn, parsed.timestampHeader]]);
  for (const column of parsed.columns) headers.set(column.index, column.header);
  function* problemLines(): Generator<string> {
    for (const p of parsed.problems) {
      const header = headers.get(p.columnIndex) ?? (p.columnIndex === parsed.statusColumn ? 'Status' : '');
      const label = `${columnLetter(p.columnIndex)}${header ? ` (${header})` : ''}`;
      yield [tenant, importId, p.row, p.columnIndex, label, p.value, p.code, p.reason].map((f) => copyField(f)).join('\t');
    }
  }
  if (parsed.problems.length > 0) {
    await ctx.db.raw('drop table if exists pg_temp.import_problems_in');
    await ctx.db.raw('create temp table import_problems_in (like import_problems) on commit drop');
    await copyLines(ctx.db, 'COPY import_problems_in (tenant_id, import_id, row_number, column_index, column_label, value, code, reason) FROM STDIN', problemLines());
    await ctx.db.raw('insert into import_problems select * from import_problems_in');
  }
  return {
    rowCount: parsed.rowCount,
    rowNumbers: parsed.rowNumbers,
    tUtcMs: parsed.tUtcMs,
    statuses: parsed.statuses,
    values: new Map(parsed.values.map((values, k) => [k + 1, values])),
  };
}

/**
 * The staged file with the value columns at `positions` (1-based), or null when the import is not
 * staged (after a database crash emptied the unlogged table, or after housekeeping removed an old
 * draft's staging). Read with COPY in binary: the parts arrive as their raw bytes.
 */
export async function loadStaged(ctx: ImportCtx, importId: string, positions: readonly number[]): Promise<StagedFile | null> {
  // COPY takes no parameters: only validated uuids and integers are written into the query.
  if (!uuidPattern.test(ctx.tenantId) || !uuidPattern.test(importId)) throw new Error('loadStaged: not a uuid');
  const parts = [0, ...new Set(positions)];
  if (!parts.every((p) => Number.isInteger(p) && p >= 0)) throw new Error('loadStaged: not a column position');
  const rows = await copyOutBinary(
    ctx.db,
    `select part, content from import_columns
      where tenant_id = '${ctx.tenantId}' and import_id = '${importId}' and part in (${parts.join(', ')})`,
  );
  const byPart = new Map(rows.map(([part, content]) => [part!.readInt32BE(0), content!]));
  const head = byPart.get(0);
  if (!head || parts.some((p) => !byPart.has(p))) return null;
  return { ...unpackStagedRows(head), values: new Map(parts.slice(1).map((p) => [p, unpackStagedColumn(byPart.get(p)!)])) };
}

export async function clearStaging(ctx: ImportCtx, importId: string, alsoProblems: boolean): Promise<void> {
  await ctx.db('import_columns').where({ tenant_id: ctx.tenantId, import_id: importId }).delete();
  if (alsoProblems) await ctx.db('import_problems').where({ tenant_id: ctx.tenantId, import_id: importId }).delete();
}

export async function loadFile(ctx: ImportCtx, importId: string): Promise<Buffer> {
  const row = (await ctx.db('import_files').where({ tenant_id: ctx.tenantId, import_id: importId }).first('content')) as { content: Buffer } | undefined;
  if (!row) throw new Conflict('file_missing', 'The uploaded file of this import is no longer stored; upload it again.');
  return row.content;
}

/** Problems relevant for the mapping: every row problem, and cell problems of mapped columns. */
export function relevantProblems(ctx: ImportCtx, importId: string, mappedColumns: number[]): Knex.QueryBuilder {
  return ctx
    .db('import_problems')
    .where({ tenant_id: ctx.tenantId, import_id: importId })
    .andWhere((qb) => {
      qb.whereIn('code', [...rowProblemCodes]);
      if (mappedColumns.length > 0) qb.orWhereIn('column_index', mappedColumns);
    });
}
