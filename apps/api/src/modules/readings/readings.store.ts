/**
 * Shared rules of the readings store (apps/api migrations 20261203000200): month partitions and
 * the per-stack write lock. Every writer of readings (imports, corrections) uses both.
 */
import type { Knex } from 'knex';

export type Db = Knex | Knex.Transaction;

/** Month-partitioned tables (see migration 20261203000100). */
export type PartitionedTable = 'readings' | 'hourly_values' | 'limit_hourly_values';

/** First day (UTC) of every calendar month touched by [fromMs, toMs). */
export function monthsCovering(fromMs: number, toMs: number): string[] {
  const months: string[] = [];
  const start = new Date(fromMs);
  let year = start.getUTCFullYear();
  let month = start.getUTCMonth();
  for (;;) {
    const first = Date.UTC(year, month, 1);
    if (first >= toMs && months.length > 0) break;
    months.push(new Date(first).toISOString().slice(0, 10));
    month++;
    if (month === 12) [year, month] = [year + 1, 0];
    if (months.length > 1200) throw new Error('span too long');
  }
  return months;
}

/**
 * Makes sure the month partitions for [fromMs, toMs) exist. Call it in its own short transaction
 * (or outside one) before the writing transaction: creating a partition locks the parent table,
 * and a long import should not hold that lock while it loads.
 */
export async function ensureMonthPartitions(db: Db, table: PartitionedTable, fromMs: number, toMs: number): Promise<void> {
  for (const month of monthsCovering(fromMs, toMs)) {
    const exists = await db.raw('select to_regclass(?) as name', [`${table}_y${month.slice(0, 4)}m${month.slice(5, 7)}`]);
    if (exists.rows[0]?.name) continue;
    await db.raw('select ensure_month_partition(?, ?::date)', [table, month]);
  }
}

/**
 * Refreshes the planner's statistics of the month partitions of `tables` covering [fromMs, toMs)
 * after `rowsWritten` rows went in, when that is a large share of what they held (see the
 * `refresh_statistics` migration: without it, the first query joining a freshly loaded month can
 * be planned as if the month were empty).
 */
export async function refreshMonthStatistics(db: Db, tables: readonly PartitionedTable[], fromMs: number, toMs: number, rowsWritten: number): Promise<void> {
  for (const table of tables) {
    for (const month of monthsCovering(fromMs, toMs)) {
      await db.raw('select refresh_statistics(?, ?)', [`${table}_y${month.slice(0, 4)}m${month.slice(5, 7)}`, rowsWritten]);
    }
  }
}

/**
 * Serialises writers of one stack's readings for the rest of the transaction (two imports of
 * overlapping files, or an import and a correction, would otherwise both see a time as free).
 *
 * Then drops the session's cached sequence values: readings ids come from a cached sequence
 * (migration 20261212000100) and order a reading's versions, so every holder of the lock must
 * take its ids from a fresh block, above the ids of every earlier holder. Writers of readings
 * call this before their first INSERT.
 */
export async function lockStackReadings(trx: Knex.Transaction, stackId: string): Promise<void> {
  await trx.raw("select pg_advisory_xact_lock(hashtextextended('readings:' || ?, 0))", [stackId]);
  await trx.raw('discard sequences');
}
