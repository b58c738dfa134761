/**
 * List endpoints of the set-up modules answer `{ items, total }` and accept
 * `?limit=50&offset=0&sort=<field>&order=asc|desc&q=<text>&includeArchived=true`.
 */
import type { Knex } from 'knex';
import { z } from 'zod';

const queryBoolean = z
  .enum(['true', 'false', '1', '0'])
  .transform((v) => v === 'true' || v === '1');

/** Query-string schema of a list endpoint; `sortFields` maps each API sort field to its column. */
export function listQuery<const F extends string>(sortFields: Record<F, string>, defaultSort: NoInfer<F>) {
  const keys = Object.keys(sortFields) as [F, ...F[]];
  return z.object({
    limit: z.coerce.number().int().min(1).max(200).default(50),
    offset: z.coerce.number().int().min(0).default(0),
    sort: z.enum(keys).default(defaultSort as never),
    order: z.enum(['asc', 'desc']).default('asc'),
    q: z.string().trim().max(200).optional(),
    includeArchived: queryBoolean.default(false),
  });
}

export interface ListParams {
  limit: number;
  offset: number;
  sort: string;
  order: 'asc' | 'desc';
  q?: string | undefined;
  includeArchived: boolean;
}

export interface ListSpec {
  /** API sort field → column */
  sortColumns: Record<string, string>;
  /** columns matched (case-insensitively, substring) by `q` */
  searchColumns: string[];
  archivedColumn: string;
  idColumn: string;
}

const escapeLike = (text: string): string => text.replace(/[\\%_]/g, (c) => `\\${c}`);

/** Applies archive filter, search, count, sort and page to a base query. */
export async function pageRows<Row>(
  base: Knex.QueryBuilder,
  params: ListParams,
  spec: ListSpec,
): Promise<{ rows: Row[]; total: number }> {
  const filtered = base.clone();
  if (!params.includeArchived) filtered.whereNull(spec.archivedColumn);
  if (params.q) {
    const pattern = `%${escapeLike(params.q)}%`;
    filtered.where((w) => {
      for (const column of spec.searchColumns) w.orWhereILike(column, pattern);
    });
  }
  const [{ count }] = (await filtered.clone().clearSelect().clearOrder().count({ count: '*' })) as { count: string }[];
  const sortColumn = spec.sortColumns[params.sort] ?? spec.idColumn;
  const rows = (await filtered
    .orderBy(sortColumn, params.order)
    .orderBy(spec.idColumn, 'asc')
    .limit(params.limit)
    .offset(params.offset)) as Row[];
  return { rows, total: Number(count) };
}
