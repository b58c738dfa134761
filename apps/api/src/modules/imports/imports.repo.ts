/**
 * Database access of the import module: stacks and channels as imports see them, the imports
 * table, staging (import_rows, import_problems, via COPY) and the stack's column map.
 */
import type { ReadingColumns } from '@flueledger/calc';
import type { Knex } from 'knex';
import { NotFound, Conflict } from '../../lib/errors';
import { READING_STATUS_CODE, type DbReadingStatus } from '../results/channel-hours';
import { whereSiteVisible } from '../sites/site-access';
import type { SetupCtx } from '../sites/setup-context';
import { copyField, copyLines } from './imports.copy';
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

/** One value column as stored in imports.columns (position k ↔ import_rows.vals[k + 1]). */
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

/** Loads the parsed rows and problems of a file into staging with COPY. */
export async function stageParsed(ctx: ImportCtx, importId: string, parsed: ParsedFile): Promise<void> {
  const tenant = ctx.tenantId;
  const { rowCount, rowNumbers, tUtcMs, statuses, values } = parsed;
  function* rowLines(): Generator<string> {
    const width = values.length;
    for (let i = 0; i < rowCount; i++) {
      const t = tUtcMs[i]!;
      // Rejected rows are kept (without a time) so row numbers stay complete for the preview.
      const parts = new Array<string>(width);
      for (let k = 0; k < width; k++) {
        const v = values[k]![i]!;
        parts[k] = Number.isNaN(v) ? 'NULL' : String(v);
      }
      yield `${tenant}\t${importId}\t${rowNumbers[i]}\t${Number.isFinite(t) ? new Date(t).toISOString() : '\\N'}\t${statuses[i]}\t{${parts.join(',')}}`;
    }
  }
  // PostgreSQL refuses COPY FROM into a table with row-level security: load a temporary table
  // (private to this transaction), then move the rows over with one INSERT, which the policy checks.
  await ctx.db.raw('drop table if exists pg_temp.import_rows_in');
  await ctx.db.raw('create temp table import_rows_in (like import_rows) on commit drop');
  await copyLines(ctx.db, 'COPY import_rows_in (tenant_id, import_id, row_number, t, status, vals) FROM STDIN', rowLines());
  const staged = await ctx.db.raw('insert into import_rows select * from import_rows_in');
  // The preview joins staging with stored readings: give the planner staging's new size.
  await ctx.db.raw('select refresh_statistics(?, ?)', ['import_rows', staged.rowCount ?? 0]);
  const headers = new Map<number, string>([[parsed.timestampColumn, parsed.timestampHeader]]);
  for (const column of parsed.columns) headers.set(column.index, column.header);
  function* problemLines(): Generator<string> {
    for (const p of parsed.problems) {
      const header = headers.get(p.columnIndex) ?? (p.columnIndex === parsed.statusColumn ? 'Status' : '');
      const label = `${columnLetter(p.columnIndex)}${header ? ` (${header})` : ''}`;
      yield [tenant, importId, p.row, p.columnIndex, label, p.value, p.code, p.reason].map((f) => copyField(f)).join('\t');
    }
  }
  if (parsed.problems.length === 0) return;
  await ctx.db.raw('drop table if exists pg_temp.import_problems_in');
  await ctx.db.raw('create temp table import_problems_in (like import_problems) on commit drop');
  await copyLines(ctx.db, 'COPY import_problems_in (tenant_id, import_id, row_number, column_index, column_label, value, code, reason) FROM STDIN', problemLines());
  await ctx.db.raw('insert into import_problems select * from import_problems_in');
}

/**
 * The readings an import brings for the mapped channels, as engine columns by channel id: every
 * staged row with a time, per mapped column the cell when it holds a number or the row's status is
 * not valid (the rule of the commit's INSERT). In file order (the primary key's, so no sort), which
 * is the order the commit inserts them in. One statement: the rows
 * come back as one JSON document (times, statuses and the value arrays), which parses far faster
 * than a row object per staged row.
 */
export async function loadStagedReadings(ctx: ImportCtx, importId: string, mapped: { channelIds: readonly string[]; positions: readonly number[] }): Promise<Map<string, ReadingColumns>> {
  const { rows } = await ctx.db.raw(
    `select json_build_object('t', array_agg(date_part('epoch', s.t) * 1000), 's', array_agg(s.status), 'v', array_agg(s.vals))::text as columns
       from (select t, status, vals from import_rows
              where tenant_id = ? and import_id = ? and t is not null
              order by row_number) s`,
    [ctx.tenantId, importId],
  );
  const out = new Map<string, ReadingColumns>();
  const packed = rows[0]?.columns ? (JSON.parse(rows[0].columns as string) as { t: number[] | null; s: DbReadingStatus[] | null; v: (number | null)[][] | null }) : null;
  const t = packed?.t ?? [];
  const statuses = packed?.s ?? [];
  const values = packed?.v ?? [];
  const n = t.length;
  const statusCodes = new Uint8Array(n);
  const valid = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    statusCodes[i] = READING_STATUS_CODE[statuses[i]!];
    valid[i] = statuses[i] === 'valid' ? 1 : 0;
  }
  mapped.channelIds.forEach((channelId, k) => {
    const at = mapped.positions[k]! - 1;
    let count = 0;
    for (let i = 0; i < n; i++) if (values[i]![at] !== null || !valid[i]) count++;
    const columns = { t: new Float64Array(count), value: new Float64Array(count), status: new Uint8Array(count) };
    let j = 0;
    for (let i = 0; i < n; i++) {
      const value = values[i]![at]!;
      if (value === null && valid[i]) continue;
      columns.t[j] = t[i]!;
      columns.value[j] = value === null ? NaN : value;
      columns.status[j] = statusCodes[i]!;
      j++;
    }
    out.set(channelId, columns);
  });
  return out;
}

export async function clearStaging(ctx: ImportCtx, importId: string, alsoProblems: boolean): Promise<void> {
  await ctx.db('import_rows').where({ tenant_id: ctx.tenantId, import_id: importId }).delete();
  if (alsoProblems) await ctx.db('import_problems').where({ tenant_id: ctx.tenantId, import_id: importId }).delete();
}

export async function isStaged(ctx: ImportCtx, importId: string): Promise<boolean> {
  const row = await ctx.db('import_rows').where({ tenant_id: ctx.tenantId, import_id: importId }).first(ctx.db.raw('1 as one'));
  return !!row;
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
