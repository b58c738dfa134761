import type { Knex } from 'knex';

/** Advisory-lock key of this job: one instance at a time runs it, the others skip the round. */
export const purgeStaleWorkLockKey = 'flueledger:job:purge-stale-work';

export interface PurgeOutcome {
  /** False when another instance held the lock and this one did nothing. */
  ran: boolean;
  stagingRowsDeleted: number;
  rateLimitsDeleted: number;
}

/**
 * Deletes import staging rows that are no longer needed (committed, rolled back or failed
 * imports, and drafts older than `draftMaxAgeDays`) and expired rate-limit windows. Safe on any
 * number of instances: a transaction-scoped advisory lock lets one run and the rest skip, and the
 * lock goes with the transaction even if the process dies.
 */
export async function purgeStaleWork(db: Knex, { draftMaxAgeDays = 7 } = {}): Promise<PurgeOutcome> {
  return db.transaction(async (trx) => {
    const { rows: lock } = await trx.raw('select pg_try_advisory_xact_lock(hashtextextended(?, 0)) as locked', [purgeStaleWorkLockKey]);
    if (!lock[0]?.locked) return { ran: false, stagingRowsDeleted: 0, rateLimitsDeleted: 0 };
    const { rows } = await trx.raw('select * from purge_stale_work(make_interval(days => ?))', [draftMaxAgeDays]);
    return { ran: true, stagingRowsDeleted: Number(rows[0].staging_rows_deleted), rateLimitsDeleted: Number(rows[0].rate_limits_deleted) };
  });
}
